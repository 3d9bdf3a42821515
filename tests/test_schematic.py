"""Designs whose components come from a schematic's netlist, and cell stacks.

The outside reference is tests/data/kicad-protect1s/protect1s.net, written by KiCad 6.0.11 itself
from a schematic of the single-cell circuit (its README.md says what the schematic holds). A design
reading it must give the same figures and findings as the same circuit written out by hand
(tests/data/kicad/protect1s-twin.yaml, transcribed from that README): the import may add nothing
and lose nothing. Stacks are checked against the long form of the same cells, the hand-written
example_designs/ridgeline-tool-4s2p.yaml among them.
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest
from typer.testing import CliRunner

from packwarden.cli import app
from packwarden.engine import lint, load_registry
from packwarden.report import RenderOptions, formatter
from packwarden.docs import shipped_schema as json_schema

REPO = Path(__file__).resolve().parents[1]
DATA = REPO / "tests" / "data"
KICAD = DATA / "kicad"


@pytest.fixture(scope="module")
def registry():
    return load_registry()


def same_figures(a: dict, b: dict) -> bool:
    assert a.keys() == b.keys()
    for name in a:
        assert a[name].declared == b[name].declared
        assert a[name].value == pytest.approx(b[name].value, rel=1e-9), name
    return True


def comparable(result, drop=("unreviewed-component",)):
    """A design's findings without their places (which differ between the two files)."""
    return sorted((f.rule, f.severity.value, f.element or "", f.location.dotted, f.key, f.message)
                  for f in result.findings if f.rule not in drop)


@pytest.mark.parametrize("netlist_design", ["protect1s.yaml", "protect1s-kicad9.yaml"])
def test_a_design_from_the_netlist_equals_its_hand_written_twin(netlist_design, registry):
    run = lint([str(KICAD / netlist_design), str(KICAD / "protect1s-twin.yaml")], registry=registry)
    from_netlist, by_hand = run.designs
    assert from_netlist.errors == [] and by_hand.errors == []
    # every figure: the same to rounding (the netlist lists parts and nets in another order, so
    # the solver eliminates them in another order)
    assert same_figures(from_netlist.figures, by_hand.figures)
    assert from_netlist.figures["series"].value == 1
    assert comparable(from_netlist) == comparable(by_hand)
    # the one difference: the output connector, which has no part id, is listed, not dropped
    [extra] = [f for f in from_netlist.findings if f.rule == "unreviewed-component"]
    assert extra.element == "J1" and extra.severity.value == "warning"
    pins = "1", "2"
    if netlist_design == "protect1s-kicad9.yaml":
        pins = "01", "02"  # the hand-made KiCad 9 netlist numbers the connector's pins so
    assert f"P+ (pin {pins[0]}), P- (pin {pins[1]})" in extra.message


def test_the_twin_is_the_orchard_example(registry):
    # The twin transcribes the README; the example differs only in giving R1 inline. Same figures.
    # The example has since gained the pack's thermistor (RT1, read by the charger): one
    # component more and the cut-off temperatures; every other figure is the same.
    run = lint([str(KICAD / "protect1s-twin.yaml"), str(REPO / "example_designs/orchard-probe.yaml")],
               registry=registry)
    twin, example = (d.figures for d in run.designs)
    assert example["component_count"].value == twin["component_count"].value + 1
    example = {k: v for k, v in example.items()
               if not k.startswith(("charge_", "discharge_")) and k != "component_count"}
    twin = {k: v for k, v in twin.items() if k != "component_count"}
    assert same_figures(twin, example)


def test_a_netlist_finding_points_at_the_netlist_and_names_the_design(registry, monkeypatch):
    monkeypatch.chdir(REPO)
    run = lint(["tests/data/kicad/protect1s.yaml"], registry=registry)
    # (the design's charger window with no thermistor is charge-inhibit-window's, in the design)
    [f] = [f for f in run.designs[0].findings if f.rule != "charge-inhibit-window"]
    # `(comp (ref "J1")` is at line 55, column 5 of the netlist KiCad wrote
    assert (f.location.file, f.location.line, f.location.column) == \
        ("tests/data/kicad-protect1s/protect1s.net", 55, 5)
    design = f.location.related
    assert (design.file, design.line) == ("tests/data/kicad/protect1s.yaml", 6)
    text = formatter("text")(run, RenderOptions())
    assert ("tests/data/kicad-protect1s/protect1s.net:55:5: warning unreviewed-component: J1 "
            "(Conn 2P) has no part id") in text
    assert "(design tests/data/kicad/protect1s.yaml:6:22)" in text
    data = json.loads(formatter("json")(run, RenderOptions()))
    [loc] = [g["location"] for g in data["designs"][0]["findings"]
             if g["rule"] == "unreviewed-component"]
    assert loc["file"] == "tests/data/kicad-protect1s/protect1s.net"
    assert loc["design"] == {"file": "tests/data/kicad/protect1s.yaml", "line": 6, "column": 22}


