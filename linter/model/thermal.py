"""Steady-state junction temperature with temperature-dependent dissipation.

T_J = T_A + P·R_θJA and P_D,max = (T_J,max - T_A)/R_θJA are the data sheet definitions
[published: data sheet definition]. A protection FET's conduction loss I²·R_DS(on) rises with
T_J, so the steady state is a fixed point of T -> T_A + P(T)·R_θJA, and when the loop gain
R_θJA·dP/dT reaches 1 there is none: thermal runaway. Temperatures in °C, power in watts,
R_θJA in K/W.
"""

from __future__ import annotations

import math
from typing import Callable

from ..records import record

__all__ = ["ThermalResult", "junction_temperature", "steady_junction_temperature", "max_power",
           "conduction_power", "accelerated_step"]


@record(frozen=True)
class ThermalResult:
    """Outcome of the fixed-point search.

    ``converged``: a steady state at or below ``tj_max`` was found and ``tj`` is it.
    ``runaway``: no steady state at or below ``tj_max`` exists, either because there is none at all
    or because the one there is lies above the limit; the two are not told apart, both fail a
    design. On runaway ``tj`` and ``power`` are the last iterate, a lower bound on any steady state.
    """

    tj: float
    power: float
    converged: bool
    runaway: bool
    iterations: int
    notes: tuple[str, ...] = ()


def steady_junction_temperature(ambient: float, power: float, theta_ja: float) -> float:
    """T_J = T_A + P·R_θJA for a dissipation that does not depend on temperature."""
    _check_theta(theta_ja)
    return ambient + power * theta_ja


def max_power(tj_max: float, ambient: float, theta_ja: float) -> float:
    """P_D,max = (T_J,max - T_A)/R_θJA in watts.

    Returned as computed: zero or negative means the ambient alone uses up the budget, and the
    amount below zero says by how much.
    """
    _check_theta(theta_ja)
    return (tj_max - ambient) / theta_ja


def conduction_power(current: float, *resistances: float) -> float:
    """I²·ΣR in watts for one current through resistances in series (e.g. both FET channels)."""
    if not resistances:
        raise ValueError("give at least one resistance")
    if any(r < 0.0 or not math.isfinite(r) for r in resistances):
        raise ValueError(f"resistances must be finite and >= 0, got {resistances}")
    return current * current * math.fsum(resistances)


