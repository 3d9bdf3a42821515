"""The HTML review report: structure, the charts' numbers and geometry, escaping, determinism.

The charts are checked two ways: their labels carry the numbers a reviewer would work out by hand
from the part data (worked examples from docs/references.md, each tagged with its source), and their
geometry puts those numbers where an axis says they are. A chart that printed the right label at
the wrong place, or drew nothing, fails here.
"""

from __future__ import annotations

import math
import os
import re
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path
from types import SimpleNamespace

import pytest
from hypothesis import given, strategies as st
from markupsafe import escape

from packwarden.engine import lint
from packwarden.report import RenderOptions, formatter
from packwarden.model.limits import Limits
from packwarden.report.charts import FONT, Svg, refs_text, spread, text_width, trip_window
from packwarden.report.html import render
from packwarden.report.text import CAUTION

REPO = Path(__file__).resolve().parents[2]
EXAMPLE = REPO / "example_designs" / "orchard-probe.yaml"
FLAWED = REPO / "example_designs" / "flawed" / "trip-below-load.yaml"


# --- helpers ------------------------------------------------------------------------------------

def report(*paths: Path | str) -> str:
    return render(lint([str(p) for p in paths]), RenderOptions())


def charts(html: str) -> dict[str, ET.Element]:
    """Each chart's <svg>, parsed as XML: the writer must produce well-formed markup."""
    out = {}
    for m in re.finditer(r'<svg class="chart (\w+)".*?</svg>', html, re.S):
        out[m.group(1)] = ET.fromstring(m.group(0))
    return out


def texts(svg: ET.Element) -> list[str]:
    return ["".join(t.itertext()) for t in svg.iter("text")]


def has_class(el: ET.Element, name: str) -> bool:
    return name in (el.get("class") or "").split()


def label_boxes(svg: ET.Element) -> list[tuple[str, float, float, float, float]]:
    """(text, left, top, right, bottom) of every label, at the layout's own width estimate."""
    boxes = []
    for t in svg.iter("text"):
        s = "".join(t.itertext())
        x, y = float(t.get("x")), float(t.get("y"))
        w = text_width(s, FONT)
        anchor = t.get("text-anchor", "start")
        left = x - w if anchor == "end" else x - w / 2 if anchor == "middle" else x
        boxes.append((s, left, y - 0.78 * FONT, left + w, y + 0.22 * FONT))
    return boxes


def overlaps(boxes) -> list[tuple[str, str]]:
    bad = []
    for i, a in enumerate(boxes):
        for b in boxes[i + 1:]:
            if a[1] < b[3] and b[1] < a[3] and a[2] < b[4] and b[2] < a[4]:
                bad.append((a[0], b[0]))
    return bad


# A design whose figures are worked by hand: one cell, one dual-FET pair with flat on-resistance
# (same at every gate drive, corner and temperature: rds_on_hot_ratio 1.0), all parts inline.
WORKED = """\
format: packwarden/1
design: {{name: {name}, revision: A}}
pack:
  ambient: {{min: 0 °C, max: 60 °C}}
load:
  continuous: {load}
charger:
  voltage: {{typ: 4.20 V, tol: 0.5 %}}
  current: 0.8 A
  open_circuit_max: 5.5 V
components:
  BT1:
    kind: cell
    chemistry: nmc
    capacity: 3 Ah
    voltage: {{charge: 4.20 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}}
    internal_resistance: {{typ: 30 mΩ, max: 45 mΩ}}
    max_current: {{discharge: 10 A, charge: 1.7 A}}
    pins: {{pos: B+, neg: B-}}
  U1:
    kind: protector
    chemistry: [nmc]
    overcharge:
      detect: {{typ: 4.300 V, tol: 25 mV}}
      release: {{typ: 4.100 V, tol: 50 mV}}
      delay: {{typ: 1.2 s}}
    overdischarge:
      detect: {{typ: 2.500 V, tol: 50 mV}}
      release: {{typ: 3.000 V, tol: 100 mV}}
      delay: {{typ: 150 ms}}
    overcurrent:
      detect: 150 mV
      delay: {{min: 5 ms, typ: 9 ms, max: 15 ms}}
    short_circuit:
      detect: 500 mV
      delay: {{typ: 300 us}}
    supply_current: {{operating: {{typ: 3 uA}}}}
    pins: {{supply: VDD, ground: B-, sense: VM, discharge_gate: DG, charge_gate: CG}}
{fets}
  R1: {{kind: resistor, value: 470 Ω, pins: [B+, VDD]}}
  C1: {{kind: capacitor, value: 100 nF, pins: [VDD, B-]}}
  R2: {{kind: resistor, value: 2 kΩ, pins: [VM, P-]}}
  F1: {{kind: fuse, rated_current: 12 A, rated_voltage: 32 V, breaking_capacity: 600 A,
        melting_i2t: 95 A2s, pins: [B+, P+]}}
{extra}"""

