"""The design assistant: what a design can carry, and which library parts would fix its findings.

It sits above the engine and knows no physics: every answer comes from linting the design again
with a value changed in memory (:mod:`packwarden.overrides`), exactly as ``packwarden check``
would lint the changed file. Two questions:

* the **capability envelope**: the highest continuous load, the highest peak for a duration and
  the ambient range for which the design still passes, each found by a monotone search (grow the
  value until a rule objects, then bisect between the last pass and the first failure) and each
  naming the finding that sets it;
* **part suggestions**: for a part with findings, every part of the same kind in the design's
  libraries put in its place (in every component that uses it), re-linted; those that leave the
  design passing, ranked by the load headroom they leave (see :func:`headroom`).

"Passing" means no finding of a counted severity (error and warning, :data:`COUNTED`) that no
waiver accepts, and no input error. The searches assume the answer is monotone in the value (a
larger load never passes where a smaller one fails); each limit is checked at the resolution
below, no finer.
"""

from __future__ import annotations

import math
import re
from dataclasses import field
from pathlib import Path
from typing import Any, Callable

from .api import Finding, Severity
from .library import resolve_libraries
from .loader import Document, InputError, load_file
from .overrides import Override, OverrideError, apply_overrides
from .pipeline import Session, hints_unsearched, lint_file
from .quantities import format_quantity
from .records import record
from .schema import HIGHEST_C, LOWEST_C, MAX_AMPS

__all__ = ["COUNTED", "CURRENT_RESOLUTION", "TEMPERATURE_RESOLUTION", "HEADROOM_CEILING",
           "Blocker", "Limit", "Suggestion", "PartAdvice", "Assistance", "Relinter",
           "continuous_overrides", "peak_overrides", "ambient_overrides", "scaled_load_overrides",
           "envelope", "suggestions", "assist", "headroom", "assist_run", "render_text",
           "render_json", "ValueAdvice", "values_to_change"]

#: Severities that stop a design from passing. An info finding states a fact, not a fault.
COUNTED = (Severity.error, Severity.warning)
#: A current limit is found to within this share of itself: the last passing value and the first
#: failing one differ by at most 0.5 %.
CURRENT_RESOLUTION = 0.005
#: An ambient limit is found to within 0.5 K.
TEMPERATURE_RESOLUTION = 0.5
#: The load headroom is searched up to 16 × the design's loads; beyond that it reads "more than".
HEADROOM_CEILING = 16.0


@record(frozen=True)
class Blocker:
    """What stops a design from passing: a finding's rule, element and message, or an input
    error (rule ``input``)."""

    rule: str
    element: str
    message: str

    def as_dict(self) -> dict[str, str]:
        return {"rule": self.rule, "element": self.element, "message": self.message}

    def text(self) -> str:
        return f"{self.rule}{' at ' + self.element if self.element else ''}: {self.message}"


@record
class Limit:
    """One edge of the envelope: ``value`` is the last passing value the search found (None: no
    value passes), ``failing`` the first failing one beside it (None: nothing failed up to the
    format's own bound ``bound``), ``blocker`` what fails there."""

    name: str
    unit: str
    given: float | None
    value: float | None
    failing: float | None = None
    blocker: Blocker | None = None
    bound: float | None = None
    note: str = ""

    def as_dict(self) -> dict[str, Any]:
        return {"name": self.name, "unit": self.unit, "given": self.given, "value": self.value,
                "failing": self.failing, "bound": self.bound, "note": self.note,
                "blocker": self.blocker.as_dict() if self.blocker else None,
                # as the text shows them, with units ("n/a" where there is none)
                "shown": {"value": _q(self.value, self.unit), "failing": _q(self.failing, self.unit),
                          "given": _q(self.given, self.unit), "bound": _q(self.bound, self.unit)}}

    def text(self) -> str:
        if self.value is None:
            head = f"{self.name}: no value passes"
        elif self.failing is None:
            head = (f"{self.name}: {_q(self.value, self.unit)} and beyond: no rule objects up to "
                    f"the format's bound {_q(self.bound, self.unit)}" if self.bound is not None
                    else f"{self.name}: {_q(self.value, self.unit)}")
        else:
            head = (f"{self.name}: {_q(self.value, self.unit)} (fails at "
                    f"{_q(self.failing, self.unit)}; as designed {_q(self.given, self.unit)})")
        lines = [head + (f"; {self.note}" if self.note else "")]
        if self.blocker is not None:
            lines.append(f"    set by {self.blocker.text()}")
        return "\n".join(lines)


