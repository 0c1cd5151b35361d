"""The layers of DEVELOPERS.md import one way only (checked by parsing every module)."""

import ast
import pathlib

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[1] / "workbook"

# rank of each top-level module or sub-package; a module may import only equal-or-lower ranks
# (equal rank: within a layer, e.g. valve uses restrictor)
RANK = {
    "__init__": 0, "errors": 0, "safetext": 0, "constants": 0, "numerics": 0, "formatting": 0, "grading": 0,
    "units": 1, "unit_spelling": 1, "fields": 1, "inputs": 1,
    "fluid": 2, "restrictor": 2, "cylinder": 2, "supply": 2, "valve": 2,
    "circuit": 3,
    "checks": 4,
    "record": 5,
    "studies": 6,
    "design": 7, "review": 7, "design_edit": 7,
    "ui": 8,
    "tools": 9,
    "cli": 9, "__main__": 9,
    "cycle": 3, "cycle_file": 7, "transient": 3,
}
PHYSICS = {"fluid", "restrictor", "cylinder", "supply", "valve", "circuit"}


def _modules():
    for path in sorted(ROOT.rglob("*.py")):
        rel = path.relative_to(ROOT)
        yield rel.parts[0].removesuffix(".py"), path


def _imports(path):
    tree = ast.parse(path.read_text(encoding="utf-8"))
    rel_parts = path.relative_to(ROOT).parts
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level == 0:
                if node.module and node.module.startswith("workbook"):
                    parts = node.module.split(".")
                    if len(parts) > 1:
                        yield parts[1], node.lineno
                    else:
                        for alias in node.names:
                            yield alias.name, node.lineno
                else:
                    yield ("external:" + (node.module or "")), node.lineno
            else:
                # relative: resolve against the package of this file
                base = list(rel_parts[:-1])
                up = node.level - 1
                base = base[: len(base) - up] if up else base
                target = base + (node.module.split(".") if node.module else [])
                if target:
                    yield target[0], node.lineno
                else:
                    for alias in node.names:
                        yield alias.name, node.lineno
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith("workbook."):
                    yield alias.name.split(".")[1], node.lineno
                else:
                    yield "external:" + alias.name, node.lineno


@pytest.mark.parametrize("layer, path", list(_modules()), ids=lambda x: str(x).split("workbook/")[-1])
def test_imports_go_one_way(layer, path):
    assert layer in RANK, f"{path}: add its layer to DEVELOPERS.md and RANK"
    for target, line in _imports(path):
        if target.startswith("external:"):
            name = target.split(":", 1)[1].split(".")[0]
            if layer in PHYSICS:
                assert name not in {"pint", "ipywidgets", "bokeh", "jupyter_bokeh"}, f"{path}:{line} imports {name}"
            continue
        if target not in RANK:
            continue  # a name imported from the package root, e.g. CAUTION
        assert RANK[target] <= RANK[layer], f"{path}:{line}: {layer} (layer {RANK[layer]}) imports {target}"
