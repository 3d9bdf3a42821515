"""Where team rules come from, and where they never come from; required plugins; rule isolation.

Code loads only from installed entry points and from folders the project's own config names.
Every test here that checks code did *not* run plants a module that would leave a marker file if
it were ever imported, then looks for the marker.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest
from typer.testing import CliRunner

from packwarden.cli import app
from packwarden.engine import (Registry, RequiredPluginError, lint, load_folder, load_registry,
                               missing_plugins, normalize_name)
from packwarden.report import RenderOptions, formatter
from packwarden.schema import Design, PartLibrary

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = (REPO / "example_designs" / "orchard-probe.yaml").read_text(encoding="utf-8")
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"
BAD_PART = EXAMPLE.replace("part: OR-FET-D20", "part: OR-FET-D2O")


def trap(name: str) -> str:
    """Module text that leaves ``<name>.imported`` beside itself when imported, and a rule."""
    return textwrap.dedent(f'''
        from pathlib import Path
        Path(__file__).with_name("{name}.imported").write_text("ran")

        from packwarden import rule

        @rule(id="{name}", summary="planted by the repository under review", scope="netlist")
        def check(ctx, options):
            """Must never run unless a trusted config names its folder."""
            yield ctx.finding("planted rule ran", path=("components",))
    ''')


@pytest.fixture
def repo(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    (tmp_path / ".git").mkdir()
    (tmp_path / "designs" / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, tmp_path / "designs" / "parts" / "orchard-parts.yaml")
    (tmp_path / "designs" / "probe.yaml").write_text(EXAMPLE, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    return tmp_path


def plant(folder: Path, name: str) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    (folder / f"{name.replace('-', '_')}.py").write_text(trap(name), encoding="utf-8")
    return folder / f"{name}.imported"


# --- the two ways in, and no third ------------------------------------------------------------

def test_a_rule_folder_in_the_repository_loads_only_when_its_config_names_it(repo: Path) -> None:
    marker = plant(repo / "team_rules", "team-planted")
    run = lint(["designs/probe.yaml"])
    assert "team-planted" not in run.rules
    assert not marker.exists()
    (repo / "pyproject.toml").write_text('[tool.packwarden]\nrule_paths = ["team_rules"]\n')
    run = lint(["designs/probe.yaml"])
    assert marker.exists()  # named by the config: the config is trusted, its folder runs
    assert run.rules["team-planted"].origin.endswith("team_planted.py")
    assert [f.message for f in run.all_findings()] == ["planted rule ran"]


def test_config_pins_the_rule_folders_and_the_repository_config_is_not_read(
        repo: Path, tmp_path_factory: pytest.TempPathFactory) -> None:
    marker = plant(repo / "team_rules", "team-planted")
    (repo / "pyproject.toml").write_text('[tool.packwarden]\nrule_paths = ["team_rules"]\n')
    trusted = tmp_path_factory.mktemp("trusted") / "packwarden.toml"
    trusted.write_text('fail_on = "error"\n')
    run = lint(["designs/probe.yaml"], config=trusted)
    assert "team-planted" not in run.rules and not marker.exists()
    assert run.designs[0].figures and run.all_findings() == []


CODE_KEYS = ["rule_paths", "plugins", "rules", "require_plugins", "import", "module", "policy"]


@pytest.mark.parametrize("key", CODE_KEYS)
def test_a_design_cannot_name_a_module(repo: Path, key: str) -> None:
    marker = plant(repo / "designs" / "evil", "design-planted")
    text = EXAMPLE + f"{key}: [evil]\n"
    (repo / "designs" / "probe.yaml").write_text(text, encoding="utf-8")
    run = lint(["designs/probe.yaml"])
    [err] = run.input_errors()
    line = text.count("\n")
    assert (err.file, err.line, err.column) == ("designs/probe.yaml", line, 1)
    assert err.message.startswith(f"unknown key '{key}' in the top level")
    assert run.exit_code() == 2
    assert not marker.exists() and "design-planted" not in run.rules


@pytest.mark.parametrize("key", ["rule_paths", "plugins", "import"])
def test_a_part_library_cannot_name_a_module(repo: Path, key: str) -> None:
    marker = plant(repo / "designs" / "parts" / "evil", "library-planted")
    lib = repo / "designs" / "parts" / "orchard-parts.yaml"
    lib.write_text(lib.read_text(encoding="utf-8") + f"{key}: [evil]\n", encoding="utf-8")
    run = lint(["designs/probe.yaml"])
    [err] = run.input_errors()
    assert err.file == "designs/parts/orchard-parts.yaml"
    assert err.message.startswith(f"unknown key '{key}' in the top level")
    assert not marker.exists()


def test_no_design_or_library_field_takes_code() -> None:
    # The formats hold data only: every top-level field of either is one the format documents.
    # (`schematic` names a netlist file, read as data by packwarden's own reader.)
    assert set(Design.model_fields) == {"format", "design", "libraries", "pack", "load", "charger",
                                        "storage", "schematic", "stacks", "components", "waivers"}
    assert set(PartLibrary.model_fields) == {"format", "include", "parts"}


def _command() -> str:
    found = shutil.which("packwarden", path=str(Path(sys.executable).parent))
    if found is None:
        pytest.skip(f"no packwarden script next to {sys.executable}; install the package first")
    return found


def test_the_repository_under_review_cannot_shadow_modules_or_register_entry_points(
        repo: Path) -> None:
    """Run from inside a hostile checkout: nothing in it may be imported.

    It holds modules named like packwarden's own dependencies and its built-in rule package, and
    a fake installed distribution (``*.dist-info`` with ``entry_points.txt``) registering a rule:
    had the working folder been on the import path, each would have run.
    """
    markers = []
    for module in ("yaml", "pydantic", "typer", "packwarden_rules", "evil_rules"):
        (repo / f"{module}.py").write_text(
            f"from pathlib import Path\nPath(__file__).with_name('{module}.imported').write_text('x')\n")
        markers.append(repo / f"{module}.imported")
    dist = repo / "evil_rules-1.0.dist-info"
    dist.mkdir()
    (dist / "METADATA").write_text("Metadata-Version: 2.1\nName: evil-rules\nVersion: 1.0\n")
    (dist / "entry_points.txt").write_text("[packwarden.rules]\nevil-rule = evil_rules:check\n")
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONSTARTUP")}
    rules = subprocess.run([_command(), "rules"], cwd=repo, capture_output=True, text=True, env=env)
    check = subprocess.run([_command(), "check", "designs/probe.yaml"], cwd=repo,
                           capture_output=True, text=True, env=env)
    # (exit codes are left to the CLI tests: a built-in rule under construction may be broken)
    assert "unknown-part" in rules.stdout and "evil" not in rules.stdout + rules.stderr
    assert "1 design(s) linted, 0 could not be read" in check.stdout, check.stdout + check.stderr
    assert "evil" not in check.stdout + check.stderr
    assert [m.name for m in markers if m.exists()] == []


# --- required plugins ---------------------------------------------------------------------------

def test_names_compare_as_packaging_compares_them() -> None:
    # [published: PEP 503, "Normalized Names": runs of -, _ and . fold to -, case-insensitive]
    assert normalize_name("Tallgrass_Packwarden.Rules") == "tallgrass-packwarden-rules"
    assert normalize_name("a--b__c..d") == "a-b-c-d"


def test_an_installed_rule_distribution_satisfies_the_requirement(repo: Path) -> None:
    reg = load_registry()
    assert missing_plugins(reg, ["packwarden", "PackWarden"]) == []
    run = lint(["designs/probe.yaml"], require=["packwarden"])
    assert [d.name for d in run.designs] == ["Orchard soil probe"]


def test_a_missing_plugin_fails_before_any_design_is_read(repo: Path) -> None:
    with pytest.raises(RequiredPluginError) as err:
        lint(["designs/probe.yaml", "designs/no-such.yaml"],
             require=["tallgrass-packwarden-rules", "pytest"])
    lines = str(err.value).splitlines()
    assert lines == [
        "--require-plugins: required plugin 'tallgrass-packwarden-rules' is not installed "
        "(distributions registering rules here: packwarden); install it, or drop it from the "
        "required plugins",
        # pytest is installed in the test environment but registers no packwarden rules
        "--require-plugins: required plugin 'pytest' is installed but registers no rules in the "
        "'packwarden.rules' entry-point group",
    ]


def test_require_plugins_from_the_config_points_at_the_config(repo: Path) -> None:
    (repo / "pyproject.toml").write_text(
        '[tool.packwarden]\nrequire_plugins = ["packwarden", "tallgrass-packwarden-rules"]\n')
    with pytest.raises(RequiredPluginError) as err:
        lint(["designs/probe.yaml"])
    assert str(err.value).startswith("pyproject.toml:2:35: required plugin "
                                     "'tallgrass-packwarden-rules' is not installed")


def test_require_plugins_on_the_command_line_exits_2_with_nothing_linted(repo: Path) -> None:
    result = CliRunner().invoke(app, ["check", "--require-plugins", "packwarden, tallgrass-rules",
                                      "designs/probe.yaml"])
    assert result.exit_code == 2
    assert result.stdout == ""  # fail fast: no report of a review that would lack the team rules
    assert result.stderr.strip() == (
        "--require-plugins: required plugin 'tallgrass-rules' is not installed (distributions "
        "registering rules here: packwarden); install it, or drop it from the required plugins")
    ok = CliRunner().invoke(app, ["check", "--require-plugins", "packwarden", "designs/probe.yaml"])
    assert "1 design(s) linted, 0 could not be read" in ok.stdout, ok.stdout


# --- isolation ----------------------------------------------------------------------------------

ISOLATION_RULES = '''
    import sys
    from packwarden import rule

    @rule(id="divides-by-zero", summary="fails on one design", scope="netlist")
    def divides(ctx, options):
        """Fails only on the design with a second cell."""
        if "BT2" in ctx.netlist.components:
            1 / 0
        yield from ()

    @rule(id="yields-text", summary="yields something that is no finding", scope="netlist")
    def text(ctx, options):
        """A rule author's slip: a string instead of ctx.finding(...)."""
        yield "Q1 looks wrong"

    @rule(id="exits", summary="calls sys.exit", scope="netlist")
    def exits(ctx, options):
        """Would end the whole run if not contained."""
        sys.exit(3)
        yield from ()
