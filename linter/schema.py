"""Pydantic models of design files and part libraries: the single source of truth for the format.

The JSON Schemas in ``schemas/`` are generated from these models (``packwarden schema``) and checked
for staleness by a test, so editors validate exactly what the linter validates.

Every quantity is text with its unit (``4.25 V``), parsed strictly by :mod:`packwarden.quantities`
and stored as a float in SI units.
"""

# No ``from __future__ import annotations`` here: pydantic would then evaluate every field's
# annotation from a string when each model is created (about 12 ms of every start-up).

import datetime
import functools
import re
from enum import Enum
from pathlib import Path
from types import SimpleNamespace
from typing import Annotated, Any, Literal, Union

from pydantic_core import PydanticCustomError, core_schema

from . import quick

if quick.ON:  # a plain check's quick way: the same classes without pydantic (quick.py)
    from .quick import (AfterValidator, BaseModel, ConfigDict, Discriminator, Field, Tag,
                        model_validator)
else:
    from pydantic import (AfterValidator, BaseModel, ConfigDict, Discriminator, Field, Tag,
                          model_validator)

from .files import Refused, check_path
from .quantities import UNITS, QuantityError, format_quantity, parse_quantity

DESIGN_FORMAT = "packwarden/1"
PARTS_FORMAT = "packwarden-parts/1"


class Strict(BaseModel):
    """Base for every model: unknown keys are errors, data is immutable once validated."""

    # defer_build: each validator is built when first used, not at import (start-up time)
    model_config = ConfigDict(extra="forbid", frozen=True, str_strip_whitespace=True,
                              defer_build=True)


# --- quantities -------------------------------------------------------------------------------

_PREFIX_CLASS = "[YZEPTGMkmuµμnpfa]?"


def _js_escape(text: str) -> str:
    """Escape only regex syntax characters: editors read these patterns as ECMAScript regexes in
    unicode mode, where ``re.escape``'s ``\\ `` and ``\\-`` are errors."""
    return "".join("\\" + ch if ch in r"\^$.|?*+()[]{}" else ch for ch in text)


def _unit_pattern(unit: str) -> str:
    spec = UNITS[unit]
    names = [spec.symbol, *spec.spellings]
    if spec.symbol == "Ω":
        names.append("\u2126")
    alt = "|".join(_js_escape(n) for n in names)
    prefix = _PREFIX_CLASS if spec.prefixes else ""
    optional = "?" if not spec.prefixes and unit not in ("oz",) else ""
    return rf"^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)? ?({prefix}({alt})){optional}$"


class Before:
    """``BeforeValidator(func)`` for a ``func`` of one argument, the value: the same core schema
    (``no_info_before_validator_function`` around the field's own), without pydantic reading
    the function's signature each time a model using the field is built (about 200 times for
    the design's and the library's validators, a tenth of building them)."""

    __slots__ = ("func",)

    def __init__(self, func: Any) -> None:
        self.func = func

    def __get_pydantic_core_schema__(self, source: Any, handler: Any) -> Any:
        return core_schema.no_info_before_validator_function(self.func, handler(source))


def _parser(unit: str, bounds: "Bounds | None" = None):
    def parse(value: Any) -> float:
        try:
            number = parse_quantity(value, unit)
        except QuantityError as exc:
            raise ValueError(str(exc)) from None
        if bounds is not None:
            bounds.check(number, unit)
        return number
    return parse


class Bounds:
    """The physically possible range of one field, beyond its unit's own (ohms are never
    negative): the sign, zero where the model divides by the value, and a ceiling far above any
    battery pack that keeps the arithmetic finite. Checked where the value is read, so the message
    names the file, line and field."""

    __slots__ = ("gt", "ge", "lt", "le")

    def __init__(self, gt: float | None = None, ge: float | None = None,
                 lt: float | None = None, le: float | None = None) -> None:
        self.gt, self.ge, self.lt, self.le = gt, ge, lt, le

    def check(self, value: float, unit: str, what: str = "") -> None:
        if ((self.gt is not None and not value > self.gt) or
                (self.ge is not None and not value >= self.ge) or
                (self.lt is not None and not value < self.lt) or
                (self.le is not None and not value <= self.le)):
            shown = format_quantity(value, UNITS[unit].symbol, digits=6)
            raise ValueError(f"{what}{shown} is out of range: it must be {self.text(unit)}")

    def text(self, unit: str) -> str:
        """``above 0 A and at most 100 kA``."""
        def q(v: float) -> str:
            if unit == "s" and v >= 1000:  # a day reads better as 86400 s than as 86.4 ks
                return f"{v:g} s"
            return format_quantity(v, UNITS[unit].symbol, digits=6)
        parts = [f"{word} {q(v)}" for word, v in (("above", self.gt), ("at least", self.ge),
                                                   ("below", self.lt), ("at most", self.le))
                 if v is not None]
        return " and ".join(parts)


@functools.cache
def Q(unit: str, *, gt: float | None = None, ge: float | None = None,  # noqa: N802 - reads
      lt: float | None = None, le: float | None = None) -> Any:  # like a type in declarations
    """A float field given as text in ``unit``, within the bounds given (see :class:`Bounds`)."""
    bounds = Bounds(gt, ge, lt, le) if (gt, ge, lt, le) != (None,) * 4 else None
    return Annotated[float, QuantitySchema(unit, bounds)]


class QuantitySchema:
    """The schemas of a field in ``unit``: text parsed to a float in SI units, and its JSON
    Schema (a string with the unit's pattern). Given to pydantic whole, so a model with many such
    fields is built without working each one out from general annotations again."""

    def __init__(self, unit: str, bounds: Bounds | None = None) -> None:
        self.unit, self.bounds = unit, bounds
        self.core = core_schema.no_info_before_validator_function(_parser(unit, bounds),
                                                                  core_schema.float_schema())

    def __get_pydantic_core_schema__(self, source: Any, handler: Any) -> Any:
        return self.core

    def __get_pydantic_json_schema__(self, schema: Any, handler: Any) -> dict:
        # units without prefixes (%, °C, K...) also take a bare number
        plain = UNITS[self.unit].prefixes or self.unit == "oz"
        return {**q_schema(self.unit), "type": "string" if plain else ["string", "number"]}


def _example(unit: str) -> str:
    from .quantities import example as ex  # one table of examples
    return ex(UNITS[unit])


Volts, Amps, Ohms = Q("V"), Q("A"), Q("Ω")
Farads, Henries, Watts, Seconds = Q("F"), Q("H"), Q("W"), Q("s")
AmpHours, Percent, Celsius, Kelvin = Q("Ah"), Q("%"), Q("°C"), Q("K")
KelvinPerWatt, AmpSquaredSeconds, Metres = Q("K/W"), Q("A²s"), Q("m")

# The physically possible range of the fields (Bounds): a sign, zero refused where the model
# divides by the value or where zero means the part is absent, and ceilings orders of magnitude
# above any battery pack - the largest traction packs stay below 1 kV and a few kA - which keep
# every product and square the model forms finite [practice].
MAX_VOLTS = 10e3
MAX_AMPS = 100e3
MAX_OHMS = 1e12
MAX_SECONDS = 86400.0  # a day: no protector delay, retry or load peak lasts longer
# Beyond this no lithium pack operates, charges or is stored; such a number is a typo (a unit or
# sign slip), and the temperature models mean nothing there [practice].
LOWEST_C, HIGHEST_C = -100.0, 200.0
HOTTEST_JUNCTION_C = 300.0  # above any silicon or silicon-carbide switch's rating

PositiveVolts = Q("V", gt=0, le=MAX_VOLTS)
PositiveAmps = Q("A", gt=0, le=MAX_AMPS)
LeakageAmps = Q("A", ge=0, le=1.0)  # leakage and quiescent currents: nA to mA
PositiveOhms = Q("Ω", gt=0, le=MAX_OHMS)
PathOhms = Q("Ω", ge=0, le=MAX_OHMS)  # zero is a jumper or a part taken as ideal
PositiveSeconds = Q("s", gt=0, le=MAX_SECONDS)
Temperature = Q("°C", ge=LOWEST_C, le=HIGHEST_C)
Share = Q("%", ge=0, le=100)  # a state of charge, a share of capacity
Tolerance = Q("%", ge=0, lt=100)  # at 100 % the low limit is zero or of the other sign


def drop_titles(node: Any) -> Any:
    # pydantic's per-property titles only repeat the key; editors show descriptions instead.
    if isinstance(node, dict):
        return {k: drop_titles(v) for k, v in node.items()
                if not (k == "title" and isinstance(v, str))}
    if isinstance(node, list):
        return [drop_titles(v) for v in node]
    return node


class Toleranced(Strict):
    """A data-sheet value: any of ``typ``, ``min``, ``max``, or ``typ`` with ``tol``.

    ``tol`` is absolute (same unit) or a percentage of ``typ``. A bare value means ``typ`` only.
    Resolved limits are in ``min``/``typ``/``max``; a limit the data sheet does not give is None.
    """

    typ: float | None = Field(default=None, description=(
        "typical value in SI units, None when the data sheet gives none"))
    min: float | None = Field(default=None, description=(
        "lowest value in SI units: the data sheet's min, or typ - tol; None when neither is "
        "given"))
    max: float | None = Field(default=None, description=(
        "highest value in SI units: the data sheet's max, or typ + tol; None when neither is "
        "given"))

    @property
    def low(self) -> float:
        """The lowest value the part may have, falling back on what is given."""
        return next(v for v in (self.min, self.typ, self.max) if v is not None)

    @property
    def high(self) -> float:
        return next(v for v in (self.max, self.typ, self.min) if v is not None)

    @property
    def nominal(self) -> float:
        if self.typ is not None:
            return self.typ
        if self.min is not None and self.max is not None:
            return (self.min + self.max) / 2
        return self.low


@functools.cache
def given_model(unit: str, gt: float | None = None, ge: float | None = None,
                lt: float | None = None, le: float | None = None) -> type[Strict]:
    """The mapping a toleranced field is written as, each value within the field's bounds; made
    the first time it is asked for (a value given as such a mapping, or the JSON Schema)."""
    if quick.ON and __name__ == "packwarden.schema":
        # the quick way's models are not pydantic's: the mapping is read by pydantic's own
        # model, made from schema.py again (quick.full_schema), into the same values
        return quick.full_schema().given_model(unit, gt, ge, lt, le)
    spec = UNITS[unit]
    q = Q(unit, gt=gt, ge=ge, lt=lt, le=le)

    class Given(Strict):
        typ: q | None = Field(default=None, description=(
            f"typical value as the data sheet prints it, in {spec.name}, e.g. '{_example(unit)}'"))
        min: q | None = Field(default=None, description=(
            f"minimum the data sheet guarantees, in {spec.name}; the linter's worst cases use it"))
        max: q | None = Field(default=None, description=(
            f"maximum the data sheet guarantees, in {spec.name}; the linter's worst cases use it"))
        tol: Annotated[str | float | None, Field(description=(
            f"tolerance around typ: absolute in {spec.symbol} or a percentage ('1 %')"))] = None

    Given.__name__ = Given.__qualname__ = f"Toleranced_{_safe(spec.name)}"
    return Given


@functools.cache
def Tol(unit: str, *, gt: float | None = None, ge: float | None = None,  # noqa: N802
        lt: float | None = None, le: float | None = None) -> Any:
    """A toleranced field in ``unit``: ``{typ, min, max}`` any subset, ``{typ, tol}`` or a bare
    value; every limit, also those worked out from ``tol``, within the bounds given."""
    bounds = Bounds(gt, ge, lt, le) if (gt, ge, lt, le) != (None,) * 4 else None
    parse = _parser(unit, bounds)  # what the Given model parses its typ, min and max with

    def build(value: Any) -> Any:
        if isinstance(value, Toleranced):
            return value
        if not isinstance(value, dict):
            value = {"typ": value}
        given = _plain_limits(value, parse)
        if given is None:
            # the model is made when a design first gives such a value, not at import: most of
            # the ~20 kinds of toleranced field never appear in a given run (start-up time)
            given = given_model(unit, gt, ge, lt, le).model_validate(value)
        return _resolve(given, unit, bounds)

    # The JSON Schema is the same for any bounds (a pattern cannot say them): one model per unit.
    return Annotated[Toleranced, Before(build), TolJsonSchema(unit, bounds)]


