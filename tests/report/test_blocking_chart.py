"""The review report's blocking-voltage chart: each switch's voltages when off, against its
vds_max and the derated limit, drawn from the model (no physics in the chart)."""

from __future__ import annotations

import pytest

from packwarden.engine import lint
from packwarden.report import RenderOptions, formatter
from packwarden.report.charts import blocking_cases, blocking_voltage

from report_data import EXAMPLES
from test_html import charts, texts

VOLTAGE = EXAMPLES / "flawed/fet-voltage-too-low.yaml"
SPIKE = EXAMPLES / "flawed/wiring-spike.yaml"


def _model(design):
    (d,) = lint([str(design)]).designs
    return d.model


def test_a_reversed_charger_adds_to_the_stack() -> None:
    # [derived: Kirchhoff's voltage law, docs/references.md "Events in time"] a charger connected
    # reversed is in series with the stack, aiding it: the design's 24 V open circuit plus the
    # 4.325 V of a full cell (4.30 V typical overcharge detection + tolerance, the stack's
    # highest) = 28.325 V across the off discharge switch. Its vds_max is 20 V; derated to
    # 80 % [practice: docs/references.md "MOSFETs"] 16 V.
    cases = {(c.switches, c.what): c for c in blocking_cases(_model(VOLTAGE))}
    rev = cases[("Q1.1", "charger connected reversed")]
    assert rev.volts == pytest.approx(24 + 4.325, abs=0.01)
    assert rev.vds_max == 20 and rev.derated == pytest.approx(16)
    # the charge switch holds the charger against the lowest stack: 24 V − 2.45 V
    assert cases[("Q1.2", "charge switch off with the charger connected")].volts == \
        pytest.approx(24 - 2.45, abs=0.01)


def test_the_turn_off_spike_is_drawn_beside_the_other_cases() -> None:
    # [derived: V = V_stack + L·di/dt, docs/references.md "Events in time"]: 4.33 V + 200 nH ×
    # 110 A / 1 µs = 26.3 V, past the vds_max of 20 V.
    chart = blocking_voltage(_model(SPIKE))
    assert chart.drawn
    values = dict(chart.values)
    spike = values["Q1.1 (discharge): turning off a short circuit"]
    assert spike.startswith("26.3 V") and "vds_max 20 V" in spike and "derated 16 V" in spike


def test_the_chart_marks_what_passes_and_what_fails() -> None:
    html = formatter("html")(lint([str(VOLTAGE)]), RenderOptions())
    svg = charts(html)["vds"]
    bars = [r.get("class") for r in svg.iter("{http://www.w3.org/2000/svg}rect")
            if "vds-bar" in (r.get("class") or "")] or \
           [r.get("class") for r in svg.iter("rect") if "vds-bar" in (r.get("class") or "")]
    # 28.3 V and 21.6 V exceed the 20 V rating; the stack's 4.33 V is within the derated 16 V
    assert sorted(bars) == ["vds-bar vds-over-rating", "vds-bar vds-over-rating",
                            "vds-bar vds-within"]
    assert "voltage, V" in texts(svg)


def test_a_design_without_switch_roles_says_why() -> None:
    class NoSwitches:
        channels = ()
    chart = blocking_voltage(NoSwitches())
    assert not chart.drawn and chart.notes
