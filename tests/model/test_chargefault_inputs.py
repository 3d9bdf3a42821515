"""Bad charge-side input: one located message each, no traceback, exit code 2."""

from __future__ import annotations

import pytest

from packwarden.engine import lint
from tests.model.test_stress import _design


@pytest.mark.parametrize("values, where, words", [
    (dict(extra="charger: {voltage: {typ: 4.1 V}, current: 1 A, open_circuit_max: 6 V, "
                "fault_voltage: 7 V}\n"),
     "d.yaml:", "is outside 4.1 V (the highest regulated voltage) to 6 V"),
    (dict(guard_extra="    low_voltage_charge: {allowed: false}"),
     "lib.yaml:", "allowed: false needs inhibit_below"),
    (dict(guard_extra="    low_voltage_charge: {allowed: true, path: current_limit}"),
     "lib.yaml:", "path: current_limit needs its current"),
    (dict(load="1 A, regen: {current: 0 A, duration: 1 s}"), "d.yaml:", "out of range"),
])
def test_located_input_error(tmp_path, values, where, words):
    run = lint([str(_design(tmp_path, **values))])
    errors = [str(e) for e in run.input_errors()]
    assert len(errors) == 1 and where in errors[0] and words in errors[0], errors
    assert not any(d.internal for d in run.designs)


def test_the_command_says_it_in_one_line_and_exits_2(tmp_path):
    import subprocess
    import sys
    path = _design(tmp_path, guard_extra="    low_voltage_charge: {allowed: false}")
    proc = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", str(path)],
                          capture_output=True, text=True, cwd=tmp_path)
    assert proc.returncode == 2
    assert "Traceback" not in proc.stdout + proc.stderr
    assert "allowed: false needs inhibit_below" in proc.stdout + proc.stderr


def test_a_cell_table_that_cannot_be_read_falls_back_on_the_chemistry(tmp_path):
    # A flat stretch cannot be inverted to a state of charge: the charger fault is still worked
    # out, on the NMC table, and says so; no internal error.
    from tests.model.linted import linted_model
    flat = ("30 mΩ}\n    ocv: [{soc: 0 %, voltage: 3.0 V}, {soc: 50 %, voltage: 3.0 V}, "
            "{soc: 100 %, voltage: 4.2 V}]\n    charge_temperature: {min: 0 °C, max: 45 °C")
    extra = "charger: {voltage: {typ: 4.1 V}, current: 1 A, open_circuit_max: 6 V}\n"
    m = linted_model(_design(tmp_path, cell_r=flat, extra=extra))
    f = m.charger_fault
    assert f is not None
    assert any("the cell's ocv table cannot be used" in n and "the nmc table is used" in n
               for n in f.assumptions)
