"""Shared by the netlist-integrity rules: each reports one kind of resolution problem."""

from __future__ import annotations

from typing import Iterator

from packwarden import Finding, RuleContext


def report(ctx: RuleContext, kind: str) -> Iterator[Finding]:
    for p in ctx.netlist.problems:
        if p.kind == kind:
            yield ctx.finding(p.message, path=p.path, hint=p.hint, element=p.component,
                              key=".".join(str(x) for x in p.path[2:]))
