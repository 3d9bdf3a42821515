"""A power path's memo kept between models of an equal netlist (issue 19): a design linted
after others reports what it reports linted alone, to the last bit, whether the earlier designs
had its netlist (another load) or another (each one-flaw variant after its base); a netlist that
differs in any part value, a pin, or only in the sign of a zero gets a memo of its own; and a
shared operating point still obeys Joule's law, computed here independently.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.engine import Session, lint_file, load_registry
from packwarden.model import network, path
from packwarden.netlist import Component

EXAMPLES = Path("example_designs")
FLAWED = sorted((EXAMPLES / "flawed").glob("*.yaml"))


def forget() -> None:
    path._MEMOS.clear()
    path._RDS_KEPT.clear()
    network._SOLVED.clear()
    network._SOLVED_LARGE.clear()
    network._SOLVED_LARGE_HELD[0] = 0


@pytest.fixture(autouse=True)
def forgotten():
    forget()
    yield
    forget()


@pytest.fixture(scope="module")
def registry():
    return load_registry()


def outcome(result) -> str:
    """Every figure, event, cut-off and finding of a result, every float to the last bit."""
    return repr(({k: getattr(v, "value", v) for k, v in result.figures.items()}, result.events,
                 result.temperature_cutoffs,
                 [(f.rule, f.fingerprint, f.message, f.hint, f.figures) for f in result.findings],
                 [str(e) for e in result.errors], result.internal))


def lint(registry, design: Path, text: str | None = None):
    return lint_file(Session(registry=registry), design, str(design), text=text)


@pytest.mark.parametrize("design", ["orchard-probe.yaml", "ridgeline-tool-4s2p.yaml"])
def test_another_load_on_the_same_netlist_reads_the_memo_and_reports_the_same(registry, design):
    base = EXAMPLES / design
    text = base.read_text(encoding="utf-8")
    before = lint(registry, base)
    (kept,) = path._MEMOS.values()
    memo = kept[2]
    held = len(memo)
    changed = text.replace("  continuous: 1.2 A", "  continuous: 0.9 A").replace(
        "  continuous: 12 A", "  continuous: 9 A")
    assert changed != text
    shared = lint(registry, base, changed)
    assert shared.model.path._memo is memo  # the same netlist: the memo was shared
    assert len(memo) > held  # and the new load's operating points were added to it
    forget()
    alone = lint(registry, base, changed)
    assert alone.model.path._memo is not memo
    assert outcome(shared) == outcome(alone)
    assert outcome(before) != outcome(alone)


@pytest.mark.parametrize("flawed", FLAWED, ids=lambda p: p.stem)
def test_a_variant_linted_after_every_example_reports_what_it_reports_alone(registry, flawed):
    session = Session(registry=registry)
    for design in sorted(EXAMPLES.glob("*.yaml")):
        lint_file(session, design, str(design))
    after = lint_file(session, flawed, str(flawed))
    forget()
    assert outcome(after) == outcome(lint(registry, flawed))


def cell(part) -> Component:
    return Component("BT1", "cell", None, part, {"pos": "B+", "neg": "B-"}, ("components", "BT1"))


def test_a_part_value_a_pin_or_the_sign_of_a_zero_makes_another_netlist():
    same = cell(0.5)
    assert path._same_netlist((same,), (cell(0.5),))
    assert not path._same_netlist((same,), (cell(0.6),))
    assert not path._same_netlist((cell(0.0),), (cell(-0.0),))  # equal, yet "-0" prints
    moved = Component("BT1", "cell", None, 0.5, {"pos": "B+", "neg": "N1"}, ("components", "BT1"))
    assert not path._same_netlist((same,), (moved,))
    assert not path._same_netlist((same,), (same, cell(0.5)))


def test_the_kept_memos_are_bounded(registry):
    design = EXAMPLES / "orchard-probe.yaml"
    text = design.read_text(encoding="utf-8")
    for k in range(path.MEMOS_MAX + 3):
        # the supply resistor named anew each time: another netlist
        changed = text.replace("  R1: {kind: resistor", f"  R{k + 10}: {{kind: resistor", 1)
        assert changed != text
        lint(registry, design, changed)
    assert len(path._MEMOS) == path.MEMOS_MAX


def test_another_value_under_the_same_names_takes_the_place_of_the_kept_memo(registry):
    design = EXAMPLES / "orchard-probe.yaml"
    text = design.read_text(encoding="utf-8")
    first = lint(registry, design).model.path._memo
    other = lint(registry, design, text.replace("value: 470 Ω", "value: 510 Ω", 1)).model.path._memo
    assert other is not first
    (kept,) = path._MEMOS.values()
    assert kept[2] is other


def test_a_shared_operating_point_obeys_joules_law(registry):
    design = EXAMPLES / "ridgeline-tool-4s2p.yaml"
    lint(registry, design)
    model = lint(registry, design).model
    op = model.path.operating_point(10.0, 25.0, 10.0, "max")
    assert op is lint(registry, design).model.path.operating_point(10.0, 25.0, 10.0, "max")
    # P = I² R per channel, summed per package [published: Joule's first law]
    for package in op.power:
        joule = sum(op.channel_current[ch.name] ** 2 * op.rds[ch.name]
                    for ch in model.channels if ch.package == package)
        assert op.power[package] == pytest.approx(joule, rel=1e-12)


def test_a_kept_network_is_handed_out_as_a_copy_that_solves_like_a_fresh_build(registry):
    model = lint(registry, EXAMPLES / "ridgeline-tool-4s2p.yaml").model
    p = model.path
    rds = {ch.name: 0.004 for ch in model.channels}
    args = dict(cell_emf=3.6, cell_r=0.02, temp=40.0, corner="max")
    first = p.network(rds, **args)
    first.add_resistor("(probe)", *model.terminals, 1.0)  # a caller may add to its copy
    again = p.network(rds, **args)
    fresh = p.built_network(rds, **args)
    assert "(probe)" not in {b.name for b in again.branches}
    assert again.branches == fresh.branches and again.nets == fresh.nets
    ground = model.stack.bottom
    network._SOLVED.clear()
    kept, built = again.solve(ground), fresh.solve(ground)
    assert repr(kept) == repr(built)  # a solve of the copy: every float to the last bit
    # what flows into each net flows out of it, summed here over the branches (current from
    # a to b) [published: Kirchhoff's current law]
    for net in again.nets:
        into = sum(kept.current(b.name) * ((b.b == net) - (b.a == net)) for b in again.branches)
        assert into == pytest.approx(0.0, abs=1e-9 * abs(kept.current("(load)")))


def test_a_large_network_is_not_kept(registry, monkeypatch):
    monkeypatch.setattr(path, "NETWORK_KEPT_BRANCHES", 3)
    model = lint(registry, EXAMPLES / "ridgeline-tool-4s2p.yaml").model
    p = model.path
    before = sum(1 for k in p._memo if k[0] == "network")
    p.network({ch.name: 0.005 for ch in model.channels}, cell_emf=3.7, cell_r=0.02, temp=41.0)
    assert sum(1 for k in p._memo if k[0] == "network") == before


def test_the_hard_short_and_the_permitted_point_are_solved_once_per_netlist(registry):
    design = EXAMPLES / "ridgeline-tool-4s2p.yaml"
    first, second = lint(registry, design).model, lint(registry, design).model
    assert second.hard_short is first.hard_short
    hs = second.hard_short
    # the switch channels in series each carry the short's whole current, the parallel
    # channels of one switch share it [published: Kirchhoff's current law]
    for role in ("discharge", "charge"):
        chans = [c for c in second.channels if c.role == role]
        total = sum(hs.channels[c.name].current for c in chans)
        assert total == pytest.approx(hs.current, rel=1e-9)
    forget()
    assert repr(lint(registry, design).model.hard_short) == repr(hs)


def test_a_recalled_computation_says_its_problems_again(registry):
    model = lint(registry, EXAMPLES / "orchard-probe.yaml").model
    p = model.path
    said = []

    def compute():
        p.problems.append("a problem")
        said.append(1)
        return 42

    before = len(p.problems)
    assert p.remembered(("test",), compute) == 42
    assert p.remembered(("test",), compute) == 42
    assert len(said) == 1 and p.problems[before:] == ["a problem", "a problem"]


def test_a_conduction_path_is_found_once_per_netlist(registry):
    design = EXAMPLES / "ridgeline-tool-4s2p.yaml"
    first = lint(registry, design).model.path.conducts("discharge", "charge")
    model = lint(registry, design).model
    assert model.path.conducts("discharge", "charge") is first
    # with the discharge switch off, charge current still passes its body diode, and discharge
    # current finds no way [practice: back-to-back protection FETs]
    assert "body diode" in [h.via for h in first.hops]
    assert model.path.conducts("discharge", "discharge") is None
    # the search itself, made again, finds the same way through the same parts
    assert model.path.find_conduction("discharge", "charge") == first


def test_a_part_name_or_a_pin_order_makes_another_netlist():
    same = cell(0.5)
    renamed = Component("BT1", "cell", "RL-OTHER", 0.5, {"pos": "B+", "neg": "B-"},
                        ("components", "BT1"))
    assert not path._same_netlist((same,), (renamed,))
    swapped = Component("BT1", "cell", None, 0.5, {"neg": "B-", "pos": "B+"}, ("components", "BT1"))
    assert not path._same_netlist((same,), (swapped,))  # equal, yet it prints apart


def test_a_relint_that_left_the_netlist_alone_solves_no_drain_or_spread_again(registry,
                                                                              monkeypatch):
    from packwarden.model import balance, storage, survival
    design = EXAMPLES / "ridgeline-tool-4s2p.yaml"
    text = design.read_text(encoding="utf-8")
    first = lint(registry, design)
    assert {"level drains", "current spread", "bleed currents"} <= {
        k[0] for k in first.model.path._memo}
    solved = []
    for module, name in ((storage, "solve_level_drains"), (survival, "spread_at_drives"),
                         (balance, "solve_bleed_currents")):
        real = getattr(module, name)
        monkeypatch.setattr(module, name, lambda *a, _real=real, _name=name: (
            solved.append(_name), _real(*a))[1])
    again = lint(registry, design, text + "# an edit that leaves the netlist alone\n")
    assert again.model.path._memo is first.model.path._memo and solved == []
    assert outcome(again) == outcome(first)
    forget()
    alone = lint(registry, design, text + "# alone\n")
    assert set(solved) == {"solve_level_drains", "spread_at_drives", "solve_bleed_currents"}
    assert outcome(alone) == outcome(first)
