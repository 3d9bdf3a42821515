"""The protector's support network: supply filter, sense-pin resistor, capacitor and resistor stress.

The small parts around a protector decide whether its thresholds mean what the data sheet says and
whether it survives a fault:

* the supply filter (a resistor from the cell's positive terminal to the ``supply`` pin and a
  capacitor from ``supply`` to ground) carries the protector's supply current, and on a single-cell
  protector, which measures the cell at its supply pin, that current times the resistance moves
  every voltage threshold [practice: docs/references.md "Single-cell protector"];
* the sense-pin resistor (``sense`` to a pack terminal) is what limits the current into the sense
  pin when a charger is connected the wrong way round, with the charger's open-circuit voltage plus
  the stack across it;
* every capacitor must be rated for the highest voltage across it, and every resistor for the power
  it dissipates, in the worst of a few named cases solved with the same nodal solver as the power
  path.

Volts, amperes, ohms, farads, watts.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ..netlist import Component
from .values import ModelProblem
from .events import CHARGER_SOURCE_R, SWITCH_ON_R, terminal_network
from .network import Network, NetworkError
from ..records import record

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["DEFAULT_SUPPLY_R", "DEFAULT_SUPPLY_C", "DEFAULT_SENSE_R", "SupplyFilter",
           "SenseResistor", "Stress", "supply_filter", "sense_resistor", "capacitor_stress",
           "resistor_stress", "scenarios", "balance_switches"]

#: Supply filter ranges when the protector's data gives none [practice: docs/references.md
#: "Single-cell protector": R 300 Ω-1 kΩ (470 Ω typical), C 0.022-1 µF (0.1 µF typical)].
DEFAULT_SUPPLY_R = (300.0, 1000.0)
DEFAULT_SUPPLY_C = (22e-9, 1e-6)
#: Sense-pin resistor range [practice: docs/references.md "Single-cell protector", 300 Ω-4 kΩ, 2 kΩ
#: typical]: below it a reversed charger overloads the pin, above it the charger- and
#: load-detection currents of the pin shift its thresholds.
DEFAULT_SENSE_R = (300.0, 4000.0)
# The charger's source resistance and an on switch in the stress cases are events.py's, whose
# reversed-charger event is one of the cases.
_NOISE = 1e-12


@record(frozen=True)
class SupplyFilter:
    resistor: Component | None
    capacitor: Component | None
    resistance: float | None  # at its highest, with tolerance
    capacitance: float | None
    supply_current: float  # the protector's operating supply current, max
    #: Volts the thresholds move (resistance × supply current); None where the supply pin does not
    #: measure a cell (a multi-cell protector measures at its cell pins).
    shift: float | None


@record(frozen=True)
class SenseResistor:
    resistor: Component | None
    terminal: str | None  # the pack terminal net it goes to
    resistance: float | None  # at its lowest, with tolerance
    #: Reversed charger: volts across the resistor (charger open-circuit + stack maximum), the
    #: current and the power; None when no charger can be connected reversed.
    voltage: float | None
    current: float | None
    power: float | None


@record(frozen=True)
class Stress:
    """The worst value one part sees, the case it is seen in, and the part's rating."""

    component: Component
    value: float
    case: str
    rating: float | None


def _two_pins(c: Component) -> tuple[str, str] | None:
    a, b = c.pins.get("1"), c.pins.get("2")
    return (a, b) if a and b and a != b else None


def _between(m: "DesignModel", kind: str, net: str, others: set[str]) -> Component | None:
    for c in m.netlist.of_kind(kind):
        pins = _two_pins(c)
        if pins and net in pins and (set(pins) - {net}) & others:
            return c
    return None


def supply_filter(m: "DesignModel") -> SupplyFilter | None:
    """The resistor from a stack net to ``supply`` and the capacitor from ``supply`` to ground."""
    p = m.protector
    if p is None or m.stack is None:
        return None
    supply, ground = p.pins.get("supply"), p.pins.get("ground")
    if supply is None:
        return None
    stack_nets = set(m.stack_levels) - {m.stack.bottom}
    r = None if supply in stack_nets else _between(m, "resistor", supply, stack_nets)
    c = _between(m, "capacitor", supply, {ground, m.stack.bottom} - {None})
    current = p.part.supply_current.operating.high
    resistance = r.part.value * (1 + r.part.tol / 100) if r is not None else None
    shift = None
    if p.part.cells == 1:
        shift = (resistance or 0.0) * current
    return SupplyFilter(r, c, resistance, c.part.value if c is not None else None, current, shift)


def sense_resistor(m: "DesignModel") -> SenseResistor | None:
    """The resistor between the ``sense`` pin and a pack terminal, and its reversed-charger load."""
    p = m.protector
    if p is None or m.stack is None:
        return None
    sense = p.pins.get("sense")
    if sense is None:
        return None
    terminals = set(m.terminals)
    if sense in terminals:
        r, terminal, resistance = None, sense, None
    else:
        r = _between(m, "resistor", sense, terminals)
        if r is None:
            return None
        terminal = (set(_two_pins(r)) - {sense}).pop()
        resistance = r.part.value * (1 - r.part.tol / 100)
    rev = m.event("charger-reversed")
    voltage = current = power = None
    if rev is not None and rev.voltage is not None:
        # Reversed, the charger's open-circuit voltage adds to the stack's across the off
        # discharge switches (the charger-reversed event) [practice: docs/references.md]; the pin
        # itself is clamped near the protector's rails, so nearly all of it lies across the
        # resistor.
        voltage = rev.voltage
        if resistance:
            current = voltage / resistance
            power = voltage * current
    return SenseResistor(r, terminal, resistance, voltage, current, power)


