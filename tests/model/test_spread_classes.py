"""The worst share of parallel channels, solved once per class of interchangeable channels
(survival.ClassShares), against a solve per channel and against the current divider.

Sources (docs/references.md, "What parts survive over time"): the current divider for parallel
conductances, G_self/(G_self + ΣG_others) [derived]; relabelling two interchangeable parallel
branches leaves the nodal equations as they were [derived: nodal analysis]. The reference here is
the method spelled out (every channel at its highest on-resistance, one at its lowest, the whole
path solved for each channel), computed beside the fast one.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.model import survival
from packwarden.model.values import corner_value
from tests.model.linted import linted_model

REPO = Path(__file__).resolve().parents[2]
EXAMPLES = REPO / "example_designs"

# A weaker die beside the library's RL-PFET-30: 3.0 / 4.0 mΩ at 10 V, 5.0 / 6.5 mΩ at 4.5 V.
WEAK_FET = """
  RL-PFET-30W:
    kind: fet
    channel: p
    vds_max: 30 V
    vgs_max: 20 V
    vgs_th: {min: -2.5 V, max: -1.0 V}
    rds_on:
      - {vgs: -4.5 V, typ: 5.0 mΩ, max: 6.5 mΩ}
      - {vgs: -10 V, typ: 3.0 mΩ, max: 4.0 mΩ}
    rds_on_hot_ratio: {at: 125 °C, ratio: 1.5}
    id_max: 60 A
    id_pulse_max: 600 A
    theta_ja: 30 K/W
    tj_max: 150 °C
    idss: 1 uA
"""


@pytest.fixture(scope="module")
def unequal(tmp_path_factory):
    """The Ridgeline pack with unequal parallel channels: the discharge switch Q1 ∥ Q2 ∥ Q5 (two
    RL-PFET-30 and a weaker die), the charge switch Q3 ∥ Q4 (one of each)."""
    root = tmp_path_factory.mktemp("unequal")
    (root / "parts").mkdir()
    library = (EXAMPLES / "parts" / "ridgeline-parts.yaml").read_text(encoding="utf-8")
    marker = "\n  RL-NFET-40:"
    assert marker in library
    (root / "parts" / "ridgeline-parts.yaml").write_text(
        library.replace(marker, WEAK_FET + marker, 1), encoding="utf-8")
    text = (EXAMPLES / "ridgeline-tool-4s2p.yaml").read_text(encoding="utf-8")
    q2 = "  Q2: {part: RL-PFET-30, pins: {s: BF, g: DG, d: MID}}\n"
    q4 = "  Q4: {part: RL-PFET-30, pins: {s: P+, g: CG, d: MID}}\n"
    assert q2 in text and q4 in text
    text = (text.replace(q2, q2 + "  Q5: {part: RL-PFET-30W, pins: {s: BF, g: DG, d: MID}}\n")
            .replace(q4, "  Q4: {part: RL-PFET-30W, pins: {s: P+, g: CG, d: MID}}\n"))
    design = root / "unequal.yaml"
    design.write_text(text, encoding="utf-8")
    return linted_model(design)


def spread_solved_per_channel(m) -> dict[str, tuple[float, float]]:
    """Channel -> (worst share / equal share, gate drive), the path solved once per channel."""
    cell_r = corner_value(m.stack.part.internal_resistance, "min")
    out: dict[str, tuple[float, float]] = {}
    for vgs in sorted({m.gate_drive.min, m.gate_drive.max}):
        high = {ch.name: m.channel_rds(ch, vgs, 25.0, "max")[0] for ch in m.channels}
        sol, _, _ = m.solve_path(high, 25.0, "min", cell_r)
        for ch in m.channels:
            equal = abs(sol.current(ch.name)) / abs(sol.current("(load)"))
            low = dict(high, **{ch.name: m.channel_rds(ch, vgs, 25.0, "min")[0]})
            sol_low, _, _ = m.solve_path(low, 25.0, "min", cell_r)
            factor = abs(sol_low.current(ch.name)) / abs(sol_low.current("(load)")) / equal
            if ch.name not in out or factor > out[ch.name][0]:
                out[ch.name] = (factor, vgs)
    return out


def test_the_spread_by_class_equals_a_solve_per_channel(unequal):
    fast = survival.current_spread(unequal)
    full = spread_solved_per_channel(unequal)
    assert set(fast) == set(full) == {"Q1", "Q2", "Q3", "Q4", "Q5"}
    for name, (factor, vgs) in full.items():
        assert fast[name].factor == pytest.approx(factor, rel=1e-9), name
        assert fast[name].vgs == vgs
    # the weaker die shares less, and a pair shares more than a triple
    assert fast["Q5"].factor != pytest.approx(fast["Q1"].factor, rel=1e-3)
    assert fast["Q1"].factor == fast["Q2"].factor


def test_interchangeable_channels_are_solved_once(unequal, monkeypatch):
    # Per gate drive: the solve with every channel high, then one per class: {Q1, Q2}, {Q5},
    # {Q3}, {Q4}; a solve per channel would take one more.
    kept = survival.current_spread(unequal)
    solves = []
    real = type(unequal).solve_path

    def counted(self, *args):
        solves.append(args[0])
        return real(self, *args)

    monkeypatch.setattr(type(unequal), "solve_path", counted)
    drives = tuple(sorted({unequal.gate_drive.min, unequal.gate_drive.max}))
    assert survival.spread_at_drives(unequal, drives) == kept
    assert len(solves) == len(drives) * (1 + 4)


def test_the_worst_share_is_the_current_divider_of_the_switch(unequal):
    # All of the load current passes the discharge switch, so Q5 at its lowest beside Q1 and Q2
    # at their highest carries G5_low / (G5_low + G1_high + G2_high) of it, and G5_high / ΣG_high
    # when all are at their highest [derived: current divider, docs/references.md].
    m = unequal
    s = survival.current_spread(m)["Q5"]
    chans = {ch.name: ch for ch in m.channels}
    g_high = {n: 1.0 / m.channel_rds(chans[n], s.vgs, 25.0, "max")[0] for n in ("Q1", "Q2", "Q5")}
    g_low = 1.0 / s.rds[0]
    worst = g_low / (g_low + g_high["Q1"] + g_high["Q2"])
    equal = g_high["Q5"] / sum(g_high.values())
    assert s.factor == pytest.approx(worst / equal, rel=1e-9)
