"""Pydantic models of design files and part libraries: the single source of truth for the format.

The JSON Schemas in ``schemas/`` are generated from these models (``packwarden schema``) and checked
for staleness by a test, so editors validate exactly what the linter validates.

Every quantity is text with its unit (``4.25 V``), parsed strictly by :mod:`packwarden.quantities`
and stored as a float in SI units.
"""

from __future__ import annotations

import datetime
import functools
import re
from enum import Enum
from typing import Annotated, Any, Literal, Union

from pydantic import (BaseModel, BeforeValidator, ConfigDict, Discriminator, Field, Tag,
                      WithJsonSchema, model_validator)

from .quantities import UNITS, QuantityError, parse_quantity

DESIGN_FORMAT = "packwarden/1"
PARTS_FORMAT = "packwarden-parts/1"


class Strict(BaseModel):
    """Base for every model: unknown keys are errors, data is immutable once validated."""

    model_config = ConfigDict(extra="forbid", frozen=True, str_strip_whitespace=True)


# --- quantities -------------------------------------------------------------------------------

_PREFIX_CLASS = "[YZEPTGMkmuµμnpfa]?"


def _unit_pattern(unit: str) -> str:
    spec = UNITS[unit]
    names = [spec.symbol, *spec.spellings]
    if spec.symbol == "Ω":
        names.append("\u2126")
    alt = "|".join(re.escape(n) for n in names)
    prefix = _PREFIX_CLASS if spec.prefixes else ""
    optional = "?" if not spec.prefixes and unit not in ("oz",) else ""
    return rf"^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)? ?({prefix}({alt})){optional}$"


def _parser(unit: str):
    def parse(value: Any) -> float:
        try:
            return parse_quantity(value, unit)
        except QuantityError as exc:
            raise ValueError(str(exc)) from None
    return parse


@functools.cache
def Q(unit: str) -> Any:  # noqa: N802 - reads like a type in field declarations
    """A float field given as text in ``unit``."""
    spec = UNITS[unit]
    return Annotated[float, BeforeValidator(_parser(unit)), WithJsonSchema({
        "type": "string" if spec.prefixes or unit == "oz" else ["string", "number"],
        "pattern": _unit_pattern(unit),
        "description": f"{spec.name}, e.g. '{_example(unit)}'",
    })]


def _example(unit: str) -> str:
    from .quantities import _example as ex  # one table of examples
    return ex(UNITS[unit])


Volts, Amps, Ohms = Q("V"), Q("A"), Q("Ω")
Farads, Henries, Watts, Seconds = Q("F"), Q("H"), Q("W"), Q("s")
AmpHours, Percent, Celsius, Kelvin = Q("Ah"), Q("%"), Q("°C"), Q("K")
KelvinPerWatt, AmpSquaredSeconds, Metres = Q("K/W"), Q("A²s"), Q("m")


def _drop_titles(node: Any) -> Any:
    # pydantic's per-property titles only repeat the key; editors show descriptions instead.
    if isinstance(node, dict):
        return {k: _drop_titles(v) for k, v in node.items()
                if not (k == "title" and isinstance(v, str))}
    if isinstance(node, list):
        return [_drop_titles(v) for v in node]
    return node


class Toleranced(Strict):
    """A data-sheet value: any of ``typ``, ``min``, ``max``, or ``typ`` with ``tol``.

    ``tol`` is absolute (same unit) or a percentage of ``typ``. A bare value means ``typ`` only.
    Resolved limits are in ``min``/``typ``/``max``; a limit the data sheet does not give is None.
    """

    typ: float | None = None
    min: float | None = None
    max: float | None = None

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
def Tol(unit: str) -> Any:  # noqa: N802
    """A toleranced field in ``unit``: ``{typ, min, max}`` any subset, ``{typ, tol}`` or a bare value."""
    spec = UNITS[unit]
    q = Q(unit)

    class Given(Strict):
        typ: q | None = None
        min: q | None = None
        max: q | None = None
        tol: Annotated[str | float | None, Field(description=(
            f"tolerance around typ: absolute in {spec.symbol} or a percentage ('1 %')"))] = None

    Given.__name__ = Given.__qualname__ = f"Toleranced_{_safe(spec.name)}"

    def build(value: Any) -> Any:
        if isinstance(value, Toleranced):
            return value
        if not isinstance(value, dict):
            value = {"typ": value}
        given = Given.model_validate(value)
        return _resolve(given, unit)

    given_schema = _drop_titles(Given.model_json_schema())
    given_schema["description"] = f"{spec.name}: any of typ, min, max; or typ with tol"
    return Annotated[Toleranced, BeforeValidator(build), WithJsonSchema({
        "anyOf": [given_schema, q_schema(unit)],
    })]