@record
class Suggestion:
    """A library part that leaves the design passing in place of the part at fault, with the
    load headroom it leaves: loads up to ``headroom`` × the design's pass (None: it passes up to
    :data:`HEADROOM_CEILING`), and the finding that ends it."""

    part: str
    headroom: float | None
    blocker: Blocker | None

    @property
    def margin_percent(self) -> float | None:
        return None if self.headroom is None else round((self.headroom - 1.0) * 100.0, 1)

    def as_dict(self) -> dict[str, Any]:
        return {"part": self.part, "load_margin_percent": self.margin_percent,
                "blocker": self.blocker.as_dict() if self.blocker else None}

    def text(self) -> str:
        if self.headroom is None:
            return (f"{self.part}: passes; loads can rise more than "
                    f"{(HEADROOM_CEILING - 1) * 100:.0f} % before any rule objects")
        return (f"{self.part}: passes; loads can rise {self.margin_percent:g} % before "
                f"{self.blocker.text() if self.blocker else 'a rule objects'}")


@record
class PartAdvice:
    """For one part with findings: the components using it, their findings, what fixes them."""

    part: str
    kind: str
    components: list[str]
    findings: list[Blocker]
    passing: list[Suggestion] = field(default_factory=list)
    #: Parts of the same kind that were tried and still fail, each with its first blocker.
    failing: list[tuple[str, Blocker]] = field(default_factory=list)
    note: str = ""

    def as_dict(self) -> dict[str, Any]:
        return {"part": self.part, "kind": self.kind, "components": self.components,
                "findings": [b.as_dict() for b in self.findings],
                "suggestions": [s.as_dict() for s in self.passing],
                "tried_and_failing": [{"part": p, "blocker": b.as_dict()} for p, b in self.failing],
                "note": self.note}

    def text(self) -> str:
        rules = ", ".join(sorted({b.rule for b in self.findings}))
        lines = [f"{self.part} ({', '.join(self.components)}; {rules}):"]
        for s in self.passing:
            lines.append(f"    {s.text()}")
        if not self.passing:
            lines.append(f"    {self.note or 'no part of the same kind in the libraries fixes it'}")
            for p, b in self.failing:
                lines.append(f"    {p}: still fails: {b.text()}")
        return "\n".join(lines)


@record
class Assistance:
    """The assistant's answer for one design."""

    file: str
    counted: tuple[str, ...]
    #: Blocking findings of the design as given; when any, the envelope is empty.
    blockers: list[Blocker] = field(default_factory=list)
    limits: list[Limit] = field(default_factory=list)
    advice: list[PartAdvice] = field(default_factory=list)
    #: For findings no library part fixes: a value from the finding's hint, re-linted.
    values: list["ValueAdvice"] = field(default_factory=list)
    #: Why the assistant could not work on the design (it does not lint), else "".
    unusable: str = ""
    seconds: float = 0.0
    lints: int = 0

    def as_dict(self) -> dict[str, Any]:
        return {"file": self.file, "counted_severities": list(self.counted),
                "resolution": {"current": f"{CURRENT_RESOLUTION * 100:g} %",
                               "temperature": f"{TEMPERATURE_RESOLUTION:g} K"},
                "unusable": self.unusable,
                "blockers": [b.as_dict() for b in self.blockers],
                "envelope": [lim.as_dict() for lim in self.limits],
                "parts": [a.as_dict() for a in self.advice],
                "values": [v.as_dict() for v in self.values],
                "lints": self.lints, "seconds": round(self.seconds, 2)}

    def text(self) -> str:
        out = [f"{self.file}: design assistant (passing: no {' or '.join(self.counted)} finding; "
               f"resolution {CURRENT_RESOLUTION * 100:g} % on currents, "
               f"{TEMPERATURE_RESOLUTION:g} K on ambient)"]
        if self.unusable:
            out.append(f"  {self.unusable}")
            return "\n".join(out) + "\n"
        out.append("  Capability envelope:")
        if self.blockers:
            out.append("    empty: the design as given does not pass; first fix")
            out += [f"      {b.text()}" for b in self.blockers]
        out += ["    " + line for lim in self.limits for line in lim.text().splitlines()]
        out.append("  Part suggestions (ranked by load headroom, largest first):")
        if not self.advice:
            out.append("    no finding at a library part")
        out += ["    " + line for a in self.advice for line in a.text().splitlines()]
        if self.values:
            out.append("  Values to change (findings no library part fixes; each value from the "
                       "finding's hint, linted again):")
            out += [f"    {v.text()}" for v in self.values]
        out.append(f"  ({self.lints} lints in {self.seconds:.1f} s)")
        return "\n".join(out) + "\n"


