"""The package's layers: each module imports only from its own layer or the layers below it.

From the bottom: errors, physics, elements, studies, io, render, api, then the command (cli,
__main__) and the package's own __init__. Every import is read from the source (imports inside
functions included), so a lazy import cannot hide an upward one. The physics layer also never
imports the libraries of the edges (units, YAML, tables, plots, Touchstone files).
"""
from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "linecalc"
LAYERS = ["errors", "physics", "elements", "studies", "io", "render", "api", "cli"]
DATA = ("cable_data",)  # package data (the cable library), below everything
TOP = len(LAYERS) - 1  # cli, __main__ and the package __init__
EDGE_LIBRARIES = ("pint", "yaml", "tabulate", "matplotlib", "skrf", "jinja2", "argparse")


def _layer(module: str) -> int:
    """Layer index of a dotted module name under linecalc (the package itself is the top)."""
    parts = module.split(".")
    if len(parts) > 1 and parts[1] in DATA:
        return 0
    if len(parts) == 1 or parts[1] not in LAYERS:  # the package, its __init__, __main__, or a name they hold
        return TOP
    return LAYERS.index(parts[1])


def _modules():
    for path in sorted(PACKAGE.rglob("*.py")):
        relative = path.relative_to(PACKAGE.parent).with_suffix("")
        yield ".".join(relative.parts), path


def _imports(module: str, path: Path):
    """Every module that ``path`` imports, as absolute dotted names, with the line of the import."""
    package = module.rsplit(".", 1)[0] if path.name != "__init__.py" else module
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            for alias in node.names:
                yield alias.name, node.lineno
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")[: len(package.split(".")) - node.level + 1]
                name = ".".join(base + ([node.module] if node.module else []))
            else:
                name = node.module
            yield name, node.lineno
            for alias in node.names:  # from linecalc.physics import cables: the submodule counts
                yield f"{name}.{alias.name}", node.lineno


MODULES = list(_modules())


def test_every_module_has_a_layer():
    for module, _ in MODULES:
        assert 0 <= _layer(module) <= TOP, module


@pytest.mark.parametrize("module, path", MODULES, ids=[m for m, _ in MODULES])
def test_imports_run_downward(module, path):
    own = _layer(module)
    upward = []
    for name, line in _imports(module, path):
        if name == "linecalc" or name.startswith("linecalc."):
            target = _layer(name)
            if target > own:
                upward.append(f"{path.name}:{line} imports {name} ({LAYERS[target]} is above {LAYERS[own]})")
    assert not upward, upward


@pytest.mark.parametrize("module, path", [(m, p) for m, p in MODULES if _layer(m) <= LAYERS.index("elements")],
                         ids=[m for m, _ in MODULES if _layer(m) <= LAYERS.index("elements")])
def test_physics_and_elements_stay_free_of_edge_libraries(module, path):
    edge = [f"{path.name}:{line} imports {name}" for name, line in _imports(module, path)
            if name.split(".")[0] in EDGE_LIBRARIES]
    assert not edge, edge


def test_the_check_catches_an_upward_import(tmp_path):
    """The checker itself: a physics module that imports a study is reported."""
    bad = tmp_path / "bad.py"
    bad.write_text("def f():\n    from linecalc.studies.budget import solve_budget\n")
    imported = [name for name, _ in _imports("linecalc.physics.bad", bad)]
    assert any(_layer(name) > _layer("linecalc.physics.bad") for name in imported if name.startswith("linecalc."))
