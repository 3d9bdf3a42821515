"""What the schema cannot see, checked before the model is built: each mistake a located error.

The schema checks one file at a time; some nonsense shows only once the design's components are
resolved against their library parts. The model would meet it as a division by zero or a network
it cannot set up, so it is refused here, with the design's line, as any other input error:

* a component with every pin on one net: shorted out, it carries nothing the model can solve;
* a switch whose drain and source share a net: its body diode has nowhere to point;
* a protector whose sense and ground pins share a net: the over-current detection sees no
  voltage, so every trip current would be a division by zero;
* an on-resistance temperature line (``rds_on_hot_ratio``) that falls to zero or below within
  the temperatures the design meets (the lowest ambient up to the part's ``tj_max``).

What shows only in the model's solution (the load current bypassing the protector's sense pins)
the model raises as a ``model.values.DesignMistake``; the engine reports it the same way.
"""

from __future__ import annotations

from typing import Iterator

from .loader import Document, InputError
from .netlist import KIND_TEXT, Netlist
from .schema import Design


#: The drain and source pins of each switch channel, by part kind (see netlist.PIN_NAMES).
_CHANNELS = {"fet": (("d", "s"),), "fet_pair_common_drain": (("d", "s1"), ("d", "s2"))}


def netlist_errors(doc: Document, design: Design, netlist: Netlist) -> list[InputError]:
    """The mistakes above, each at its component in the design file; empty when there are none."""
    return [doc.error(path, message) for path, message in _mistakes(design, netlist)]


def _mistakes(design: Design, netlist: Netlist) -> Iterator[tuple[tuple, str]]:
    ambient_min = design.pack.ambient.min
    for comp in netlist.components.values():
        if comp.kind is None:
            continue  # an unknown part: unknown-part reports it
        what = KIND_TEXT.get(comp.kind, comp.kind)
        pins = comp.pins
        nets = set(pins.values())
        if len(pins) >= 2 and len(nets) == 1:
            yield (comp.path + ("pins",),
                   f"{comp.refdes}: every pin of the {what} is on net '{next(iter(nets))}', "
                   f"which shorts it out; connect each pin to its own net")
            continue
        for drain, source in _CHANNELS.get(comp.kind, ()):
            if drain in pins and pins[drain] == pins.get(source):
                yield (comp.path + ("pins", source),
                       f"{comp.refdes}: drain ({drain}) and source ({source}) of the {what} are "
                       f"both on net '{pins[source]}', which shorts the switch out")
        if comp.kind == "protector" and pins.get("sense") is not None \
                and pins.get("sense") == pins.get("ground"):
            yield (comp.path + ("pins", "sense"),
                   f"{comp.refdes}: the sense and ground pins of the protector are both on net "
                   f"'{pins['sense']}': the over-current detection would see no voltage; connect "
                   f"sense across the switches or the shunt")
        hot = getattr(comp.part, "rds_on_hot_ratio", None)
        if hot is not None:
            message = _hot_line(hot, ambient_min, comp.part.tj_max)
            if message is not None:
                part = f"part {comp.part_name}" if comp.part_name else "inline part"
                yield comp.path + ("part",), f"{comp.refdes}: {message.format(part=part)}"


def _hot_line(hot, coldest: float, hottest: float) -> str | None:
    """Why the straight line through 1 at 25 °C and ``hot.ratio`` at ``hot.at`` cannot scale an
    on-resistance between ``coldest`` and ``hottest``, or None when it can."""
    slope = (hot.ratio - 1.0) / (hot.at - 25.0)  # the schema keeps hot.at above 25 °C
    for temp in (coldest, hottest):
        if 1.0 + slope * (temp - 25.0) <= 0.0:
            zero = 25.0 - 1.0 / slope
            return (f"the on-resistance line of its {{part}} (rds_on_hot_ratio {hot.ratio:g} at "
                    f"{hot.at:g} °C) falls to zero at {zero:.3g} °C, within the {coldest:g} °C "
                    f"to {hottest:g} °C its switches may meet; check the ratio and its "
                    f"temperature against the data sheet's curve")
    return None
