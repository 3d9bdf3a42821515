"""The stand-in for pydantic's plugin loader while pydantic's plugins are off (``plugins_off``).

The reference is pydantic's own ``pydantic.plugin._loader.get_plugins`` (pydantic 2's plugin
mechanism, documented under "Plugins" in pydantic's docs [published]): for each value of
``PYDANTIC_DISABLE_PLUGINS`` the stand-in answers what pydantic's loader answers, a model built
under it validates and fails alike, and a run of ``packwarden check`` imports no
``importlib.metadata``. Each case runs in a fresh interpreter, since the stand-in can only be put
in place before pydantic first asks for its loader.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent

PROBE = r"""
import json, os, sys
from packwarden import plugins_off
installed = plugins_off.install() if sys.argv[1] == "stand-in" else False
from pydantic import BaseModel, ValidationError
class Cell(BaseModel):
    voltage: float
from pydantic.plugin._loader import get_plugins
answers = [list(get_plugins())]
os.environ.pop("PYDANTIC_DISABLE_PLUGINS", None)   # turned on again later in the process
answers.append([type(p).__name__ for p in get_plugins()])
try:
    Cell(voltage="four")
except ValidationError as exc:
    error = str(exc)
print(json.dumps({"installed": installed, "answers": answers, "error": error,
                  "ok": Cell(voltage="4.2").voltage,
                  "validator": type(Cell.__pydantic_validator__).__name__,
                  "metadata": "importlib.metadata" in sys.modules}))
"""


def probe(way: str, value: str | None) -> dict:
    env = {k: v for k, v in os.environ.items() if k != "PYDANTIC_DISABLE_PLUGINS"}
    if value is not None:
        env["PYDANTIC_DISABLE_PLUGINS"] = value
    proc = subprocess.run([sys.executable, "-c", PROBE, way], capture_output=True, text=True,
                          env=env, cwd=REPO)
    assert proc.returncode == 0, proc.stderr
    return json.loads(proc.stdout)


@pytest.mark.parametrize("value", ["__all__", "1", "true", None, "", "false", "some-plugin"])
def test_answers_as_pydantics_loader(value: str | None) -> None:
    ours, theirs = probe("stand-in", value), probe("pydantic", value)
    assert ours["installed"] == (value in ("__all__", "1", "true"))
    for key in ("answers", "error", "ok", "validator"):
        assert ours[key] == theirs[key], key
    assert ours["validator"] == "SchemaValidator"


def test_the_stand_in_spares_importing_importlib_metadata_until_asked() -> None:
    # importlib.metadata comes in only when plugins are turned on again in the process
    code = PROBE.replace('os.environ.pop("PYDANTIC_DISABLE_PLUGINS", None)', "pass")
    env = {**os.environ, "PYDANTIC_DISABLE_PLUGINS": "__all__"}
    out = subprocess.run([sys.executable, "-c", code, "stand-in"], capture_output=True,
                         text=True, env=env, cwd=REPO)
    assert json.loads(out.stdout)["metadata"] is False, out.stderr
    assert probe("stand-in", "__all__")["metadata"] is True
