"""One design from file to findings, in phases: load -> validate -> resolve libraries ->
netlist -> model -> rules (each isolated) -> policy -> waivers. The run's shared state (configs,
libraries, policies) is a :class:`Session`.
"""

from __future__ import annotations

import datetime as _dt
import os
import time
from contextlib import contextmanager
from contextvars import ContextVar
from dataclasses import field, replace
from pathlib import Path
from typing import Any, Callable, Iterable, Iterator

from . import files, quick
from .api import Finding, RuleContext
from .config import Config, check_against_rules, find_config, line_of, load_config
from .guards import netlist_errors
from .library import LibraryCache, named_root, repository_root, resolve_libraries, shown_path
from .loader import Document, InputError, load_file, printable
from .model.values import DesignMistake
from .netlist import Netlist, build_netlist
from .records import record
from .registry import Registry
from .results import DesignResult, InternalError
from .schema import Design
from .validate import validate

# --- discovery ----------------------------------------------------------------------------------

def is_design_text(head: str) -> bool:
    return format_of(head) == "packwarden/1"


def format_of(head: str) -> str | None:
    """The value of the first top-level ``format:`` line: ``packwarden/1`` for a design,
    ``packwarden-parts/1`` for a part library, None when there is none."""
    for line in head.splitlines():
        stripped = line.strip()
        if stripped.startswith("format:"):
            return stripped.split(":", 1)[1].strip().strip("'\"")
    return None


def discover(paths: Iterable[str], errors: list[InputError] | None = None) -> list[tuple[Path, str]]:
    """Files named directly, and design files (``format: packwarden/1``) inside named folders.

    A named folder holding no design is an error (in ``errors``): a typo in a CI path must not
    pass as "nothing to report".
    """
    out: list[tuple[Path, str]] = []
    roots: dict[Path, tuple[Path, Path | None]] = {}
    for raw in paths:
        p = Path(raw)
        if p.is_dir():
            before = len(out)
            for f in sorted(list(p.rglob("*.yaml")) + list(p.rglob("*.yml"))):
                root, resolved_root = _root_of(f.parent, roots)
                head = files.head(f, root, resolved_root=resolved_root)
                if head is None:
                    # Not read (a pipe, a device, a link out of the repository): linted, so the
                    # run says why, unless it is only a folder with a YAML-like name.
                    if not f.is_dir():
                        out.append((f, printable(shown_path(f))))
                elif is_design_text(head):
                    out.append((f, printable(shown_path(f))))
            if len(out) == before and errors is not None:
                errors.append(InputError(raw, 1, 1, "no design files (format: packwarden/1) in "
                                                    "this folder"))
        else:
            out.append((p, printable(raw)))
    return out


# --- running ------------------------------------------------------------------------------------

