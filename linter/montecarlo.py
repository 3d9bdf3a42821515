"""``check --yield``: the production-yield Monte Carlo over a run's designs, and its report section.

The sampling and the physics are in :mod:`packwarden.model.yield_` (the only module that imports
numpy); this module runs it for each design the engine could model and adds a ``yield`` section to
the text or JSON report, so the formatters stay as they are for runs without ``--yield``.
"""

from __future__ import annotations

import json
import sys
from typing import Any

from .results import RunResult

#: The seed ``--yield`` uses unless ``--seed`` is given; cli.py repeats it as the option's default
#: (a test holds the two equal) so that importing the CLI never imports numpy.
DEFAULT_SEED = 20240601


def run_designs(run: RunResult, samples: int, seed: int = DEFAULT_SEED,
                distribution: str = "uniform") -> list[tuple[Any, Any]]:
    """(design result, YieldResult or the reason there is none) for every design of the run."""
    from .model.yield_ import YieldError, run_yield
    out = []
    for d in run.designs:
        if d.model is None or d.errors:
            out.append((d, "the design could not be read"))
            continue
        try:
            out.append((d, run_yield(d.model, samples, seed, distribution)))
        except (YieldError, ValueError) as exc:
            out.append((d, str(exc)))
        except Exception as exc:  # no design may end the run with a traceback
            out.append((d, f"internal error: {type(exc).__name__}: {exc}"))
    return out


def _ppm(x: float) -> str:
    return f"{x * 1e6:,.0f}" if x * 1e6 >= 10 else f"{x * 1e6:.2g}"


def text_section(results: list[tuple[Any, Any]]) -> str:
    lines = []
    for d, r in results:
        if isinstance(r, str):
            lines.append(f"{d.file}: yield: not run: {r}")
            continue
        lines.append(f"{d.file}: yield over {r.samples:,} builds ({r.distribution} draws, "
                     f"seed {r.seed}), failing share in ppm with its 95 % Wilson interval:")
        width = max(len(c.check) for c in r.checks)
        for c in r.checks:
            lo, hi = c.interval
            lines.append(f"    {c.rule:<20} {c.check:<{width}}  {_ppm(c.share):>9} ppm  "
                         f"[{_ppm(lo)}, {_ppm(hi)}]  ({c.failures} builds; {c.condition})")
        lines.append(f"    sampled: {', '.join(r.sampled)}")
        if r.held:
            lines.append(f"    declared but not entering these checks: {', '.join(r.held)}")
        for n in r.notes:
            lines.append(f"    note: {n}")
    lines.append("Yield figures follow from the declared tolerances alone; parts outside their "
                 "data sheets, assembly faults and ageing are not in them.")
    return "\n".join(lines) + "\n"


def as_dict(r: Any) -> dict:
    if isinstance(r, str):
        return {"error": r}
    return {
        "samples": r.samples, "seed": r.seed, "distribution": r.distribution,
        "interval": "wilson-95",
        "checks": [{"rule": c.rule, "check": c.check, "condition": c.condition,
                    "failures": c.failures, "samples": c.samples, "ppm": c.share * 1e6,
                    "ppm_low": c.interval[0] * 1e6, "ppm_high": c.interval[1] * 1e6}
                   for c in r.checks],
        "sampled": list(r.sampled), "held": list(r.held), "figures": r.figures,
        "notes": list(r.notes),
    }


def add_yield(text: str, fmt: str, run: RunResult, samples: int, seed: int = DEFAULT_SEED,
              distribution: str = "uniform") -> str:
    """The report ``text`` in format ``fmt`` with a yield section for each design added."""
    if fmt not in ("text", "json"):
        sys.stderr.write(f"packwarden check: --yield is reported in the text and json formats, "
                         f"not {fmt}\n")
        return text
    results = run_designs(run, samples, seed, distribution)
    if fmt == "text":
        return text + "\n" + text_section(results)
    doc = json.loads(text)
    for entry, (_, r) in zip(doc.get("designs", []), results):
        entry["yield"] = as_dict(r)
    return json.dumps(doc, indent=2, ensure_ascii=False, allow_nan=False) + "\n"
