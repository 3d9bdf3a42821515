"""A folder's repository looked up once a run (``Session.named_roots``), as ``discover`` does:
the designs of one folder share it, and a design that links out of the repository is still
refused after a good one of the same folder was read, its own links resolved each time.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from packwarden import pipeline
from packwarden.engine import lint, load_registry

GOOD = Path(__file__).resolve().parent.parent / "example_designs" / "orchard-probe.yaml"


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    root = tmp_path / "repo"
    (root / "designs").mkdir(parents=True)
    (root / "packwarden.toml").write_text("", encoding="utf-8")
    shutil.copytree(GOOD.parent / "parts", root / "parts")
    text = GOOD.read_text(encoding="utf-8").replace("libraries: [parts/", "libraries: [../parts/")
    for name in ("a-good.yaml", "b-good.yaml"):
        (root / "designs" / name).write_text(text, encoding="utf-8")
    outside = tmp_path / "elsewhere.yaml"
    outside.write_text(text, encoding="utf-8")
    try:
        (root / "designs" / "c-out.yaml").symlink_to(outside)
    except (OSError, NotImplementedError) as exc:
        pytest.skip(f"this file system cannot make a link: {exc}")
    return root


def test_one_walk_per_folder_and_a_link_out_still_refused(repo, monkeypatch):
    walks = []
    real = pipeline.named_root

    def counted(start):
        walks.append(start)
        return real(start)

    monkeypatch.setattr(pipeline, "named_root", counted)
    monkeypatch.chdir(repo)
    run = lint(["designs"], registry=load_registry())
    by_file = {d.file: d for d in run.designs}
    assert by_file["designs/a-good.yaml"].linted and by_file["designs/b-good.yaml"].linted
    assert [str(e) for e in by_file["designs/c-out.yaml"].errors] == [
        "designs/c-out.yaml:1:1: the design links outside its repository (.); it is not read"]
    # three designs in one folder: one walk to discover them, one for their lints (was four)
    assert len(walks) == 2
