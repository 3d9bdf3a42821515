"""Waivers: accepted findings, declared in the design with a reason, an approver and an expiry.

A waiver may bound what it accepts (``up_to: 1.5 A``): the finding's headline figure, its first
(``Finding.headline``), must not exceed it. A finding beyond the ceiling, or with no figure in the
ceiling's unit, is not waived and says why; the waiver still counts as used, so waiver-hygiene
does not call it unused.
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
                beyond = _beyond_ceiling(waiver.up_to, f, pos.line)
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


def _beyond_ceiling(up_to: str | None, f: Finding, line: int) -> str | None:
    """Why the waiver at ``line`` with ceiling ``up_to`` does not cover ``f``, or None when it
    does (or has no ceiling)."""
    if up_to is None:
        return None
    from .quantities import format_quantity, parse_any_quantity
    ceiling, unit = parse_any_quantity(up_to)  # validated with the design: it parses
    head = f.headline
    shown = format_quantity(ceiling, unit)
    if head is None or head.unit != unit:
        return (f"not waived: the waiver at line {line} bounds a figure in {unit} up to {shown}, "
                f"and this finding's headline figure is " +
                (f"{head.name} in {head.unit or 'a count'}" if head is not None else "missing"))
    # A hair of relative slack: a ceiling copied from a report's three digits still covers the
    # figure it was copied from when that rounds down to it.
    if head.value <= ceiling * (1 + 5e-4) if ceiling >= 0 else head.value <= ceiling * (1 - 5e-4):
        return None
    return (f"not waived: the waiver at line {line} up to {shown} does not cover "
            f"{head.name} {format_quantity(head.value, unit)}")
