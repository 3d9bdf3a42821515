"""The design's model: every figure computed once per design and cached; rules read them."""

from __future__ import annotations

from functools import cached_property
from typing import Any

from ..netlist import Netlist
from ..schema import Design


class DesignModel:
    def __init__(self, design: Design, netlist: Netlist):
        self.design = design
        self.netlist = netlist

    @cached_property
    def cells(self) -> list:
        return self.netlist.of_kind("cell")

    @cached_property
    def protectors(self) -> list:
        return self.netlist.of_kind("protector")

    def figures(self) -> dict[str, Any]:
        """The design's key figures, by name, in SI units (reported even when no rule fires)."""
        return {"cell_count": len(self.cells), "component_count": len(self.netlist.components)}
