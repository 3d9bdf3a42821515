"""The references generated from metadata: ``docs/rules.md`` and ``docs/format.md``.

The rule reference comes from the rule registry: run ``packwarden docs rules`` (or ``python -m
packwarden.docs``) to print it, ``--output FILE`` to write it. Only packwarden's own rules are
documented, so the file does not depend on which team plugins happen to be installed where it is
generated.

The design-format reference comes from the pydantic models of ``schema.py`` (every field's
description, unit and default), the pin tables of ``netlist.py`` and the example designs, behind a
hand-written introduction: ``packwarden docs format`` (``python -m packwarden.docs format``).

``tests/test_docs.py`` fails when a checked-in file differs from what this module renders, when a
built-in rule lacks an example, or when a key of the format lacks a description.
"""

from __future__ import annotations

import datetime
import inspect
import json
import sys
from enum import Enum
from pathlib import Path
from types import UnionType
from typing import Annotated, Any, Iterable, Literal, Union, get_args, get_origin

from .api import Rule
from .headlines import bound_words, headlines
from .kinds import KINDS, NUMBERED_PINS
from .schema import bounds_of, given_model
from .schema import quantity_of as _quantity_of

HEADER = ("<!-- Generated from the rule registry by `packwarden docs rules > docs/rules.md`; "
          "do not edit by hand. -->")

PSEUDO_RULES = [
    ("input-error", "error",
     "a design, part library or configuration file cannot be used",
     "Not a rule of the registry: SARIF and JUnit reports file every input error (YAML syntax, "
     "unknown or missing fields, values without units, a library outside the repository, a bad "
     "configuration) under this id, at the file, line and column to fix. A design with input "
     "errors is not reviewed, and the command exits with code 2."),
]


def shipped_schema(which: str) -> dict:
    """The JSON Schema shipped as ``schemas/{which}.schema.json``: design, parts, policy or
    report (the JSON report's)."""
    if which == "report":  # the JSON report's, beside its formatter
        from .report.json_schema import report_schema
        return report_schema()
    if which == "policy":  # the team policy's model lives with its checks in policy.py
        from .policy import policy_json_schema
        return policy_json_schema()
    from .schema import json_schema
    return json_schema(which)


def builtin_rules(rules: dict[str, Rule]) -> list[Rule]:
    """packwarden's own rules: those registered by the packwarden distribution's entry points."""
    return [rules[rid] for rid in sorted(rules) if rules[rid].origin.startswith("packwarden:")]


def missing_examples(rules: Iterable[Rule]) -> list[str]:
    """Why each rule lacking a failing or a passing example fails the docs check (empty: none)."""
    out = []
    for r in rules:
        if r.example is None:
            out.append(f"{r.id}: no example (give @rule(..., example=Example(bad=..., good=...)))")
        else:
            for which in ("bad", "good"):
                if not getattr(r.example, which).strip():
                    out.append(f"{r.id}: the example's '{which}' fragment is empty")
    return out


def render_rules(rules: Iterable[Rule]) -> str:
    rules = list(rules)
    out = [HEADER, "", "# Rule reference", "",
           "Every built-in rule: its id, default severity, what it checks and why, its options and "
           "a failing and a passing example. Change a rule's severity per project under "
           "`[tool.packwarden.severity]`, its options under `[tool.packwarden.rules.<id>]`; turn "
           "rules off with `ignore = [...]`. `packwarden explain <id>` prints the same text.", "",
           "A rule whose scope is *netlist* checks the netlist itself and always runs; the other "
           "(*electrical*) rules are held back while a design's netlist has integrity errors.", "",
           "Each rule's **waiver bounds** name, for each finding with figures, its headline figure "
           "(the one whose change makes the finding worse) and the bound a waiver puts on it: "
           "`up_to` where the finding worsens as the figure grows, `down_to` where it worsens as "
           "the figure falls; a waiver with the other bound only does not cover the finding. "
           "Read from the rules' own code; `…` stands for what the design fills in (an event's "
           "or a switch's name).", "",
           "| rule | default severity | checks that |", "|---|---|---|"]
    for r in rules:
        out.append(f"| [`{r.id}`](#{r.id}) | {r.severity.value} | {_cell(r.summary)} |")
    for rid, sev, summary, _ in PSEUDO_RULES:
        out.append(f"| [`{rid}`](#{rid}) | {sev} | {_cell(summary)} (reports only) |")
    out.append("")
    for r in rules:
        out += _rule_section(r)
    for rid, sev, summary, text in PSEUDO_RULES:
        out += [f"## {rid}", "", f"**Default severity:** {sev} · **Reports only**", "",
                f"*{_sentence(summary)}*", "", text, ""]
    return "\n".join(out).rstrip("\n") + "\n"


def _rule_section(r: Rule) -> list[str]:
    out = [f"## {r.id}", "",
           f"**Default severity:** {r.severity.value} · **Scope:** {r.scope}", "",
           f"*{_sentence(r.summary)}*", "", r.rationale.strip(), ""]
    fields = r.options.model_fields
    if fields:
        out += [f"**Options** (`[tool.packwarden.rules.{r.id}]`):", "",
                "| option | default | description |", "|---|---|---|"]
        for name, f in fields.items():
            out.append(f"| `{name}` | `{option_default(f)}` | {_cell(f.description or '')} |")
        out.append("")
    else:
        out += ["No options.", ""]
    heads = headlines(r)
    if heads:
        out += ["**Waiver bounds:**", "", "| finding key | headline figure | bound |", "|---|---|---|"]
        out += [f"| `{h.key or '—'}` | {_cell(h.figure)} | {bound_words(h.bound)} |" for h in heads]
        out.append("")
    if r.example is not None:
        out += ["**Fails:**", "", "```yaml", r.example.bad.strip("\n"), "```", "",
                "**Passes:**", "", "```yaml", r.example.good.strip("\n"), "```", ""]
    return out