@record
class Session:
    """State shared across the designs of one run: libraries, configs and the registry."""

    registry: Registry
    libraries: LibraryCache = field(default_factory=LibraryCache)
    configs: dict[Path | None, tuple[Config | None, dict, InputError | None]] = field(default_factory=dict)
    config_override: Path | None = None
    today: _dt.date = field(default_factory=_dt.date.today)

    #: Per folder of designs: the config found above it, and its repository root (a batch
    #: holds thousands of designs in a few folders; each walk up the tree is done once).
    config_paths: dict[Path, Path | None] = field(default_factory=dict)
    roots: dict[Path, Path] = field(default_factory=dict)
    #: Per folder of designs: the repository its designs are confined to as the path names it
    #: (``library.named_root``) and that root with its links resolved, looked up once a run as
    #: ``discover`` does: a walk up the folders took a tenth of a small design's lint.
    named_roots: dict[Path, tuple[Path, Path | None]] = field(default_factory=dict)
    #: Schematic netlists read this run, by resolved path (or the error reading one gave).
    netlists: dict[Path, Any] = field(default_factory=dict)
    #: Whether each result carries the model's events (the JSON report writes them).
    keep_events: bool = True
    #: Whether one root cause is reported once (``group_phase``); rule cases see each finding.
    grouping: bool = True

    def root_for(self, folder: Path) -> Path:
        root = self.roots.get(folder)
        if root is None:
            root = self.roots[folder] = repository_root(folder)
        return root

    def config_for(self, design: Path) -> tuple[Config | None, dict, InputError | None]:
        path = self.config_override
        if path is None:
            folder = design.parent
            if folder not in self.config_paths:
                self.config_paths[folder] = find_config(folder)
            path = self.config_paths[folder]
        if path not in self.configs:
            try:
                cfg = load_config(path, shown_path(path) if path else None)
                options = check_against_rules(cfg, self.registry.rules)
                self.configs[path] = (cfg, options, None)
            except InputError as exc:
                self.configs[path] = (None, {}, exc)
        return self.configs[path]

    #: Team policies by file, read once per run: (policy or None, its errors).
    policies: dict[Path, tuple[Any, list[InputError]]] = field(default_factory=dict)

    def policy_for(self, cfg: Config) -> Any:
        """The team policy ``cfg`` names (``packwarden.policy.Policy``), or None.

        A policy with mistakes is reported once for the run (see :func:`lint`) and checks
        nothing; the rules still run, so one typo in the policy does not hide every finding.
        """
        if cfg.policy is None:
            return None
        key = cfg.policy.resolve()
        if key not in self.policies:
            if quick.ON:  # a policy is read with pydantic's models
                quick.fall_back("a team policy")
            from .policy import read_policy
            shown = shown_path(cfg.policy)
            root = repository_root(cfg.folder or cfg.policy.parent)
            line, col = config_position(cfg, "policy")
            try:
                key.relative_to(root.resolve())
            except ValueError:
                self.policies[key] = (None, [InputError(
                    cfg.file or "", line, col, f"policy file {shown} lies outside the repository "
                    f"of this config ({shown_path(root)}); keep it beside the config")])
            else:
                if not cfg.policy.is_file():
                    self.policies[key] = (None, [InputError(
                        cfg.file or "", line, col, f"policy file {shown} " + (
                            "is not a file" if cfg.policy.exists() else "does not exist"))])
                    return None
                policy, errors = read_policy(cfg.policy, shown)
                self.policies[key] = (policy, errors)
        return self.policies[key][0]

    def policy_errors(self) -> list[InputError]:
        return [e for _, errors in self.policies.values() for e in errors]


def config_position(cfg: Config, key: str) -> tuple[int, int]:
    """Line and column of a top-level key of the project's config."""
    return line_of(cfg.text, key, ("",), cfg.prefix)


def lint_file(session: Session, path: Path, shown: str,
              timings: dict[str, float] | None = None,
              document: Document | None = None, text: str | None = None) -> DesignResult:
    """Lint one design file. ``timings``, when given, gains the seconds each stage took (added
    to what it holds, so one dict can sum a batch): load, validate, libraries, netlist, model,
    rules. The benchmark reads it to show where a design's time goes.

    ``document``, when given, is linted instead of the file's text, as if it were at ``path``
    (libraries resolve from its folder, positions point into it): a rule case's base design with
    its overrides applied (``packwarden.overrides``).

    ``text``, when given, is the design as an editor holds it, linted in place of the file on
    disk (the language server); its libraries and config are read from disk, as saved."""
    clock = _StageClock(timings)
    result = DesignResult(file=shown)
    refused, resolved_path = (_refused(path, shown, session.named_roots)
                              if document is None and text is None else (None, None))
    if refused is not None:
        result.errors.append(refused)
        return result
    cfg, options, cfg_error = session.config_for(path)
    if cfg_error is not None:
        result.errors.append(cfg_error)
        return result
    assert cfg is not None
    try:
        doc = load_file(path, shown, text) if document is None else document
    except InputError as exc:
        result.errors.append(exc)
        return result
    clock.lap("load")
    design, errors = validate(doc, Design)
    clock.lap("validate")
    if errors:
        result.errors.extend(errors)
        return result
    result.name = printable(design.design.name)
    root = session.root_for(path.parent)
    resolved = resolve_libraries(doc, design.libraries, path, session.libraries, root,
                                 cfg.library_roots)
    clock.lap("libraries")
    if resolved.errors:
        result.errors.extend(resolved.errors)
        return result
    sources = None
    if not _written_out(design, doc):
        from .schematic import assemble  # only for designs with a schematic, stacks or a slip
        sources = assemble(design, doc, path, root, resolved.parts, session.netlists)
        if sources.errors:
            result.errors.extend(sources.errors)
            return result
        design = sources.design
    netlist = build_netlist(design, resolved.parts)
    if sources is not None:
        netlist.problems[:0] = sources.problems
        netlist.outside = sources.outside
    clock.lap("netlist")
    guarded = netlist_errors(doc, design, netlist)
    if guarded:  # nonsense the model would meet as a division by zero: refused, located
        result.errors.extend(guarded)
        return result
    model = make_model(design, netlist, options)
    result.model = model
    result.figures = model_figures(model, result, doc)
    if session.keep_events:
        result.events = model_events(model, result, doc)
        result.temperature_cutoffs = _from_model(result, doc, model.cutoffs_report, [])
    clock.lap("model")
    run_rules(session, cfg, options, doc, design, netlist, model, result,
              design_id=design_identity(path, root, root_resolved=True,
                                        resolved_path=resolved_path),
              elsewhere=(lambda p: sources.locate(doc, p)) if sources is not None else _nowhere,
              relint=_relinter(session, path, shown, doc, len(netlist.components)))
    clock.lap("rules")
    return result


