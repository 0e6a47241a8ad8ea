"""Questions with confirmed answers: read from example files or made from log records."""

from __future__ import annotations

import json
from dataclasses import dataclass
from pathlib import Path

from ..errors import InputError
from ..records import Confirmation
from ..safeio import read_bounded
from ..table import ReadChoices

MAX_BYTES = 100 << 20    # a large evaluation set is a few MB; a FIFO or /dev/zero never ends


class ExamplesError(InputError):
    """An examples file is missing, or one of its lines is not an example."""


@dataclass
class Job:
    """One question to answer or learn from, with its gold answer and the table it is about."""

    id: str
    question: str
    table: str                       # the table file's path
    answer: list
    kind: str | None = None          # a label for breakdowns in `tabq eval`
    table_name: str | None = None    # which SQLite table or sheet of that file
    strength: float = 1.0            # how much its updates count (a pick counts more)
    rows: list[int] | None = None    # rows on which the meant reading's answer is known too
    rows_answer: list | None = None  # that answer
    meant: str | None = None         # the meant form, when no rows tell it from look-alikes
    reading: ReadChoices | None = None   # reading choices the table is loaded with
    team_words: tuple = ()           # definitions other confirmations induced (logic.Defined)

    @property
    def search_key(self) -> tuple:
        """What decides a candidate search's outcome besides the model and the beam."""
        return (self.table, self.table_name, self.reading, self.question,
                json.dumps(self.answer, sort_keys=True),
                json.dumps({"rows": self.rows, "rows_answer": self.rows_answer,
                            "meant": self.meant}, sort_keys=True),
                tuple(str(d) for d in self.team_words))


def read_examples(path: str | Path, table: str | Path | None = None,
                  table_name: str | None = None) -> list[Job]:
    """Every example of a JSON-lines file, or a clear error naming the first bad line.
    With `table`, every example is about that table (and `table_name` in it)."""
    path = Path(path)
    try:
        raw = read_bounded(path, MAX_BYTES, ExamplesError, "examples file", follow=True)
        lines = raw.decode("utf-8").splitlines()
    except FileNotFoundError:
        raise ExamplesError(f"{path}: no such file") from None
    except UnicodeDecodeError:
        raise ExamplesError(f"{path}: cannot be read as text (not UTF-8)") from None
    jobs = []
    for number, line in enumerate(lines, 1):
        if not line.strip():
            continue
        try:
            data = json.loads(line)
        except json.JSONDecodeError as err:
            raise ExamplesError(f"{path}:{number}: not JSON ({err.msg})") from None
        jobs.append(_job(data, path, number, table, table_name))
    if not jobs:
        raise ExamplesError(f"{path}: holds no examples")
    return jobs


def _job(data, path: Path, number: int, table, table_name: str | None) -> Job:
    where = f"{path}:{number}"
    if not isinstance(data, dict):
        raise ExamplesError(f"{where}: an example must be a JSON object")
    question, answer = data.get("question"), data.get("answer")
    if not isinstance(question, str) or not question.strip():
        raise ExamplesError(f"{where}: needs a non-empty \"question\" string")
    if not isinstance(answer, list):
        answer = [answer] if isinstance(answer, (str, int, float)) else None
    if not answer or not all(isinstance(v, (str, int, float)) for v in answer):
        raise ExamplesError(f"{where}: needs an \"answer\": a list of strings or numbers")
    if table is None:
        name = data.get("table")
        if not isinstance(name, str) or not name:
            raise ExamplesError(f"{where}: needs a \"table\" (a path relative to the file)")
        table = path.parent / name
    return Job(str(data.get("id", number)), question, str(Path(table).resolve()), answer,
               data.get("kind"), table_name)


def job_of(record: Confirmation) -> Job:
    """A logged confirmation as a job to learn from again."""
    return Job(f"log:{record.batch}:{record.id}", record.question, record.table.path,
               record.answer, table_name=record.table.name,
               strength=1.0 if record.strength is None else record.strength, rows=record.rows,
               rows_answer=record.rows_answer, meant=record.meant, reading=record.table.reading)
