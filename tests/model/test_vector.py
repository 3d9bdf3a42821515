"""The vector forms of the model's functions (model/vector.py) against their scalar definitions.

The yield run evaluates the model's own functions for many builds at once; each vector twin must
give what the scalar function gives for the same input [derived: the same equations], checked here
on random inputs and random networks, and the whole run on random designs whose every tolerance is
closed (each build is then the lint's own corner).
"""

import math
import random

import pytest

np = pytest.importorskip("numpy")

from packwarden.model import rdson, thermal, vector  # noqa: E402
from packwarden.model.network import Network  # noqa: E402
from packwarden.model.yield_ import run_yield  # noqa: E402

from tests.test_yield import _design, _model  # noqa: E402


@pytest.mark.parametrize("seed", range(40))
def test_on_resistance_at_the_spread_ends_is_the_scalar_corner(seed):
    rng = random.Random(seed)
    rows, v = [], rng.uniform(1.8, 3.0)
    for _ in range(rng.randint(2, 4)):
        typ = rng.uniform(2e-3, 40e-3)
        mx = typ * rng.uniform(1.0, 1.9)
        rows.append((v, typ, mx))
        v += rng.uniform(0.5, 4.0)
    hot = (rng.uniform(1.2, 1.8), rng.choice([100.0, 125.0, 150.0]))
    # Thresholds mostly below the lowest row, some at or above it (an off switch below the table).
    low = rng.uniform(0.3, rows[0][0] + 0.2)
    th = (low, low + rng.uniform(0.0, 0.4), low + rng.uniform(0.4, 0.8))
    for _ in range(5):
        vgs = rng.uniform(rows[0][0] - 2.5, rows[-1][0] + 2.0)
        tj = rng.uniform(-30.0, 140.0)
        for corner, spread in (("min", -1.0), ("typ", 0.0), ("max", 1.0)):
            want = rdson.rds_on(rows, vgs, tj, *hot, corner=corner,
                                vth=rdson.threshold_at(th, corner)).value
            got = (vector.rds_on(rows, np.array([vgs]), np.array([spread]), th)
                   * vector.temperature_factor(np.array([tj]), *hot))[0]
            assert got == pytest.approx(want, rel=1e-12)


@pytest.mark.parametrize("seed", range(20))
def test_the_secant_step_decides_per_build_as_the_scalar_does(seed):
    rng = random.Random(seed)
    n = 50
    t = [rng.uniform(20, 150) for _ in range(n)]
    target = [x + rng.uniform(-20, 20) for x in t]
    prev = [(x + rng.choice([0.0, rng.uniform(-10, 10)]), rng.uniform(-30, 30)) for x in t]
    damping = rng.choice([1.0, 0.5])
    got = vector.accelerated_step(np.array(t), np.array(target),
                                  (np.array([p[0] for p in prev]), np.array([p[1] for p in prev])),
                                  damping)
    for k in range(n):
        assert got[k] == pytest.approx(
            thermal.accelerated_step(t[k], target[k], prev[k], damping), rel=1e-12, abs=1e-12)


def _random_network(rng: random.Random) -> tuple[Network, list[str]]:
    """A connected network of sources, resistors and on switches (no diode conducting)."""
    nets = [f"n{i}" for i in range(rng.randint(3, 9))]
    net = Network()
    for i in range(1, len(nets)):  # a spanning tree keeps it connected
        a, b = nets[i], rng.choice(nets[:i])
        net.add_resistor(f"t{i}", a, b, rng.uniform(1e-3, 10.0))
    for k in range(rng.randint(1, 8)):
        a, b = rng.sample(nets, 2)
        kind = rng.choice(["r", "s", "sw"])
        if kind == "r":
            net.add_resistor(f"r{k}", a, b, rng.uniform(1e-3, 100.0))
        elif kind == "s":
            net.add_source(f"s{k}", a, b, rng.uniform(-5.0, 5.0), rng.uniform(1e-3, 1.0))
        else:
            net.add_switch(f"w{k}", a, b, rng.uniform(1e-3, 1.0), True)
    net.add_resistor("float", "island1", "island2", 1.0)  # a part joined to nothing
    return net, nets


