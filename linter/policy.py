"""Team policy: limits on computed figures and part parameters, written as data — no code runs.

A team names its policy file in its config (``policy = "team-policy.yaml"`` under
``[tool.packwarden]``)::

    format: packwarden-policy/1
    limits:
      - id: trip-max-product-line          # findings carry the rule id policy/trip-max-product-line
        figure: trip_current_max            # a key of the design's figures (JSON "figures")
        max: 5 A
        reason: our connector is rated 5 A  # shown as the finding's hint
      - id: fet-vds-30
        part: {kind: [fet, fet_pair_common_drain]}
        parameter: vds_max
        min: 30 V
      - id: no-legacy-fuse
        part: {name: OR-FUSE-5A}
        banned: true
        severity: warning
      - id: short-under-200a
        figure: hard-short.current          # an event's figure: <event>.<current|duration|i2t|voltage>
        max: 200 A

A figure is a key of the design's figures, or a figure of one of its events in time
(docs/rules-api.md, "Events"), named ``<event>.<what>`` with ``what`` one of ``current``,
``duration``, ``i2t`` and ``voltage`` (:data:`EVENT_FIGURES`): ``gap-overload.i2t``,
``charger-reversed.voltage``. A design without that event, or an event without that figure (an
event that lasts for ever has no duration), has nothing to bound.

The file is read by the same strict loader as designs (no aliases, tags or merge keys; size and
depth limits), checked by the pydantic model :class:`PolicyFile` (the JSON Schema
``schemas/policy.schema.json`` is generated from it), and every bound is parsed strictly in the unit
of what it bounds: ``max: 5 mV`` on a current is an error, not a guess. Mistakes are
:class:`~packwarden.loader.InputError` with file, line and column.

Each limit yields ordinary findings — rule id ``policy/<id>``, the policy's severity, the element,
the figures compared, the reason as hint — so they appear in every report format and can be
waived like any rule's findings.
"""

from __future__ import annotations

import difflib
import math
import re
import types
from pathlib import Path
from typing import Annotated, Any, Iterable, Literal, Union, get_args, get_origin

from pydantic import BaseModel, Field, StrictFloat, StrictInt, StrictStr, WithJsonSchema

from .api import Figure, Finding, RuleContext, Severity
from .figures import DECLARED, KeyFigure
from .model.events import EVENT_NAMES
from .loader import Document, InputError, load_file
from .quantities import UNITS, QuantityError, format_quantity, parse_quantity
from .schema import PART_KINDS, Strict, Toleranced, drop_titles, quantity_of
from .validate import validate
from .records import record

#: The figures of an event a policy may bound, by what they are called after the event's name
#: (``hard-short.current``), with their units: the ``Event``'s attributes of the same names.
EVENT_QUANTITIES = {"current": "A", "duration": "s", "i2t": "A²s", "voltage": "V"}
#: Every event figure a policy may name, with its unit.
EVENT_FIGURES = {f"{event}.{what}": unit for event in EVENT_NAMES
                 for what, unit in EVENT_QUANTITIES.items()}

POLICY_FORMAT = "packwarden-policy/1"
RULE_PREFIX = "policy/"
LIMIT_ID = re.compile(r"^[a-z0-9][a-z0-9-]{0,62}$")

# --- the file format (pydantic; the JSON Schema is generated from here) -------------------------

KindName = Literal[tuple(PART_KINDS)]  # type: ignore[valid-type]
PartName = Annotated[str, Field(min_length=1, max_length=100)]
Bound = Annotated[Union[StrictStr, StrictInt, StrictFloat], WithJsonSchema({
    "type": ["string", "number"],
    "description": "a value in the unit of the figure or parameter, e.g. '5 A' or '30 V'; a "
                   "plain number for counts"})]


class PartSelector(Strict):
    """Which components a part limit applies to: all given conditions must hold."""

    kind: KindName | list[KindName] | None = Field(
        default=None, description="part kind(s), e.g. fet or [fet, fet_pair_common_drain]")
    name: PartName | list[PartName] | None = Field(
        default=None, description="library part name(s)")


