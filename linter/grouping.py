"""One finding per root cause: the phase after the waivers that merges findings saying the same.

Two kinds of repetition are merged:

- **Parallel packages**: findings of one rule with one cause (``Finding.cause``, else its
  ``key``), one severity and the same figures, on switch packages the model's topology knows to
  be in parallel (``Topology.parallel_packages``), become one finding naming every member:
  "Q1–Q4, discharge switch, 4 in parallel". Each package meets the cause alike; four paragraphs
  would say one thing four times.
- **One cause, two rules**: findings of two rules that both give one ``cause`` (a turn-off spike
  over vds_max) on one element with the same headline figure become one: the first by severity
  and then rule id is kept and names the other rule (``Finding.also``).

A grouped finding keeps the first member's fingerprint and lists every member's own fingerprint
in ``merged``, so a baseline written before grouping still matches it (``baseline.compare``).

Waivers act on each member before grouping (``waiver_phase`` runs first): a group is waived only
when every member is; otherwise it stays and says which members are waived. Findings of two
rules merge only when both are waived or neither is.
"""

from __future__ import annotations

import math
import re
from dataclasses import replace
from typing import Iterable

from .api import Finding

__all__ = ["group_findings", "refs_span"]


def group_findings(findings: list[Finding], parallel: Iterable[tuple[str, ...]],
                   roles: dict[str, str], fingerprint) -> list[Finding]:
    """``findings`` with each root cause reported once. ``parallel``: sets of parallel packages;
    ``roles``: package -> its switch role in words ("discharge switch"); ``fingerprint``: a
    finding -> its own fingerprint (the design's identity bound)."""
    return _across_rules(_across_packages(findings, parallel, roles, fingerprint), fingerprint)


def _across_packages(findings: list[Finding], parallel: Iterable[tuple[str, ...]],
                     roles: dict[str, str], fingerprint) -> list[Finding]:
    set_of = {ref: refs for refs in parallel for ref in refs}
    buckets: dict[tuple, list[int]] = {}
    for i, f in enumerate(findings):
        refs = set_of.get(f.element or "")
        if refs is None or f.members:
            continue
        buckets.setdefault((f.rule, f.cause or f.key, f.severity, refs, _figures_key(f)),
                           []).append(i)
    out: list[Finding] = []
    merged_into: dict[int, int] = {}
    for key, idx in buckets.items():
        if len({findings[i].element for i in idx}) < 2:
            continue
        for i in idx[1:]:
            merged_into[i] = idx[0]
    for i, f in enumerate(findings):
        if i in merged_into:
            continue
        idx = [i] + [j for j, k in merged_into.items() if k == i]
        out.append(f if len(idx) == 1 else _package_group([findings[j] for j in idx], roles,
                                                          fingerprint))
    return out


def _package_group(members: list[Finding], roles: dict[str, str], fingerprint) -> Finding:
    first = members[0]
    refs = tuple(dict.fromkeys(m.element for m in members if m.element))
    role = roles.get(first.element or "", "switch")
    group = f"{refs_span(refs)}, {role}, {len(refs)} in parallel"
    waived = [m for m in members if m.waived]
    note = ""
    reason = None
    if len(waived) == len(members):
        reason = "; ".join(dict.fromkeys(m.waived for m in waived))
    elif waived:
        note = "; waived for " + ", ".join(f"{m.element} ({m.waived})" for m in waived) + \
               " only, so the group counts"
    return replace(
        first, message=f"{first.message} [the same for each of {group}{note}]", group=group,
        members=refs, waived=reason, fingerprint=fingerprint(first),
        merged=tuple(dict.fromkeys(fingerprint(m) for m in members)),
        locations=tuple(m.location for m in members[1:]),
        assumptions=tuple(dict.fromkeys(a for m in members for a in m.assumptions)))


def _across_rules(findings: list[Finding], fingerprint) -> list[Finding]:
    by_cause: dict[tuple, list[int]] = {}
    for i, f in enumerate(findings):
        head = f.headline
        if not f.cause or head is None:
            continue
        by_cause.setdefault((f.cause, f.element, head.unit, _rounded(head.value),
                             bool(f.waived)), []).append(i)
    dropped: set[int] = set()
    kept: dict[int, Finding] = {}
    for idx in by_cause.values():
        rules = {findings[i].rule for i in idx}
        if len(rules) < 2:
            continue
        idx.sort(key=lambda i: (-findings[i].severity.rank, findings[i].rule))
        first = findings[idx[0]]
        others = [findings[i] for i in idx[1:] if findings[i].rule != first.rule]
        also = tuple(dict.fromkeys(o.rule for o in others))
        kept[idx[0]] = replace(
            first, message=f"{first.message} (also found by {', '.join(also)})", also=also,
            fingerprint=first.fingerprint or fingerprint(first),
            merged=tuple(dict.fromkeys(first.merged or (fingerprint(first),)))
            + tuple(p for o in others for p in (o.merged or (fingerprint(o),))),
            assumptions=tuple(dict.fromkeys(a for f in [first, *others] for a in f.assumptions)))
        dropped.update(i for i in idx[1:] if findings[i].rule != first.rule)
    return [kept.get(i, f) for i, f in enumerate(findings) if i not in dropped]


def _rounded(value: float) -> float:
    """Figures equal to the digits a report shows are the same figure (two rules may reach one
    voltage by different sums)."""
    return float(f"{value:.4g}") if math.isfinite(value) else value


def _figures_key(f: Finding) -> tuple:
    return tuple((fig.name, fig.unit, _rounded(fig.value)) for fig in f.figures)


_REF = re.compile(r"^(.*?)(\d+)$")


def refs_span(refs: Iterable[str]) -> str:
    """Reference designators in short: "Q1–Q4" for a run of numbers, else "Q1/Q3/Q6"."""
    refs = list(refs)
    parts = [_REF.match(r) for r in refs]
    if len(refs) > 1 and all(parts) and len({p.group(1) for p in parts}) == 1:
        numbers = [int(p.group(2)) for p in parts]
        if numbers == list(range(numbers[0], numbers[0] + len(numbers))):
            return f"{refs[0]}–{refs[-1]}"
    return "/".join(refs)