# --- stress cases ------------------------------------------------------------------------------

def scenarios(m: "DesignModel") -> list[tuple[str, Any]]:
    """(case, solution) for the named cases every capacitor and resistor is checked in.

    Cells are sources at the voltages the protector allows, FETs switches with body diodes,
    every resistor and diode of the netlist present; protector pins are not branches, so a net
    reached only through a resistor sits at the voltage of its far end.
    """
    p, stack, cv = m.protector, m.stack, m.cell_voltage
    if p is None or stack is None or cv is None:
        return []
    out: list[tuple[str, Any]] = []
    pos, neg = m.terminals

    def solve(case: str, volts: float, off: set[str], extra=None) -> None:
        net = terminal_network(m, volts, off)
        if extra is not None:
            extra(net)
        try:
            out.append((case, net.solve(ground=stack.bottom)))
        except NetworkError as exc:
            m.problems.append(ModelProblem("support", f"{case}: {exc}"))

    solve("the cells at the overcharge detection maximum, terminals open", cv.max, set())
    ch = m.design.charger
    if ch is not None and pos != neg:
        def charger(net: Network) -> None:
            net.add_source("(charger)", pos, neg, ch.open_circuit_max, CHARGER_SOURCE_R)
        solve("a charger at its open-circuit voltage with the charge switches off and the cells "
              "at the over-discharge detection minimum", cv.min, {"charge"}, charger)
        reversed_charger = m.charger_reversed_solution  # the charger-reversed event's solve
        if reversed_charger is not None:
            out.append(("a charger connected reversed with the discharge switches off",
                        reversed_charger[1]))
    bal = _balance_switches(m)
    if bal:
        def balancing(net: Network) -> None:
            for name, a, b in bal:
                net.add_resistor(name, a, b, SWITCH_ON_R)
        solve("balancing every cell at the overcharge detection maximum", cv.max, set(), balancing)
    return out


def _balance_switches(m: "DesignModel") -> list[tuple[str, str, str]]:
    """The protector's bleed switches: ``balanceK`` closes to the pin below cell K.

    That is cell(K-1)'s sense pin, or ``ground`` for the bottom cell: the switch returns the bleed
    current to the negative end of the cell it balances [practice: internal bleed switches sit
    across each cell's pair of inputs].
    """
    p = m.protector
    if p is None or p.part.cells < 2:
        return []
    out = []
    for k in range(1, p.part.cells + 1):
        a = p.pins.get(f"balance{k}")
        b = p.pins.get("ground") if k == 1 else p.pins.get(f"cell{k - 1}")
        if a and b and a != b:
            out.append((f"({p.refdes}.balance{k})", a, b))
    return out


def capacitor_stress(m: "DesignModel") -> tuple[Stress, ...]:
    """Highest voltage across each capacitor over :func:`scenarios`."""
    cases = m.support_scenarios
    out = []
    for c in m.netlist.of_kind("capacitor"):
        pins = _two_pins(c)
        if pins is None:
            continue
        worst: tuple[float, str] | None = None
        for case, sol in cases:
            if pins[0] not in sol.voltages or pins[1] not in sol.voltages:
                continue
            v = sol.voltage_between(*pins)
            if v is not None and (worst is None or abs(v) > worst[0]):
                worst = (abs(v), case)
        if worst is not None:
            out.append(Stress(c, worst[0], worst[1], c.part.voltage))
    return tuple(out)


def resistor_stress(m: "DesignModel") -> tuple[Stress, ...]:
    """Highest dissipation of each resistor: the stress cases, and the power path in the
    ``permitted`` event.

    In the power path the highest sustained current is just below the over-current trip, which
    the protection never cuts off (the permitted event); each resistor dissipates what that event
    says, at the event's own corner: a shunt that sets the current does so at the resistance it
    dissipates at (V²/R), not at the opposite end of its tolerance.
    """
    cases = m.support_scenarios
    permitted = m.event("permitted")
    out = []
    for c in m.netlist.of_kind("resistor"):
        if _two_pins(c) is None:
            continue
        r_typ = m.part_resistance(c, 25.0, "typ")
        worst: tuple[float, str] | None = None
        for case, sol in cases:
            i = sol.currents.get(c.refdes)
            if i is None:
                continue
            watts = i * i * r_typ
            if worst is None or watts > worst[0]:
                worst = (watts, case)
        watts = permitted.dissipation.get(c.refdes) if permitted is not None else None
        if watts is not None and (worst is None or watts > worst[0]):
            worst = (watts, f"the current the protection permits for ever "
                            f"({permitted.current:.3g} A, the permitted event)")
        if worst is not None and worst[0] > _NOISE:
            out.append(Stress(c, worst[0], worst[1], c.part.power))
    return tuple(out)


def balance_switches(m: "DesignModel") -> list[tuple[str, str, str]]:
    """The protector's bleed switches as (branch name, balanceK net, net below cell K), K rising
    from the bottom cell (the cell-balance model reads them)."""
    return _balance_switches(m)