@pytest.mark.parametrize("seed", range(60))
def test_the_batch_path_solves_like_the_nodal_solver(seed):
    rng = random.Random(seed)
    net, nets = _random_network(rng)
    sol = net.solve(ground=nets[0])
    path = vector.LinearPath(net, nets[0])
    v, current = path.solve({}, 3)
    for name in nets:
        assert path.voltage(v, name) == pytest.approx(sol.voltages[name], rel=1e-9, abs=1e-9)
    assert math.isnan(path.voltage(v, "island1")[0]) and sol.voltages["island1"] is None
    for br in net.branches:
        if br.name != "float":
            assert current(br.name)[1] == pytest.approx(sol.currents[br.name], rel=1e-9,
                                                         abs=1e-9)
    # Values given per build replace the network's: the second build solves a changed network.
    name = next(b.name for b in net.branches if b.name.startswith("t"))
    ohms = np.array([net.branch(name).ohms, 2.0 * net.branch(name).ohms])
    v2, _ = path.solve({name: ohms}, 2)
    changed = Network()
    for br in net.branches:
        changed.add(br)
    changed = _replaced(net, name, 2.0 * net.branch(name).ohms)
    sol2 = changed.solve(ground=nets[0])
    for n in nets:
        assert path.voltage(v2, n)[0] == pytest.approx(sol.voltages[n], rel=1e-9, abs=1e-9)
        assert path.voltage(v2, n)[1] == pytest.approx(sol2.voltages[n], rel=1e-9, abs=1e-9)


def _replaced(net: Network, name: str, ohms: float) -> Network:
    out = Network()
    for br in net.branches:
        if br.name == name:
            out.add_resistor(name, br.a, br.b, ohms)
        else:
            out.add(br)
    return out


@pytest.mark.parametrize("seed", range(12))
def test_a_run_with_every_tolerance_closed_is_the_lint_itself(seed, tmp_path):
    # Random loads, on-resistances and thermal resistances, every tolerance closed: each build is
    # the typical design, and the run's figures must be the lint's own operating points.
    rng = random.Random(seed)
    rds45 = rng.uniform(4e-3, 20e-3)
    path = _design(tmp_path, detect=f"{rng.uniform(80, 200):.1f} mV",
                   load=f"{rng.uniform(1.0, 9.0):.2f} A", rds45=f"{rds45 * 1e3:.2f} mΩ",
                   rds25=f"{rds45 * rng.uniform(1.1, 1.6) * 1e3:.2f} mΩ",
                   theta=f"{rng.uniform(5, 120):.0f} K/W", boosted=False)
    # The fixed drive is capped by the cell voltage (a driver fed from the cell), so the
    # protector's voltage thresholds close too; each channel's own V_GS (gate.py) and the
    # extrapolation below the table stay in play.
    lib = path.parent / "lib.yaml"
    lib.write_text(lib.read_text(encoding="utf-8")
                   .replace("detect: {typ: 4.30 V, tol: 25 mV}", "detect: 4.30 V")
                   .replace("detect: {typ: 2.50 V, tol: 50 mV}", "detect: 2.50 V"), encoding="utf-8")
    m = _model(path)
    r = run_yield(m, 20, seed=seed)
    t = m.overcurrent_trip
    heat = {h.case: h for h in m.switch_heat}
    hot = r.figures["trip_current_hot"]
    assert hot["min"] == pytest.approx(t.min, rel=1e-6) and hot["max"] == pytest.approx(
        t.min, rel=1e-6)
    limits = m.limits
    for case, figure, words in (("continuous", "junction_temperature_continuous", "continuous"),
                                ("permitted", "junction_temperature_below_trip", "just below")):
        h = heat[case]
        fails = h.runaway or h.tj > limits.junction_ceiling(h.part)
        [check] = [c for c in r.checks if c.rule == "switch-temperature" and words in c.check]
        assert check.failures == (r.samples if fails else 0)
        if h.tj <= h.part.tj_max:  # past tj_max the lint reports the balance above it instead
            assert r.figures[figure]["p50"] == pytest.approx(h.tj, abs=0.02)