#: The keys of a toleranced mapping the direct read takes (schema.Tol).
_GIVEN_KEYS = frozenset({"typ", "min", "max", "tol"})


def _plain_limits(value: dict, parse: Any) -> Any:
    """What the ``Given`` model makes of a mapping of ``typ``, ``min``, ``max`` and ``tol``
    whose limits are each nothing or a value ``parse`` reads, and whose ``tol`` is nothing or
    text with no space around it (the model strips text; what Python's ``strip`` leaves alone,
    pydantic-core's leaves too): the same values, without making that model and its validator
    (a few ms of a cold check). None for any other mapping, which the model validates and words
    the mistake in as ever."""
    tol = value.get("tol")
    if not _GIVEN_KEYS.issuperset(value) or not (
            tol is None or type(tol) is str and tol == tol.strip()):
        return None
    try:
        limits = {k: None if v is None else parse(v) for k, v in value.items() if k != "tol"}
    except Exception:  # noqa: BLE001 - the model says what is wrong
        return None
    return SimpleNamespace(typ=limits.get("typ"), min=limits.get("min"), max=limits.get("max"),
                           tol=tol)


class TolJsonSchema:
    """The JSON Schema of a toleranced field, made only when a schema is asked for: building
    it at import would build the ``Given`` model's validator too, on every start of the linter.
    It also marks the field as toleranced in ``unit`` (:func:`quantity_of`)."""

    def __init__(self, unit: str, bounds: "Bounds | None" = None) -> None:
        self.unit, self.bounds = unit, bounds

    def __get_pydantic_json_schema__(self, core_schema: Any, handler: Any) -> dict:
        given_schema = drop_titles(given_model(self.unit).model_json_schema())
        given_schema["description"] = f"{UNITS[self.unit].name}: any of typ, min, max; or typ with tol"
        return {"anyOf": [given_schema, q_schema(self.unit)]}


def quantity_of(metadata: Any) -> tuple[str, str] | None:
    """``("quantity" | "toleranced", unit)`` of a field declared ``Q(unit)`` or ``Tol(unit)``,
    read from its annotation's markers (``field.metadata``, or an Annotated type's arguments)."""
    for meta in metadata:
        if isinstance(meta, QuantitySchema):
            return "quantity", meta.unit
        if isinstance(meta, TolJsonSchema):
            return "toleranced", meta.unit
    return None


def bounds_of(metadata: Any) -> "Bounds | None":
    """The range a ``Q`` or ``Tol`` field declares (None: only its unit's), for the docs."""
    for meta in metadata:
        if isinstance(meta, (QuantitySchema, TolJsonSchema)):
            return meta.bounds
    return None


def q_schema(unit: str) -> dict:
    spec = UNITS[unit]
    return {"type": "string", "pattern": _unit_pattern(unit),
            "description": f"{spec.name}, e.g. '{_example(unit)}'"}


def _safe(name: str) -> str:
    return re.sub(r"[^A-Za-z0-9]+", "_", name).strip("_")


def _resolve(given: Any, unit: str, bounds: Bounds | None = None) -> Toleranced:
    typ, low, high, tol = given.typ, given.min, given.max, given.tol
    if tol is not None:
        if typ is None:
            raise ValueError("'tol' needs 'typ'")
        if low is not None or high is not None:
            raise ValueError("give either 'tol' or 'min'/'max', not both")
        if isinstance(tol, str) and tol.strip().endswith("%"):
            try:
                pct = parse_quantity(tol, "%")
            except QuantityError as exc:
                raise ValueError(f"tol: {exc}") from None
            if pct >= 100.0:
                # typ - tol would be zero or of the other sign: no part is made that loosely
                raise ValueError(f"'tol' of {pct:g} % leaves no value on its low side; a "
                                 f"tolerance is below 100 %")
            delta = abs(typ) * pct / 100.0
        else:
            try:
                delta = parse_quantity(tol, unit)
            except QuantityError as exc:
                raise ValueError(f"tol: {exc}") from None
        if delta < 0:
            raise ValueError("'tol' must not be negative")
        low, high = typ - delta, typ + delta
        if bounds is not None:
            bounds.check(low, unit, "min (typ - tol) ")
            bounds.check(high, unit, "max (typ + tol) ")
    if typ is None and low is None and high is None:
        raise ValueError("give at least one of 'typ', 'min', 'max'")
    ordered = [v for v in (low, typ, high) if v is not None]
    if ordered != sorted(ordered):
        raise ValueError("limits out of order: need min <= typ <= max")
    # numbers (floats) or None, as the model's fields take them unchanged: made without building
    # its validator, the same object (start-up time)
    return Toleranced.model_construct(typ=typ, min=low, max=high)


def inconsistent(at: str, message: str) -> PydanticCustomError:
    """A cross-field mistake, raised by a model's check and located at its field ``at`` (dotted,
    below the model; list items by number): ``validate`` points at that field's line."""
    path = tuple(int(p) if p.isdigit() else p for p in at.split("."))
    return PydanticCustomError("inconsistent", "{message}", {"message": message, "at": path})


def _q(value: float, unit: str) -> str:
    return format_quantity(value, unit, digits=4)


def _rising(model: BaseModel, names: tuple[tuple[str, bool], ...], unit: str) -> None:
    """Values given among ``names`` must rise in that order: each at least the one given before
    it, or above it where its flag is True. The mistake is reported at the later field."""
    chain = " ".join((("< " if strict else "≤ ") if i else "") + name
                     for i, (name, strict) in enumerate(names))
    before: tuple[str, float] | None = None
    for name, strict in names:
        value = getattr(model, name)
        if value is None:
            continue
        if before is not None and (value < before[1] or (strict and value == before[1])):
            raise inconsistent(name, f"{_q(value, unit)} is {'not above' if strict else 'below'} "
                                     f"{before[0]} {_q(before[1], unit)}; these rise as "
                                     f"{chain}")
        before = (name, value)


# --- design-level sections ----------------------------------------------------------------------

class Range(Strict):
    """A temperature range, lowest to highest."""

    min: Temperature = Field(description="lowest temperature of the range, in degrees Celsius")
    max: Temperature = Field(description="highest temperature of the range, in degrees Celsius")

    @model_validator(mode="after")
    def _ordered(self) -> "Range":
        if self.min > self.max:
            raise ValueError("min is above max")
        return self


class Window(Range):
    """A temperature window something happens within (charging): its ends differ."""

    @model_validator(mode="after")
    def _open(self) -> "Window":
        if self.min == self.max:
            raise inconsistent("max", f"{self.max:g} °C equals min: a window needs min below max")
        return self


class DesignInfo(Strict):
    """What the design is: the name and revision the reports are headed with."""

    name: str = Field(min_length=1, max_length=200, description=(
        "product or board name, as the reports head the design (up to 200 characters)"))
    revision: str | None = Field(default=None, max_length=50, description=(
        "board or schematic revision, e.g. 'C'; shown in the HTML report"))
    description: str | None = Field(default=None, max_length=2000, description=(
        "free text about the design (up to 2000 characters); shown in the HTML report"))


class Terminals(Strict):
    """The nets of the pack's two terminals."""

    pos: str = Field(default="P+", description=(
        "net of the pack's positive terminal, where charger and load connect; the linter puts the "
        "load, the charger and the hard short across the terminals, and exempts them from "
        "single-connection-net"))
    neg: str = Field(default="P-", description=(
        "net of the pack's negative terminal, where charger and load connect; the linter puts the "
        "load, the charger and the hard short across the terminals, and exempts them from "
        "single-connection-net"))

    @model_validator(mode="after")
    def _two_nets(self) -> "Terminals":
        if self.pos == self.neg:
            raise inconsistent("neg", f"'{self.neg}' is also the positive terminal's net: the "
                                      f"terminals would be shorted; give each its own net")
        return self


class Pack(Strict):
    """The pack as a whole: where it works and where its terminals are."""

    ambient: Range = Field(description=(
        "ambient temperature range the pack works in, {min, max} in °C: the highest end heats "
        "the switches (switch-temperature) and sets the over-current trip minimum, the lowest end "
        "the trip maximum, the prospective short circuit and the cell's rebound"))
    terminals: Terminals = Field(default_factory=Terminals, description=(
        "nets of the pack terminals, {pos, neg}; P+ and P- unless named otherwise"))
    wiring_inductance: Q("H", ge=0, le=1e-3) | None = Field(default=None, description=(
        "loop inductance of the wiring from the cells through the board to the load, in henries "
        "(e.g. '200 nH'); when given, the L·di/dt spike "
        "of turning off a short circuit is added to the voltage the discharge switch must block "
        "(switch-voltage-margin, short-circuit-stress)"))


class Peak(Strict):
    """A load peak above the continuous load."""

    current: PositiveAmps = Field(description=(
        "peak load current drawn from the pack terminals, in amperes; a steady-state heat case of "
        "switch-temperature, and the over-current trip minimum must clear it when it lasts longer "
        "than the shortest over-current delay"))
    duration: PositiveSeconds = Field(description=(
        "how long the peak lasts, in seconds, e.g. '40 ms'; compared with the protector's "
        "over-current and over-discharge delays"))


class Regen(Strict):
    """Current the load drives back into the pack (a motor braking), at the terminals."""

    current: PositiveAmps = Field(description=(
        "peak regenerative current into the pack terminals, in amperes, e.g. '12 A'; it flows "
        "the charge way through the switches, so the charge over-current detection must clear "
        "it or the charge switch opens while braking, and without that detection the cells "
        "must take it (charge-current-window)"))
    duration: PositiveSeconds = Field(description=(
        "how long the regenerative peak lasts, in seconds, e.g. '3 s'; compared with the charge "
        "over-current delay (charge-current-window)"))


class Load(Strict):
    """What the product draws from the pack."""

    continuous: PositiveAmps = Field(description=(
        "continuous load current drawn from the pack terminals, in amperes: the over-current trip "
        "minimum must clear it (trip-current-window) and the switches must carry it cool at the "
        "highest ambient (switch-temperature)"))
    peak: Peak | None = Field(default=None, description=(
        "a peak load above the continuous one, {current, duration}"))
    input_capacitance: Q("F", gt=0, le=100.0) | None = Field(default=None, description=(
        "capacitance across the load's input (a motor controller's bank), in farads, e.g. "
        "'2200 uF'; with any capacitor the design places across the pack terminals it is charged "
        "through the whole loop when the switches close (switch-on-inrush)"))
    input_esr: Q("Ω", ge=0, le=1e3) | None = Field(default=None, description=(
        "equivalent series resistance of that capacitance, in ohms, e.g. '15 mΩ'; part of the "
        "inrush loop's resistance (taken as zero when absent, the highest peak)"))
    regen: Regen | None = Field(default=None, description=(
        "regenerative current the load drives back into the pack, {current, duration}; without "
        "it the load is taken never to charge the pack"))

    @model_validator(mode="after")
    def _peak_above(self) -> "Load":
        if self.peak is not None and self.peak.current < self.continuous:
            raise inconsistent("peak.current", f"{_q(self.peak.current, 'A')} is below the "
                                               f"continuous load {_q(self.continuous, 'A')}; a "
                                               f"peak is at least the continuous load")
        if self.input_esr is not None and self.input_capacitance is None:
            raise inconsistent("input_esr", "an ESR without its input_capacitance; give the "
                                            "capacitance it belongs to")
        return self


class ReversePolarity(str, Enum):
    possible = "possible"
    prevented = "prevented"


Ratio = Tol("%", gt=0, lt=100)  # a share of a reference voltage
ThresholdVolts = Tol("V", gt=0, le=MAX_VOLTS)  # a comparator threshold as a pin voltage


