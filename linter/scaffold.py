"""``packwarden new-rule NAME``: a rule package a team can install, test and grow.

The package registers its rule in the ``packwarden.rules`` entry-point group, declares an option in
units and an example, and tests itself with packwarden's own case runner
(:mod:`packwarden.testing`) against a passing design, and cases that change it to fail. It passes
its own tests as generated; the author then rewrites the check, the design and the cases.

The templates are kept here as text, not as package data, so the command works from any
installation (a zip, a wheel, an editable checkout) without locating data files.
"""

from __future__ import annotations

import re
from pathlib import Path
from string import Template

from .records import record

NAME = re.compile(r"^[a-z][a-z0-9]*(-[a-z0-9]+)*$")
MAX_NAME = 60


class ScaffoldError(Exception):
    """The package cannot be made: a bad name, or its folder is already there."""


@record(frozen=True)
class Names:
    rule_id: str  # tallgrass-trip-limit
    distribution: str  # packwarden-tallgrass-trip-limit
    package: str  # packwarden_tallgrass_trip_limit
    module: str  # tallgrass_trip_limit

    @classmethod
    def of(cls, rule_id: str) -> "Names":
        if len(rule_id) > MAX_NAME or not NAME.match(rule_id):
            raise ScaffoldError(
                f"rule name '{rule_id}' must be lowercase words joined by '-', starting with a "
                f"letter, at most {MAX_NAME} characters (e.g. 'fuse-derating'): it becomes the "
                f"rule id, the entry-point name and, with '_', a Python module name")
        module = rule_id.replace("-", "_")
        return cls(rule_id, f"packwarden-{rule_id}", f"packwarden_{module}", module)


def new_rule(rule_id: str, parent: Path) -> list[Path]:
    """Write the package for rule ``rule_id`` into ``parent/<rule_id>``; return the files written."""
    names = Names.of(rule_id)
    root = parent / rule_id
    if root.exists():
        raise ScaffoldError(f"{root} already exists; choose another --dir or remove it")
    values = {"rule_id": names.rule_id, "distribution": names.distribution,
              "package": names.package, "module": names.module}
    files = {
        "pyproject.toml": PYPROJECT,
        "README.md": README,
        f"{names.package}/__init__.py": INIT,
        f"{names.package}/{names.module}.py": RULE,
        "tests/test_rule_cases.py": TEST,
        f"tests/cases/{names.rule_id}.yaml": CASES,
        "tests/designs/passing.yaml": PASSING,
        "tests/designs/parts/example-parts.yaml": PARTS,
    }
    written = []
    for rel, template in files.items():
        path = root / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(Template(template).substitute(values), encoding="utf-8")
        written.append(path)
    return written


# --- templates (string.Template: $name is replaced, $$ is a dollar) ------------------------------

PYPROJECT = '''\
[build-system]
requires = ["setuptools>=61"]
build-backend = "setuptools.build_meta"

[project]
name = "$distribution"
version = "0.1.0"
description = "packwarden rule $rule_id"
requires-python = ">=3.10"
dependencies = ["packwarden>=0.1"]

[project.optional-dependencies]
test = ["pytest>=8"]

# packwarden finds rules through this entry-point group; the name is the rule id.
[project.entry-points."packwarden.rules"]
$rule_id = "$package.$module:check"

[tool.setuptools]
packages = ["$package"]

[tool.pytest.ini_options]
testpaths = ["tests"]
'''

README = '''\
# $distribution

A packwarden rule package made by `packwarden new-rule $rule_id`.

```sh
pip install -e '.[test]'     # registers the rule in the packwarden.rules entry-point group
packwarden rules             # $rule_id is listed beside the built-in rules
python -m pytest -q          # runs tests/cases/*.yaml with packwarden.testing
```

Next steps:

1. Rewrite `check()` in `$package/$module.py`: its docstring is the rationale shown by
   `packwarden explain $rule_id`; cite the source of every number.
2. Replace `tests/designs/passing.yaml` with a design of your own that the rule passes.
3. In `tests/cases/$rule_id.yaml`, give each way the rule fails a case: the passing design plus
   the values that make the flaw (`set`, `add`, `delete` by YAML path), and the findings the rule
   must produce.
4. In CI, run `packwarden check --require-plugins $distribution ...` so a missing install fails
   the run instead of passing it silently.

Options are set per project in its config:

```toml
[tool.packwarden.rules.$rule_id]
max_trip = "8 A"
```

Lithium cells can vent, burn or explode: a rule adds to, and never replaces, the cell maker's
requirements, the applicable safety standards and licensed engineering review.
'''