# --- a repository of our own, for variants ----------------------------------------------------

def make_repo(root: Path) -> Path:
    """The test data and the example libraries, at the same relative places, in ``root``."""
    (root / "tests" / "data").mkdir(parents=True)
    shutil.copytree(KICAD, root / "tests/data/kicad")
    shutil.copytree(DATA / "kicad-protect1s", root / "tests/data/kicad-protect1s")
    shutil.copytree(REPO / "example_designs", root / "example_designs")
    (root / "packwarden.toml").write_text("", encoding="utf-8")
    return root


def variant(path: Path, *subs: tuple[str, str], extra: str = "") -> Path:
    text = path.read_text(encoding="utf-8")
    for old, new in subs:
        assert old in text, old
        text = text.replace(old, new)
    path.write_text(text + extra, encoding="utf-8")
    return path


def protect1s_findings(tmp_path: Path, registry, rules, edited: str, *subs: tuple[str, str]):
    """The findings of ``rules`` (one id, or a tuple: a list per id) on the KiCad 6 netlist's
    design, with ``subs`` made in the repository's file ``edited``."""
    repo = make_repo(tmp_path)
    variant(repo / edited, *subs)
    found = lint([str(repo / "tests/data/kicad/protect1s.yaml")], registry=registry).designs[0].findings
    if isinstance(rules, str):
        return [f for f in found if f.rule == rules]
    return [[f for f in found if f.rule == rule] for rule in rules]


def test_entries_under_components_override_and_add(tmp_path, registry):
    repo = make_repo(tmp_path)
    design = variant(repo / "tests/data/kicad/protect1s.yaml", extra=(
        "components:\n"
        "  R1: {kind: resistor, value: 470 Ω, power: 0.1 W}   # the netlist's pins, inline data\n"
        "  J1: {part: RES-2K0, pins: [P+, P-]}                # a part for the connector's place\n"))
    twin = variant(repo / "tests/data/kicad/protect1s-twin.yaml",
                   ("  F1: {part: OR-FUSE-12A, pins: [B+, P+]}\n",
                    "  F1: {part: OR-FUSE-12A, pins: [B+, P+]}\n  J1: {part: RES-2K0, pins: [P+, P-]}\n"),
                   ("  R1: {part: RES-470, pins: [B+, VDD]}",
                    "  R1: {kind: resistor, value: 470 Ω, power: 0.1 W, pins: [B+, VDD]}"))
    run = lint([str(design), str(twin)], registry=registry)
    a, b = run.designs
    assert a.errors == [] and same_figures(a.figures, b.figures)
    assert comparable(a, drop=()) == comparable(b, drop=())
    assert not [f for f in a.findings if f.rule == "unreviewed-component"]


def test_pins_given_in_the_design_override_the_netlists_by_name(tmp_path, registry):
    repo = make_repo(tmp_path)
    design = variant(repo / "tests/data/kicad/protect1s.yaml",
                     extra="components:\n  Q1: {part: OR-FET-D20, pins: {g1: CG, g2: DG}}\n")
    twin = variant(repo / "tests/data/kicad/protect1s-twin.yaml",
                   ("g1: DG, d: MID, s2: P-, g2: CG", "g1: CG, d: MID, s2: P-, g2: DG"))
    run = lint([str(design), str(twin)], registry=registry)
    a, b = run.designs
    assert comparable(a) == comparable(b) != []  # gates swapped: findings, the same ones
    assert a.model.netlist.components["Q1"].pins == {"s1": "B-", "g1": "CG", "d": "MID", "s2": "P-",
                                                     "g2": "DG"}


def test_a_component_outside_the_netlist_needs_its_pins(tmp_path, registry, monkeypatch):
    repo = make_repo(tmp_path)
    variant(repo / "tests/data/kicad/protect1s.yaml", extra="components:\n  C9: {part: CAP-100N}\n")
    monkeypatch.chdir(repo)
    run = lint(["tests/data/kicad/protect1s.yaml"], registry=registry)
    [err] = run.designs[0].errors
    assert str(err).endswith(":20:3: missing required key 'pins' in components.C9 (C9 is not in "
                             "the netlist tests/data/kicad-protect1s/protect1s.net)")
    assert run.exit_code() == 2


