"""The model of one design the engine lints cleanly, for tests that read its figures."""

from __future__ import annotations

from pathlib import Path

from packwarden.engine import lint


def linted_model(path: str | Path, config: Path | None = None):
    """The model of the design at ``path``: it must lint with no input or internal error."""
    run = lint([str(path)], config=config)
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result.model
