"""The engine: rule registry, and the path of one design from file to findings.

load -> validate -> resolve libraries -> netlist -> model -> rules (each isolated) -> waivers.
"""

from __future__ import annotations

import datetime as _dt
import importlib.util
import os
import sys
import time
from dataclasses import field, replace
from pathlib import Path
from typing import Any, Callable, Iterable

from .api import Finding, Rule, RuleContext, Severity
from . import files
from .config import Config, check_against_rules, find_config, load_config
from .guards import DesignMistake, netlist_errors
from .library import LibraryCache, named_root, repository_root, resolve_libraries, shown_path
from .loader import Document, InputError, load_file, printable
from .netlist import Netlist, build_netlist
from .schema import Design
from .validate import validate
from .records import record

ENTRY_POINT_GROUP = "packwarden.rules"


# --- registry -----------------------------------------------------------------------------------

@record
class Registry:
    rules: dict[str, Rule] = field(default_factory=dict)
    #: Plugins that failed to load: (name, message). Reported; the rest still run.
    broken: list[tuple[str, str]] = field(default_factory=list)
    plugins: set[str] = field(default_factory=set)
    #: Installed distributions that register rules, by normalized name (``--require-plugins``).
    distributions: set[str] = field(default_factory=set)

    def add(self, obj: Any, origin: str, plugin: str) -> None:
        items = obj if isinstance(obj, (list, tuple)) else [obj]
        for item in items:
            if not isinstance(item, Rule):
                self.broken.append((origin, f"{origin} is not a packwarden Rule "
                                            f"(got {type(item).__name__})"))
                continue
            if item.id in self.rules:
                other = self.rules[item.id].origin
                self.broken.append((origin, f"duplicate rule id '{item.id}': defined by {other} "
                                            f"and by {origin}"))
                continue
            self.rules[item.id] = replace(item, origin=origin)
        self.plugins.add(plugin)


def load_registry(rule_paths: Iterable[Path] = ()) -> Registry:
    """Every rule from installed entry points, then from the config's rule folders."""
    from importlib.metadata import entry_points

    reg = Registry()
    names: dict[int, str] = {}

    def dist_name(ep) -> str:
        # A distribution's name is read from its metadata file on every access; its entry
        # points share one distribution object, so each is read once.
        key = id(ep.dist)
        if key not in names:
            names[key] = ep.dist.name
        return names[key]

    def order(ep) -> tuple:
        # packwarden's own rules first, then plugins by distribution: when a plugin reuses a
        # built-in id, the plugin is the one reported, and the outcome never depends on a name.
        dist = dist_name(ep) if ep.dist else ""
        return (dist != "packwarden", dist, ep.name)

    found = list(entry_points(group=ENTRY_POINT_GROUP))
    eps = sorted(found, key=order)
    for ep in eps:
        plugin = dist_name(ep) if ep.dist else ep.module
        if ep.dist is not None:
            reg.distributions.add(normalize_name(dist_name(ep)))
        origin = f"{plugin}:{ep.name}"
        try:
            obj = ep.load()
        except (Exception, SystemExit) as exc:  # a broken plugin must not stop the others
            reg.broken.append((origin, f"plugin {origin} failed to load: "
                                       f"{type(exc).__name__}: {exc}"))
            reg.plugins.add(plugin)
            continue
        reg.add(obj, origin, plugin)
    for folder in rule_paths:
        load_folder(reg, folder)
    return reg


def load_folder(reg: Registry, folder: Path) -> None:
    """Load every ``*.py`` module in a folder the project's config names; take its ``RULES``."""
    if not folder.is_dir():
        reg.broken.append((str(folder), f"rule folder {shown_path(folder)} does not exist"))
        return
    for path in sorted(folder.glob("*.py")):
        if path.name.startswith("_"):
            continue
        name = f"packwarden_team_rules.{folder.name}.{path.stem}"
        origin = shown_path(path)
        try:
            spec = importlib.util.spec_from_file_location(name, path)
            assert spec and spec.loader
            module = importlib.util.module_from_spec(spec)
            sys.modules[name] = module
            spec.loader.exec_module(module)
            rules = getattr(module, "RULES", None)
            if rules is None:
                rules = [v for v in vars(module).values() if isinstance(v, Rule)]
        except (Exception, SystemExit) as exc:
            reg.broken.append((origin, f"rule module {origin} failed to load: "
                                       f"{type(exc).__name__}: {exc}"))
            continue
        reg.add(list(rules), origin, origin)


