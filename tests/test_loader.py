"""The strict YAML loader: what it reads, what it refuses (exact message and place), its limits.

Outside facts checked here, with their sources:

* YAML 1.1 reads ``no``, ``on``, ``1:30`` (sexagesimal) and ``012`` (octal) as a boolean and
  integers: YAML 1.1 type repository, https://yaml.org/type/bool.html and /int.html. The loader
  must not.
* ``EF BB BF`` is the UTF-8 byte-order mark, ``FF FE``/``FE FF`` the UTF-16 ones and
  ``FF FE 00 00`` the UTF-32LE one: The Unicode Standard, section 23.8 (Specials, U+FEFF).
"""

import os

import pytest
from hypothesis import given, settings, strategies as st

import packwarden.loader as loader
from packwarden.loader import InputError, Position, decode, load_file, load_text


def refused(text: str) -> InputError:
    with pytest.raises(InputError) as caught:
        load_text(text, "f.yaml")
    return caught.value


def refused_bytes(raw: bytes) -> InputError:
    with pytest.raises(InputError) as caught:
        decode(raw, "f.yaml")
    return caught.value


# --- duplicate keys -----------------------------------------------------------------------------

def test_duplicate_top_level_key_names_both_lines():
    err = refused("format: packwarden/1\nload: {continuous: 1 A}\npack: {}\nload: {continuous: 2 A}\n")
    assert str(err) == "f.yaml:4:1: duplicate key 'load' (first on line 2)"


def test_duplicate_nested_key_names_both_lines():
    err = refused("charger:\n  current: 0.8 A\n  voltage: 4.2 V\n  current: 0.9 A\n")
    assert (err.line, err.column) == (4, 3)
    assert err.message == "duplicate key 'current' (first on line 2)"


def test_duplicate_key_in_a_flow_mapping():
    assert str(refused("peak: {current: 1 A, current: 2 A}\n")) == \
        "f.yaml:1:22: duplicate key 'current' (first on line 1)"


def test_quoted_and_plain_spellings_of_a_key_are_the_same_key():
    assert refused("'1': a\n1: b\n").message == "duplicate key '1' (first on line 1)"


# --- scalars ------------------------------------------------------------------------------------

@pytest.mark.parametrize("text", ["no", "No", "off", "on", "yes", "y", "n", "1:30", "012", "0x1F",
                                  "0o17", "1_000", "2024-01-01", ".5", "5.", ".infx"])
def test_yaml11_look_alikes_stay_text(text):
    # YAML 1.1 type repository [published] would make these booleans, numbers or dates.
    assert load_text(f"a: {text}\n", "f.yaml").data == {"a": text}


@pytest.mark.parametrize("text,value", [
    ("1", 1), ("-2", -2), ("+3", 3), ("0", 0), ("2.5", 2.5), ("-0.25", -0.25), ("1e5", 1e5),
    ("1.5e-3", 1.5e-3), ("true", True), ("false", False), ("True", True), ("FALSE", False),
    ("null", None), ("~", None), ("", None),
])
def test_plain_numbers_booleans_and_null(text, value):
    data = load_text(f"a: {text}\n", "f.yaml").data
    assert data == {"a": value} and type(data["a"]) is type(value)


@pytest.mark.parametrize("text", ["'12'", '"true"', "'null'", "!!str 12", "!!str true", "! 12"])
def test_quoted_or_str_tagged_values_are_text(text):
    value = load_text(f"a: {text}\n", "f.yaml").data["a"]
    assert isinstance(value, str) and value in ("12", "true", "null")


def test_keys_are_always_text():
    assert load_text("1: a\ntrue: b\nno: c\n~: d\n", "f.yaml").data == \
        {"1": "a", "true": "b", "no": "c", "~": "d"}