INIT = '''\
"""packwarden rule package for $rule_id."""
'''

RULE = '''\
from packwarden import Example, Figure, Q, RuleOptions, Severity, format_quantity as fq, rule
from pydantic import Field


class Options(RuleOptions):
    # Options are set under [tool.packwarden.rules.$rule_id]; Q("A") reads "8 A" strictly.
    max_trip: Q("A") = Field(10.0, description="highest over-current trip current allowed")


@rule(id="$rule_id", summary="the over-current trip maximum stays within max_trip",
      severity=Severity.error, options=Options, example=Example(
          bad="Q1, Q2: two FET pairs in parallel   # half the sense resistance: trip max 15.6 A",
          good="Q1: one FET pair                   # trip max 7.8 A"))
def check(ctx, options):
    """Replace this with why the rule exists: the failure it prevents, and where each number
    comes from. As generated, it bounds the highest current at which the protector's
    over-current detection trips, over detection tolerance, part spread, gate drive and
    temperature, as the model computes it (ctx.model.overcurrent_trip), by the option
    max_trip: a load just below the trip is never cut off, so everything in the path must
    carry it."""
    m = ctx.model
    trip, protector = m.overcurrent_trip, m.protector
    if trip is None or protector is None:
        return  # no protector or no switches: the built-in rules report that
    if trip.max > options.max_trip:
        yield ctx.finding(
            f"over-current trip max {fq(trip.max, 'A')} exceeds max_trip "
            f"{fq(options.max_trip, 'A')}",
            path=("components", protector.refdes, "part"), element=protector.refdes,
            key="trip-max",
            figures=[Figure("trip max", trip.max, "A"), Figure("max_trip", options.max_trip, "A")],
            hint="raise the sense resistance (fewer FETs in parallel, or FETs with a higher "
                 "on-resistance), or choose a protector with a lower over-current detection")
'''

TEST = '''\
"""The rule's cases, run by packwarden's own case runner against the installed rules."""

from pathlib import Path

import pytest

from packwarden.testing import cases_in, check_case, load_cases

CASES = Path(__file__).parent / "cases"


@pytest.mark.parametrize("case", cases_in(CASES))
def test_rule_case(case):
    check_case(case)


def test_the_rule_has_a_passing_and_a_failing_case():
    cases = load_cases(CASES / "$rule_id.yaml")
    assert any(not c.expect for c in cases), "no case where the rule stays silent"
    assert any(c.expect for c in cases), "no case where the rule fires"
'''

CASES = '''\
rule: $rule_id
cases:
  - name: the passing design passes
    design: tests/designs/passing.yaml        # relative to the folder holding pyproject.toml
    expect: []
  - name: two FET pairs in parallel trip too high
    design: tests/designs/passing.yaml
    # a second pair beside Q1 halves the sense resistance: the trip max doubles to about 15.6 A
    add: {components.Q2: {part: EX-FET-D20, pins: {s1: B-, g1: DG, d: MID2, s2: P-, g2: CG}}}
    expect:
      - {element: U1, severity: error, message_contains: "exceeds max_trip 10 A"}
  - name: a lower max_trip fails the passing design
    design: tests/designs/passing.yaml
    options: {max_trip: 5 A}
    expect:
      - {element: U1, message_contains: "exceeds max_trip 5 A"}
'''