def option_default(field: Any) -> str:
    """The default as it is written in the project's TOML: quantities with their unit."""
    value = field.default
    unit = quantity_unit(field)
    if unit is not None and isinstance(value, (int, float)) and not isinstance(value, bool):
        from .quantities import format_quantity
        return f'"{format_quantity(value, unit)}"'
    if isinstance(value, bool):
        return "true" if value else "false"
    if hasattr(value, "value") and isinstance(getattr(value, "value"), str):  # an Enum
        value = value.value
    return json.dumps(value, ensure_ascii=False) if isinstance(value, (str, list, dict)) else str(value)


def quantity_unit(field: Any) -> str | None:
    """The unit of a field declared as ``Q(unit)`` (schema.Q is cached: same parser, same unit)."""
    q = _quantity_of(field.metadata)
    return q[1] if q is not None and q[0] == "quantity" else None


def _sentence(text: str) -> str:
    text = text.strip()
    return (text[:1].upper() + text[1:]).rstrip(".") + "."


def _cell(text: str) -> str:
    return " ".join(text.replace("|", "\\|").split())


# --- the design-format reference, docs/format.md ------------------------------------------------

FORMAT_HEADER = ("<!-- Generated from linter/schema.py, linter/netlist.py and example_designs/ by "
                 "`packwarden docs format -o docs/format.md`; do not edit by hand: the "
                 "descriptions live in linter/schema.py, the introduction in linter/docs.py. -->")

#: The example designs the reference quotes; they live in the source checkout beside the package.
EXAMPLES = Path(__file__).resolve().parent.parent / "example_designs"
EXAMPLE_DESIGN = "orchard-probe.yaml"
#: Kinds the library excerpt shows: the ones with the most parameters to copy from a data sheet.
EXCERPT_KINDS = ("cell", "protector", "fet_pair_common_drain")


class DocsError(Exception):
    """The reference cannot be generated (the example designs are missing or unreadable)."""

    def __init__(self, file: str, message: str, line: int = 1, column: int = 1):
        super().__init__(message)
        self.file, self.line, self.column, self.message = file, line, column, message

    def __str__(self) -> str:
        return f"{self.file}:{self.line}:{self.column}: {self.message}"


