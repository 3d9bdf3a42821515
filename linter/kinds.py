"""Every component kind, declared once: its pins and what each connects to, how it reads in a
message, and how it enters the power path.

The part's own data (its fields, units and descriptions) is its pydantic model in ``schema.py``
(``PART_KINDS``); everything else the linter knows of a kind is here, and the netlist, the docs and
the model's power path read it from here. Adding a kind: its model in ``schema.py``, its
declaration here, and the rule that judges it, if any (DEVELOPERS.md, "Which files a change
touches").
"""

from __future__ import annotations

from dataclasses import field
from typing import Any, Callable, Mapping

from .model import copper
from .model.values import IDEAL
from .records import record

__all__ = ["Kind", "KINDS", "SERIES_KINDS", "SWITCH_KINDS"]


@record(frozen=True)
class Kind:
    """One component kind.

    ``pins`` maps each pin to what it connects to, the required ones first (``required`` of them);
    a kind with exactly two required pins and no optional one may write its pins as a list.
    ``resistance(part, temp, corner)``, for a part that carries the pack's current in series
    (a fuse, a shunt, copper), gives its resistance in ohms at ``temp`` °C and at the corner
    ``"min"``/``"typ"``/``"max"`` of its spread.
    """


    name: str
    text: str
    pins: Mapping[str, str]
    required: int
    resistance: Callable[[Any, float, str], float] | None = None
    #: Pin names a schematic symbol commonly gives (lower case), for the part pin they mean.
    symbol_pins: Mapping[str, str] = field(default_factory=dict)

    @property
    def required_pins(self) -> tuple[str, ...]:
        return tuple(self.pins)[:self.required]

    @property
    def optional_pins(self) -> tuple[str, ...]:
        return tuple(self.pins)[self.required:]


def _resistor(part: Any, temp: float, corner: str) -> float:
    k = {"min": 1 - part.tol / 100, "typ": 1.0, "max": 1 + part.tol / 100}[corner]
    return max(part.value * k, IDEAL)


def _given_or_ideal(part: Any, temp: float, corner: str) -> float:
    # A fuse or wire with no resistance given neither adds to the sense resistance nor limits a
    # short circuit, which errs on the side of higher currents.
    return part.resistance if part.resistance else IDEAL


def _ptc(part: Any, temp: float, corner: str) -> float:
    r = part.resistance
    return {"min": r.low, "typ": r.nominal, "max": r.high}[corner]


def _trace(part: Any, temp: float, corner: str) -> float:
    return copper.trace_resistance(part.width, copper.trace_thickness(part), part.length, temp)


_ENDS = {"1": "first terminal", "2": "second terminal"}
_COPPER_ENDS = {"1": "one end", "2": "the other end"}

KINDS: dict[str, Kind] = {k.name: k for k in (
    # A battery symbol's pins are "+" and "-" [practice].
    Kind("cell", "cell", {"pos": "positive terminal", "neg": "negative terminal"}, 2,
         symbol_pins={"+": "pos", "-": "neg"}),
    Kind("protector", "protector", {
        "supply": "supply input; a single-cell protector measures the cell here, through the "
                  "supply filter resistor",
        "ground": "ground: the negative end of the stack, and one side of the current sense",
        "sense": "current-sense input: across the sense resistance from ground (the switch FETs "
                 "or a shunt), usually through a resistor to the pack's negative terminal",
        "discharge_gate": "gate output of the discharge switch",
        "charge_gate": "gate output of the charge switch",
        "temperature": "temperature-sense input: an NTC thermistor from it to ground, biased as "
                       "the part's temperature_input says",
    }, 5),
    Kind("fet", "FET", {"d": "drain", "g": "gate", "s": "source"}, 3),
    # The common drain of a pair is internal to the package; bringing it out is optional.
    Kind("fet_pair_common_drain", "common-drain FET pair", {
        "s1": "source of channel 1", "g1": "gate of channel 1",
        "s2": "source of channel 2", "g2": "gate of channel 2",
        "d": "the common drain; internal to the package, may stay unconnected",
    }, 4),
    Kind("fuse", "fuse", _ENDS, 2, _given_or_ideal),
    Kind("ptc", "PTC", _ENDS, 2, _ptc),
    Kind("resistor", "resistor", _ENDS, 2, _resistor),
    Kind("capacitor", "capacitor", _ENDS, 2),
    Kind("trace", "trace", _COPPER_ENDS, 2, _trace),
    Kind("wire", "wire", _COPPER_ENDS, 2, _given_or_ideal),
    # Not in the power path: its switch is open in every steady state, and once the main
    # switches close they short it (switch-on-inrush reads it).
    Kind("precharge", "pre-charge path", {"1": "one side of the discharge switches",
                                          "2": "the other side of the discharge switches"}, 2),
    # Not in the power path: it sits in a temperature input's divider and carries microamperes.
    Kind("ntc", "NTC thermistor", {"1": "the temperature input's side",
                                   "2": "the reference's ground side"}, 2),
    # A diode symbol's pins are "A" and "K" [practice].
    Kind("diode", "diode", {"anode": "anode", "cathode": "cathode"}, 2,
         symbol_pins={"a": "anode", "k": "cathode"}),
    # Watches the cells through its cellN pins; not in the power path.
    Kind("overvoltage_backup", "backup overvoltage protector", {
        "ground": "ground: the negative end of the stack, the reference of cell1",
        "output": "output that drives the fuse's heater (directly or through a switch) when a "
                  "cell passes its detection",
        "supply": "supply input (recorded, not modelled)",
    }, 2),
    # In the power path between 1 and 2 like a fuse; the heater hangs off it.
    Kind("heater_fuse", "heater fuse", {
        "1": "first terminal", "2": "second terminal",
        "heater": "heater element terminal: current into it melts the fuse",
    }, 3, _given_or_ideal),
    # In the power path like a fuse; it opens on its body's temperature, not on current.
    Kind("thermal_fuse", "thermal fuse", _ENDS, 2, _given_or_ideal),
)}

#: A multi-cell protector's numbered pins (``cellN``, ``balanceN``), described once for every N.
NUMBERED_PINS = {
    "protector": {
        "cellN": "sense input of the top of cell N, counted from the bottom (cell1 is the bottom "
                 "cell)",
        "balanceN": "balancing (bleed) output of cell N, closing to the pin below that cell",
    },
    "overvoltage_backup": {
        "cellN": "sense input of the top of cell N, counted from the bottom (cell1 is the bottom "
                 "cell)",
    },
}

#: Kinds that carry the pack's current in series (those with a ``resistance``), in this order.
SERIES_KINDS = tuple(k.name for k in KINDS.values() if k.resistance is not None)
#: Kinds whose channels switch the power path.
SWITCH_KINDS = ("fet", "fet_pair_common_drain")