def _refused(path: Path, shown: str, named_roots: dict[Path, tuple[Path, Path | None]] | None = None
             ) -> tuple[InputError | None, Path | None]:
    """Why a design path is not read, before anything is opened: a path no file system holds, or
    a link out of the design's repository (whose target is then never read, so no message can
    show a byte of it); None when it may be read, with the path resolved (for the design's
    identity). ``named_roots`` keeps each folder's root (``Session.named_roots``); the design's
    own links are resolved at every lint."""
    try:
        files.check_path(path)
    except files.Refused as exc:
        return InputError(shown, 1, 1, exc.message), None
    root, resolved = _root_of(path.parent, named_roots)
    inside = files.resolved_inside(path, root, resolved)
    if inside is None:
        return InputError(shown, 1, 1, f"the design links outside its repository "
                                       f"({shown_path(root) or '.'}); it is not read"), None
    return None, inside


def _root_of(folder: Path, kept: dict[Path, tuple[Path, Path | None]] | None
             ) -> tuple[Path, Path | None]:
    """The repository holding ``folder`` as its path names it (``named_root``) and that root
    resolved (None when it cannot be), worked out once per folder and kept in ``kept``."""
    found = kept.get(folder) if kept is not None else None
    if found is None:
        root = named_root(folder)
        try:
            found = (root, root.resolve())
        except (OSError, RuntimeError):
            found = (root, None)
        if kept is not None:
            kept[folder] = found
    return found


def _written_out(design: Design, doc: Document) -> bool:
    """True when the design file itself gives every component with its pins: no schematic, no
    stacks, nothing left out. Then there is nothing to put together (``schematic.assemble``)."""
    return (design.schematic is None and not design.stacks and
            isinstance(doc.data, dict) and "components" in doc.data and
            all(c.pins is not None for c in design.components.values()))


#: Set while a rule's hint search lints its design again: that lint searches no hints itself.
_FITTING: ContextVar[bool] = ContextVar("packwarden_fitting", default=False)


@contextmanager
def hints_unsearched() -> Iterator[None]:
    """Lints within search no hints (``ctx.relint`` is None): for a caller that lints a design
    again and again and reads only whether it passes (``packwarden assist``)."""
    token = _FITTING.set(True)
    try:
        yield
    finally:
        _FITTING.reset(token)


#: Designs of at most this many components search their hints in full, as many re-lints as
#: the searches take (about eighty each at most, ``model.fit.FULL_SEARCH_LINTS``; the flawed
#: examples take at most 23, a re-lint of such a design some 10-25 ms).
FIT_FULL_COMPONENTS = 60
#: A larger design's budget of re-lints for its hints, in components re-linted: a design of n
#: components gets ``FIT_BUDGET // (n + FIT_LINT_FIXED)`` re-lints (a re-lint costs about in
#: proportion to n plus a fixed share: measured some 12 ms plus 0.27 ms per component, so the
#: fixed share is worth about 50 components). Counted, never timed, so the report does not
#: depend on the machine. A search cut short by it says so in its hint (a coarser range); one
#: left no re-lint to try a value keeps the hint computed from the window alone. 900 gives a
#: 61-component design 8 re-lints, a 200-component one 3, and none from about 400 components
#: (the benchmark's 401-component pack, whose four re-lints at 2000 took its editor re-lint
#: from 52 to 318 ms and its batch from 9.9 to 14 times the parse floor).
FIT_BUDGET = 900
FIT_LINT_FIXED = 50