# Hand-written: what a design file is and how values are written. `<<NAME>>` marks a table the
# generator fills in from the parser itself, so the examples cannot drift from what is accepted.
FORMAT_INTRO = """\
# Design format reference

A **design file** describes one battery pack's protection circuit for review: the conditions it
works in (ambient temperatures, the load, the charger, storage) and a netlist-lite of its
components, each a part from a part library or given inline, with the nets its pins connect to.
`packwarden check` reads it, resolves parts and nets, models the power path at its worst cases and
runs the rules ([rules.md](rules.md)). Part data lives in **part libraries** that a team's designs
share, so a data sheet is copied once.

> packwarden is an aid to design review, not a substitute for it. Lithium cells can vent, burn or
> explode when overcharged, over-discharged, shorted, crushed or overheated. The cell maker's
> instructions, the safety standards (for example IEC 62133-2, UL 2054, UN 38.3 for transport),
> local codes and licensed engineering practice prevail over anything this tool says.

## A design file

```yaml
# yaml-language-server: $schema=../schemas/design.schema.json
format: packwarden/1
design: {name: Orchard soil probe, revision: C}
libraries: [parts/orchard-parts.yaml]        # relative to this file
pack:
  ambient: {min: -20 °C, max: 55 °C}
load:
  continuous: 1.2 A
charger:
  voltage: {typ: 4.20 V, tol: 0.5 %}
  current: 0.8 A
  open_circuit_max: 5.5 V
components:
  BT1: {part: OR-CELL-3400, pins: {pos: B+, neg: B-}}
  R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}   # an inline part
  # ...
```

- **`format: packwarden/1`** names the format and its version, and is required. When
  `packwarden check` is given a folder, it reviews the `.yaml` and `.yml` files in which a line in
  the first 4096 characters reads `format: packwarden/1`. A part library says
  `format: packwarden-parts/1`.
- **The schema line**, `# yaml-language-server: $schema=../schemas/design.schema.json`, lets an
  editor with a YAML language server check the file as you type, complete keys and show each key's
  description on hover. The path is relative to the file and points at the `schemas/` folder of a
  packwarden checkout (or a copy of it); libraries use `parts.schema.json`. `packwarden schema
  design` and `packwarden schema parts` print the same schemas. The line is a comment: the linter
  itself does not need it.
- **Strict YAML.** Unknown keys are errors, and so are duplicate keys (both lines are named). Only
  `true` and `false` are booleans and only plain decimal numbers are numbers: `no`, `on`, `1:30` and
  `012` stay text. Anchors and aliases, merge keys (`<<`) and tags are refused, since they make a
  reviewed file say something its text does not show. Each problem is reported as one line,
  `file:line:column: message`, the run exits with code 2, and the other designs of the run are still
  reviewed.

## Libraries

- `libraries:` lists part library files **relative to the design file**.
- Every library must lie **inside the design's repository**: the nearest folder at or above the
  design that holds `.git`, `pyproject.toml` or `packwarden.toml` (without one, the design's own
  folder). An absolute path, a path that
  climbs out (`../../elsewhere/parts.yaml`) and a link that points outside are refused, so a design
  under review reads no file beyond its own repository.
- A library may **`include:`** other libraries, relative to itself and under the same confinement;
  libraries that include each other in a cycle are refused. Each file is read once per run.
- Part names are unique across all the libraries of a design; a name defined twice is an error
  naming both places. A component uses a part by name (`part: OR-FET-D20`) or gives `kind:` and the
  part's parameters inline.

## Quantities

Values are text with their unit, as data sheets print them: a decimal number, at most one space, an
optional SI prefix (`Y Z E P T G M k m u µ n p f a`) and the unit the field expects, for example
`4.25 V`, `22 mΩ`, `100 nF`, `3 µA`. The unit is checked per field, and a wrong one is named
together with the one expected. Units and prefixes are case-sensitive (`mV` is millivolts, `MV`
megavolts). The micro sign `\u00b5` (U+00B5) and the Greek letter `\u03bc` (U+03BC)
are the same prefix, and the ohm sign `\u2126` (U+2126) and the Greek capital omega
`\u03a9` (U+03A9) the same unit: data sheets use either, and they look alike on screen.
Percentages, temperatures (°C and K), K/W, months, %/month and copper ounces may also be written as
a bare number; every other quantity needs its unit. Numbers take the ASCII digits 0-9 only (a
Bengali or fullwidth digit looks like another). The type column of the tables below gives each
field's unit and its physically possible range (a sign, zero refused where it would mean no part or
a division by zero, a ceiling far above any battery pack); a value outside it is refused with the
field's line. Fields that must agree with each other are checked together too (a peak load at least
the continuous one, a charger's open-circuit voltage at least its regulation, a release on the safe
side of its detection, one on-resistance row per gate voltage), and the message points at the
field that breaks the order.

Accepted, and the value the linter works with (SI units):

<<QUANTITIES_ACCEPTED>>

Refused, never guessed: text a reviewer could read two ways (RKM codes, decimal commas, `meg`),
values no part has (NaN, infinity, negative resistance) and slips. The message is what packwarden
prints:

<<QUANTITIES_REFUSED>>

## Toleranced values

A data-sheet parameter with a spread (type **toleranced V**, **toleranced Ω** and so on) takes any
of three forms:

- **`{typ, min, max}`**: any of the three alone or together, exactly as the data sheet gives them:
  `vgs_th: {max: 1.0 V}`, `internal_resistance: {typ: 30 mΩ, max: 45 mΩ}`;
- **`{typ, tol}`**: the typical value and a symmetric tolerance, absolute in the field's unit
  (`tol: 25 mV`) or a percentage of typ (`tol: 0.5 %`);
- **a bare value**: `4.20 V` means `{typ: 4.20 V}`.

`min <= typ <= max` must hold; `tol` needs `typ` and excludes `min` and `max`; a percentage `tol`
is below 100 %, and the limits it implies must lie in the field's range like the ones written.
The worst cases take the lowest and the highest value given; where a limit is missing they fall
back on what is there (with typ and max only, the low end is typ). One parameter is read otherwise, because that
fallback would flatter the design: a cell's lowest internal resistance, which sets the prospective
short-circuit current, is typ - (max - typ), but at least typ / 2, when the data sheet gives typ and
max only [practice: the usual reading of a symmetric spread].

<<TOLERANCED>>

## Components and pins

`components:` maps each reference designator (`U1`, `Q1`, `R2`) to a component: a library part with
`part:` and `pins:`, or an inline part with `kind:`, the kind's parameters and `pins:`. `pins:` maps
pin names to nets:

```yaml
Q1: {part: OR-FET-D20, pins: {s1: B-, g1: DG, d: MID, s2: P-, g2: CG}}
```

A part with two pins in a fixed order (resistors, capacitors, fuses, PTCs, traces and wires, and
also cells and diodes) may give **a list of nets** instead, filled in pin order:

```yaml
R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}
BT1: {part: OR-CELL-3400, pins: [B+, B-]}   # pos, neg
```

Nets are joined by name; a net name is any text up to 100 characters (a number is read as its
text). Each kind's pins are listed with the kind below. The netlist rules report a required pin left
unconnected (unconnected-pin), a pin the part does not have (unknown-pin), a list where the pins
have names (pin-form) and a net with a single connection (single-connection-net, a warning).

## Components from a schematic

A design may take its components from the netlist its schematic editor exports (KiCad's own
S-expression format, `(export (version "E") ...)`, as KiCad 6 to 9 write it):

```yaml
schematic: {netlist: board/power.net, part_field: packwarden-part}   # relative to this file
```

Each symbol's `part_field` field (default `packwarden-part`) names its library part. Package pins
become the part's pins by the part's `pinout` (package pin number -> pin name, several numbers may
name one pin if they share a net), else by the symbol's pin names where they equal the part's
(ignoring case; `+` and `-` for a cell's `pos` and `neg`, `A` and `K` for a diode's), else, for a
two-terminal part, by pin order. A pin marked no-connect needs no match. Net names are the ones the
schematic shows (a local label's leading `/` is dropped). An entry under `components:` with the same
reference adds to or overrides the netlist's (its `pins` may be left out); an entry the netlist lacks
adds a component. A symbol without a part id is listed for the reviewer (unreviewed-component), and
package pins of one part pin on different nets are an error (split-pin). Findings about a component
of the netlist point at its line in the netlist.

## Cell stacks

Many cells of one part are written once, as `series` x `parallel` with the nets between the levels:

```yaml
stacks:
  - {part: RL-CELL-2500, series: 4, parallel: 2, taps: [B-, B1, B2, B3, B+]}
```

This is the same design as writing the cells out: `BT1` and `BT2` from `B-` to `B1`, `BT3` and `BT4`
from `B1` to `B2`, and so on (`prefix` and `first` choose the reference designators).

## Pack terminals, cell side

The nets **`P+`** and **`P-`** are the pack's terminals, where the charger and the load connect (the
trade's convention); `pack: {terminals: {pos: PACK+, neg: PACK-}}` names others. The linter puts the
load, the charger (also reversed) and the hard short across them, and a terminal connecting a single
pin is no mistake, since its other side is off the board. The cell side needs no declaration: the
stack's bottom (`B-`) and top (`B+`), and its series and parallel counts, follow from how the cells'
`pos` and `neg` pins chain. A common-drain FET pair's drain `d` is internal to its package and may
stay unconnected.

## Waivers

```yaml
waivers:
  - rule: trip-current-window
    element: U1
    reason: bench-tested at 2.6 A for 10 min, test report TR-114
    approved_by: pack safety review
    expires: 2026-06-30
```

A waiver accepts the findings of one rule, on one element or on all, with the reason on record.
Waived findings are reported as waived and do not fail the run. A waiver past its `expires` date
waives nothing and is itself an error, and a waiver that matches no finding is a warning
(waiver-hygiene): an accepted risk is looked at again rather than forgotten. A waiver without a
reason is an input error.

## Storage

```yaml
storage: {soc: 40 %, duration: 12 months, temperature: 25 °C}
```

`storage:` says how the product ships or waits on a shelf. storage-drain then budgets the charge
above the protector's over-discharge cut-off against everything that drains a stored pack: the
protector's supply current, the switches' leakage, resistive paths and LEDs across the cells, and
the cells' self-discharge (doubling per 10 °C). Running out before the storage time ends ships a
dead pack (a warning); reaching the cell's lower limit ships a damaged one (an error). Without
`storage:` the check is skipped.

## Reference

Everything below is generated from the models in `linter/schema.py`, the pin tables of
`linter/netlist.py` and the example designs. In the tables, **type / unit** gives the unit a
quantity is written in (`V`, `Ω`, `°C`...), **toleranced V** a
[toleranced value](#toleranced-values), and **mapping** a nested set of keys, with a link to its
table. **optional** means the key may be
left out, with no default.
"""