FET = """\
  {ref}:
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {{min: 0.5 V, max: 1.0 V}}
    rds_on:
      - {{vgs: 1.8 V, typ: {rds}, max: {rds}}}
      - {{vgs: 2.5 V, typ: {rds}, max: {rds}}}
      - {{vgs: 4.5 V, typ: {rds}, max: {rds}}}
    rds_on_hot_ratio: {{at: 125 °C, ratio: 1.0}}
    id_max: 10 A
    theta_ja: 120 K/W
    pins: {{s1: B-, g1: DG, s2: P-, g2: CG}}"""


def worked(tmp_path: Path, *, rds: str = "22 mΩ", load: str = "2 A", pairs: int = 1,
           name: str = "Worked example", extra: str = "", file: str = "worked.yaml") -> Path:
    fets = "\n".join(FET.format(ref=f"Q{k}", rds=rds) for k in range(1, pairs + 1))
    path = tmp_path / file
    path.write_text(WORKED.format(name=name, load=load, fets=fets, extra=extra), encoding="utf-8")
    return path


# --- the report as a whole -------------------------------------------------------------------

def test_the_format_is_registered() -> None:
    assert formatter("html") is render


def test_example_report_has_title_counts_figures_and_cautions() -> None:
    html = report(EXAMPLE)
    assert html.startswith("<!DOCTYPE html>")
    assert '<h2 class="design-title">Orchard soil probe <span class="rev">revision C</span></h2>' in html
    assert "example_designs/orchard-probe.yaml" in html
    assert "No findings." in html
    # The text formatter's caution, word for word, and the wider cautions of a review report
    # [practice: README "Safety cautions"].
    assert str(escape(CAUTION)) in html
    assert "not that the design is safe" in html
    # key figures as the model computes them, formatted with units
    assert "<tr><th>over-current trip</th><td>1.62 A</td><td>3.62 A</td><td>7.72 A</td></tr>" in html
    assert "<tr><th>prospective short circuit</th><td></td><td>110 A</td><td></td></tr>" in html
    assert set(charts(html)) == {"ladder", "trip", "tj", "tc", "vds"}


def test_report_is_self_contained_with_no_script() -> None:
    html = report(EXAMPLE, FLAWED)
    for banned in ("<script", "<link", "@import", "url(", "http://", "https://", "src=", "@font-face"):
        assert banned not in html, banned
    assert "<style>" in html


def test_findings_table_shows_every_field(tmp_path: Path) -> None:
    html = report(FLAWED)
    rows = re.findall(r"<tr class=\"sev-error\">(.*?)</tr>", html, re.S)
    assert len(rows) == 2  # two trip-current-window findings (min below continuous and peak load)
    first = rows[0]
    for part in ('<span class="badge sev-error">error</span>', "trip-current-window", "<td>U1</td>",
                 "<code>10:15</code>", "load.continuous", "over-current trip min 1.4 A is below the "
                 "continuous load 2.5 A", "no on-resistance of Q1 lets every rule pass",
                 "<li>trip min = 1.4 A</li>"):
        assert part in first, part
    assert ">2</b> errors" in html


