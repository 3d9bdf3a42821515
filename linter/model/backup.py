"""Second-level (backup) overvoltage protection, read from the design: no solve.

A backup protector (kind ``overvoltage_backup``) watches every cell of a series stack on its own;
when one passes its detection it drives current through the heater of a heater fuse in the power
path (directly, or through a switch whose gate it drives), which melts the fuse and opens the pack
for good [practice: docs/references.md, "Over-current levels and second-level protection"]. So it
must act only where the primary protector has failed (its lowest detection above the primary's
highest overcharge detection), before the cell reaches its never-exceed voltage (its highest
detection at or below the cell's overcharge limit), sense each cell at its own tap, and reach a
fuse that interrupts the pack's current. An open cell-tap wire leaves a cell unwatched unless the
primary or the backup detects it.

The rule backup-overvoltage compares; this module gives the figures. Units are SI.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..kinds import SWITCH_KINDS
from ..records import record
from .values import Span

if TYPE_CHECKING:  # pragma: no cover
    from ..netlist import Component
    from .design import DesignModel

__all__ = ["HeaterDrive", "Backup", "backups", "heater_drive_voltage", "open_tap_watchers"]


@record(frozen=True)
class HeaterDrive:
    """A heater fuse the backup's output reaches: ``via`` is the switch package between them
    (``None`` when the output drives the heater itself); ``in_path`` whether the fuse is in series
    with the whole power path; ``power`` the heater's lowest power (W) at the lowest drive voltage
    and its highest resistance, ``None`` where the part gives no heater resistance."""

    fuse: str
    via: str | None
    in_path: bool
    power: float | None
    needed: float | None  # W, the part's heater_power


@record(frozen=True)
class Backup:
    """One backup protector: its per-cell detection window against the primary's overcharge
    detection maximum and the cell's overcharge limit, the tap each cell pin reaches
    ((pin, net, level reached or None, level it should)), and the heater fuses it reaches."""

    refdes: str
    cells: int
    detect: Span
    delay: Span
    primary_max: float | None
    cell_limit: float | None
    taps: tuple
    drives: tuple
    drive_voltage: float | None

    @property
    def above_primary(self) -> float | None:
        """Lowest detection less the primary's highest overcharge detection, V (> 0: clear)."""
        return None if self.primary_max is None else self.detect.min - self.primary_max

    @property
    def below_limit(self) -> float | None:
        """The cell's overcharge limit less the highest detection, V (>= 0: in time)."""
        return None if self.cell_limit is None else self.cell_limit - self.detect.max

    def typical_range(self, margin: float) -> tuple[float, float] | None:
        """The typical detection, V, whose window (its tolerance as it is) lies above the
        primary's highest overcharge detection by more than ``margin`` and within the cell's
        overcharge limit: (lowest, highest); None where either bound is unknown. The lowest is
        excluded (the window must lie strictly above); low >= high says no typical value fits."""
        if self.primary_max is None or self.cell_limit is None:
            return None
        return (self.primary_max + margin + (self.detect.typ - self.detect.min),
                self.cell_limit - (self.detect.max - self.detect.typ))


def heater_drive_voltage(m: "DesignModel", detect_min: float) -> float | None:
    """The lowest stack voltage the heater can be driven from when the backup acts: one cell at
    the backup's lowest detection, every other at the lowest voltage the pack lives at (the
    primary's over-discharge detection minimum, else the cell's cut-off) [derived: the heater
    hangs across the stack through its switch]."""
    stack, limits, p = m.stack, m.cell_limits, m.protector
    if stack is None or limits is None:
        return None
    low = p.part.overdischarge.detect.low if p is not None else limits.cutoff
    return detect_min + (stack.series - 1) * low


def backups(m: "DesignModel") -> tuple[Backup, ...]:
    """Every backup protector of the design, with what :class:`Backup` gives."""
    out = []
    p, limits = m.protector, m.cell_limits
    primary_max = p.part.overcharge.detect.high if p is not None else None
    cell_limit = limits.overcharge_limit if limits is not None else None
    for c in m.netlist.of_kind("overvoltage_backup"):
        part = c.part
        detect = Span.of(part.overvoltage.detect)
        drive = heater_drive_voltage(m, detect.min)
        out.append(Backup(c.refdes, part.cells, detect, Span.of(part.overvoltage.delay),
                          primary_max, cell_limit, _taps(m, c), _drives(m, c, drive), drive))
    return tuple(out)


def open_tap_watchers(m: "DesignModel") -> tuple[str, ...]:
    """The protectors that detect an open cell-tap wire (primary and backups), by reference."""
    found = []
    p = m.protector
    if p is not None and p.part.open_tap_detection:
        found.append(p.refdes)
    found += [c.refdes for c in m.netlist.of_kind("overvoltage_backup")
              if c.part.open_tap_detection]
    return tuple(found)


def _one_resistor_away(m: "DesignModel", net: str) -> set[str]:
    """``net`` and the nets one series resistor away from it (an input filter, a gate resistor)."""
    out = {net}
    for r in m.topology.resistors_at.get(net, ()):
        a, b = r.pins.get("1"), r.pins.get("2")
        out.add(b if a == net else a)
    return out


def _taps(m: "DesignModel", c: "Component") -> tuple:
    if not m.stack_levels:
        return ()
    pins = ((f"cell{k}", c.pins.get(f"cell{k}"), k) for k in range(1, c.part.cells + 1))
    return tuple((pin, net, m.topology.tap_level(net), k) for pin, net, k in pins
                 if net is not None)


def _drives(m: "DesignModel", c: "Component", volts: float | None) -> tuple[HeaterDrive, ...]:
    output = c.pins.get("output")
    if output is None:
        return ()
    driven = _one_resistor_away(m, output)
    # The switches whose gate the output drives: their other pins are what it reaches.
    reach: dict[str, str | None] = {output: None}
    for sw in m.netlist.of_kind(*SWITCH_KINDS):
        gates = {n for pin, n in sw.pins.items() if pin.startswith("g")}
        if gates & driven:
            for pin, n in sw.pins.items():
                if not pin.startswith("g"):
                    reach.setdefault(n, sw.refdes)
    out = []
    for f in m.netlist.of_kind("heater_fuse"):
        heater = f.pins.get("heater")
        if heater not in reach:
            continue
        r = f.part.heater_resistance
        power = volts * volts / r.high if r is not None and volts is not None else None
        out.append(HeaterDrive(f.refdes, reach[heater], m.in_series_with_path(f.refdes), power,
                               f.part.heater_power))
    return tuple(out)
