"""The per-environment cache of the entry points (``packwarden.entrycache``).

The reference is ``importlib.metadata`` itself (the standard library's reader of installed
distributions, PEP 376 / the packaging "entry points" specification [published]): whatever the
cache holds, what it answers must be what ``importlib.metadata`` answers at that moment. A fake
distribution (a ``*.dist-info`` folder with ``METADATA`` and ``entry_points.txt``) in a temporary
``sys.path`` entry is installed, changed and removed under it.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from packwarden import entrycache
from packwarden.entrycache import GROUPS, installed_entry_points, read_installed
from packwarden.registry import load_registry


def answer() -> dict:
    return {g: [[ep.name, ep.value, dist] for dist, ep in installed_entry_points(g)]
            for g in GROUPS}


def install(site: Path, version: str = "1.0", rules: str = "team-rule = team_rules:check\n") -> Path:
    info = site / f"acme_review-{version}.dist-info"
    info.mkdir(parents=True)
    (info / "METADATA").write_text(f"Metadata-Version: 2.1\nName: acme-review\nVersion: {version}\n",
                                   encoding="utf-8")
    (info / "entry_points.txt").write_text(f"[packwarden.rules]\n{rules}", encoding="utf-8")
    return info


def folder_on_path(folder: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A new, empty folder put first on ``sys.path`` for the test."""
    folder.mkdir()
    monkeypatch.syspath_prepend(str(folder))
    return folder


def remove(info: Path) -> None:
    for f in info.iterdir():
        f.unlink()
    info.rmdir()