PASSING = '''\
# A design the rule passes: one NMC cell, low-side protection with one dual-FET pair
# (trip max about 7.8 A). Invented parts (tests/designs/parts/example-parts.yaml). The failing
# cases in tests/cases/ are this design with a few values changed.
design: {name: Example pack, revision: A}
format: packwarden/1
libraries: [parts/example-parts.yaml]
pack:
  ambient: {min: -20 °C, max: 55 °C}
load:
  continuous: 1.2 A
  peak: {current: 1.6 A, duration: 40 ms}
charger:
  voltage: {typ: 4.20 V, tol: 0.5 %}
  current: 0.8 A
  open_circuit_max: 5.5 V
  reverse_polarity: possible
  temperature_window: {min: 0 °C, max: 45 °C}
components:
  BT1: {part: EX-CELL-3400, pins: {pos: B+, neg: B-}}
  U1:
    part: EX-GUARD-1S
    pins: {supply: VDD, ground: B-, sense: VM, discharge_gate: DG, charge_gate: CG}
  Q1: {part: EX-FET-D20, pins: {s1: B-, g1: DG, d: MID, s2: P-, g2: CG}}
  R1: {part: EX-RES-470, pins: [B+, VDD]}
  C1: {part: EX-CAP-100N, pins: [VDD, B-]}
  R2: {part: EX-RES-2K0, pins: [VM, P-]}
  F1: {part: EX-FUSE-12A, pins: [B+, P+]}
'''

PARTS = '''\
# Invented parts for the rule's tests; values follow the shape of typical data sheets, and none of
# these parts exists.
format: packwarden-parts/1
parts:
  EX-CELL-3400:
    kind: cell
    chemistry: nmc
    capacity: 3400 mAh
    voltage: {charge: 4.20 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.60 V,
              cutoff: 2.50 V, lower_limit: 2.00 V}
    internal_resistance: {typ: 30 mΩ, max: 45 mΩ}
    max_current: {discharge: 10 A, charge: 1.7 A}
    charge_temperature: {min: 0 °C, max: 45 °C}
  EX-GUARD-1S:
    kind: protector
    chemistry: [lco, nmc, nca]
    cells: 1
    overcharge:
      detect: {typ: 4.300 V, tol: 25 mV}
      release: {typ: 4.100 V, tol: 50 mV}
      delay: {min: 0.7 s, typ: 1.2 s, max: 2.0 s}
      release_on: [voltage]
    overdischarge:
      detect: {typ: 2.500 V, tol: 50 mV}
      release: {typ: 3.000 V, tol: 100 mV}
      delay: {min: 100 ms, typ: 150 ms, max: 200 ms}
      release_on: [voltage, charger]
    overcurrent:
      detect: {typ: 150 mV, tol: 15 mV}
      delay: {min: 5 ms, typ: 9 ms, max: 15 ms}
      release_on: [load_removal]
    short_circuit:
      detect: {typ: 500 mV, tol: 100 mV}
      delay: {min: 150 us, typ: 300 us, max: 540 us}
      release_on: [load_removal]
    supply_current:
      operating: {typ: 3 uA, max: 6 uA}
      power_down: {max: 0.1 uA}
    gate_drive: cell
  EX-FET-D20:
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {min: 0.5 V, max: 1.0 V}
    rds_on:
      - {vgs: 1.8 V, typ: 38 mΩ, max: 52 mΩ}
      - {vgs: 2.5 V, typ: 25 mΩ, max: 32 mΩ}
      - {vgs: 3.7 V, typ: 20 mΩ, max: 26 mΩ}
      - {vgs: 4.5 V, typ: 18 mΩ, max: 23 mΩ}
    rds_on_hot_ratio: {at: 125 °C, ratio: 1.44}
    id_max: 10 A
    id_pulse_max: 150 A
    theta_ja: 83 K/W
    tj_max: 150 °C
    idss: 1 uA
  EX-FUSE-12A:
    kind: fuse
    rated_current: 12 A
    rated_voltage: 32 V
    breaking_capacity: 600 A
    melting_i2t: 95 A2s
    speed: time_lag
    resistance: 5 mΩ
  EX-CAP-100N:
    kind: capacitor
    value: 100 nF
    voltage: 16 V
  EX-RES-470:
    kind: resistor
    value: 470 Ω
    tol: 1 %
    power: 0.1 W
  EX-RES-2K0:
    kind: resistor
    value: 2.0 kΩ
    tol: 1 %
    power: 0.1 W
'''
