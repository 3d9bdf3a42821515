"""An NTC thermistor in a temperature input's divider: the beta equation and its inverse.

A temperature input biases the thermistor from a reference through a resistor and compares the
pin voltage, as a share of that reference, with its thresholds. A thermistor's resistance falls
as it warms, so the share falls too: a threshold is crossed at one temperature, which follows
from the beta equation (docs/references.md, "Temperature sensing and balancing")::

    R(T) = R25 · exp(B · (1/T - 1/T25))        T in kelvin [published: the makers' standard form]
    share = R(T) / (R(T) + R_bias)               the divider

The trip temperature is monotonic in each of R25, B, the bias resistor and the threshold, so
its lowest and highest over the tolerances lie at corners of the four spreads; every one of the
sixteen is evaluated rather than reasoning which is worst.

Resistances are in ohms, B in kelvin, shares as fractions 0..1, temperatures in °C.
"""

from __future__ import annotations

import itertools
import math

from .values import Span

__all__ = ["T25", "KELVIN", "resistance", "temperature_at", "divider_share", "ntc_for_share",
           "trip_temperature", "trip_span", "resistance_span"]

#: 0 °C in kelvin [published: SI].
KELVIN = 273.15
#: The reference temperature of R25 and of the beta equation, in °C [published].
T25 = 25.0


def resistance(r25: float, beta: float, temp: float) -> float:
    """The thermistor's resistance at ``temp`` °C."""
    return r25 * math.exp(beta * (1.0 / (temp + KELVIN) - 1.0 / (T25 + KELVIN)))


def temperature_at(r25: float, beta: float, r: float) -> float:
    """The temperature, in °C, at which the thermistor has resistance ``r`` (the inverse);
    infinite where no temperature gives it (a resistance the beta form reaches only beyond
    absolute temperatures' end)."""
    inverse = 1.0 / (T25 + KELVIN) + math.log(r / r25) / beta
    return 1.0 / inverse - KELVIN if inverse > 0 else math.inf


def divider_share(r_ntc: float, r_bias: float) -> float:
    """The pin voltage as a share of the reference: the thermistor to ground, the bias above."""
    return r_ntc / (r_ntc + r_bias)


def ntc_for_share(share: float, r_bias: float) -> float:
    """The thermistor resistance that puts the pin at ``share`` of the reference."""
    return r_bias * share / (1.0 - share)


def trip_temperature(r25: float, beta: float, r_bias: float, share: float) -> float:
    """The temperature, in °C, at which the divider crosses ``share`` of its reference."""
    return temperature_at(r25, beta, ntc_for_share(share, r_bias))


def trip_span(r25: Span, beta: Span, r_bias: Span, share: Span) -> Span:
    """The trip temperature's own lowest, typical and highest over every tolerance corner."""
    typ = trip_temperature(r25.typ, beta.typ, r_bias.typ, share.typ)
    temps = [trip_temperature(*c) for c in itertools.product(
        (r25.min, r25.max), (beta.min, beta.max), (r_bias.min, r_bias.max),
        (share.min, share.max))]
    return Span(min(temps), typ, max(temps))


def resistance_span(r25: Span, beta: Span, r: Span) -> Span:
    """The temperature's own lowest, typical and highest at which the thermistor has the
    resistance ``r`` (an input that sources a current into it and compares the voltage: ``r`` is
    the threshold over the current), over every corner of R25, B and ``r``."""
    typ = temperature_at(r25.typ, beta.typ, r.typ)
    temps = [temperature_at(*c) for c in itertools.product(
        (r25.min, r25.max), (beta.min, beta.max), (r.min, r.max))]
    return Span(min(temps), typ, max(temps))


def tolerance_stack(f, spans: dict[str, Span]) -> dict[str, tuple[float, float]]:
    """What each tolerance alone moves ``f``'s result by: ``f`` with that one quantity at its
    lowest and at its highest and every other at its typical value, less ``f`` at typical, in
    the result's unit, as (most negative, most positive). The corners of :func:`trip_span` stack
    these [derived: for a monotone function of each quantity the one-at-a-time ends add up to
    about the corner's spread when the spreads are small]."""
    typ = [s.typ for s in spans.values()]
    base = f(*typ)
    out = {}
    for i, (name, span) in enumerate(spans.items()):
        ends = []
        for v in (span.min, span.max):
            args = list(typ)
            args[i] = v
            ends.append(f(*args) - base)
        out[name] = (min(ends), max(ends))
    return out
