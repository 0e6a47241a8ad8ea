"""`tabq demo`: the invented Brambleford Bike Kitchen tables, asked a few everyday questions."""

from __future__ import annotations

from collections.abc import Callable
from importlib import resources
from pathlib import Path

from . import api
from .errors import TabqError
from .model import Model
from .output import format_result

MAIN_TABLE = "repair_jobs.csv"


def demo_folder() -> Path:
    """Where the demo tables are: inside the installed package, or beside it in a checkout."""
    try:
        return Path(str(resources.files("tabq.sample_tables")))
    except ModuleNotFoundError:
        folder = Path(__file__).resolve().parent.parent / "sample_tables"
        if not folder.is_dir():
            raise TabqError("the demo tables are missing: reinstall tabq") from None
        return folder


def demo_questions() -> list[str]:
    text = (demo_folder() / "demo_questions.txt").read_text(encoding="utf-8")
    return [line.strip() for line in text.splitlines() if line.strip()]


def run_demo(say: Callable[[str], None]) -> None:
    """tabq out of the box: the untaught model, whatever the default model folder has learned."""
    folder = demo_folder()
    table = api.open(folder / MAIN_TABLE, model=Model.prior())
    say(f"tabq demo — {MAIN_TABLE}: the jobs log of an invented community bike workshop "
        f"({table.table.row_count} rows), asked with the untaught model. Check each answer's "
        "SQL before acting on it.\n")
    for question in demo_questions():
        say(f"Q: {question}")
        try:
            say(format_result(table.ask(question), top=2))
        except TabqError as err:
            say(f"tabq: {err}")
        say("")
