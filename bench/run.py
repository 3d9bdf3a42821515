#!/usr/bin/env python3
"""packwarden's speed benchmark (issue 7): one run, every target, a table and a JSON file.

    .venv/bin/python bench/run.py            # the full corpus: about ten minutes on two cores
    .venv/bin/python bench/run.py --tiny     # everything on a tiny corpus, in seconds (the test)

It writes a corpus into a temporary folder, made from the examples: single-cell designs (the
Orchard probe with its name and load varied), 4S2P packs (the Ridgeline tool pack, likewise),
large 16S x 20P packs with ten parallel FETs per switch (about 400 components, with an inline
16-cell protector that has RL-GUARD-4S's thresholds) and a scaling series from 10 to 2 000
components. Then, in one run:

* cold single-file lint: the whole ``packwarden check FILE`` process, median of repeated runs.
  The benchmark runs the ``packwarden`` of its own environment, in a development checkout an
  editable install (``pip install -e``), whose every start imports the editable finder from a
  ``.pth`` file (about 12 ms, ``pathlib`` and ``urllib`` among it), which yamllint's start in
  the same environment pays too. A user has a regular install: when this one is editable, the
  cold lint and yamllint are also timed from a regular install made for the run (the same
  libraries linked, packwarden installed by pip from this checkout), wall and CPU time, taking
  turns with the rest; the issue 19 target is judged on it and the editable figure printed beside;
* batch throughput over 10 000 designs, all cores (``--jobs``), and the peak memory of the whole
  process tree (RSS of every process summed, sampled from /proc);
* scaling: time per design against its component count;
* the floor on the same files: libyaml parsing alone (``yaml.compose`` with ``CSafeLoader``, in
  process; and, printed beside it but not judged, the same split among as many processes as the
  batch runs, parsing at once, whose CPU per design is what a batch on every core is up against
  where busy cores slow each other down) and, as the peer a user might reach for, schema-only validation with the
  general-purpose ``check-jsonschema`` command (one file per process, and the whole batch);
* the plain YAML linter that often runs in the same pre-commit hook, ``yamllint`` with its
  default rules, one file per process, taking turns with the cold lint (issue 19);
* the Monte Carlo yield run, 100 000 samples;
* the start-up floor: processes that only start the interpreter, import the libraries a plain
  check is built on (pyyaml, pydantic-core), and build the schema's validators as a plain check
  does (the quick way), and beside it as the other commands do (pydantic's models);
* where the time goes: per kind of design, each stage of the lint (load, validate, libraries,
  netlist, model, rules) beside the floor, in process;
* the editor (``packwarden lsp``): per kind of design, a warm re-lint of the editor's text after
  an edit, in process, as the server runs it once the 300 ms debounce has passed; and over stdio,
  the time from an edit fixing a flawed design to the diagnostics that clear it, and back (needs
  the ``lsp`` extra, pygls; else reported as not available).

Bytecode: the measured processes run with bytecode caching on, as on a user's machine, after a
warm-up run has written the caches (``PYTHONDONTWRITEBYTECODE`` is removed from their
environment; the warm-up also writes the entry-point cache, ``packwarden.entrycache``). The cold
lint is also measured with no cache at all (every module, the standard library's too, compiled
at start-up, and the entry points read from ``importlib.metadata``) and printed beside it.

Speed figures belong here, never in the unit tests: ``tests/test_bench.py`` only runs ``--tiny``.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import resource
import shutil
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"
ORCHARD = EXAMPLES / "orchard-probe.yaml"
RIDGELINE = EXAMPLES / "ridgeline-tool-4s2p.yaml"
RIDGELINE_PARTS = EXAMPLES / "parts" / "ridgeline-parts.yaml"
ORCHARD_PARTS = EXAMPLES / "parts" / "orchard-parts.yaml"
DESIGN_SCHEMA = REPO / "schemas" / "design.schema.json"

# The targets of issue 7.
TARGET_FLOOR_RATIO = 3.0
TARGET_COLD = 0.3  # s
TARGET_SCALING = 12.0  # time ratio allowed for ten times the components
TARGET_MEMORY = 150.0  # MB
# s for 100 000 samples, by design: the single cell under 1 s, a 4S2P pack under 2 s (the large
# pack and the low-side example are measured and stated, with no target).
TARGET_MONTE_CARLO = {"single": 1.0, "pack4s2p": 2.0}
TARGET_EDITOR = 1.0  # s from an edit to its diagnostics in the editor (issue 17)
# The targets of issue 19 (speed with the events in).
TARGET_YAMLLINT_RATIO = 2.0  # cold lint of the single-cell example against yamllint's
TARGET_FLOOR_RATIO_EVENTS = 8.0  # batch CPU per design against libyaml's compose of it
TARGET_RELINT = {"single": 0.005, "large": 0.050}  # s, the editor's warm re-lint
# s CPU of `packwarden check` of the 1000-component scaling pack, its hints' re-lint searches
# included (issue 18: the search budget, pipeline.FIT_BUDGET, keeps a large design's check cheap)
TARGET_FIT_PACK = {"components": 1000, "cpu_s": 1.0}

FULL = dict(single=5000, pack4s2p=4900, large=100, scaling=[10, 20, 50, 100, 200, 500, 1000, 2000],
            cold_runs=9, scaling_runs=5, mc_samples=100_000, mc_runs=3, floor_runs=3,
            stage_designs=200, editor_runs=51, editor_trips=10)
TINY = dict(single=12, pack4s2p=6, large=2, scaling=[10, 20, 50, 100], cold_runs=2,
            scaling_runs=2, mc_samples=2_000, mc_runs=1, floor_runs=1, stage_designs=2,
            editor_runs=3, editor_trips=1)


# --- the corpus ------------------------------------------------------------------------------

def single_cell(i: int) -> str:
    """The Orchard probe, its name and continuous load varied (0.5 .. 1.3 A, below its trip)."""
    text = ORCHARD.read_text(encoding="utf-8")
    load = 0.5 + (i % 9) / 10
    return (text.replace("name: Orchard soil probe,", f"name: Probe {i:05d},")
            .replace("  continuous: 1.2 A", f"  continuous: {load:.1f} A")
            .replace("libraries: [parts/orchard-parts.yaml]",
                     "libraries: [../../parts/orchard-parts.yaml]"))


def pack_4s2p(i: int) -> str:
    """The Ridgeline 4S2P tool pack, its name and continuous load varied (8 .. 16 A)."""
    text = RIDGELINE.read_text(encoding="utf-8")
    load = 8 + (i % 9)
    return (text.replace("name: Ridgeline hedge-trimmer pack 4S2P,", f"name: Tool pack {i:05d},")
            .replace("  continuous: 12 A", f"  continuous: {load} A")
            .replace("libraries: [parts/ridgeline-parts.yaml]",
                     "libraries: [../../parts/ridgeline-parts.yaml]"))


def _protector(cells: int) -> dict:
    """RL-GUARD-4S's thresholds from the Ridgeline library, as an inline part with ``cells``."""
    import yaml
    part = dict(yaml.safe_load(RIDGELINE_PARTS.read_text(encoding="utf-8"))["parts"]["RL-GUARD-4S"])
    part["cells"] = cells
    return part