# Quantity examples the reference shows: (text, field unit, note). Parsed when the reference is
# generated, so the table shows what the parser does today.
QUANTITY_ACCEPTED: tuple[tuple[Any, str, str], ...] = (
    ("4.25 V", "V", ""),
    ("22 mΩ", "Ω", ""),
    ("22 mohm", "Ω", "spelled out"),
    ("22 m\u2126", "Ω", "ohm sign U+2126"),
    ("100 nF", "F", ""),
    ("3 uA", "A", "u for micro"),
    ("3 \u00b5A", "A", "micro sign U+00B5"),
    ("3 \u03bcA", "A", "Greek mu U+03BC"),
    ("1.5e-3 A", "A", "exponent"),
    ("40ms", "s", "no space"),
    ("3400 mAh", "Ah", ""),
    ("1 %", "%", ""),
    ("-20 °C", "°C", ""),
    ("-20 degC", "°C", ""),
    ("45", "°C", "a bare number: °C"),
    ("10 K", "K", "a temperature difference"),
    ("120 K/W", "K/W", ""),
    ("10 A2s", "A²s", ""),
    ("10 A²s", "A²s", ""),
    ("2 mm", "m", ""),
    ("1 oz", "oz", "copper weight"),
    ("12 months", "months", ""),
    ("2 %/month", "%/month", ""),
)
QUANTITY_REFUSED: tuple[tuple[Any, str, str], ...] = (
    ("4k7", "Ω", "RKM code"),
    ("5V5", "V", "RKM code"),
    ("1,5 V", "V", "decimal comma"),
    ("1 meg", "Ω", "SPICE mega"),
    ("NaN", "V", ""),
    ("inf", "A", ""),
    (4.2, "V", "a YAML number"),
    ("4.2 A", "V", "wrong unit"),
    ("4.2 mv", "V", "letter case"),
    ("4.2  V", "V", "two spaces"),
    ("20 m°C", "°C", ""),
    ("-1 Ω", "Ω", ""),
    ("-300 °C", "°C", ""),
)
# Toleranced examples: (YAML text, unit); read with the field's own validator.
TOLERANCED_ACCEPTED: tuple[tuple[str, str], ...] = (
    ("{typ: 4.20 V, tol: 0.5 %}", "V"),
    ("{typ: 4.300 V, tol: 25 mV}", "V"),
    ("{min: 0.5 V, max: 1.0 V}", "V"),
    ("{max: 1.0 V}", "V"),
    ("{typ: 30 mΩ, max: 45 mΩ}", "Ω"),
    ("{min: 100 ms, typ: 150 ms, max: 200 ms}", "s"),
    ("4.20 V", "V"),
)
TOLERANCED_REFUSED: tuple[tuple[str, str], ...] = (
    ("{tol: 1 %}", "V"),
    ("{typ: 4.20 V, tol: 1 %, max: 4.30 V}", "V"),
    ("{min: 4.30 V, max: 4.20 V}", "V"),
    ("{typ: 4.20 V, tol: -5 mV}", "V"),
    ("{}", "V"),
)

