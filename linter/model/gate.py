"""The gate-source voltage each switch channel really sees, from the power path's own node voltages.

A protector sets up its drive between a gate and a rail, not between a gate and each switch's
source. In a low-side pair driven from the cell the discharge FET's source is the protector's
ground (B−), so it sees the whole drive; the charge FET's source is P−, which the discharge
current lifts above B− by I·R of the path between them, so it sees the drive less that lift
[derived: Kirchhoff's voltage law around gate output, gate, source and ground]. A p-channel pair
on the positive rail is the mirror: the gate is pulled towards the ground, and a source below the
stack top by I·R sees that much less. A driver that floats on each switch's source (a bootstrap
or charge pump, ``gate_drive_boosted``) or turns on an n-channel switch on the positive rail (it
must float to do so) gives every channel its full drive.

The lift is read off a solve of the path as volts per ampere of pack current: the part of the
path between the rail and a source holds no cell, so the lift scales with the current, and the
operating point that asks for it iterates the channels' drive and on-resistance together.
Units are SI: volts, ohms, amperes.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel
    from .topology import Topology

__all__ = ["VGS_TOLERANCE", "lift_nets", "lift_per_ampere", "channel_vgs", "settled", "describe",
           "figure_drives"]

#: Channel drives agree to this between two iterations of an operating point, volts: a
#: thousandth of the smallest detection voltage a protector states (about 100 mV [practice]).
VGS_TOLERANCE = 1e-4


def lift_nets(topology: "Topology", high_side: dict[str, bool]) -> dict[str, tuple[str, str]]:
    """Channel name -> (a, b): the channel's source lift is V(a) − V(b), for the channels whose
    drive is referenced to a rail (others are absent: no lift)."""
    p, stack = topology.protector, topology.stack
    if p is None or stack is None:
        return {}
    if p.part.gate_drive != "cell" and p.part.gate_drive_boosted:
        return {}
    ground = p.pins.get("ground") or stack.bottom
    out: dict[str, tuple[str, str]] = {}
    for ch in topology.channels:
        high = high_side.get(ch.name)
        if ch.channel == "n" and high is False:
            out[ch.name] = (ch.source, ground)
        elif ch.channel == "p" and high:
            out[ch.name] = (stack.top, ch.source)
    return out


def lift_per_ampere(topology: "Topology", high_side: dict[str, bool], sol: Any) -> dict[str, float]:
    """Channel name -> volts its source sits off the drive's rail per ampere of pack current,
    read off the solution ``sol`` of the path under a load (:func:`lift_nets`)."""
    if sol is None:
        return {}
    i_load = abs(sol.current("(load)"))
    if not i_load > 0.0:
        return {}
    out: dict[str, float] = {}
    for name, (a, b) in lift_nets(topology, high_side).items():
        v = sol.voltage_between(a, b) if a in sol.voltages and b in sol.voltages else None
        if v is not None and v > 0.0:
            out[name] = v / i_load
    return out


def channel_vgs(drive: float, lift: dict[str, float], names: Any, current: float) -> dict[str, float]:
    """Each channel's V_GS: the drive less its source's lift at ``current`` amperes."""
    return {name: drive - lift.get(name, 0.0) * current for name in names}


def settled(old: dict[str, float], new: dict[str, float]) -> bool:
    """True when no channel's drive moved by :data:`VGS_TOLERANCE` or more."""
    return all(abs(new[k] - old.get(k, new[k])) < VGS_TOLERANCE for k in new)


def describe(drive: float, vgs: dict[str, float]) -> str | None:
    """The channels whose V_GS differs from the drive, in words; None when none does."""
    low = {k: v for k, v in vgs.items() if drive - v >= 1e-3}
    if not low:
        return None
    each = ", ".join(f"{k} {v:.3g} V" for k, v in sorted(low.items()))
    return (f"V_GS below the {drive:.3g} V drive where a source rides above the drive's rail "
            f"by I·R of the path: {each}")


def figure_drives(m: "DesignModel") -> list[tuple[str, float, str]]:
    """(channel name, V_GS, the figure it enters) for every channel in the operating points the
    design's figures rest on: the trip windows at each end and the switches' heat cases."""
    out: list[tuple[str, float, str]] = []
    windows = (("over-current trip", m.overcurrent_trip), ("short-circuit trip", m.short_circuit_trip))
    for words, window in windows:
        if window is None:
            continue
        for end, op in (("minimum", window.at_min), ("typical", window.at_typ),
                        ("maximum", window.at_max)):
            for ch in m.channels:
                out.append((ch.name, op.channel_vgs.get(ch.name, op.vgs), f"the {words} {end}"))
    cases = {"continuous": "the continuous load's heat", "peak": "the peak load's heat",
             "permitted": "the heat just below the over-current trip"}
    for h in m.switch_heat:
        for name in h.channel_current:
            out.append((name, h.vgs_of(name), cases.get(h.case, h.case)))
    return out
