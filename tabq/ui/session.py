"""What the app does, without a screen: ask, confirm, "none of these", pick a meant reading, undo.

Everything here is plain Python so that it can be tested without the UI. One `Session` holds the
loaded table, the model folder and a cache of candidate searches; the app calls it from worker
threads, so every use of the table's DuckDB connection goes through `Session.lock`.
"""

from __future__ import annotations

import random
import re
import threading
import time
import uuid
from dataclasses import dataclass, field
from pathlib import Path

import sqlglot
from sqlglot import exp

from .. import api
from .. import logic as L
from ..answers import Denotation, matches
from ..definitions import rival
from ..execute import run_on_rows, run_sql
from ..table import ROW, TABLE, ReadChoices
from ..model import Model
from ..records import Confirmation
from ..sql import condition
from ..store import ModelFolder
from ..teaching import Job, Searches, current, retract, teach, warm

PICK_STRENGTH = 2.0      # a reading picked among look-alikes says more than a plain confirmation
WIDE_EXECUTE = 300       # candidates executed when a typed answer is among none of the shown
CLARIFY_MARGIN = 6.0     # look-alike readings within this score of the best one are compared
CLARIFY_MOST = 3         # readings shown side by side
PREVIEW_ROWS = 500       # rows of the table view


@dataclass
class Taught:
    """One confirmation as the app remembers it: its log record and the weights before it."""

    kind: str                     # "confirm", "typed" or "pick"
    question: str
    answer: list
    record: Confirmation
    before: Model
    seconds: float
    reachable: bool


@dataclass
class Event:
    """A line of the session's history."""

    kind: str                     # "ask", "confirm", "typed", "pick", "undo", "error"
    question: str
    detail: str
    clock: str = field(default_factory=lambda: time.strftime("%H:%M:%S"))


@dataclass
class Comparison:
    """Readings side by side (look-alikes giving one answer on the whole table, or two taught
    meanings of a word giving two), and rows where they differ."""

    readings: list[api.Reading]
    rows: tuple[int, ...] | None       # None when no subset of rows tells them apart
    answers: list[list]                # each reading's answer on `rows`
    sample: list[tuple]                # those rows, base columns only
    headers: list[str]