def component_plan(target: int) -> tuple[int, int, int, bool, int]:
    """(series, parallel, FETs per switch, sense and monitor parts, extra capacitors) making a
    pack of exactly ``target`` components."""
    series = 1 if target < 20 else 2 if target < 50 else 4 if target < 100 else 16
    fets = max(1, target // 40)
    extras = target >= 20
    base = 1 + (2 * series if series > 1 else 0) + 4 * fets + 4 + (4 if extras else 0)
    parallel = max(1, (target - base) // series)
    caps = target - base - series * parallel
    if caps < 0:
        raise ValueError(f"no pack plan makes {target} components")
    return series, parallel, fets, extras, caps


def pack(name: str, series: int, parallel: int, fets: int, *, extras: bool = True, caps: int = 0,
         load: float = 15.0) -> str:
    """A pack of Ridgeline parts: ``series`` x ``parallel`` cells, a protector with ``series``
    cell inputs (tap filters and bleed resistors), ``fets`` p-channel FETs in parallel per
    switch on the positive rail, each with its own gate resistor, a fuse and a low-side shunt."""
    levels = ["B-"] + [f"B{k}" for k in range(1, series)] + ["B+"]
    lines = [
        "# A generated benchmark pack (bench/run.py) of invented parts.",
        "format: packwarden/1",
        f"design: {{name: {name}, revision: A}}",
        "libraries: [../../parts/ridgeline-parts.yaml]",
        "pack:",
        "  ambient: {min: -10 °C, max: 50 °C}",
        "load:",
        f"  continuous: {load:g} A",
        f"  peak: {{current: {min(load * 2, 28):g} A, duration: 300 ms}}",
        "charger:",
        f"  voltage: {{typ: {4.2 * series:.1f} V, tol: 0.5 %}}",
        "  current: 2 A",
        f"  open_circuit_max: {4.2 * series * 1.1:.1f} V",
        "  reverse_polarity: prevented",
        "  temperature_window: {min: 0 °C, max: 45 °C}",
        "storage: {soc: 30 %, duration: 6 months, temperature: 25 °C}",
        "components:",
    ]
    n = 0
    for level in range(series):
        for _ in range(parallel):
            n += 1
            lines.append(f"  BT{n}: {{part: RL-CELL-2500, pins: {{pos: {levels[level + 1]}, "
                         f"neg: {levels[level]}}}}}")
    protector = _protector(series)
    pins = {"supply": "VDD", "ground": "B-", "sense": "SNS" if extras else "P-",
            "discharge_gate": "DG", "charge_gate": "CG"}
    if series > 1:
        for k in range(1, series + 1):
            pins[f"cell{k}"] = f"T{k}"
            pins[f"balance{k}"] = f"BAL{k}"
    protector["pins"] = pins
    # JSON is YAML: the protector's block, copied from the library, is written as one flow map.
    lines.append("  U1: " + json.dumps(protector, ensure_ascii=False))
    if series > 1:
        for k in range(1, series + 1):
            lines.append(f"  RT{k}: {{part: RL-RES-1K0, pins: [{levels[k]}, T{k}]}}")
            lines.append(f"  RB{k}: {{part: RL-RES-100-HALFW, pins: [{levels[k]}, BAL{k}]}}")
    lines += ["  R1: {part: RL-RES-330, pins: [B+, VDD]}",
              "  C1: {part: RL-CAP-1U-25V, pins: [VDD, B-]}",
              "  F1: {part: RL-FUSE-60A, pins: [B+, BF]}",
              "  RSH: {part: RL-SHUNT-1M5, pins: [B-, P-]}"]
    for k in range(1, fets + 1):
        lines.append(f"  QD{k}: {{part: RL-PFET-30, pins: {{s: BF, g: GD{k}, d: MID}}}}")
        lines.append(f"  RGD{k}: {{part: RL-RES-1K0, pins: [DG, GD{k}]}}")
        lines.append(f"  QC{k}: {{part: RL-PFET-30, pins: {{s: P+, g: GC{k}, d: MID}}}}")
        lines.append(f"  RGC{k}: {{part: RL-RES-1K0, pins: [CG, GC{k}]}}")
    if extras:
        lines += ["  R2: {part: RL-RES-1K0, pins: [SNS, P-]}",
                  "  R21: {part: RL-RES-1M0, pins: [B+, VMON]}",
                  "  R22: {part: RL-RES-150K, pins: [VMON, B-]}",
                  "  C2: {part: RL-CAP-100N-50V, pins: [P+, P-]}"]
    for k in range(caps):
        lines.append(f"  CX{k + 1}: {{part: RL-CAP-100N-50V, pins: [P+, P-]}}")
    return "\n".join(lines) + "\n"


def scaling_pack(target: int) -> str:
    series, parallel, fets, extras, caps = component_plan(target)
    return pack(f"Scaling pack {target}", series, parallel, fets, extras=extras, caps=caps,
                load=min(2.0 * parallel, 15.0))


def large_pack(i: int) -> str:
    return pack(f"Large pack {i:04d}", 16, 20, 10, load=15.0 + (i % 9))


def make_corpus(root: Path, cfg: dict) -> dict:
    """Write the corpus under ``root``; return its files by kind."""
    (root / "parts").mkdir(parents=True)
    shutil.copy(ORCHARD_PARTS, root / "parts" / "orchard-parts.yaml")
    shutil.copy(RIDGELINE_PARTS, root / "parts" / "ridgeline-parts.yaml")
    # The corpus is a repository of its own: its config marks the root that libraries must lie in.
    (root / "packwarden.toml").write_text("# benchmark corpus\n", encoding="utf-8")
    files: dict[str, list[Path]] = {}
    for kind, make in (("single", single_cell), ("pack4s2p", pack_4s2p), ("large", large_pack)):
        folder = root / "batch" / kind
        folder.mkdir(parents=True)
        files[kind] = []
        for i in range(cfg[kind]):
            path = folder / f"{kind}-{i:05d}.yaml"
            path.write_text(make(i), encoding="utf-8")
            files[kind].append(path)
    folder = root / "scaling" / "packs"
    folder.mkdir(parents=True)
    files["scaling"] = []
    for target in cfg["scaling"]:
        path = folder / f"scale-{target:04d}.yaml"
        path.write_text(scaling_pack(target), encoding="utf-8")
        files["scaling"].append(path)
    return files


# --- measuring processes ---------------------------------------------------------------------

def cached_env() -> dict:
    """The environment of a user's machine: bytecode is cached."""
    env = dict(os.environ)
    env.pop("PYTHONDONTWRITEBYTECODE", None)
    env.pop("PYTHONPYCACHEPREFIX", None)
    env["NO_COLOR"] = "1"
    return env


def uncached_env(prefix: Path) -> dict:
    """No bytecode cache at all: caches are looked for in an empty folder and never written."""
    env = cached_env()
    env["PYTHONDONTWRITEBYTECODE"] = "1"
    env["PYTHONPYCACHEPREFIX"] = str(prefix)
    env["PACKWARDEN_CACHE_DIR"] = ""  # nor the entry points kept between runs
    return env


def packwarden_cmd() -> list[str]:
    script = Path(sys.executable).with_name("packwarden")
    return [str(script)] if script.exists() else [sys.executable, "-m", "packwarden.cli"]


def peer_cmd(name: str = "check-jsonschema") -> list[str] | None:
    script = Path(sys.executable).with_name(name)
    if script.exists():
        return [str(script)]
    found = shutil.which(name)
    return [found] if found else None


def ensure_peer(install: bool, name: str = "check-jsonschema") -> tuple[list[str] | None, str]:
    """The peer command ``name`` (a distribution of the same name in the bench extra), installed
    into this environment when it is missing and ``install`` allows it."""
    cmd = peer_cmd(name)
    if cmd is not None or not install:
        return cmd, "" if cmd else f"{name} is not installed (pip install -e '.[bench]')"
    print(f"installing {name} into this environment (the bench extra) ...", flush=True)
    proc = subprocess.run([sys.executable, "-m", "pip", "install", "-q", name],
                          capture_output=True, text=True)
    cmd = peer_cmd(name)
    if cmd is None:
        return None, (f"{name} could not be installed: "
                      + (proc.stderr.strip().splitlines() or ["pip failed"])[-1])
    return cmd, ""


def peer_args(cmd: list[str]) -> list[str]:
    # The peer as a user would run it: its default (ECMAScript) regex dialect, which the shipped
    # schema's patterns are written for.
    return cmd + ["--schemafile", str(DESIGN_SCHEMA)]


def timed(cmd: list[str], env: dict, ok=(0, 1), cwd: Path | None = None) -> float:
    t0 = time.perf_counter()
    proc = subprocess.run(cmd, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                          cwd=cwd)
    elapsed = time.perf_counter() - t0
    if proc.returncode not in ok:
        raise RuntimeError(f"{' '.join(cmd[:4])} ... exited {proc.returncode}: "
                           f"{proc.stderr.decode(errors='replace')[-2000:]}")
    return elapsed


def median_of(runs: int, cmd: list[str], env: dict, **kw) -> dict:
    return _stats([timed(cmd, env, **kw) for _ in range(runs)])


def _stats(times: list[float]) -> dict:
    return {"median_s": statistics.median(times), "min_s": min(times), "max_s": max(times),
            "runs": len(times)}


def timed_cpu(cmd: list[str], env: dict, ok=(0, 1)) -> tuple[float, float]:
    """Wall and CPU (user + system of the child) seconds of one process: on a shared machine
    the CPU time is the steadier of the two."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    wall = timed(cmd, env, ok=ok)
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    return wall, (after.ru_utime + after.ru_stime) - (before.ru_utime + before.ru_stime)


def regular_args(name: str, design: Path) -> list[str]:
    return ["check", str(design)] if name == "packwarden" else [str(design)]


def editable_install() -> bool:
    """Whether this environment's packwarden is an editable (development) install: its
    console script then starts with the editable finder that ``site`` imports from a ``.pth``
    file, which a user's regular install does not have."""
    from importlib.metadata import PackageNotFoundError, distribution
    try:
        text = distribution("packwarden").read_text("direct_url.json") or "{}"
    except PackageNotFoundError:
        return False
    return bool(json.loads(text).get("dir_info", {}).get("editable"))


def regular_install(tmp: Path) -> tuple[dict | None, str]:
    """packwarden as a user installs it (``pip install``, not editable), with the same libraries:
    a virtual environment without pip whose site-packages links every entry of this one except
    packwarden's own files (its editable finder, ``.pth`` and metadata), and packwarden
    installed into it from this checkout by this environment's pip (``--python``). Returns the
    commands (``packwarden`` and ``yamllint``, the peer started the same way) or None and why."""
    import sysconfig
    venv = tmp / "regular-install"
    try:
        subprocess.run([sys.executable, "-m", "venv", "--without-pip", str(venv)], check=True,
                       capture_output=True)
        python = venv / ("Scripts" if os.name == "nt" else "bin") / "python"
        site = Path(subprocess.run([str(python), "-c", "import sysconfig; "
                                    "print(sysconfig.get_paths()['purelib'])"], check=True,
                                   capture_output=True, text=True).stdout.strip())
        ours = ("__editable__", "packwarden", "__pycache__")
        for entry in Path(sysconfig.get_paths()["purelib"]).iterdir():
            if not entry.name.startswith(ours):
                (site / entry.name).symlink_to(entry)
        proc = subprocess.run([sys.executable, "-m", "pip", "--python", str(python), "install",
                               "-q", "--no-deps", str(REPO)], capture_output=True, text=True)
        if proc.returncode != 0:
            return None, "pip: " + (proc.stderr.strip().splitlines() or ["failed"])[-1]
    except (OSError, subprocess.CalledProcessError) as exc:
        return None, f"could not make the regular install: {exc}"
    scripts = python.parent
    cmds = {"packwarden": [str(scripts / "packwarden")]}
    yamllint = peer_cmd("yamllint")
    if yamllint and Path(yamllint[0]).is_file():
        # the peer's own console script, started by this environment's interpreter
        text = Path(yamllint[0]).read_text(encoding="utf-8").split("\n", 1)
        (scripts / "yamllint").write_text(f"#!{python}\n{text[1]}", encoding="utf-8")
        (scripts / "yamllint").chmod(0o755)
        cmds["yamllint"] = [str(scripts / "yamllint")]
    return cmds, ""


class TreeMemory:
    """Peak resident memory of a process and all its descendants, sampled from /proc."""

    def __init__(self, pid: int, interval: float = 0.01):
        self.pid, self.interval = pid, interval
        self.peak_rss = 0
        self.peak_pss = 0
        self.peak_processes = 0
        self._stop = threading.Event()
        self._thread = threading.Thread(target=self._run, daemon=True)

    def __enter__(self) -> "TreeMemory":
        self._thread.start()
        return self

    def __exit__(self, *exc) -> None:
        self._stop.set()
        self._thread.join()

    def _tree(self) -> list[int]:
        children: dict[int, list[int]] = {}
        for entry in os.listdir("/proc"):
            if not entry.isdigit():
                continue
            try:
                with open(f"/proc/{entry}/stat", "rb") as fh:
                    stat = fh.read()
            except OSError:
                continue
            ppid = int(stat[stat.rfind(b")") + 2:].split()[1])
            children.setdefault(ppid, []).append(int(entry))
        out, todo = [], [self.pid]
        while todo:
            pid = todo.pop()
            out.append(pid)
            todo.extend(children.get(pid, ()))
        return out

    @staticmethod
    def _field(path: str, name: bytes) -> int:
        try:
            with open(path, "rb") as fh:
                for line in fh:
                    if line.startswith(name):
                        return int(line.split()[1]) * 1024
        except OSError:
            pass
        return 0

    def _run(self) -> None:
        while not self._stop.is_set():
            pids = self._tree()
            rss = sum(self._field(f"/proc/{p}/status", b"VmRSS:") for p in pids)
            pss = sum(self._field(f"/proc/{p}/smaps_rollup", b"Pss:") for p in pids)
            self.peak_rss = max(self.peak_rss, rss)
            self.peak_pss = max(self.peak_pss, pss)
            self.peak_processes = max(self.peak_processes, len(pids))
            self._stop.wait(self.interval)


def supports_jobs() -> bool:
    out = subprocess.run(packwarden_cmd() + ["check", "--help"], capture_output=True, text=True,
                         env=cached_env())
    return "--jobs" in out.stdout


def run_batch(folder: Path, jobs: int, env: dict, count: int) -> dict:
    cmd = packwarden_cmd() + ["check", "--quiet"]
    if jobs and supports_jobs():
        cmd += ["--jobs", str(jobs)]
    else:
        jobs = 1
    cmd.append(str(folder))
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    proc = subprocess.Popen(cmd, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    on_linux = os.path.isdir("/proc/self")
    if on_linux:
        with TreeMemory(proc.pid) as mem:
            _, err = proc.communicate()
    else:  # pragma: no cover
        mem = None
        _, err = proc.communicate()
    wall = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    if proc.returncode not in (0, 1):
        raise RuntimeError(f"the batch lint exited {proc.returncode}: "
                           f"{err.decode(errors='replace')[-2000:]}")
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    out = {"designs": count, "jobs": jobs, "wall_s": wall, "cpu_s": cpu,
           "designs_per_s": count / wall, "wall_per_design_s": wall / count,
           "cpu_per_design_s": cpu / count,
           # ru_maxrss of the children: the largest single process, in kilobytes on Linux
           "max_single_process_rss_mb": after.ru_maxrss / 1024}
    if mem is not None:
        out.update(peak_tree_rss_mb=mem.peak_rss / 2**20, peak_tree_pss_mb=mem.peak_pss / 2**20,
                   processes=mem.peak_processes)
    return out


def peer_batch(cmd: list[str], files: list[Path], env: dict, cores: int) -> dict:
    """check-jsonschema over every file, one process per core at a time, a few hundred files each."""
    chunk = max(1, min(500, -(-len(files) // cores)))
    chunks = [files[i:i + chunk] for i in range(0, len(files), chunk)]
    t0 = time.perf_counter()
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    running: list[subprocess.Popen] = []
    failures = []

    def reap(p: subprocess.Popen) -> None:
        p.wait()
        if p.returncode not in (0, 1):
            failures.append(p.returncode)

    for part in chunks:
        while len(running) >= cores:
            reap(running.pop(0))
        running.append(subprocess.Popen(peer_args(cmd) + [str(f) for f in part], env=env,
                                        stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL))
    for p in running:
        reap(p)
    wall = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    if failures:
        raise RuntimeError(f"check-jsonschema failed: exit codes {failures}")
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return {"designs": len(files), "processes": len(chunks), "parallel": cores, "wall_s": wall,
            "cpu_s": cpu, "designs_per_s": len(files) / wall, "cpu_per_design_s": cpu / len(files)}


# --- measuring in process --------------------------------------------------------------------

#: What every ``packwarden check`` process must do before it reads a design, each step including
#: the ones before: start the interpreter; import the libraries a plain check is built on (pyyaml,
#: pydantic-core, pydantic's package without its models); make the validators of the design and
#: part-library schema as a plain check makes them (the quick way, ``packwarden.quick``: the
#: schema's classes without pydantic, compiled from the core schemas kept by the warm-up run).
#: The last step, beside it, is the same with pydantic's own models, as every other command and a
#: check that needs them (a team's rules) make them.
STARTUP_STEPS = {
    "interpreter": "pass",
    "libraries": "import gc; gc.disable(); import yaml, pydantic_core, pydantic",
    "schema": "import gc; gc.disable(); import yaml; "
              "from packwarden.checking import start; start(); "
              "from packwarden.schemacache import go_quick, validator; assert go_quick(); "
              "from packwarden.schema import Design, PartLibrary; "
              "validator(Design); validator(PartLibrary)",
    "schema, full way": "import gc, os; gc.disable(); "
              "os.environ['PYDANTIC_DISABLE_PLUGINS'] = '__all__'; "
              "import yaml; from pydantic import BaseModel; "
              "from packwarden.schema import Design, PartLibrary; "
              "from packwarden.schemacache import validator; "
              "validator(Design); validator(PartLibrary)",
}


def time_startup(env: dict, into: dict[str, list[float]]) -> None:
    """One wall time per step of :data:`STARTUP_STEPS`, each a process of its own, added to
    ``into``. Called between the cold lints of the single-cell design, so that a machine that
    speeds up or slows down during the run weighs on the floor and the lint alike."""
    for step, code in STARTUP_STEPS.items():
        into.setdefault(step, []).append(timed([sys.executable, "-c", code], env, ok=(0,)))


def compose_floor(files: list[Path], runs: int) -> dict:
    """libyaml's parse alone: read each file and compose its node tree, on one core."""
    import yaml
    best = None
    for _ in range(runs):
        t0 = time.perf_counter()
        for f in files:
            yaml.compose(f.read_text(encoding="utf-8"), Loader=yaml.CSafeLoader)
        elapsed = time.perf_counter() - t0
        best = elapsed if best is None else min(best, elapsed)
    return {"designs": len(files), "total_s": best, "per_design_s": best / len(files),
            "runs": runs, "loader": "yaml.CSafeLoader"}


#: A child that composes the files named on its stdin, one a line, and prints the CPU time the
#: loop took (its start-up not counted, as the in-process floor counts none).
_COMPOSE_CHILD = ("import sys, time, yaml\n"
                  "names = sys.stdin.read().splitlines()\n"
                  "t0 = time.process_time()\n"
                  "for n in names:\n"
                  "    with open(n, encoding='utf-8') as f:\n"
                  "        yaml.compose(f.read(), Loader=yaml.CSafeLoader)\n"
                  "print(time.process_time() - t0)\n")


def compose_floor_layout(files: list[Path], processes: int, runs: int, env: dict) -> dict:
    """The same floor in the batch's layout: the files split among ``processes`` processes
    that parse at once, CPU per design summed over them. On a machine whose processors slow each
    other down when all are busy (shared caches, a host's sibling threads), this is the floor a
    batch on every processor is up against; printed beside the one-core floor, for reading the
    batch's ratio, not judged."""
    share = -(-len(files) // processes)
    parts = [files[i:i + share] for i in range(0, len(files), share)]
    best = None
    for _ in range(runs):
        children = [subprocess.Popen([sys.executable, "-c", _COMPOSE_CHILD], env=env,
                                     stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True)
                    for _ in parts]
        for child, part in zip(children, parts):
            child.stdin.write("".join(f"{f}\n" for f in part))
            child.stdin.close()
        cpu = sum(float(child.stdout.read()) for child in children)
        for child in children:
            child.wait()
        best = cpu if best is None else min(best, cpu)
    return {"designs": len(files), "processes": len(parts), "cpu_s": best,
            "per_design_s": best / len(files), "runs": runs, "loader": "yaml.CSafeLoader"}


def in_process_session():
    from packwarden.engine import Session, load_registry
    return Session(registry=load_registry())


STAGES = ("load", "validate", "libraries", "netlist", "model", "rules")


def stages(files: dict[str, list[Path]], count: int) -> dict:
    """Where a design's time goes, in process on one core: per kind, the time per design of each
    stage of the lint beside the floor (reading the file and libyaml's compose of it), over the
    first ``count`` designs of the kind with the libraries already read, as in a batch. ``model``
    is the figures every lint reports; ``rules`` the checks, with the model queries only they
    make."""
    import yaml

    from packwarden.engine import lint_file
    session = in_process_session()
    out = {}
    for kind in ("single", "pack4s2p", "large"):
        chosen = files[kind][:count]
        lint_file(session, chosen[0], str(chosen[0]))  # libraries and first-use set-up
        floor = 0.0
        timings: dict[str, float] = {}
        for f in chosen:
            t0 = time.perf_counter()
            yaml.compose(f.read_text(encoding="utf-8"), Loader=yaml.CSafeLoader)
            floor += time.perf_counter() - t0
            lint_file(session, f, str(f), timings)
        per = {stage: timings.get(stage, 0.0) / len(chosen) for stage in STAGES}
        total = sum(per.values())
        out[kind] = {"designs": len(chosen), "floor_s": floor / len(chosen), "stages_s": per,
                     "lint_s": total, "ratio": total / (floor / len(chosen))}
    return out


def editor_relint(files: dict[str, Path], runs: int) -> dict:
    """Per kind, the language server's re-lint after an edit, in process and warm (rules loaded,
    libraries read by the first lint): median of ``runs`` edits, each a different text (a
    comment line added), linted from the text as the server does. The server keeps nothing per
    text, so any edit costs a full lint."""
    from packwarden.lsp.live import LiveLinter, absolute
    out = {}
    for kind, f in files.items():
        live = LiveLinter()
        text = f.read_text(encoding="utf-8")
        live.lint_design(f, text)
        times = []
        for i in range(runs):
            edited = f"{text}# edit {i}\n"
            t0 = time.perf_counter()
            notes = live.lint_design(f, edited)
            times.append(time.perf_counter() - t0)
        if any(n.code == "input-error" or n.code is None for n in notes):
            raise RuntimeError(f"{f}: {notes}")
        out[kind] = {"components": live.designs[absolute(f)].result.figures["component_count"].value,
                     **_stats(times)}
    return out


def editor_round_trip(trips: int) -> dict:
    """Over stdio, as an editor sees it: ``packwarden lsp`` with the flawed example whose FET
    blocks too little open; the time from an edit fixing it to the diagnostics without the
    finding, and from the edit back to the diagnostics with it (each includes the 300 ms
    debounce). Needs pygls (the ``lsp`` extra)."""
    try:
        from lsprotocol import types
        from pygls.lsp.client import LanguageClient
    except ImportError:
        return {"available": False, "reason": "pygls is not installed (pip install '.[lsp]')"}
    import asyncio
    design = EXAMPLES / "flawed" / "fet-voltage-too-low.yaml"
    flawed = design.read_text(encoding="utf-8")
    fixed = flawed.replace("open_circuit_max: 24 V", "open_circuit_max: 5.5 V")
    assert fixed != flawed

    async def run() -> dict:
        client = LanguageClient("packwarden-bench", "1")
        published: asyncio.Queue = asyncio.Queue()
        uri = design.resolve().as_uri()

        @client.feature(types.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS)
        def _(params: types.PublishDiagnosticsParams) -> None:
            if params.uri == uri:
                published.put_nowait((time.perf_counter(), params.diagnostics))

        async def flagged(want: bool) -> float:
            while True:
                at, diagnostics = await asyncio.wait_for(published.get(), 30)
                if any(d.code == "switch-voltage-margin" for d in diagnostics) == want:
                    return at

        await client.start_io(sys.executable, "-m", "packwarden.cli", "lsp", cwd=str(REPO))
        await client.initialize_async(types.InitializeParams(
            capabilities=types.ClientCapabilities()))
        client.initialized(types.InitializedParams())
        t0 = time.perf_counter()
        client.text_document_did_open(types.DidOpenTextDocumentParams(
            text_document=types.TextDocumentItem(uri=uri, language_id="yaml", version=1,
                                                 text=flawed)))
        first = await flagged(True) - t0
        cleared, flagged_again = [], []
        version = 1
        for _ in range(trips):
            for text, want, into in ((fixed, False, cleared), (flawed, True, flagged_again)):
                version += 1
                t0 = time.perf_counter()
                client.text_document_did_change(types.DidChangeTextDocumentParams(
                    text_document=types.VersionedTextDocumentIdentifier(uri=uri, version=version),
                    content_changes=[types.TextDocumentContentChangeWholeDocument(text=text)]))
                into.append(await flagged(want) - t0)
        await client.shutdown_async(None)
        client.exit(None)
        await client.stop()
        return {"available": True, "design": design.name, "debounce_s": 0.3,
                "first_lint_s": first, "fix_cleared": _stats(cleared),
                "flaw_flagged": _stats(flagged_again)}

    return asyncio.run(run())


def fit_pack(files: list[Path], env: dict, runs: int) -> dict:
    """CPU (and wall) time of ``packwarden check`` of the largest scaling pack up to
    :data:`TARGET_FIT_PACK`'s size, hints fitted within the design's budget of re-lints, median
    of ``runs`` processes."""
    sized = {int(f.stem.split("-")[-1]): f for f in files}
    size = max((n for n in sized if n <= TARGET_FIT_PACK["components"]), default=None)
    if size is None:
        return {"components": None}
    times = [timed_cpu(packwarden_cmd() + ["check", str(sized[size])], env) for _ in range(runs)]
    return {"components": size, "cpu_s": statistics.median(c for _, c in times),
            "wall_s": statistics.median(w for w, _ in times), "runs": runs}


def scaling(files: list[Path], runs: int) -> dict:
    """Per design of the series: in-process lint with the part library already read (as in a
    batch), median of ``runs``, and libyaml's compose of the same file.

    The series' packs have findings, and a finding may fit its hint by linting the design again
    (``pipeline.fit_budget``): a design of up to 60 components searches in full, a larger one
    within a budget that falls with its size. That cost is not the model's and does not scale
    with the components, so the target is judged on the lint with the searches off
    (``lint_s``); the lint as ``check`` runs it, searches and all, is given beside it
    (``lint_with_hints_s``, one run) and the searches' cost on a large pack is a target of its
    own (``fit_pack``)."""
    import yaml

    from packwarden.engine import lint_file
    from packwarden.pipeline import hints_unsearched
    session = in_process_session()
    points = []
    for f in files:
        lint_file(session, f, str(f))  # reads the library into the session, as a batch would
        t0 = time.perf_counter()
        lint_file(session, f, str(f))
        with_hints = time.perf_counter() - t0
        times = []
        result = None
        for _ in range(runs):
            t0 = time.perf_counter()
            with hints_unsearched():
                result = lint_file(session, f, str(f))
            times.append(time.perf_counter() - t0)
        if result.errors or result.internal:
            raise RuntimeError(f"{f}: {[str(e) for e in result.errors]} {result.internal}")
        t0 = time.perf_counter()
        yaml.compose(f.read_text(encoding="utf-8"), Loader=yaml.CSafeLoader)
        parse = time.perf_counter() - t0
        shape = {k: result.figures[k].value if k in result.figures else None
                 for k in ("component_count", "series", "parallel")}
        points.append({"components": shape["component_count"],
                       "series": shape["series"],
                       "parallel": shape["parallel"],
                       "lint_s": statistics.median(times), "compose_s": parse,
                       "lint_with_hints_s": with_hints,
                       "lint_per_component_s": statistics.median(times) /
                       shape["component_count"]})
    ratios = []
    by_n = {p["components"]: p for p in points}
    for n, p in by_n.items():
        q = by_n.get(n * 10)
        if q is not None:
            ratios.append({"from": n, "to": n * 10, "time_ratio": q["lint_s"] / p["lint_s"]})
    return {"points": points, "decade_ratios": ratios,
            "worst_decade_ratio": max((r["time_ratio"] for r in ratios), default=None)}


def monte_carlo(files: dict[str, Path], samples: int, runs: int) -> dict:
    from packwarden.engine import lint_file
    from packwarden.model.yield_ import run_yield
    session = in_process_session()
    out = {}
    for kind, f in files.items():
        d = lint_file(session, f, str(f))
        if d.model is None:
            raise RuntimeError(f"{f}: no model for the yield run")
        run_yield(d.model, min(samples, 1000))  # numpy's imports and first calls, not the run
        times = []
        for _ in range(runs):
            t0 = time.perf_counter()
            run_yield(d.model, samples)
            times.append(time.perf_counter() - t0)
        out[kind] = {"samples": samples, "median_s": statistics.median(times), "runs": runs,
                     "components": d.figures["component_count"].value}
    return out


# --- the report ------------------------------------------------------------------------------

def verdict(ok: bool | None) -> str:
    return "n/a" if ok is None else "PASS" if ok else "MISS"


def targets(res: dict) -> list[tuple[str, str, str]]:
    rows = []
    floor = res["floor"]["batch_compose"]["per_design_s"]
    b = res["batch"]
    ratio_cpu = b["cpu_per_design_s"] / floor
    ratio_wall = b["wall_per_design_s"] / (floor / b["jobs"])
    rows.append(("batch lint <= 3x libyaml parse floor per design",
                 f"CPU {b['cpu_per_design_s'] * 1e3:.2f} ms vs {floor * 1e3:.3f} ms = {ratio_cpu:.1f}x"
                 f" (wall on {b['jobs']} cores vs floor on {b['jobs']}: {ratio_wall:.1f}x)",
                 verdict(ratio_cpu <= TARGET_FLOOR_RATIO)))
    layout = res["floor"].get("batch_compose_layout")
    beside = "" if layout is None else (
        f" (the floor on {layout['processes']} processes at once, as the batch runs: "
        f"{layout['per_design_s'] * 1e3:.3f} ms, "
        f"{b['cpu_per_design_s'] / layout['per_design_s']:.1f}x; not judged)")
    rows.append((f"batch lint <= {TARGET_FLOOR_RATIO_EVENTS:g}x libyaml parse floor (issue 19)",
                 f"CPU {ratio_cpu:.1f}x the floor per design{beside}",
                 verdict(ratio_cpu <= TARGET_FLOOR_RATIO_EVENTS)))
    lint_single = res["cold"]["single"]["cached"]["median_s"]
    yl = res.get("yamllint", {}).get("single", {}).get("single")
    if yl is None:
        rows.append((f"cold lint <= {TARGET_YAMLLINT_RATIO:g}x yamllint (single)",
                     res.get("yamllint", {}).get("reason") or "yamllint not available", "n/a"))
    elif "yamllint" in res.get("regular", {}).get("single", {}):
        rows.append(regular_row(res["regular"]["single"], lint_single / yl["median_s"]))
    else:
        ratio = lint_single / yl["median_s"]
        rows.append((f"cold lint <= {TARGET_YAMLLINT_RATIO:g}x yamllint (single)",
                     f"{lint_single:.3f} s vs yamllint {yl['median_s']:.3f} s = {ratio:.2f}x "
                     f"(interleaved, median of {yl['runs']})",
                     verdict(ratio <= TARGET_YAMLLINT_RATIO)))
    for kind, limit in TARGET_RELINT.items():
        e = res["editor"]["relint"][kind]
        rows.append((f"editor: warm re-lint < {limit * 1e3:g} ms ({kind})",
                     f"{e['median_s'] * 1e3:.2f} ms ({e['components']} components, median of "
                     f"{e['runs']})", verdict(e["median_s"] < limit)))
    peer = res.get("peer", {})
    for kind, c in res["cold"].items():
        p = peer.get("single", {}).get(kind)
        if p is None:
            rows.append((f"file lint faster than peer ({kind})", "peer not available", "n/a"))
        else:
            rows.append((f"file lint faster than peer ({kind})",
                         f"{c['cached']['median_s']:.3f} s vs check-jsonschema "
                         f"{p['median_s']:.3f} s", verdict(c["cached"]["median_s"] < p["median_s"])))
    floor_schema = res["startup_floor"]["schema"]["median_s"]
    for kind, c in res["cold"].items():
        rows.append((f"cold single-file lint < 0.3 s ({kind})",
                     f"{c['cached']['median_s']:.3f} s cached bytecode "
                     f"({c['uncached']['median_s']:.3f} s without any cache; start-up floor "
                     f"{floor_schema:.3f} s)",
                     verdict(c["cached"]["median_s"] < TARGET_COLD)))
    s = res["scaling"]
    worst = s["worst_decade_ratio"]
    pairs = ", ".join(f"{r['from']}->{r['to']}: {r['time_ratio']:.1f}x" for r in s["decade_ratios"])
    rows.append(("10x components <= 12x time", pairs or "no decade in the series",
                 verdict(None if worst is None else worst <= TARGET_SCALING)))
    fp = res.get("fit_pack", {})
    if fp.get("components") == TARGET_FIT_PACK["components"]:
        rows.append((f"check of the {fp['components']}-component pack <= "
                     f"{TARGET_FIT_PACK['cpu_s']:g} s CPU, hints fitted (issue 18)",
                     f"{fp['cpu_s']:.3f} s CPU ({fp['wall_s']:.3f} s wall), median of {fp['runs']}",
                     verdict(fp["cpu_s"] <= TARGET_FIT_PACK["cpu_s"])))
    elif fp.get("components"):
        rows.append((f"check of the {TARGET_FIT_PACK['components']}-component pack <= "
                     f"{TARGET_FIT_PACK['cpu_s']:g} s CPU, hints fitted (issue 18)",
                     f"not in this corpus; {fp['components']} components: {fp['cpu_s']:.3f} s CPU",
                     "n/a"))
    mem = b.get("peak_tree_rss_mb", b["max_single_process_rss_mb"])
    rows.append((f"peak memory < 150 MB ({b['designs']} designs)",
                 f"{mem:.0f} MB RSS of the process tree"
                 + (f" (PSS {b['peak_tree_pss_mb']:.0f} MB)" if "peak_tree_pss_mb" in b else ""),
                 verdict(mem < TARGET_MEMORY)))
    trip = res["editor"]["round_trip"]
    if trip["available"]:
        worst = max(trip["fix_cleared"]["median_s"], trip["flaw_flagged"]["median_s"])
        rows.append(("editor: an edit's diagnostics < 1 s (stdio)",
                     f"fix cleared in {trip['fix_cleared']['median_s']:.3f} s, flaw back in "
                     f"{trip['flaw_flagged']['median_s']:.3f} s (300 ms of it debounce)",
                     verdict(worst < TARGET_EDITOR)))
    else:
        rows.append(("editor: an edit's diagnostics < 1 s (stdio)", trip["reason"], "n/a"))
    for kind, m in res["monte_carlo"].items():
        scaled = m["median_s"] * 100_000 / m["samples"]
        target = TARGET_MONTE_CARLO.get(kind)
        rows.append((f"100 000 Monte Carlo samples"
                     + (f" < {target:g} s" if target else "") + f" ({kind})",
                     f"{m['median_s']:.3f} s for {m['samples']:,}"
                     + (f" (~{scaled:.2f} s per 100 000)" if m["samples"] != 100_000 else ""),
                     verdict(scaled < target if target else None)))
    return rows


def regular_row(regular: dict, editable_ratio: float) -> tuple[str, str, str]:
    """The cold-lint target from the regular install (as a user has packwarden), both commands
    started alike; the editable install's ratio beside it."""
    lint, peer = regular["packwarden"], regular["yamllint"]
    ratio = lint["median_s"] / peer["median_s"]
    cpu_ratio = lint["cpu"]["median_s"] / peer["cpu"]["median_s"]
    return (f"cold lint <= {TARGET_YAMLLINT_RATIO:g}x yamllint (single, regular install)",
            f"{lint['median_s']:.3f} s vs yamllint {peer['median_s']:.3f} s = {ratio:.2f}x, CPU "
            f"{cpu_ratio:.2f}x (interleaved, median of {peer['runs']}; editable install "
            f"{editable_ratio:.2f}x)", verdict(ratio <= TARGET_YAMLLINT_RATIO))


def print_report(res: dict) -> None:
    print()
    print(f"packwarden benchmark ({res['machine']['cpus']} CPUs, Python "
          f"{res['machine']['python']}; corpus of {res['corpus']['batch_designs']:,} designs)")
    print("Measured processes run with bytecode caching on (PYTHONDONTWRITEBYTECODE unset, after "
          "a warm-up run); figures without any bytecode cache are given beside them.")
    print()
    print(f"{'measure':<44} {'figure':>14}")
    for kind, c in res["cold"].items():
        print(f"{'cold lint, ' + kind + ' (median, cached)':<44} {c['cached']['median_s']:>12.3f} s"
              f"   ({c['components']} components; no cache {c['uncached']['median_s']:.3f} s)")
    for kind, p in res.get("peer", {}).get("single", {}).items():
        print(f"{'check-jsonschema, ' + kind + ' (median)':<44} {p['median_s']:>12.3f} s")
    for kind, p in res.get("yamllint", {}).get("single", {}).items():
        print(f"{'yamllint, ' + kind + ' (median)':<44} {p['median_s']:>12.3f} s")
    for name, r in res.get("regular", {}).get("single", {}).items():
        print(f"{name + ', single, regular install (median)':<44} {r['median_s']:>12.3f} s"
              f"   (CPU {r['cpu']['median_s']:.3f} s)")
    for step, t in res["startup_floor"].items():
        print(f"{'start-up floor: ' + step + ' (median)':<44} {t['median_s']:>12.3f} s")
    for kind, f in res["floor"]["single"].items():
        print(f"{'libyaml compose, ' + kind:<44} {f * 1e3:>11.3f} ms")
    b = res["batch"]
    print(f"{'batch lint, ' + format(b['designs'], ',') + ' designs':<44} "
          f"{b['designs_per_s']:>10.0f} /s   ({b['wall_s']:.1f} s wall, {b['jobs']} jobs, "
          f"{b['cpu_per_design_s'] * 1e3:.2f} ms CPU per design)")
    fb = res["floor"]["batch_compose"]
    print(f"{'libyaml compose, same designs (1 core)':<44} {1 / fb['per_design_s']:>10.0f} /s   "
          f"({fb['per_design_s'] * 1e3:.3f} ms per design)")
    fl = res["floor"].get("batch_compose_layout")
    if fl:
        print(f"{'libyaml compose, same designs (' + str(fl['processes']) + ' at once)':<44} "
              f"{fl['per_design_s'] * 1e3:>11.3f} ms CPU per design")
    pb = res.get("peer", {}).get("batch")
    if pb:
        print(f"{'check-jsonschema, same designs':<44} {pb['designs_per_s']:>10.0f} /s   "
              f"({pb['wall_s']:.1f} s wall, {pb['parallel']} at a time)")
    if "peak_tree_rss_mb" in b:
        print(f"{'peak memory of the batch (tree RSS)':<44} {b['peak_tree_rss_mb']:>11.0f} MB  "
              f"(PSS {b['peak_tree_pss_mb']:.0f} MB, {b['processes']} processes)")
    st = res["stages"]
    print(f"{'per design, in process (ms)':<32} {'floor':>6} " + " ".join(f"{x:>9}" for x in STAGES)
          + f" {'lint':>6} {'ratio':>6}")
    for kind, k in st.items():
        print(f"{kind:<32} {k['floor_s'] * 1e3:>6.2f} "
              + " ".join(f"{k['stages_s'][x] * 1e3:>9.2f}" for x in STAGES)
              + f" {k['lint_s'] * 1e3:>6.2f} {k['ratio']:>5.1f}x")
    print(f"{'scaling: components':<30} {'lint/design':>12} {'per component':>14} {'compose':>10}"
          f" {'with hint searches':>20}")
    for p in res["scaling"]["points"]:
        print(f"{p['components']:>30} {p['lint_s'] * 1e3:>10.1f} ms {p['lint_per_component_s'] * 1e6:>11.1f} µs"
              f" {p['compose_s'] * 1e3:>8.2f} ms {p.get('lint_with_hints_s', 0.0) * 1e3:>17.1f} ms")
    for kind, e in res["editor"]["relint"].items():
        print(f"{'editor: warm re-lint after an edit, ' + kind:<44} {e['median_s'] * 1e3:>11.2f} ms"
              f"  ({e['components']} components, median of {e['runs']})")
    trip = res["editor"]["round_trip"]
    if trip["available"]:
        print(f"{'editor over stdio: edit to cleared finding':<44} "
              f"{trip['fix_cleared']['median_s'] * 1e3:>11.0f} ms  (of it 300 ms debounce; "
              f"first lint after opening {trip['first_lint_s'] * 1e3:.0f} ms)")
    for kind, m in res["monte_carlo"].items():
        print(f"{'Monte Carlo ' + format(m['samples'], ',') + ' samples, ' + kind:<44} "
              f"{m['median_s']:>12.3f} s")
    print()
    print(f"{'target':<52} {'verdict':<7} measured")
    for name, figure, v in res["targets"]:
        print(f"{name:<52} {v:<7} {figure}")


# --- main ------------------------------------------------------------------------------------

def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--tiny", action="store_true", help="a tiny corpus, quickly (for the test)")
    ap.add_argument("--out", type=Path, default=REPO / "bench" / "out" / "results.json",
                    help="write the JSON results here")
    ap.add_argument("--jobs", type=int, default=os.cpu_count() or 1,
                    help="workers for the batch lint (default: every CPU)")
    ap.add_argument("--keep", type=Path, default=None,
                    help="write the corpus into this folder and keep it")
    ap.add_argument("--no-install", action="store_true",
                    help="do not install the peers (check-jsonschema, yamllint) when missing")
    args = ap.parse_args(argv)
    cfg = TINY if args.tiny else FULL
    cores = os.cpu_count() or 1

    tmp = Path(tempfile.mkdtemp(prefix="packwarden-bench-"))
    root = args.keep or tmp / "corpus"
    if args.keep and root.exists():
        shutil.rmtree(root)
    try:
        return _run(args, cfg, cores, tmp, root)
    finally:
        shutil.rmtree(tmp, ignore_errors=True)


def _run(args, cfg: dict, cores: int, tmp: Path, root: Path) -> int:
    t_start = time.perf_counter()
    print(f"writing the corpus to {root} ...", flush=True)
    files = make_corpus(root, cfg)
    batch_files = files["single"] + files["pack4s2p"] + files["large"]
    samples = {"single": files["single"][0], "pack4s2p": files["pack4s2p"][0],
               "large": files["large"][0]}
    res: dict = {
        "machine": {"cpus": cores, "python": platform.python_version(),
                    "platform": platform.platform(), "tiny": args.tiny},
        "bytecode": {"measured": "cached (PYTHONDONTWRITEBYTECODE unset, after a warm-up run)",
                     "also": "uncached: PYTHONDONTWRITEBYTECODE=1 with an empty "
                             "PYTHONPYCACHEPREFIX, every module compiled, and "
                             "PACKWARDEN_CACHE_DIR='' (entry points not cached)"},
        "corpus": {kind: len(v) for kind, v in files.items()},
    }
    res["corpus"]["batch_designs"] = len(batch_files)
    env = cached_env()
    pw = packwarden_cmd()
    peer, why = ensure_peer(not args.no_install)
    yamllint, yamllint_why = ensure_peer(not args.no_install, "yamllint")

    # A development checkout is an editable install, whose start carries the editable finder: the
    # cold lint and yamllint are then also timed from a regular install, as a user has it.
    regular, regular_why = None, "packwarden here is a regular install: the figures above are its"
    if editable_install():
        print("a regular (non-editable) install for the cold lint ...", flush=True)
        regular, regular_why = regular_install(tmp)
    res["regular"] = {"editable_here": editable_install(), "available": regular is not None,
                      "reason": regular_why, "single": {}}

    print("warm-up runs (writing bytecode caches) ...", flush=True)
    for name, cmd in (regular or {}).items():
        timed(cmd + regular_args(name, samples["single"]), env)
    for f in samples.values():
        timed(pw + ["check", str(f)], env)
        if peer:
            timed(peer_args(peer) + [str(f)], env)
        if yamllint:
            timed(yamllint + [str(f)], env)

    import yaml
    print("cold single-file lint, the peer on the same file, the start-up floor ...", flush=True)
    startup: dict[str, list[float]] = {}
    nocache = tmp / "no-pycache"
    res["cold"] = {}
    res["peer"] = {"available": peer is not None, "command": "check-jsonschema --schemafile "
                   "schemas/design.schema.json FILE...", "reason": why}
    if peer:
        res["peer"]["single"] = {}
    # yamllint with its default rules, as a pre-commit hook runs it (its findings, exit 1, are
    # the long lines and missing document starts of the designs: a lint, not a failure).
    res["yamllint"] = {"available": yamllint is not None, "command": "yamllint FILE",
                       "reason": yamllint_why, "single": {}}
    for kind, f in samples.items():
        comps = len(yaml.safe_load(f.read_text(encoding="utf-8"))["components"])
        # The lint and the peer take turns, so a machine that speeds up or slows down during the
        # run (a shared or virtual one does) weighs on both alike.
        lint_times, peer_times, yamllint_times = [], [], []
        regular_times: dict[str, list[tuple[float, float]]] = {}
        for _ in range(cfg["cold_runs"]):
            lint_times.append(timed(pw + ["check", str(f)], env))
            if peer:
                peer_times.append(timed(peer_args(peer) + [str(f)], env))
            if yamllint:
                yamllint_times.append(timed(yamllint + [str(f)], env))
            if kind == "single":
                time_startup(env, startup)
                for name, cmd in (regular or {}).items():
                    regular_times.setdefault(name, []).append(
                        timed_cpu(cmd + regular_args(name, f), env))
        nocache.mkdir(exist_ok=True)
        res["cold"][kind] = {
            "file": f.name, "components": comps, "cached": _stats(lint_times),
            "uncached": median_of(max(1, cfg["cold_runs"] // 3), pw + ["check", str(f)],
                                  uncached_env(nocache)),
        }
        shutil.rmtree(nocache, ignore_errors=True)
        if peer:
            res["peer"]["single"][kind] = _stats(peer_times)
        if yamllint:
            res["yamllint"]["single"][kind] = _stats(yamllint_times)
        for name, runs in regular_times.items():
            res["regular"]["single"][name] = {**_stats([w for w, _ in runs]),
                                              "cpu": _stats([c for _, c in runs])}

    res["startup_floor"] = {step: _stats(t) for step, t in startup.items()}

    print("floor: libyaml compose ...", flush=True)
    res["floor"] = {"single": {}}
    for kind, f in samples.items():
        text = f.read_text(encoding="utf-8")
        t0 = time.perf_counter()
        for _ in range(20):
            yaml.compose(text, Loader=yaml.CSafeLoader)
        res["floor"]["single"][kind] = (time.perf_counter() - t0) / 20
    res["floor"]["batch_compose"] = compose_floor(batch_files, cfg["floor_runs"])
    if args.jobs > 1:
        res["floor"]["batch_compose_layout"] = compose_floor_layout(
            batch_files, args.jobs, cfg["floor_runs"], env)

    print(f"batch lint of {len(batch_files):,} designs, {args.jobs} jobs ...", flush=True)
    res["batch"] = run_batch(root / "batch", args.jobs, env, len(batch_files))
    if peer:
        print("peer: check-jsonschema over the batch ...", flush=True)
        res["peer"]["batch"] = peer_batch(peer, batch_files, env, cores)

    print("where the time goes, per stage ...", flush=True)
    res["stages"] = stages(files, cfg["stage_designs"])

    print("editor: re-lint after an edit, in process and over stdio ...", flush=True)
    res["editor"] = {"relint": editor_relint(samples, cfg["editor_runs"]),
                     "round_trip": editor_round_trip(cfg["editor_trips"])}

    print("scaling series ...", flush=True)
    res["scaling"] = scaling(files["scaling"], cfg["scaling_runs"])
    res["fit_pack"] = fit_pack(files["scaling"], env, cfg["scaling_runs"])

    print(f"Monte Carlo yield, {cfg['mc_samples']:,} samples ...", flush=True)
    # The example with the shunt between B- and the FET sources, the layout most multi-cell
    # packs use, beside the corpus' own designs.
    mc_files = dict(samples, lowside=REPO / "example_designs/ridgeline-blower-4s2p-lowside.yaml")
    res["monte_carlo"] = monte_carlo(mc_files, cfg["mc_samples"], cfg["mc_runs"])
    res["monte_carlo_process"] = {}
    for kind in ("single", "pack4s2p"):
        res["monte_carlo_process"][kind] = median_of(
            1, pw + ["check", "--yield", str(cfg["mc_samples"]), str(samples[kind])], env)

    res["targets"] = targets(res)
    res["elapsed_s"] = time.perf_counter() - t_start
    args.out.parent.mkdir(parents=True, exist_ok=True)
    args.out.write_text(json.dumps(res, indent=2, ensure_ascii=False) + "\n", encoding="utf-8")
    print_report(res)
    print(f"\nresults: {args.out} ({res['elapsed_s']:.0f} s)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