# --- required plugins ---------------------------------------------------------------------------

class RequiredPluginError(Exception):
    """A plugin the run must have (``--require-plugins``, config ``require_plugins``) is missing.

    Raised before any design is read: a review without the team's rules would pass designs the
    team's own checks fail, so the run stops at once with exit code 2.
    """


def normalize_name(name: str) -> str:
    """A distribution name as packaging compares them (PEP 503): case and -_. runs folded."""
    import re
    return re.sub(r"[-_.]+", "-", name).lower()


def missing_plugins(registry: Registry, names: Iterable[str]) -> list[str]:
    """One message per required distribution that registers no rules in this installation."""
    from importlib.metadata import PackageNotFoundError, distribution

    out = []
    for name in names:
        if normalize_name(name) in registry.distributions:
            continue
        try:
            distribution(name)
        except PackageNotFoundError:
            have = ", ".join(sorted(registry.distributions)) or "none"
            out.append(f"required plugin '{name}' is not installed (distributions registering "
                       f"rules here: {have}); install it, or drop it from the required plugins")
        else:
            out.append(f"required plugin '{name}' is installed but registers no rules in the "
                       f"'{ENTRY_POINT_GROUP}' entry-point group")
    return out


def require_plugins(registry: Registry, names: Iterable[str] = (), cfg: Config | None = None) -> None:
    """Raise :class:`RequiredPluginError` unless every plugin named here or in ``cfg`` is installed.

    Names given directly (the command line) are reported as ``--require-plugins``; names from the
    config point at the config's line.
    """
    lines = [f"--require-plugins: {m}" for m in missing_plugins(registry, names)]
    for name in _config_required(cfg):
        for m in missing_plugins(registry, [name]):
            from .config import _line_of
            line, col = _line_of(cfg.text, name, ("",), cfg.prefix) if cfg else (1, 1)
            lines.append(f"{cfg.file}:{line}:{col}: {m}")
    if lines:
        raise RequiredPluginError("\n".join(lines))


def _config_required(cfg: Config | None) -> list[str]:
    return list(cfg.require_plugins) if cfg is not None else []


# --- results ------------------------------------------------------------------------------------

@record
class InternalError:
    rule: str
    file: str
    message: str


@record
class DesignResult:
    file: str
    name: str | None = None
    findings: list[Finding] = field(default_factory=list)
    figures: dict[str, Any] = field(default_factory=dict)
    errors: list[InputError] = field(default_factory=list)
    internal: list[InternalError] = field(default_factory=list)
    #: True once the design's rules ran (False when its file, config or libraries stopped it).
    linted: bool = False
    #: Electrical rules held back because the netlist has integrity errors.
    skipped: list[str] = field(default_factory=list)
    #: Rules that ran on this design (enabled by its config and not held back), for reports
    #: that list passing checks (JUnit).
    checked: list[str] = field(default_factory=list)
    model: Any = None
    #: Each rule's options as this design was linted with them (its folder's config), by rule id:
    #: the review report draws the limits the rules judged by.
    options: dict[str, Any] = field(default_factory=dict)


@record
class RunResult:
    designs: list[DesignResult] = field(default_factory=list)
    errors: list[InputError] = field(default_factory=list)  # errors outside any design (config)
    broken_plugins: list[tuple[str, str]] = field(default_factory=list)
    rules: dict[str, Rule] = field(default_factory=dict)
    fail_on: Severity = Severity.error

    def all_findings(self) -> list[Finding]:
        return [f for d in self.designs for f in d.findings]

    def input_errors(self) -> list[InputError]:
        return self.errors + [e for d in self.designs for e in d.errors]

    def exit_code(self) -> int:
        if self.input_errors() or self.broken_plugins or any(d.internal for d in self.designs):
            return 2
        level = self.fail_on.rank
        if any(f.severity.rank >= level and not f.waived for f in self.all_findings()):
            return 1
        return 0


# --- discovery ----------------------------------------------------------------------------------