#: What each pin of each kind connects to (kinds.py). ``cellN``/``balanceN`` stand for the
#: numbered pins of a multi-cell protector.
PIN_TEXT: dict[str, dict[str, str]] = {
    name: {**k.pins, **NUMBERED_PINS.get(name, {})} for name, k in KINDS.items()}
# Cell counts at which a multi-cell protector's numbered pins are read off netlist.pin_names.
_MULTI = (1, 3)


def render_format(examples: Path | None = None) -> str:
    """docs/format.md: the introduction, the generated key tables and the example design."""
    from .schema import PART_KINDS, Design, PartLibrary
    examples = EXAMPLES if examples is None else examples
    shapes = _Shapes()
    shapes.walk(Design, "")
    for kind, model in PART_KINDS.items():
        shapes.walk(model, kind)
    intro = (FORMAT_INTRO
             .replace("<<QUANTITIES_ACCEPTED>>", _quantity_table(QUANTITY_ACCEPTED, accepted=True))
             .replace("<<QUANTITIES_REFUSED>>", _quantity_table(QUANTITY_REFUSED, accepted=False))
             .replace("<<TOLERANCED>>", _toleranced_tables()))
    out = [FORMAT_HEADER, "", intro.rstrip("\n"), ""]
    out += ["## Design files", "",
            "A design file's top-level keys; the sections after the table give the keys of each "
            "nested mapping.", ""]
    out += _field_table(Design, shapes)
    for name, field in Design.model_fields.items():
        key = field.alias or name
        if key == "components":
            out += _components_section(shapes)
        for model in shapes.order:
            if shapes.root(model) == key:
                out += _shape_section(model, shapes, "###")
    out += ["## Part libraries", "",
            "A part library (`format: packwarden-parts/1`) defines parts by name under `parts:`; "
            "each part gives its `kind` and that kind's parameters, as its data sheet states "
            "them.", ""]
    out += _field_table(PartLibrary, shapes)
    out += ["<a id=\"part-kinds\"></a>", "", "### Part kinds", "",
            "| kind | what it is | pins |", "|---|---|---|"]
    for kind, model in PART_KINDS.items():
        pins = ", ".join(_pin_shown(p, numbered) for p, _, numbered in _pins_of(kind))
        out.append(f"| [`{kind}`](#part-{kind}) | {_cell(_doc(model))} | {pins} |")
    out.append("")
    for kind, model in PART_KINDS.items():
        out += _kind_section(kind, model, shapes)
    out += _example_section(examples)
    return "\n".join(out).rstrip("\n") + "\n"


class _Shapes:
    """Every nested mapping of the format and the YAML paths it appears at, in first-seen order."""

    def __init__(self) -> None:
        self.paths: dict[type, list[str]] = {}
        self.order: list[type] = []

    def walk(self, model: type, path: str) -> None:
        for name, field in model.model_fields.items():
            key = field.alias or name
            if _special(model, key) is not None:
                continue
            for sub, suffix in _nested_models(field.annotation, field.metadata):
                here = f"{path}.{key}{suffix}" if path else f"{key}{suffix}"
                if sub in self.paths:
                    self.paths[sub].append(here)
                    continue
                self.paths[sub] = [here]
                self.order.append(sub)
                self.walk(sub, here)

    def anchor(self, model: type) -> str:
        return self.paths[model][0].replace("[]", "")

    def root(self, model: type) -> str:
        return self.paths[model][0].split(".", 1)[0].replace("[]", "")


def _special(model: type, key: str) -> str | None:
    """The type text of the two keys whose values are keyed collections of unions."""
    from .schema import Design, PartLibrary
    if model is Design and key == "components":
        return "mapping of reference designators to [components](#components)"
    if model is PartLibrary and key == "parts":
        return "mapping of part names to [parts](#part-kinds)"
    return None


def _nested_models(tp: Any, metadata: Iterable[Any] = ()) -> list[tuple[type, str]]:
    """The mappings (models) a field holds, each with "[]" when it is a list of them."""
    from pydantic import BaseModel
    if _quantity_of(metadata) is not None:
        return []
    origin = get_origin(tp)
    if origin is Annotated:
        base, *meta = get_args(tp)
        return _nested_models(base, meta)
    if origin in (Union, UnionType):
        return [m for a in get_args(tp) for m in _nested_models(a)]
    if origin is list:
        return [(m, "[]" + s) for m, s in _nested_models(get_args(tp)[0])]
    if isinstance(tp, type) and issubclass(tp, BaseModel):
        return [(tp, "")]
    return []


