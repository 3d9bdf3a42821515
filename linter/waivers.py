"""Waivers: accepted findings, declared in the design with a reason, an approver and an expiry.

A waiver may bound what it accepts: the finding's headline figure (``Finding.headline``, the
figure the rule named, else its first) must not exceed ``up_to`` when the finding worsens as the
figure grows, and must not fall below ``down_to`` when it worsens as the figure falls
(``Finding.lower_is_worse``, e.g. a trip minimum below the load). A bound of the other direction
only does not cover the finding: a ceiling on a figure whose fall is the fault would waive the
finding however bad it got. A finding beyond its bound, with no bound of its direction, or with
no figure in the bound's unit, is not waived and says why; the waiver still counts as used, so
waiver-hygiene does not call it unused.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import replace

from .api import Finding, Location, Severity
from .loader import Document
from .schema import Design

WAIVER_RULE = "waiver-hygiene"


def apply_waivers(findings: list[Finding], design: Design, doc: Document,
                  today: _dt.date) -> list[Finding]:
    """Mark waived findings; add findings for expired waivers and waivers that match nothing."""
    out = list(findings)
    for i, waiver in enumerate(design.waivers):
        path = ("waivers", i)
        pos = doc.where(path)
        loc = Location(doc.file, path, pos.line, pos.column)
        expired = False
        if waiver.expires:
            expired = waiver.expires < today
        matched = False
        for j, f in enumerate(out):
            if f.rule == waiver.rule and (waiver.element is None or f.element == waiver.element):
                matched = True
                if expired or f.waived is not None:
                    continue
                beyond = _beyond_bound(waiver.up_to, waiver.down_to, f, pos.line)
                out[j] = replace(f, waived=waiver.reason) if beyond is None else \
                    replace(f, message=f"{f.message} ({beyond})")
        if expired:
            out.append(Finding(WAIVER_RULE, Severity.error,
                               f"waiver for '{waiver.rule}'" +
                               (f" on {waiver.element}" if waiver.element else "") +
                               f" expired on {waiver.expires}; its findings count again",
                               loc, hint="review the finding again and renew or remove the waiver",
                               element=waiver.element, key=f"expired-{waiver.rule}"
                               ).with_fingerprint(doc.file))
        elif not matched:
            out.append(Finding(WAIVER_RULE, Severity.warning,
                               f"waiver for '{waiver.rule}'" +
                               (f" on {waiver.element}" if waiver.element else "") +
                               " matches no finding", loc,
                               hint="remove the waiver if the finding was fixed", element=waiver.element,
                               key=f"unused-{waiver.rule}").with_fingerprint(doc.file))
    return out


def _beyond_bound(up_to: str | None, down_to: str | None, f: Finding, line: int) -> str | None:
    """Why the waiver at ``line`` with bounds ``up_to`` and ``down_to`` does not cover ``f``, or
    None when it does (or has no bound)."""
    if up_to is None and down_to is None:
        return None
    head = f.headline
    key, bound, other = ("down_to", down_to, up_to) if f.lower_is_worse else ("up_to", up_to, down_to)
    if bound is None:
        name = head.name if head is not None else "its headline figure"
        return (f"not waived: the waiver at line {line} has no {key}, and this finding worsens as "
                f"{name} {'falls' if f.lower_is_worse else 'grows'}")
    from .quantities import format_quantity, parse_any_quantity
    limit, unit = parse_any_quantity(bound)  # validated with the design: it parses
    shown = format_quantity(limit, unit)
    way = f"worse as it {'falls' if f.lower_is_worse else 'grows'}"
    if head is None or head.unit != unit:
        return (f"not waived: the waiver at line {line} bounds a figure in {unit} "
                f"{key.replace('_', ' ')} {shown}, and this finding's headline figure is " +
                (f"{head.name} in {head.unit or 'a count'}, {way}" if head is not None
                 else "missing"))
    # A hair of relative slack: a bound copied from a report's three digits still covers the
    # figure it was copied from when that rounds to it.
    loose = limit * (1 + 5e-4) if (limit >= 0) != f.lower_is_worse else limit * (1 - 5e-4)
    if (head.value >= loose) if f.lower_is_worse else (head.value <= loose):
        return None
    return (f"not waived: the waiver at line {line} {key.replace('_', ' ')} {shown} does not "
            f"cover {head.name} {format_quantity(head.value, unit)}, {way}")