class ChargerThermistor(Strict):
    """The charger's temperature input: the pack's thermistor it reads, its bias, its thresholds."""

    ntc: str = Field(min_length=1, max_length=40, description=(
        "reference designator of the NTC thermistor (a component of kind 'ntc') the charger "
        "reads, e.g. 'RT1'"))
    bias: Tol("Ω", gt=0, le=MAX_OHMS) = Field(description=(
        "the charger's bias resistor from its reference to the thermistor (toleranced ohms, "
        "e.g. {typ: 10 kΩ, tol: 1 %})"))
    cold: Ratio | None = Field(default=None, description=(
        "charging stops while the thermistor's voltage is above this share of the reference "
        "(toleranced percent); or give cold_voltage"))
    hot: Ratio | None = Field(default=None, description=(
        "charging stops while the thermistor's voltage is below this share of the reference "
        "(toleranced percent); or give hot_voltage"))
    reference: Tol("V", gt=0, le=MAX_VOLTS) | None = Field(default=None, description=(
        "the voltage the bias resistor is tied to, with its tolerance (toleranced volts); "
        "needed for thresholds given in volts"))
    cold_voltage: ThresholdVolts | None = Field(default=None, description=(
        "the cold threshold as the thermistor's voltage (toleranced volts), instead of cold"))
    hot_voltage: ThresholdVolts | None = Field(default=None, description=(
        "the hot threshold as the thermistor's voltage (toleranced volts), instead of hot"))
    cold_release: Ratio | None = Field(default=None, description=(
        "charging resumes once the thermistor's voltage falls below this share of the "
        "reference (toleranced percent): the cold threshold's hysteresis"))
    hot_release: Ratio | None = Field(default=None, description=(
        "charging resumes once the thermistor's voltage rises above this share of the "
        "reference (toleranced percent): the hot threshold's hysteresis"))
    cold_release_voltage: ThresholdVolts | None = Field(default=None, description=(
        "cold_release as a voltage (toleranced volts)"))
    hot_release_voltage: ThresholdVolts | None = Field(default=None, description=(
        "hot_release as a voltage (toleranced volts)"))

    @model_validator(mode="after")
    def _ordered(self) -> "ChargerThermistor":
        for end in ("cold", "hot"):
            if getattr(self, end) is None and getattr(self, f"{end}_voltage") is None:
                raise inconsistent(end, f"give the {end} threshold: {end} (a share) or "
                                        f"{end}_voltage")
        _threshold_forms(self, *({n: (f"{n}{suffix}", getattr(self, f"{n}{suffix}"))
                                  for n in ("cold", "hot")}
                                 for suffix in ("", "_voltage", "_release", "_release_voltage")),
                         sourced=False)
        if self.cold is None or self.hot is None:
            return self
        if self.cold.nominal <= self.hot.nominal:
            raise inconsistent("hot", f"{_q(self.hot.nominal, '%')} is not below cold "
                                      f"{_q(self.cold.nominal, '%')}: a hot thermistor pulls "
                                      f"the input lower than a cold one")
        return self


class Charger(Strict):
    """The charger the pack is charged with, as seen at the pack terminals."""

    voltage: Tol("V", gt=0, le=MAX_VOLTS) = Field(description=(
        "regulated charge voltage of the whole pack with its tolerance (toleranced volts, e.g. "
        "{typ: 4.20 V, tol: 0.5 %}); divided by the series cell count, its maximum must stay "
        "within the cell's upper_limit and below the overcharge detection (threshold-ladder)"))
    current: PositiveAmps = Field(description=(
        "charge current, in amperes, shared by the cells in parallel: it must not exceed their "
        "max_current.charge (charge-conditions), and it sets the cell's rebound when an overcharge "
        "cut-off stops it (release-hysteresis)"))
    open_circuit_max: PositiveVolts = Field(description=(
        "highest voltage the charger puts on the pack terminals with no cell connected, worst case "
        "over its faults, in volts: the charge switch must block it against a depleted stack, and "
        "reversed it adds to the stack across the discharge switch, the sense-pin resistor and the "
        "capacitors"))
    reverse_polarity: ReversePolarity = Field(default=ReversePolarity.possible, description=(
        "'possible' when the charger can be connected the wrong way round (no keyed connector), "
        "'prevented' when the mechanics rule it out; with 'possible' the reversed-charger cases "
        "are checked (switch-voltage-margin, support-network)"))
    temperature_window: Window | None = Field(default=None, description=(
        "temperatures outside which the charger stops charging (its NTC input or own sensing), "
        "{min, max} in °C; must lie inside the cell's charge_temperature (charge-conditions); "
        "without it, an ambient range beyond the cell's window is a warning"))
    fault_voltage: PositiveVolts | None = Field(default=None, description=(
        "highest voltage the charger puts out after a single fault of its regulation (its "
        "current limit still acting), at the pack terminals, in volts; the cells are pushed "
        "towards it at the charger's current until the overcharge detection's delay ends "
        "(charger-fault-overshoot); between the highest regulated voltage and "
        "open_circuit_max; when absent, 1.4 × the cell's upper limit per cell, IEC 62133-2's "
        "overcharge test supply [memory], at most open_circuit_max"))
    thermistor: ChargerThermistor | None = Field(default=None, description=(
        "the charger's temperature input: {ntc, bias, cold, hot}, the pack's thermistor it reads "
        "and the thresholds it stops charging at; from it the charge-inhibit temperatures are "
        "computed over every tolerance (charge-inhibit-window)"))

    @model_validator(mode="after")
    def _open_circuit_above(self) -> "Charger":
        # with no cell to load it, the output sits at least at its regulation [practice]
        if self.open_circuit_max < self.voltage.high:
            raise inconsistent("open_circuit_max", (
                f"{_q(self.open_circuit_max, 'V')} is below the highest regulated charge "
                f"voltage {_q(self.voltage.high, 'V')}; with no cell connected a charger's "
                f"output is at least its regulation voltage"))
        return self

    @model_validator(mode="after")
    def _fault_between(self) -> "Charger":
        v = self.fault_voltage
        if v is not None and not self.voltage.high <= v <= self.open_circuit_max:
            raise inconsistent("fault_voltage", (
                f"{_q(v, 'V')} is outside {_q(self.voltage.high, 'V')} (the highest regulated "
                f"voltage) to {_q(self.open_circuit_max, 'V')} (open_circuit_max, the worst case "
                f"over the charger's faults)"))
        return self


class Storage(Strict):
    """How the product is stored or shipped before use."""

    soc: Share = Field(description=(
        "state of charge the pack ships or is stored at, in percent of full, e.g. '40 %'; "
        "storage-drain counts the charge above the over-discharge cut-off from it"))
    duration: Q("months", gt=0, le=1200) = Field(description=(
        "longest time on the shelf, in months (of 730 hours), e.g. '12 months'; the pack must "
        "last it above the cut-off (warning) and above the cell's lower limit (error)"))
    temperature: Temperature = Field(default=25.0, description=(
        "storage temperature, in °C; the cell's 25 °C self-discharge is scaled by doubling per "
        "10 °C [practice]"))
    standby_current: LeakageAmps | None = Field(default=None, description=(
        "what the product draws from the pack terminals while stored in it (sleep or ship "
        "mode), in amperes, e.g. '15 µA'; usually the largest drain on the shelf. It drains every "
        "cell until the over-discharge cut-off, and after it no more than the off discharge "
        "switches leak; '0 A' for a pack stored on its own or a ship mode that disconnects. "
        "Without it, nothing is counted before the cut-off and the switches' full leakage "
        "after it"))


class Waiver(Strict):
    """An accepted finding, on the record: which rule, which element, why and until when."""

    rule: str = Field(min_length=1, description=(
        "id of the rule whose findings are accepted, e.g. 'trip-current-window'"))
    element: str | None = Field(default=None, description=(
        "the element the finding concerns, usually a reference designator such as 'U1'; without "
        "it the waiver covers every finding of the rule in this design"))
    reason: str = Field(min_length=3, description=(
        "why the finding is accepted, e.g. a test report number (at least 3 characters); shown "
        "beside each waived finding"))
    approved_by: str | None = Field(default=None, description=(
        "who accepted the risk; kept on record, not checked"))
    expires: datetime.date | None = Field(default=None, description=(
        "last day the waiver applies, YYYY-MM-DD; after it the findings count again and "
        "waiver-hygiene reports the expired waiver as an error"))
    up_to: Annotated[str, AfterValidator(lambda v: _ceiling(v))] | None = Field(
        default=None, description=(
            "the highest value of the finding's headline figure the waiver accepts, with its "
            "unit, e.g. '1.5 A', for a finding that worsens as the figure grows: a finding beyond "
            "it is not waived and says why; docs/rules.md names each rule's headline figures "
            "and their bound"))
    down_to: Annotated[str, AfterValidator(lambda v: _ceiling(v))] | None = Field(
        default=None, description=(
            "the lowest value of the finding's headline figure the waiver accepts, with its unit, "
            "e.g. '1.2 A', for a finding that worsens as the figure falls (a trip minimum below "
            "the load): a finding below it is not waived and says why"))


def _ceiling(text: str) -> str:
    """A waiver's ``up_to`` must name a value and its unit (checked here, read in waivers.py)."""
    from .quantities import QuantityError, parse_any_quantity
    try:
        parse_any_quantity(text)
    except QuantityError as exc:
        raise ValueError(str(exc)) from None
    return text


NetName = Annotated[str, Before(lambda v: str(v) if isinstance(v, int) and not isinstance(v, bool) else v),
                    Field(min_length=1, max_length=100)]
Pins = Union[dict[str, NetName], list[NetName]]

_PINS_TEXT = ("nets the component's pins connect to: a mapping pin -> net, e.g. {pos: B+, neg: "
              "B-}; two-terminal parts may give a list of nets in pin order, e.g. [B+, P+]. Nets "
              "are joined by name; docs/format.md lists each kind's pins. Left out for a component "
              "of the schematic's netlist, which gives them; given, they override its pins of the "
              "same names (a list replaces them all)")
_NOTE_TEXT = "free text for reviewers, e.g. an assembly remark; not checked"

PinNumber = Annotated[str, Before(lambda v: str(v) if isinstance(v, int) and not isinstance(v, bool) else v),
                      Field(min_length=1, max_length=20)]


class Packaged(Strict):
    """Base of every part kind: how the package's numbered pins map onto the part's pins."""

    pinout: dict[PinNumber, Annotated[str, Field(min_length=1, max_length=40)]] | None = Field(
        default=None, max_length=400, description=(
            "package pin number -> the part's pin name, for designs read from a schematic's "
            "netlist, e.g. {'1': s1, '2': s1, '3': g1}; several numbers may name one pin (they "
            "must then share a net). Without it, pins are matched by the symbol's pin names, "
            "and two-terminal parts by pin order"))


# --- part kinds ---------------------------------------------------------------------------------

class Chemistry(str, Enum):
    lco = "lco"
    nmc = "nmc"
    nca = "nca"
    lfp = "lfp"
    lmo = "lmo"
    lto = "lto"


CellVolts = Q("V", gt=0, le=10.0)  # per cell: every lithium chemistry stays below 5 V


class CellVoltages(Strict):
    """The cell's voltage limits, per cell, as its data sheet gives them."""

    charge: CellVolts = Field(description=(
        "standard charge voltage (the constant-voltage set point of the data sheet's charge "
        "method), per cell, in volts; upper_limit defaults to it plus 50 mV"))
    upper_limit: CellVolts | None = Field(default=None, description=(
        "highest charge voltage the cell maker allows (IEC 62133-2's upper limit charging "
        "voltage), per cell, in volts; the charger's maximum per cell must not exceed it "
        "(threshold-ladder); when absent, charge + 50 mV [practice]"))
    overcharge_limit: CellVolts | None = Field(default=None, description=(
        "voltage the cell must never reach, even when the charger fails (the data sheet's "
        "'never exceed'), per cell, in volts; the overcharge detection maximum must stay below it "
        "(threshold-ladder); when absent, the chemistry's default"))
    nominal: CellVolts = Field(description=(
        "nominal (rated mean) voltage per cell, in volts; the cells' source voltage in the "
        "linter's solves of the power path"))
    cutoff: CellVolts = Field(description=(
        "discharge cut-off voltage the rated capacity is measured to, per cell, in volts; quoted "
        "beside the over-discharge detection in findings"))
    lower_limit: CellVolts | None = Field(default=None, description=(
        "voltage the cell must never be discharged below (the data sheet's 'never discharge "
        "below'), per cell, in volts; the over-discharge detection minimum must stay above it "
        "(threshold-ladder) and a stored pack must not sink to it (storage-drain); when absent, "
        "the chemistry's default"))

    @model_validator(mode="after")
    def _ordered(self) -> "CellVoltages":
        _rising(self, (("lower_limit", False), ("cutoff", False), ("nominal", True),
                       ("charge", True), ("upper_limit", False), ("overcharge_limit", False)), "V")
        return self