def _q(value: float | None, unit: str) -> str:
    if value is None:
        return "n/a"
    if unit == "°C":
        return f"{value:.1f} °C"
    return format_quantity(value, unit, 4)


def _written(value: float, unit: str) -> str:
    """A value as the design's format reads it: plain decimals (no exponent) and the unit."""
    text = f"{value:.6f}".rstrip("0").rstrip(".") if abs(value) >= 1e-3 else f"{value:.12f}"
    return f"{text} {unit}"


# --- re-linting -----------------------------------------------------------------------------------

@record
class Relinter:
    """Lints one design again and again with changes, through one session (libraries read once)."""

    session: Session
    path: Path
    shown: str
    base: Document
    counted: tuple[Severity, ...] = COUNTED
    lints: int = 0

    def blockers(self, overrides: list[Override]) -> list[Blocker]:
        """What keeps the changed design from passing; empty when it passes."""
        self.lints += 1
        try:
            doc = apply_overrides(self.base, overrides) if overrides else self.base
        except OverrideError as exc:
            return [Blocker("input", "", str(exc))]
        with hints_unsearched():  # only whether it passes counts here, not the hints
            result = lint_file(self.session, self.path, self.shown, document=doc)
        found = [Blocker("input", "", _error_text(e)) for e in result.errors]
        found += [Blocker("engine", "", f"internal error in '{i.rule}': {i.message}")
                  for i in result.internal]
        found += [_blocker(f) for f in result.findings
                  if f.severity in self.counted and not f.waived]
        return found

    def passes(self, overrides: list[Override]) -> bool:
        return not self.blockers(overrides)


def _error_text(e: InputError) -> str:
    return str(e)


def _blocker(f: Finding) -> Blocker:
    return Blocker(f.rule, f.element or "", f.message)


# --- the changes each search makes -------------------------------------------------------------

def continuous_overrides(design: Any, amps: float) -> list[Override]:
    """The continuous load at ``amps``; a peak below it is raised with it (the format holds a
    peak to be at least the continuous load)."""
    out = [Override("set", "load.continuous", _written(amps, "A"))]
    peak = design.load.peak
    if peak is not None and peak.current < amps:
        out.append(Override("set", "load.peak.current", _written(amps, "A")))
    return out


def peak_overrides(design: Any, amps: float, seconds: float) -> list[Override]:
    """A peak of ``amps`` for ``seconds``, in place of the design's (or added)."""
    if design.load.peak is not None:
        return [Override("set", "load.peak.current", _written(amps, "A")),
                Override("set", "load.peak.duration", _written(seconds, "s"))]
    return [Override("add", "load.peak", {"current": _written(amps, "A"),
                                          "duration": _written(seconds, "s")})]


def ambient_overrides(end: str, celsius: float) -> list[Override]:
    """One end (``min`` or ``max``) of the pack's ambient range at ``celsius``."""
    return [Override("set", f"pack.ambient.{end}", _written(celsius, "°C"))]


def scaled_load_overrides(design: Any, factor: float) -> list[Override]:
    """The continuous load and the peak (if any) both at ``factor`` × the design's."""
    load = design.load
    out = [Override("set", "load.continuous", _written(load.continuous * factor, "A"))]
    if load.peak is not None:
        out.append(Override("set", "load.peak.current", _written(load.peak.current * factor, "A")))
    return out