@pytest.mark.parametrize("text,message", [
    ("a: .inf\n", "f.yaml:1:4: '.inf' is not a finite number"),
    ("a: -.Inf\n", "f.yaml:1:4: '-.Inf' is not a finite number"),
    ("a: .NaN\n", "f.yaml:1:4: '.NaN' is not a finite number"),
    ("a: 1e999\n", "f.yaml:1:4: '1e999' is too large to be a finite number"),
    ("a: -1e999\n", "f.yaml:1:4: '-1e999' is too large to be a finite number"),
    ("a: " + "9" * 5000 + "\n", "f.yaml:1:4: a number of 5000 digits is too long"),
])
def test_numbers_no_physical_quantity_has(text, message):
    assert str(refused(text)) == message


def test_a_long_but_convertible_integer_is_still_a_number():
    assert load_text("a: " + "9" * 400 + "\n", "f.yaml").data["a"] == 10 ** 400 - 1


# --- aliases, merge keys, tags ------------------------------------------------------------------

def test_alias_is_refused_where_it_is_written():
    err = refused("ambient: &range {min: -20 °C, max: 55 °C}\nwindow: *range\n")
    assert str(err) == "f.yaml:2:9: alias '*range' is not allowed; write the value out"


def test_alias_to_a_scalar_is_refused():
    assert str(refused("a: &x 1\nb: [2, *x]\n")) == \
        "f.yaml:2:8: alias '*x' is not allowed; write the value out"


def test_an_anchor_alone_is_harmless():
    assert load_text("a: &x 1\nb: 2\n", "f.yaml").data == {"a": 1, "b": 2}


def test_recursive_alias_is_refused():
    assert str(refused("a: &a [*a]\n")) == "f.yaml:1:8: alias '*a' is not allowed; write the value out"


@pytest.mark.parametrize("text,where", [
    ("base: &b {p: 1}\nc:\n  <<: *b\n  q: 2\n", (3, 3)),
    ("c:\n  <<: {p: 1}\n  q: 2\n", (2, 3)),
    ("c:\n  <<: [{p: 1}, {q: 2}]\n", (2, 3)),
    ("c: {<<: {p: 1}}\n", (1, 5)),
])
def test_merge_keys_are_refused(text, where):
    err = refused(text)
    assert (err.line, err.column) == where
    assert err.message == "merge keys (<<) are not allowed; write the keys out"


def test_a_quoted_double_angle_key_is_just_a_key():
    assert load_text("c: {'<<': 1}\n", "f.yaml").data == {"c": {"<<": 1}}


@pytest.mark.parametrize("text,message", [
    ("a: !!python/object/apply:os.system ['echo owned']\n",
     "f.yaml:1:4: YAML tag '!!python/object/apply:os.system' is not allowed"),
    ("a: !!python/name:os.system\n", "f.yaml:1:4: YAML tag '!!python/name:os.system' is not allowed"),
    ("a: !!binary aGVsbG8=\n", "f.yaml:1:4: YAML tag '!!binary' is not allowed"),
    ("a: !!set {x, y}\n", "f.yaml:1:4: YAML tag '!!set' is not allowed"),
    ("a: !foo bar\n", "f.yaml:1:4: YAML tag '!foo' is not allowed"),
    ("a: !m {x: 1}\n", "f.yaml:1:4: YAML tag '!m' is not allowed"),
    ("!foo a: 1\n", "f.yaml:1:1: YAML tag '!foo' is not allowed"),
    ("a: !!int '12'\n", "f.yaml:1:4: YAML tag '!!int' is not allowed; write the value plainly"),
    ("a: !!bool yes\n", "f.yaml:1:4: YAML tag '!!bool' is not allowed; write the value plainly"),
    ("%TAG !e! tag:example.com,2000:\n---\na: !e!foo 1\n",
     "f.yaml:3:4: YAML tag 'tag:example.com,2000:foo' is not allowed"),
])
def test_tags_are_refused(text, message):
    assert str(refused(text)) == message