class CellCurrents(Strict):
    """The cell's current ratings, per cell."""

    discharge: PositiveAmps = Field(description=(
        "maximum continuous discharge current per cell, in amperes; times the cells in parallel, "
        "the current the protection permits for ever must not exceed it (trip-current-window)"))
    charge: PositiveAmps = Field(description=(
        "maximum charge current per cell, in amperes; times the cells in parallel, the charger "
        "current must not exceed it (charge-conditions)"))


class OcvPoint(Strict):
    """One row of an open-circuit voltage table."""

    soc: Share = Field(description="state of charge, in percent of full, e.g. '40 %'")
    voltage: CellVolts = Field(description=(
        "open-circuit (rested) voltage per cell at that state of charge, in volts, at 25 °C"))


class PulseRating(Strict):
    """One pulse discharge rating of a cell: a current it delivers for up to a duration."""

    current: PositiveAmps = Field(description="pulse discharge current per cell, in amperes")
    duration: PositiveSeconds = Field(description=(
        "longest duration of that pulse, in seconds, e.g. '10 s'"))


class Recovery(Strict):
    """What the cell maker allows for a cell found below its lower limit."""

    allowed: bool = Field(default=True, description=(
        "false when the cell maker forbids charging a cell that fell below its lower limit "
        "(it must be scrapped); a protector that charges it is then an error "
        "(deep-discharge-recovery)"))
    precharge_current: PositiveAmps | None = Field(default=None, description=(
        "highest charge current per cell the maker allows while the cell is below recovery_voltage, "
        "in amperes, e.g. '0.1 A'; when absent, 0.1 C of the rated capacity [practice]"))
    recovery_voltage: CellVolts | None = Field(default=None, description=(
        "cell voltage up to which only the pre-charge current is allowed, per cell, in volts; "
        "recorded and quoted in findings; when absent, the cell's cutoff"))


class Cell(Packaged):
    """A lithium-ion cell; cells in series and parallel form the stack from their pins."""

    kind: Literal["cell"] = Field(description="the part kind: 'cell'")
    chemistry: Chemistry = Field(description=(
        "cell chemistry: lco, nmc, nca, lfp, lmo or lto; picks the default voltage limits and "
        "OCV table where the data sheet is silent, and must be one the protector is made for"))
    capacity: Q("Ah", gt=0, le=10e3) = Field(description=(
        "rated capacity, in ampere-hours, e.g. '3400 mAh'; the charge storage-drain budgets"))
    voltage: CellVoltages = Field(description=(
        "voltage limits per cell: {charge, upper_limit, overcharge_limit, nominal, cutoff, "
        "lower_limit}"))
    internal_resistance: Tol("Ω", gt=0, le=100.0) = Field(description=(
        "DC internal resistance per cell (toleranced ohms, the data sheet's typ and max; an AC "
        "1 kHz figure reads low): its lowest value sets the prospective short-circuit current, its "
        "highest the voltage rebound after a cut-off, raised further at cold"))
    max_current: CellCurrents = Field(description=(
        "current ratings per cell: {discharge, charge}"))
    charge_temperature: Window | None = Field(default=None, description=(
        "temperatures the cell may be charged at, {min, max} in °C; when absent, 0-45 °C "
        "[practice] (charge-conditions)"))
    self_discharge: Q("%/month", ge=0, le=100) | None = Field(default=None, description=(
        "self-discharge at 25 °C, in percent of capacity per month, e.g. '2 %/month'; when "
        "absent, 2 %/month [practice] (storage-drain)"))
    ocv: list[OcvPoint] | None = Field(default=None, description=(
        "the cell's own open-circuit voltage table, a list of {soc, voltage}; when absent, the "
        "chemistry's table; storage-drain turns voltages into charge with it"))
    pulse_discharge: list[PulseRating] | None = Field(default=None, max_length=20, description=(
        "pulse discharge ratings per cell, a list of {current, duration}: the cell delivers "
        "that current for up to that long; every event above the continuous rating must fit "
        "under one (cell-pulse-rating); when absent, an info finding says what is needed"))
    recovery: Recovery | None = Field(default=None, description=(
        "what the maker allows for a cell below its lower limit, {allowed, precharge_current, "
        "recovery_voltage}; when absent, recovery allowed at 0.1 C [practice] "
        "(deep-discharge-recovery)"))
    discharge_temperature: Window | None = Field(default=None, description=(
        "temperatures the cell may be discharged at, {min, max} in °C (NMC and LiFePO4 data "
        "sheets commonly give -20-60 °C [practice]); the pack's hottest ambient plus its "
        "self-heating must stay below the max, or a discharge over-temperature cut-off must "
        "stop it there (discharge-overtemperature); when absent, -20-60 °C, the common figure "
        "[practice]"))


class ReleaseOn(str, Enum):
    charger = "charger"
    voltage = "voltage"
    load_removal = "load_removal"
    auto_retry = "auto_retry"


class Threshold(Strict):
    """One detection of the protector: where it trips, after how long, and what releases it."""

    detect: Tol("V", gt=0, le=MAX_VOLTS) = Field(description=(
        "detection voltage with its accuracy (toleranced volts): per cell for overcharge and "
        "over-discharge; between the sense and ground pins for over-current and short circuit, "
        "where divided by the sense resistance it gives the trip current"))
    release: Tol("V", gt=0, le=MAX_VOLTS) | None = Field(default=None, description=(
        "release (recovery) voltage per cell, for a release by voltage (toleranced volts); it must "
        "lie on the safe side of the detection (threshold-ladder) by more than the cell's rebound "
        "(release-hysteresis)"))
    delay: Tol("s", ge=0, le=MAX_SECONDS) = Field(description=(
        "detection delay time (toleranced seconds): a load peak longer than its shortest must not "
        "trip (trip-current-window); its longest is how long an overload or short flows "
        "(short-circuit-stress, secondary-protection)"))
    release_on: list[ReleaseOn] = Field(default_factory=list, description=(
        "what releases the protection once tripped, any of: voltage (the cell recovers past "
        "release), charger (a charger is connected), load_removal (the load is removed), "
        "auto_retry (it retries on its own)"))


class CurrentThreshold(Threshold):
    """An over-current or short-circuit detection; it may release by retrying on its own."""

    retry_period: PositiveSeconds | None = Field(default=None, description=(
        "time between automatic retries, in seconds (with release_on: [auto_retry]); each retry "
        "repeats the fault current into the switches (release-hysteresis); when absent, 0.1 s "
        "[memory]"))

    @model_validator(mode="after")
    def _retrying(self) -> "CurrentThreshold":
        if self.retry_period is not None and ReleaseOn.auto_retry not in self.release_on:
            raise ValueError("'retry_period' needs 'auto_retry' in 'release_on'")
        return self


class OhmsRange(Strict):
    """A recommended resistance range."""

    min: PathOhms | None = Field(default=None, description=(
        "lowest recommended resistance, in ohms"))
    max: PathOhms | None = Field(default=None, description=(
        "highest recommended resistance, in ohms"))

    @model_validator(mode="after")
    def _ordered(self) -> "OhmsRange":
        if self.min is not None and self.max is not None and self.min > self.max:
            raise ValueError("min is above max")
        return self


Capacitance = Q("F", gt=0, le=100.0)  # up to the largest supercapacitors


class FaradsRange(Strict):
    """A recommended capacitance range."""

    min: Capacitance | None = Field(default=None, description=(
        "lowest recommended capacitance, in farads"))
    max: Capacitance | None = Field(default=None, description=(
        "highest recommended capacitance, in farads"))

    @model_validator(mode="after")
    def _ordered(self) -> "FaradsRange":
        if self.min is not None and self.max is not None and self.min > self.max:
            raise ValueError("min is above max")
        return self


class SupplyFilter(Strict):
    """The protector maker's recommended supply filter: series resistor and capacitor ranges."""

    r: OhmsRange | None = Field(default=None, description=(
        "recommended series resistor from the cell's positive terminal to the supply pin, "
        "{min, max} in ohms; when absent, 300 Ω-1 kΩ [practice] (support-network)"))
    c: FaradsRange | None = Field(default=None, description=(
        "recommended capacitor from the supply pin to ground, {min, max} in farads; when absent, "
        "22 nF-1 µF [practice] (support-network)"))


class SupplyCurrent(Strict):
    """The protector's own current consumption."""

    operating: Tol("A", ge=0, le=1.0) = Field(description=(
        "supply current in normal operation (toleranced amperes, the data sheet's current "
        "consumption); its maximum times the supply filter resistance shifts a single-cell "
        "protector's thresholds (support-network), and it drains a stored pack (storage-drain)"))
    power_down: Tol("A", ge=0, le=1.0) | None = Field(default=None, description=(
        "supply current after an over-discharge cut-off (power-down or standby, toleranced "
        "amperes); it drains the cells on towards their lower limit; when absent, the operating "
        "current"))


class LowVoltagePath(str, Enum):
    charge_switch = "charge_switch"
    body_diode = "body_diode"
    current_limit = "current_limit"


class LowVoltageCharge(Strict):
    """Whether the protector lets a cell that sits below its lower limit (down to 0 V) be
    charged, and how."""

    allowed: bool = Field(description=(
        "true when the part charges a cell at any voltage (a '0 V charge allowed' option), false "
        "when it inhibits charging below inhibit_below"))
    inhibit_below: CellVolts | None = Field(default=None, description=(
        "with allowed: false, the cell voltage below which the part keeps the charge switch off, "
        "per cell, in volts (toleranced parts: its highest); a cell between it and its lower "
        "limit is still charged (deep-discharge-recovery)"))
    path: LowVoltagePath = Field(default=LowVoltagePath.charge_switch, description=(
        "how such a cell is charged: 'charge_switch' (switched on as usual), 'body_diode' "
        "(through the charge switch's body diode with the switch off) or 'current_limit' (a "
        "limited pre-charge current, given as current); the first two pass the charger's full "
        "current"))
    current: PositiveAmps | None = Field(default=None, description=(
        "with path: current_limit, the highest current the part lets flow into the pack while a "
        "cell is low, in amperes"))

    @model_validator(mode="after")
    def _complete(self) -> "LowVoltageCharge":
        if self.allowed and self.inhibit_below is not None:
            raise inconsistent("inhibit_below", "an inhibit voltage with allowed: true; give "
                                                "allowed: false for a part that inhibits")
        if not self.allowed and self.inhibit_below is None:
            raise inconsistent("allowed", "allowed: false needs inhibit_below, the cell voltage "
                                          "below which charging is inhibited")
        if (self.path == LowVoltagePath.current_limit) != (self.current is not None):
            raise inconsistent("current" if self.current is not None else "path", (
                "a limited current goes with path: current_limit, and path: current_limit "
                "needs its current"))
        return self


class ThresholdShares(Strict):
    """The four thresholds of a temperature input as shares of its reference (toleranced
    percent); here the levels at which a tripped threshold releases."""

    charge_cold: Ratio | None = Field(default=None, description=(
        "charging resumes once the pin falls below this share (toleranced percent)"))
    charge_hot: Ratio | None = Field(default=None, description=(
        "charging resumes once the pin rises above this share (toleranced percent)"))
    discharge_cold: Ratio | None = Field(default=None, description=(
        "discharge resumes once the pin falls below this share (toleranced percent)"))
    discharge_hot: Ratio | None = Field(default=None, description=(
        "discharge resumes once the pin rises above this share (toleranced percent)"))


class ThresholdLevels(Strict):
    """The four thresholds of a temperature input as pin voltages (toleranced volts): for a
    data sheet that gives its comparators in volts against a stated reference, or an input that
    sources a current into the thermistor."""

    charge_cold: ThresholdVolts | None = Field(default=None, description=(
        "charge-inhibit cold threshold as a pin voltage (toleranced volts)"))
    charge_hot: ThresholdVolts | None = Field(default=None, description=(
        "charge-inhibit hot threshold as a pin voltage (toleranced volts)"))
    discharge_cold: ThresholdVolts | None = Field(default=None, description=(
        "discharge cut-off cold threshold as a pin voltage (toleranced volts)"))
    discharge_hot: ThresholdVolts | None = Field(default=None, description=(
        "discharge over-temperature threshold as a pin voltage (toleranced volts)"))


