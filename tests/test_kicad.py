"""The KiCad netlist reader, against netlists KiCad wrote and hand-made ones in the newer shapes.

tests/data/kicad-protect1s/protect1s.net was written by KiCad 6.0.11's schematic editor itself
(see its README.md): what it holds is checked against that README, not against this reader.
tests/data/kicad/*.net are hand-made in the shape KiCad 8 and 9 write (elements those versions
add: footprint, datasheet, description, units, component_classes, textvars, net classes, the
"no_connect" pin type) [memory of KiCad 8/9 netlist exports].
"""

from __future__ import annotations

from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from packwarden.kicad import build, net_name, parse, read_netlist
from packwarden.loader import InputError

DATA = Path(__file__).parent / "data"
KICAD6 = DATA / "kicad-protect1s" / "protect1s.net"
KICAD9 = DATA / "kicad" / "protect1s-kicad9.net"
KICAD8 = DATA / "kicad" / "pack16s.net"


def test_kicad_6_netlist_as_its_readme_describes_it():
    net = read_netlist(KICAD6, "protect1s.net")
    # README: BT1, U1, Q1, R1, C1, R2, F1 with part ids in 'packwarden-part'; J1 without one.
    assert sorted(net.components) == ["BT1", "C1", "F1", "J1", "Q1", "R1", "R2", "U1"]
    part = {ref: s.field_value("packwarden-part") for ref, s in net.components.items()}
    assert part == {"BT1": "OR-CELL-3400", "U1": "OR-GUARD-1S", "Q1": "OR-FET-D20",
                    "R1": "RES-470", "C1": "CAP-100N", "R2": "RES-2K0", "F1": "OR-FUSE-12A",
                    "J1": None}
    # README: F1's value `12 A "fast"` and Note `path C:\lib\fuse`, written with \" and \\.
    assert net.components["F1"].value == '12 A "fast"'
    assert net.components["F1"].field_value("Note") == "path C:\\lib\\fuse"
    assert net.components["R1"].field_value("MPN") == "XR-R470-0603"
    assert net.components["R2"].value == "2 kΩ"  # UTF-8 as written
    # README: nets named by local labels, which KiCad writes with a leading "/".
    assert [n.name for n in net.nets] == ["B+", "B-", "CG", "DG", "MID", "P+", "P-", "VDD", "VM"]
    j1 = [(node.pin, node.function, name) for node, name in net.pins_of("J1")]
    assert j1 == [("1", "Pin_1", "P+"), ("2", "Pin_2", "P-")]
    # where each component starts in the file: `(comp (ref "BT1")` is line 23, column 5
    lines = KICAD6.read_text(encoding="utf-8").splitlines()
    for ref, sym in net.components.items():
        assert lines[sym.line - 1][sym.column - 1:].startswith(f'(comp (ref "{ref}")')


def test_kicad_9_shape_newer_elements_escapes_and_generated_names():
    net = read_netlist(KICAD9, "k9.net")
    assert sorted(net.components) == ["BT1", "C1", "F1", "J1", "Q1", "R1", "R2", "U1"]
    f1 = net.components["F1"]
    assert f1.value == "12 A\ttime-lag"  # a raw tab inside a string is kept
    assert f1.field_value("Note") == 'größer "träge" – see C:\\lib\\fuse'
    assert f1.footprint == "pw:Fuse_1206"
    names = [n.name for n in net.nets]
    assert "DSG/GATE" in names  # "/DSG{slash}GATE": label on the root sheet, '/' escaped
    assert "Net-(Q1-D)" in names and "Net-(U1-VM)" in names
    assert "unconnected-(U1-NC-Pad6)" in names
    # pin numbers are text: "01" stays "01"
    assert [node.pin for node, _ in net.pins_of("J1")] == ["01", "02"]
    [(nc, _)] = [(n, name) for n, name in net.pins_of("U1") if n.pin == "6"]
    assert nc.no_connect


def test_kicad_8_shape():
    net = read_netlist(KICAD8, "pack16s.net")
    assert len(net.components) == 9
    assert net.components["J2"].field_value("packwarden-part") is None
    assert net.components["U1"].field_value("PACKWARDEN-PART") == "RL-GUARD-16S"  # any case
    assert len(net.pins_of("U1")) == 22


@pytest.mark.parametrize("raw, shown", [
    ("/B+", "B+"),                          # local label on the root sheet
    ("/power/VBAT", "power/VBAT"),          # a label in a sub-sheet keeps its sheet
    ("GND", "GND"),                         # global label or power symbol
    ("/CELL{slash}TAP", "CELL/TAP"),
    ("/A{lt}B{gt}", "A<B>"),
    ("Net-(Q1-Pad7)", "Net-(Q1-Pad7)"),     # KiCad's generated names are kept
    ("unconnected-(U1-Pad6)", "unconnected-(U1-Pad6)"),
    ("/", "/"),
])
def test_net_names_as_the_schematic_shows_them(raw, shown):
    assert net_name(raw) == shown


def _error(text: str) -> str:
    with pytest.raises(InputError) as info:
        build(parse(text, "x.net"), "x.net")
    return str(info.value)