def fit_budget(components: int) -> int | None:
    """The re-lints a check of a design of ``components`` components may spend on its hints
    (None: no bound); below two (the design as it is and one value) none."""
    if components <= FIT_FULL_COMPONENTS:
        return None
    lints = FIT_BUDGET // (components + FIT_LINT_FIXED)
    return lints if lints >= 2 else 0


class _Relinter:
    """The design linted again with changes, a list of (dotted path, value) each set there, or
    added where the path starts with "+" (None where they do not apply, or where the check's
    budget of re-lints is spent: ``left``, None for no bound); the design as it is (no
    changes) is linted once. One serves every rule of a lint: ``kept`` holds, by name, a search
    that several rules' hints share (``rules/_rdsfit.py``)."""

    __slots__ = ("session", "path", "shown", "doc", "components", "budget", "left", "_as_is",
                 "kept")

    def __init__(self, session: Session, path: Path, shown: str, doc: Document,
                 components: int) -> None:
        self.session, self.path, self.shown, self.doc = session, path, shown, doc
        self.components = components
        self.budget = self.left = fit_budget(components)
        self._as_is: list = []
        self.kept: dict[str, Any] = {}

    def __call__(self, changes: list) -> DesignResult | None:
        if not changes and self._as_is:
            return self._as_is[0]
        if self.left is not None and self.left < 1:
            return None
        from .overrides import Override, OverrideError, apply_overrides  # only when a hint searches
        try:
            changed = apply_overrides(self.doc, [Override("add", p[1:], v) if p.startswith("+")
                                                 else Override("set", p, v) for p, v in changes])
        except OverrideError:
            return None
        if self.left is not None:
            self.left -= 1
        with hints_unsearched():
            result = lint_file(self.session, self.path, self.shown, document=changed)
        if not changes:
            self._as_is.append(result)
        return result


def _relinter(session: Session, path: Path, shown: str, doc: Document,
              components: int = 0) -> Callable[[list], DesignResult | None] | None:
    """The design linted again with changes (:class:`_Relinter`), for a rule that fits its hint
    to what every rule allows; None inside such a lint, and where the budget allows no re-lint
    (:func:`fit_budget`)."""
    if _FITTING.get() or fit_budget(components) == 0:
        return None
    return _Relinter(session, path, shown, doc, components)


def _nowhere(path: tuple) -> Any:
    """A design written out in full has no second source to point a finding at."""
    return None


class _StageClock:
    """Adds the time since the last lap to ``timings[stage]``; does nothing without a dict."""

    __slots__ = ("timings", "last")

    def __init__(self, timings: dict[str, float] | None) -> None:
        self.timings = timings
        self.last = time.perf_counter() if timings is not None else 0.0

    def lap(self, stage: str) -> None:
        if self.timings is not None:
            now = time.perf_counter()
            self.timings[stage] = self.timings.get(stage, 0.0) + now - self.last
            self.last = now


def design_identity(path: Path, root: Path, root_resolved: bool = False,
                    resolved_path: Path | None = None) -> str:
    """The design's name in fingerprints: its path inside the repository, in POSIX form.

    Not the path as shown, which is relative to the working folder: a baseline written by CI at
    the repository root must still match when someone lints from a subfolder.
    ``root_resolved``: ``root`` has no links to resolve (``Session.root_for`` gives such);
    ``resolved_path``: ``path`` already resolved in this lint.
    """
    resolved = resolved_path if resolved_path is not None else path.resolve()
    try:
        return resolved.relative_to(root if root_resolved else root.resolve()).as_posix()
    except ValueError:
        return resolved.as_posix()