def _type_text(tp: Any, shapes: _Shapes, metadata: Iterable[Any] = ()) -> str:
    from pydantic import BaseModel

    from .schema import Pins
    q = _quantity_of(metadata)
    if q is not None:
        what, unit = q
        text = unit if what == "quantity" else f"[toleranced](#toleranced-values) {unit}"
        bounds = bounds_of(metadata)
        return f"{text}, {bounds.text(unit)}" if bounds is not None else text
    if tp in (Pins, Union[Pins, None]):
        return "mapping of pin names to nets, or a list of nets"
    origin = get_origin(tp)
    if origin is Annotated:
        base, *meta = get_args(tp)
        return _type_text(base, shapes, meta)
    if origin in (Union, UnionType):
        return " or ".join(_type_text(a, shapes) for a in get_args(tp) if a is not type(None))
    if origin is Literal:
        return " or ".join(f"`{v}`" for v in get_args(tp))
    if origin is list:
        return f"list of {_type_text(get_args(tp)[0], shapes)}"
    if origin is dict:
        return f"mapping of names to {_type_text(get_args(tp)[1], shapes)}"
    if isinstance(tp, type):
        if issubclass(tp, Enum):
            return "one of " + ", ".join(f"`{m.value}`" for m in tp)
        if issubclass(tp, BaseModel):
            return f"[mapping](#{shapes.anchor(tp)})" if tp in shapes.paths else "mapping"
        names = {str: "text", int: "integer", float: "number", bool: "`true` or `false`",
                 datetime.date: "date"}
        if tp in names:
            return names[tp]
    return str(tp)  # pragma: no cover - a type the format does not use yet


def _default_text(field: Any) -> str:
    if field.is_required():
        return "required"
    value = field.default_factory() if field.default_factory is not None else field.default
    if value is None:
        return "optional"
    q = _quantity_of(field.metadata)
    return f"`{_yaml_text(value, q[1] if q else None)}`"


def _yaml_text(value: Any, unit: str | None = None) -> str:
    """A default as it is written in a design file (YAML flow style)."""
    from pydantic import BaseModel
    if isinstance(value, BaseModel):
        value = value.model_dump(mode="json", by_alias=True)
    if isinstance(value, Enum):
        value = value.value
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)) and unit is not None:
        return _quantity_text(value, unit)
    if isinstance(value, dict):
        return "{" + ", ".join(f"{k}: {_yaml_text(v)}" for k, v in value.items()) + "}"
    if isinstance(value, list):
        return "[" + ", ".join(_yaml_text(v) for v in value) + "]"
    return str(value)


def _quantity_text(value: float, unit: str) -> str:
    from .quantities import UNITS, format_quantity
    # Plain numbers read best where no prefix is needed: "0.7 V", not "700 mV".
    if not UNITS[unit].prefixes or 0.1 <= abs(value) < 1000 or value == 0:
        return f"{value:g} {unit}"
    return format_quantity(value, unit, digits=6)


def _field_table(model: type, shapes: _Shapes) -> list[str]:
    out = ["| key | type / unit | required or default | description |", "|---|---|---|---|"]
    fields = list(model.model_fields.items())
    # The part kind leads, as it does in a library, even where a base model declares the rest.
    fields.sort(key=lambda item: item[0] != "kind")
    for name, field in fields:
        key = field.alias or name
        kind = _special(model, key) or _type_text(field.annotation, shapes, field.metadata)
        out.append(f"| `{key}` | {_cell(kind)} | {_default_text(field)} | "
                   f"{_cell(field.description or '')} |")
    return out + [""]


def _doc(model: type) -> str:
    doc = model.__dict__.get("__doc__")
    return inspect.cleandoc(doc) if doc else ""


def _shape_section(model: type, shapes: _Shapes, level: str) -> list[str]:
    paths = shapes.paths[model]
    out = [f"<a id=\"{shapes.anchor(model)}\"></a>", "", f"{level} `{paths[0]}`", ""]
    if _doc(model):
        out += [_doc(model), ""]
    if len(paths) > 1:
        out += ["Also at " + ", ".join(f"`{p}`" for p in paths[1:]) + ".", ""]
    return out + _field_table(model, shapes)


def _components_section(shapes: _Shapes) -> list[str]:
    from .schema import PartRef
    out = ["<a id=\"components\"></a>", "", "### `components`", "",
           "Each component is a library part or an inline part. A library part:", ""]
    out += _field_table(PartRef, shapes)
    out += ["An inline part gives `kind:` and that kind's keys, exactly as in a part library "
            "(see [part kinds](#part-kinds)), together with `pins` and `note` as above:", "",
            "```yaml", "R1: {kind: resistor, value: 470 Ω, power: 0.1 W, pins: [B+, VDD]}", "```",
            ""]
    return out


def _kind_section(kind: str, model: type, shapes: _Shapes) -> list[str]:
    from .netlist import LIST_PINS
    out = [f"<a id=\"part-{kind}\"></a>", "", f"### `{kind}`", ""]
    if _doc(model):
        out += [_doc(model), ""]
    out += _field_table(model, shapes)
    out += ["**Pins**", "", "| pin | required | connects |", "|---|---|---|"]
    for pin, need, numbered in _pins_of(kind):
        out.append(f"| {_pin_shown(pin, numbered)} | {need} | {_cell(PIN_TEXT[kind][pin])} |")
    out.append("")
    if kind in LIST_PINS:
        order = ", ".join(LIST_PINS[kind])
        out += [f"Pins may also be given as a list of nets, in the order [{order}].", ""]
    else:
        out += ["Pins are given as a mapping of pin names to nets.", ""]
    if kind == "cell":
        out += _chemistry_table()
    for sub in shapes.order:
        if shapes.root(sub) == kind:
            out += _shape_section(sub, shapes, "####")
    return out


