"""JSON for scripts: every design with its figures and findings; stable key order."""

from __future__ import annotations

import json
import math
from dataclasses import asdict

from .. import __version__
from ..figures import DECLARED
from ..results import RunResult
from .common import RenderOptions


def finding_dict(f) -> dict:
    out = {
        "rule": f.rule, "severity": f.severity.value, "message": f.message, "hint": f.hint,
        "element": f.element, "key": f.key,
        "location": {"file": f.location.file, "path": ".".join(str(p) for p in f.location.path),
                     "line": f.location.line, "column": f.location.column},
        "figures": [asdict(fig) for fig in f.figures],
        "headline": f.headline_dict(),
        "waived": f.waived, "fingerprint": f.fingerprint,
        "assumptions": list(f.assumptions),
    }
    if f.members:  # one cause on parallel packages (packwarden.grouping)
        out.update(group=f.group, members=list(f.members),
                   member_locations=[{"file": m.file, "path": m.dotted, "line": m.line,
                                      "column": m.column} for m in f.locations])
    if f.also:
        out["also_found_by"] = list(f.also)
    if f.merged:
        out["merged_fingerprints"] = list(f.merged)
    rel = f.location.related
    if rel is not None:  # a component of the schematic's netlist: the design that reads it
        out["location"]["design"] = {"file": rel.file, "line": rel.line, "column": rel.column}
    return out


def render(run: RunResult, opts: RenderOptions) -> str:
    out = {
        "tool": {"name": "packwarden", "version": __version__},
        "exit_code": run.exit_code(),
        "errors": [{"file": e.file, "line": e.line, "column": e.column, "message": e.message}
                   for e in run.input_errors()],
        "broken_plugins": [{"plugin": o, "message": m} for o, m in run.broken_plugins],
        "designs": [{
            "file": d.file, "name": d.name, "figures": key_figures(d.figures),
            "events": [event_dict(e) for e in d.events],
            "temperature_cutoffs": [_deep_rounded(c) for c in d.temperature_cutoffs],
            "findings": [finding_dict(f) for f in d.findings],
            "internal_errors": [asdict(i) for i in d.internal],
            "skipped_rules": d.skipped,
        } for d in run.designs],
    }
    cmp = opts.baseline
    if cmp is not None:  # --baseline / --since: "designs" holds the new findings only
        out["comparison"] = {
            "reference": cmp.reference, "new": len(cmp.new),
            "unchanged": [finding_dict(f) for f in cmp.unchanged],
            "absent": [e.as_dict() for e in cmp.absent],
        }
    return json.dumps(_finite(out), indent=2, sort_keys=False, ensure_ascii=False,
                      allow_nan=False) + "\n"


# The JSON report writes each design's events: the run keeps them for it (cli, batch.lint).
render.needs_events = True  # type: ignore[attr-defined]


def key_figures(figures: dict) -> dict:
    """A design's key figures as JSON writes them: by name in declaration order, counts as they
    are, measures rounded to 6 significant digits (more than any input carries), and null where
    not finite."""
    return {name: _rounded(figures[name].value) for name in DECLARED if name in figures}


def event_dict(event: dict) -> dict:
    """An event as JSON writes it: its measures rounded as the key figures are, at every depth
    (its element figures by element name, a switch package's heat, an inrush's corners)."""
    return _deep_rounded(event)


def _deep_rounded(node):
    if isinstance(node, dict):
        return {k: _deep_rounded(v) for k, v in node.items()}
    if isinstance(node, (list, tuple)):
        return [_deep_rounded(v) for v in node]
    return _rounded(node)


def _rounded(value):
    if isinstance(value, float):
        return float(f"{value:.6g}") if math.isfinite(value) else None
    return value


def _finite(node):
    """JSON has no infinity or NaN: a figure that is not finite (an open path) is written null."""
    if isinstance(node, float):
        return node if math.isfinite(node) else None
    if isinstance(node, dict):
        return {k: _finite(v) for k, v in node.items()}
    if isinstance(node, (list, tuple)):
        return [_finite(v) for v in node]
    return node
