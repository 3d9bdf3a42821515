"""The charging pulse of a capacitance switched onto a stiff source through a resistance.

When the switches close, the load's input capacitance (a motor controller's bank) charges from
the stack through the whole loop's resistance R: a first-order RC step [derived: textbook circuit
theory, docs/references.md]. With the capacitance empty,

* the current falls from its peak ``I_pk = V/R`` as ``I_pk·exp(-t/τ)``, ``τ = R·C``;
* it stays above a threshold ``I_th < I_pk`` for ``t = τ·ln(I_pk/I_th)``;
* its I²t is ``∫ I² dt = I_pk²·τ/2``;
* the loop dissipates ``½·C·V²`` whatever R is (as much as the capacitance stores), shared by
  the loop's parts in proportion to their resistance.

A pre-charge path charges it through a resistor first; when the main switches close after a delay
``d``, the voltage still across the loop is ``V·exp(-d/τ_pre)`` and the step that follows is the
same pulse from that voltage.

Units are SI: volts, ohms, farads, amperes, seconds, joules, watts.
"""

from __future__ import annotations

import math
from typing import Iterable

from ..records import record

__all__ = ["RcPulse", "equivalent_bank", "voltage_left", "time_to_fall"]


@record(frozen=True)
class RcPulse:
    """The charging pulse of ``farads`` from ``volts`` through ``ohms``."""

    volts: float
    ohms: float
    farads: float

    def __post_init__(self) -> None:
        if not (self.ohms > 0 and self.farads >= 0 and self.volts >= 0) or not all(
                math.isfinite(x) for x in (self.volts, self.ohms, self.farads)):
            raise ValueError(f"need V >= 0, R > 0, C >= 0, finite; got {self.volts}, "
                             f"{self.ohms}, {self.farads}")

    @property
    def peak(self) -> float:
        """The current as the switches close, A."""
        return self.volts / self.ohms

    @property
    def time_constant(self) -> float:
        """τ = R·C, s."""
        return self.ohms * self.farads

    @property
    def i2t(self) -> float:
        """∫ I² dt over the whole pulse = I_pk²·τ/2, A²s [derived]."""
        return self.peak * self.peak * self.time_constant / 2.0

    @property
    def energy(self) -> float:
        """Energy the loop dissipates, ½·C·V², J [derived]."""
        return 0.5 * self.farads * self.volts * self.volts

    def time_above(self, threshold: float) -> float:
        """How long the current stays above ``threshold``: τ·ln(I_pk/I_th), 0 when the peak does
        not reach it."""
        if threshold <= 0:
            raise ValueError(f"threshold must be > 0, got {threshold}")
        if self.peak <= threshold:
            return 0.0
        return self.time_constant * math.log(self.peak / threshold)


def voltage_left(volts: float, tau: float, t: float) -> float:
    """The voltage still across the loop ``t`` seconds into a charge with time constant ``tau``
    (the capacitance at ``volts·(1 - exp(-t/τ))``)."""
    return volts * math.exp(-t / tau) if tau > 0 else 0.0


def time_to_fall(volts: float, tau: float, target: float) -> float:
    """How long a capacitance charged through ``tau`` takes until ``volts`` are left as
    ``target``: the inverse of :func:`voltage_left`, τ·ln(V/V_target) [derived]; 0 when already
    there."""
    return tau * math.log(volts / target) if volts > target > 0 else 0.0


def equivalent_bank(branches: Iterable[tuple[float, float]]) -> tuple[float, float]:
    """(C, ESR) of capacitors in parallel, each given as (C_i, ESR_i), seen by the charging pulse.

    C is the sum. The ESR is the one a single capacitor C would need to have the same admittance
    at low frequency, where the pulse's time constant lives: each branch is
    sC_i/(1 + sC_i·r_i) ≈ sC_i - s²C_i²·r_i, so r = ΣC_i²·r_i / (ΣC_i)² [derived: first-order
    expansion of the branch admittances]. Equal branches give r/n, as in parallel; a small
    capacitor without ESR beside a large one barely moves the large one's.
    """
    pairs = [(c, r) for c, r in branches if c > 0]
    total = sum(c for c, _ in pairs)
    if total <= 0:
        return 0.0, 0.0
    return total, sum(c * c * r for c, r in pairs) / (total * total)