def q_schema(unit: str) -> dict:
    spec = UNITS[unit]
    return {"type": "string", "pattern": _unit_pattern(unit),
            "description": f"{spec.name}, e.g. '{_example(unit)}'"}


def _safe(name: str) -> str:
    return re.sub(r"[^A-Za-z0-9]+", "_", name).strip("_")


def _resolve(given: Any, unit: str) -> Toleranced:
    typ, low, high, tol = given.typ, given.min, given.max, given.tol
    if tol is not None:
        if typ is None:
            raise ValueError("'tol' needs 'typ'")
        if low is not None or high is not None:
            raise ValueError("give either 'tol' or 'min'/'max', not both")
        if isinstance(tol, str) and tol.strip().endswith("%"):
            pct = parse_quantity(tol, "%")
            delta = abs(typ) * pct / 100.0
        else:
            try:
                delta = parse_quantity(tol, unit)
            except QuantityError as exc:
                raise ValueError(f"tol: {exc}") from None
        if delta < 0:
            raise ValueError("'tol' must not be negative")
        low, high = typ - delta, typ + delta
    if typ is None and low is None and high is None:
        raise ValueError("give at least one of 'typ', 'min', 'max'")
    ordered = [v for v in (low, typ, high) if v is not None]
    if ordered != sorted(ordered):
        raise ValueError("limits out of order: need min <= typ <= max")
    return Toleranced(typ=typ, min=low, max=high)


# --- design-level sections ----------------------------------------------------------------------

class Range(Strict):
    min: Celsius
    max: Celsius

    @model_validator(mode="after")
    def _ordered(self) -> "Range":
        if self.min > self.max:
            raise ValueError("min is above max")
        # Beyond this no lithium pack operates, charges or is stored; such a number is a typo
        # (a unit or sign slip), and the temperature models are meaningless there [practice].
        for value in (self.min, self.max):
            if not -100.0 <= value <= 200.0:
                raise ValueError(f"{value:g} °C is outside -100 °C to 200 °C, where no battery "
                                 f"pack works; check the value and its sign")
        return self


class DesignInfo(Strict):
    name: str = Field(min_length=1, max_length=200)
    revision: str | None = Field(default=None, max_length=50)
    description: str | None = Field(default=None, max_length=2000)


class Terminals(Strict):
    pos: str = Field(default="P+", description="net where the charger and load connect, positive")
    neg: str = Field(default="P-", description="net where the charger and load connect, negative")


class Pack(Strict):
    ambient: Range = Field(description="ambient temperature range the pack operates in")
    terminals: Terminals = Field(default_factory=Terminals)
    wiring_inductance: Henries | None = Field(
        default=None, description="loop inductance of the pack wiring, for turn-off spikes")


class Peak(Strict):
    current: Amps
    duration: Seconds


class Load(Strict):
    continuous: Amps
    peak: Peak | None = None


class ReversePolarity(str, Enum):
    possible = "possible"
    prevented = "prevented"


class Charger(Strict):
    voltage: Tol("V") = Field(description="regulated charge voltage of the whole pack")
    current: Amps
    open_circuit_max: Volts = Field(description="worst-case voltage at the pack terminals with no cell")
    reverse_polarity: ReversePolarity = ReversePolarity.possible
    temperature_window: Range | None = Field(
        default=None, description="temperatures outside which the charger stops charging")


class Storage(Strict):
    soc: Percent = Field(description="state of charge the product ships or is stored at")
    duration: Q("months")
    temperature: Celsius = 25.0


class Waiver(Strict):
    rule: str = Field(min_length=1)
    element: str | None = None
    reason: str = Field(min_length=3)
    approved_by: str | None = None
    expires: datetime.date | None = Field(default=None, description="YYYY-MM-DD")


NetName = Annotated[str, BeforeValidator(lambda v: str(v) if isinstance(v, int) and not isinstance(v, bool) else v),
                    Field(min_length=1, max_length=100)]
Pins = Union[dict[str, NetName], list[NetName]]


# --- part kinds ---------------------------------------------------------------------------------

class Chemistry(str, Enum):
    lco = "lco"
    nmc = "nmc"
    nca = "nca"
    lfp = "lfp"
    lmo = "lmo"
    lto = "lto"


class CellVoltages(Strict):
    charge: Volts = Field(description="standard charge voltage")
    upper_limit: Volts | None = Field(default=None, description="highest charge voltage allowed")
    overcharge_limit: Volts | None = Field(
        default=None, description="voltage the cell must never see, even under a fault")
    nominal: Volts
    cutoff: Volts = Field(description="discharge cut-off voltage")
    lower_limit: Volts | None = Field(default=None, description="never discharge below this")