def _threshold_forms(model: Any, shares: dict, volts: dict, release: dict,
                     release_volts: dict, sourced: bool) -> None:
    """The checks a temperature input's thresholds share, whichever form they take: each given
    once, as a share or as a voltage; volts need the reference (or the sourced current); a
    release only beside its threshold, on the side a warming or cooling thermistor crosses it
    after tripping (a hot thermistor pulls the pin low)."""
    reference = model.reference

    def share(value: Any, in_volts: bool) -> float | None:
        if value is None:
            return None
        if not in_volts:
            return value.nominal / 100.0
        return value.nominal / reference.nominal if reference is not None else None

    for name in shares:
        s, v = shares[name][1], volts[name][1]
        if s is not None and v is not None:
            raise inconsistent(volts[name][0], f"{name} is given both as a share and as a "
                                               f"voltage: give one")
        if v is not None and reference is None and not sourced:
            raise inconsistent(volts[name][0], "a threshold in volts needs the input's "
                                               "reference voltage (reference)")
        if v is not None and reference is not None and v.nominal >= reference.nominal:
            raise inconsistent(volts[name][0], f"{_q(v.nominal, 'V')} is not below the "
                                               f"reference {_q(reference.nominal, 'V')}: a "
                                               f"divider's pin stays below its reference")
    for name in shares:
        for (where, r), in_volts in ((release[name], False), (release_volts[name], True)):
            if r is None:
                continue
            if shares[name][1] is None and volts[name][1] is None:
                raise inconsistent(where, f"a release for {name}, which has no threshold")
            if in_volts and reference is None and not sourced:
                raise inconsistent(where, "a release in volts needs the input's reference "
                                          "voltage (reference)")
    for name in shares:
        trip = share(shares[name][1], False) or share(volts[name][1], True)
        rel_s, rel_v = release[name][1], release_volts[name][1]
        if rel_s is not None and rel_v is not None:
            raise inconsistent(release_volts[name][0], f"the release of {name} is given both "
                                                       f"as a share and as a voltage: give one")
        rel = share(rel_s, False) if rel_s is not None else share(rel_v, True)
        if sourced:  # a current into the thermistor: compare the voltages themselves
            trip = volts[name][1].nominal if volts[name][1] is not None else None
            rel = rel_v.nominal if rel_v is not None else None
        if trip is None or rel is None:
            continue
        cold = name.endswith("cold")
        if (rel >= trip) if cold else (rel <= trip):
            where = release[name][0] if rel_s is not None else release_volts[name][0]
            raise inconsistent(where, (
                f"the release of {name} is not {'below' if cold else 'above'} its threshold: "
                f"a {'cold' if cold else 'hot'} cut-off releases as the thermistor "
                f"{'warms and the pin falls' if cold else 'cools and the pin rises'}"))


class TemperatureInput(Strict):
    """A protector's temperature input: the thermistor on its pin forms a divider with a bias
    resistor from the input's reference, and comparators trip at shares of that reference.

    Thresholds are the pin voltage as a percentage of the reference the bias resistor is tied
    to: a cold thermistor has a high resistance, so the cold thresholds are the higher ones."""

    pull_up: Tol("Ω", gt=0, le=MAX_OHMS) | None = Field(default=None, description=(
        "the protector's internal bias resistor from its reference to the pin (toleranced ohms); "
        "when absent, the resistor in the netlist from the pin's net to the reference is the "
        "bias"))
    charge_cold: Ratio | None = Field(default=None, description=(
        "charge-inhibit cold threshold: charging stops while the pin is above this share of the "
        "reference (toleranced percent, e.g. {min: 71 %, typ: 71.5 %, max: 72 %}; a tol in % "
        "is a share of typ, a bare number is in percentage points)"))
    charge_hot: Ratio | None = Field(default=None, description=(
        "charge-inhibit hot threshold: charging stops while the pin is below this share of the "
        "reference (toleranced percent)"))
    discharge_cold: Ratio | None = Field(default=None, description=(
        "discharge cut-off cold threshold: discharge stops while the pin is above this share "
        "of the reference (toleranced percent)"))
    discharge_hot: Ratio | None = Field(default=None, description=(
        "discharge over-temperature cut-off: discharge stops while the pin is below this share "
        "of the reference (toleranced percent)"))
    reference: Tol("V", gt=0, le=MAX_VOLTS) | None = Field(default=None, description=(
        "the voltage the bias resistor is tied to, with its tolerance (toleranced volts); "
        "needed for thresholds given in volts (volts, release_volts)"))
    volts: ThresholdLevels | None = Field(default=None, description=(
        "the thresholds as pin voltages instead of shares, {charge_cold, charge_hot, "
        "discharge_cold, discharge_hot} in toleranced volts: each is judged as its share of "
        "the reference (or, with bias_current, as the thermistor resistance it means)"))
    release: ThresholdShares | None = Field(default=None, description=(
        "where a tripped threshold releases (its hysteresis), {charge_cold, ...} as shares of "
        "the reference (toleranced percent): the release temperatures are computed and "
        "reported beside the cut-offs"))
    release_volts: ThresholdLevels | None = Field(default=None, description=(
        "the releases as pin voltages (toleranced volts), for thresholds given in volts"))
    bias_current: Tol("A", gt=0, le=1.0) | None = Field(default=None, description=(
        "for an input that sources a current into the thermistor instead of a bias resistor: "
        "that current with its tolerance (toleranced amperes, e.g. {typ: 20 µA, tol: 5 %}); "
        "its thresholds are then in volts (volts), each the thermistor resistance volts / "
        "current"))

    @model_validator(mode="after")
    def _some(self) -> "TemperatureInput":
        if all(getattr(self, n) is None for n in THRESHOLDS) and not (
                self.volts is not None and any(getattr(self.volts, n) is not None
                                               for n in THRESHOLDS)):
            raise ValueError("give at least one threshold: " + ", ".join(THRESHOLDS)
                             + " (as shares) or volts")
        if self.bias_current is not None and (
                self.pull_up is not None or any(getattr(self, n) is not None for n in THRESHOLDS)
                or self.release is not None):
            raise inconsistent("bias_current", "an input that sources a current has no pull_up "
                                               "and its thresholds are in volts (volts, "
                                               "release_volts)")

        def each(block: Any, prefix: str) -> dict:
            return {n: (f"{prefix}{n}", getattr(block, n) if block is not None else None)
                    for n in THRESHOLDS}

        _threshold_forms(self, {n: (n, getattr(self, n)) for n in THRESHOLDS},
                         each(self.volts, "volts."), each(self.release, "release."),
                         each(self.release_volts, "release_volts."),
                         self.bias_current is not None)
        for cold, hot in (("charge_cold", "charge_hot"), ("discharge_cold", "discharge_hot")):
            c, h = getattr(self, cold), getattr(self, hot)
            if c is not None and h is not None and c.nominal <= h.nominal:
                raise inconsistent(hot, f"{_q(h.nominal, '%')} is not below {cold} "
                                        f"{_q(c.nominal, '%')}: a hot thermistor pulls the pin "
                                        f"lower than a cold one")
        return self


#: The thresholds a temperature input may have, as (name, which end of the window it guards).
THRESHOLDS = ("charge_cold", "charge_hot", "discharge_cold", "discharge_hot")


class Protector(Packaged):
    """A battery protector: watches the cells and drives the charge and discharge switches."""

    kind: Literal["protector"] = Field(description="the part kind: 'protector'")
    chemistry: list[Chemistry] | None = Field(default=None, description=(
        "cell chemistries the protector's thresholds are made for, e.g. [lco, nmc, nca]; a cell "
        "of another chemistry is an error (threshold-ladder)"))
    cells: int = Field(default=1, ge=1, le=16, description=(
        "number of cells in series it protects, 1-16; must equal the stack's series count; above "
        "1 it has the pins cell1..cellN and balance1..balanceN"))
    overcharge: Threshold = Field(description=(
        "overcharge detection, per cell: {detect, release, delay, release_on}"))
    overdischarge: Threshold = Field(description=(
        "over-discharge detection, per cell: {detect, release, delay, release_on}; its "
        "detection is also the lowest cell voltage, and so the lowest gate drive, in service"))
    overcurrent: CurrentThreshold = Field(description=(
        "discharge over-current detection, across the sense and ground pins: {detect, release, "
        "delay, release_on, retry_period}"))
    short_circuit: CurrentThreshold | None = Field(default=None, description=(
        "short-circuit detection, across the sense and ground pins: {detect, release, delay, "
        "release_on, retry_period}"))
    supply_current: SupplyCurrent = Field(description=(
        "the protector's own current: {operating, power_down}"))
    gate_drive: Literal["cell"] | PositiveVolts = Field(default="cell", description=(
        "'cell' when the gate outputs swing between ground and supply, so the drive is the cell "
        "voltage (the stack voltage for a multi-cell protector); or a fixed drive in volts, e.g. "
        "'12 V' from a gate driver, at most the stack voltage unless gate_drive_boosted; it "
        "sets the switches' on-resistance and is checked against their vgs_max and vgs_th"))
    gate_drive_boosted: bool = Field(default=False, description=(
        "true when the gate driver makes its fixed gate_drive from a charge pump or a bootstrap "
        "and holds it when the stack falls below it; false (the default): the drive comes from "
        "the stack, so it is at most the stack voltage, and at the lowest stack voltage the "
        "protector allows it is min(gate_drive, that voltage)"))
    supply_filter: SupplyFilter | None = Field(default=None, description=(
        "the maker's recommended supply filter: {r: {min, max}, c: {min, max}}"))
    overcurrent_fast: CurrentThreshold | None = Field(default=None, description=(
        "a second, faster discharge over-current level where the protector has one, across the "
        "sense and ground pins: {detect, release, delay, release_on, retry_period}; its detection "
        "lies between overcurrent's and short_circuit's, its delay between theirs "
        "(overcurrent-levels)"))
    open_tap_detection: bool | None = Field(default=None, description=(
        "true when the protector detects an open cell-tap (sense) wire and acts on it, false when "
        "it does not; absent: not stated (backup-overvoltage counts it as not detecting)"))
    cell_input_current: Tol("A", ge=0, le=1.0) | None = Field(default=None, description=(
        "current each cell input (cell1..cellN) draws from its tap and returns through the ground "
        "pin, as the data sheet gives it (toleranced amperes, e.g. {typ: 0.5 uA, max: 1 uA}); "
        "the input of cell K drains cells 1..K, so the bottom cells lose more (cell-balance); "
        "when absent, none"))
    balance_switch_resistance: Tol("Ω", ge=0, le=1e6) | None = Field(default=None, description=(
        "on-resistance of the internal bleed switch between balanceK and the pin below cell K "
        "(toleranced ohms, e.g. {typ: 10 Ω, max: 25 Ω}); in series with the bleed resistor it sets "
        "the bleed current (cell-balance); when absent, 0 Ω (the bleed resistor alone)"))
    charge_overcurrent: CurrentThreshold | None = Field(default=None, description=(
        "charge over-current detection, the voltage across the sense and ground pins with charge "
        "current flowing (a magnitude): {detect, release, delay, release_on, retry_period}; its "
        "trip window must clear the charger current and say whether a regenerative peak trips "
        "it (charge-current-window)"))
    low_voltage_charge: LowVoltageCharge | None = Field(default=None, description=(
        "whether a cell below its lower limit is charged, {allowed, inhibit_below, path, "
        "current}; judged against the cell's recovery (deep-discharge-recovery); when absent, "
        "not checked"))
    temperature_input: TemperatureInput | None = Field(default=None, description=(
        "what the temperature pin does with the thermistor on it: {pull_up, charge_cold, "
        "charge_hot, discharge_cold, discharge_hot}; from it the cut-off temperatures are "
        "computed over every tolerance (charge-inhibit-window, discharge-overtemperature); "
        "when absent, the pin is not modelled"))

    @model_validator(mode="after")
    def _ordered(self) -> "Protector":
        # A release on the unsafe side of its detection would trip and release in a loop; the
        # margins with tolerances are threshold-ladder's, the order itself is the data's.
        oc, od = self.overcharge, self.overdischarge
        if oc.release is not None and oc.release.nominal >= oc.detect.nominal:
            raise inconsistent("overcharge.release", (
                f"{_q(oc.release.nominal, 'V')} is not below the overcharge detection "
                f"{_q(oc.detect.nominal, 'V')}; the cell releases by falling from it"))
        if od.release is not None and od.release.nominal <= od.detect.nominal:
            raise inconsistent("overdischarge.release", (
                f"{_q(od.release.nominal, 'V')} is not above the over-discharge detection "
                f"{_q(od.detect.nominal, 'V')}; the cell releases by recovering from it"))
        if od.detect.nominal >= oc.detect.nominal:
            raise inconsistent("overdischarge.detect", (
                f"{_q(od.detect.nominal, 'V')} is not below the overcharge detection "
                f"{_q(oc.detect.nominal, 'V')}"))
        sc = self.short_circuit
        if sc is not None and sc.detect.nominal <= self.overcurrent.detect.nominal:
            raise inconsistent("short_circuit.detect", (
                f"{_q(sc.detect.nominal, 'V')} is not above the over-current detection "
                f"{_q(self.overcurrent.detect.nominal, 'V')}; a short circuit draws more"))
        return self

    @model_validator(mode="after")
    def _fast_level_between(self) -> "Protector":
        # The nominal order is the data's; the windows with tolerances and corners are
        # overcurrent-levels' to judge.
        fast, sc = self.overcurrent_fast, self.short_circuit
        if fast is None:
            return self
        if fast.detect.nominal <= self.overcurrent.detect.nominal:
            raise inconsistent("overcurrent_fast.detect", (
                f"{_q(fast.detect.nominal, 'V')} is not above the over-current detection "
                f"{_q(self.overcurrent.detect.nominal, 'V')}; the fast level trips at more"))
        if sc is not None and fast.detect.nominal >= sc.detect.nominal:
            raise inconsistent("overcurrent_fast.detect", (
                f"{_q(fast.detect.nominal, 'V')} is not below the short-circuit detection "
                f"{_q(sc.detect.nominal, 'V')}; a short circuit draws more"))
        return self