class LimitSpec(Strict):
    """One limit: a bound on a design figure, or on a parameter of some parts, or a banned part."""

    id: Annotated[str, WithJsonSchema({"type": "string", "pattern": LIMIT_ID.pattern})] = Field(
        description="stable id; findings carry the rule id policy/<id>")
    figure: Annotated[str, WithJsonSchema({"type": "string", "enum": [*DECLARED, *EVENT_FIGURES]})] | None = Field(
        default=None, description="a key of the design's figures, e.g. trip_current_max, or an "
                                  "event's figure, <event>.<current|duration|i2t|voltage>, e.g. "
                                  "hard-short.current")
    part: PartSelector | None = Field(default=None, description="the parts this limit applies to")
    parameter: str | None = Field(default=None, description="a part parameter, e.g. vds_max or "
                                                            "voltage.charge (needs part.kind)")
    min: Bound | None = Field(default=None, description="lowest allowed value")
    max: Bound | None = Field(default=None, description="highest allowed value")
    banned: bool | None = Field(default=None, description="true: the selected parts must not be "
                                                          "used at all")
    severity: Severity = Severity.error
    reason: str | None = Field(default=None, max_length=500,
                               description="why the team set this limit; shown as the hint")


class PolicyFile(Strict):
    format: Literal["packwarden-policy/1"]
    limits: list[LimitSpec] = Field(default_factory=list, max_length=1000)


def policy_json_schema() -> dict:
    """The JSON Schema of policy files, in the same draft-07 shape as the design schema."""
    schema = PolicyFile.model_json_schema(ref_template="#/definitions/{model}", mode="validation")
    defs = schema.pop("$defs", {})
    out = {"$schema": "http://json-schema.org/draft-07/schema#",
           "$id": "https://packwarden.invalid/schemas/policy.schema.json",
           "title": f"packwarden team policy (format {POLICY_FORMAT})"}
    out.update(drop_titles(schema))
    out["definitions"] = {k: drop_titles(v) for k, v in sorted(defs.items())}
    return out


# --- the checked policy -------------------------------------------------------------------------

@record(frozen=True)
class Limit:
    id: str
    severity: Severity
    reason: str | None
    source: str  # "file:line" where the limit is written
    unit: str = ""  # of what is bounded; "" for plain numbers
    figure: str | None = None
    kinds: tuple[str, ...] = ()
    names: tuple[str, ...] = ()
    parameter: tuple[str, ...] = ()
    low: float | None = None
    high: float | None = None
    banned: bool = False

    @property
    def rule(self) -> str:
        return RULE_PREFIX + self.id

    def applies_to(self, kind: str | None, part_name: str | None) -> bool:
        return ((not self.kinds or kind in self.kinds)
                and (not self.names or part_name in self.names))


@record(frozen=True)
class Policy:
    file: str
    limits: tuple[Limit, ...]


def load_policy(path: Path, shown: str | None = None) -> Policy:
    """Read and check a policy file; raise the first :class:`InputError` found."""
    policy, errors = read_policy(path, shown)
    if errors:
        raise errors[0]
    assert policy is not None
    return policy


def read_policy(path: Path, shown: str | None = None) -> tuple[Policy | None, list[InputError]]:
    """Read and check a policy file: the policy, or every mistake with its position."""
    shown = shown if shown is not None else str(path)
    try:
        doc = load_file(path, shown)
    except InputError as exc:
        return None, [exc]
    model, errors = validate(doc, PolicyFile)
    if errors:
        return None, errors
    limits: list[Limit] = []
    errors = []
    seen: dict[str, int] = {}
    for i, spec in enumerate(model.limits):
        where = ("limits", i)
        if spec.id in seen:
            errors.append(doc.error(where + ("id",), f"limit id '{spec.id}' is also used on line "
                                                     f"{seen[spec.id]}; ids must be unique"))
            continue
        seen[spec.id] = doc.where(where + ("id",)).line
        if not LIMIT_ID.match(spec.id):
            errors.append(doc.error(where + ("id",), f"limit id '{spec.id}': use lowercase "
                                                     f"letters, digits and '-' (at most 63), "
                                                     f"e.g. 'fet-vds-30'"))
            continue
        try:
            limits.append(_limit(doc, where, spec))
        except InputError as exc:
            errors.append(exc)
    if errors:
        return None, errors
    return Policy(shown, tuple(limits)), []


