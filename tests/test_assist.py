"""The design assistant (``packwarden assist``): the capability envelope and part suggestions.

Each answer is checked the way a reviewer would check it: by linting the design again with the
answer applied (the re-lint is the independent check: the assistant only searches, the rules
judge), and one envelope limit against the protector's trip condition worked by hand.
"""

from __future__ import annotations

import inspect
import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
import yaml

import packwarden.assist

from packwarden.assist import (CURRENT_RESOLUTION, Relinter, assist, continuous_overrides,
                               peak_overrides)
from packwarden.engine import Session, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override

REPO = Path(__file__).resolve().parent.parent
ORCHARD = "example_designs/orchard-probe.yaml"


def run(*args: str) -> subprocess.CompletedProcess:
    """The command as a user runs it, in the repository (its entry point is ``cli.main``)."""
    return subprocess.run([sys.executable, "-m", "packwarden.cli", *args], capture_output=True,
                          text=True, encoding="utf-8", cwd=REPO)


@pytest.fixture(scope="module")
def session() -> Session:
    return Session(registry=load_registry())


@pytest.fixture(scope="module")
def orchard(session):
    return assist(session, REPO / ORCHARD, ORCHARD)


def _relinter(session: Session, shown: str) -> Relinter:
    return Relinter(session, REPO / shown, shown, load_file(REPO / shown, shown))


def _design(session: Session, shown: str):
    from packwarden.engine import lint_file
    return lint_file(session, REPO / shown, shown).model.design


def _limit(help_, name: str):
    return next(lim for lim in help_.limits if lim.name.startswith(name))


def test_the_continuous_load_limit_passes_and_one_percent_above_fails(session, orchard) -> None:
    # issue 18's test: applied as the load (the peak raised with it where it would fall below,
    # as the format requires), the limit passes; 1 % above it a rule objects.
    limit = _limit(orchard, "highest continuous load")
    design = _design(session, ORCHARD)
    relint = _relinter(session, ORCHARD)
    assert limit.value > design.load.continuous
    assert relint.blockers(continuous_overrides(design, limit.value)) == []
    above = relint.blockers(continuous_overrides(design, limit.value * 1.01))
    assert above and limit.blocker is not None
    assert limit.blocker.rule in {b.rule for b in above}


def test_every_limit_is_bracketed_within_its_resolution(orchard) -> None:
    for lim in orchard.limits:
        assert lim.value is not None and lim.blocker is not None, lim.text()
        if lim.unit == "A":
            assert lim.failing / lim.value - 1 <= CURRENT_RESOLUTION
        else:
            assert abs(lim.failing - lim.value) <= 0.5


def test_the_orchard_peak_limit_is_the_protectors_trip_minimum_worked_by_hand(orchard) -> None:
    # A FET-sensed protector trips when the current times the on-resistance of both channels
    # reaches its detection voltage: I_trip = V_detect / R_DS(on) (docs/references.md,
    # "Single-cell protector, typical values", worked example [practice]). A peak longer than the
    # shortest over-current delay must stay below the lowest trip, so the highest 40 ms peak is
    #   V_detect,min / R_sense,max = (150 mV - 15 mV) / 83.09 mΩ = 1.6247 A,
    # with 150 mV ± 15 mV the detection voltage of OR-GUARD-1S (example_designs/parts) and
    # 83.09 mΩ the model's sense_resistance_max for the Orchard probe (both channels, 55 °C
    # ambient, 2.45 V gate drive, at the continuous load's heat).
    by_hand = (0.150 - 0.015) / 0.08309
    limit = _limit(orchard, "highest peak for 40 ms")
    assert limit.blocker.rule == "trip-current-window"
    assert limit.value <= by_hand * 1.001 and limit.failing >= by_hand * 0.999
    assert limit.value == pytest.approx(by_hand, rel=CURRENT_RESOLUTION)


def test_a_longer_peak_duration_is_applied_and_re_linted(session) -> None:
    help_ = assist(session, REPO / ORCHARD, ORCHARD, peak_duration=2.0)
    limit = _limit(help_, "highest peak for 2 s")
    design = _design(session, ORCHARD)
    relint = _relinter(session, ORCHARD)
    assert relint.blockers(peak_overrides(design, limit.value, 2.0)) == []
    assert relint.blockers(peak_overrides(design, limit.value * 1.01, 2.0))


def test_a_design_that_fails_as_given_has_an_empty_envelope_and_says_why(session) -> None:
    shown = "example_designs/flawed/trip-below-load.yaml"
    help_ = assist(session, REPO / shown, shown)
    assert help_.limits == []
    assert "trip-current-window" in {b.rule for b in help_.blockers}
    assert "empty: the design as given does not pass" in help_.text()


