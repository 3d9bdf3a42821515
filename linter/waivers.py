"""Waivers: accepted findings, declared in the design with a reason, an approver and an expiry."""

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
                if not expired and f.waived is None:
                    out[j] = replace(f, waived=waiver.reason)
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