def _pin_shown(pin: str, numbered: bool) -> str:
    return f"`{pin[:-1]}1` … `{pin}`" if numbered else f"`{pin}`"


def _pins_of(kind: str) -> list[tuple[str, str, bool]]:
    """(pin, required, numbered) of a kind; numbered pins of multi-cell parts once, as ``cellN``."""
    from types import SimpleNamespace

    from .netlist import pin_names
    one_req, one_opt = pin_names(kind, SimpleNamespace(cells=_MULTI[0]))
    many_req, many_opt = pin_names(kind, SimpleNamespace(cells=_MULTI[1]))
    out = [(p, "yes", False) for p in one_req] + [(p, "no", False) for p in one_opt]
    for names, need in ((many_req, "yes, with `cells` ≥ 2"),
                        (many_opt, "no (with `cells` ≥ 2)")):
        seen = []
        for p in names:
            if p in one_req or p in one_opt:
                continue
            stem = p.rstrip("0123456789") + "N"
            if stem not in seen:
                seen.append(stem)
                out.append((stem, need, True))
    return out


def undocumented_pins() -> list[str]:
    """Pins of netlist.PIN_NAMES (and the multi-cell pins) that PIN_TEXT does not describe."""
    from .netlist import PIN_NAMES
    return [f"{kind}.{pin}" for kind in PIN_NAMES for pin, _, _ in _pins_of(kind)
            if pin not in PIN_TEXT.get(kind, {})]


def _chemistry_table() -> list[str]:
    from .model.cells import DEFAULT_WINDOWS
    from .model.ocv import OCV_TABLES
    out = ["**Defaults by chemistry**, used only where the cell data sheet gives no value, and "
           "named in the findings that rest on them (`upper_limit` defaults to `charge` + 50 mV "
           "for every chemistry):", "",
           "| chemistry | overcharge_limit | lower_limit | OCV table |", "|---|---|---|---|"]
    for chem, w in DEFAULT_WINDOWS.items():
        tags = [_tag(w.source(f)) for f in ("overcharge_limit", "lower_limit")]
        ocv = OCV_TABLES[chem].source if chem in OCV_TABLES else "none"
        out.append(f"| `{chem}` | {w.overcharge_limit:g} V {tags[0]} | {w.lower_limit:g} V "
                   f"{tags[1]} | {_cell(ocv)} |")
    return out + [""]


def _tag(text: str) -> str:
    start, end = text.find("["), text.find("]")
    return text[start:end + 1] if 0 <= start < end else ""


def _quantity_table(rows: Iterable[tuple[Any, str, str]], accepted: bool) -> str:
    from .quantities import QuantityError, UNITS, parse_quantity
    out = ["| written | field in | " + ("read as" if accepted else "message") + " |",
           "|---|---|---|"]
    for text, unit, note in rows:
        written = f"`{text}`" + (f" ({note})" if note else "")
        try:
            value = parse_quantity(text, unit)
        except QuantityError as exc:
            if accepted:
                raise ValueError(f"the accepted example {text!r} is refused: {exc}") from None
            result = _verbatim(str(exc))
        else:
            if not accepted:
                raise ValueError(f"the refused example {text!r} is accepted as {value!r}")
            result = f"{value:.6g} {UNITS[unit].symbol}"
        out.append(f"| {_verbatim(written)} | {UNITS[unit].name} | {result} |")
    return "\n".join(out)


def _toleranced_tables() -> str:
    import yaml
    from pydantic import TypeAdapter, ValidationError

    from .schema import Tol
    out = ["| written | low | typical | high |", "|---|---|---|---|"]
    for text, unit in TOLERANCED_ACCEPTED:
        t = TypeAdapter(Tol(unit)).validate_python(yaml.safe_load(f"v: {text}")["v"])
        out.append(f"| `{text}` | {_tol_text(t.low, unit)} | {_tol_text(t.nominal, unit)} | "
                   f"{_tol_text(t.high, unit)} |")
    out += ["", "Refused:", "", "| written | message |", "|---|---|"]
    for text, unit in TOLERANCED_REFUSED:
        try:
            TypeAdapter(Tol(unit)).validate_python(yaml.safe_load(f"v: {text}")["v"])
        except ValidationError as exc:
            msg = exc.errors(include_url=False)[0]["msg"].removeprefix("Value error, ")
        else:
            raise ValueError(f"the refused example {text!r} is accepted")
        out.append(f"| `{text}` | {_verbatim(msg)} |")
    return "\n".join(out)


def _verbatim(text: str) -> str:
    """A table cell that keeps the text's spaces (a message quoting '4.2  V' must show both)."""
    return text.replace("|", "\\|").replace("\n", " ")


def _tol_text(value: float, unit: str) -> str:
    from .quantities import format_quantity
    return format_quantity(value, unit, digits=4)