def junction_temperature(ambient: float, power_fn: Callable[[float], float], theta_ja: float,
                         tj_max: float, *, tol: float = 1e-6,
                         max_iter: int = 500) -> ThermalResult:
    """Solve T_J = T_A + P(T_J)·R_θJA for the lowest steady state, up to ``tj_max``.

    ``power_fn(tj)`` returns the dissipation in watts at junction temperature ``tj``, typically
    I²·R_DS(on)(tj). Plain iteration from T_A is used: when P does not fall with temperature (the
    physical case for conduction loss) each step is a lower bound on the lowest steady state, so
    the first step past ``tj_max`` proves there is none below it. If the iteration has not settled
    within ``max_iter`` steps (loop gain close to 1, or P falling with T so the steps oscillate),
    bisection between the last lower bound and ``tj_max`` settles it where a root is bracketed;
    otherwise the result is reported as runaway.
    """
    _check_theta(theta_ja)
    if not (math.isfinite(ambient) and math.isfinite(tj_max)):
        raise ValueError("ambient and tj_max must be finite")
    if tol <= 0.0 or max_iter < 1:
        raise ValueError("tol must be > 0 and max_iter >= 1")

    def step(t: float) -> tuple[float, float]:
        p = power_fn(t)
        if not math.isfinite(p) or p < 0.0:
            raise ValueError(f"power_fn({t:g}) returned {p!r}; it must be finite and >= 0")
        return ambient + p * theta_ja, p

    t = ambient
    # Largest iterate seen with g(t) = f(t) - t >= 0: the low end of any later bisection bracket.
    lower = ambient
    if ambient > tj_max:
        _, p = step(t)
        return ThermalResult(t, p, False, True, 0, ("ambient is already above tj_max",))

    for n in range(1, max_iter + 1):
        nxt, p = step(t)
        if nxt > tj_max:
            return ThermalResult(nxt, power_fn(nxt), False, True, n,
                                 (f"iteration passed tj_max {tj_max:g} °C",))
        if abs(nxt - t) <= tol:
            return ThermalResult(nxt, power_fn(nxt), True, False, n)
        if nxt >= t:
            lower = max(lower, t)
        t = nxt

    def g(x: float) -> float:
        return step(x)[0] - x

    # g(lower) >= 0 by construction, so a sign change by tj_max brackets a steady state below the
    # limit. With P not falling in T, lower is also below the lowest steady state, so bisection
    # lands on that one unless several lie in the bracket.
    if g(tj_max) > 0.0:
        return ThermalResult(t, power_fn(t), False, True, max_iter,
                             (f"no settling after {max_iter} steps and no steady state bracketed "
                              f"below tj_max {tj_max:g} °C; treated as runaway",))
    lo, hi = lower, tj_max
    n = max_iter
    while hi - lo > tol:
        mid = 0.5 * (lo + hi)
        n += 1
        if g(mid) > 0.0:
            lo = mid
        else:
            hi = mid
    return ThermalResult(hi, power_fn(hi), True, False, n,
                         (f"plain iteration did not settle in {max_iter} steps; steady state "
                          f"found by bisection",))


#: The steady states of the model's power path are held to this: |target - T_J| below it, kelvin.
TJ_TOLERANCE = 0.01
#: Fixed points of a path carrying a fixed current: at most this many solves.
LOAD_ITERATIONS = 200
# The permitted-current fixed point T -> T_A + P(T)·R_θJA has a falling P(T) when the FETs are
# the sense resistance (P = V²/R), so plain iteration can overshoot; half steps settle any loop
# gain between -3 and 1 [derived: fixed-point iteration x + w(f(x) - x), |1 - w + w·f'| < 1].
TRIP_DAMPING = 0.5
TRIP_ITERATIONS = 400
#: Far enough above any rating that an iterate this hot can only be a diverging loop.
RUNAWAY_MARGIN = 1000.0

#: A secant step is taken only where the residual falls at least this fast with temperature
#: (loop gain R_θJA·dP/dT at most 0.75), so no step is more than four times the plain one.
SECANT_MIN_FALL = 0.25


def accelerated_step(t: float, target: float, previous: tuple[float, float] | None,
                     damping: float = 1.0) -> float:
    """The next iterate towards the fixed point of ``T -> target(T)``, from ``t``.

    ``previous`` is the iterate before and its residual ``target - T``. The residual of a stable
    balance falls as T rises (loop gain below 1), and for conduction loss it is nearly a straight
    line in T, since R_DS(on) is; the secant through the last two residuals then lands close to
    the root, in two or three steps where the plain iteration takes ten to thirty [published:
    the secant method, any numerical-analysis text]. Where the secant is unreliable (first step,
    no change in T, a slope too flat or of the wrong sign), the plain step ``t + damping·(target -
    t)`` is taken. The caller keeps its own test of convergence on ``|target - t|``, so the
    answer is held to the same tolerance either way.
    """
    residual = target - t
    if previous is not None:
        t0, r0 = previous
        if t != t0:
            slope = (residual - r0) / (t - t0)
            if slope <= -SECANT_MIN_FALL and math.isfinite(slope):
                return t - residual / slope
    return t + damping * residual


def _check_theta(theta_ja: float) -> None:
    if not (theta_ja > 0.0 and math.isfinite(theta_ja)):
        raise ValueError(f"theta_ja must be a finite value > 0 K/W, got {theta_ja}")
