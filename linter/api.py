"""The rule API: what a rule is, what it yields, and what it may ask of the design.

Built-in rules and team rules use exactly this module (re-exported from ``packwarden``); if a
built-in rule needs something that is not here, team rules need it too and it belongs here.
"""

from __future__ import annotations

from dataclasses import field, replace
from enum import Enum
from typing import TYPE_CHECKING, Any, Callable, Iterable

from . import quick
from .records import record

# ``Field`` declares a rule's options (``packwarden.Field``): pydantic's, or on a plain check's
# quick way (quick.py) its stand-in, as the options' models are then made without pydantic.
if quick.ON:
    from .quick import BaseModel, ConfigDict, Field
else:
    from pydantic import BaseModel, ConfigDict, Field  # noqa: F401 - Field: see above

if TYPE_CHECKING:  # pragma: no cover
    from .model.design import DesignModel
    from .netlist import Netlist
    from .schema import Design


class Severity(str, Enum):
    error = "error"
    warning = "warning"
    info = "info"

    @property
    def rank(self) -> int:
        return {"info": 1, "warning": 2, "error": 3}[self.value]


@record(frozen=True)
class Figure:
    """A number a rule computed or compared, shown beside the finding so it can be checked."""

    name: str
    value: float
    unit: str

    def text(self) -> str:
        from .quantities import format_quantity
        return f"{self.name} = {format_quantity(self.value, self.unit)}"


@record(frozen=True)
class Location:
    file: str
    path: tuple = ()  # YAML path, e.g. ("components", "Q1", "part")
    line: int = 1
    column: int = 1
    #: The design's own place for a finding located in another file (a component of the
    #: schematic's netlist is found at the netlist's line; the design names the netlist).
    related: "Location | None" = None

    @property
    def dotted(self) -> str:
        return ".".join(str(p) for p in self.path)


@record(frozen=True)
class Finding:
    rule: str
    severity: Severity
    message: str
    location: Location
    hint: str | None = None
    element: str | None = None
    figures: tuple[Figure, ...] = ()
    #: Distinguishes several findings of one rule on one element (e.g. "overcharge-release").
    key: str = ""
    waived: str | None = None  # the waiver's reason when a waiver covers this finding
    fingerprint: str = ""
    #: The root cause the finding reports, said without the element (e.g. "share-id_max"):
    #: findings of one rule with one cause and the same figures on parallel packages become one,
    #: and findings of two rules with one cause on one element, one headline figure, become one
    #: (``packwarden.grouping``). Empty: the finding's ``key`` stands for its cause, and it
    #: merges with no other rule's.
    cause: str = ""
    #: A grouped finding's elements, every one (the first is ``element``); empty when alone.
    members: tuple[str, ...] = ()
    #: A grouped finding's elements in words: "Q1–Q4, discharge switch, 4 in parallel".
    group: str = ""
    #: Other rules that found the same cause, reported here once.
    also: tuple[str, ...] = ()
    #: The fingerprints the grouped findings had alone (a baseline written before grouping
    #: still matches through them).
    merged: tuple[str, ...] = ()
    #: The places of the other members of a group (the first member's is ``location``).
    locations: tuple[Location, ...] = ()
    #: What the finding's figures rest on that the design does not give: the model's assumption
    #: notes (an on-resistance extrapolated, a minimum taken from the typical and maximum).
    assumptions: tuple[str, ...] = ()
    #: The name of the headline figure, the one whose change makes the finding worse (a waiver's
    #: bound applies to it); empty: the first figure.
    headline_figure: str = ""
    #: The headline figure makes the finding worse as it falls (a trip minimum below the load):
    #: a waiver bounds it with ``down_to``, not ``up_to``.
    lower_is_worse: bool = False

    @property
    def subject(self) -> str | None:
        """What the finding is about, for reports: a group in words, else the element."""
        return self.group or self.element

    @property
    def headline(self) -> Figure | None:
        """The finding's headline figure, the one a waiver's bound applies to: the figure the
        rule named (``ctx.finding(headline=...)``), else the first."""
        named = [g for g in self.figures if g.name == self.headline_figure]
        return named[0] if named else self.figures[0] if self.figures else None

    @property
    def worse(self) -> str:
        """Which way the headline figure makes the finding worse: "higher" or "lower"."""
        return "lower" if self.lower_is_worse else "higher"

    def headline_dict(self) -> dict | None:
        """The headline figure and its direction as the machine formats write it (JSON
        ``headline``, SARIF ``properties.headline``), or None for a finding without figures."""
        head = self.headline
        if head is None:
            return None
        return {"figure": head.name, "value": head.value, "unit": head.unit, "worse": self.worse}

    def with_fingerprint(self, design_id: str) -> "Finding":
        # Keyed on what the finding is about, never on line numbers, so baselines survive edits
        # elsewhere in the file and re-ordering of components.
        import hashlib  # here, not at the top: a clean design never needs it at start-up

        basis = "\x1f".join([self.rule, design_id, self.element or "", self.location.dotted, self.key])
        return replace(self, fingerprint=hashlib.sha256(basis.encode()).hexdigest()[:20])


