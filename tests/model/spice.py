"""Run a packwarden network through ngspice, an independent circuit simulator, for comparison.

The translation is one SPICE element per part, so what is compared is the solving, not a second
copy of the modelling: every branch gets a 0 V source in series as an ammeter, which gives its
current in the same ``a`` to ``b`` convention packwarden uses.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

import pytest

from packwarden.model.network import Diode, Network, Resistor, Source, Switch

# A diode in ngspice is either the same straight-line model packwarden uses, written as a
# behavioural current source (so results must agree to solver precision), or a junction diode
# (exponential, so results only agree as far as the two models do).
DiodeModel = Literal["pwl", "junction"]

# Every node gets this much to ground so ngspice's matrix stays regular where packwarden reports
# a floating net; 1e12 Ω moves nothing else measurably [derived: 60 V / 1e12 Ω = 6e-11 A].
_RSHUNT = 1e12

_LINE = re.compile(r"^\s*(\S+)\s*=\s*([-+0-9.eE]+)\s*$")


def require_ngspice() -> str:
    """Path to ngspice; skip the test without it, unless on CI, which must have it."""
    path = shutil.which("ngspice")
    if path is None:
        if os.environ.get("CI"):
            pytest.fail("ngspice is not on PATH; CI must install it (apt-get install -y ngspice)")
        pytest.skip("ngspice is not on PATH")
    return path


def run_op(netlist: str) -> dict[str, float]:
    """Operating point of a netlist: every printed vector, names lower-cased as ngspice gives."""
    exe = require_ngspice()
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "circuit.cir"
        path.write_text(netlist)
        proc = subprocess.run([exe, "-b", str(path)], capture_output=True, text=True, cwd=tmp,
                              stdin=subprocess.DEVNULL, timeout=120)
    out = proc.stdout + proc.stderr
    values: dict[str, float] = {}
    for line in proc.stdout.splitlines():
        m = _LINE.match(line)
        if m:
            name = m.group(1).lower()
            if name.startswith("v(") and name.endswith(")"):
                name = name[2:-1]
            values[name] = float(m.group(2))
    # Warnings that a convergence aid failed are normal on the way to an answer (ngspice then
    # tries the next aid); only an aborted analysis, an error line or no output is a failure.
    if (proc.returncode != 0 or not values or re.search(r"(?im)^\s*error\b|aborted", out)):
        raise RuntimeError(f"ngspice failed (exit {proc.returncode}):\n{out}\n--- netlist ---\n"
                           f"{netlist}")
    return values


def element_lines(network: Network, ground: str, *, diode: DiodeModel = "pwl",
                  junction_is: float = 1e-12, junction_n: float = 1.0
                  ) -> tuple[dict[str, str], list[str], dict[str, str]]:
    """(node of each net, the netlist's element and model lines, ammeter of each branch): one
    SPICE element per branch, each behind a 0 V source that reads its current."""
    node = {net: ("0" if net == ground else f"n{i}") for i, net in enumerate(network.nets)}
    lines = ["* packwarden network"]
    ammeters: dict[str, str] = {}
    models: list[str] = []

    def diode_lines(tag: str, anode: str, cathode: str, vf: float, r_on: float) -> list[str]:
        if diode == "pwl":
            return [f"B{tag} {anode} {cathode} I = max(V({anode},{cathode})-{vf!r},0)/{r_on!r}"]
        models.append(f".model DM{tag} D(IS={junction_is!r} N={junction_n!r} RS={r_on!r})")
        return [f"D{tag} {anode} {cathode} DM{tag}"]

    for k, br in enumerate(network.branches):
        a, b = node[br.a], node[br.b]
        x = f"x{k}"
        body: list[str] = []
        if isinstance(br, Resistor):
            body = [f"R{k} {x} {b} {br.ohms!r}"]
        elif isinstance(br, Source):
            body = [f"R{k} {x} y{k} {br.r_internal!r}", f"V{k} y{k} {b} DC {br.volts!r}"]
        elif isinstance(br, Diode):
            body = diode_lines(str(k), x, b, br.v_forward, br.r_on)
        elif isinstance(br, Switch):
            if br.on:
                body.append(f"R{k} {x} {b} {br.ohms_on!r}")
            bd = br.body_diode
            if bd is not None:
                anode, cathode = (x, b) if bd.anode == br.a else (b, x)
                body += diode_lines(str(k), anode, cathode, bd.v_forward, bd.r_on)
        if body:
            lines.append(f"VAM{k} {a} {x} DC 0")
            lines += body
            ammeters[br.name] = f"vam{k}#branch"
    lines += models
    return node, lines, ammeters


@dataclass(frozen=True)
class SpiceResult:
    voltages: dict[str, float | None]
    currents: dict[str, float]


def simulate(network: Network, ground: str, *, diode: DiodeModel = "pwl",
             junction_is: float = 1e-12, junction_n: float = 1.0) -> SpiceResult:
    """Node voltages (against ``ground``) and branch currents of ``network`` from ngspice.

    ``junction_is``/``junction_n`` set the saturation current and emission coefficient of the
    junction diode model; a diode's ``r_on`` becomes its series resistance either way.
    """
    node, lines, ammeters = element_lines(network, ground, diode=diode, junction_is=junction_is,
                                          junction_n=junction_n)
    lines += [
        f".option rshunt={_RSHUNT!r} reltol=1e-9 abstol=1e-15 vntol=1e-12",
        ".control", "set numdgt=15", "op", "print all", "quit 0", ".endc", ".end", ""]
    values = run_op("\n".join(lines))
    # A net that only open switches touch never reaches the netlist and has no voltage.
    voltages = {net: (0.0 if n == "0" else values.get(n)) for net, n in node.items()}
    currents = {br.name: (values[ammeters[br.name]] if br.name in ammeters else 0.0)
                for br in network.branches}
    return SpiceResult(voltages, currents)
