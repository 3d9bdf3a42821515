"""Which figure heads each finding of a rule and which waiver bound it takes, read from the rule's
own ``ctx.finding(...)`` calls, so the rule reference (docs/rules.md) cannot drift from the code.

A finding's headline figure is the one whose change makes it worse (``ctx.finding(headline=...)``);
``lower_is_worse`` says it worsens as the figure falls, so a waiver bounds it with ``down_to``
rather than ``up_to`` (packwarden.waivers). A call names its key, headline and direction with
literals, f-strings (shown with ``…`` for what the design fills in) or a condition (a value
outside a range worsens on the side it left: either bound, by that side).
"""

from __future__ import annotations

import ast
import inspect
import re

from .api import Rule
from .records import record

#: Stands for what an f-string fills in from the design (an event's or a channel's name).
FILLED = "…"


@record(frozen=True)
class Headline:
    """One ``ctx.finding`` call of a rule: its key, headline figure and the bound a waiver takes."""

    key: str
    figure: str
    #: "up_to" (worse as it grows), "down_to" (worse as it falls), or "either" (by the side of a
    #: range the value left, decided by the design).
    bound: str

    def matches(self, key: str, figure: str, lower_is_worse: bool) -> bool:
        """Whether a finding with this ``key``, headline ``figure`` and direction is this call's."""
        fits = all(re.fullmatch(".+".join(map(re.escape, pattern.split(FILLED))), text)
                   for pattern, text in ((self.key, key), (self.figure, figure)))
        wanted = "down_to" if lower_is_worse else "up_to"
        return fits and self.bound in (wanted, "either")


def headlines(rule: Rule) -> list[Headline]:
    """The headline of each finding with figures the rule's module makes, in source order; [] for
    a rule whose source cannot be read (a rule built at run time)."""
    module = inspect.getmodule(rule.check)
    try:
        tree = ast.parse(inspect.getsource(module)) if module is not None else None
    except (OSError, TypeError, SyntaxError):
        return []
    if tree is None:
        return []
    out = []
    for node in ast.walk(tree):
        if not (isinstance(node, ast.Call) and isinstance(node.func, ast.Attribute)
                and node.func.attr == "finding"):
            continue
        kw = {k.arg: k.value for k in node.keywords}
        if "figures" not in kw or "headline" not in kw:
            continue
        for figure, lower in _cases(kw["headline"], kw.get("lower_is_worse")):
            out.append(Headline(_text(kw.get("key")), figure, lower))
    out.sort(key=lambda h: (h.key, h.figure))
    return list(dict.fromkeys(out))


def _cases(headline: ast.expr, lower: ast.expr | None) -> list[tuple[str, str]]:
    """(figure, bound) for a headline and a direction as written: a conditional headline whose
    direction is the same condition is two cases, one per side."""
    if (isinstance(headline, ast.IfExp) and lower is not None
            and ast.dump(headline.test) == ast.dump(lower)):
        return [(_text(headline.body), "down_to"), (_text(headline.orelse), "up_to")]
    if isinstance(headline, ast.IfExp):
        sides = [_text(headline.body), _text(headline.orelse)]
    else:
        sides = [_text(headline)]
    if lower is None or (isinstance(lower, ast.Constant) and lower.value is False):
        bound = "up_to"
    elif isinstance(lower, ast.Constant) and lower.value is True:
        bound = "down_to"
    else:
        bound = "either"
    return [(s, bound) for s in sides]


def _text(node: ast.expr | None) -> str:
    if node is None:
        return ""
    if isinstance(node, ast.Constant) and isinstance(node.value, str):
        return node.value
    if isinstance(node, ast.JoinedStr):
        return "".join(v.value if isinstance(v, ast.Constant) else FILLED for v in node.values)
    return FILLED  # a name or an expression: filled in from the design


def bound_words(bound: str) -> str:
    """How the rule reference says which waiver bound a headline takes."""
    return {"up_to": "`up_to` (worse as it grows)", "down_to": "`down_to` (worse as it falls)",
            "either": "`down_to` below the range, `up_to` above it"}[bound]
