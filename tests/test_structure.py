"""The shape of the package, read from its source with `ast`: no import cycles between tabq's
modules, and no private name (a leading underscore) used outside the module that defines it."""

import ast
from pathlib import Path

import pytest

import tabq

PACKAGE = Path(tabq.__file__).parent


def _modules() -> dict[str, Path]:
    found = {}
    for path in PACKAGE.rglob("*.py"):
        parts = path.relative_to(PACKAGE.parent).with_suffix("").parts
        name = ".".join(parts[:-1] if parts[-1] == "__init__" else parts)
        found[name] = path
    return found


MODULES = _modules()


def _base(name: str, level: int, module: str | None) -> str:
    """The absolute name of a relative import's target package or module."""
    package = name if MODULES[name].name == "__init__.py" else name.rpartition(".")[0]
    for _ in range(level - 1):
        package = package.rpartition(".")[0]
    return f"{package}.{module}" if module else package


def _imports(name: str) -> dict[str, set[str]]:
    """Each tabq module this one imports (at any depth of its code), with the names it takes
    from it."""
    tree = ast.parse(MODULES[name].read_text(encoding="utf-8"))
    found: dict[str, set[str]] = {}
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            base = _base(name, node.level, node.module) if node.level else node.module or ""
            for alias in node.names:
                sub = f"{base}.{alias.name}"
                if sub in MODULES:                      # `from . import records`
                    found.setdefault(sub, set())
                elif base in MODULES:
                    found.setdefault(base, set()).add(alias.name)
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name in MODULES:
                    found.setdefault(alias.name, set())
    found.pop(name, None)
    return found


def _graph() -> dict[str, set[str]]:
    """Who imports whom. A package's own `__init__` re-exporting its modules, and a module
    importing a sibling through its package, are how packages work, not cycles."""
    graph = {}
    for name in MODULES:
        edges = set()
        for target in _imports(name):
            if MODULES[target].name == "__init__.py" and name.startswith(target + "."):
                continue                                # a module of the package itself
            edges.add(target)
        graph[name] = edges
    return graph


def _cycle(graph: dict[str, set[str]]) -> list[str] | None:
    state: dict[str, int] = {}
    path: list[str] = []

    def visit(node: str) -> list[str] | None:
        state[node] = 1
        path.append(node)
        for nxt in sorted(graph[node]):
            if state.get(nxt) == 1:
                return path[path.index(nxt):] + [nxt]
            if nxt not in state and (found := visit(nxt)):
                return found
        path.pop()
        state[node] = 2
        return None

    for node in sorted(graph):
        if node not in state and (found := visit(node)):
            return found
    return None


def test_no_import_cycles():
    cycle = _cycle(_graph())
    assert cycle is None, " → ".join(cycle)


def test_the_cycle_finder_finds_a_planted_cycle():
    graph = _graph()
    graph["tabq.records"] = graph["tabq.records"] | {"tabq.cli"}   # cli reaches records
    assert _cycle(graph) is not None


def _private(name: str) -> bool:
    return name.startswith("_") and not name.startswith("__")


def _private_uses(name: str) -> list[str]:
    """Private names this module takes from another tabq module, by import or attribute."""
    imported = _imports(name)
    uses = [f"from {m} import {n}" for m, names in imported.items() for n in names
            if _private(n)]
    tree = ast.parse(MODULES[name].read_text(encoding="utf-8"))
    aliases = {}
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            base = _base(name, node.level, node.module) if node.level else node.module or ""
            for alias in node.names:
                if f"{base}.{alias.name}" in MODULES:
                    aliases[alias.asname or alias.name] = f"{base}.{alias.name}"
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name in MODULES:
                    aliases[alias.asname or alias.name] = alias.name
    for node in ast.walk(tree):
        if (isinstance(node, ast.Attribute) and isinstance(node.value, ast.Name)
                and node.value.id in aliases and _private(node.attr)):
            uses.append(f"{aliases[node.value.id]}.{node.attr}")
    return uses


def test_no_private_name_is_used_outside_its_module():
    found = {name: uses for name in MODULES if (uses := _private_uses(name))}
    assert not found, found


def test_the_private_name_check_sees_both_ways_of_reaching_one():
    source = "from .store import _learned\nfrom . import load\nload._read_bytes\n"
    path = PACKAGE / "_planted_for_test.py"
    MODULES["tabq._planted_for_test"] = path
    try:
        path.write_text(source)
        assert set(_private_uses("tabq._planted_for_test")) == {
            "from tabq.store import _learned", "tabq.load._read_bytes"}
    finally:
        path.unlink()
        del MODULES["tabq._planted_for_test"]


def test_every_package_is_listed_for_installing():
    """A subpackage missing from pyproject's list is left out of the wheel: `pip install .`
    then gives a tabq that cannot import itself (this happened once)."""
    tomllib = pytest.importorskip("tomllib")     # Python 3.11 and later
    root = Path(__file__).resolve().parent.parent
    listed = set(tomllib.loads((root / "pyproject.toml").read_text())["tool"]["setuptools"][
        "packages"])
    source = root / "tabq"
    packages = {".".join(p.parent.relative_to(root).parts) for p in source.rglob("__init__.py")}
    assert packages <= listed, sorted(packages - listed)