def test_waived_findings_are_shown_as_waived_and_not_counted(tmp_path: Path) -> None:
    # 150 mV over 2 × 25 mΩ trips at 3 A, below a 3.5 A load: a trip-current-window finding on U1,
    # accepted here by a waiver with a reason.
    waiver = ("waivers:\n  - rule: trip-current-window\n    element: U1\n"
              "    reason: bench-tested at 3.5 A for 10 min, test report TR-7\n")
    path = worked(tmp_path, rds="25 mΩ", load="3.5 A", extra=waiver)
    run = lint([str(path)])
    html = render(run, RenderOptions())
    waived = re.findall(r'<tr class="is-waived">(.*?)</tr>', html, re.S)
    assert waived and all("bench-tested at 3.5 A for 10 min, test report TR-7" in w for w in waived)
    assert all('<span class="badge waived">waived</span>' in w for w in waived)
    assert f"<b>{len(waived)}</b> waived" in html
    # Counted apart: the error count holds only the findings no waiver covers (other rules may
    # have their own say about this design).
    findings = run.designs[0].findings
    assert any(f.rule == "trip-current-window" and f.waived for f in findings)
    errors = sum(1 for f in findings if f.severity.value == "error" and not f.waived)
    assert f"<b>{errors}</b> error" in html
    assert f"exit code <b>{run.exit_code()}</b>" in html


def test_several_designs_get_a_table_of_contents() -> None:
    html = report(EXAMPLE, FLAWED)
    assert '<a href="#design-1">Orchard soil probe</a>' in html
    assert '<a href="#design-2">Orchard soil probe (trip-below-load)</a>' in html
    assert html.count('<section class="design"') == 2


def test_a_baseline_comparison_is_summarised() -> None:
    # With --baseline the run holds only new findings; the report says what it left out.
    cmp = SimpleNamespace(summary=lambda: "compared with baseline.json: 0 new, 2 unchanged (not shown), 1 fixed")
    html = render(lint([str(EXAMPLE)]), RenderOptions(baseline=cmp))
    assert '<p class="sub baseline">compared with baseline.json: 0 new, 2 unchanged (not shown), 1 fixed</p>' in html
    assert "baseline" not in report(EXAMPLE).split("<body>")[1].split("<aside")[0]


def test_unreadable_input_is_reported_not_raised(tmp_path: Path) -> None:
    bad = tmp_path / "bad.yaml"
    bad.write_text("format: packwarden/1\ndesign: {name: x}\npack: [\n", encoding="utf-8")
    html = report(bad, EXAMPLE)
    assert re.search(r"bad\.yaml:\d+:\d+: ", html)
    assert "Not linted: see above." in html
    assert "exit code <b>2</b>" in html
    assert len(charts(html)) == 5  # the readable design still gets its charts


def test_a_design_without_protector_says_what_is_not_drawn(tmp_path: Path) -> None:
    text = worked(tmp_path).read_text(encoding="utf-8")
    start = text.index("  U1:\n")
    end = text.index("  Q1:\n")
    path = tmp_path / "no-protector.yaml"
    path.write_text(text[:start] + text[end:], encoding="utf-8")
    html = report(path)
    assert "no protector in the design: its thresholds are not shown" in html
    assert "gate drive unknown (no protector or cell)" in html
    svg = charts(html)["ladder"]  # the cell's own levels and the charger still make a ladder
    assert "charge voltage 4.2 V" in texts(svg)


def test_a_failing_model_figure_costs_its_charts_not_the_report(monkeypatch) -> None:
    from packwarden.model.design import DesignModel

    def broken(self):
        raise RuntimeError("figure exploded")

    monkeypatch.setattr(DesignModel, "overcurrent_trip", property(broken))
    run = lint([str(EXAMPLE)])
    assert run.designs[0].internal  # the engine has reported the failure
    html = render(run, RenderOptions())
    assert "not drawn: RuntimeError: figure exploded" in html
    assert "internal error in &#39;model&#39;" in html
    assert "charge voltage 4.2 V" in texts(charts(html)["ladder"])  # needs no trip window


# --- chart 1: the voltage ladder -----------------------------------------------------------

