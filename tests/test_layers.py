"""The package's imports point one way: no import cycle (function-level imports counted, imports
for type checkers only not), no private name imported from another module, and the model's layers
import only the layers below them (DEVELOPERS.md, "Layout")."""

import ast
from collections import defaultdict
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]
PACKAGES = (("linter", "packwarden"), ("rules", "packwarden_rules"))

# The model's layers, bottom first; a module may import its own layer and those before it.
MODEL_LAYERS = [
    {"values", "fit"},
    {"cells", "ocv", "rdson", "thermal", "copper", "fuse", "network", "inrush", "pulse",
     "thermistor"},
    {"topology", "gate"},
    {"path"},
    {"limits"},
    {"events", "short"},
    {"stress", "support", "storage", "survival", "coordination", "backup", "balance", "chargefault",
     "sensing"},
    {"design"},
    {"vector", "yield_"},
]


def _modules() -> dict[str, Path]:
    out = {}
    for folder, package in PACKAGES:
        for f in (REPO / folder).rglob("*.py"):
            rel = f.relative_to(REPO / folder).with_suffix("")
            out[".".join([package] + [p for p in rel.parts if p != "__init__"])] = f
    return out


def _type_checking_only(tree: ast.AST) -> set[int]:
    """ids of the import nodes inside ``if TYPE_CHECKING:`` blocks."""
    out = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            out |= {id(n) for n in ast.walk(node)}
    return out


def _imports() -> tuple[dict[str, set[str]], list[str]]:
    """Module -> the package modules it imports, and every private name imported across."""
    mods = _modules()
    edges: dict[str, set[str]] = defaultdict(set)
    private = []
    for name, f in mods.items():
        tree = ast.parse(f.read_text(encoding="utf-8"))
        skip = _type_checking_only(tree)
        here = name.split(".") if f.name == "__init__.py" else name.split(".")[:-1]
        for node in ast.walk(tree):
            if id(node) in skip:
                continue
            if isinstance(node, ast.ImportFrom):
                base = here[:len(here) - node.level + 1] if node.level else []
                target = ".".join(base + ([node.module] if node.module else [])) if node.level \
                    else (node.module or "")
                names = [a.name for a in node.names]
            elif isinstance(node, ast.Import):
                target, names = "", [a.name for a in node.names]
            else:
                continue
            for n in names:
                full = f"{target}.{n}" if target else n
                dest = full if full in mods else target
                if dest in mods and dest != name:
                    edges[name].add(dest)
                if target in mods and n.startswith("_") and not n.startswith("__"):
                    private.append(f"{name} imports {target}.{n}")
    return edges, private


def test_no_import_cycle():
    edges, _ = _imports()
    cycles = []

    def visit(node: str, stack: list[str], done: set[str]) -> None:
        for nxt in sorted(edges[node]):
            if nxt in stack:
                cycles.append(" -> ".join(stack[stack.index(nxt):] + [nxt]))
            elif nxt not in done:
                done.add(nxt)
                visit(nxt, stack + [nxt], done)

    for start in sorted(_modules()):
        visit(start, [start], {start})
    assert not cycles, sorted(set(cycles))[:10]


def test_no_private_name_is_imported_from_another_module():
    _, private = _imports()
    assert not private, private


@pytest.mark.parametrize("layer", range(len(MODEL_LAYERS)))
def test_the_model_layers_import_only_downwards(layer):
    edges, _ = _imports()
    allowed = set().union(*MODEL_LAYERS[:layer + 1])
    for module in MODEL_LAYERS[layer]:
        name = f"packwarden.model.{module}"
        above = sorted(d for d in edges[name] if d.startswith("packwarden.model.")
                       and d.rsplit(".", 1)[1] not in allowed)
        assert not above, f"{name} imports {above}"


def test_every_model_module_has_a_layer():
    mods = {m.rsplit(".", 1)[1] for m in _modules() if m.startswith("packwarden.model.")}
    assert mods == set().union(*MODEL_LAYERS)