# --- monotone searches ------------------------------------------------------------------------

@record
class _Edge:
    passing: float | None
    failing: float | None
    blockers: list[Blocker]


def _search(start: float, blockers: Callable[[float], list[Blocker]], *, outward: Callable[[float, int], float],
            bound: float, close: Callable[[float, float], bool],
            midpoint: Callable[[float, float], float], inward_floor: float | None = None) -> _Edge:
    """The edge between passing and failing values, searching away from ``start``.

    ``outward(value, step)`` is the next value further out (toward ``bound``); when ``start``
    itself fails and ``inward_floor`` is given, the search walks back toward it instead. The
    edge is narrowed by bisection until ``close(passing, failing)``.
    """
    def beyond(a: float, b: float) -> bool:  # b lies further out than a
        return b > a if bound > start else b < a

    first = blockers(start)
    if first:
        if inward_floor is None:
            return _Edge(None, start, first)
        failing, failing_blockers = start, first
        step = 0
        while True:
            step += 1
            value = _inward(start, inward_floor, step)
            found = blockers(value)
            if not found:
                passing = value
                break
            failing, failing_blockers = value, found
            if value == inward_floor:
                return _Edge(None, value, found)
    else:
        passing, step = start, 0
        while True:
            step += 1
            value = outward(passing, step)
            if not beyond(value, bound):
                value = bound
            if value == passing:
                return _Edge(passing, None, [])
            found = blockers(value)
            if found:
                failing, failing_blockers = value, found
                break
            passing = value
            if value == bound:
                return _Edge(passing, None, [])
    while not close(passing, failing):
        middle = midpoint(passing, failing)
        found = blockers(middle)
        if found:
            failing, failing_blockers = middle, found
        else:
            passing = middle
    return _Edge(passing, failing, failing_blockers)


def _inward(start: float, floor: float, step: int) -> float:
    """Halve the distance to ``floor`` (geometrically for currents) at each step; the floor at 6."""
    if step >= 6:
        return floor
    if floor > 0 and start > 0:
        return max(floor, start / 2.0 ** step)
    return start + (floor - start) * (1 - 0.5 ** step)


def _current_edge(start: float, blockers: Callable[[float], list[Blocker]],
                  floor: float | None, bound: float = MAX_AMPS) -> _Edge:
    return _search(start, blockers, outward=lambda v, _: v * 2.0, bound=bound,
                   close=lambda a, b: abs(b / a - 1.0) <= CURRENT_RESOLUTION,
                   midpoint=lambda a, b: math.sqrt(a * b), inward_floor=floor)


def _temperature_edge(start: float, blockers: Callable[[float], list[Blocker]], bound: float) -> _Edge:
    sign = 1.0 if bound > start else -1.0
    return _search(start, blockers, outward=lambda v, step: v + sign * 10.0 * 2 ** (step - 1),
                   bound=bound, close=lambda a, b: abs(b - a) <= TEMPERATURE_RESOLUTION,
                   midpoint=lambda a, b: (a + b) / 2.0)


def _limit(name: str, unit: str, given: float | None, edge: _Edge, bound: float,
           note: str = "") -> Limit:
    return Limit(name, unit, given, edge.passing, edge.failing,
                 edge.blockers[0] if edge.blockers else None,
                 bound if edge.failing is None else None, note)


# --- the envelope ---------------------------------------------------------------------------------

