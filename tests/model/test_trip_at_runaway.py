"""The trip window of FETs that the load alone heats past tj_max is taken at tj_max.

Independent check: the window's highest sense resistance rebuilt by hand from the library's data
sheet figures (docs/references.md, "Where the load alone gives no steady state ..."): the 4.5 V
row's maximum, the straight-line temperature factor at tj_max, and the 1/(V_GS − V_th)
extrapolation (docs/references.md, the square-law model) at each channel's gate voltage as the
report states it. Before, the window was taken at the runaway iteration's last temperature
(about 3 140 °C), a corner no part reaches intact.
"""

from __future__ import annotations

import re
from pathlib import Path

from packwarden.engine import Session, lint_file, load_registry

REPO = Path(__file__).resolve().parents[2]
DESIGN = "example_designs/flawed/high-threshold-fet.yaml"


def _result():
    return lint_file(Session(registry=load_registry()), REPO / DESIGN, DESIGN)


def test_the_window_of_a_runaway_switch_is_taken_at_tj_max() -> None:
    result = _result()
    windows = [f for f in result.findings if f.rule == "trip-current-window"]
    assert windows
    notes = [a for f in windows for a in f.assumptions]
    assert any(a.startswith("T_J held at tj_max (Q1 150 °C)") for a in notes), notes
    # no junction temperature beyond the rated one is assumed anywhere in the window
    for a in notes:
        for t in re.findall(r"T_J (-?[0-9.]+) °C", a):
            assert float(t) <= 150.0, a
    # by hand, OR-FET-D30H: 18 mΩ max at 4.5 V, ratio 1.5 at 125 °C -> 1.625 at 150 °C;
    # V_th max 2 V; the discharge channel at the 2.45 V drive, the charge channel at the V_GS the
    # report gives (its source rides on the path's I·R)
    vgs2 = float(re.search(r"Q1\.2 ([0-9.]+) V", next(
        a for a in notes if "source rides above" in a)).group(1))
    by_hand = 18e-3 * (1 + 0.5 * (150 - 25) / 100) * (2.5 / (2.45 - 2.0) + 2.5 / (vgs2 - 2.0))
    r_max = result.figures["sense_resistance_max"].value
    assert abs(r_max - by_hand) / by_hand < 0.02, (r_max, by_hand)
    # OR-GUARD-1S over-current detection 150 ± 15 mV: the minimum trip is 135 mV over it
    trip_min = result.figures["trip_current_min"].value
    assert abs(trip_min - 0.135 / by_hand) / (0.135 / by_hand) < 0.02, trip_min