def test_without_a_schematic_components_and_pins_are_required(tmp_path, registry):
    repo = make_repo(tmp_path)
    design = variant(repo / "tests/data/kicad/protect1s-twin.yaml",
                     ("  C1: {part: CAP-100N, pins: [VDD, B-]}", "  C1: {part: CAP-100N}"))
    run = lint([str(design)], registry=registry)
    assert [str(e).split(":", 1)[1] for e in run.designs[0].errors] == [
        "25:3: missing required key 'pins' in components.C1"]
    text = design.read_text(encoding="utf-8")
    design.write_text(text[:text.index("components:")], encoding="utf-8")
    [err] = lint([str(design)], registry=registry).designs[0].errors
    assert str(err).endswith(":3:1: missing required key 'components' in the top level (or a "
                             "'schematic' whose netlist gives them)")


@pytest.mark.parametrize("entry, message", [
    ("../../../../outside.net", "netlist path '../../../../outside.net' escapes the repository"),
    ("/etc/hostname", "netlist path '/etc/hostname' escapes the repository"),
    ("no-such.net", "netlist 'no-such.net' not found"),
    ("..", "netlist '..' is a directory, not a file"),
])
def test_the_netlist_is_confined_like_libraries(tmp_path, registry, monkeypatch, entry, message):
    repo = make_repo(tmp_path)
    design = variant(repo / "tests/data/kicad/protect1s.yaml",
                     ("../kicad-protect1s/protect1s.net", entry))
    monkeypatch.chdir(repo)
    run = lint([str(design.relative_to(repo)), "example_designs/orchard-probe.yaml"], registry=registry)
    [err] = run.designs[0].errors
    assert str(err).startswith("tests/data/kicad/protect1s.yaml:6:22: " + message)
    assert run.designs[1].linted  # the rest of the run goes on
    assert run.exit_code() == 2


def test_a_broken_netlist_is_one_line_exit_2_and_the_run_goes_on(tmp_path, registry, monkeypatch):
    repo = make_repo(tmp_path)
    net = repo / "tests/data/kicad-protect1s/protect1s.net"
    net.write_text(net.read_text(encoding="utf-8")[:3000], encoding="utf-8")  # truncated
    monkeypatch.chdir(repo)
    result = CliRunner().invoke(app, ["check", "tests/data/kicad/protect1s.yaml",
                                      "example_designs/orchard-probe.yaml"])
    assert result.exit_code == 2
    lines = [ln for ln in result.output.splitlines() if "protect1s.net:" in ln]
    # the cut falls inside F1's Note, a string opened at line 71, column 16
    assert lines == ["tests/data/kicad-protect1s/protect1s.net:71:16: string opened here is never "
                     "closed"]
    assert "Traceback" not in result.output
    assert "1 design(s) linted, 1 could not be read" in result.output


def test_an_unknown_part_id_is_the_unknown_part_finding_at_the_netlist_line(tmp_path, registry):
    [f] = protect1s_findings(tmp_path, registry, "unknown-part", "tests/data/kicad-protect1s/protect1s.net",
                             ('(field (name "packwarden-part") "RES-2K0"))',
                              '(field (name "packwarden-part") "RES-2K00"))'))
    assert f.element == "R2" and f.location.line == 84 and f.location.file.endswith("protect1s.net")
    assert "did you mean 'RES-2K0'?" in f.hint


def test_pins_that_match_no_part_pin_are_reported_not_dropped(tmp_path, registry):
    # Without the protector's pinout, its symbol's pin names (VDD, VSS, ...) match none of the
    # part's pins (supply, ground, ...): each is an unknown pin, and the part's pins stay open.
    unknown, unconnected = protect1s_findings(
        tmp_path, registry, ("unknown-pin", "unconnected-pin"), "example_designs/parts/orchard-parts.yaml",
        ('    pinout: {"1": supply, "2": ground, "3": sense, "4": discharge_gate, "5": charge_gate}\n', ""))
    assert [f.message for f in unknown][0] == (
        "U1: package pin 1 (VDD) on net VDD matches no pin of the protector (supply, ground, sense, "
        "discharge_gate, charge_gate, temperature)")
    assert len(unknown) == 5 and all("pinout" in f.hint for f in unknown)
    assert {f.location.dotted for f in unconnected} == {
        "components.U1.pins.supply", "components.U1.pins.ground", "components.U1.pins.sense",
        "components.U1.pins.discharge_gate", "components.U1.pins.charge_gate"}