def envelope(relint: Relinter, design: Any, peak_duration: float | None = None) -> list[Limit]:
    """The continuous load, the peak for ``peak_duration`` (the design's own by default) and the
    ambient range for which the design passes; the design as given must pass."""
    load = design.load
    limits = []
    limits.append(_limit(
        "highest continuous load", "A", load.continuous,
        _current_edge(load.continuous, lambda a: relint.blockers(continuous_overrides(design, a)),
                      floor=None),
        MAX_AMPS, "a peak below it rises with it" if load.peak is not None else ""))
    duration = peak_duration if peak_duration is not None else \
        (load.peak.duration if load.peak is not None else None)
    if duration is None:
        limits.append(Limit("highest peak", "A", None, None,
                            note="the design has no peak; name a duration (--peak-duration)"))
    else:
        start = load.peak.current if load.peak is not None else load.continuous
        edge = _current_edge(start, lambda a: relint.blockers(peak_overrides(design, a, duration)),
                             floor=load.continuous)
        limits.append(_limit(f"highest peak for {format_quantity(duration, 's')}", "A",
                             load.peak.current if load.peak is not None else None, edge, MAX_AMPS,
                             "no lower than the continuous load" if edge.passing is None else ""))
    ambient = design.pack.ambient
    for end, name, bound in (("max", "highest ambient", HIGHEST_C),
                             ("min", "lowest ambient", LOWEST_C)):
        given = getattr(ambient, end)
        edge = _temperature_edge(given, lambda t, e=end: relint.blockers(ambient_overrides(e, t)),
                                 bound)
        limits.append(_limit(name, "°C", given, edge, bound))
    return limits


def headroom(relint: Relinter, design: Any, changes: list[Override]) -> tuple[float | None, Blocker | None]:
    """How far the loads (continuous and peak together) can rise, with ``changes`` applied,
    before a rule objects: the factor and the finding that ends it (None: more than
    :data:`HEADROOM_CEILING`). The design with the changes must pass at factor 1.

    This is the margin a suggestion is ranked by. A figure's distance to its limit differs from
    rule to rule in kind (volts, kelvins, ampere-squared seconds); one factor on the loads, found
    by linting, puts every load-driven rule on one scale and names the one that gives first.
    """
    edge = _current_edge(1.0, lambda k: relint.blockers(changes + scaled_load_overrides(design, k)),
                         floor=None, bound=HEADROOM_CEILING)
    if edge.failing is None:
        return None, None
    return edge.passing, edge.blockers[0] if edge.blockers else None


# --- part suggestions -------------------------------------------------------------------------

def _component_of(f: Finding, components: dict) -> str | None:
    path = f.location.path
    if len(path) >= 2 and path[0] == "components" and path[1] in components:
        return str(path[1])
    if f.element:
        name = f.element.split(".")[0]
        if name in components:
            return name
    return None


def suggestions(relint: Relinter, design: Any, findings: list[Finding],
                parts: dict[str, Any]) -> list[PartAdvice]:
    """For each library part with findings of a counted severity, the parts of its kind that
    leave the design passing when put in its place in every component that uses it; for a part
    written inline in a component, the library parts of its kind on the same pins."""
    components = relint.base.data.get("components")
    if not isinstance(components, dict):
        return []
    at_fault: dict[str, PartAdvice] = {}
    for f in findings:
        if f.severity not in relint.counted or f.waived:
            continue
        name = _component_of(f, components)
        if name is None or not isinstance(components[name], dict):
            continue
        written = components[name]
        part = written.get("part")
        if isinstance(part, str) and part in parts:
            key, kind = part, parts[part].kind
            users = [c for c, v in components.items() if isinstance(v, dict) and v.get("part") == part]
        elif part is None and isinstance(written.get("kind"), str) and "pins" in written:
            users = _same_inline_part(components, written)
            key, kind = f"inline {written['kind']} of {', '.join(users)}", written["kind"]
        else:
            continue
        advice = at_fault.get(key)
        if advice is None:
            advice = at_fault[key] = PartAdvice(key, kind, users, [])
        advice.findings.append(_blocker(f))
    for advice in at_fault.values():
        _try_parts(relint, design, advice, parts)
    return list(at_fault.values())


def _same_inline_part(components: dict, written: dict) -> list[str]:
    """The components whose inline part is written exactly as ``written``'s (pins aside): one
    line of the bill of materials, so a substitute goes into all of them at once, as a library
    part does into every component that names it."""
    fields = {k: v for k, v in written.items() if k != "pins"}
    return [c for c, v in components.items() if isinstance(v, dict) and "part" not in v
            and "pins" in v and {k: x for k, x in v.items() if k != "pins"} == fields]


def _substitution(components: dict, name: str, part: str) -> Override:
    """``part`` in component ``name``: its part name changed, or an inline part replaced by a
    library part on the same pins."""
    if "part" in components[name]:
        return Override("set", f"components.{name}.part", part)
    return Override("set", f"components.{name}", {"part": part, "pins": components[name]["pins"]})


