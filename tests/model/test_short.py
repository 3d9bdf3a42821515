"""The hard short as it happens (linter/model/short.py) against outside computations.

* ngspice, an independent circuit simulator: a transient of a bolted short on a cell-driven
  low-side pair, the protector's supply behind its RC filter, each channel a conductance that
  grows with its own V_GS and a junction body diode; the model's hard-short current and
  per-channel dissipation must agree within 5 % (docs/references.md "Events in time").
* A hand-worked vector: Orchard soil probe, rev C (example_designs/orchard-probe.yaml), from the
  library's data sheet figures, Kirchhoff's voltage law and a bisection written here.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from packwarden.engine import lint
from tests.model.linted import linted_model
from packwarden.model.network import DEFAULT_DIODE_R_ON
from packwarden.model.short import BODY_DIODE_V_FORWARD
from tests.model.spice import run_op
from tests.model.test_multicell import RIDGE, _model

REPO = Path(__file__).resolve().parents[2]

# --- the ngspice transient ----------------------------------------------------------------------

# A channel in its linear region conducts G = k·(V_GS − V_th) [published: the square-law MOSFET
# model's linear region, any device text]: 15 mΩ at 4.5 V with V_th 0.8 V.
V_TH = 0.8
K = 1.0 / (0.015 * (4.5 - V_TH))
ROWS = (2.0, 2.5, 3.0, 3.5, 4.0, 4.5)  # the table the model reads, from the same law
EMF, CELL_R, FUSE_R = 4.325, 0.015, 0.005
# The junction body diode: IS and N of a silicon junction, RS set so that it drops what the
# model's body diode does at 80 A, 0.95 V + 0.1 mΩ × 80 A [practice: 0.8-1.2 V at high current,
# docs/references.md "Events in time"]; V = N·V_T·ln(I/IS) + I·RS [published: the diode law].
IS, N_DIODE, V_T = 1e-12, 1.0, 0.025865  # V_T = kT/q at ngspice's 27 °C nominal
RS = (BODY_DIODE_V_FORWARD + DEFAULT_DIODE_R_ON * 80 - N_DIODE * V_T * math.log(80 / IS)) / 80


def _rds(vgs: float) -> float:
    return 1.0 / (K * (vgs - V_TH))


LIB = """\
format: packwarden-parts/1
parts:
  S-CELL:
    kind: cell
    chemistry: nmc
    capacity: 3 Ah
    voltage: {{charge: 4.2 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}}
    internal_resistance: {{typ: {cell_r} mΩ}}
    max_current: {{discharge: 200 A, charge: 3 A}}
  S-GUARD:
    kind: protector
    overcharge: {{detect: {{typ: {emf} V}}, release: {{typ: 4.1 V}}, delay: 1.2 s}}
    overdischarge: {{detect: {{typ: 2.50 V, tol: 50 mV}}, release: {{typ: 3.0 V, tol: 100 mV}}, delay: 150 ms}}
    overcurrent: {{detect: {{typ: 150 mV, tol: 15 mV}}, delay: {{min: 5 ms, max: 15 ms}}}}
    short_circuit: {{detect: {{typ: 500 mV, tol: 100 mV}}, delay: {{min: 150 us, max: 540 us}}}}
    supply_current: {{operating: {{max: 6 uA}}}}
    gate_drive: cell
  S-PAIR:
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {{typ: {vth} V}}
    rds_on:
{rows}
    rds_on_hot_ratio: {{at: 125 °C, ratio: 1.5}}
    id_max: 20 A
    id_pulse_max: 500 A
    theta_ja: 83 K/W
"""

DESIGN = """\
format: packwarden/1
design: {{name: bolted short}}
libraries: [lib.yaml]
pack: {{ambient: {{min: 25 °C, max: 40 °C}}}}
load: {{continuous: 1 A}}
components:
  BT1: {{part: S-CELL, pins: {{pos: B+, neg: B-}}}}
  U1: {{part: S-GUARD, pins: {{supply: VDD, ground: B-, sense: VM, discharge_gate: DG, charge_gate: CG}}}}
  R1: {{kind: resistor, value: 470 Ω, power: 0.1 W, pins: [B+, VDD]}}
  C1: {{kind: capacitor, value: 100 nF, voltage: 16 V, pins: [VDD, B-]}}
  R2: {{kind: resistor, value: 2 kΩ, power: 0.1 W, pins: [VM, P-]}}
  Q1: {{part: S-PAIR, pins: {{s1: B-, g1: DG, d: MID, s2: P-, g2: CG}}}}
  F1: {{kind: fuse, rated_current: 300 A, rated_voltage: 32 V, breaking_capacity: 10 kA, resistance: {fuse_r} mΩ, pins: [B+, P+]}}