def test_ladder_labels_carry_the_tolerance_bands() -> None:
    labels = texts(charts(report(EXAMPLE))["ladder"])
    # OR-GUARD-1S: overcharge detect 4.300 V ± 25 mV, release 4.100 V ± 50 mV; over-discharge
    # detect 2.500 V ± 50 mV, release 3.000 V ± 100 mV [derived: typ ± tol from the part data].
    for band in ("4.275–4.325 V", "4.05–4.15 V", "2.45–2.55 V", "2.9–3.1 V"):
        assert band in labels, band
    # Charger 4.20 V ± 0.5 % on one cell: 4.179–4.221 V [derived: 4.2 × (1 ∓ 0.005)].
    assert "4.179–4.221 V" in labels
    for level in ("overcharge limit 4.35 V", "upper limit 4.25 V", "charge voltage 4.2 V",
                  "cut-off 2.5 V", "lower limit 2 V"):
        assert level in labels, level


def _band_rects(svg: ET.Element) -> dict[str, tuple[float, float]]:
    out = {}
    for r in svg.iter("rect"):
        cls = r.get("class", "")
        m = re.search(r"b-([\w-]+)", cls)
        if m:
            y = float(r.get("y"))
            out[m.group(1)] = (y, y + float(r.get("height")))
    return out


def test_ladder_draws_the_bands_in_voltage_order_with_the_charger_clear_of_detection() -> None:
    svg = charts(report(EXAMPLE))["ladder"]
    rects = _band_rects(svg)
    assert set(rects) == {"overcharge-detect", "overcharge-release", "over-discharge-detect",
                          "over-discharge-release", "charger"}
    # higher voltage is higher up (smaller y): detect above charger above release, etc.
    order = ["overcharge-detect", "charger", "overcharge-release", "over-discharge-release",
             "over-discharge-detect"]
    tops = [rects[k][0] for k in order]
    assert tops == sorted(tops)
    # The gap a reviewer looks for: the charger's highest 4.221 V sits below the overcharge
    # detection's lowest 4.275 V [practice: docs/references.md "Single-cell protector", detection
    # 4.25-4.35 V for 4.2 V cells, above the charger]; on the chart it is visible daylight.
    assert rects["charger"][0] - rects["overcharge-detect"][1] > 5


def test_ladder_geometry_is_one_scale_throughout() -> None:
    """Band heights are proportional to their tolerance spans, across the axis break too."""
    svg = charts(report(EXAMPLE))["ladder"]
    rects = _band_rects(svg)
    spans = {"overcharge-detect": 0.050, "overcharge-release": 0.100, "over-discharge-detect": 0.100,
             "over-discharge-release": 0.200, "charger": 0.042}
    per_volt = [(rects[k][1] - rects[k][0]) / v for k, v in spans.items()]
    assert max(per_volt) / min(per_volt) == pytest.approx(1.0, abs=0.03)
    # and the break is marked on the axis when the empty middle is cut out
    assert any(has_class(line, "break") for line in svg.iter("line"))


# --- chart 2: the trip-current window --------------------------------------------------------

def _tick_x(svg: ET.Element) -> dict[float, float]:
    return {float("".join(t.itertext())): float(t.get("x")) for t in svg.iter("text")
            if has_class(t, "tick")}


def test_trip_window_worked_example(tmp_path: Path) -> None:
    # Trip current = detection voltage / (2 × R_DS(on) per FET): 150 mV / (2 × 25 mΩ) = 3 A
    # [practice: docs/references.md "Single-cell protector", worked example]. Short circuit: 500 mV over
    # the same 50 mΩ = 10 A [derived, same formula].
    svg = charts(report(worked(tmp_path, rds="25 mΩ", load="1.2 A")))["trip"]
    labels = texts(svg)
    assert "3 A" in labels  # no tolerance given: the window is a single current
    assert "10 A" in labels
    # Fuse derated to 75 % of its 12 A rating = 9 A [practice: docs/references.md "Fuses", derating].
    assert "F1 fuse derated, 75 % of 12 A" in labels and "9 A" in labels
    assert "cell discharge max, 1P × 10 A" in labels
    # Where the 3 A typ marker sits on the log axis: log-interpolated between the 2 and 5 A ticks
    # [derived: log10(3/2) / log10(5/2) = 0.4425 of the way].
    ticks = _tick_x(svg)
    typ_mark = next(p for p in svg.iter("path") if has_class(p, "typ-mark"))
    x_typ = float(re.match(r"M([\d.]+),", typ_mark.get("d")).group(1))
    expect = ticks[2] + math.log10(1.5) / math.log10(2.5) * (ticks[5] - ticks[2])
    assert x_typ == pytest.approx(expect, abs=0.6)