def make_model(design: Design, netlist: Netlist, options: dict | None = None) -> Any:
    """The design's model, judged by the limits of the rules' ``options`` (by rule id)."""
    from .model.design import DesignModel
    from .model.limits import Limits
    return DesignModel(design, netlist, Limits.of(options or {}))


def model_figures(model: Any, result: DesignResult, doc: Document | None = None) -> dict[str, Any]:
    return _from_model(result, doc, model.figures, {})


def model_events(model: Any, result: DesignResult,
                 doc: Document | None = None) -> list[dict[str, Any]]:
    return _from_model(result, doc, model.events_report, [])


def _from_model(result: DesignResult, doc: Document | None, compute: Callable[[], Any],
                empty: Any) -> Any:
    """What ``compute`` asks of the model, or ``empty`` when it cannot: nonsense the model met
    is the design's input error on its line; any other failure must not take the run down, and
    says where it broke."""
    try:
        return compute()
    except DesignMistake as exc:
        add_mistake(result, exc, doc)
    except Exception as exc:
        result.internal.append(InternalError("model", result.file, describe(exc)))
    return empty


@record
class DesignRun:
    """What the phases after the model share for one design."""

    session: Session
    cfg: Config
    options: dict
    doc: Document
    design: Design
    netlist: Netlist
    model: Any
    result: DesignResult
    #: Where a finding's path lies in a second source (a schematic's netlist), or None.
    elsewhere: Callable[[tuple], Any] = _nowhere
    #: The design's name in fingerprints (:func:`design_identity`).
    design_id: str = ""
    #: The design linted again with changes, for a rule fitting its hint (:func:`_relinter`).
    relint: Callable[[list], Any] | None = None

    def where(self, path: tuple) -> tuple[int, int]:
        pos = self.doc.where(path)
        return pos.line, pos.column

    def context(self, rule_id: str, severity: Any) -> RuleContext:
        return RuleContext(file=self.result.file, design=self.design, netlist=self.netlist,
                           model=self.model, rule_id=rule_id, severity=severity,
                           _where=self.where, _elsewhere=self.elsewhere, relint=self.relint)


def rule_phase(run: DesignRun, findings: list[Finding]) -> list[Finding]:
    """Every enabled rule, each isolated: one broken rule must not hide the others."""
    cfg, result = run.cfg, run.result
    broken_netlist = bool(run.netlist.problems)
    rules = run.session.registry.rules
    for rid in sorted(rules):
        rule = rules[rid]
        if not cfg.enabled(rid):
            continue
        if broken_netlist and rule.scope != "netlist":
            result.skipped.append(rid)
            continue
        result.checked.append(rid)
        ctx = run.context(rid, cfg.severity.get(rid, rule.severity))
        try:
            override = cfg.severity.get(rid)
            for f in rule.check(ctx, run.options[rid]) or ():
                if not isinstance(f, Finding):  # caught here, not later where it takes all down
                    raise TypeError(f"rule yielded {type(f).__name__}, not a Finding "
                                    f"(use ctx.finding(...))")
                # the project's severity override wins even where a rule chose one per finding
                findings.append(replace(f, severity=override) if override else f)
        except DesignMistake as exc:  # the model met nonsense: one input error, not the rule's
            add_mistake(result, exc, run.doc)
        except (Exception, SystemExit) as exc:
            result.internal.append(InternalError(rid, result.file, describe(exc)))
    return findings


def policy_phase(run: DesignRun, findings: list[Finding]) -> list[Finding]:
    """The team policy's limits on the design's figures and parts (no code runs)."""
    policy = run.session.policy_for(run.cfg)
    if policy is None:
        return findings
    from .policy import check_policy  # only a project with a policy pays for its models
    model = run.result.model
    found, held = check_policy(policy, lambda limit: run.context(limit.rule, limit.severity),
                               run.result.figures, run.netlist, bool(run.netlist.problems),
                               lambda: _from_model(run.result, run.doc, lambda: model.events, ())
                               if model is not None else ())
    run.result.skipped.extend(held)
    return findings + found


