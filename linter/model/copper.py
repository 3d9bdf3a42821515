"""Copper conductor arithmetic: trace resistance and IPC-2221 current capacity.

Units are SI everywhere in the public API: lengths in metres, temperatures in °C, temperature
rises in kelvin, currents in amperes, resistances in ohms. IPC-2221 itself is written in mils and
square mils; the conversion happens inside, and the area in mil² is echoed in results because that
is the number reviewers compare against the standard's chart.
"""

from __future__ import annotations

import math
from typing import Literal

from ..records import record

__all__ = [
    "RESISTIVITY_20C", "ALPHA_20C", "OZ_THICKNESS", "MIL",
    "copper_resistivity", "trace_resistance", "oz_to_thickness", "thickness_to_oz",
    "ConductorRating", "ipc2221_current", "ipc2221_min_width",
    "IEC60949_K_COPPER", "IEC60949_BETA_COPPER", "COPPER_MELTING",
    "adiabatic_i2t", "adiabatic_current", "adiabatic_min_area", "awg_area",
    "awg_for_area",
]

#: Annealed copper at 20 °C, 1/58 Ω·mm²/m, in Ω·m (IEC 60028 [published]).
RESISTIVITY_20C = 1.0 / 58.0 * 1e-6
#: Temperature coefficient of resistance at 20 °C, per kelvin (IEC 60028 [published]).
ALPHA_20C = 0.00393
#: 1 oz/ft² copper foil is about 35 µm thick [practice]. Mass over density gives about 34 µm
#: [derived]; the trade rounds to 35 µm (1.378 mil) and the IPC-2221 vectors in docs/references.md use
#: that.
OZ_THICKNESS = 35e-6
#: One mil, a thousandth of an inch, in metres (exact by the definition of the inch [published]).
MIL = 25.4e-6

Layer = Literal["outer", "inner"]

# IPC-2221 conductor formula constants: I = k·ΔT^0.44·A^0.725 with I in A, ΔT in °C, A in mil²
# [published]. Inner layers get half of the outer k because buried copper sheds heat worse.
_IPC_K = {"outer": 0.048, "inner": 0.024}
_IPC_B = 0.44
_IPC_C = 0.725

# Usually quoted validity of the IPC-2221 curves [memory]; docs/references.md, "Conductor current
# capacity". Outside them the formula still returns a number, hence flags rather than exceptions.
_IPC_MAX_CURRENT = {"outer": 35.0, "inner": 17.5}
_IPC_DT_RANGE = (10.0, 100.0)
_IPC_MAX_WIDTH_MIL = 400.0
_IPC_OZ_RANGE = (0.5, 3.0)


def copper_resistivity(temp: float = 20.0) -> float:
    """Resistivity of annealed copper at ``temp`` °C, in Ω·m, linear in temperature.

    The single IEC 60028 coefficient is referred to 20 °C; using it linearly is the usual practice
    over board temperatures (roughly -40 to 150 °C) [practice].
    """
    rho = RESISTIVITY_20C * (1.0 + ALPHA_20C * (temp - 20.0))
    if rho <= 0.0:
        raise ValueError(f"temperature {temp} °C is outside the linear resistivity model")
    return rho


def trace_resistance(width: float, thickness: float, length: float, temp: float = 20.0) -> float:
    """Resistance in ohms of a rectangular copper conductor, R = ρ(T)·L / (w·t).

    ``width``, ``thickness`` and ``length`` in metres, ``temp`` in °C. Assumes uniform current
    density (DC): fine for protection paths, wrong for fast edges where skin effect matters.
    """
    _positive(width=width, thickness=thickness)
    if length < 0.0 or not math.isfinite(length):
        raise ValueError(f"length must be a finite value >= 0, got {length}")
    return copper_resistivity(temp) * length / (width * thickness)


def oz_to_thickness(oz: float) -> float:
    """Copper weight in oz/ft² to foil thickness in metres (35 µm per oz [practice])."""
    _positive(oz=oz)
    return oz * OZ_THICKNESS


def trace_thickness(trace) -> float:
    """A trace part's copper thickness: as given, else from its copper weight."""
    return trace.thickness if trace.thickness is not None else oz_to_thickness(trace.copper_weight)


def thickness_to_oz(thickness: float) -> float:
    """Foil thickness in metres to copper weight in oz/ft² (inverse of :func:`oz_to_thickness`)."""
    _positive(thickness=thickness)
    return thickness / OZ_THICKNESS


@record(frozen=True)
class ConductorRating:
    """An IPC-2221 result: the conductor and the current it carries at a given temperature rise.

    ``out_of_range`` lists, in words, every input outside the usual validity range of the curves;
    empty means the formula was used where it is usually trusted.
    """

    current: float
    width: float
    thickness: float
    delta_t: float
    layer: str
    area_mil2: float
    out_of_range: tuple[str, ...]

    @property
    def in_range(self) -> bool:
        return not self.out_of_range


def ipc2221_current(width: float, thickness: float, delta_t: float,
                    layer: Layer = "outer") -> ConductorRating:
    """Current in amperes a conductor carries for a temperature rise ``delta_t`` (K), IPC-2221.

    ``width`` and ``thickness`` in metres; ``layer`` is ``'outer'`` or ``'inner'``.
    """
    k = _layer_k(layer)
    _positive(width=width, thickness=thickness, delta_t=delta_t)
    area = (width / MIL) * (thickness / MIL)
    current = k * delta_t ** _IPC_B * area ** _IPC_C
    return ConductorRating(current, width, thickness, delta_t, layer, area,
                           _ipc_flags(current, width, thickness, delta_t, layer))