def is_design_text(head: str) -> bool:
    for line in head.splitlines():
        stripped = line.strip()
        if stripped.startswith("format:"):
            return stripped.split(":", 1)[1].strip().strip("'\"") == "packwarden/1"
    return False


def discover(paths: Iterable[str], errors: list[InputError] | None = None) -> list[tuple[Path, str]]:
    """Files named directly, and design files (``format: packwarden/1``) inside named folders.

    A named folder holding no design is an error (in ``errors``): a typo in a CI path must not
    pass as "nothing to report".
    """
    out: list[tuple[Path, str]] = []
    roots: dict[Path, Path] = {}
    for raw in paths:
        p = Path(raw)
        if p.is_dir():
            before = len(out)
            for f in sorted(list(p.rglob("*.yaml")) + list(p.rglob("*.yml"))):
                root = roots.get(f.parent) or roots.setdefault(f.parent, named_root(f.parent))
                head = files.head(f, root)
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
            from .policy import read_policy
            shown = shown_path(cfg.policy)
            root = repository_root(cfg.folder or cfg.policy.parent)
            line, col = _config_position(cfg, "policy")
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


def _config_position(cfg: Config, key: str) -> tuple[int, int]:
    from .config import _line_of
    return _line_of(cfg.text, key, ("",), cfg.prefix)


def lint_file(session: Session, path: Path, shown: str,
              timings: dict[str, float] | None = None) -> DesignResult:
    """Lint one design file. ``timings``, when given, gains the seconds each stage took (added
    to what it holds, so one dict can sum a batch): load, validate, libraries, netlist, model,
    rules. The benchmark reads it to show where a design's time goes."""
    clock = _StageClock(timings)
    result = DesignResult(file=shown)
    refused = _refused(session, path, shown)
    if refused is not None:
        result.errors.append(refused)
        return result
    cfg, options, cfg_error = session.config_for(path)
    if cfg_error is not None:
        result.errors.append(cfg_error)
        return result
    assert cfg is not None
    try:
        doc = load_file(path, shown)
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
    resolved = resolve_libraries(doc, design.libraries, path, session.libraries, root)
    clock.lap("libraries")
    if resolved.errors:
        result.errors.extend(resolved.errors)
        return result
    netlist = build_netlist(design, resolved.parts)
    clock.lap("netlist")
    guarded = netlist_errors(doc, design, netlist)
    if guarded:  # nonsense the model would meet as a division by zero: refused, located
        result.errors.extend(guarded)
        return result
    model = make_model(design, netlist)
    result.model = model
    result.figures = model_figures(model, result, doc)
    clock.lap("model")
    run_rules(session, cfg, options, doc, design, netlist, model, result,
              design_id=design_identity(path, root))
    clock.lap("rules")
    return result


def _refused(session: Session, path: Path, shown: str) -> InputError | None:
    """Why a design path is not read, before anything is opened: a path no file system holds, or
    a link out of the design's repository (whose target is then never read, so no message can
    show a byte of it); None when it may be read."""
    try:
        files.check_path(path)
    except files.Refused as exc:
        return InputError(shown, 1, 1, exc.message)
    root = named_root(path.parent)
    if files.outside(path, root):
        return InputError(shown, 1, 1, f"the design links outside its repository "
                                       f"({shown_path(root) or '.'}); it is not read")
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


def design_identity(path: Path, root: Path) -> str:
    """The design's name in fingerprints: its path inside the repository, in POSIX form.

    Not the path as shown, which is relative to the working folder: a baseline written by CI at
    the repository root must still match when someone lints from a subfolder.
    """
    try:
        return path.resolve().relative_to(root.resolve()).as_posix()
    except ValueError:
        return path.resolve().as_posix()


def make_model(design: Design, netlist: Netlist) -> Any:
    from .model.design import DesignModel
    return DesignModel(design, netlist)


def model_figures(model: Any, result: DesignResult, doc: Document | None = None) -> dict[str, Any]:
    try:
        return model.figures()
    except DesignMistake as exc:  # nonsense the model met: the design's, on its line
        result.errors.append(_located(result, exc, doc))
        return {}
    except Exception as exc:  # the model must not take the run down; say where it broke
        result.internal.append(InternalError("model", result.file, _describe(exc)))
        return {}