def _limit(doc: Document, where: tuple, spec: LimitSpec) -> Limit:
    raw = doc.data["limits"][where[1]]

    def fail(key: str | None, message: str, on_key: bool = False) -> InputError:
        return doc.error(where + ((key,) if key else ()), message, key=on_key)

    source = f"{doc.file}:{doc.where(where).line}"
    common = dict(id=spec.id, severity=spec.severity, reason=spec.reason, source=source)
    if spec.figure is not None and spec.part is not None:
        raise fail("part", "a limit bounds either a 'figure' or a 'part', not both", on_key=True)
    if spec.figure is None and spec.part is None:
        raise fail(None, "a limit needs 'figure' (a design figure) or 'part' (which parts it "
                         "applies to)")
    if spec.banned is False:
        raise fail("banned", "'banned: false' bans nothing; leave the key out")
    if spec.figure is not None:
        for key in ("parameter", "banned"):
            if key in raw:
                raise fail(key, f"'{key}' belongs to part limits; a figure limit gives 'min' "
                                f"and/or 'max'", on_key=True)
        known = [*DECLARED, *EVENT_FIGURES]
        if spec.figure not in known:
            close = difflib.get_close_matches(spec.figure, known, n=1)
            raise fail("figure", f"unknown figure '{spec.figure}'" +
                       (f" (did you mean '{close[0]}'?)" if close else
                        f"; known figures: {', '.join(DECLARED)}, or an event's "
                        f"<event>.<{'|'.join(EVENT_QUANTITIES)}> with the events "
                        f"{', '.join(EVENT_NAMES)}"))
        unit = DECLARED[spec.figure].unit if spec.figure in DECLARED else EVENT_FIGURES[spec.figure]
        low, high = _bounds(doc, where, spec, raw, unit, f"figure {spec.figure}")
        return Limit(**common, unit=unit, figure=spec.figure, low=low, high=high)

    sel = spec.part
    assert sel is not None
    kinds = _names(sel.kind)
    names = _names(sel.name)
    if not kinds and not names:
        raise fail("part", "say which parts: give 'kind' and/or 'name'")
    if spec.banned:
        for key in ("parameter", "min", "max"):
            if key in raw:
                raise fail(key, f"a banned part is banned whatever its '{key}'; give 'banned: "
                                f"true' or a parameter with bounds, not both", on_key=True)
        return Limit(**common, kinds=kinds, names=names, banned=True)
    if spec.parameter is None:
        raise fail(None, "a part limit gives 'parameter' with 'min' and/or 'max', or "
                         "'banned: true'")
    if not kinds:
        raise fail("part", "a parameter limit needs 'kind', so the parameter and its unit are "
                           "known: e.g. part: {kind: fet, name: ...}")
    dotted = tuple(spec.parameter.split("."))
    units = set()
    for kind in kinds:
        try:
            units.add(parameter_unit(kind, dotted))
        except ValueError as exc:
            raise fail("parameter", str(exc)) from None
    if len(units) > 1:  # pragma: no cover - no parameter has different units across kinds today
        raise fail("parameter", f"'{spec.parameter}' has different units across "
                                f"{', '.join(kinds)}; write one limit per kind")
    unit = units.pop()
    low, high = _bounds(doc, where, spec, raw, unit, f"parameter {spec.parameter}")
    return Limit(**common, unit=unit, kinds=kinds, names=names, parameter=dotted, low=low, high=high)


def _names(value: Any) -> tuple[str, ...]:
    if value is None:
        return ()
    return tuple(dict.fromkeys([value] if isinstance(value, str) else value))


def _bounds(doc: Document, where: tuple, spec: LimitSpec, raw: dict, unit: str,
            what: str) -> tuple[float | None, float | None]:
    if spec.min is None and spec.max is None:
        raise doc.error(where, f"the limit on {what} gives neither 'min' nor 'max'")
    out = []
    for key in ("min", "max"):
        value = getattr(spec, key)
        if value is None:
            out.append(None)
            continue
        try:
            out.append(parse_bound(value, unit))
        except QuantityError as exc:
            unit_text = f"is in {UNITS[unit].name} ({unit})" if unit else "is a count"
            raise doc.error(where + (key,), f"{key}: {exc} ({what} {unit_text})") from None
    low, high = out
    if low is not None and high is not None and low > high:
        raise doc.error(where + ("max",), f"max {_fmt(high, unit)} is below min {_fmt(low, unit)}")
    return low, high


def parse_bound(value: Any, unit: str) -> float:
    """A bound in ``unit`` (strict, as design values are read); ``""`` takes a plain number."""
    if unit:
        return parse_quantity(value, unit)
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise QuantityError(f"expected a plain number, got {value!r}")
    number = float(value)
    if not math.isfinite(number):
        raise QuantityError(f"{value!r} is not a finite number")
    return number