class CellCurrents(Strict):
    discharge: Amps
    charge: Amps


class OcvPoint(Strict):
    soc: Percent
    voltage: Volts


class Cell(Strict):
    kind: Literal["cell"]
    chemistry: Chemistry
    capacity: AmpHours
    voltage: CellVoltages
    internal_resistance: Tol("Ω")
    max_current: CellCurrents
    charge_temperature: Range | None = None
    self_discharge: Q("%/month") | None = None
    ocv: list[OcvPoint] | None = Field(default=None, description="the cell's own OCV-SoC table")


class ReleaseOn(str, Enum):
    charger = "charger"
    voltage = "voltage"
    load_removal = "load_removal"
    auto_retry = "auto_retry"


class Threshold(Strict):
    detect: Tol("V")
    release: Tol("V") | None = None
    delay: Tol("s")
    release_on: list[ReleaseOn] = Field(default_factory=list)


class CurrentThreshold(Threshold):
    """An over-current or short-circuit detection; it may release by retrying on its own."""

    retry_period: Seconds | None = Field(
        default=None, description="time between automatic retries (with release_on: [auto_retry])")

    @model_validator(mode="after")
    def _retrying(self) -> "CurrentThreshold":
        if self.retry_period is not None and ReleaseOn.auto_retry not in self.release_on:
            raise ValueError("'retry_period' needs 'auto_retry' in 'release_on'")
        return self


class OhmsRange(Strict):
    min: Ohms | None = None
    max: Ohms | None = None

    @model_validator(mode="after")
    def _ordered(self) -> "OhmsRange":
        if self.min is not None and self.max is not None and self.min > self.max:
            raise ValueError("min is above max")
        return self


class FaradsRange(Strict):
    min: Farads | None = None
    max: Farads | None = None

    @model_validator(mode="after")
    def _ordered(self) -> "FaradsRange":
        if self.min is not None and self.max is not None and self.min > self.max:
            raise ValueError("min is above max")
        return self


class SupplyFilter(Strict):
    """The protector maker's recommended supply filter: series resistor and capacitor ranges."""

    r: OhmsRange | None = Field(default=None, description="series resistor from the cell's + to supply")
    c: FaradsRange | None = Field(default=None, description="capacitor from supply to ground")


class SupplyCurrent(Strict):
    operating: Tol("A")
    power_down: Tol("A") | None = None


class Protector(Strict):
    kind: Literal["protector"]
    chemistry: list[Chemistry] | None = Field(
        default=None, description="chemistries the protector's thresholds are made for")
    cells: int = Field(default=1, ge=1, le=16)
    overcharge: Threshold
    overdischarge: Threshold
    overcurrent: CurrentThreshold
    short_circuit: CurrentThreshold | None = None
    supply_current: SupplyCurrent
    gate_drive: Literal["cell"] | Volts = Field(
        default="cell", description="'cell' when the gates are driven at the cell voltage")
    supply_filter: SupplyFilter | None = Field(
        default=None, description="recommended supply filter: {r: {min, max}, c: {min, max}}")


class Channel(str, Enum):
    n = "n"
    p = "p"


class RdsOnPoint(Strict):
    vgs: Volts
    typ: Ohms | None = None
    max: Ohms | None = None

    @model_validator(mode="after")
    def _given(self) -> "RdsOnPoint":
        if self.typ is None and self.max is None:
            raise ValueError("give 'typ' or 'max'")
        if self.typ is not None and self.max is not None and self.typ > self.max:
            raise ValueError("typ is above max")
        if (self.typ is not None and self.typ <= 0) or (self.max is not None and self.max <= 0):
            raise ValueError("on-resistance must be above zero")
        return self


class HotRatio(Strict):
    at: Celsius = 125.0
    ratio: float = Field(gt=0.5, lt=5.0)


class FetCommon(Strict):
    channel: Channel
    vds_max: Volts
    vgs_max: Volts
    vgs_th: Tol("V")
    rds_on: list[RdsOnPoint] = Field(min_length=1, max_length=20)
    rds_on_hot_ratio: HotRatio | None = None
    id_max: Amps
    id_pulse_max: Amps | None = None
    turn_off_time: Seconds | None = Field(
        default=None, description="drain current fall time when the gate is pulled off, for "
                                  "turn-off spikes (1 µs assumed when not given)")
    theta_ja: KelvinPerWatt
    tj_max: Celsius = 150.0
    idss: Amps | None = Field(default=None, description="drain leakage at vds_max")


class Fet(FetCommon):
    kind: Literal["fet"]


class FetPair(FetCommon):
    kind: Literal["fet_pair_common_drain"]


