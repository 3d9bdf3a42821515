"""A run over many designs: discovery, one session, worker processes for a large batch, the
results in the order of the designs.
"""

from __future__ import annotations

import datetime as _dt
import gc
import os
import sys
from pathlib import Path
from typing import Callable, Iterable

from .api import Severity
from .config import Config, find_config, load_config
from .library import shown_path
from .loader import InputError
from .pipeline import Session, describe, discover, lint_file
from .registry import Registry, load_registry, require_plugins
from .results import DesignResult, InternalError, RunResult

#: With ``jobs=None`` a batch of at least this many designs is split over worker processes; a
#: smaller one is linted in this process, where a worker's start and its own reading of the part
#: libraries would cost more than the workers save: on two cores the pool pays from about 40-50
#: small designs [measured: the profile behind issue 11; re-measured by bench/run.py's batch].
PARALLEL_MIN_DESIGNS = 48

#: A batch runs with the cycle collector off and collects only the young generation (what the
#: last designs made) after every this many designs. A design's lint leaves almost no cycles
#: behind, yet the collector, left on, walks the growing results again and again: 5-10 % of a
#: batch's CPU [measured: bench/run.py's corpus in process, issue 19].
COLLECT_EVERY = 32


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
         keep_models: bool = True, keep_events: bool = True,
         figures_up_to: int | None = None) -> RunResult:
    """Lint every design found under ``paths``; ``progress(done, total, file)`` after each one.

    ``require`` names plugin distributions that must be installed (``--require-plugins``); with
    the config's ``require_plugins`` they are checked before any design is read, and a missing
    one raises :class:`RequiredPluginError`.

    ``jobs`` is the number of worker processes: 1 lints in this process; None takes one per
    processor for a batch of :data:`PARALLEL_MIN_DESIGNS` designs or more. Each worker keeps its
    own session, so a part library is read once per worker, and the results come back in the
    order of the designs, the same as in one process. Worker results carry no ``model``; nor do
    any results when ``keep_models`` is False (the HTML report and ``--yield`` need them); the
    results carry the model's events only when ``keep_events`` is True (the JSON report writes
    them; a batch of thousands of designs in another format need not hold them). A run of more
    than ``figures_up_to`` designs keeps no design's key figures (the text report shows them
    only for a single design); None keeps them in every run.
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
    session = Session(registry=reg, config_override=config, keep_events=keep_events)
    run = RunResult(rules=reg.rules, broken_plugins=list(reg.broken), errors=discovery_errors)
    workers = worker_count(jobs, len(found), rebuildable=registry is None)
    keep_figures = figures_up_to is None or len(found) <= figures_up_to
    if workers > 1:
        run.designs = _lint_in_workers(session, found, workers, progress, rule_paths,
                                       keep_figures)
        _adopt(session, found, run.designs)
    else:
        collecting = _pause_collector()
        try:
            for done, (path, shown) in enumerate(found, 1):
                result = _lint_one(session, path, shown)
                if not keep_models:
                    result.model = None
                if not keep_figures:
                    result.figures = {}
                run.designs.append(result)
                if progress is not None:
                    progress(done, len(found), shown)
                if done % COLLECT_EVERY == 0:
                    gc.collect(0)
        finally:
            _resume_collector(collecting)
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
        return DesignResult(file=shown, internal=[InternalError("engine", shown, describe(exc))])


# --- worker processes -------------------------------------------------------------------------

def worker_count(jobs: int | None, designs: int, rebuildable: bool) -> int:
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
_WORKER_KEEPS_FIGURES = True


def _worker_start(registry: Registry | None, rule_paths: list[Path], config: Path | None,
                  today: _dt.date, keep_events: bool = True, keep_figures: bool = True) -> None:
    global _WORKER_SESSION, _WORKER_KEEPS_FIGURES
    _WORKER_KEEPS_FIGURES = keep_figures
    if registry is None:
        registry = load_registry(rule_paths)
    _WORKER_SESSION = Session(registry=registry, config_override=config, today=today,
                              keep_events=keep_events)
    # What the worker holds now (modules, schemas, rules) lives as long as the worker: keep the
    # cycle collector from walking it again for every design; the worker collects the young
    # generation after each chunk instead (_worker_lint).
    gc.freeze()
    gc.disable()


def _worker_lint(chunk: list[tuple[Path, str]]) -> bytes:
    """A chunk's results, pickled here: the parent keeps them so, a fraction of their size as
    objects, until every worker is done (:func:`_lint_in_workers`)."""
    assert _WORKER_SESSION is not None
    out = []
    for path, shown in chunk:
        result = _lint_one(_WORKER_SESSION, path, shown)
        result.model = None  # the model stays behind: it is large, and only this process has it
        if not _WORKER_KEEPS_FIGURES:
            result.figures = {}  # nor is a figure sent that the report will not show
        out.append(result)
    gc.collect(0)
    import pickle
    return pickle.dumps(out, protocol=pickle.HIGHEST_PROTOCOL)


def _lint_in_workers(session: Session, found: list[tuple[Path, str]], workers: int,
                     progress: Callable[[int, int, str], None] | None,
                     rule_paths: list[Path], keep_figures: bool = True) -> list[DesignResult]:
    """Results of ``found``, in order, linted in chunks by ``workers`` processes.

    This process is one of them: it lints chunks from the end of the batch while the others
    take them from the front, so no processor waits and one process fewer holds the libraries
    and imports. A chunk whose worker fails (a result that cannot be sent or read back, or a
    worker killed, after which the pool takes no more chunks) is linted here instead, so a run
    never loses a design.
    """
    import concurrent.futures as futures
    import multiprocessing

    ctx = multiprocessing.get_context("fork" if _FORK else "spawn")
    # Chunks small enough that the processes stay busy to the end, large enough that sending
    # them costs little next to linting them.
    size = max(1, min(64, len(found) // (workers * 8)))
    chunks = [found[i:i + size] for i in range(0, len(found), size)]
    # A worker's chunk is kept as the worker pickled it until the pool is shut down, and read
    # only then: while the workers run, the results they send take a fraction of the memory
    # they take as objects (a 401-component pack's 67 findings: 43 kB against about 150 kB).
    results: list[list[DesignResult] | bytes | None] = [None] * len(chunks)
    # Its own session, as the other workers have theirs: this process's session learns the
    # configs and policies afterwards, in the order of the designs (see _adopt).
    here = Session(registry=session.registry, config_override=session.config_override,
                   today=session.today, keep_events=session.keep_events)
    done = 0

    def finished(k: int, chunk_results: list[DesignResult] | bytes) -> None:
        nonlocal done
        results[k] = chunk_results
        for _, shown in chunks[k]:
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
                    finished(k, _lint_here(here, chunks[k], keep_figures))

    pool = futures.ProcessPoolExecutor(
        workers - 1, mp_context=ctx, initializer=_worker_start,
        initargs=(session.registry if _FORK else None, rule_paths, session.config_override,
                  session.today, session.keep_events, keep_figures))
    running: dict[int, futures.Future] = {}
    front, back = 0, len(chunks)  # the pool takes chunks from the front, this process the back
    broken = False  # a worker died (killed, out of memory): the pool takes no more chunks
    try:
        while front < back:
            while not broken and front < back and len(running) < 2 * (workers - 1):
                try:
                    running[front] = pool.submit(_worker_lint, chunks[front])
                except futures.BrokenExecutor:
                    broken = True  # this process lints the rest; the lost chunks below
                    break
                front += 1
            if front < back:
                back -= 1
                finished(back, _lint_here(here, chunks[back], keep_figures))
            harvest(block=False)
        harvest(block=True)
    except BaseException:
        pool.shutdown(wait=False, cancel_futures=True)
        raise
    pool.shutdown()
    import pickle
    out: list[DesignResult] = []
    for k, chunk_results in enumerate(results):
        if isinstance(chunk_results, bytes):
            try:
                chunk_results = pickle.loads(chunk_results)
            except Exception:  # a result that cannot be read back: linted here, as a lost chunk
                chunk_results = _lint_here(here, chunks[k], keep_figures)
        assert chunk_results is not None
        out.extend(chunk_results)
    return out


def _lint_here(session: Session, chunk: list[tuple[Path, str]],
               keep_figures: bool = True) -> list[DesignResult]:
    """A chunk linted in this process, as a worker would have: no models kept (nor figures,
    unless ``keep_figures``)."""
    collecting = _pause_collector()
    try:
        results = [_lint_one(session, path, shown) for path, shown in chunk]
        for result in results:
            result.model = None
            if not keep_figures:
                result.figures = {}
        gc.collect(0)
    finally:
        _resume_collector(collecting)
    return results


def _pause_collector() -> bool:
    """Turn the cycle collector off for a batch (see :data:`COLLECT_EVERY`); whether it was on."""
    collecting = gc.isenabled()
    gc.disable()
    return collecting


def _resume_collector(collecting: bool) -> None:
    if collecting:
        gc.enable()


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
