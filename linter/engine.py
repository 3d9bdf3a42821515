"""The engine's public entry points, gathered from the modules that each do one job:

* :mod:`registry` — rules from entry points and folders, plugins a run requires;
* :mod:`pipeline` — one design from file to findings, in phases (rules, policy, waivers);
* :mod:`batch` — a run over many designs, worker processes for a large batch;
* :mod:`results` — what a run hands the formatters.

Team packages, the command and the tests import from here; the engine's own modules import each
other directly, downwards (results ← registry ← pipeline ← batch).
"""

from .batch import PARALLEL_MIN_DESIGNS, default_jobs, lint, worker_count
from .pipeline import (PHASES, DesignRun, Session, describe, design_identity, discover,
                       format_of, is_design_text, lint_file, make_model, model_figures,
                       policy_phase, rule_phase, run_rules, waiver_phase, group_phase)
from .registry import (ENTRY_POINT_GROUP, Registry, RequiredPluginError, load_folder,
                       load_registry, missing_plugins, normalize_name, require_plugins)
from .results import DesignResult, InternalError, RunResult

__all__ = ["PARALLEL_MIN_DESIGNS", "default_jobs", "lint", "worker_count", "PHASES", "DesignRun",
           "Session", "describe", "design_identity", "discover", "format_of", "is_design_text",
           "lint_file", "make_model", "model_figures", "policy_phase", "rule_phase", "run_rules",
           "waiver_phase", "group_phase", "ENTRY_POINT_GROUP", "Registry", "RequiredPluginError",
           "load_folder",
           "load_registry", "missing_plugins", "normalize_name", "require_plugins",
           "DesignResult", "InternalError", "RunResult"]