# --- which parameters a part limit may name -----------------------------------------------------

def _members(ann: Any) -> list[Any]:
    if get_origin(ann) in (Union, types.UnionType):
        return [a for a in get_args(ann) if a is not type(None)]
    return [ann]


def parameter_unit(kind: str, dotted: tuple[str, ...]) -> str:
    """The unit of part parameter ``dotted`` of ``kind`` ("" for plain numbers).

    Raises ValueError with a message fit for the user when the parameter does not exist or is not
    one number (a table, a list, text).
    """
    model: type[BaseModel] = PART_KINDS[kind]
    for depth, name in enumerate(dotted):
        fields = {n: f for n, f in model.model_fields.items() if n not in ("kind",)}
        if name not in fields:
            close = difflib.get_close_matches(name, list(fields), n=1)
            at = ".".join(dotted[:depth]) or kind
            raise ValueError(f"a {kind} has no parameter '{'.'.join(dotted[:depth + 1])}'" +
                             (f" (did you mean '{close[0]}'?)" if close else
                              f"; {at} has: {', '.join(fields)}"))
        info = fields[name]
        members = _members(info.annotation)
        last = depth == len(dotted) - 1
        markers = list(info.metadata)
        if len(members) == 1 and get_origin(members[0]) is Annotated:
            markers += list(get_args(members[0])[1:])
            base = get_args(members[0])[0]
        else:
            base = members[0] if len(members) == 1 else None
        found = quantity_of(markers)
        unit = found[1] if found else None
        whole = ".".join(dotted[:depth + 1])
        if unit is not None or base is Toleranced:
            if not last:
                raise ValueError(f"'{whole}' of a {kind} is one value; it has no "
                                 f"'{dotted[depth + 1]}'" + (
                                     " (a limit on a toleranced value checks its lowest value "
                                     "against min and its highest against max)"
                                     if base is Toleranced else ""))
            if unit is None:  # pragma: no cover - every Toleranced field is made by Tol(unit)
                raise ValueError(f"'{whole}' of a {kind} has no known unit")
            return unit
        if isinstance(base, type) and issubclass(base, BaseModel):
            if last:
                raise ValueError(f"'{whole}' of a {kind} is a group of values "
                                 f"({', '.join(base.model_fields)}); name one, e.g. "
                                 f"{whole}.{next(iter(base.model_fields))}")
            model = base
            continue
        if base in (int, float) and last:
            return ""
        raise ValueError(f"'{whole}' of a {kind} is not a single number; a limit bounds one "
                         f"number")
    raise ValueError("empty parameter")  # pragma: no cover - split('.') never yields ()


# --- checking a design --------------------------------------------------------------------------

def check_policy(policy: Policy, ctx_for, figures: dict[str, KeyFigure], netlist: Any,
                 held_back: bool = False, events: Any = ()) -> tuple[list[Finding], list[str]]:
    """Findings of every limit on one design, and the limits held back.

    ``ctx_for(limit)`` makes the :class:`RuleContext` a limit reports through; ``events`` are the
    design's events in time (``DesignModel.events``), which event figures are read from, or a
    callable that gives them (asked only when a limit names one). Figure limits are
    electrical and, like electrical rules, wait while the netlist has integrity errors
    (``held_back``): a figure computed from a misspelt part is not worth bounding.
    """
    findings: list[Finding] = []
    skipped: list[str] = []
    for limit in policy.limits:
        if limit.figure is not None:
            if held_back:
                skipped.append(limit.rule)
                continue
            if limit.figure in EVENT_FIGURES:
                events = events() if callable(events) else events
                found = _event_figure(limit.figure, events)
                if found is None:
                    continue  # no such event, or it has no such figure: nothing to bound
                name, value = found
                findings.extend(_bound_findings(limit, ctx_for(limit), name, value,
                                                ("protector",), netlist))
                continue
            findings.extend(_figure_findings(limit, ctx_for(limit), figures, netlist))
        else:
            findings.extend(_part_findings(limit, ctx_for(limit), netlist))
    return findings, skipped


def _hint(limit: Limit) -> str:
    return limit.reason or f"team policy limit '{limit.id}' ({limit.source})"


def _fmt(value: float, unit: str) -> str:
    return format_quantity(value, unit) if unit else f"{value:g}"


def _anchor(kinds: tuple[str, ...], netlist: Any) -> tuple[tuple, str | None]:
    if kinds:
        found = sorted(netlist.of_kind(*kinds), key=lambda c: c.refdes)
        if found:
            c = found[0]
            return c.path + (("part",) if c.part_name is not None else ("kind",)), c.refdes
    return ("components",), None


