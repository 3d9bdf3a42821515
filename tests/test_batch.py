"""A batch of 1 000 designs, one in ten broken: nothing is lost and the summary counts both.

The good designs are the Orchard example with its name and load varied; the broken ones carry ten
kinds of damage, ten of each. All sit in one folder, found the way CI finds them (a folder named on
the command line); each broken file keeps its ``format: packwarden/1`` line, so it is a design
that could not be read rather than a file that is not a design.
"""

from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import pytest

from packwarden.engine import lint, load_registry
from packwarden.report import RenderOptions, formatter

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = (REPO / "example_designs" / "orchard-probe.yaml").read_text(encoding="utf-8")
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"
TOTAL, EVERY = 1000, 10


def _sub(old: str, new: str):
    def damage(text: str) -> str:
        assert text.count(old) == 1, old
        return text.replace(old, new)
    return damage


# Ten kinds of damage, each with the start of the message it must produce.
DAMAGE = [
    (_sub("pack:\n  ambient: {min: -20 °C, max: 55 °C}", "pack:\n  ambient: {min: -20 °C, max: 55 °C"),
     "YAML syntax error"),
    (_sub("  continuous: 1.2 A", "\tcontinuous: 1.2 A"), "a tab character cannot indent YAML"),
    (_sub("load:\n", "lod:\n"), "unknown key 'lod'"),
    (_sub("  current: 0.8 A", "  current: 0.8"), "charger.current: missing unit: write '0.8 A'"),
    (_sub("  C1: {part: CAP-100N", "  R1: {part: CAP-100N"), "duplicate key 'R1'"),
    (_sub("revision: C}", "revision: C\udcff}"), "invalid UTF-8 byte 0xff"),
    (_sub("libraries: [parts/orchard-parts.yaml]", "libraries: [../../../../etc/parts.yaml]"),
     "library path '../../../../etc/parts.yaml' escapes the repository"),
    (_sub("  current: 0.8 A", "  current: 0.8 V"), "charger.current: '0.8 V' is in volts"),
    (_sub("  current: 0.8 A", "  current: &c 0.8 A\n  open_circuit_max_copy: *c"),
     "alias '*c' is not allowed"),
    (_sub("  continuous: 1.2 A", "  continuous: .nan"), "'.nan' is not a finite number"),
]


@pytest.fixture(scope="module")
def batch(tmp_path_factory: pytest.TempPathFactory) -> dict:
    root = tmp_path_factory.mktemp("batch")
    (root / ".git").mkdir()
    designs = root / "designs"
    (designs / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, designs / "parts" / "orchard-parts.yaml")
    good: dict[str, str] = {}
    broken: dict[str, str] = {}
    for i in range(TOTAL):
        path = designs / f"pack-{i:04d}.yaml"
        if i % EVERY == EVERY - 1:
            damage, message = DAMAGE[(i // EVERY) % len(DAMAGE)]
            text = damage(EXAMPLE)
            path.write_bytes(text.encode("utf-8", errors="surrogateescape"))
            broken[str(path)] = message
        else:
            load = 0.5 + (i % 9) / 10  # 0.5 .. 1.3 A, all below the 1.62 A trip minimum
            text = (EXAMPLE.replace("name: Orchard soil probe,", f"name: Probe {i:04d},")
                    .replace("  continuous: 1.2 A", f"  continuous: {load:.1f} A"))
            path.write_text(text, encoding="utf-8")
            good[str(path)] = f"Probe {i:04d}"
    run = lint([str(designs)], registry=load_registry())
    return {"run": run, "good": good, "broken": broken, "root": root}


def test_the_batch_holds_what_the_brief_asks(batch: dict) -> None:
    assert len(batch["good"]) == 900 and len(batch["broken"]) == 100
    # every kind of damage is there ten times
    counts: dict[str, int] = {}
    for message in batch["broken"].values():
        counts[message] = counts.get(message, 0) + 1
    assert sorted(counts.values()) == [10] * 10


def test_every_good_design_is_linted_and_reported(batch: dict) -> None:
    run = batch["run"]
    by_file = {d.file: d for d in run.designs}
    assert len(run.designs) == TOTAL and set(by_file) == set(batch["good"]) | set(batch["broken"])
    for file, name in batch["good"].items():
        d = by_file[file]
        assert d.errors == [] and d.internal == [], file
        assert d.name == name and d.figures["component_count"].value == 8, file
        assert d.skipped == [], file  # every rule ran: the netlist is clean


def test_every_broken_design_has_its_message(batch: dict) -> None:
    by_file = {d.file: d for d in batch["run"].designs}
    for file, message in batch["broken"].items():
        d = by_file[file]
        assert d.errors, f"{file}: no message"
        assert d.findings == [] and d.internal == []
        shown = [str(e) for e in d.errors]
        assert any(message in s for s in shown), (file, shown)
        assert all(re.match(re.escape(file) + r":\d+:\d+: ", s) for s in shown), shown


def test_the_text_summary_counts_both(batch: dict) -> None:
    run = batch["run"]
    out = formatter("text")(run, RenderOptions())
    summary = out.rstrip("\n").splitlines()[-2]
    assert summary.startswith("900 design(s) linted, 100 could not be read; ")
    errors = [ln for ln in out.splitlines()
              if re.match(r"^\S+\.yaml:\d+:\d+: ", ln) and " error " not in ln]
    assert sorted({ln.split(":", 1)[0] for ln in errors}) == sorted(batch["broken"])
    assert run.exit_code() == 2


def test_the_json_report_counts_both(batch: dict) -> None:
    data = json.loads(formatter("json")(batch["run"], RenderOptions()))
    assert len(data["designs"]) == TOTAL
    assert {e["file"] for e in data["errors"]} == set(batch["broken"])
    assert all(e["line"] >= 1 and e["column"] >= 1 for e in data["errors"])
    good = [d for d in data["designs"] if d["file"] in batch["good"]]
    assert len(good) == 900 and all(d["figures"]["trip_current_max"] > 0 for d in good)
    assert data["exit_code"] == 2


def test_events_are_kept_only_when_asked_for():
    # A batch in a format that prints no events need not hold them (memory of a 10 000-design
    # run); the JSON report asks for them, in one process or in workers alike.
    examples = str(Path(__file__).resolve().parents[1] / "example_designs")
    kept = lint([examples], jobs=1)
    dropped = lint([examples], jobs=1, keep_events=False)
    assert all(d.events for d in kept.designs if d.linted)
    assert not any(d.events for d in dropped.designs)
    assert [d.figures for d in kept.designs] == [d.figures for d in dropped.designs]
    from packwarden.report import formatter
    assert getattr(formatter("json"), "needs_events", False)
    assert not getattr(formatter("text"), "needs_events", False)