def run_rules(session: Session, cfg: Config, options: dict, doc: Document, design: Design,
              netlist: Netlist, model: Any, result: DesignResult, design_id: str | None = None) -> None:
    def where(p: tuple) -> tuple[int, int]:
        pos = doc.where(p)
        return pos.line, pos.column

    design_id = design_id or Path(result.file).as_posix()
    result.options = options
    findings: list[Finding] = []
    broken_netlist = bool(netlist.problems)
    for rid in sorted(session.registry.rules):
        rule = session.registry.rules[rid]
        if not cfg.enabled(rid):
            continue
        if broken_netlist and rule.scope != "netlist":
            result.skipped.append(rid)
            continue
        result.checked.append(rid)
        ctx = RuleContext(file=result.file, design=design, netlist=netlist, model=model,
                          rule_id=rid, severity=cfg.severity.get(rid, rule.severity), _where=where)
        try:
            override = cfg.severity.get(rid)
            for f in rule.check(ctx, options[rid]) or ():
                if not isinstance(f, Finding):  # caught here, not later where it takes all down
                    raise TypeError(f"rule yielded {type(f).__name__}, not a Finding "
                                    f"(use ctx.finding(...))")
                # the project's severity override wins even where a rule chose one per finding
                findings.append(replace(f, severity=override) if override else f)
        except DesignMistake as exc:  # the model met nonsense: one input error, not the rule's
            error = _located(result, exc, doc)
            if str(error) not in {str(e) for e in result.errors}:
                result.errors.append(error)
        except (Exception, SystemExit) as exc:  # isolate: one broken rule must not hide the others
            result.internal.append(InternalError(rid, result.file, _describe(exc)))
    policy = session.policy_for(cfg)
    if policy is not None:
        from .policy import check_policy

        def ctx_for(limit) -> RuleContext:
            return RuleContext(file=result.file, design=design, netlist=netlist, model=model,
                               rule_id=limit.rule, severity=limit.severity, _where=where)
        found, held = check_policy(policy, ctx_for, result.figures, netlist, broken_netlist)
        findings.extend(found)
        result.skipped.extend(held)
    from .waivers import apply_waivers
    findings = apply_waivers(findings, design, doc, session.today)
    # The waiver findings are the engine's own; the project's select/ignore/severity apply to them
    # as to any rule's.
    hygiene = "waiver-hygiene"
    if not cfg.enabled(hygiene):
        findings = [f for f in findings if f.rule != hygiene]
    elif hygiene in cfg.severity:
        findings = [replace(f, severity=cfg.severity[hygiene]) if f.rule == hygiene else f
                    for f in findings]
    # After the waivers, so their own findings (expired, unused) share the design's identity.
    findings = [_printable_finding(f).with_fingerprint(design_id) for f in findings]
    findings.sort(key=lambda f: (f.location.line, f.location.column, f.rule, f.key, f.element or ""))
    result.findings = findings
    result.linted = True


def _printable_finding(f: Finding) -> Finding:
    """The finding with its text safe for every report: net names, part names and waiver reasons
    come from the files under review, and a terminal escape among them must reach no terminal,
    HTML page or pull-request comment as anything but visible text."""
    texts = {"message": f.message, "hint": f.hint, "element": f.element, "waived": f.waived}
    if all(t is None or t.isprintable() for t in texts.values()):
        return f
    return replace(f, **{k: printable(t) if t is not None else None for k, t in texts.items()})


def _located(result: DesignResult, mistake: DesignMistake, doc: Document | None) -> InputError:
    pos = doc.where(mistake.path) if doc is not None else None
    return InputError(result.file, pos.line if pos else 1, pos.column if pos else 1,
                      mistake.message)


def _describe(exc: BaseException) -> str:
    import traceback
    tb = traceback.extract_tb(exc.__traceback__)
    last = tb[-1] if tb else None
    where = f" (at {os.path.basename(last.filename)}:{last.lineno})" if last else ""
    return printable(f"{type(exc).__name__}: {exc}{where}")


#: With ``jobs=None`` a batch of at least this many designs is split over worker processes; a
#: smaller one is linted in this process, where a worker's start and its own reading of the part
#: libraries would cost more than the workers save.
PARALLEL_MIN_DESIGNS = 16