"""

NETLIST = f"""\
* bolted short across P+ and P- of a cell-driven low-side pair, closing at t = 0
VCELL e 0 DC {EMF}
RCELL e bp {CELL_R}
RF bp pp {FUSE_R}
VAM pp ps DC 0
S1 ps pm ctl 0 SWX
.model SWX SW(VT=0.5 VH=0.1 RON=1e-6 ROFF=1e6)
VCTL ctl 0 PWL(0 0 1u 1)
* the protector's supply filter; its gate outputs swing to its supply above its ground (B-)
R1 bp vdd 470
C1 vdd 0 100n
BDG dg 0 V=V(vdd)
BCG cg 0 V=V(vdd)
* discharge channel: drain MID, source B- (node 0); charge channel: drain MID, source P-
VA1 mid m1 DC 0
BCH1 m1 0 I=V(m1,0)*{K!r}*max(V(dg,0)-{V_TH},0)
D1 0 mid DB
VA2 pm p2 DC 0
BCH2 p2 mid I=V(p2,mid)*{K!r}*max(V(cg,p2)-{V_TH},0)
VA3 pm p3 DC 0
D2 p3 mid DB
.model DB D(IS={IS!r} N={N_DIODE} RS={RS!r})
.control
tran 0.5u 600u
meas tran ishort FIND i(vam) AT=500u
meas tran ich1 FIND i(va1) AT=500u
meas tran ich2 FIND i(va2) AT=500u
meas tran idio FIND i(va3) AT=500u
meas tran vmid FIND v(mid) AT=500u
meas tran vpm FIND v(pm) AT=500u
meas tran vdd FIND v(vdd) AT=500u
meas tran ipeak MAX i(vam)
print ishort ich1 ich2 idio vmid vpm vdd ipeak
quit 0
.endc
.end
"""

def _bolted_short_model(tmp_path: Path):
    rows = "\n".join(f"      - {{vgs: {v:g} V, typ: {_rds(v) * 1e3:.6g} mΩ, max: {_rds(v) * 1e3:.6g} mΩ}}"
                     for v in ROWS)
    (tmp_path / "packwarden.toml").write_text("")
    (tmp_path / "lib.yaml").write_text(LIB.format(cell_r=CELL_R * 1e3, emf=EMF, vth=V_TH,
                                                  rows=rows), encoding="utf-8")
    path = tmp_path / "d.yaml"
    path.write_text(DESIGN.format(fuse_r=FUSE_R * 1e3), encoding="utf-8")
    return linted_model(path)


def test_bolted_short_of_a_cell_driven_pair_against_an_ngspice_transient(tmp_path):
    # ngspice settles the short with the supply filter's dynamics (R1·C1 = 47 µs) and its own
    # Newton solve of the nonlinear channels and the junction diode; read 500 µs in, within the
    # 540 µs delay, when the supply has long followed the collapsed cell voltage.
    sp = run_op(NETLIST)
    m = _bolted_short_model(tmp_path)
    hard = m.event("hard-short")
    assert hard.ambient == 25.0
    assert hard.current == pytest.approx(sp["ishort"], rel=0.05)
    p_discharge = sp["vmid"] * sp["ich1"]  # V_DS · I of the discharge channel
    p_charge = (sp["vpm"] - sp["vmid"]) * (sp["ich2"] + sp["idio"])  # the charge FET, both paths
    assert hard.channel_dissipation["Q1.1"] == pytest.approx(p_discharge, rel=0.05)
    assert hard.channel_dissipation["Q1.2"] == pytest.approx(p_charge, rel=0.05)
    # the charge FET is starved: ngspice's channel carries almost nothing beside its diode
    assert sp["ich2"] < 0.01 * sp["idio"]
    assert hard.conduction == {"Q1.1": "channel", "Q1.2": "body diode"}
    # the discharge FET's drive is the collapsed supply, as ngspice's filter passes it on
    assert hard.gate_voltage["Q1.1"] == pytest.approx(sp["vdd"], rel=0.02)
    # The onset, the supply still held by its filter: ngspice's peak, at the first microsecond.
    assert m.prospective_short_circuit == pytest.approx(sp["ipeak"], rel=0.05)


# --- the hand-worked Orchard vector -------------------------------------------------------------

def _orchard_by_hand() -> tuple[float, float, float]:
    """Orchard's short at 25 °C, every part at its lowest resistance, worked from the library's
    figures (example_designs/parts/orchard-parts.yaml) [derived: Kirchhoff's voltage law]:

    * EMF: the protector's highest overcharge detection, 4.300 V + 25 mV = 4.325 V;
    * the cell: typ 30 mΩ, max 45 mΩ, its minimum the symmetric 30 − (45 − 30) = 15 mΩ
      [practice: a data sheet's typ and max read as a symmetric spread];
    * the fuse: 5 mΩ;
    * the discharge channel, source on B−, its gate at the protector's supply, the cell's terminal
      voltage: V_GS = 4.325 − 0.015·I; between the 2.5 V (typ 25, max 32 mΩ, min 18 mΩ) and
      3.7 V rows (typ 20, max 26, min 14 mΩ), R = 18 − 4·(V_GS − 2.5)/1.2 mΩ at 25 °C;
    * the charge channel, source on P− (joined to P+ by the short), gate at the supply: V_GS =
      V(B+) − V(P+) = 5 mΩ·I, below its 0.5 V threshold: off, its body diode conducts at the
      default 0.95 V (+ the network's 0.1 mΩ) [practice: 0.8-1.2 V at high current];
    * the bolted short itself: 1 µΩ (the model's stand-in for a part with no resistance).

    Returns (current, discharge channel W, charge body diode W).
    """
    def residual(i: float) -> float:
        vgs = 4.325 - 0.015 * i
        r = (18.0 - 4.0 * (vgs - 2.5) / 1.2) * 1e-3
        return 4.325 - 0.95 - i * (0.015 + 0.005 + 1e-4 + 1e-6 + r)

    lo, hi = 1.0, 200.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if residual(mid) > 0 else (lo, mid)
    i = 0.5 * (lo + hi)
    vgs = 4.325 - 0.015 * i
    r = (18.0 - 4.0 * (vgs - 2.5) / 1.2) * 1e-3
    return i, i * i * r, i * (0.95 + 1e-4 * i)


@pytest.fixture(scope="module")
def orchard():
    (result,) = lint([str(REPO / "example_designs" / "orchard-probe.yaml")]).designs
    return result.model


def test_orchard_hard_short_by_hand(orchard):
    current, p_discharge, p_diode = _orchard_by_hand()
    hard = orchard.event("hard-short")
    assert hard.current == pytest.approx(current, rel=1e-6)
    assert hard.channel_dissipation["Q1.1"] == pytest.approx(p_discharge, rel=1e-6)
    assert hard.channel_dissipation["Q1.2"] == pytest.approx(p_diode, rel=1e-6)
    assert hard.dissipation["Q1"] == pytest.approx(p_discharge + p_diode, rel=1e-6)
    assert hard.duration == 540e-6  # OR-GUARD-1S's longest short-circuit delay
    assert hard.detection == "short-circuit"
    assert hard.conduction == {"Q1.1": "channel", "Q1.2": "body diode"}
    assert "everything at 25 °C" in hard.corner and "starved" in hard.corner
    # An outside review's figures for Orchard (docs/references.md, outside review): about
    # 92 A, 139 W in the discharge channel, 89 W in the
    # charge FET's body diode (its V_F a little above the 0.95 V taken here).
    assert current == pytest.approx(92, rel=0.01)
    assert p_discharge == pytest.approx(139, rel=0.015)
    assert p_diode == pytest.approx(89, rel=0.015)


def test_hard_short_is_solved_once(orchard):
    assert orchard.hard_short is orchard.hard_short
    assert orchard.short_circuit_pulse.current == orchard.hard_short.current
    assert orchard.event("hard-short").current == orchard.hard_short.current


# --- the fixed point holds on every topology ----------------------------------------------------

def _gate_to_source(m, hs, ch) -> float:
    """The V_GS a channel's node voltages give it in the short's own solution, written out from
    the drive's wiring: a cell-driven n-channel gate sits at the protector's supply (the stack's
    terminal voltage in the short) above its ground, a p-channel gate at that ground."""
    sol, p = hs.solution, m.protector
    ground = sol.voltage(p.pins["ground"])
    stack = sol.voltage_between(m.stack.top, m.stack.bottom)
    supply = stack if p.part.cells > 1 else stack / m.stack.series
    source = sol.voltage(ch.source)
    return ground + supply - source if ch.channel == "n" else source - ground


@pytest.mark.parametrize("cell_r, fuse_r, vth", [
    (15, 5, 0.8),     # the ngspice case
    (200, 5, 2.4),    # a weak cell and a high threshold: the discharge channel just conducts
    (60, 100, 2.4),   # a resistive path: the charge channel's drive rises with the current
    (0.5, 0.001, 0.4),
])
def test_each_cell_driven_channel_has_the_drive_its_short_gives_it(tmp_path, cell_r, fuse_r, vth):
    # Self-consistency of the solve [derived]: the V_GS each channel was solved with is the one its
    # own node voltages give it, to a microvolt, near the threshold too.
    rows = "\n".join(f"      - {{vgs: {v:g} V, typ: {_rds(v) * 1e3:.6g} mΩ, max: {_rds(v) * 1.3e3:.6g} mΩ}}"
                     for v in ROWS)
    (tmp_path / "packwarden.toml").write_text("")
    (tmp_path / "lib.yaml").write_text(LIB.format(cell_r=cell_r, emf=EMF, vth=vth, rows=rows),
                                       encoding="utf-8")
    (tmp_path / "d.yaml").write_text(DESIGN.format(fuse_r=fuse_r), encoding="utf-8")
    (result,) = lint([str(tmp_path / "d.yaml")]).designs
    m = result.model
    for hs in (m.hard_short, m.short_onset):
        assert hs.converged
        for ch in m.channels:
            if hs.drive == "collapsed":
                assert hs.channels[ch.name].vgs == pytest.approx(_gate_to_source(m, hs, ch), abs=2e-6)


def test_a_cell_driven_high_side_pair_loses_its_drive_with_the_stack(tmp_path):
    # The 4S2P pack's p-channel switches on the positive rail, driven from the stack: each gate
    # is pulled to the protector's ground, so |V_GS| is its source's voltage above B−, which the
    # short pulls down; the charge switches' sources on P+ sit a shunt's drop above B−.
    m = _model(tmp_path, *RIDGE, lib_replace=(
        ("    gate_drive: 12 V                   # clamped gate driver, 12 V below the source when on",
         "    gate_drive: cell"),))
    hs = m.hard_short
    assert hs.converged and hs.drive == "collapsed"
    for ch in m.channels:
        assert hs.channels[ch.name].vgs == pytest.approx(_gate_to_source(m, hs, ch), abs=2e-6)
    discharge = [hs.channels[c.name] for c in m.channels_of("discharge")]
    charge = [hs.channels[c.name] for c in m.channels_of("charge")]
    assert all(c.vgs < 0.25 * m.gate_drive.max for c in discharge)  # far below the 17.2 V stack
    assert all(c.vgs < 1.5 for c in charge)  # a shunt's drop: hardly above the threshold
    # a fixed 12 V driver would have held every V_GS
    (tmp_path / "fixed").mkdir()
    fixed = _model(tmp_path / "fixed", *RIDGE).hard_short
    assert fixed.drive == "fixed" and {c.vgs for c in fixed.channels.values()} == {12.0}
    assert fixed.current > hs.current


@pytest.mark.parametrize("design", ["orchard-probe.yaml", "ridgeline-tool-4s2p.yaml",
                                    "ridgeline-blower-4s2p-lowside.yaml"])
def test_the_breaking_figure_is_never_below_the_short_as_it_happens(design):
    # What a fuse must break is the highest current of the short: its onset at the lowest
    # ambient holds at least as much drive, at switches at most as resistive, as the short as
    # it goes on at 25 °C [derived: more drive and less resistance, more current].
    (result,) = lint([str(REPO / "example_designs" / design)]).designs
    m = result.model
    assert m.prospective_short_circuit >= m.event("hard-short").current
    assert m.short_onset.ambient == m.ambient.min