def waiver_phase(run: DesignRun, findings: list[Finding]) -> list[Finding]:
    """Accepted findings marked with their reason; waivers that expired or match nothing found.

    The waiver findings are the engine's own; the project's select/ignore/severity apply to them
    as to any rule's.
    """
    from .waivers import apply_waivers
    findings = apply_waivers(findings, run.design, run.doc, run.session.today)
    cfg, hygiene = run.cfg, "waiver-hygiene"
    if not cfg.enabled(hygiene):
        findings = [f for f in findings if f.rule != hygiene]
    elif hygiene in cfg.severity:
        findings = [replace(f, severity=cfg.severity[hygiene]) if f.rule == hygiene else f
                    for f in findings]
    return findings


def group_phase(run: DesignRun, findings: list[Finding]) -> list[Finding]:
    """One finding per root cause (``packwarden.grouping``): a cause met alike by parallel
    switch packages, or by two rules on one element, reported once. After the waivers, which
    act on each member."""
    model = run.model
    if model is None or len(findings) < 2 or not run.session.grouping:
        return findings
    from .grouping import group_findings
    topology = model.topology
    try:
        roles: dict[str, set[str]] = {}
        for ch in topology.channels:
            roles.setdefault(ch.package, set()).add(ch.role or "unassigned")
        words = {ref: " and ".join(sorted(r)) + " switch" for ref, r in roles.items()}
        return group_findings(findings, topology.parallel_packages, words,
                              lambda f: f.with_fingerprint(run.design_id).fingerprint)
    except DesignMistake as exc:  # the rules met it too: said once, the findings kept apart
        add_mistake(run.result, exc, run.doc)
    except Exception as exc:  # grouping must not take the findings down with it
        run.result.internal.append(InternalError("grouping", run.result.file, describe(exc)))
    return findings


#: The phases after the model, in order: each takes the findings so far and returns them.
PHASES = (rule_phase, policy_phase, waiver_phase, group_phase)


def run_rules(session: Session, cfg: Config, options: dict, doc: Document, design: Design,
              netlist: Netlist, model: Any, result: DesignResult,
              design_id: str | None = None,
              elsewhere: Callable[[tuple], Any] = _nowhere,
              relint: Callable[[list], Any] | None = None) -> None:
    """Every phase after the model (:data:`PHASES`), then each finding's fingerprint and order."""
    design_id = design_id or Path(result.file).as_posix()
    run = DesignRun(session, cfg, options, doc, design, netlist, model, result, elsewhere,
                    design_id, relint)
    findings: list[Finding] = []
    for phase in PHASES:
        findings = phase(run, findings)
    # After the waivers, so their own findings (expired, unused) share the design's identity; a
    # grouped finding keeps its first member's (``group_phase``).
    findings = [printable_finding(f) if f.merged else
                printable_finding(f).with_fingerprint(design_id) for f in findings]
    findings.sort(key=lambda f: (f.location.line, f.location.column, f.rule, f.key, f.element or ""))
    result.findings = findings
    result.linted = True


def printable_finding(f: Finding) -> Finding:
    """The finding with its text safe for every report: net names, part names and waiver reasons
    come from the files under review, and a terminal escape among them must reach no terminal,
    HTML page or pull-request comment as anything but visible text."""
    texts = {"message": f.message, "hint": f.hint, "element": f.element, "waived": f.waived,
             "group": f.group}
    if all(t is None or t.isprintable() for t in texts.values()):
        return f
    return replace(f, **{k: printable(t) if t is not None else None for k, t in texts.items()},
                   members=tuple(printable(m) for m in f.members))


def add_mistake(result: DesignResult, mistake: DesignMistake, doc: Document | None) -> None:
    """A mistake the model met, as an input error at its path in the design file; said once,
    however many figures, events and rules run into it."""
    pos = doc.where(mistake.path) if doc is not None else None
    error = InputError(result.file, pos.line if pos else 1, pos.column if pos else 1,
                       mistake.message)
    if str(error) not in {str(e) for e in result.errors}:
        result.errors.append(error)


def describe(exc: BaseException) -> str:
    import traceback
    tb = traceback.extract_tb(exc.__traceback__)
    last = tb[-1] if tb else None
    where = f" (at {os.path.basename(last.filename)}:{last.lineno})" if last else ""
    return printable(f"{type(exc).__name__}: {exc}{where}")