def _try_parts(relint: Relinter, design: Any, advice: PartAdvice, parts: dict[str, Any]) -> None:
    candidates = sorted(n for n, p in parts.items() if p.kind == advice.kind and n != advice.part)
    if not candidates:
        advice.note = f"the libraries hold no other part of kind {advice.kind}"
        return
    for name in candidates:
        changes = [_substitution(relint.base.data["components"], c, name) for c in advice.components]
        found = relint.blockers(changes)
        if found:
            advice.failing.append((name, found[0]))
            continue
        factor, blocker = headroom(relint, design, changes)
        advice.passing.append(Suggestion(name, factor, blocker))
    advice.passing.sort(key=lambda s: (-(s.headroom or math.inf), s.part))
    if not advice.passing:
        advice.note = "no part of the same kind in the libraries fixes it"


# --- one design -------------------------------------------------------------------------------

def assist(session: Session, path: Path, shown: str, peak_duration: float | None = None,
           counted: tuple[Severity, ...] = COUNTED) -> Assistance:
    """The envelope and the part suggestions for the design at ``path``."""
    import time
    began = time.perf_counter()
    out = Assistance(shown, tuple(s.value for s in counted))
    try:
        base = load_file(path, shown)
    except InputError as exc:
        out.unusable = f"cannot be read: {exc}"
        return out
    result = lint_file(session, path, shown, document=base)
    if result.errors or result.model is None:
        out.unusable = "does not lint: " + "; ".join(str(e) for e in result.errors)
        return out
    relint = Relinter(session, path, shown, base, counted)
    design = result.model.design
    cfg, _, _ = session.config_for(path)
    resolved = resolve_libraries(base, design.libraries, path, session.libraries,
                                 session.root_for(path.parent), cfg.library_roots if cfg else ())
    out.blockers = [_blocker(f) for f in result.findings if f.severity in counted and not f.waived]
    out.blockers += [Blocker("engine", "", f"internal error in '{i.rule}': {i.message}")
                     for i in result.internal]
    if not out.blockers:
        out.limits = envelope(relint, design, peak_duration)
    out.advice = suggestions(relint, design, result.findings, resolved.parts)
    fixed = {_identity(f) for f in result.findings
             if any(a.passing and _blocker(f) in a.findings for a in out.advice)}
    out.values = values_to_change(relint, result.findings, fixed)
    out.lints = relint.lints + 1
    out.seconds = time.perf_counter() - began
    return out


# --- a run over designs -----------------------------------------------------------------------

def assist_run(paths: list[str], config: Path | None = None,
               peak_duration: float | None = None) -> tuple[Any, list[Assistance]]:
    """Lint ``paths`` as ``packwarden check`` would (keeping the models, for the HTML report),
    then assist every design that lints: the run, and one :class:`Assistance` per design that
    could be read (also attached to its result as ``assistant``, a plain dict)."""
    from .engine import Registry, discover, lint
    run = lint(paths, config=config, keep_models=True, jobs=1)
    session = Session(registry=Registry(rules=dict(run.rules)), config_override=config)
    found = dict((shown, path) for path, shown in discover(paths))
    helped = []
    for d in run.designs:
        if d.errors or d.model is None or d.file not in found:
            continue
        help_ = assist(session, found[d.file], d.file, peak_duration)
        d.assistant = help_.as_dict()
        helped.append(help_)
    return run, helped


def render_text(run: Any, helped: list[Assistance]) -> str:
    """Input errors (one ``file:line:column: message`` each), then each design's answer."""
    lines = [str(e) for e in run.input_errors()]
    lines += [f"{o}:1:1: {m}" for o, m in run.broken_plugins]
    text = "\n".join(lines) + ("\n" if lines else "")
    return text + "\n".join(h.text() for h in helped)