def test_a_pinout_name_the_part_lacks_is_an_unknown_pin(tmp_path, registry):
    [f] = protect1s_findings(tmp_path, registry, "unknown-pin", "example_designs/parts/orchard-parts.yaml",
                             ('"4": discharge_gate', '"4": dischage_gate'))
    assert "no pin 'dischage_gate'" in f.message and f.hint == "did you mean 'discharge_gate'?"
    assert f.location.line == 94  # U1 in the netlist


# --- stacks -------------------------------------------------------------------------------------

RIDGELINE_CELLS = """\
  BT1: {part: RL-CELL-2500, pins: {pos: B1, neg: B-}}
  BT2: {part: RL-CELL-2500, pins: {pos: B1, neg: B-}}
  BT3: {part: RL-CELL-2500, pins: {pos: B2, neg: B1}}
  BT4: {part: RL-CELL-2500, pins: {pos: B2, neg: B1}}
  BT5: {part: RL-CELL-2500, pins: {pos: B3, neg: B2}}
  BT6: {part: RL-CELL-2500, pins: {pos: B3, neg: B2}}
  BT7: {part: RL-CELL-2500, pins: {pos: B+, neg: B3}}
  BT8: {part: RL-CELL-2500, pins: {pos: B+, neg: B3}}
"""


@pytest.mark.parametrize("example", ["ridgeline-tool-4s2p.yaml", "flawed/ridgeline-led-always-on.yaml",
                                     "flawed/ridgeline-3s-protector.yaml"])
def test_a_stack_is_its_cells_written_out(tmp_path, registry, example):
    repo = make_repo(tmp_path)
    long_form = repo / "example_designs" / example
    short = long_form.with_name("stacked.yaml")
    short.write_text(long_form.read_text(encoding="utf-8"), encoding="utf-8")
    variant(short, (RIDGELINE_CELLS, ""), ("components:\n", "stacks:\n  - {part: RL-CELL-2500, series: 4, "
                                                             "parallel: 2, taps: [B-, B1, B2, B3, B+]}\n"
                                                             "components:\n"))
    run = lint([str(long_form), str(short)], registry=registry)
    a, b = run.designs
    assert a.errors == [] and b.errors == []
    assert same_figures(a.figures, b.figures)
    assert (a.figures["series"].value, a.figures["parallel"].value) == (4, 2)
    assert comparable(a) == comparable(b)


def test_a_16s_pack_merged_from_a_netlist_equals_its_long_form(tmp_path, registry):
    repo = make_repo(tmp_path)
    stacked = repo / "tests/data/kicad/pack16s.yaml"
    taps = ["B-", *(f"T{k}" for k in range(1, 16)), "B+"]
    cells = "".join(f"  BT{2 * level + k + 1}: {{part: RL-CELL-2500, pins: {{pos: {taps[level + 1]}, "
                    f"neg: {taps[level]}}}}}\n" for level in range(16) for k in range(2))
    long_form = repo / "tests/data/kicad/pack16s-long.yaml"
    text = stacked.read_text(encoding="utf-8")
    stack = text[text.index("stacks:"):text.index("waivers:")]
    long_form.write_text(text.replace(stack, "").replace("components:\n", "components:\n" + cells),
                         encoding="utf-8")
    run = lint([str(stacked), str(long_form)], registry=registry)
    a, b = run.designs
    assert a.errors == [] and b.errors == []
    assert (a.figures["series"].value, a.figures["parallel"].value) == (16, 2)
    assert same_figures(a.figures, b.figures)
    assert comparable(a, drop=()) == comparable(b, drop=())
    # the protector's 21 connected pins came by their names (CELL1..CELL16 and the rest, any case)
    u1 = a.model.netlist.components["U1"]
    assert u1.pins["cell16"] == "B+" and u1.pins["cell1"] == "T1" and len(u1.pins) == 21
    [j2] = [f for f in a.findings if f.rule == "unreviewed-component"]
    assert j2.waived and "B- (pin 1), T1 (pin 2)" in j2.message
    assert run.exit_code() == 0


def test_a_stack_with_the_wrong_number_of_taps(tmp_path, registry):
    repo = make_repo(tmp_path)
    design = variant(repo / "tests/data/kicad/pack16s.yaml", (", T15, B+]", ", B+]"))
    run = lint([str(design)], registry=registry)
    [err] = run.designs[0].errors
    assert "16 cells in series need 17 taps (bottom to top), 16 given" in str(err)


