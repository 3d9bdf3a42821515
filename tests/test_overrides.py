"""A base design plus changes by YAML path: the data it gives, and where each value is located."""

from __future__ import annotations

import pytest

from packwarden.loader import Position, load_text
from packwarden.overrides import Override, OverrideError, apply_overrides, parse_path

BASE = """\
format: packwarden/1
pack:
  ambient: {min: -20 °C, max: 55 °C}
components:
  R2: {part: RES-2K0, pins: [VM, P-]}
  U1:
    part: OR-GUARD-1S
    pins: {supply: VDD, sense: VM}
waivers:
  - {rule: a, reason: first}
  - {rule: b, reason: second}
  - {rule: c, reason: third}
"""


def _base():
    return load_text(BASE, "base.yaml")


def _apply(*overrides: Override):
    return apply_overrides(_base(), overrides)


def test_set_add_and_delete_change_the_data_and_nothing_else() -> None:
    doc = _apply(Override("set", "components.R2.part", "RES-100"),
                 Override("add", "components.W1", {"kind": "wire", "pins": ["B-", "P-"]}),
                 Override("delete", "components.U1.pins.sense"),
                 Override("add", "components.R2.pins.2", "B-"))
    base = _base().data
    assert doc.data["components"]["R2"] == {"part": "RES-100", "pins": ["VM", "P-", "B-"]}
    assert doc.data["components"]["W1"] == {"kind": "wire", "pins": ["B-", "P-"]}
    assert doc.data["components"]["U1"]["pins"] == {"supply": "VDD"}
    assert list(doc.data["components"]) == ["R2", "U1", "W1"]  # a new key goes last
    assert doc.data["pack"] == base["pack"] and doc.data["waivers"] == base["waivers"]


def test_the_base_document_is_left_as_it_was() -> None:
    base = _base()
    value = {"kind": "wire"}
    doc = apply_overrides(base, [Override("delete", "components.R2"),
                                 Override("add", "components.W1", value)])
    assert "R2" in base.data["components"] and "W1" not in base.data["components"]
    value["kind"] = "trace"  # the case's value is copied, not shared between runs
    assert doc.data["components"]["W1"] == {"kind": "wire"}


def test_a_replaced_value_keeps_the_position_of_the_text_it_replaced() -> None:
    base = _base()
    doc = apply_overrides(base, [Override("set", "components.R2.part", "RES-100")])
    path = ("components", "R2", "part")
    assert doc.positions[path] == base.positions[path] == Position(5, 14)
    assert doc.key_positions[path] == base.key_positions[path]
    assert doc.positions == base.positions  # no other value moved


def test_a_new_value_points_at_the_key_of_its_nearest_ancestor_in_the_base() -> None:
    doc = _apply(Override("add", "components.W1", {"kind": "wire", "pins": ["B-", "P-"]}))
    components_key = Position(4, 1)  # the line "components:"
    assert doc.where(("components", "W1")) == components_key
    assert doc.where(("components", "W1", "pins", 1)) == components_key
    assert doc.where(("components", "W1"), key=True) == components_key


def test_a_set_value_keeps_base_positions_where_the_base_has_the_same_path() -> None:
    base = _base()
    doc = apply_overrides(base, [Override("set", "components.R2",
                                          {"kind": "resistor", "value": "100 Ω", "pins": ["VM"]})])
    first_pin = ("components", "R2", "pins", 0)
    assert doc.positions[first_pin] == base.positions[first_pin]
    # "value" is new inside R2: it points at R2's key
    assert doc.where(("components", "R2", "value")) == base.key_positions[("components", "R2")]
    assert ("components", "R2", "part") not in doc.positions
    assert ("components", "R2", "pins", 1) not in doc.positions


def test_paths_name_places_in_the_base_even_after_a_deletion_shifts_a_list() -> None:
    base = _base()
    doc = apply_overrides(base, [Override("delete", "waivers.0"), Override("delete", "waivers.2")])
    assert doc.data["waivers"] == [{"rule": "b", "reason": "second"}]
    # the one left is the base's second item, and is located there
    assert doc.where(("waivers", 0, "rule")) == base.positions[("waivers", 1, "rule")]
    assert ("waivers", 1) not in doc.positions


@pytest.mark.parametrize("override, message", [
    (Override("set", "components.Q1.part", "X"),
     "the base design has no 'Q1' in components (it has: R2, U1)"),
    (Override("set", "components.U1.pins.sens", "X"),
     "no 'sens' in components.U1.pins (did you mean 'sense'?)"),
    (Override("delete", "charger"), "the base design has no 'charger' in the design"),
    (Override("add", "components.R2", {}), "already has this; use set to change it"),
    (Override("add", "components.R2.pins.5", "B-"), "add appends to a list: name index 2"),
    (Override("set", "components.R2.pins.x", "B-"), "components.R2.pins is a list; name an item"),
    (Override("set", "components.R2.pins.2", "B-"), "has 2 item(s); there is no index 2"),
    (Override("set", "components.R2.part.grade", "X"), "components.R2.part is a single value"),
    (Override("rename", "components.R2", "R3"), "unknown action; use one of: set, add, delete"),
])
def test_a_change_that_does_not_fit_the_base_says_why(override: Override, message: str) -> None:
    with pytest.raises(OverrideError) as info:
        _apply(override)
    assert message in str(info.value)


def test_the_error_names_where_the_change_is_written() -> None:
    with pytest.raises(OverrideError, match=r"^cases/x\.yaml:7: set components\.Q1\.part: "):
        _apply(Override("set", "components.Q1.part", "X", source="cases/x.yaml:7"))


def test_overlapping_changes_are_refused_since_their_order_would_matter() -> None:
    with pytest.raises(OverrideError, match=r"delete components\.R2: overlaps 'set "
                                            r"components\.R2\.part = 'X'' \(c\.yaml:3\)"):
        _apply(Override("set", "components.R2.part", "X", "c.yaml:3"),
               Override("delete", "components.R2", source="c.yaml:4"))


@pytest.mark.parametrize("text", ["", "components..Q1", ".pack", "pack."])
def test_a_path_with_an_empty_segment_is_refused(text: str) -> None:
    with pytest.raises(ValueError, match="is not a dotted YAML path"):
        parse_path(text)
