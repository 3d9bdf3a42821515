"""A batch holds only what its report shows (issue 19, batch peak memory): a run of more designs
than ``figures_up_to`` keeps no design's key figures, in this process and from worker
processes alike, and everything else a report can show is the same as in a run that keeps them;
a single design keeps its figures, and formats that write figures keep them in any batch.
The reference is the run that keeps everything, which the rest of the suite checks against
outside sources.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.report import RenderOptions, formatter

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = (REPO / "example_designs" / "orchard-probe.yaml").read_text(encoding="utf-8")
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"


@pytest.fixture(scope="module")
def repo(tmp_path_factory: pytest.TempPathFactory) -> Path:
    root = tmp_path_factory.mktemp("batch-figures")
    (root / ".git").mkdir()
    (root / "parts").mkdir()
    shutil.copy(LIBRARY, root / "parts" / "orchard-parts.yaml")
    for i in range(6):
        load = 0.6 + i / 5  # 0.6 .. 1.6 A, up to the peak
        (root / f"probe-{i}.yaml").write_text(
            EXAMPLE.replace("name: Orchard soil probe,", f"name: Probe {i},")
            .replace("  continuous: 1.2 A", f"  continuous: {load:.1f} A"), encoding="utf-8")
    return root


def shown(run) -> list:
    """What a report can show of each design besides its figures."""
    return [(d.file, d.name, d.findings,
             [str(e) for e in d.errors], d.checked, d.skipped, d.linted) for d in run.designs]


@pytest.mark.parametrize("jobs", [1, 2])
def test_a_batch_past_figures_up_to_keeps_everything_but_the_figures(repo, jobs):
    full = lint([str(repo)], jobs=1, keep_models=False, keep_events=False)
    slim = lint([str(repo)], jobs=jobs, keep_models=False, keep_events=False, figures_up_to=1)
    assert len(full.designs) == 6 and all(d.figures for d in full.designs)
    assert any(d.findings for d in full.designs)  # the 1.6 A load is above the trip's minimum
    assert all(d.figures == {} for d in slim.designs)
    assert shown(slim) == shown(full)
    assert slim.exit_code() == full.exit_code()


def test_a_single_design_keeps_its_figures(repo):
    run = lint([str(repo / "probe-0.yaml")], jobs=1, figures_up_to=1)
    assert run.designs[0].figures["component_count"].value > 0


def test_the_text_report_of_a_batch_is_unchanged_and_json_keeps_the_figures(repo):
    def check(*args: str) -> str:
        return subprocess.run([sys.executable, "-m", "packwarden.launch", "check", *args],
                              capture_output=True, text=True, cwd=repo).stdout
    text = check(".")
    assert "probe-5.yaml" in text and ": figures:" not in text
    assert ": figures:" in check("probe-0.yaml")
    assert '"component_count"' in check("-f", "json", ".")


@pytest.mark.parametrize("name", ["sarif", "junit"])
def test_a_format_without_key_figures_writes_the_same_report_from_a_run_without_them(repo, name):
    render = formatter(name)
    assert render.figures_up_to == 0
    full = lint([str(repo)], jobs=1, keep_models=False, keep_events=False)
    slim = lint([str(repo)], jobs=2, keep_models=False, keep_events=False, figures_up_to=0)
    assert all(d.figures == {} for d in slim.designs)
    assert render(slim, RenderOptions()) == render(full, RenderOptions())