def test_a_python_tag_runs_nothing(monkeypatch):
    calls = []
    monkeypatch.setattr(os, "system", lambda *a: calls.append(a) or 0)
    refused("a: !!python/object/apply:os.system ['echo owned']\n")
    assert calls == []


# --- layout and syntax --------------------------------------------------------------------------

@pytest.mark.parametrize("text,where", [("a:\n\tb: 1\n", (2, 1)), ("a: 1\nb:\n  c: 2\n\t  d: 3\n", (4, 1))])
def test_tab_indentation_is_refused(text, where):
    err = refused(text)
    assert (err.line, err.column) == where
    assert err.message == "YAML syntax error: a tab character cannot indent YAML; use spaces"


def test_a_tab_after_a_colon_is_only_a_separator():
    assert load_text("a:\t1\n", "f.yaml").data == {"a": 1}


@pytest.mark.parametrize("text,message", [
    ("a: [1, 2\nb: 3\n",
     "f.yaml:2:2: YAML syntax error: did not find expected ',' or ']' in the [...] that starts on line 1"),
    ("a: b: c\n", "f.yaml:1:5: YAML syntax error: mapping values are not allowed in this context"),
    ("a: 1\n---\nb: 2\n",
     "f.yaml:2:1: a second YAML document ('---') in the file; one file holds one design or library"),
    ("? [a, b]\n: 1\n", "f.yaml:1:3: mapping keys must be plain text"),
])
def test_syntax_errors(text, message):
    assert str(refused(text)) == message


@pytest.mark.parametrize("text", ["", "   \n\n", "# only a comment\n", "---\n", "\ufeff"])
def test_empty_files(text):
    assert str(refused(text)) == "f.yaml:1:1: empty file"


@pytest.mark.parametrize("char", ["\x01", "\x07", "\x1b", "\x7f"])
def test_control_characters_are_refused_with_their_place(char):
    err = refused(f"a: 1\nbé: x{char}y\n")
    assert (err.line, err.column) == (2, 6)
    assert err.message == (f"character U+{ord(char):04X} cannot appear in a YAML file "
                           f"(control or non-printing character)")


# --- encodings ----------------------------------------------------------------------------------

def test_utf8_bom_is_accepted(tmp_path):
    # Unicode 23.8 [published]: EF BB BF is U+FEFF in UTF-8.
    path = tmp_path / "d.yaml"
    path.write_bytes(b"\xef\xbb\xbfformat: packwarden/1\nname: x\n")
    doc = load_file(path, "d.yaml")
    assert doc.data == {"format": "packwarden/1", "name": "x"}
    assert doc.where(("name",)) == Position(2, 7)


@pytest.mark.parametrize("encoding,message", [
    ("utf-16", "file is UTF-16; save it as UTF-8"),
    ("utf-16-be", "file looks like UTF-16 (no byte-order mark); save it as UTF-8"),
    ("utf-16-le", "file looks like UTF-16 (no byte-order mark); save it as UTF-8"),
    ("utf-32", "file is UTF-32; save it as UTF-8"),
])
def test_utf16_and_utf32_are_refused(encoding, message):
    err = refused_bytes("format: packwarden/1\nname: Orchard\n".encode(encoding))
    assert str(err) == f"f.yaml:1:1: {message}"


def test_utf16_with_a_big_endian_bom():
    assert refused_bytes(b"\xfe\xff" + "a: 1\n".encode("utf-16-be")).message == \
        "file is UTF-16; save it as UTF-8"


@pytest.mark.parametrize("raw,where,byte", [
    (b"a: 1\nbb: \xff\n", (2, 5), 0xFF),
    (b"name: caf\xe9\n", (1, 10), 0xE9),          # Latin-1 e-acute
    (b"x: \xc3\xa9\xff\n", (1, 5), 0xFF),          # column in characters, after a valid e-acute
    (b"a: \xc0\xaf\n", (1, 4), 0xC0),              # overlong encoding of '/'
    (b"a: \xe2\x82\n", (1, 4), 0xE2),              # truncated sequence
])
def test_invalid_utf8_with_line_and_column(raw, where, byte):
    err = refused_bytes(raw)
    assert (err.line, err.column) == where
    assert err.message == f"invalid UTF-8 byte 0x{byte:02x}"