class Channel(str, Enum):
    n = "n"
    p = "p"


class RdsOnPoint(Strict):
    """One row of a data sheet's on-resistance table, at 25 °C."""

    vgs: Q("V", ge=-1000.0, le=1000.0) = Field(description=(
        "gate-source voltage of the row, in volts (p-channel data sheets print it negative; read "
        "as a magnitude)"))
    typ: PositiveOhms | None = Field(default=None, description=(
        "typical R_DS(on) at that gate voltage and 25 °C, in ohms, e.g. '25 mΩ'"))
    max: PositiveOhms | None = Field(default=None, description=(
        "maximum R_DS(on) at that gate voltage and 25 °C, in ohms"))

    @model_validator(mode="after")
    def _given(self) -> "RdsOnPoint":
        if self.typ is None and self.max is None:
            raise ValueError("give 'typ' or 'max'")
        if self.typ is not None and self.max is not None and self.typ > self.max:
            raise ValueError("typ is above max")
        if self.vgs == 0:
            raise inconsistent("vgs", "0 V: a row of the table holds the gate voltage it was "
                                      "measured at; at 0 V the switch is off")
        if self.typ is not None and self.max is not None and self.max >= 2 * self.typ:
            # The model's lowest corner is typ - (max - typ) (model/rdson.py), which is then not
            # positive: refused here, at the row, rather than as a crash of the model.
            raise inconsistent("max", (
                f"{_q(self.max, 'Ω')} is at least twice typ {_q(self.typ, 'Ω')}, so the lowest "
                f"R_DS(on), typ - (max - typ), would not be positive; check the row against the "
                f"data sheet"))
        return self


class HotRatio(Strict):
    """How much the on-resistance rises when the junction is hot."""

    at: Q("°C", gt=25.0, le=HOTTEST_JUNCTION_C) = Field(default=125.0, description=(
        "junction temperature the ratio is read at, in °C"))
    ratio: float = Field(gt=0.5, lt=5.0, description=(
        "R_DS(on) at that temperature over R_DS(on) at 25 °C, from the data sheet's normalised "
        "on-resistance curve, e.g. 1.44 (a plain number between 0.5 and 5)"))


class ZthPoint(Strict):
    """One point of a single-pulse transient thermal impedance curve."""

    time: PositiveSeconds = Field(description="pulse width, in seconds, above 0")
    zth: Q("K/W", gt=0, le=10e3) = Field(description=(
        "single-pulse Z_th at that pulse width, junction to ambient on the board as built, in "
        "K/W"))


class FosterStage(Strict):
    """One stage of a Foster network: Z_th(t) = Σ r·(1 − e^(−t/tau))."""

    r: Q("K/W", gt=0, le=10e3) = Field(description="the stage's thermal resistance, in K/W")
    tau: PositiveSeconds = Field(description="the stage's time constant, in seconds")


class ThermalImpedance(Strict):
    """A switch's single-pulse transient thermal impedance Z_th(t), as curve points or a Foster
    network (one of the two)."""

    points: list[ZthPoint] | None = Field(default=None, min_length=1, max_length=50, description=(
        "points of the single-pulse curve, {time, zth}, rising in time; read as straight lines "
        "on log-log axes, the first point's value before it and theta_ja after the last"))
    foster: list[FosterStage] | None = Field(default=None, min_length=1, max_length=20,
                                             description=(
        "Foster network stages {r, tau}, as the data sheet tabulates them; it should describe "
        "the junction to ambient on the board as built (a junction-to-case network understates "
        "long pulses)"))

    @model_validator(mode="after")
    def _one(self) -> "ThermalImpedance":
        if (self.points is None) == (self.foster is None):
            raise ValueError("give either 'points' or 'foster'")
        pts = self.points or []
        for i, (a, b) in enumerate(zip(pts, pts[1:]), start=1):
            if b.time <= a.time:
                raise inconsistent(f"points.{i}.time", (
                    f"{_q(b.time, 's')} is not after the point before ({_q(a.time, 's')}); give "
                    f"the points in rising time"))
            if b.zth < a.zth:
                raise inconsistent(f"points.{i}.zth", (
                    f"{_q(b.zth, 'K/W')} is below the point before ({_q(a.zth, 'K/W')}); a "
                    f"single-pulse Z_th never falls as the pulse gets longer"))
        return self


class SoaPoint(Strict):
    """One point of a safe-operating-area chart: a current the part carries at a drain-source
    voltage for a single pulse of a width."""

    vds: PositiveVolts = Field(description="drain-source voltage, in volts")
    current: PositiveAmps = Field(description="drain current allowed there, in amperes")
    pulse: PositiveSeconds = Field(description=(
        "single-pulse width of the chart's line, in seconds (the DC line: a long time, e.g. "
        "'1000 s')"))


class FetCommon(Packaged):
    """Parameters every switch MOSFET gives, per channel for a pair."""

    channel: Channel = Field(description=(
        "channel type, 'n' or 'p'; decides which rail the switch can sit on with gate_drive: "
        "cell and the direction of its body diode"))
    vds_max: PositiveVolts = Field(description=(
        "drain-source voltage rating V_DS (absolute maximum), in volts: the worst voltage the off "
        "switch blocks must stay within a derated share of it, 80 % by default "
        "(switch-voltage-margin), a turn-off spike within it, or its energy within e_as "
        "(short-circuit-stress)"))
    vgs_max: PositiveVolts = Field(description=(
        "gate-source voltage rating V_GS (absolute maximum), in volts; the highest gate drive "
        "must stay within a derated share of it, 70 % by default (switch-voltage-margin)"))
    vgs_th: Tol("V", ge=-1000.0, le=1000.0) = Field(description=(
        "gate threshold voltage V_GS(th) (toleranced volts, e.g. {min: 0.5 V, max: 1.0 V}); its "
        "max must sit below the lowest gate drive, the over-discharge detection with gate_drive: "
        "cell, or the FET is not fully on near the end of discharge (switch-voltage-margin)"))
    rds_on: list[RdsOnPoint] = Field(min_length=1, max_length=20, description=(
        "on-resistance table at 25 °C, one row per gate voltage the data sheet gives: a list of "
        "{vgs, typ, max}, 1-20 rows; interpolated to the gate drive; below the lowest row it "
        "rises as 1/(V_GS - V_th) through that row (V_th at the corner, its max for the highest "
        "resistance), and any figure resting on that is flagged (on-resistance-in-table)"))
    rds_on_hot_ratio: HotRatio | None = Field(default=None, description=(
        "rise of R_DS(on) with junction temperature, {at, ratio}; when absent, 1.5 at 125 °C "
        "[practice]"))
    id_max: PositiveAmps = Field(description=(
        "continuous drain current rating I_D per channel, in amperes; each channel's share of "
        "the current the protection permits for ever must not exceed it (trip-current-window)"))
    id_pulse_max: PositiveAmps | None = Field(default=None, description=(
        "pulsed drain current rating I_DM per channel, in amperes; a hard short's channel current "
        "must stay within it until the protection turns it off (short-circuit-stress)"))
    turn_off_time: Q("s", gt=0, le=1.0) | None = Field(default=None, description=(
        "drain current fall time when the gate is pulled off, in seconds; with "
        "pack.wiring_inductance it sets the turn-off spike (1 µs assumed when not given)"))
    theta_ja: Q("K/W", gt=0, le=10e3) = Field(description=(
        "junction-to-ambient thermal resistance R_θJA on the board as built, in K/W, for the "
        "whole package; the junction sits at ambient + dissipation × theta_ja "
        "(switch-temperature)"))
    tj_max: Q("°C", gt=25.0, le=HOTTEST_JUNCTION_C) = Field(default=150.0, description=(
        "maximum junction temperature T_J, in °C; the junctions must stay below it "
        "(switch-temperature), and no thermal balance below it is thermal runaway"))
    idss: LeakageAmps | None = Field(default=None, description=(
        "zero-gate-voltage drain leakage I_DSS at vds_max, in amperes; the discharge switches' "
        "leakage counts as a drain on a stored pack (storage-drain)"))
    zth: ThermalImpedance | None = Field(default=None, description=(
        "single-pulse transient thermal impedance, {points: [{time, zth}]} or {foster: [{r, "
        "tau}]}; the junction at the end of each event must stay below tj_max "
        "(switch-pulse-heat); when absent, the Z_th each event needs is stated"))
    e_as: Q("J", gt=0, le=1e3) | None = Field(default=None, description=(
        "single-pulse avalanche energy rating E_AS, in joules, as the data sheet gives it (most "
        "rate it from a 25 °C junction; give a derated figure for a hot start); a turn-off spike "
        "past vds_max is then judged by the energy it puts into the FET (short-circuit-stress)"))
    soa: list[SoaPoint] | None = Field(default=None, min_length=1, max_length=50, description=(
        "safe-operating-area points, [{vds, current, pulse}], read off the chart's single-pulse "
        "lines; each event's drain current is checked against them where they decide "
        "(switch-pulse-heat)"))

    @model_validator(mode="after")
    def _consistent(self) -> "FetCommon":
        rows: dict[float, int] = {}
        for i, row in enumerate(self.rds_on):
            first = rows.setdefault(abs(row.vgs), i)
            if first != i:
                # interpolating between two rows at one gate voltage divides by zero, and which
                # row wins would move the trip window silently
                raise inconsistent(f"rds_on.{i}.vgs", (
                    f"{_q(abs(row.vgs), 'V')} is also the gate voltage of rds_on[{first}]; give "
                    f"one row per gate voltage"))
        if self.id_pulse_max is not None and self.id_pulse_max < self.id_max:
            raise inconsistent("id_pulse_max", (
                f"{_q(self.id_pulse_max, 'A')} is below the continuous rating id_max "
                f"{_q(self.id_max, 'A')}; a pulse rating is at least the continuous one"))
        return self


class Fet(FetCommon):
    """A discrete MOSFET used as a charge or discharge switch."""

    kind: Literal["fet"] = Field(description="the part kind: 'fet'")