@pytest.fixture
def cache(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    folder = tmp_path / "cache"
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", str(folder))
    return folder


def test_installing_changing_and_removing_a_plugin_is_seen(
        tmp_path: Path, cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    site = folder_on_path(tmp_path / "site", monkeypatch)
    first = answer()
    assert first == read_installed()
    assert list(cache.glob("entry-points-*.txt"))  # written
    assert answer() == first                          # and read back

    info = install(site)
    seen = answer()
    assert seen == read_installed()
    assert ["team-rule", "team_rules:check", "acme-review"] in seen["packwarden.rules"]

    # the same distribution's entry_points.txt rewritten in place (a reinstall of one version):
    # the file's size and time say so, even when the folder keeps its name
    (info / "entry_points.txt").write_text("[packwarden.rules]\nother-rule = team_rules:other\n"
                                           "[packwarden.formats]\nacme = team_rules:render\n",
                                           encoding="utf-8")
    seen = answer()
    assert seen == read_installed()
    assert ["acme", "team_rules:render", "acme-review"] in seen["packwarden.formats"]
    assert not any(r[0] == "team-rule" for r in seen["packwarden.rules"])

    remove(info)
    assert answer() == read_installed() == first

    install(site, version="2.0")  # upgraded: a new folder name
    assert answer() == read_installed() != first


def test_a_file_written_into_a_path_folder_keeps_the_cache(
        tmp_path: Path, cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # `python -m packwarden` puts the working folder on sys.path: saving a design there changes
    # nothing importlib.metadata reads, so the kept answer stands; a distribution put there is
    # seen at once
    work = folder_on_path(tmp_path / "work", monkeypatch)
    first = answer()
    reads = []
    real = entrycache.read_installed
    monkeypatch.setattr(entrycache, "read_installed", lambda: reads.append(1) or real())
    (work / "design.yaml").write_text("design: {}\n", encoding="utf-8")
    os.utime(work, ns=(1, 1))  # the folder's own time moved too, as any save moves it
    assert answer() == first and reads == []
    install(work)
    assert answer() == read_installed() != first and reads == [1]


def test_a_new_path_entry_is_another_environment_state(
        tmp_path: Path, cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    answer()
    site = tmp_path / "later"
    install(site)
    monkeypatch.syspath_prepend(str(site))
    assert answer() == read_installed()
    assert any(r[2] == "acme-review" for r in answer()["packwarden.rules"])


@pytest.mark.parametrize("content", [
    "", "{", "\x00\xff", "packwarden entry points 1", "packwarden entry points 0 STATE\n",
    "packwarden entry points 1 STATE\npackwarden.rules\tx\n",          # too few fields
    "packwarden entry points 1 STATE\nother.group\tx\tm:f\t\n",       # an unknown group
    "packwarden entry points 1 STATE\npackwarden.rules\t\tm:f\tacme\n",  # no name
    "packwarden entry points 1 STATE\npackwarden.rules\tx\tm:f\tacme",    # cut short
])
def test_a_corrupt_or_stale_cache_is_read_again(cache: Path, content: str) -> None:
    answer()
    (path,) = cache.glob("entry-points-*.txt")
    state = path.read_text(encoding="utf-8").split("\n")[0].split()[-1]
    path.write_bytes(content.replace("STATE", state).encode("latin-1"))
    assert answer() == read_installed()
    assert path.read_text(encoding="utf-8").startswith(entrycache.HEADER)  # written again


def test_a_cache_of_another_state_is_not_believed(cache: Path) -> None:
    answer()
    (path,) = cache.glob("entry-points-*.txt")
    header, rest = path.read_text(encoding="utf-8").split("\n", 1)
    other = "1" if header.endswith("0") else "0"  # another state, whatever this one ends with
    forged = f"{header[:-1]}{other}\npackwarden.rules\tghost\tghost:check\t\n{rest}"
    path.write_text(forged, encoding="utf-8")
    assert answer() == read_installed()
    assert not any(r[0] == "ghost" for r in answer()["packwarden.rules"])


def test_an_unwritable_cache_still_answers(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("a file where the cache folder would be", encoding="utf-8")
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", str(blocker / "cache"))
    assert answer() == read_installed()
    assert answer() == read_installed()


def test_an_empty_cache_setting_turns_the_cache_off(tmp_path: Path,
                                                     monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", "")
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path))
    assert entrycache.cache_dir() is None
    assert answer() == read_installed()
    assert not list(tmp_path.rglob("entry-points-*"))


def test_the_registry_from_the_cache_is_the_registry_without_it(
        cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    load_registry()  # fills the cache
    cached = load_registry()
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", "")
    direct = load_registry()
    assert list(cached.rules) == list(direct.rules)
    assert {k: r.origin for k, r in cached.rules.items()} == {k: r.origin for k, r in direct.rules.items()}
    assert cached.distributions == direct.distributions and cached.broken == direct.broken
    assert cached.plugins == direct.plugins


def test_the_state_reads_no_file_outside_the_path(tmp_path: Path,
                                                  monkeypatch: pytest.MonkeyPatch) -> None:
    # a missing or unreadable sys.path entry is part of the state, not an error
    monkeypatch.syspath_prepend(str(tmp_path / "missing"))
    state = entrycache.environment_state()
    assert [str(tmp_path / "missing"), None] in state
    assert os.fspath(tmp_path / "missing") not in os.listdir(tmp_path)


def test_the_folder_keeps_the_newest_files_of_each_kind(tmp_path: Path) -> None:
    # every environment and installed copy writes a file of its own; the folder must not grow
    # without end: past KEPT_PER_KIND files of one kind the least recently written go, and the
    # files of another kind, or of no kind, stay
    keep = entrycache.KEPT_PER_KIND
    other = tmp_path / "core-schemas-0000.pickle"
    other.write_bytes(b"x")
    stray = tmp_path / "notes.txt"
    stray.write_text("mine", encoding="utf-8")
    names = [f"entry-points-{i:04d}.txt" for i in range(keep + 5)]
    for i, name in enumerate(names):
        entrycache.write_cache_file(tmp_path / name, b"data")
        os.utime(tmp_path / name, ns=(i * 10**9, i * 10**9))  # written one second apart
    left = sorted(p.name for p in tmp_path.glob("entry-points-*"))
    assert left == names[-keep:]
    assert other.exists() and stray.exists()
    # a file written again (here one that had gone) is kept, the folder still at KEPT_PER_KIND
    entrycache.write_cache_file(tmp_path / names[0], b"again")
    assert (tmp_path / names[0]).read_bytes() == b"again"
    assert len(list(tmp_path.glob("entry-points-*"))) == keep


def test_each_entry_point_is_credited_to_its_own_distribution(
        monkeypatch: pytest.MonkeyPatch) -> None:
    # The reference: each entry point's own distribution name, read without any memo. Each group's
    # distributions are made anew and dropped once the group is read, as importlib.metadata makes
    # them; a distribution object made for a later group may then sit where one of an earlier
    # group sat (the same id), and must not be credited with the earlier one's name.
    import importlib.metadata as md

    class Dist:
        def __init__(self, name: str) -> None:
            self.name = name

    class EP:
        def __init__(self, name: str, dist: Dist) -> None:
            self.name, self.value, self.dist = name, f"{name}.mod:f", dist

    made: list[list] = []

    def entry_points(group: str) -> list:
        owner = "acme-review" if group == entrycache.GROUPS[0] else "packwarden"
        eps = [EP(f"{group}-{i}", Dist(owner)) for i in range(50)]
        made.append([[ep.name, ep.value, ep.dist.name] for ep in eps])
        return eps

    monkeypatch.setattr(md, "entry_points", entry_points)
    for _ in range(20):
        made.clear()
        found = entrycache.read_installed()
        assert [found[g] for g in entrycache.GROUPS] == made