def ipc2221_min_width(current: float, thickness: float, delta_t: float,
                      layer: Layer = "outer") -> ConductorRating:
    """Narrowest conductor width in metres that carries ``current`` (A) for a rise ``delta_t``.

    The inverse of :func:`ipc2221_current`: A = (I / (k·ΔT^0.44))^(1/0.725) mil², and
    width = A / thickness.
    """
    k = _layer_k(layer)
    _positive(current=current, thickness=thickness, delta_t=delta_t)
    area = (current / (k * delta_t ** _IPC_B)) ** (1.0 / _IPC_C)
    width = area / (thickness / MIL) * MIL
    return ConductorRating(current, width, thickness, delta_t, layer, area,
                           _ipc_flags(current, width, thickness, delta_t, layer))


def _layer_k(layer: str) -> float:
    try:
        return _IPC_K[layer]
    except KeyError:
        raise ValueError(f"layer must be 'outer' or 'inner', got {layer!r}") from None


def _ipc_flags(current: float, width: float, thickness: float, delta_t: float,
               layer: str) -> tuple[str, ...]:
    flags = []
    limit = _IPC_MAX_CURRENT[layer]
    if current > limit:
        flags.append(f"current {current:.3g} A above the {limit:g} A usually quoted for {layer} "
                     f"layers [memory]")
    lo, hi = _IPC_DT_RANGE
    if not lo <= delta_t <= hi:
        flags.append(f"temperature rise {delta_t:g} K outside the {lo:g}-{hi:g} K range "
                     f"[memory]")
    width_mil = width / MIL
    if width_mil > _IPC_MAX_WIDTH_MIL:
        flags.append(f"width {width_mil:.4g} mil above {_IPC_MAX_WIDTH_MIL:g} mil [memory]")
    oz = thickness / OZ_THICKNESS
    lo, hi = _IPC_OZ_RANGE
    # A small tolerance so 0.5 oz given as 17.5 µm is not flagged for a rounding error.
    if not lo * (1 - 1e-9) <= oz <= hi * (1 + 1e-9):
        flags.append(f"copper {oz:.3g} oz/ft² outside {lo:g}-{hi:g} oz [memory]")
    return tuple(flags)


def _positive(**values: float) -> None:
    for name, value in values.items():
        if not (value > 0.0 and math.isfinite(value)):
            raise ValueError(f"{name} must be a finite value > 0, got {value}")


# --- short-time withstand (adiabatic) ----------------------------------------------------------

#: IEC 60949's adiabatic constants for copper: K in A·s½/mm² and β, the reciprocal of the
#: temperature coefficient referred to 0 °C, in kelvin [published; from memory;
#: docs/references.md "What parts survive over time"].
IEC60949_K_COPPER = 226.0
IEC60949_BETA_COPPER = 234.5
#: Melting point of copper, °C [published: a handbook constant].
COPPER_MELTING = 1083.0


def _withstand_log(initial: float, final: float) -> float:
    """ln((θf + β)/(θi + β)) of IEC 60949's adiabatic equation; > 0 for final above initial."""
    beta = IEC60949_BETA_COPPER
    if not (math.isfinite(initial) and math.isfinite(final)) or initial <= -beta:
        raise ValueError(f"temperatures must be finite and above {-beta} °C, got {initial}, {final}")
    if final <= initial:
        raise ValueError(f"the final temperature {final} °C must be above the initial {initial} °C")
    return math.log((final + beta) / (initial + beta))


def adiabatic_i2t(area: float, initial: float, final: float) -> float:
    """The I²t in A²s that heats a copper conductor of cross-section ``area`` (m²) from
    ``initial`` to ``final`` °C with no heat lost: I²t = K²·S²·ln((θf + β)/(θi + β)), S in mm²
    (IEC 60949's adiabatic form). No heat lost is what makes it a bound that errs safe for
    events shorter than a few seconds, while the copper sheds little into the board or
    insulation [practice]."""
    _positive(area=area)
    s = area * 1e6  # m² -> mm²
    return (IEC60949_K_COPPER * s) ** 2 * _withstand_log(initial, final)


def adiabatic_current(area: float, duration: float, initial: float, final: float) -> float:
    """The current in A a copper conductor of ``area`` (m²) carries for ``duration`` (s) from
    ``initial`` to ``final`` °C: the square root of :func:`adiabatic_i2t` over the duration."""
    _positive(duration=duration)
    return math.sqrt(adiabatic_i2t(area, initial, final) / duration)


def adiabatic_min_area(current: float, duration: float, initial: float, final: float) -> float:
    """The smallest copper cross-section in m² that carries ``current`` (A) for ``duration``
    (s) from ``initial`` to ``final`` °C (the inverse of :func:`adiabatic_current`)."""
    _positive(current=current, duration=duration)
    s = current * math.sqrt(duration / _withstand_log(initial, final)) / IEC60949_K_COPPER
    return s * 1e-6


def awg_area(gauge: int) -> float:
    """Cross-section in m² of a copper conductor of American Wire Gauge ``gauge`` (-3 for
    4/0): d = 0.005 in × 92^((36 − n)/39), area π·d²/4 [published: ASTM B258's definition of the
    gauge]. A stranded wire of that gauge has about the same copper area [practice]."""
    if not -3 <= gauge <= 40:
        raise ValueError(f"AWG gauge must be within -3 (4/0) and 40, got {gauge}")
    d = 0.005 * 0.0254 * 92.0 ** ((36 - gauge) / 39)
    return math.pi / 4 * d * d


def awg_for_area(area: float) -> int | None:
    """The thinnest American Wire Gauge with at least ``area`` m² of copper; None above 4/0."""
    return next((g for g in range(40, -4, -1) if awg_area(g) >= area), None)