def test_a_stack_cell_may_not_reuse_a_reference(tmp_path, registry):
    repo = make_repo(tmp_path)
    design = variant(repo / "tests/data/kicad/pack16s.yaml", ("    parallel: 2\n", "    parallel: 2\n    prefix: C\n"))
    run = lint([str(design)], registry=registry)
    [err] = run.designs[0].errors
    assert str(err).endswith("cell C1 of this stack is a component of the netlist; give the stack "
                             "another prefix or first number")


# --- libraries kept outside the repository -------------------------------------------------------

def test_library_roots_allow_a_team_library_outside_the_repository(tmp_path, registry):
    team = tmp_path / "team-parts"
    team.mkdir()
    shutil.copy(REPO / "example_designs/parts/orchard-parts.yaml", team / "orchard-parts.yaml")
    repo = tmp_path / "product"
    repo.mkdir()
    (repo / "packwarden.toml").write_text("", encoding="utf-8")
    design = repo / "probe.yaml"
    design.write_text((REPO / "example_designs/orchard-probe.yaml").read_text(encoding="utf-8")
                      .replace("[parts/orchard-parts.yaml]", "[../team-parts/orchard-parts.yaml]"),
                      encoding="utf-8")
    refused = lint([str(design)], registry=registry)
    [err] = refused.designs[0].errors
    assert "library path '../team-parts/orchard-parts.yaml' escapes the repository" in str(err)
    assert 'library_roots = ["../team-parts"] under [tool.packwarden]' in str(err)
    (repo / "packwarden.toml").write_text('library_roots = ["../team-parts"]\n', encoding="utf-8")
    allowed = lint([str(design)], registry=registry)
    assert allowed.designs[0].errors == [] and allowed.designs[0].findings == []
    # confined likewise: the root allows its own folder, not its parent's
    design.write_text(design.read_text(encoding="utf-8").replace(
        "../team-parts/orchard-parts.yaml", "../team-parts/../elsewhere.yaml"), encoding="utf-8")
    [err] = lint([str(design)], registry=registry).designs[0].errors
    assert "escapes the repository" in str(err) and "or the library roots" in str(err)


# --- schemas for a user's repository ----------------------------------------------------------

def test_schema_write_puts_the_schemas_where_designs_can_name_them(tmp_path):
    result = CliRunner().invoke(app, ["schema", "--write", str(tmp_path / "schemas")])
    assert result.exit_code == 0, result.output
    for which in ("design", "parts", "policy", "report"):
        written = json.loads((tmp_path / "schemas" / f"{which}.schema.json").read_text("utf-8"))
        assert written == json_schema(which)
        shipped = json.loads((REPO / "schemas" / f"{which}.schema.json").read_text("utf-8"))
        assert written == shipped
    assert "$schema=" in result.output
    one = CliRunner().invoke(app, ["schema", "parts", "--write", str(tmp_path / "one")])
    assert one.exit_code == 0 and [p.name for p in (tmp_path / "one").iterdir()] == ["parts.schema.json"]


def test_since_reads_the_netlist_as_it_was(tmp_path):
    """A schematic change alone is judged too: the netlist is taken from the revision with the
    designs, so a symbol that loses its part id is a new finding."""
    from test_baseline import cli, git

    repo = make_repo(tmp_path)
    git("init", "-q", "-b", "main", cwd=repo)
    git("add", "-A", cwd=repo)
    git("commit", "-q", "-m", "rev A", cwd=repo)
    variant(repo / "tests/data/kicad-protect1s/protect1s.net",
            ('        (field (name "packwarden-part") "RES-2K0"))', '        )'),
            ('(property (name "packwarden-part") (value "RES-2K0"))', ""))
    proc = cli("check", "--since", "HEAD", "tests/data/kicad/protect1s.yaml", cwd=repo)
    # R2 (VM to P-) drops out of the review: it is listed, and what its absence means follows
    # unchanged: J1's unreviewed-component and the charger window no thermistor enforces
    assert "3 new, 2 unchanged (not shown), 0 fixed" in proc.stderr, proc.stderr
    new = [ln.split(" (design ")[0] for ln in proc.stdout.splitlines() if ": error " in ln or ": warning " in ln]
    assert [ln.split(": ", 2)[:2] for ln in new] == [
        ["tests/data/kicad-protect1s/protect1s.net:84:5", "warning unreviewed-component"],
        ["tests/data/kicad-protect1s/protect1s.net:94:5", "warning single-connection-net"],
        ["tests/data/kicad-protect1s/protect1s.net:94:5", "error trip-current-window"]]
    assert "R2 (2 kΩ) has no part id" in new[0] and "it connects to VM (pin 1), P- (pin 2)" in new[0]