def test_trip_window_with_two_pairs_in_parallel(tmp_path: Path) -> None:
    # Two identical pairs in parallel halve the resistance and double the trip current to 6 A
    # [practice: docs/references.md "Single-cell protector", worked example]; each channel carries half, so the pair's 10 A id_max
    # is reached at 20 A of pack current [derived].
    svg = charts(report(worked(tmp_path, rds="25 mΩ", load="1.2 A", pairs=2)))["trip"]
    labels = texts(svg)
    assert "6 A" in labels
    assert "Q1, Q2 FET id_max, 10 A/channel" in labels and "20 A pack" in labels


def test_trip_window_shows_a_trace_at_its_ipc2221_rating(tmp_path: Path) -> None:
    # A 100 mil outer trace of 1 oz copper carries 4.70 A for a 10 K rise
    # [derived: docs/references.md "Conductor current capacity — IPC-2221", I = k·ΔT^0.44·A^0.725].
    trace = "  T1: {kind: trace, width: 2.54 mm, length: 20 mm, copper_weight: 1 oz, pins: [P+, PAD]}\n"
    labels = texts(charts(report(worked(tmp_path, rds="25 mΩ", load="1.2 A", extra=trace)))["trip"])
    assert "T1 trace, IPC-2221 at ΔT 10 K" in labels and "4.7 A" in labels


def test_trip_window_example_design() -> None:
    labels = texts(charts(report(EXAMPLE))["trip"])
    for text in ("U1 over-current trip", "1.62–7.72 A, typ 3.62 A", "U1 short-circuit trip",
                 "continuous load", "1.2 A", "peak load, 40 ms", "1.6 A", "Q1 FET id_max",
                 "hard short", "92.1 A", "current, A (log scale)",
                 # the permitted event: the current the rules judge the ratings by
                 # (docs/references.md "Events in time"; an independent calculator gave about 5.49 A)
                 "permitted for ever, -20 °C", "5.47 A"):
        assert text in labels, text


def test_trip_window_names_a_short_circuit_off_the_scale() -> None:
    # A hard short over 20 times the largest other current would squeeze the window to a sliver:
    # it is named at the edge, not drawn.
    win = SimpleNamespace(min=2.0, max=6.0, typ=3.0)
    events = {"hard-short": SimpleNamespace(current=900.0)}
    model = SimpleNamespace(
        overcurrent_trip=win, short_circuit_trip=None, protector=SimpleNamespace(refdes="U1"),
        design=SimpleNamespace(load=SimpleNamespace(continuous=1.0, peak=None)), stack=None,
        channels=(), netlist=SimpleNamespace(of_kind=lambda *k: []), event=events.get,
        limits=Limits())
    chart = trip_window(model)
    assert "900 A, off scale →" in texts(ET.fromstring(chart.svg))
    assert any("beyond the axis" in n for n in chart.notes)


# --- chart 3: junction temperature -------------------------------------------------------------

def test_junction_temperature_worked_example(tmp_path: Path) -> None:
    # 2 A through two 22 mΩ channels → 0.176 W; at 120 K/W and 60 °C ambient T_J = 81.1 °C
    # [derived: docs/references.md "MOSFETs", T_J = T_A + P·R_θJA]. The on-resistance is flat here, so
    # the worst and typical cases agree.
    html = report(worked(tmp_path, rds="22 mΩ", load="2 A"))
    svg = charts(html)["tj"]
    labels = texts(svg)
    assert "Q1 worst 81.1 °C" in labels
    assert "Q1 typ 81.1 °C" in labels
    assert "<tr><th>Q1 worst, 0 °C ambient</th><td>21.1 °C</td></tr>" in html  # 0 + 21.12 K
    assert "Q1 tj_max 150 °C" in labels and "derating 125 °C" in labels  # [practice: T_J ≤ 125 °C]
    # the curve is drawn through the computed points: one vertex per ambient 0, 10, ..., 60 °C
    curve = next(p for p in svg.iter("polyline") if has_class(p, "curve") and not has_class(p, "dashed"))
    assert len(curve.get("points").split()) == 7