def default_jobs() -> int:
    """Processors this process may run on."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


def lint(paths: Iterable[str], config: Path | None = None, registry: Registry | None = None,
         fail_on: Severity | None = None,
         progress: Callable[[int, int, str], None] | None = None,
         require: Iterable[str] = (), jobs: int | None = 1,
         keep_models: bool = True) -> RunResult:
    """Lint every design found under ``paths``; ``progress(done, total, file)`` after each one.

    ``require`` names plugin distributions that must be installed (``--require-plugins``); with
    the config's ``require_plugins`` they are checked before any design is read, and a missing
    one raises :class:`RequiredPluginError`.

    ``jobs`` is the number of worker processes: 1 lints in this process; None takes one per
    processor for a batch of :data:`PARALLEL_MIN_DESIGNS` designs or more. Each worker keeps its
    own session, so a part library is read once per worker, and the results come back in the
    order of the designs, the same as in one process. Worker results carry no ``model``; nor do
    any results when ``keep_models`` is False (the HTML report and ``--yield`` need them).
    """
    discovery_errors: list[InputError] = []
    found = discover(paths, discovery_errors)
    reg = registry
    cfg_error: InputError | None = None
    # Team rule folders and required plugins come from the config of the first design's project
    # (or --config): code is loaded once per run, never per design.
    first_cfg_path = config or (find_config(found[0][0].parent) if found else None)
    first_cfg: Config | None = None
    try:
        first_cfg = load_config(first_cfg_path, shown_path(first_cfg_path) if first_cfg_path else None)
    except InputError as exc:
        cfg_error = exc
    rule_paths = first_cfg.rule_paths if first_cfg else []
    if reg is None:
        reg = load_registry(rule_paths)
        require_plugins(reg, require, first_cfg)
    else:  # the caller chose the rules (a second pass of --since, tests): only its own demands
        require_plugins(reg, require)
    session = Session(registry=reg, config_override=config)
    run = RunResult(rules=reg.rules, broken_plugins=list(reg.broken), errors=discovery_errors)
    workers = _worker_count(jobs, len(found), rebuildable=registry is None)
    if workers > 1:
        run.designs = _lint_in_workers(session, found, workers, progress, rule_paths)
        _adopt(session, found, run.designs)
    else:
        for done, (path, shown) in enumerate(found, 1):
            result = _lint_one(session, path, shown)
            if not keep_models:
                result.model = None
            run.designs.append(result)
            if progress is not None:
                progress(done, len(found), shown)
    # a bad config is reported once, not once per design
    seen: set[str] = set()
    for d in run.designs:
        kept = []
        for e in d.errors:
            if _is_config(e, session):
                if str(e) in seen:
                    continue
                seen.add(str(e))
            kept.append(e)
        d.errors = kept
    if cfg_error is not None and str(cfg_error) not in seen:
        run.errors.append(cfg_error)
    # a policy's mistakes are the run's, reported once however many designs it covers
    run.errors.extend(e for e in session.policy_errors() if str(e) not in seen)
    if fail_on is not None:
        run.fail_on = fail_on
    else:
        cfgs = [c for c, _, _ in session.configs.values() if c is not None]
        run.fail_on = cfgs[0].fail_on if cfgs else Severity.error
    return run


def _lint_one(session: Session, path: Path, shown: str) -> DesignResult:
    try:
        return lint_file(session, path, shown)
    except Exception as exc:  # last resort: no input may end the run with a traceback
        return DesignResult(file=shown, internal=[InternalError("engine", shown, _describe(exc))])


# --- worker processes -------------------------------------------------------------------------

def _worker_count(jobs: int | None, designs: int, rebuildable: bool) -> int:
    if jobs is None:
        jobs = default_jobs() if designs >= PARALLEL_MIN_DESIGNS else 1
    workers = max(1, min(jobs, designs))
    if workers > 1 and not _FORK and not rebuildable:
        # Without fork a worker must load the rules itself, and a registry the caller built
        # cannot be rebuilt there.
        return 1
    return workers


# Forked workers start with the registry, libraries and imports of this process at no cost;
# elsewhere (spawn) each worker imports packwarden and loads the rules itself.
_FORK = sys.platform.startswith("linux")
_WORKER_SESSION: Session | None = None


def _worker_start(registry: Registry | None, rule_paths: list[Path], config: Path | None,
                  today: _dt.date) -> None:
    global _WORKER_SESSION
    if registry is None:
        registry = load_registry(rule_paths)
    _WORKER_SESSION = Session(registry=registry, config_override=config, today=today)
    # What the worker holds now (modules, schemas, rules) lives as long as the worker: keep the
    # cycle collector from walking it again for every design.
    import gc
    gc.freeze()


def _worker_lint(chunk: list[tuple[Path, str]]) -> list[DesignResult]:
    assert _WORKER_SESSION is not None
    out = []
    for path, shown in chunk:
        result = _lint_one(_WORKER_SESSION, path, shown)
        result.model = None  # the model stays behind: it is large, and only this process has it
        out.append(result)
    return out


def _lint_in_workers(session: Session, found: list[tuple[Path, str]], workers: int,
                     progress: Callable[[int, int, str], None] | None,
                     rule_paths: list[Path]) -> list[DesignResult]:
    """Results of ``found``, in order, linted in chunks by ``workers`` processes.

    This process is one of them: it lints chunks from the end of the batch while the others
    take them from the front, so no processor waits and one process fewer holds the libraries
    and imports. A chunk whose worker fails (killed, or a result that cannot be sent back) is
    linted here instead, so a run never loses a design.
    """
    import concurrent.futures as futures
    import multiprocessing

    ctx = multiprocessing.get_context("fork" if _FORK else "spawn")
    # Chunks small enough that the processes stay busy to the end, large enough that sending
    # them costs little next to linting them.
    size = max(1, min(64, len(found) // (workers * 8)))
    chunks = [found[i:i + size] for i in range(0, len(found), size)]
    results: list[list[DesignResult] | None] = [None] * len(chunks)
    # Its own session, as the other workers have theirs: this process's session learns the
    # configs and policies afterwards, in the order of the designs (see _adopt).
    here = Session(registry=session.registry, config_override=session.config_override,
                   today=session.today)
    done = 0

    def finished(k: int, chunk_results: list[DesignResult]) -> None:
        nonlocal done
        results[k] = chunk_results
        for (_, shown), _result in zip(chunks[k], chunk_results):
            done += 1
            if progress is not None:
                progress(done, len(found), shown)

    def harvest(block: bool) -> None:
        for k, job in list(running.items()):
            if block or job.done():
                del running[k]
                try:
                    finished(k, job.result())
                except Exception:
                    finished(k, _lint_here(here, chunks[k]))

    pool = futures.ProcessPoolExecutor(
        workers - 1, mp_context=ctx, initializer=_worker_start,
        initargs=(session.registry if _FORK else None, rule_paths, session.config_override,
                  session.today))
    running: dict[int, futures.Future] = {}
    front, back = 0, len(chunks)  # the pool takes chunks from the front, this process the back
    try:
        while front < back:
            while front < back and len(running) < 2 * (workers - 1):
                running[front] = pool.submit(_worker_lint, chunks[front])
                front += 1
            if front < back:
                back -= 1
                finished(back, _lint_here(here, chunks[back]))
            harvest(block=False)
        harvest(block=True)
    except BaseException:
        pool.shutdown(wait=False, cancel_futures=True)
        raise
    pool.shutdown()
    return [r for chunk_results in results for r in chunk_results]


def _lint_here(session: Session, chunk: list[tuple[Path, str]]) -> list[DesignResult]:
    """A chunk linted in this process, as a worker would have: no models kept."""
    results = [_lint_one(session, path, shown) for path, shown in chunk]
    for result in results:
        result.model = None
    return results


def _adopt(session: Session, found: list[tuple[Path, str]], results: list[DesignResult]) -> None:
    """Give this process's session what the workers' sessions learnt, as one process would have.

    The configs are read here in the order of the designs (the first one's fail-on is the run's),
    a config error from a worker is replaced by this session's own, so it is reported once, and
    the policies are read in the order the designs that ran their rules name them.
    """
    for (path, _), result in zip(found, results):
        cfg, _, error = session.config_for(path)
        if error is not None:
            result.errors = [error if str(e) == str(error) else e for e in result.errors]
        elif cfg is not None and result.linted:
            session.policy_for(cfg)


def _is_config(err: InputError, session: Session) -> bool:
    return any(e is err for _, _, e in session.configs.values())
