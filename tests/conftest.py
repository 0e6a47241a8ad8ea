import os
import shutil
import tempfile
from importlib import resources
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
FIXTURES = Path(__file__).resolve().parent / "fixtures"

# The per-user model folder (`tabq teach` without --model) goes to a throwaway place, so the
# tests never read or change the real one; commands run by the tests inherit this.
os.environ["XDG_DATA_HOME"] = tempfile.mkdtemp(prefix="tabq-test-data-")
# TABQ_MODEL stands in for that folder: an empty throwaway one, so `tabq.open(path)` asks with
# the untaught model even where platformdirs ignores XDG_DATA_HOME (macOS) or the shell that
# runs the tests has a TABQ_MODEL of its own.
os.environ["TABQ_MODEL"] = os.path.join(tempfile.mkdtemp(prefix="tabq-test-model-"), "model")


@pytest.fixture(scope="session")
def penguins_csv(tmp_path_factory) -> Path:
    """The palmerpenguins package's own CSV (Horst, Hill & Gorman 2020), copied to a temp dir."""
    source = resources.files("palmerpenguins") / "data" / "penguins.csv"
    target = tmp_path_factory.mktemp("penguins") / "penguins.csv"
    with resources.as_file(source) as path:
        shutil.copy(path, target)
    return target


@pytest.fixture(scope="session")
def demo_csv() -> Path:
    return ROOT / "sample_tables" / "repair_jobs.csv"


def pytest_addoption(parser: pytest.Parser) -> None:
    parser.addoption("--long", action="store_true",
                     help="also run the tests marked long (whole sweeps, training runs); "
                          "CI (.ci/run) does")


def pytest_collection_modifyitems(config: pytest.Config, items: list[pytest.Item]) -> None:
    """Tests that fork run first: a fork copies only the forking thread, so a child forked after
    earlier tests left DuckDB worker threads running in this process can hang or abort in
    DuckDB's scheduler (seen with test_crash after test_confidence).

    Tests marked long are skipped unless --long is given, so that the README's plain `pytest`
    stays a few minutes on a 2-core machine; the skip line names the option."""
    items.sort(key=lambda item: 0 if item.nodeid.startswith("tests/test_crash.py") else 1)
    if config.getoption("--long"):
        return
    skip = pytest.mark.skip(reason="long: run with pytest --long (CI does)")
    for item in items:
        if item.get_closest_marker("long"):
            item.add_marker(skip)