class Session:
    """A loaded table, a model folder and what was taught in this session."""

    def __init__(self, path: str | Path, model: str | Path | None = None,
                 table: str | None = None, choices: ReadChoices | None = None):
        self.folder = ModelFolder(model)
        self.open = api.open(path, model=current(self.folder), table=table, choices=choices)
        self.path = str(Path(path).resolve())
        self.lock = threading.RLock()          # the table's DuckDB connection
        self.teaching = threading.Lock()       # the search cache and the model folder
        self.searches = Searches()
        self.taught: list[Taught] = []
        self.history: list[Event] = []

    # ── asking ─────────────────────────────────────────────────────────────────────────────
    def ask(self, question: str) -> api.Result:
        with self.lock:
            result = self.open.ask(question)
        self.history.append(Event("ask", question, _short(result.answer) if result.best
                                  else "no reading"))
        return result

    def look_alikes(self, result: api.Result, reading: api.Reading) -> list[api.Reading]:
        """Readings of the same answer with other SQL, near the best of them in score."""
        if reading.error:
            return []
        key = _key(reading)
        same = [c for c in result.candidates if not c.error and _key(c) == key]
        top = max(c.score for c in same)
        near = list({c.sql: c for c in same if c.score >= top - CLARIFY_MARGIN}.values())
        # readings over other columns first: "minutes missing" and "minutes and parts
        # missing" are one meaning to a person, "minutes missing" and "cancelled" are two
        picked: list[api.Reading] = []
        for c in near:
            if all(_columns(c) != _columns(p) for p in picked):
                picked.append(c)
        picked += [c for c in near if c not in picked]
        return picked[:CLARIFY_MOST]

    def competing(self, result: api.Result, index: int) -> list[api.Reading]:
        """The readings to set beside the one at `index`: for the top answer, the reading a
        rival definition of a taught word gives when there is one (`definitions.rival`: what
        was taught fits both, the answers differ, and the unsure reason names the two); else
        those giving its answer by other SQL."""
        reading = result.readings[index]
        clash = rival(reading, result.candidates) if index == 0 else None
        return [reading, clash[2]] if clash else self.look_alikes(result, reading)

    def compare(self, readings: list[api.Reading], seed: int = 0) -> Comparison:
        """Readings side by side, with the smallest rows found where their answers differ."""
        with self.lock:
            found = differing_rows(self.open.table, [r.form for r in readings], seed)
            rows, answers = found if found else (None, [])
            headers = [c.name for c in self.open.table.columns if c.view is None]
            sample = preview(self.open.table, headers, rows) if rows else []
        return Comparison(readings, rows, answers, sample, headers)

    def readings_giving(self, result: api.Result, typed: list) -> list[api.Reading]:
        """Candidates whose answer is the typed one: first those already run, then a wider
        search with more candidates executed. Distinct SQL, best first."""
        hits = [c for c in result.candidates if not c.error and matches(c.answer, typed)]
        if not hits:
            with self.lock:
                wide = self.open.ask(result.question, execute=WIDE_EXECUTE)
            hits = [c for c in wide.candidates if not c.error and matches(c.answer, typed)]
        return list({c.sql: c for c in hits}.values())

    # ── teaching ───────────────────────────────────────────────────────────────────────────
    def confirm(self, question: str, answer: list, kind: str = "confirm",
                **hints) -> Taught:
        """Teach one confirmation now: the model folder learns it, logs it, saves. `hints`
        are the pick's extra `Job` fields (strength, rows, rows_answer, meant)."""
        start = time.perf_counter()
        job = Job(f"ui-{uuid.uuid4().hex[:10]}", question, self.path, _plain(answer),
                  table_name=self.open.table.name, reading=self.open.table.reading, **hints)
        with self.teaching:
            with self.lock:   # searched on the table already open (a worker would load it again)
                self.searches.search_here(self.open, job)
            before = self.folder.load()
            report = teach(self.folder, [job], workers=1, searches=self.searches)
            model = self.folder.load()
            with self.lock:
                self.open.model = model
        taught = Taught(kind, question, job.answer, report.records[0], before,
                        time.perf_counter() - start, report.reachable > 0)
        self.taught.append(taught)
        self.history.append(Event(kind, question, _short(job.answer)
                                  + ("" if taught.reachable else " (no reading gives it)")))
        return taught

    def pick(self, question: str, comparison: Comparison, index: int) -> Taught:
        """The analyst's pick among look-alikes, taught as a stronger confirmation: the answer
        on the whole table and, when rows tell the readings apart, the answer on those rows."""
        reading = comparison.readings[index]
        if comparison.rows:
            return self.confirm(question, reading.answer, "pick", strength=PICK_STRENGTH,
                                rows=list(comparison.rows),
                                rows_answer=_plain(comparison.answers[index]))
        return self.confirm(question, reading.answer, "pick", strength=PICK_STRENGTH,
                            meant=str(reading.form))

    def undo(self) -> Taught | None:
        """Take back the last confirmation of this session (a retraction record is logged)."""
        if not self.taught:
            return None
        last = self.taught.pop()
        with self.teaching:
            model = retract(self.folder, last.record, before=last.before,
                            searches=self.searches)
            with self.lock:
                self.open.model = model
        self.history.append(Event("undo", last.question, f"took back {_short(last.answer)}"))
        return last

    def warm(self) -> int:
        """Search the log's recent confirmations ahead of the first teaching (in a worker)."""
        with self.teaching:
            return warm(self.folder, self.searches)


# ── finding rows where readings differ ────────────────────────────────────────────────────────
SINGLE_ROWS = 60         # single rows tried
PAIRS = 40               # random pairs tried
SUBSETS = 30             # random larger subsets tried (3 to 12 rows)


