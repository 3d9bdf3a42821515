"""The time–current coordination chart: drawn for every example design with each of its events,
from the model's coordination data (no physics of its own), and its limits checked against
outside values: the definition of I²t and IEC 60949's adiabatic form (docs/references.md,
"What parts survive over time")."""

from __future__ import annotations

import math
import shutil
import re
import xml.etree.ElementTree as ET

import pytest

from packwarden.engine import lint
from packwarden.model.coordination import time_current
from packwarden.report import RenderOptions
from packwarden.report.charts import clip_polyline, time_current_chart
from packwarden.report.html import render

from report_data import CLEAN, EXAMPLES, FLAWED

DESIGNS = [CLEAN, *sorted(EXAMPLES.glob("ridgeline-*.yaml")), *FLAWED]


def _tc_charts(html: str) -> list[ET.Element]:
    return [ET.fromstring(m.group(0))
            for m in re.finditer(r'<svg class="chart tc".*?</svg>', html, re.S)]


def _model(path):
    run = lint([str(path)])
    return run.designs[0].model


@pytest.fixture(scope="module")
def every_example():
    return lint([str(p) for p in DESIGNS])


def test_drawn_for_every_example_with_each_event(every_example) -> None:
    html = render(every_example, RenderOptions())
    svgs = _tc_charts(html)
    assert len(svgs) == len(DESIGNS)
    for d, svg in zip(every_example.designs, svgs):
        text = " ".join("".join(t.itertext()) for t in svg.iter("text"))
        # every event that carries a current, but storage (microamperes over months)
        events = [e for e in d.model.events if e.current > 0 and e.name != "storage"]
        assert events, d.file
        for e in events:
            assert f"{e.name}: " in text, (d.file, e.name)
        dots = [c for c in svg.iter("circle") if "tc-dot" in c.get("class", "")]
        assert len(dots) == sum(e.duration is not None for e in events), d.file


def test_the_chart_shows_the_models_windows_and_limits() -> None:
    m = _model(CLEAN)
    chart = time_current_chart(m)
    values = dict(chart.values)
    # the over-current detection as the trip window and the protector's delay give it
    assert values["over-current detection"] == "trips 1.62–7.72 A after 5–15 ms"
    tc = time_current(m)
    assert {lim.kind for lim in tc.limits} == {"fuse", "fet"}
    assert [mk.name for mk in tc.marks] == [e.name for e in m.events
                                            if e.current > 0 and e.name != "storage"]


def test_the_melting_line_keeps_the_fuses_melting_i2t() -> None:
    # I²t of a rectangular pulse is I²·t [published: definition; docs/references.md "Fuses"]:
    # every point of the melting-I²t line carries the part's melting I²t.
    m = _model(CLEAN)
    fuse_part = m.netlist.components["F1"].part
    line = next(lim for lim in time_current(m).limits if lim.label == "F1 melting I²t")
    assert line.points
    for i, t in line.points:
        assert i * i * t == pytest.approx(fuse_part.melting_i2t)
        assert t <= 5e-3


def test_the_narrow_trace_crosses_below_the_gap_overload() -> None:
    # IEC 60949 adiabatic form [published; from memory], worked by hand: 0.3 mm × 35 µm from
    # 65 °C to 160 °C carries 226 × 0.0105 × √(ln(394.5/299.5)/t) A, 10.17 A at 15 ms and
    # 10.17 × √(15/10) = 12.46 A at 10 ms. The gap overload (28.3 A for 15 ms) lies beyond it:
    # the chart shows the trace fails before the protector acts.
    m = _model(EXAMPLES / "flawed" / "narrow-trace.yaml")
    tc = time_current(m)
    trace = next(lim for lim in tc.limits if lim.element == "T1")
    at = dict((t, i) for i, t in trace.points)
    assert at[1e-2] == pytest.approx(226 * 0.0105 * math.sqrt(math.log(394.5 / 299.5) / 1e-2),
                                     rel=1e-3)
    assert at[1e-2] == pytest.approx(12.46, abs=0.01)
    gap = next(mk for mk in tc.marks if mk.name == "gap-overload")
    assert gap.current > at[1e-2] and not gap.load


def test_clip_polyline_cuts_at_the_box_edges() -> None:
    box = (0.0, 0.0, 10.0, 10.0)
    assert clip_polyline([(-5.0, 5.0), (15.0, 5.0)], box) == [[(0.0, 5.0), (10.0, 5.0)]]
    assert clip_polyline([(20.0, 20.0), (30.0, 30.0)], box) == []
    # out, in, out, in: two runs
    runs = clip_polyline([(5.0, -5.0), (5.0, 5.0), (15.0, 5.0), (5.0, 8.0)], box)
    assert runs == [[(5.0, 0.0), (5.0, 5.0), (10.0, 5.0)], [(10.0, 6.5), (5.0, 8.0)]]


@pytest.mark.parametrize("path", [CLEAN, EXAMPLES / "ridgeline-tool-4s2p.yaml"])
def test_the_steady_fet_limit_is_where_the_thermal_balance_reaches_tj_max(path) -> None:
    # Checked against the model's own self-heated operating point (the thermal fixed point of
    # switch-temperature, tested against its closed form in tests/model/test_thermal.py): at the
    # chart's steady current the package's junction sits at its tj_max.
    m = _model(path)
    for lim in time_current(m).limits:
        if "θJA steady" not in lim.label:
            continue
        op = m.operating_point(lim.points[0][0], m.ambient.max, m.gate_drive.min, "max",
                               self_heating=True)
        part = next(ch.part for ch in m.channels if ch.package == lim.element)
        assert op.tj[lim.element] == pytest.approx(part.tj_max, abs=0.1)


def test_a_ptc_draws_its_derated_hold_current_and_i_max(tmp_path) -> None:
    # docs/references.md [practice]: hold current falls to 70-80 % at 50-60 °C; without the
    # part's table 70 % at 60 °C from 25 °C: 1.5 A × (1 − 0.3 × 30/35) = 1.114 A at 55 °C.
    (tmp_path / ".git").mkdir()
    shutil.copytree(EXAMPLES / "parts", tmp_path / "parts")
    text = CLEAN.read_text(encoding="utf-8")
    fuse_line = "  F1: {part: OR-FUSE-12A, pins: [B+, P+]}"
    assert fuse_line in text
    ptc = ("  F1: {kind: ptc, hold_current: 1.5 A, trip_current: 3 A, rated_voltage: 6 V, "
           "max_current: 200 A, resistance: {min: 20 mΩ, max: 50 mΩ}, pins: [B+, P+]}")
    path = tmp_path / "ptc.yaml"
    path.write_text(text.replace(fuse_line, ptc), encoding="utf-8")
    m = _model(path)
    ptcs = {lim.label: lim.points[0][0] for lim in time_current(m).limits if lim.kind == "ptc"}
    assert ptcs["F1 holds at 55 °C"] == pytest.approx(1.5 * (1 - 0.3 * 30 / 35))
    assert ptcs["F1 I_max"] == 200.0
    assert time_current_chart(m).drawn