class FetPair(FetCommon):
    """Two MOSFETs sharing one drain in one package: the usual charge and discharge switch pair."""

    kind: Literal["fet_pair_common_drain"] = Field(description=(
        "the part kind: 'fet_pair_common_drain'"))


class FuseSpeed(str, Enum):
    quick_acting = "quick_acting"
    time_lag = "time_lag"


class PreArcingPoint(Strict):
    """One point of a fuse's time-current (pre-arcing) curve."""

    current: PositiveAmps = Field(description="current through the fuse, in amperes, above 0")
    time: PositiveSeconds = Field(description=(
        "pre-arcing (melting) time at that current, in seconds, above 0; read the curve's lower "
        "edge where the data sheet draws a band"))


class DeratingPoint(Strict):
    """A fuse's continuous rating at one ambient, from its maker's temperature derating curve."""

    ambient: Temperature = Field(description="ambient temperature, in °C")
    factor: Q("%", gt=0, le=150) = Field(description=(
        "the share of the rated current it carries at that ambient, e.g. '85 %'"))


class Fuse(Packaged):
    """A fuse: the secondary protection in series with the power path."""

    kind: Literal["fuse"] = Field(description="the part kind: 'fuse'")
    rated_current: PositiveAmps = Field(description=(
        "rated current I_n, in amperes; derated (to 75 % by default) it must carry the "
        "current the protection permits for ever (secondary-protection)"))
    rated_voltage: PositiveVolts = Field(description=(
        "rated voltage, in volts; at least the highest pack or charger voltage "
        "(secondary-protection)"))
    breaking_capacity: PositiveAmps = Field(description=(
        "breaking capacity (rated interrupting current), in amperes; at least the prospective "
        "short-circuit current (secondary-protection)"))
    melting_i2t: Q("A²s", gt=0, le=1e9) | None = Field(default=None, description=(
        "melting (pre-arcing) I²t, in A²s, e.g. '95 A2s'; the I²t let through during the "
        "longest over-current and short-circuit delays must stay below a share of it, 48 % by "
        "default (secondary-protection); when absent, an info finding"))
    speed: FuseSpeed = Field(default=FuseSpeed.time_lag, description=(
        "'quick_acting' or 'time_lag', as IEC 60127 names them; without pre_arcing points, an "
        "event longer than a short pulse is judged against the standard's pre-arcing gates for "
        "this speed (secondary-protection)"))
    pre_arcing: list[PreArcingPoint] | None = Field(default=None, max_length=50, description=(
        "the part's own pre-arcing time-current points, a list of {current, time}; events "
        "longer than a short pulse are judged against them (log-log between points) instead of "
        "the standard's gates (secondary-protection)"))
    resistance: PathOhms | None = Field(default=None, description=(
        "cold resistance, in ohms; part of the power path's resistance (taken as near zero when "
        "absent)"))
    ambient_derating: list[DeratingPoint] | None = Field(default=None, max_length=20, description=(
        "the maker's temperature derating curve as points (ambient, share of the rating); "
        "secondary-protection derates the rating to the pack's highest ambient by it (straight "
        "lines between points, 100 % at 25 °C unless a point says otherwise); without it no "
        "ambient derating is applied, since curves differ by fuse type"))

    @model_validator(mode="after")
    def _breaks_its_rating(self) -> "Fuse":
        if self.breaking_capacity < self.rated_current:
            raise inconsistent("breaking_capacity", (
                f"{_q(self.breaking_capacity, 'A')} is below the rated current "
                f"{_q(self.rated_current, 'A')}; a fuse breaks more than it carries"))
        return self


class HoldPoint(Strict):
    """A PTC's hold current at one ambient, from its data sheet's table."""

    ambient: Temperature = Field(description="ambient temperature, in °C")
    current: PositiveAmps = Field(description="hold current at that ambient, in amperes")


class Ptc(Packaged):
    """A resettable PTC fuse used as the secondary protection."""

    kind: Literal["ptc"] = Field(description="the part kind: 'ptc'")
    hold_current: PositiveAmps = Field(description=(
        "hold current I_hold, in amperes, the highest it carries without tripping; at least the "
        "continuous load (secondary-protection)"))
    trip_current: PositiveAmps = Field(description=(
        "trip current I_trip, in amperes; recorded, not yet used by a rule"))
    rated_voltage: PositiveVolts = Field(description=(
        "rated voltage V_max, in volts; at least the highest pack or charger voltage "
        "(secondary-protection)"))
    max_current: PositiveAmps = Field(description=(
        "highest fault current it withstands and interrupts, I_max, in amperes; at least the "
        "highest short-circuit current through it (secondary-protection)"))
    hold_derating: list[HoldPoint] | None = Field(default=None, max_length=50, description=(
        "hold current at other ambients, a list of {ambient, current} from the data sheet's "
        "table; the hold current at the highest ambient is read from it (straight lines between "
        "points, with hold_current at 25 °C); when absent, 70 % at 60 °C [practice] "
        "(secondary-protection)"))
    resistance: Tol("Ω", gt=0, le=MAX_OHMS) = Field(description=(
        "resistance before tripping (toleranced ohms, the data sheet's R_min and R_max); part of "
        "the power path's resistance at each corner"))

    @model_validator(mode="after")
    def _ordered(self) -> "Ptc":
        _rising(self, (("hold_current", False), ("trip_current", True), ("max_current", False)),
                "A")
        return self


class Resistor(Packaged):
    """A resistor: a shunt in the power path, or a signal part (supply filter, sense, divider)."""

    kind: Literal["resistor"] = Field(description="the part kind: 'resistor'")
    value: PathOhms = Field(description=(
        "resistance, in ohms, e.g. '470 Ω'; a resistor of 1 Ω or less is taken to carry the "
        "pack's current (a shunt), a larger one a signal"))
    tol: Tolerance = Field(default=1.0, description=(
        "resistance tolerance, in percent; the worst cases and the --yield run use value ± tol"))
    power: Q("W", gt=0, le=100e3) | None = Field(default=None, description=(
        "power rating, in watts; its worst dissipation must stay within a derated share of it, "
        "50 % by default (support-network); when absent, not checked"))


class Capacitor(Packaged):
    """A capacitor: the protector's supply filter, or a decoupling capacitor."""

    kind: Literal["capacitor"] = Field(description="the part kind: 'capacitor'")
    value: Capacitance = Field(description=(
        "capacitance, in farads, e.g. '100 nF'; the supply filter's capacitor is compared with "
        "the recommended range (support-network)"))
    voltage: PositiveVolts | None = Field(default=None, description=(
        "voltage rating, in volts; the highest voltage across it must stay within a derated "
        "share of it, 80 % by default (support-network); when absent, not checked"))
    esr: Q("Ω", ge=0, le=1e3) | None = Field(default=None, description=(
        "equivalent series resistance, in ohms; across the pack terminals it is part of the "
        "inrush loop (switch-on-inrush); taken as zero when absent"))


class Precharge(Packaged):
    """A pre-charge path: a resistor in series with its own switch, placed around the discharge
    switches. The switch closes first and charges the load's capacitance through the resistor;
    the main switches close a stated delay later."""

    kind: Literal["precharge"] = Field(description="the part kind: 'precharge'")
    resistance: Tol("Ω", gt=0, le=1e6) = Field(description=(
        "pre-charge resistance (toleranced ohms, e.g. {typ: 47 Ω, tol: 5 %}); its lowest sets "
        "the peak current and power, its highest how far the capacitance is charged when the "
        "main switches close (switch-on-inrush)"))
    switch_resistance: Q("Ω", ge=0, le=1e3) = Field(default=0.0, description=(
        "on-resistance of the pre-charge switch, in ohms (zero when not given)"))
    delay: Tol("s", gt=0, le=MAX_SECONDS) = Field(description=(
        "time from closing the pre-charge switch to closing the main switches, set by whatever "
        "sequences them (the protector's or the controller's timer), toleranced seconds; its "
        "shortest is judged (switch-on-inrush)"))
    pulse_energy: Q("J", gt=0, le=1e6) | None = Field(default=None, description=(
        "single-pulse energy the resistor absorbs without damage, in joules, from its data "
        "sheet's pulse curve; at least ½CV² of the charged capacitance (switch-on-inrush); when "
        "absent, not checked"))
    pulse_power: Q("W", gt=0, le=1e7) | None = Field(default=None, description=(
        "peak power the resistor takes for a pulse as long as the charging time constant, in "
        "watts; at least the peak power at switch-on (switch-on-inrush); when absent, not "
        "checked"))


class Layer(str, Enum):
    outer = "outer"
    inner = "inner"


class Trace(Packaged):
    """A copper trace of the power path, rated by the IPC-2221 conductor formula."""

    kind: Literal["trace"] = Field(description="the part kind: 'trace'")
    width: Q("m", gt=0, le=1.0) = Field(description=(
        "trace width, in metres, e.g. '2 mm'; with the copper thickness it gives the "
        "cross-section IPC-2221 rates (conductor-capacity)"))
    length: Q("m", gt=0, le=100.0) = Field(description=(
        "trace length, in metres, e.g. '20 mm'; with width and thickness it gives the copper "
        "resistance in the power path (IEC 60028 resistivity)"))
    thickness: Q("m", gt=0, le=0.01) | None = Field(default=None, description=(
        "finished copper thickness, in metres, e.g. '35 um'; give it or copper_weight"))
    copper_weight: Q("oz", gt=0, le=20.0) | None = Field(default=None, description=(
        "copper weight in ounces per square foot, e.g. '1 oz' (35 µm); give it or thickness"))
    layer: Layer = Field(default=Layer.outer, description=(
        "'outer' or 'inner' layer; IPC-2221 rates inner traces at half the current"))

    @model_validator(mode="after")
    def _copper(self) -> "Trace":
        if (self.thickness is None) == (self.copper_weight is None):
            raise ValueError("give exactly one of 'thickness' and 'copper_weight'")
        return self


class Wire(Packaged):
    """A wire or cable of the power path."""

    kind: Literal["wire"] = Field(description="the part kind: 'wire'")
    rated_current: PositiveAmps = Field(description=(
        "current rating of the wire as installed, in amperes; at least the highest current the "
        "protection permits through it (conductor-capacity)"))
    resistance: PathOhms | None = Field(default=None, description=(
        "resistance of the whole wire, in ohms; part of the power path (near zero when absent)"))
    length: Q("m", gt=0, le=10e3) | None = Field(default=None, description=(
        "wire length, in metres; recorded, not yet used"))
    awg: int | None = Field(default=None, ge=-3, le=40, description=(
        "copper size in American Wire Gauge, e.g. 18 (-3 for 4/0); its cross-section (ASTM "
        "B258) must withstand each event's current for its duration (conductor-withstand); "
        "when absent, an info finding states the copper the wire needs"))


class Diode(Packaged):
    """A diode or LED; an LED the cells can light drains a stored pack."""

    kind: Literal["diode"] = Field(description="the part kind: 'diode'")
    forward_voltage: Q("V", gt=0, le=1000.0) = Field(default=0.7, description=(
        "forward voltage V_F, in volts; the diode conducts above it in the linter's solves"))
    led: bool = Field(default=False, description=(
        "true for an LED: lit from the cells it counts as a storage drain (storage-drain)"))
    current: Q("A", gt=0, le=100.0) | None = Field(default=None, description=(
        "current when lit, in amperes, for LEDs; counted as the drain instead of the solved "
        "current"))


class BackupDetection(Strict):
    """The backup protector's per-cell overvoltage detection."""

    detect: Tol("V", gt=0, le=10.0) = Field(description=(
        "overvoltage detection per cell with its accuracy (toleranced volts); its minimum must "
        "lie above the primary protector's overcharge detection maximum and its maximum at or "
        "below the cell's overcharge limit (backup-overvoltage)"))
    delay: Tol("s", ge=0, le=MAX_SECONDS) = Field(description=(
        "detection delay (toleranced seconds): how long a cell stays above the detection before "
        "the output acts"))