def test_nul_byte_with_line_and_column():
    err = refused_bytes(b"a: 1\nb: x\x00y\n")
    assert str(err) == "f.yaml:2:5: binary data (NUL byte) in a YAML file"


# --- limits -------------------------------------------------------------------------------------

def nested(n: int) -> str:
    return "a: " + "[" * n + "]" * n + "\n"


def test_nesting_at_the_limit_is_read():
    data = load_text(nested(loader.MAX_DEPTH), "f.yaml").data
    depth, node = 0, data["a"]
    while node:
        depth, node = depth + 1, node[0]
    assert depth == loader.MAX_DEPTH - 1  # the innermost list is empty


def test_nesting_beyond_the_limit_is_refused():
    err = refused(nested(loader.MAX_DEPTH + 1))
    assert str(err) == f"f.yaml:1:{4 + loader.MAX_DEPTH}: nesting deeper than {loader.MAX_DEPTH} levels"


def test_nesting_limit_applies_to_block_mappings(monkeypatch):
    monkeypatch.setattr(loader, "MAX_DEPTH", 3)
    load_text("a:\n  b:\n    c: 1\n", "f.yaml")
    err = refused("a:\n  b:\n    c:\n      d: 1\n")
    assert str(err) == "f.yaml:4:7: nesting deeper than 3 levels"


def test_nesting_far_beyond_the_parser_limit_is_refused_in_the_same_words():
    assert refused(nested(20_000)).message == f"nesting deeper than {loader.MAX_DEPTH} levels"


def test_node_count_limit(monkeypatch):
    monkeypatch.setattr(loader, "MAX_NODES", 4)
    assert load_text("[1, 2, 3]\n", "f.yaml").data == [1, 2, 3]  # the list and three items
    monkeypatch.setattr(loader, "MAX_NODES", 3)
    err = refused("[1, 2, 3]\n")
    assert str(err) == ("f.yaml:1:8: more than 3 YAML nodes (keys and values); the file is too "
                        "large to check")


def test_node_flood_is_refused_before_any_node_is_built(monkeypatch):
    monkeypatch.setattr(loader, "MAX_NODES", 100)
    monkeypatch.setattr(loader.yaml, "compose", _must_not_compose)
    assert refused("a: [" + ", ".join(["1"] * 200) + "]\n").message.startswith("more than 100 YAML")


def test_billion_laughs_is_refused_at_its_first_alias_before_anything_expands(monkeypatch):
    monkeypatch.setattr(loader.yaml, "compose", _must_not_compose)
    bomb = "lol0: &lol0 [lol, lol, lol, lol, lol, lol, lol, lol, lol]\n" + "".join(
        f"lol{i}: &lol{i} [" + ", ".join([f"*lol{i - 1}"] * 9) + "]\n" for i in range(1, 10))
    assert str(refused(bomb)) == "f.yaml:2:14: alias '*lol0' is not allowed; write the value out"


def _must_not_compose(*args, **kwargs):
    raise AssertionError("the loader composed nodes for input it should have refused first")


def test_size_limit_on_files(monkeypatch, tmp_path):
    monkeypatch.setattr(loader, "MAX_BYTES", 64)
    path = tmp_path / "big.yaml"
    path.write_text("a: " + "x" * 62 + "\n", encoding="utf-8")  # 66 bytes
    with pytest.raises(InputError) as caught:
        load_file(path, "big.yaml")
    assert str(caught.value) == "big.yaml:1:1: file is 66 bytes; the limit is 64 bytes"
    path.write_text("a: " + "x" * 60 + "\n", encoding="utf-8")  # 64 bytes: at the limit
    assert load_file(path, "big.yaml").data == {"a": "x" * 60}