@pytest.mark.parametrize("shown, component, expected", [
    # a 5 A inline fuse that blows before the protector acts; the library's 12 A fuse does not
    ("example_designs/flawed/fuse-too-small.yaml", "F1", "OR-FUSE-12A"),
    # four parallel FETs of a low spread minimum: the library's other P-channel part shares safely
    ("example_designs/flawed/ridgeline-fet-share.yaml", "Q1", "RL-PFET-30"),
])
def test_a_suggested_part_applied_passes(session, shown, component, expected) -> None:
    help_ = assist(session, REPO / shown, shown)
    advice = next(a for a in help_.advice if component in a.components)
    assert expected in [s.part for s in advice.passing]
    # the independent check: a fresh session lints the design with the part put in place
    base = load_file(REPO / shown, shown)
    written = base.data["components"]
    changes = [Override("set", f"components.{c}.part", expected) if "part" in written[c] else
               Override("set", f"components.{c}", {"part": expected, "pins": written[c]["pins"]})
               for c in advice.components]
    fresh = Session(registry=load_registry())
    assert Relinter(fresh, REPO / shown, shown, base).blockers(changes) == []
    best = advice.passing[0]
    assert best.blocker is not None and best.margin_percent is not None and best.margin_percent >= 0


def test_when_no_part_in_the_libraries_fixes_it_the_answer_says_so(session) -> None:
    shown = "example_designs/flawed/fet-voltage-too-low.yaml"
    help_ = assist(session, REPO / shown, shown)
    fet = next(a for a in help_.advice if a.part == "OR-FET-D20")
    assert fet.passing == [] and [p for p, _ in fet.failing] == ["OR-FET-D30H"]
    assert "no part of the same kind in the libraries fixes it" in fet.text()
    resistor = next(a for a in help_.advice if a.part == "RES-2K0")
    assert "no other part of kind resistor" in resistor.note


def test_the_command_answers_in_text_json_and_html(tmp_path) -> None:
    text = run("assist", ORCHARD)
    assert text.returncode == 0, text.stderr
    assert "highest continuous load" in text.stdout and "set by trip-current-window" in text.stdout
    as_json = run("assist", "-f", "json", "example_designs/flawed/fuse-too-small.yaml")
    assert as_json.returncode == 1  # as `check`: the design has errors
    data = json.loads(as_json.stdout)
    part = data["designs"][0]["parts"][0]
    assert part["suggestions"][0]["part"] == "OR-FUSE-12A"
    report = tmp_path / "review.html"
    html = run("assist", "-f", "html", ORCHARD, "-o", str(report))
    assert html.returncode == 0, html.stderr
    page = report.read_text(encoding="utf-8")
    assert "Design assistant" in page and "highest peak for 40 ms" in page


def test_bad_input_gives_one_located_line_and_exit_2_never_a_traceback(tmp_path) -> None:
    bad = run("assist", "--peak-duration", "40 parsecs", ORCHARD)
    assert bad.returncode == 2 and "Traceback" not in bad.stderr
    assert bad.stderr.startswith("packwarden assist: --peak-duration:")
    broken = tmp_path / "broken.yaml"
    broken.write_text("format: packwarden/1\ndesign: [\n", encoding="utf-8")
    out = run("assist", str(broken))
    assert out.returncode == 2 and "Traceback" not in out.stdout + out.stderr
    first = out.stdout.splitlines()[0]
    assert first.startswith(f"{broken}:") and first.split(":")[1].isdigit()


def test_identical_inline_parts_are_one_bill_of_materials_line(tmp_path: Path) -> None:
    # The four parallel FETs of the flawed Ridgeline pack, each written inline as a copy of the
    # library's RL-PFET-30C: one part on the bill of materials, so one piece of advice for all
    # four, and the suggested part goes into all four (one alone would leave three at fault).
    shutil.copytree(REPO / "example_designs", tmp_path / "designs")
    (tmp_path / "packwarden.toml").write_text("", encoding="utf-8")
    library = yaml.safe_load((REPO / "example_designs/parts/ridgeline-parts.yaml")
                             .read_text(encoding="utf-8"))
    fields = library["parts"]["RL-PFET-30C"]
    design = tmp_path / "designs/flawed/ridgeline-fet-share.yaml"
    text = design.read_text(encoding="utf-8")
    for name in ("Q1", "Q2", "Q3", "Q4"):
        start = text.index(f"  {name}: {{part: RL-PFET-30C, pins: ")
        pins = text[start:text.index("}}", start) + 1].split("pins: ", 1)[1]
        inline = json.dumps(fields, ensure_ascii=False)[:-1] + f", \"pins\": {pins}}}"
        text = text[:start] + f"  {name}: {inline}" + text[text.index("\n", start):]
    design.write_text(text, encoding="utf-8")
    shown = "designs/flawed/ridgeline-fet-share.yaml"
    session = Session(registry=load_registry())
    help_ = assist(session, design, shown)
    inline = [a for a in help_.advice if a.kind == "fet"]
    assert [a.components for a in inline] == [["Q1", "Q2", "Q3", "Q4"]]
    assert "RL-PFET-30" in [s.part for s in inline[0].passing]
    # the independent check: a fresh session lints the design with the part in all four places
    base = load_file(design, shown)
    written = base.data["components"]
    changes = [Override("set", f"components.{c}", {"part": "RL-PFET-30", "pins": written[c]["pins"]})
               for c in ("Q1", "Q2", "Q3", "Q4")]
    fresh = Session(registry=load_registry())
    assert Relinter(fresh, design, shown, base).blockers(changes) == []


def test_the_assistant_module_exports_every_public_name_it_defines() -> None:
    module = packwarden.assist

    defined = {n for n, v in vars(module).items() if not n.startswith("_")
               and (inspect.isfunction(v) or inspect.isclass(v)) and v.__module__ == module.__name__}
    assert defined <= set(module.__all__)
    assert all(hasattr(module, n) for n in module.__all__)
