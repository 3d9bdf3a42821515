"""The limits a design is judged by, resolved once per design: the rules, the yield run and the
review report's charts read them from here, so none of them can judge by a number of its own.

A limit is a rule option after the project's overrides (``[rules.switch-temperature] limit =
"100 °C"``) combined with the part's own rating where both bound the same figure (the lower of
the option and the FET's ``tj_max``). The built-in rules take their option defaults from the
constants below, so a default is written down once.
"""

from __future__ import annotations

from typing import Any, Mapping

from ..records import record
from . import copper
from .fuse import CONTINUOUS_DERATING, curve_ambient_factor, max_continuous_current

__all__ = ["Limits", "JUNCTION_LIMIT", "FUSE_DERATING", "TRACE_RISE", "CHARGE_MARGIN",
           "CELL_AGEING", "FAULT_RESISTANCE", "CONDUCTOR_FINAL", "BALANCE_CYCLE", "BALANCE_TIME",
           "SELF_DISCHARGE_SPREAD", "SERVICE_CYCLES", "VDS_DERATING"]

#: Highest junction temperature allowed in service, below the part's own tj_max [practice:
#: commercial derating T_J ≤ 125 °C, docs/references.md "MOSFETs"].
JUNCTION_LIMIT = 125.0
#: Share of its rating a fuse may carry continuously [practice: 75 % at 25 °C, docs/references.md
#: "Fuses"].
FUSE_DERATING = CONTINUOUS_DERATING
#: Temperature rise a trace is rated for, kelvin [practice: IPC-2221 ratings are commonly read at
#: a 10 K rise].
TRACE_RISE = 10.0
#: How far the overcharge detection must sit above the charger's highest per-cell voltage, volts
#: [practice: end-of-charge noise and the charger's ripple are tens of millivolts].
CHARGE_MARGIN = 0.025
#: How far the cells' internal resistance may have risen at the end of their life, as a factor on
#: the data sheet's maximum [practice: end of life is commonly taken at 1.5-2 x the new
#: resistance, docs/references.md "Events in time"].
CELL_AGEING = 1.5
#: Resistance of the weakest external short the protection must still catch, ohms [published:
#: IEC 62133-2's external short-circuit test, 80 +/- 20 mOhm; value from memory,
#: docs/references.md "Events in time"].
FAULT_RESISTANCE = 0.080
#: Highest temperature a conductor may reach at the end of an event, °C [practice: 160 °C is the
#: short-circuit limit of PVC-insulated copper (IEC 60364-4-43, from 70 °C) and lies within the
#: glass transition of common FR-4 laminates, 130-180 °C [memory]; above it insulation softens
#: and a trace may lift]. Not the melting point: a conductor that nearly melts has failed.
CONDUCTOR_FINAL = 160.0
#: Time from one charge to the next, over which the cells' unequal drains act, seconds [practice:
#: a tool or e-bike pack in daily use is charged about once a day; a pack charged less often
#: drifts further between charges, docs/references.md "Balancing"].
BALANCE_CYCLE = 86400.0
#: Time per charge the balancer bleeds, seconds [practice: a passive balancer bleeds near full,
#: in the charger's constant-voltage phase, which lasts about an hour of a standard CC/CV charge;
#: docs/references.md "Balancing"].
BALANCE_TIME = 3600.0
#: How much two cells' self-discharge may differ, as a share of the cell's own rate, 0..1
#: [memory: cells of one production lot commonly differ in self-discharge by up to about a factor
#: of two; docs/references.md "Balancing"].
SELF_DISCHARGE_SPREAD = 0.5
#: Charge cycles a pack is expected to serve [practice: 300-500 full cycles to 80 % of the rated
#: capacity is the usual cycle-life rating of lithium-ion cells, docs/references.md "Balancing"].
SERVICE_CYCLES = 500
#: Share of its vds_max a switch may block [practice: commercial derating 80 %,
#: docs/references.md "MOSFETs"]; switch-voltage-margin's ``vds_derating``;
#: the turn-off spike's hints (short-circuit-stress) propose values that meet it, so both rules agree.
VDS_DERATING = 0.8


