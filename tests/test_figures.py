"""The key figures are declared once (``packwarden.figures``) and every reader takes them from there.

What is checked: every figure the model reports on every example design is declared, in declaration
order; the declared units are the SI symbols [published: BIPM, "The International System of Units
(SI)", 9th edition 2019, tables 2 and 4: A, V, Ω and the degree Celsius °C] or a count ("") or the
calendar month of a shelf-life figure; JSON rounds each figure to 6 significant digits as an
independent decimal rounding does [published: Python's ``decimal`` module, the General Decimal
Arithmetic Specification's round-half-even]; and the text, Markdown and HTML reports and the
policy's limits print or parse whatever unit and label the declaration gives, which proves that none
of them keeps a table of its own.
"""

from __future__ import annotations

import json
import re
from dataclasses import replace
from decimal import ROUND_HALF_EVEN, Decimal
from pathlib import Path

import pytest

from packwarden import figures as declaration
from packwarden.engine import lint
from packwarden.figures import DECLARED, ENDS, KeyFigure, UndeclaredFigure, typed
from packwarden.loader import InputError
from packwarden.policy import load_policy
from packwarden.report import RenderOptions, figure_text, formatter
from packwarden.schema import PART_KINDS

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = sorted((REPO / "example_designs").glob("*.yaml")) + sorted(
    (REPO / "example_designs" / "flawed").glob("*.yaml"))


@pytest.fixture(scope="module")
def runs() -> dict:
    """Each example design linted on its own (a one-design run shows the text summary line)."""
    return {path.name: lint([str(path)]) for path in EXAMPLES}


def test_every_figure_the_model_reports_is_declared_in_order(runs: dict) -> None:
    seen: set[str] = set()
    for name, run in runs.items():
        [d] = run.designs
        assert not d.internal and d.figures, name
        for key, fig in d.figures.items():
            assert isinstance(fig, KeyFigure) and fig.declared == DECLARED[key], (name, key)
        assert list(d.figures) == [k for k in DECLARED if k in d.figures], name
        seen.update(d.figures)
    # the examples hold every figure the model can report
    assert seen == set(DECLARED)
    with pytest.raises(UndeclaredFigure, match="figure 'trip_current_mean' is not declared"):
        typed([("trip_current_mean", 1.0)])


def test_declarations_are_consistent() -> None:
    # SI symbols [published: SI Brochure, 9th ed.]; a count has none; shelf life is in months and
    # a cell's charge in ampere-hours, the units its data sheet gives [practice]
    assert {d.unit for d in DECLARED.values()} == {"", "A", "V", "Ω", "°C", "months", "Ah"}
    for d in DECLARED.values():
        assert set(d.element) <= set(PART_KINDS), d.name
        assert d.end in ("",) + ENDS
    ranges: dict[str, list] = {}
    for d in DECLARED.values():
        if d.end:
            ranges.setdefault(d.range, []).append(d)
    assert set(ranges) == {"trip_current", "sense_resistance", "short_circuit_trip", "gate_drive",
                           "fast_trip", "balance_cell_voltage",
                           "charge_cold_cutoff", "charge_hot_cutoff", "discharge_cold_cutoff",
                           "discharge_hot_cutoff", "charge_cold_release", "charge_hot_release",
                           "discharge_cold_release", "discharge_hot_release"}
    for stem, members in ranges.items():
        # one unit, one label, one anchor per range, its ends in min/typ/max order
        assert len({(m.unit, m.label, m.element, m.headline) for m in members}) == 1, stem
        ends = [m.end for m in members]
        assert ends == sorted(ends, key=ENDS.index), stem


def _six_digits(x: float) -> float:
    """Round half-even to 6 significant digits, in exact decimal arithmetic."""
    exact = Decimal(x)
    return float(exact.quantize(Decimal(1).scaleb(exact.adjusted() - 5), rounding=ROUND_HALF_EVEN))


def test_json_writes_every_figure_rounded_to_six_significant_digits(runs: dict) -> None:
    for name, run in runs.items():
        [d] = run.designs
        [entry] = json.loads(formatter("json")(run, RenderOptions()))["designs"]
        assert list(entry["figures"]) == list(d.figures), name
        for key, fig in d.figures.items():
            written = entry["figures"][key]
            if isinstance(fig.value, int):
                assert written == fig.value
            elif not fig.known:
                assert written is None
            else:
                assert written == _six_digits(fig.value), (name, key)