class OvervoltageBackup(Packaged):
    """A second-level (backup) overvoltage protector: watches every cell on its own and, when one
    passes its detection, drives its output to blow a fuse in the power path for good."""

    kind: Literal["overvoltage_backup"] = Field(description="the part kind: 'overvoltage_backup'")
    cells: int = Field(ge=2, le=16, description=(
        "number of cells in series it watches, 2-16; must equal the stack's series count; it has "
        "the pins cell1..cellN"))
    overvoltage: BackupDetection = Field(description=(
        "per-cell overvoltage detection: {detect, delay}"))
    open_tap_detection: bool = Field(default=False, description=(
        "true when it detects an open cell-tap (sense) wire and drives its output for it "
        "(backup-overvoltage)"))
    open_tap_delay: Tol("s", ge=0, le=MAX_SECONDS) | None = Field(default=None, description=(
        "delay of the open-tap detection (toleranced seconds), with open_tap_detection: true"))

    @model_validator(mode="after")
    def _open_tap(self) -> "OvervoltageBackup":
        if self.open_tap_delay is not None and not self.open_tap_detection:
            raise inconsistent("open_tap_delay", (
                "an open-tap delay needs open_tap_detection: true"))
        return self


class HeaterFuse(Fuse):
    """A fuse with a heater element (a three-terminal fuse): it opens on over-current like any
    fuse, and when a backup protector passes current through its heater, it melts and opens the
    power path for good."""

    kind: Literal["heater_fuse"] = Field(description="the part kind: 'heater_fuse'")
    heater_resistance: Tol("Ω", gt=0, le=MAX_OHMS) | None = Field(default=None, description=(
        "resistance of the heater element (toleranced ohms); with heater_power, the heater must "
        "melt the fuse at the lowest stack voltage it can be driven from (backup-overvoltage)"))
    heater_power: Q("W", gt=0, le=10e3) | None = Field(default=None, description=(
        "lowest heater power that melts the fuse within its rated time, in watts, the data "
        "sheet's operating power"))
class Placement(str, Enum):
    cells = "cells"
    board = "board"


class Ntc(Packaged):
    """An NTC thermistor: the temperature sensor a protector's or a charger's temperature input
    reads through a divider. It carries no pack current."""

    kind: Literal["ntc"] = Field(description="the part kind: 'ntc'")
    r25: Tol("Ω", gt=0, le=MAX_OHMS) = Field(description=(
        "resistance at 25 °C with its tolerance (toleranced ohms, e.g. {typ: 10 kΩ, tol: 1 %})"))
    beta: Tol("K", gt=0, le=100e3) = Field(description=(
        "the B constant of the beta equation R(T) = R25·exp(B·(1/T - 1/T25)) with its "
        "tolerance (toleranced kelvin, e.g. {typ: 3435 K, tol: 1 %})"))
    beta_range: str | None = Field(default=None, max_length=100, description=(
        "the temperatures the data sheet's B is fitted between, e.g. '25/85 °C'; recorded for "
        "the reviewer (the beta equation strays from the part's table far outside it)"))
    placement: Placement = Field(default=Placement.cells, description=(
        "where it sits: 'cells' (on or between the cells, reads their temperature) or 'board' "
        "(on the circuit board, reads the board's); shown in the findings about it"))


class ThermalFuse(Packaged):
    """A thermal fuse (a thermal cut-off): carries the pack current in series and opens, for
    good, when its body reaches its opening temperature. It backs up the resettable temperature
    cut-offs; it does not open on a short circuit, so it is no over-current backup."""

    kind: Literal["thermal_fuse"] = Field(description="the part kind: 'thermal_fuse'")
    opening_temperature: Tol("°C", ge=LOWEST_C, le=HIGHEST_C) = Field(description=(
        "the temperature at which it opens, with its tolerance (toleranced °C, e.g. {typ: "
        "90 °C, tol: 5}); above the resettable cut-offs and the pack's ambient "
        "(thermal-fuse-window)"))
    rated_current: PositiveAmps = Field(description=(
        "the current it carries continuously, in amperes; at least the current the protection "
        "permits for ever (thermal-fuse-window)"))
    rated_voltage: PositiveVolts = Field(description=(
        "rated voltage, in volts; at least the highest pack or charger voltage "
        "(thermal-fuse-window)"))
    resistance: PathOhms | None = Field(default=None, description=(
        "resistance, in ohms; part of the power path's resistance (taken as near zero when "
        "absent)"))
    placement: Placement = Field(default=Placement.cells, description=(
        "where it sits: 'cells' (on the cells, feels their temperature) or 'board'"))


PART_KINDS: dict[str, type[Strict]] = {
    "cell": Cell, "protector": Protector, "fet": Fet, "fet_pair_common_drain": FetPair,
    "fuse": Fuse, "ptc": Ptc, "resistor": Resistor, "capacitor": Capacitor, "trace": Trace,
    "wire": Wire, "diode": Diode, "precharge": Precharge,
    "overvoltage_backup": OvervoltageBackup, "heater_fuse": HeaterFuse,
    "ntc": Ntc, "thermal_fuse": ThermalFuse,
}

Part = Annotated[Union[tuple(Annotated[m, Tag(k)] for k, m in PART_KINDS.items())],
                 Discriminator(lambda v: v.get("kind") if isinstance(v, dict) else getattr(v, "kind", None),
                               custom_error_type="unknown_kind",
                               custom_error_message="unknown or missing part kind",
                               custom_error_context={"kinds": ", ".join(PART_KINDS)})]


# --- components ---------------------------------------------------------------------------------

class PartRef(Strict):
    """A component that uses a library part by name."""

    part: str = Field(min_length=1, max_length=100, description=(
        "name of a part in one of the design's libraries, e.g. 'OR-FET-D20'"))
    pins: Pins | None = Field(default=None, description=_PINS_TEXT)
    note: str | None = Field(default=None, description=_NOTE_TEXT)


def _inline(kind: str, model: type[Strict]) -> type[Strict]:
    return type(f"Inline{model.__name__}", (model,), {
        "__annotations__": {"pins": Pins | None, "note": str | None},
        "pins": Field(default=None, description=_PINS_TEXT),
        "note": Field(default=None, description=_NOTE_TEXT),
        "__doc__": f"A {kind} given inline, with its parameters.",
    })


INLINE_KINDS = {k: _inline(k, m) for k, m in PART_KINDS.items()}


def _component_tag(v: Any) -> str | None:
    if isinstance(v, dict):
        if "part" in v:
            return "@ref"
        kind = v.get("kind")
        return kind if kind in INLINE_KINDS else None
    if isinstance(v, PartRef):
        return "@ref"
    return getattr(v, "kind", None)


Component = Annotated[
    Union[(Annotated[PartRef, Tag("@ref")],
           *(Annotated[m, Tag(k)] for k, m in INLINE_KINDS.items()))],
    Discriminator(_component_tag, custom_error_type="component_form",
                  custom_error_message="a component needs 'part' (a library part) or a known 'kind'"),
]

RefDes = Annotated[str, Field(pattern=r"^[A-Za-z][A-Za-z0-9_.\-]{0,39}$")]


def _path_text(value: str) -> str:
    try:
        check_path(Path(value))
    except Refused as exc:
        raise ValueError(exc.message) from None
    return value


#: A file named in a design or library: text a file system can hold (no NUL, no control bytes).
FilePath = Annotated[str, Field(min_length=1, max_length=1000), AfterValidator(_path_text)]


class Schematic(Strict):
    """Where the design's components come from: a netlist exported by the schematic editor."""

    netlist: FilePath = Field(description=(
        "the netlist file (KiCad's own format, `(export (version \"E\") ...)`), relative to this "
        "design and inside its repository, e.g. board/power.net"))
    part_field: str = Field(default="packwarden-part", min_length=1, max_length=100, description=(
        "the symbol field that holds the library part id; a component without one is listed "
        "for the reviewer (unreviewed-component)"))


class Stack(Strict):
    """Cells of one part in series x parallel, written once and expanded into cell components."""

    part: str = Field(min_length=1, max_length=100, description=(
        "the library part of every cell, e.g. 'RL-CELL-2500'"))
    series: int = Field(ge=1, le=32, description="cells in series (the stack's levels)")
    parallel: int = Field(default=1, ge=1, le=64, description="cells in parallel at each level")
    taps: list[NetName] = Field(min_length=2, max_length=33, description=(
        "the nets from the stack's negative end to its positive end, series + 1 of them, e.g. "
        "[B-, B1, B2, B3, B+] for four levels"))
    prefix: Annotated[str, Field(pattern=r"^[A-Za-z][A-Za-z_]{0,9}$")] = Field(
        default="BT", description=(
            "reference designator prefix; cells are numbered level by level from the negative "
            "end: BT1..BT<parallel> at the bottom level, and so on"))
    first: int = Field(default=1, ge=0, le=100000, description=(
        "number of the first cell's reference designator"))

    @model_validator(mode="after")
    def _levels(self) -> "Stack":
        if len(self.taps) != self.series + 1:
            raise ValueError(f"{self.series} cells in series need {self.series + 1} taps "
                             f"(bottom to top), {len(self.taps)} given")
        return self


class Design(Strict):
    """A battery-protection design: the pack, its load and charger, and the netlist."""

    format: Literal["packwarden/1"] = Field(alias="format", description=(
        "the format and its version: 'packwarden/1'"))
    design: DesignInfo = Field(description="what the design is: {name, revision, description}")
    libraries: list[FilePath] = Field(default_factory=list, max_length=50, description=(
        "part library files, relative to this design and inside its repository, e.g. "
        "[parts/orchard-parts.yaml]; up to 50"))
    pack: Pack = Field(description="the pack: {ambient, terminals, wiring_inductance}")
    load: Load = Field(description="what the product draws from the pack: {continuous, peak}")
    charger: Charger | None = Field(default=None, description=(
        "the charger: {voltage, current, open_circuit_max, reverse_polarity, "
        "temperature_window}; without it the charging checks are skipped"))
    storage: Storage | None = Field(default=None, description=(
        "how the product is stored or shipped: {soc, duration, temperature}; without it "
        "storage-drain is skipped"))
    schematic: Schematic | None = Field(default=None, description=(
        "the netlist the components come from: {netlist, part_field}; entries under "
        "'components' add to or override the netlist's components of the same reference"))
    stacks: list[Stack] = Field(default_factory=list, max_length=50, description=(
        "cell stacks written as series x parallel of one part: {part, series, parallel, taps, "
        "prefix, first}; each expands into cell components"))
    components: dict[RefDes, Component] = Field(default_factory=dict, max_length=20000, description=(
        "the parts on the board, keyed by reference designator (a letter, then up to 39 letters, "
        "digits, '_', '.' or '-'): each uses a library part ({part, pins}) or gives its kind and "
        "parameters inline ({kind, ..., pins})"))
    waivers: list[Waiver] = Field(default_factory=list, description=(
        "accepted findings, each {rule, element, reason, approved_by, expires}"))


class PartLibrary(Strict):
    """A part library: parts by name, each defined by its kind and data-sheet parameters."""

    format: Literal["packwarden-parts/1"] = Field(description=(
        "the format and its version: 'packwarden-parts/1'"))
    include: list[FilePath] = Field(default_factory=list, max_length=50, description=(
        "further library files whose parts this one brings in, relative to this file and inside "
        "the repository; up to 50"))
    parts: dict[Annotated[str, Field(min_length=1, max_length=100)], Part] = Field(
        default_factory=dict, description=(
            "parts by name (up to 100 characters, unique across a design's libraries), each with "
            "its kind and parameters"))


# --- JSON Schema --------------------------------------------------------------------------------

def json_schema(which: str) -> dict:
    """The JSON Schema of a design or a part library, in draft-07-compatible keywords (a team
    policy's is ``policy.policy_json_schema``; ``docs.shipped_schema`` gives any of the three)."""
    model = {"design": Design, "parts": PartLibrary}[which]
    schema = model.model_json_schema(ref_template="#/definitions/{model}", mode="validation")
    defs = schema.pop("$defs", {})
    schema = drop_titles(schema)
    out = {"$schema": "http://json-schema.org/draft-07/schema#",
           "$id": f"https://packwarden.invalid/schemas/{which}.schema.json",
           "title": {"design": "packwarden design (format packwarden/1)",
                     "parts": "packwarden part library (format packwarden-parts/1)"}[which]}
    out.update(schema)
    out["definitions"] = {k: drop_titles(v) for k, v in sorted(defs.items())}
    return out
