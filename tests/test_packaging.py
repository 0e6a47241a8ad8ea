"""pyproject.toml: the license is declared as PEP 639 wants it, every dependency is one tabq
imports, and every range stops below a version that could break it (docs/packaging.md)."""

import ast
from importlib import metadata
from pathlib import Path

import pytest
from packaging.requirements import Requirement

try:
    import tomllib
except ImportError:          # Python 3.10: pytest itself depends on tomli there
    tomllib = pytest.importorskip("tomli")

ROOT = Path(__file__).resolve().parent.parent


def _project() -> dict:
    return tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))["project"]


def _imported_modules() -> set[str]:
    """The top-level names every module of tabq imports."""
    found = set()
    for path in (ROOT / "tabq").rglob("*.py"):
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Import):
                found |= {alias.name.split(".")[0] for alias in node.names}
            elif isinstance(node, ast.ImportFrom) and node.level == 0 and node.module:
                found.add(node.module.split(".")[0])
    return found


def _top_level_names(distribution: str) -> set[str]:
    """The names an installed distribution puts at the top of site-packages (its packages and
    modules), read from its file list: Python 3.10's packages_distributions() reads only
    top_level.txt, which wheels such as duckdb's do not ship."""
    try:
        files = metadata.distribution(distribution).files or []
    except metadata.PackageNotFoundError:
        pytest.fail(f"{distribution} is declared but not installed: pip install '.[test]'")
    return {f.parts[0].split(".")[0] for f in files
            if not f.parts[0].endswith((".dist-info", ".data")) and f.parts[0] != ".."}


def test_the_license_is_an_spdx_expression_with_its_file():
    project = _project()
    assert project["license"] == "MIT"           # a string (PEP 639), not a {text = ...} table
    assert project["license-files"] == ["LICENSE"]
    text = (ROOT / "LICENSE").read_text(encoding="utf-8")
    assert text.startswith("MIT License") and "the tabq authors" in text


def test_every_dependency_is_imported_by_tabq():
    """A dependency nothing imports only lengthens installs and widens what can break."""
    imported = _imported_modules()
    unused = []
    for line in _project()["dependencies"]:
        name = Requirement(line).name
        if not _top_level_names(name) & imported:
            unused.append(name)
    assert not unused, f"declared but never imported in tabq/: {unused}"


def test_every_dependency_range_has_an_upper_bound():
    """An open range lets pip pick a next major version tabq was never run with."""
    open_ended = [line for line in _project()["dependencies"]
                  if not any(s.operator in ("<", "<=", "==", "~=")
                             for s in Requirement(line).specifier)]
    assert not open_ended, open_ended


def test_the_build_backend_reads_spdx_licenses():
    """setuptools reads `license = "MIT"` from version 77 on; older ones refuse the file."""
    requires = tomllib.loads((ROOT / "pyproject.toml").read_text())["build-system"]["requires"]
    setuptools = next(Requirement(r) for r in requires if Requirement(r).name == "setuptools")
    assert "76.9" not in setuptools.specifier and "77.0" in setuptools.specifier
