"""The model: every figure of a design computed once, for rules, the yield run, charts and policies.

Layers, each importing only those above it in this list:

* ``values`` — spans (``Span``: min, typ, max), corners, the model's stand-in resistances, problems;
* ``cells``, ``ocv``, ``rdson``, ``thermal``, ``copper``, ``fuse``, ``network`` — physics and the
  nodal solver, functions of SI values;
* ``topology`` — what the netlist means for protection (stack, protector, switch channels, taps);
* ``path`` — the power-path solver: the network at a stated corner, solved, cached;
* ``limits`` — the limits a design is judged by (rule options after overrides, part ratings);
* ``events``, ``short`` — events in time (continuous and peak load, the permitted current, the gap
  overload, the hard short, the weakest short, the switch-on inrush, the reversed charger, the
  turn-off spike, storage), each at its stated corner with its figures; ``short`` solves the hard
  short with the gate drive it leaves each switch;
* ``stress``, ``support``, ``storage``, ``balance`` — the worst cases built on the path and the
  events (``balance``: a series stack's drift per charge cycle against its balancer);
* ``design`` — ``DesignModel``, the facade rules read (``ctx.model``);
* ``vector``, ``yield_`` — the yield run: the same functions in vector form (imports numpy).

The names below are the model's public surface for rules and team rules (docs/rules-api.md, "The
model"); they load on first use, so importing this package costs nothing.
"""

from typing import TYPE_CHECKING

__all__ = ["DesignModel", "TripWindow", "OperatingPoint", "CellStack", "CellLimits",
           "SwitchChannel", "Span", "ModelProblem", "Limits", "JUNCTION_LIMIT", "FUSE_DERATING",
           "TRACE_RISE", "CHARGE_MARGIN", "Event", "VDS_DERATING"]

_HOMES = {**dict.fromkeys(["DesignModel", "TripWindow"], "design"),
          "OperatingPoint": "path", "Event": "events",
          **dict.fromkeys(["CellStack", "CellLimits", "SwitchChannel"], "topology"),
          **dict.fromkeys(["Span", "ModelProblem"], "values"),
          **dict.fromkeys(["Limits", "JUNCTION_LIMIT", "FUSE_DERATING", "TRACE_RISE",
                           "CHARGE_MARGIN", "VDS_DERATING"], "limits")}

if TYPE_CHECKING:  # what editors and type checkers see
    from .design import DesignModel, TripWindow
    from .events import Event
    from .limits import CHARGE_MARGIN, FUSE_DERATING, JUNCTION_LIMIT, TRACE_RISE, VDS_DERATING, Limits
    from .path import OperatingPoint
    from .topology import CellLimits, CellStack, SwitchChannel
    from .values import ModelProblem, Span


def __getattr__(name: str):
    home = _HOMES.get(name)
    if home is None:
        raise AttributeError(f"module 'packwarden.model' has no attribute {name!r}")
    import importlib
    value = getattr(importlib.import_module(f".{home}", __name__), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