def _example_section(examples: Path) -> list[str]:
    from .loader import InputError, load_file
    design_path = examples / EXAMPLE_DESIGN
    shown = f"example_designs/{EXAMPLE_DESIGN}"
    try:
        design_text = design_path.read_text(encoding="utf-8")
        doc = load_file(design_path, shown)
        library = doc.data["libraries"][0]
        lib_path = design_path.parent / library
        lib_text = lib_path.read_text(encoding="utf-8")
        lib_doc = load_file(lib_path, f"example_designs/{library}")
    except InputError as exc:
        raise DocsError(exc.file, f"the example cannot be read: {exc.message}", exc.line,
                        exc.column) from None
    except (OSError, KeyError, IndexError, TypeError) as exc:
        raise DocsError(shown, f"the example design cannot be read ({exc}); `packwarden docs "
                               f"format` runs in a source checkout, beside example_designs/")
    kinds = {name: part.get("kind") for name, part in lib_doc.data.get("parts", {}).items()}
    excerpt, left_out = _library_excerpt(lib_text, kinds)
    out = ["## Complete example", "",
           f"The clean example design, `{shown}`, as it is checked in: one NMC cell, a "
           f"single-cell protector driving a common-drain FET pair on the negative side, a fuse on "
           f"the positive side, the supply filter and the sense-pin resistor.", "",
           "```yaml", design_text.rstrip("\n"), "```", "",
           f"An excerpt of its library, `example_designs/{library}`"
           + (f" (left out here: {', '.join(f'`{n}`' for n in left_out)})" if left_out else "")
           + ":", "", "```yaml", excerpt.rstrip("\n"), "```", ""]
    return out


def _library_excerpt(text: str, kinds: dict[str, Any]) -> tuple[str, list[str]]:
    """The library's header and the first part of each of EXCERPT_KINDS, as written in the file."""
    lines = text.splitlines()
    head: list[str] = []
    blocks: list[tuple[str, list[str]]] = []
    for line in lines:
        key = line[2:].split(":", 1)[0] if line.startswith("  ") and not line.startswith("   ") \
            and not line[2:].startswith("#") else None
        if key in kinds:
            blocks.append((key, [line]))
        elif blocks:
            blocks[-1][1].append(line)
        else:
            head.append(line)
    keep, shown_kinds, left_out = [], set(), []
    for name, block in blocks:
        kind = kinds.get(name)
        if kind in EXCERPT_KINDS and kind not in shown_kinds:
            shown_kinds.add(kind)
            keep.append(block)
        else:
            left_out.append(name)
    body = []
    for block in keep:
        while block and not block[-1].strip():
            block = block[:-1]
        body += block + [""]
    return "\n".join(head + body).rstrip("\n") + "\n", left_out


# --- descriptions: every key of the format says what it is ---------------------------------------

def schema_models() -> list[type]:
    """Every model of linter/schema.py: the module's own, the inline component forms and the
    ``{typ, min, max, tol}`` forms behind the toleranced fields."""
    from pydantic import BaseModel

    from . import schema
    found: list[type] = [v for v in vars(schema).values()
                         if isinstance(v, type) and issubclass(v, BaseModel)
                         and v.__module__ == schema.__name__]
    found += list(schema.INLINE_KINDS.values())
    for model in list(found):
        for field in model.model_fields.values():
            for unit in _toleranced_units(field.annotation, field.metadata):
                given = given_model(unit)
                if given not in found:
                    found.append(given)
    return found


def _toleranced_units(tp: Any, metadata: Iterable[Any] = ()) -> list[str]:
    q = _quantity_of(metadata)
    if q is not None:
        return [q[1]] if q[0] == "toleranced" else []
    if get_origin(tp) is Annotated:
        base, *meta = get_args(tp)
        return _toleranced_units(base, meta)
    return [u for a in get_args(tp) for u in _toleranced_units(a)]


def undescribed_fields(models: Iterable[type]) -> list[str]:
    """``Model.field`` for every field of ``models`` without a description (empty: none)."""
    return [f"{m.__name__}.{name}" for m in models for name, f in m.model_fields.items()
            if not (f.description or "").strip()]


def undescribed_properties(schema: dict) -> list[str]:
    """JSON pointers of the properties of a JSON Schema that carry no description (editors show
    the description on hover, so a key without one is a key nobody can look up)."""
    out: list[str] = []

    def visit(node: Any, where: str) -> None:
        if isinstance(node, dict):
            props = node.get("properties")
            if isinstance(props, dict):
                for key, value in props.items():
                    if not isinstance(value, dict) or not str(value.get("description", "")).strip():
                        out.append(f"{where}/properties/{key}")
            for key, value in node.items():
                visit(value, f"{where}/{key}")
        elif isinstance(node, list):
            for i, value in enumerate(node):
                visit(value, f"{where}/{i}")

    visit(schema, "#")
    return out


def main(argv: list[str] | None = None) -> int:
    from .engine import load_registry
    args = list(sys.argv[1:] if argv is None else argv)
    if args not in ([], ["rules"], ["format"]):
        sys.stderr.write("usage: python -m packwarden.docs [rules|format]\n")
        return 2
    if args == ["format"]:
        try:
            sys.stdout.write(render_format())
        except DocsError as exc:
            sys.stderr.write(f"{exc}\n")
            return 2
        return 0
    reg = load_registry()
    sys.stdout.write(render_rules(builtin_rules(reg.rules)))
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