def _event_figure(name: str, events: Any) -> tuple[str, Any] | None:
    """(name, value) of event figure ``name`` (``hard-short.current``) among ``events``, or None."""
    event_name, what = name.rsplit(".", 1)
    event = next((e for e in events if e.name == event_name), None)
    value = getattr(event, what) if event is not None else None
    return None if value is None else (name, value)


def _figure_findings(limit: Limit, ctx: RuleContext, figures: dict[str, KeyFigure],
                     netlist: Any) -> Iterable[Finding]:
    name = limit.figure
    if name not in figures:
        return  # the design has no such figure (no short-circuit detection, say): nothing to bound
    figure = figures[name]
    value = figure.value if figure.known else None
    yield from _bound_findings(limit, ctx, name, value, DECLARED[name].element, netlist)


def _bound_findings(limit: Limit, ctx: RuleContext, name: str, value: Any,
                    kinds: tuple[str, ...], netlist: Any) -> Iterable[Finding]:
    """The findings of ``limit`` on a figure's ``value`` (None or not finite: it could not be
    computed), located at the design's first component of ``kinds``."""
    unit = limit.unit
    path, element = _anchor(kinds, netlist)
    if value is None or not math.isfinite(value):
        yield ctx.finding(f"{name} could not be computed for this design, so the policy limit on "
                          f"it cannot be checked", path=path, element=element, key="unknown",
                          hint=_hint(limit))
        return
    value = float(value)
    for bound, side, failed in (("min", "minimum", limit.low is not None and value < limit.low),
                                ("max", "maximum", limit.high is not None and value > limit.high)):
        if failed:
            target = limit.low if bound == "min" else limit.high
            word = "below" if bound == "min" else "above"
            yield ctx.finding(
                f"{name} {_fmt(value, unit)} is {word} the policy {side} {_fmt(target, unit)}",
                path=path, element=element, key=bound, hint=_hint(limit),
                headline=name, lower_is_worse=bound == "min",
                figures=[Figure(name, value, unit), Figure(f"policy {bound}", target, unit)])


def _part_findings(limit: Limit, ctx: RuleContext, netlist: Any) -> Iterable[Finding]:
    for refdes in sorted(netlist.components):
        c = netlist.components[refdes]
        if not limit.applies_to(c.kind, c.part_name):
            continue
        inline = c.part_name is None
        what = f"part '{c.part_name}'" if not inline else f"its inline {c.kind}"
        if limit.banned:
            path = c.path + (("kind",) if inline else ("part",))
            yield ctx.finding(f"{refdes} uses {what}, which the team policy bans", path=path,
                              element=refdes, key="banned", hint=_hint(limit))
            continue
        if c.part is None:
            continue  # unknown part: unknown-part says so; there are no parameters to bound
        value: Any = c.part
        for name in limit.parameter:
            value = getattr(value, name, None)
            if value is None:
                break
        dotted = ".".join(limit.parameter)
        # inline parts keep their parameters in the design; library parts in the library
        path = c.path + (limit.parameter if inline else ("part",))
        if value is None:
            yield ctx.finding(f"{refdes}: {what} does not give {dotted}, which the team policy "
                              f"bounds", path=c.path + ("part",) if not inline else c.path,
                              element=refdes, key="missing", hint=_hint(limit))
            continue
        for bound, side in (("min", "minimum"), ("max", "maximum")):
            target = limit.low if bound == "min" else limit.high
            if target is None:
                continue
            # a toleranced value is checked at its worst case against each bound
            v = (value.low if bound == "min" else value.high) if isinstance(value, Toleranced) \
                else float(value)
            if (v < target) if bound == "min" else (v > target):
                word = "below" if bound == "min" else "above"
                shown = dotted + ((" (lowest)" if bound == "min" else " (highest)")
                                  if isinstance(value, Toleranced) else "")
                yield ctx.finding(
                    f"{refdes}: {what} has {shown} {_fmt(v, limit.unit)}, {word} the policy "
                    f"{side} {_fmt(target, limit.unit)}", path=path, element=refdes, key=bound,
                    hint=_hint(limit), headline=dotted, lower_is_worse=bound == "min",
                    figures=[Figure(dotted, v, limit.unit), Figure(f"policy {bound}", target,
                                                                   limit.unit)])