def test_junction_temperature_without_a_steady_state_says_so(tmp_path: Path) -> None:
    # 6 A through two 22 mΩ channels is 1.58 W: 190 K above ambient at 120 K/W, past the
    # 150 °C tj_max at every ambient [derived: T_J = T_A + P·R_θJA]; there is no curve to draw.
    html = report(worked(tmp_path, rds="22 mΩ", load="6 A"))
    assert "Q1, worst case: no thermal steady state at 0 °C ambient and above" in html
    assert "<tr><th>Q1 worst, 0 °C ambient</th><td>no steady state</td></tr>" in html
    svg = charts(html)["tj"]
    assert not [p for p in svg.iter("polyline") if has_class(p, "curve")]
    assert "Q1 tj_max 150 °C" in texts(svg)


def test_junction_temperature_example_marks_the_trip_min_corner() -> None:
    html = report(EXAMPLE)
    svg = charts(html)["tj"]
    rings = [c for c in svg.iter("circle") if has_class(c, "corner")]
    assert len(rings) == 1
    # The model's trip-min operating point: 55 °C ambient, 2.45 V gate drive, 64.8 °C junction.
    assert "<tr><th>Q1 at the trip-min corner (55 °C, 2.45 V gate drive)</th><td>64.8 °C</td></tr>" in html
    assert "Q1 worst 64.8 °C" in texts(svg)


# --- layout -----------------------------------------------------------------------------------

@pytest.mark.parametrize("design", [EXAMPLE, FLAWED, REPO / "example_designs" / "flawed" / "charger-too-high.yaml"],
                         ids=lambda p: p.stem)
def test_no_two_labels_overlap(design: Path) -> None:
    for name, svg in charts(report(design)).items():
        assert overlaps(label_boxes(svg)) == [], name


def test_no_labels_overlap_with_many_packages(tmp_path: Path) -> None:
    for name, svg in charts(report(worked(tmp_path, rds="25 mΩ", load="1.2 A", pairs=4))).items():
        assert overlaps(label_boxes(svg)) == [], name


@given(st.lists(st.floats(0, 500), min_size=1, max_size=12), st.floats(4, 30))
def test_spread_keeps_order_gap_and_range(wanted: list[float], gap: float) -> None:
    lo, hi = 0.0, 500.0
    got = spread(wanted, gap, lo, hi)
    order = sorted(range(len(wanted)), key=lambda i: (wanted[i], i))
    placed = [got[i] for i in order]
    assert all(b - a >= gap - 1e-6 for a, b in zip(placed, placed[1:])) or (len(wanted) - 1) * gap > hi - lo
    if (len(wanted) - 1) * gap <= hi - lo:
        assert lo - 1e-6 <= min(got) and max(got) <= hi + 1e-6


def test_spread_leaves_labels_that_fit_where_they_are() -> None:
    assert spread([10.0, 50.0, 90.0], 12.0, 0.0, 100.0) == [10.0, 50.0, 90.0]
    assert spread([50.0, 50.0], 10.0, 0.0, 100.0) == [45.0, 55.0]


def test_designators_are_shortened_in_runs() -> None:
    assert refs_text(["Q3", "Q1", "Q2", "Q4"]) == "Q1–Q4"
    assert refs_text(["Q1", "Q2"]) == "Q1, Q2"
    assert refs_text(["Q1", "Q3", "Q10", "QA"]) == "Q1, Q3, Q10, QA"


# --- escaping ---------------------------------------------------------------------------------

HOSTILE = '<script>alert("pw")</script>'