class FuseSpeed(str, Enum):
    quick_acting = "quick_acting"
    time_lag = "time_lag"


class Fuse(Strict):
    kind: Literal["fuse"]
    rated_current: Amps
    rated_voltage: Volts
    breaking_capacity: Amps
    melting_i2t: AmpSquaredSeconds | None = None
    speed: FuseSpeed = FuseSpeed.time_lag
    resistance: Ohms | None = Field(default=None, description="cold resistance")


class Ptc(Strict):
    kind: Literal["ptc"]
    hold_current: Amps
    trip_current: Amps
    rated_voltage: Volts
    max_current: Amps
    resistance: Tol("Ω")


class Resistor(Strict):
    kind: Literal["resistor"]
    value: Ohms
    tol: Percent = 1.0
    power: Watts | None = None


class Capacitor(Strict):
    kind: Literal["capacitor"]
    value: Farads
    voltage: Volts | None = None


class Layer(str, Enum):
    outer = "outer"
    inner = "inner"


class Trace(Strict):
    kind: Literal["trace"]
    width: Metres
    length: Metres
    thickness: Metres | None = None
    copper_weight: Q("oz") | None = None
    layer: Layer = Layer.outer

    @model_validator(mode="after")
    def _copper(self) -> "Trace":
        if (self.thickness is None) == (self.copper_weight is None):
            raise ValueError("give exactly one of 'thickness' and 'copper_weight'")
        return self


class Wire(Strict):
    kind: Literal["wire"]
    rated_current: Amps
    resistance: Ohms | None = None
    length: Metres | None = None
    cross_section: Q("m") | None = Field(default=None, description="not used yet")


class Diode(Strict):
    kind: Literal["diode"]
    forward_voltage: Volts = 0.7
    led: bool = False
    current: Amps | None = Field(default=None, description="current when lit, for LEDs")


PART_KINDS: dict[str, type[Strict]] = {
    "cell": Cell, "protector": Protector, "fet": Fet, "fet_pair_common_drain": FetPair,
    "fuse": Fuse, "ptc": Ptc, "resistor": Resistor, "capacitor": Capacitor, "trace": Trace,
    "wire": Wire, "diode": Diode,
}

Part = Annotated[Union[tuple(Annotated[m, Tag(k)] for k, m in PART_KINDS.items())],
                 Discriminator(lambda v: v.get("kind") if isinstance(v, dict) else getattr(v, "kind", None),
                               custom_error_type="unknown_kind",
                               custom_error_message="unknown or missing part kind",
                               custom_error_context={"kinds": ", ".join(PART_KINDS)})]


# --- components ---------------------------------------------------------------------------------

class PartRef(Strict):
    """A component that uses a library part by name."""

    part: str = Field(min_length=1, max_length=100)
    pins: Pins
    note: str | None = None


def _inline(kind: str, model: type[Strict]) -> type[Strict]:
    return type(f"Inline{model.__name__}", (model,), {
        "__annotations__": {"pins": Pins, "note": str | None},
        "note": None,
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


class Design(Strict):
    format: Literal["packwarden/1"] = Field(alias="format")
    design: DesignInfo
    libraries: list[str] = Field(default_factory=list, max_length=50)
    pack: Pack
    load: Load
    charger: Charger | None = None
    storage: Storage | None = None
    components: dict[RefDes, Component] = Field(max_length=20000)
    waivers: list[Waiver] = Field(default_factory=list)


class PartLibrary(Strict):
    format: Literal["packwarden-parts/1"]
    include: list[str] = Field(default_factory=list, max_length=50)
    parts: dict[Annotated[str, Field(min_length=1, max_length=100)], Part] = Field(default_factory=dict)


# --- JSON Schema --------------------------------------------------------------------------------

def json_schema(which: str) -> dict:
    """The JSON Schema of a design or a part library, in draft-07-compatible keywords."""
    if which == "policy":  # the team policy's model lives with its checks in policy.py
        from .policy import policy_json_schema
        return policy_json_schema()
    model = {"design": Design, "parts": PartLibrary}[which]
    schema = model.model_json_schema(ref_template="#/definitions/{model}", mode="validation")
    defs = schema.pop("$defs", {})
    schema = _drop_titles(schema)
    out = {"$schema": "http://json-schema.org/draft-07/schema#",
           "$id": f"https://packwarden.invalid/schemas/{which}.schema.json",
           "title": {"design": "packwarden design (format packwarden/1)",
                     "parts": "packwarden part library (format packwarden-parts/1)"}[which]}
    out.update(schema)
    out["definitions"] = {k: _drop_titles(v) for k, v in sorted(defs.items())}
    return out
