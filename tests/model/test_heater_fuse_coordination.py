"""A heater fuse on the coordination chart: it melts on over-current like any fuse, so its
melting limit is drawn beside the protector's windows (issue 14, second-level protection).

Outside sources: the part's pre-arcing points are its data sheet's (here the invented part's,
given in the design); the melting I²t line is the definition of I²t [published: IEC 60127-1's
and IEC 60269-1's Joule integral], I = √(I²t / t), worked by hand below, not by the model.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from packwarden.model.coordination import time_current

from tests.model.linted import linted_model

REPO = Path(__file__).resolve().parents[2]
BACKUP = REPO / "example_designs" / "flawed" / "ridgeline-backup-below-primary.yaml"


def test_the_heater_fuse_is_drawn_with_its_pre_arcing_points_and_melting_i2t() -> None:
    chart = time_current(linted_model(BACKUP))
    mine = {limit.label: limit for limit in chart.limits if limit.element == "F1"}
    assert set(mine) == {"F1 pre-arcing", "F1 melting I²t"}
    assert all(limit.kind == "fuse" for limit in mine.values())
    # the design's pre-arcing points, time rising
    assert mine["F1 pre-arcing"].points == ((600.0, 5e-3), (360.0, 40e-3), (210.0, 0.3),
                                            (120.0, 3.0), (81.0, 60.0))
    # melting I²t 1200 A²s: at 1 ms, √(1200 / 0.001) = 1095.4 A [derived by hand]
    at_1ms = dict((t, i) for i, t in mine["F1 melting I²t"].points)[1e-3]
    assert at_1ms == pytest.approx(math.sqrt(1200 / 1e-3), rel=1e-9)
    assert at_1ms == pytest.approx(1095.4, abs=0.05)
