"""What a switch survives in a pulse: transient thermal impedance, avalanche energy.

A single pulse of power P for a time t raises the junction by P·Z_th(t), where Z_th(t) is the
part's single-pulse transient thermal impedance [published: data-sheet convention,
docs/references.md "What parts survive over time"]. Data sheets give it as a curve, often with
a Foster network Z_th(t) = Σ R_i·(1 − e^(−t/τ_i)); for t much longer than the largest τ it
reaches the steady thermal resistance. The energy a FET absorbs when it clamps an inductive
turn-off in avalanche is E = ½·L·I²·V_BR/(V_BR − V_DD) [published in FET makers' application
notes; the formula from memory].

Units are SI: seconds, K/W, henries, amperes, volts, joules.
"""

from __future__ import annotations

import math
from typing import Sequence

from ..records import record

__all__ = ["ZthValue", "foster_zth", "curve_zth", "avalanche_energy"]


@record(frozen=True)
class ZthValue:
    """Z_th at one time, K/W, and how it was read: ``exact`` is False where it is an upper bound
    (before a curve's first point, or the steady resistance after its last)."""

    value: float
    how: str
    exact: bool


def foster_zth(stages: Sequence[tuple[float, float]], t: float) -> float:
    """Z_th(t) = Σ R_i·(1 − e^(−t/τ_i)) of a Foster network given as (R_i K/W, τ_i s) stages."""
    if not stages:
        raise ValueError("a Foster network needs at least one stage")
    if not (t >= 0.0 and math.isfinite(t)):
        raise ValueError(f"time must be finite and >= 0, got {t}")
    for r, tau in stages:
        if not (r > 0.0 and tau > 0.0 and math.isfinite(r) and math.isfinite(tau)):
            raise ValueError(f"each stage needs R > 0 and tau > 0, got ({r}, {tau})")
    # -expm1(-x) is 1 - e^(-x) without the cancellation of short times
    return math.fsum(r * -math.expm1(-t / tau) for r, tau in stages)


def curve_zth(points: Sequence[tuple[float, float]], t: float, steady: float) -> ZthValue:
    """Z_th(t) read off a single-pulse curve given as (t s, Z_th K/W) points, rising in t.

    Between points: a straight line in log Z against log t, as the curve is drawn. Before the
    first point the first point's value, an upper bound (Z_th never falls with t); after the last,
    ``steady`` (R_θJA), the bound a steady state puts on any pulse.
    """
    if not points:
        raise ValueError("a Z_th curve needs at least one point")
    if not (t > 0.0 and math.isfinite(t)):
        raise ValueError(f"time must be finite and > 0, got {t}")
    first, last = points[0], points[-1]
    if t < first[0]:
        return ZthValue(first[1], f"bounded by the curve's first point ({first[0]:.3g} s)", False)
    if t > last[0]:
        return ZthValue(max(steady, last[1]), "beyond the curve's last point: R_θJA", False)
    for (t0, z0), (t1, z1) in zip(points, points[1:]):
        if t0 <= t <= t1:
            f = math.log(t / t0) / math.log(t1 / t0)
            return ZthValue(math.exp(math.log(z0) + f * math.log(z1 / z0)), "from the curve", True)
    return ZthValue(first[1], "from the curve", True)  # a single point, at its own time


def avalanche_energy(inductance: float, current: float, v_br: float, v_dd: float) -> float:
    """E = ½·L·I²·V_BR/(V_BR − V_DD), joules: the energy a FET clamping at V_BR absorbs turning
    off ``current`` through ``inductance`` from a supply ``v_dd``; infinite where V_BR ≤ V_DD
    (the clamp cannot bring the current down)."""
    for name, v in (("inductance", inductance), ("current", current), ("v_br", v_br)):
        if not (v >= 0.0 and math.isfinite(v)):
            raise ValueError(f"{name} must be finite and >= 0, got {v}")
    if v_br <= v_dd:
        return math.inf
    return 0.5 * inductance * current * current * v_br / (v_br - v_dd)