'''


def isolation_registry(root: Path) -> Registry:
    folder = root / "team"
    folder.mkdir()
    (folder / "isolation.py").write_text(textwrap.dedent(ISOLATION_RULES), encoding="utf-8")
    full = load_registry()
    reg = Registry(rules={"unknown-part": full.rules["unknown-part"]})
    load_folder(reg, folder)
    assert reg.broken == [] and len(reg.rules) == 4
    return reg


def test_each_broken_rule_is_its_own_internal_error_and_the_rest_still_report(repo: Path) -> None:
    reg = isolation_registry(repo)
    (repo / "designs" / "bad-part.yaml").write_text(BAD_PART, encoding="utf-8")
    two_cells = EXAMPLE.replace("  U1:", "  BT2: {part: OR-CELL-3400, pins: {pos: B+, neg: B-}}\n  U1:")
    (repo / "designs" / "two-cells.yaml").write_text(two_cells, encoding="utf-8")
    run = lint(["designs/bad-part.yaml", "designs/probe.yaml", "designs/two-cells.yaml"],
               registry=reg)
    by_file = {d.file: d for d in run.designs}
    internal = {(d.file, i.rule): i.message for d in run.designs for i in d.internal}
    for f in by_file:
        assert internal[(f, "yields-text")] .startswith("TypeError: rule yielded str, not a Finding")
        assert internal[(f, "exits")].startswith("SystemExit: 3 (at isolation.py:")
    assert internal[("designs/two-cells.yaml", "divides-by-zero")].startswith(
        "ZeroDivisionError: division by zero (at isolation.py:")
    assert ("designs/probe.yaml", "divides-by-zero") not in internal
    # the other rule's findings survive on the design where three rules broke
    assert [f.rule for f in by_file["designs/bad-part.yaml"].findings] == ["unknown-part"]
    assert run.exit_code() == 2
    text = formatter("text")(run, RenderOptions())
    assert ("designs/two-cells.yaml:1:1: internal error in rule 'divides-by-zero': "
            "ZeroDivisionError: division by zero") in text
    assert "3 design(s) linted, 0 could not be read; 1 error(s)" in text


def test_a_rule_module_that_exits_on_import_is_named_and_the_rest_load(tmp_path: Path) -> None:
    folder = tmp_path / "team"
    folder.mkdir()
    (folder / "a_exits.py").write_text("import sys\nsys.exit('no')\n", encoding="utf-8")
    (folder / "b_fine.py").write_text(trap("fine-rule"), encoding="utf-8")
    reg = Registry()
    load_folder(reg, folder)
    assert list(reg.rules) == ["fine-rule"]
    [(origin, message)] = reg.broken
    assert origin.endswith("a_exits.py") and message.endswith("failed to load: SystemExit: no")


def test_packwarden_rules_lists_the_folder_rules_its_config_names(repo: Path) -> None:
    marker = plant(repo / "team_rules", "team-planted")
    before = CliRunner().invoke(app, ["rules"])
    assert "team-planted" not in before.stdout and not marker.exists()
    (repo / "pyproject.toml").write_text('[tool.packwarden]\nrule_paths = ["team_rules"]\n')
    after = CliRunner().invoke(app, ["rules"])
    [row] = [ln for ln in after.stdout.splitlines() if ln.startswith("team-planted ")]
    assert row.split()[1:3] == ["error", "planted"]
    (repo / "pyproject.toml").write_text('[tool.packwarden]\nrule_path = ["team_rules"]\n')
    typo = CliRunner().invoke(app, ["rules"])
    assert typo.exit_code == 2
    assert typo.stdout.strip() == ("pyproject.toml:2:1: unknown config key 'rule_path' "
                                   "(did you mean 'rule_paths'?)")