def _run(runs: dict, name: str, monkeypatch: pytest.MonkeyPatch, redeclare: bool):
    """The example's run; redeclared, a fresh run whose every figure has a unit and a label no
    formatter could know, in the run and in the declaration."""
    if not redeclare:
        return runs[name]
    run = lint([str(next(p for p in EXAMPLES if p.name == name))])
    for d in list(DECLARED.values()):
        monkeypatch.setitem(DECLARED, d.name, replace(d, unit="Zq", label=f"label-{d.range}"))
    for design in run.designs:
        design.figures = {k: KeyFigure(DECLARED[k], f.value) for k, f in design.figures.items()}
    return run


@pytest.mark.parametrize("redeclare", [False, True], ids=["as-declared", "redeclared"])
def test_text_prints_the_declared_unit_and_label(runs: dict, monkeypatch, redeclare: bool) -> None:
    run = _run(runs, "orchard-probe.yaml", monkeypatch, redeclare)
    [d] = run.designs
    [line] = [ln for ln in formatter("text")(run, RenderOptions()).splitlines()
              if ln.startswith(f"{d.file}: figures: ")]
    for fig in d.figures.values():
        if fig.declared.headline:
            assert f"{fig.declared.label} " in line and figure_text(fig) in line, fig.name
            assert re.fullmatch(rf"\S+ [pnµmkMG]?{re.escape(fig.unit)}", figure_text(fig))
    if redeclare:
        assert not re.search(r" (A|V)\b", line), line


@pytest.mark.parametrize("redeclare", [False, True], ids=["as-declared", "redeclared"])
def test_markdown_prints_the_declared_unit_and_label(runs: dict, monkeypatch,
                                                     redeclare: bool) -> None:
    run = _run(runs, "ridgeline-tool-4s2p.yaml", monkeypatch, redeclare)
    [d] = run.designs
    page = formatter("markdown")(run, RenderOptions())
    table = page.split("### Key figures", 1)[1].strip().splitlines()
    header, row = table[0], table[2]
    for fig in d.figures.values():
        if fig.declared.headline:
            assert fig.declared.label in header
            assert figure_text(fig) in row, fig.name
    if redeclare:
        assert not re.search(r" (A|V)\b", row), row


@pytest.mark.parametrize("redeclare", [False, True], ids=["as-declared", "redeclared"])
def test_html_prints_every_figure_with_the_declared_unit_and_label(runs: dict, monkeypatch,
                                                                   redeclare: bool) -> None:
    pytest.importorskip("jinja2")
    import html

    run = _run(runs, "orchard-probe.yaml", monkeypatch, redeclare)
    [d] = run.designs
    page = formatter("html")(run, RenderOptions())
    table = page[page.index("<th>min</th><th>typ</th><th>max</th>"):]
    table = table[:table.index("</table>")]
    shown = {html.unescape(label): [html.unescape(c) for c in cells] for label, cells in
             ((m.group(1), re.findall(r"<td>(.*?)</td>", m.group(2)))
              for m in re.finditer(r"<tr><th>(.*?)</th>((?:<td>.*?</td>)+)</tr>", table))}
    for fig in d.figures.values():
        cells = shown[fig.declared.label]
        column = ENDS.index(fig.declared.end) if fig.declared.end else 1
        assert cells[column] == figure_text(fig), fig.name
        if fig.unit:
            assert re.fullmatch(rf"\S+ [pnµmkMG]?{re.escape(fig.unit)}", cells[column]), fig.name


def test_policy_limits_take_the_declared_unit(tmp_path: Path, monkeypatch) -> None:
    path = tmp_path / "policy.yaml"
    path.write_text("format: packwarden-policy/1\nlimits:\n"
                    "  - {id: trip, figure: trip_current_max, max: 5 A}\n", encoding="utf-8")
    assert load_policy(path, "policy.yaml").limits[0].unit == "A"
    monkeypatch.setitem(DECLARED, "trip_current_max",
                        replace(DECLARED["trip_current_max"], unit="V"))
    with pytest.raises(InputError, match="5 A"):
        load_policy(path, "policy.yaml")


def test_the_declaration_imports_nothing_of_the_package_but_records() -> None:
    source = Path(declaration.__file__).read_text(encoding="utf-8")
    ours = re.findall(r"^from \.(\S*) import", source, re.M)
    assert ours == ["records"]