def differing_rows(table, forms: list, seed: int = 0) -> tuple[tuple[int, ...], list[list]] | None:
    """The first small set of rows (single rows, then pairs, then a few larger random sets) on
    which the forms' answers are not all the same, with each form's answer there."""
    rows = [r for (r,) in run_sql(table, _select_rows())]
    rng = random.Random(seed)
    step = max(1, len(rows) // SINGLE_ROWS)
    # rows some readings select and others do not come first: there a filter shows its meaning
    chosen = [_row_set(table, form) for form in forms]
    split = sorted(set().union(*chosen) - set.intersection(*chosen)) if all(
        c is not None for c in chosen) else []
    tries: list[tuple[int, ...]] = [(r,) for r in split[:SINGLE_ROWS]]
    tries += [(r,) for r in rows[::step][:SINGLE_ROWS] if r not in split]
    if len(rows) >= 2:
        tries += [tuple(sorted(rng.sample(rows, 2))) for _ in range(PAIRS)]
    if len(rows) >= 3:
        tries += [tuple(sorted(rng.sample(rows, rng.randint(3, min(12, len(rows))))))
                  for _ in range(SUBSETS)]
    for subset in tries:
        dens = [run_on_rows(table, form, subset) for form in forms]
        if any(d.error for d in dens):
            continue
        if len({d.key() for d in dens}) > 1:
            return subset, [list(d.values) for d in dens]
    return None


def _row_set(table, form) -> set[int] | None:
    """The ROWs a form's row set selects on the whole table (None for forms without one)."""
    rows = getattr(form, "rows", None)
    if not isinstance(rows, L.Rows):
        return None
    query = exp.Select(expressions=[exp.column(ROW, quoted=True)]).from_(
        exp.Table(this=exp.to_identifier(TABLE, quoted=True))).where(condition(rows))
    return {r for (r,) in run_sql(table, query.sql(dialect="duckdb"))}


def preview(table, names: list[str], rows: tuple[int, ...] | None = None,
            limit: int = PREVIEW_ROWS) -> list[tuple]:
    """Rows of the table (all, or the listed ROWs) in file order, the named columns only."""
    query = exp.Select(expressions=[exp.column(n, quoted=True) for n in names]).from_(
        exp.Table(this=exp.to_identifier(TABLE, quoted=True)))
    if rows is not None:
        query = query.where(exp.In(this=exp.column(ROW, quoted=True),
                                   expressions=[exp.Literal.number(r) for r in rows]))
    query = query.order_by(exp.column(ROW, quoted=True)).limit(limit)
    return run_sql(table, query.sql(dialect="duckdb"))


def _select_rows() -> str:
    return (exp.Select(expressions=[exp.column(ROW, quoted=True)])
            .from_(exp.Table(this=exp.to_identifier(TABLE, quoted=True)))
            .order_by(exp.column(ROW, quoted=True)).sql(dialect="duckdb"))


# ── small helpers ─────────────────────────────────────────────────────────────────────────────
def parse_answer(text: str) -> list[str]:
    """A typed answer as values: split on ";" or on ", " (so "12,467" stays one number)."""
    parts = re.split(r";|,\s+", text) if ";" in text or re.search(r",\s", text) else [text]
    return [p.strip() for p in parts if p.strip()]


def _columns(reading: api.Reading) -> frozenset[str]:
    return frozenset(c.name for c in sqlglot.parse_one(reading.sql, read="duckdb")
                     .find_all(exp.Column) if c.name != ROW)


def _key(reading: api.Reading) -> tuple:
    return Denotation(tuple(reading.answer), reading.is_table).key()


def _plain(values: list) -> list:
    return [list(v) if isinstance(v, tuple) else v for v in values]


def _short(values: list, most: int = 4) -> str:
    text = ", ".join(str(v) for v in values[:most])
    return text + (f" … ({len(values)} values)" if len(values) > most else "") if values \
        else "(empty)"