@record(frozen=True)
class Limits:
    """The limits of one design's review.

    ``junction``: switch-temperature's ``limit``; ``fuse_derating``: secondary-protection's
    ``derating``; ``trace_rise``: conductor-capacity's ``delta_t``; ``charge_margin``:
    threshold-ladder's ``charge_margin``; ``cell_ageing`` and ``fault_resistance``:
    short-circuit-reach's ``ageing`` and ``fault_resistance`` (the weakest short's corner);
    ``conductor_final``: conductor-withstand's ``final_temperature``; ``balance_cycle``,
    ``balance_time``, ``self_discharge_spread`` and ``service_cycles``: cell-balance's
    ``cycle_time``, ``balancing_time``, ``self_discharge_spread`` and ``service_cycles``;
    ``vds_derating``: switch-voltage-margin's ``vds_derating`` (the blocking-voltage chart draws it).
    """

    junction: float = JUNCTION_LIMIT
    fuse_derating: float = FUSE_DERATING
    trace_rise: float = TRACE_RISE
    charge_margin: float = CHARGE_MARGIN
    cell_ageing: float = CELL_AGEING
    fault_resistance: float = FAULT_RESISTANCE
    conductor_final: float = CONDUCTOR_FINAL
    balance_cycle: float = BALANCE_CYCLE
    balance_time: float = BALANCE_TIME
    self_discharge_spread: float = SELF_DISCHARGE_SPREAD
    service_cycles: int = SERVICE_CYCLES
    vds_derating: float = VDS_DERATING

    @classmethod
    def of(cls, options: Mapping[str, Any]) -> "Limits":
        """The limits from each rule's options (by rule id) as the design was linted with them;
        a rule that is not loaded leaves its default."""
        temp = options.get("switch-temperature")
        fuse = options.get("secondary-protection")
        trace = options.get("conductor-capacity")
        ladder = options.get("threshold-ladder")
        reach = options.get("short-circuit-reach")
        return cls(getattr(temp, "limit", JUNCTION_LIMIT),
                   getattr(fuse, "derating", FUSE_DERATING),
                   getattr(trace, "delta_t", TRACE_RISE),
                   getattr(ladder, "charge_margin", CHARGE_MARGIN),
                   getattr(reach, "ageing", CELL_AGEING),
                   getattr(reach, "fault_resistance", FAULT_RESISTANCE),
                   getattr(options.get("conductor-withstand"), "final_temperature",
                           CONDUCTOR_FINAL),
                   vds_derating=getattr(options.get("switch-voltage-margin"), "vds_derating",
                                        VDS_DERATING),
                   **_balance_limits(options.get("cell-balance")))

    def junction_ceiling(self, fet: Any) -> float:
        """The highest junction temperature a FET part may reach: the limit or its tj_max."""
        return min(self.junction, fet.tj_max)

    def fuse_current(self, fuse: Any, ambient: float | None = None) -> float:
        """The continuous current a fuse part may carry: its rating, derated, and at ``ambient``
        (°C) by the part's own temperature derating curve where it gives one."""
        points = getattr(fuse, "ambient_derating", None)
        factor = 1.0
        if points and ambient is not None:
            factor = min(1.0, curve_ambient_factor(ambient, [(p.ambient, p.factor / 100.0)
                                                          for p in points]))  # % in the part
        return max_continuous_current(fuse.rated_current, factor, base_factor=self.fuse_derating)

    def trace_capacity(self, trace: Any) -> copper.ConductorRating:
        """The IPC-2221 rating of a trace part at the allowed rise (ValueError off the chart)."""
        return copper.ipc2221_current(trace.width, copper.trace_thickness(trace),
                                      self.trace_rise, trace.layer.value)

    def conductor_start(self, ambient: float) -> float:
        """The temperature a conductor starts an event at, °C: ``ambient`` plus the steady rise
        conductor-capacity allows (a conductor that passes that check runs no hotter)."""
        return ambient + self.trace_rise

    def conductor_withstand(self, area: float, duration: float, ambient: float) -> float:
        """The current a copper conductor of cross-section ``area`` (m²) carries for
        ``duration`` (s) from :meth:`conductor_start` at ``ambient`` to ``conductor_final``
        (IEC 60949's adiabatic form)."""
        return copper.adiabatic_current(area, duration, self.conductor_start(ambient),
                                        self.conductor_final)


def _balance_limits(balance: Any) -> dict[str, Any]:
    """cell-balance's options as the limits' keywords (its defaults when it is not loaded)."""
    return {"balance_cycle": getattr(balance, "cycle_time", BALANCE_CYCLE),
            "balance_time": getattr(balance, "balancing_time", BALANCE_TIME),
            "self_discharge_spread": getattr(balance, "self_discharge_spread",
                                             SELF_DISCHARGE_SPREAD * 100.0) / 100.0,
            "service_cycles": getattr(balance, "service_cycles", SERVICE_CYCLES)}