def render_json(run: Any, helped: list[Assistance]) -> str:
    import json

    from . import __version__
    out = {"tool": {"name": "packwarden", "version": __version__},
           "errors": [{"file": e.file, "line": e.line, "column": e.column, "message": e.message}
                      for e in run.input_errors()],
           "designs": [h.as_dict() for h in helped]}
    return json.dumps(out, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


# --- values to change, for findings no library part fixes ---------------------------------------

#: A quantity as a hint writes it: a number and the unit word after it ("3.14 mm", "98.6 K/W").
_HINTED = re.compile(r"(?<![\w.])(-?\d+(?:\.\d+)?(?:e-?\d+)?) ?([^\s,;()]+)")
#: At most this many hinted values are tried per finding (a hint names one or two).
VALUES_TRIED = 3


@record
class ValueAdvice:
    """For one finding no library part fixes: a value its hint proposes, put where the design
    holds it and linted again (``fits``: the finding is gone and nothing new counts), or why
    nothing can be suggested (``note``)."""

    finding: Blocker
    #: The design fields the value went into (several for an inline part written alike in
    #: several components: one line of the bill of materials).
    paths: list[str] = field(default_factory=list)
    value: str = ""
    fits: bool = False
    #: What still counts with the value in place (the finding itself, or one it raised).
    still: Blocker | None = None
    note: str = ""

    def as_dict(self) -> dict[str, Any]:
        return {"finding": self.finding.as_dict(), "paths": self.paths, "value": self.value,
                "fits": self.fits, "still": self.still.as_dict() if self.still else None,
                "note": self.note}

    def text(self) -> str:
        head = f"{self.finding.rule}{' at ' + self.finding.element if self.finding.element else ''}"
        if not self.value:
            return f"{head}: nothing to suggest: {self.note}"
        where = ", ".join(self.paths)
        if self.fits:
            return f"{head}: {where} = {self.value} (from its hint) clears it and raises nothing new"
        return (f"{head}: {where} = {self.value} (from its hint) does not fit: "
                f"{self.still.text() if self.still else 'it still counts'}")


def _identity(f: Finding) -> tuple:
    return (f.rule, f.element or "", f.key)


def _hinted_values(hint: str | None) -> list[tuple[str, str]]:
    """The quantities a hint writes, as written and with their units, in order."""
    from .quantities import QuantityError, parse_any_quantity
    out = []
    for m in _HINTED.finditer(hint or ""):
        text = f"{m.group(1)} {m.group(2)}"
        try:
            _, unit = parse_any_quantity(text)
        except QuantityError:
            continue
        out.append((text, unit))
    return out


def _node(data: Any, path: tuple) -> Any:
    for step in path:
        if isinstance(data, dict) and step in data:
            data = data[step]
        elif isinstance(data, list) and isinstance(step, int) and 0 <= step < len(data):
            data = data[step]
        else:
            return None
    return data


def _unit_of(value: Any) -> str | None:
    from .quantities import QuantityError, parse_any_quantity
    if not isinstance(value, str):
        return None
    try:
        return parse_any_quantity(value)[1]
    except QuantityError:
        return None


def _value_fields(data: Any, path: tuple, hint: str) -> dict[str, tuple | str]:
    """The design fields a finding at ``path`` may be fixed by, by unit: the value at ``path``
    itself, else the values beside it (the fields of the mapping it is, or is in). Where fields
    share a unit, the one the hint names (a word of it starts as the field does: "widen" for
    ``width``); if the hint names none or several, why not (a text in place of the path)."""
    node = _node(data, path)
    if _unit_of(node) is not None:
        return {_unit_of(node): path}
    if not isinstance(node, dict):
        path = path[:-1]
        node = _node(data, path)
    if not isinstance(node, dict):
        return {}
    by_unit: dict[str, list[tuple]] = {}
    for key, value in node.items():
        unit = _unit_of(value)
        if unit is not None:
            by_unit.setdefault(unit, []).append(path + (key,))
    words = re.findall(r"[a-z_]+", hint.lower())
    out: dict[str, tuple | str] = {}
    for unit, paths in by_unit.items():
        named = [p for p in paths if any(w.startswith(str(p[-1])[:3].lower()) for w in words)]
        out[unit] = paths[0] if len(paths) == 1 else named[0] if len(named) == 1 else (
            f"its hint's value in {unit} could go into "
            f"{' or '.join(str(p[-1]) for p in paths)} at {_dotted(path)}, and the hint does not "
            f"say which")
    return out


def _already(data: Any, path: tuple | str, text: str) -> bool:
    """Whether the design already holds ``text``'s value at ``path`` (a hint that restates a
    figure of the design proposes nothing)."""
    from .quantities import parse_any_quantity
    if isinstance(path, str) or _unit_of(_node(data, path)) is None:
        return False
    return math.isclose(parse_any_quantity(_node(data, path))[0], parse_any_quantity(text)[0],
                        rel_tol=1e-9)


def _dotted(path: tuple) -> str:
    return ".".join(str(p) for p in path)


def _alike(components: dict, path: tuple) -> list[tuple]:
    """``path`` in every component whose inline part is written as the one ``path`` is in (one
    line of the bill of materials); ``path`` alone otherwise."""
    if len(path) < 3 or path[0] != "components" or not isinstance(components, dict):
        return [path]
    written = components.get(path[1])
    if not isinstance(written, dict) or "part" in written or "pins" not in written:
        return [path]
    return [("components", c) + path[2:] for c in _same_inline_part(components, written)]


def values_to_change(relint: Relinter, findings: list[Finding],
                     fixed: set[tuple]) -> list[ValueAdvice]:
    """For each counted finding no library part fixes (``fixed``: identities a suggestion
    clears), the value its hint proposes, put into the design field the finding points at (or
    the one beside it in the hinted unit) and linted again; or why nothing can be suggested."""
    counted = [f for f in findings if f.severity in relint.counted and not f.waived]
    before = {_identity(f) for f in counted}
    components = relint.base.data.get("components")
    out = []
    for f in counted:
        if _identity(f) in fixed:
            continue
        advice = ValueAdvice(_blocker(f))
        out.append(advice)
        hinted = _hinted_values(f.hint)
        if f.location.related is not None:
            advice.note = "it is at a component of the schematic's netlist: change it there"
            continue
        if not hinted:
            advice.note = ("its hint proposes no value" if f.hint else "it has no hint") + \
                ": the change it needs is not one value of the design (a part to add, a " \
                "structure to change)"
            continue
        node = _node(relint.base.data, tuple(f.location.path))
        if f.location.path and f.location.path[-1] == "part" and isinstance(node, str):
            advice.note = (f"its hint asks for other ratings of library part {node} (see the "
                           f"part suggestions), not a value written in the design")
            continue
        fields = _value_fields(relint.base.data, tuple(f.location.path), f.hint or "")
        tried = [(text, fields[unit]) for text, unit in hinted if unit in fields
                 and not _already(relint.base.data, fields[unit], text)][:VALUES_TRIED]
        unsure = [why for text, unit in hinted if isinstance(why := fields.get(unit), str)]
        if unsure:
            advice.note = unsure[0]
            continue
        if not tried and any(unit in fields for _, unit in hinted):
            advice.note = (f"its hint restates the design's own {f.location.dotted} and proposes "
                           f"no other value there")
            continue
        if not tried:
            units = ", ".join(dict.fromkeys(u or "count" for _, u in hinted))
            advice.note = (f"its hint proposes values in {units}, and the design holds none "
                           f"there at {f.location.dotted or 'its top level'}: the change is "
                           f"to a part or the structure, not to a value written here")
            continue
        for text, path in tried:
            paths = _alike(components, path)
            advice.paths, advice.value = [_dotted(p) for p in paths], text
            relint.lints += 1
            try:
                doc = apply_overrides(relint.base, [Override("set", _dotted(p), text)
                                                    for p in paths])
            except OverrideError as exc:
                advice.still = Blocker("input", "", str(exc))
                continue
            result = lint_file(relint.session, relint.path, relint.shown, document=doc)
            after = [g for g in result.findings if g.severity in relint.counted and not g.waived]
            still = [g for g in after if _identity(g) == _identity(f)] + \
                [g for g in after if _identity(g) not in before]
            errors = [Blocker("input", "", _error_text(e)) for e in result.errors]
            advice.still = errors[0] if errors else _blocker(still[0]) if still else None
            advice.fits = advice.still is None
            if advice.fits:
                break
    return out