def test_hostile_names_and_values_come_out_escaped(tmp_path: Path) -> None:
    lib = tmp_path / "parts.yaml"
    lib.write_text(
        "format: packwarden-parts/1\nparts:\n"
        "  '<img src=x onerror=alert(1)>':\n"
        "    kind: resistor\n    value: 1 kΩ\n", encoding="utf-8")
    path = worked(tmp_path, name="'" + HOSTILE.replace("'", "''") + "'", extra=(
        "  R9: {part: '<img src=x onerror=alert(1)>', pins: [VDD, '<b>DANGLING</b>']}\n"
        "libraries: [parts.yaml]\n"))
    text = path.read_text(encoding="utf-8").replace("revision: A", "revision: '\"><i>rev</i>'")
    path.write_text(text, encoding="utf-8")
    html = report(path)
    assert "<script" not in html and "<img" not in html and "<b>DANGLING" not in html
    assert "<i>rev" not in html
    assert "&lt;script&gt;alert(&#34;pw&#34;)&lt;/script&gt;" in html  # the design name, in the title
    assert "&lt;b&gt;DANGLING&lt;/b&gt;" in html  # a net name inside a finding's message
    assert "&#34;&gt;&lt;i&gt;rev&lt;/i&gt;" in html
    assert len(charts(html)) == 5  # and the charts still parse


def test_chart_writer_escapes_text_and_attributes() -> None:
    svg = Svg(100, 50, HOSTILE, "x")
    svg.text(1, 2, HOSTILE, "a")
    svg.el("rect", x=1.0, class_='"><script>')
    out = str(svg.markup())
    assert "<script" not in out
    root = ET.fromstring(out)
    assert [t for t in texts(root)] == [HOSTILE]
    assert root.find("title").text == HOSTILE


# --- determinism ------------------------------------------------------------------------------

def test_rendering_twice_gives_identical_bytes() -> None:
    assert report(EXAMPLE, FLAWED) == report(EXAMPLE, FLAWED)


def test_output_does_not_depend_on_hash_seed() -> None:
    """Set and dict order must not leak into the report: two interpreters, two hash seeds."""
    code = ("import sys; from packwarden.engine import lint; from packwarden.report import RenderOptions;"
            "from packwarden.report.html import render;"
            "sys.stdout.buffer.write(render(lint(sys.argv[1:]), RenderOptions()).encode())")
    outs = []
    for seed in ("1", "4242"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        outs.append(subprocess.run([sys.executable, "-c", code, str(EXAMPLE), str(FLAWED)], cwd=REPO,
                                   env=env, capture_output=True, check=True).stdout)
    assert outs[0] == outs[1] and len(outs[0]) > 10_000
    assert not re.search(rb"20\d\d-\d\d-\d\d", outs[0])  # no date stamped in


def test_the_trip_chart_draws_the_limits_the_project_set(tmp_path: Path) -> None:
    # A project that derates fuses to 60 % and lets traces rise 20 K sees those lines on the
    # chart, as the findings judge by them; the defaults (75 %, 10 K) would disagree with them.
    import shutil
    shutil.copytree(REPO / "example_designs", tmp_path / "designs")
    (tmp_path / "designs" / "packwarden.toml").write_text(
        "[rules.secondary-protection]\nderating = 0.6\n\n"
        "[rules.conductor-capacity]\ndelta_t = '20 K'\n", encoding="utf-8")
    narrow = tmp_path / "designs" / "flawed" / "narrow-trace.yaml"
    labels = texts(charts(report(narrow))["trip"])
    assert "F1 fuse derated, 60 % of 12 A" in labels and "7.2 A" in labels  # 0.6 × 12 A
    assert any(t.startswith("T1 trace, IPC-2221 at ΔT 20 K") for t in labels), labels
    default = texts(charts(report(REPO / "example_designs" / "flawed" / "narrow-trace.yaml"))["trip"])
    assert "F1 fuse derated, 75 % of 12 A" in default
    assert any(t.startswith("T1 trace, IPC-2221 at ΔT 10 K") for t in default), default