class RuleOptions(BaseModel):
    """Base for a rule's options; set per project under ``[tool.packwarden.rules.<id>]``."""

    # defer_build: a model's validator is built when a project first sets its options; a rule
    # without them gets its defaults from :func:`default_options` (start-up time). A plugin's
    # options are built when the plugin loads (``registry``), so a mistake in them is reported
    # there, as it was when every model was built on import.
    model_config = ConfigDict(extra="forbid", frozen=True, defer_build=True)


def default_options(options: type[RuleOptions]) -> RuleOptions:
    """``options()``: the rule's options when the project sets none. Made without building the
    model's validator where validating could not change anything (every field has a default,
    none is validated, the model has no validator of its own), as ``model_construct`` makes
    them; ``tests/test_default_options.py`` holds the two ways equal for every rule."""
    if quick.ON:  # the quick way loads packwarden's own rules only, none with a validator
        return options.model_construct()
    found = options.__pydantic_decorators__
    if (found.validators or found.field_validators or found.root_validators
            or found.model_validators or options.model_config.get("validate_default")
            or any(f.is_required() or f.validate_default for f in options.model_fields.values())):
        return options()
    return options.model_construct()


class NoOptions(RuleOptions):
    pass


@record(frozen=True)
class Example:
    """A design fragment showing a rule's failing (``bad``) and passing (``good``) case."""

    bad: str
    good: str


CheckFn = Callable[["RuleContext", Any], Iterable[Finding]]


@record(frozen=True)
class Rule:
    id: str
    summary: str
    rationale: str
    severity: Severity
    check: CheckFn
    options: type[RuleOptions] = NoOptions
    example: Example | None = None
    #: "netlist" rules check the netlist itself; "electrical" rules (the default) reason about the
    #: circuit and are held back while the netlist has integrity errors, whose knock-on effects
    #: (a misspelt part is also "no discharge switch") would only bury the real mistake.
    scope: str = "electrical"
    #: Where the rule came from (entry point or folder), filled in by the registry.
    origin: str = ""


def rule(*, id: str, summary: str, severity: Severity | str = Severity.error,
         options: type[RuleOptions] = NoOptions, example: Example | None = None,
         scope: str = "electrical") -> Callable[[CheckFn], Rule]:
    """Turn a ``check(ctx, options)`` generator into a :class:`Rule`; its docstring is the rationale."""

    def wrap(fn: CheckFn) -> Rule:
        doc = (fn.__doc__ or "").strip()
        return Rule(id=id, summary=summary, rationale=_dedent(doc), severity=Severity(severity),
                    check=fn, options=options, example=example, scope=scope)
    return wrap


def _dedent(text: str) -> str:
    import inspect
    return inspect.cleandoc(text)


@record
class RuleContext:
    """What a rule sees: the validated design, its netlist, and the model's figures."""

    file: str
    design: "Design"
    netlist: "Netlist"
    #: The design's model: every figure, limit and worst case a rule may read (docs/rules-api.md,
    #: "The model").
    model: "DesignModel"
    rule_id: str = ""
    severity: Severity = Severity.error
    _where: Callable[[tuple], tuple[int, int]] = field(default=lambda path: (1, 1), repr=False)
    #: Where a path lies outside the design file (a component of the schematic's netlist), or
    #: None: then it is in the design, at ``_where``.
    _elsewhere: Callable[[tuple], Location | None] = field(default=lambda path: None, repr=False)
    #: The design linted again with changes, a list of (dotted path, value) each set there
    #: (as ``packwarden.overrides`` does), returning its result or None where they do not apply; None where no search may run (inside such a
    #: lint). A hint may search with it for the values every rule allows.
    relint: Callable[[list], Any] | None = field(default=None, repr=False)

    def finding(self, message: str, *, path: Iterable = (), hint: str | None = None,
                element: str | None = None, figures: Iterable[Figure] = (), key: str = "",
                severity: Severity | str | None = None, cause: str = "",
                assumptions: Iterable[str] = (), headline: str = "",
                lower_is_worse: bool = False) -> Finding:
        """Make a finding of the running rule, located at ``path`` in the design file.
        ``headline`` names the figure a waiver's bound applies to (default: the first);
        ``lower_is_worse`` says the finding worsens as that figure falls."""
        figures = tuple(figures)
        if headline and headline not in {g.name for g in figures}:
            raise ValueError(f"headline {headline!r} names none of the finding's figures")
        path = tuple(path)
        location = self._elsewhere(path)
        if location is None:
            location = Location(self.file, path, *self._where(path))
        return Finding(rule=self.rule_id, severity=Severity(severity) if severity else self.severity,
                       message=message, location=location, hint=hint,
                       element=element, figures=figures, key=key, cause=cause,
                       assumptions=tuple(dict.fromkeys(assumptions)), headline_figure=headline,
                       lower_is_worse=lower_is_worse)

    def component_path(self, refdes: str, *rest: str) -> tuple:
        return ("components", refdes, *rest)

    def part_path(self, refdes: str) -> tuple:
        """Path of a component's part: its library name under ``part``, or the component itself
        where the part is written inline."""
        c = self.netlist.components[refdes]
        return c.path + (("part",) if c.part_name else ())