def test_a_truncated_netlist_is_one_located_error(tmp_path):
    text = KICAD6.read_text(encoding="utf-8")
    cut = text[:text.index('(comp (ref "Q1")') + 10]  # the export stops inside Q1's entry
    path = tmp_path / "cut.net"
    path.write_text(cut, encoding="utf-8")
    with pytest.raises(InputError) as info:
        read_netlist(path, "cut.net")
    lines = cut.splitlines()
    assert str(info.value) == (f"cut.net:{len(lines)}:{len(lines[-1]) + 1}: the file ends inside "
                               f"(ref ...) opened at 62:11 (4 ')' missing): truncated, or a ')' "
                               f"left out")


def test_a_missing_parenthesis_is_reported_where_it_shows():
    text = KICAD6.read_text(encoding="utf-8")
    # C1's entry loses its closing ')': F1's entry then sits inside C1's
    broken = text.replace('(tstamps "6c6500f0-0439-5150-ae6d-9f313156bac4"))',
                          '(tstamps "6c6500f0-0439-5150-ae6d-9f313156bac4")', 1) + ")"
    assert _error(broken) == ("x.net:43:5: (comp ...) inside (comp ...) opened at 33:5: a ')' is "
                              "missing before here")


def test_a_parenthesis_too_many():
    text = KICAD6.read_text(encoding="utf-8")
    # one ')' too many after C1's value closes the outer list early, on line 103 of 170
    broken = text.replace('(value "100 nF")', '(value "100 nF"))', 1)
    assert _error(broken) == ("x.net:104:3: text after the end of the netlist's outer list, closed "
                              "at 103:56: a ')' too many before there?")
    assert _error('(export (version "E"))\n)') == "x.net:2:1: ')' closes a list that was never opened"


@pytest.mark.parametrize("text, message", [
    ("", "x.net:1:1: empty file: expected a KiCad netlist, (export (version \"E\") ...)"),
    ('(export (version "E") (design (source "a\n', "x.net:1:39: string opened here is never closed"),
    ('(export (version "E"))\n(export)', "x.net:2:1: text after the end of the netlist's outer list, "
                                          "closed at 1:22: a ')' too many before there?"),
    ('EESchema Netlist Version 1.1', "x.net:1:1: 'EESchema' outside the netlist's outer list"),
    ('(kicad_sch (version 20211123))', "x.net:1:1: not a KiCad netlist: expected (export (version "
                                       "\"E\") ...); export the netlist from the schematic editor "
                                       "in KiCad's own format"),
    ('(export (version "Z"))', "x.net:1:9: KiCad netlist version 'Z' is not known here (known: D, E)"),
    ("(" * 100_000, "x.net:1:65: lists nested deeper than 64 levels: not a netlist KiCad writes "
                    "(its deepest is about 6)"),
    ('(export (version "E") (nets (net (code "1") (node (ref "R1") (pin "1")))))',
     "x.net:1:29: net without (name ...)"),
])
def test_broken_netlists(text, message):
    assert _error(text) == message


def test_bare_words_read_as_quoted_strings():
    # KiCad 5 (export version "D") wrote most atoms unquoted; the skeleton is the same [memory]
    net = build(parse("(export (version D)\n (components (comp (ref R1) (value 10k)\n"
                      "  (fields (field (name packwarden-part) RES-470))))\n"
                      " (nets (net (code 1) (name /B+) (node (ref R1) (pin 01)))))", "x.net"), "x.net")
    assert net.components["R1"].field_value("packwarden-part") == "RES-470"
    assert [(node.pin, name) for node, name in net.pins_of("R1")] == [("01", "B+")]


def test_a_netlist_holds_no_more_components_than_a_design():
    comps = "".join(f'(comp (ref "R{k}"))\n' for k in range(20_001))
    assert _error(f'(export (version "E")\n(components\n{comps}))') == (
        "x.net:20003:1: more than 20000 components; a design holds at most 20000")


def test_any_whitespace_between_tokens():
    # form feeds, no-break and other Unicode spaces separate tokens as blanks do
    net = build(parse('(export\f(version\u00a0"E")\u2003(components (comp (ref "R1"))))', "x.net"), "x.net")
    assert list(net.components) == ["R1"]


def test_a_line_break_inside_a_string_keeps_later_positions_right():
    text = '(export (version "E")\n  (components\n    (comp (ref "R1") (value "two\nlines"))\n    (comp (ref "R2"))))'
    net = build(parse(text, "x.net"), "x.net")
    assert net.components["R1"].value == "two\nlines"
    assert (net.components["R2"].line, net.components["R2"].column) == (5, 5)


@settings(max_examples=150, deadline=None)
@given(st.integers(min_value=0, max_value=KICAD6.stat().st_size), st.sampled_from(["", ")", "(", '"', "\\"]))
def test_any_cut_or_stray_character_is_an_input_error(cut, extra):
    text = KICAD6.read_text(encoding="utf-8")
    try:
        build(parse(text[:cut] + extra + text[cut:] if extra else text[:cut], "x.net"), "x.net")
    except InputError as exc:
        assert str(exc).startswith("x.net:")
