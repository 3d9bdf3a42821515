"""What the loader keeps between loads (plain scalars' values by their text, positions by line
and column) changes nothing it reads or refuses: a load after others gives the data, the
positions and the errors of a load with nothing kept.

Outside facts: YAML 1.1 reads ``no`` and ``012`` as a boolean and an integer (YAML 1.1 type
repository, https://yaml.org/type/bool.html and /int.html); the loader keeps them text, kept or
not.
"""

from __future__ import annotations

from pathlib import Path

import pytest

import packwarden.loader as loader
from packwarden.loader import InputError, load_text

EXAMPLES = Path(__file__).resolve().parents[1] / "example_designs"


def fresh(text: str):
    loader._PLAIN.clear()
    loader._POSITIONS.clear()
    return load_text(text, "f.yaml")


def seen(doc) -> tuple:
    """Data with every value's type, and the positions."""
    def typed(x):
        if isinstance(x, dict):
            return {k: typed(v) for k, v in x.items()}
        if isinstance(x, list):
            return [typed(v) for v in x]
        return (type(x).__name__, repr(x))
    return typed(doc.data), doc.positions, doc.key_positions


def test_a_load_after_others_reads_what_a_fresh_load_reads():
    texts = [p.read_text(encoding="utf-8") for p in sorted(EXAMPLES.rglob("*.yaml"))]
    alone = [seen(fresh(t)) for t in texts]
    for t in texts:  # every value and place kept from the others
        load_text(t, "f.yaml")
    assert [seen(load_text(t, "f.yaml")) for t in texts] == alone


@pytest.mark.parametrize("text, value", [
    ("a: 12\nb: '12'\nc: 12\n", {"a": 12, "b": "12", "c": 12}),
    ("a: no\nb: 012\nc: -0.0\nd: 0.0\n", {"a": "no", "b": "012", "c": -0.0, "d": 0.0}),
    ("a: ~\nb: !!str ~\nc: ''\nd: null\n", {"a": None, "b": "~", "c": "", "d": None}),
    ("a: true\nb: 'true'\nc: ! true\n", {"a": True, "b": "true", "c": "true"}),
])
def test_a_kept_plain_value_is_read_only_where_the_text_is_plain(text, value):
    for _ in range(2):
        data = load_text(text, "f.yaml").data
        assert data == value
        assert [repr(v) for v in data.values()] == [repr(v) for v in value.values()]


def test_a_refused_value_is_refused_again_where_it_is_written():
    load_text("a: 1\n", "f.yaml")
    for line in (1, 3):
        text = "\n" * (line - 1) + "a: 1" + "0" * 5000 + "\n"
        with pytest.raises(InputError) as caught:
            load_text(text, "f.yaml")
        assert (caught.value.line, caught.value.column) == (line, 4)