def test_size_limit_on_bytes(monkeypatch):
    monkeypatch.setattr(loader, "MAX_BYTES", 8)
    assert refused_bytes(b"a: 123456\n").message == "file is 10 bytes; the limit is 8 bytes"


def test_missing_file_and_directory(tmp_path):
    with pytest.raises(InputError) as caught:
        load_file(tmp_path / "nope.yaml", "nope.yaml")
    assert str(caught.value) == "nope.yaml:1:1: no such file"
    with pytest.raises(InputError) as caught:
        load_file(tmp_path, "somewhere")
    assert str(caught.value) == "somewhere:1:1: is a directory, not a YAML file"


# --- positions ----------------------------------------------------------------------------------

DOC = """\
format: packwarden/1
design: {name: Orchard, revision: C}
load:
  continuous: 1.2 A
  peak:
    current: 1.6 A
components:
  R1: {kind: resistor, pins: [B+, VDD]}
"""


def test_positions_of_values_and_keys():
    doc = load_text(DOC, "d.yaml")
    assert doc.where(("format",)) == Position(1, 9)
    assert doc.where(("format",), key=True) == Position(1, 1)
    assert doc.where(("design", "revision")) == Position(2, 35)
    assert doc.where(("design", "revision"), key=True) == Position(2, 25)
    assert doc.where(("load", "continuous")) == Position(4, 15)
    assert doc.where(("load", "peak")) == Position(6, 5)       # a block mapping starts at its key
    assert doc.where(("load", "peak"), key=True) == Position(5, 3)
    assert doc.where(("load", "peak", "current")) == Position(6, 14)
    assert doc.where(("components", "R1", "pins", 1)) == Position(8, 35)
    assert doc.where(("components", "R1"), key=True) == Position(8, 3)


def test_positions_count_characters_not_bytes():
    doc = load_text("ambient: {min: -20 °C, max: 55 °C}\n", "d.yaml")
    assert doc.where(("ambient", "max")) == Position(1, 29)


def test_a_path_the_file_lacks_falls_back_to_its_nearest_ancestor():
    doc = load_text(DOC, "d.yaml")
    assert doc.where(("load", "peak", "duration")) == Position(6, 5)
    assert doc.where(("charger", "current")) == Position(1, 1)
    err = doc.error(("load", "peak", "duration"), "missing")
    assert str(err) == "d.yaml:6:5: missing"


def test_an_error_message_is_always_one_line():
    # a key or value can hold a newline (quoted, or in a block scalar); the printed line may not
    err = InputError("d.yaml", 3, 1, "duplicate key 'a\nb' (first on line 1)\x07")
    assert str(err) == "d.yaml:3:1: duplicate key 'a\\nb' (first on line 1)\\x07"
    assert "\n" not in str(refused('"a\\nb": 1\n"a\\nb": 2\n'))


# --- anything at all ----------------------------------------------------------------------------

YAMLISH = st.text(alphabet=st.sampled_from(list("ab01.-:,[]{}&*!|>'\"#%@`?~<= \n\t") +
                                           ["°", "Ω", "µ", "\x00", "\x07", "\ufeff", "\u2028"]),
                  max_size=60)


@given(YAMLISH)
@settings(max_examples=500, deadline=None)
def test_any_text_loads_or_gives_one_input_error(text):
    try:
        load_text(text, "f.yaml")
    except InputError as exc:
        assert exc.line >= 1 and exc.column >= 1
        assert "\n" not in str(exc)


@given(st.binary(max_size=80))
@settings(max_examples=300, deadline=None)
def test_any_bytes_decode_or_give_one_input_error(raw):
    try:
        text = decode(raw, "f.yaml")
    except InputError as exc:
        assert exc.line >= 1 and exc.column >= 1
    else:
        assert "\x00" not in text
