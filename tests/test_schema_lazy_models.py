"""Start-up of the schema: the ``{typ, min, max, tol}`` models are made on first use, not at import,
and ``schema.Before`` gives the core schema of pydantic's ``BeforeValidator``.

What a design may write and what an error says is pinned elsewhere (tests/hostile, the schema
tests, the generated JSON Schema); this holds only that importing the schema makes none of these
models, that a toleranced mapping makes its model and validates through it, and that the JSON
Schema of the format still holds the mapping form.
"""

from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent

PROBE = r"""
import json
from packwarden import schema
made_at_import = schema.given_model.cache_info().currsize
from pydantic import TypeAdapter, ValidationError
field = TypeAdapter(schema.Tol("V", gt=0))
value = field.validate_python({"typ": "4.2 V", "max": "4.25 V"})
try:
    field.validate_python({"typ": "4.2 V", "maximum": "4.25 V"})
except ValidationError as exc:
    error = exc.errors()[0]["type"]
print(json.dumps({"import": made_at_import, "after": schema.given_model.cache_info().currsize,
                  "typ": value.typ, "max": value.max, "error": error}))
"""


def test_no_model_at_import_and_one_on_first_use() -> None:
    out = subprocess.run([sys.executable, "-c", PROBE], capture_output=True, text=True, cwd=REPO)
    assert out.returncode == 0, out.stderr
    got = json.loads(out.stdout)
    assert got["import"] == 0
    assert got["after"] == 1
    assert (got["typ"], got["max"]) == (4.2, 4.25)
    assert got["error"] == "extra_forbidden"  # the mapping's model forbids unknown keys


def test_the_json_schema_still_gives_the_mapping_form() -> None:
    shipped = json.loads((REPO / "schemas" / "design.schema.json").read_text(encoding="utf-8"))
    text = json.dumps(shipped)
    assert '"typ"' in text and '"tol"' in text


def test_before_gives_pydantics_before_validator_schema() -> None:
    # the reference is pydantic's own BeforeValidator: the same core schema for the same field
    from typing import Annotated

    from pydantic import BaseModel, BeforeValidator, Field, TypeAdapter

    from packwarden.schema import Before, NetName, Tol

    def to_text(v):
        return str(v)

    def shown(schema) -> str:  # pydantic makes a new partial for each length check
        return re.sub(r" at 0x[0-9a-f]+", "", repr(schema))

    ours = TypeAdapter(Annotated[str, Before(to_text), Field(min_length=1)]).core_schema
    theirs = TypeAdapter(Annotated[str, BeforeValidator(to_text), Field(min_length=1)]).core_schema
    assert shown(ours) == shown(theirs)

    class Net(BaseModel):
        net: NetName
        limit: Tol("V", gt=0)  # type: ignore[valid-type]

    got = Net.model_validate({"net": 12, "limit": "4.2 V"})
    assert got.net == "12" and got.limit.typ == 4.2
