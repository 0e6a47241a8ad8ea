"""The Python API: open a table, ask it questions, get ranked answers with their SQL.

    >>> table = tabq.open("sample_tables/repair_jobs.csv")
    >>> result = table.ask("how many jobs were waiting for parts")
    >>> result.answer, result.sql, result.paraphrase
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

from . import logic as L
from .analyse import Analysis, analyse
from .answers import Denotation
from .derive import Item, derive
from .execute import run
from .features import ANSWER_FEATURES
from .load import Table, load_table
from .model import Model
from .sql import render
from .store import load_model  # noqa: F401 (re-exported for the CLI)

EXECUTE = 60            # candidates executed per question, best first by the features that need no answer
UNSURE = 0.5            # below this share of probability the top answer is flagged


@dataclass
class Reading:
    """One candidate: a logical form, its SQL, its English reading, its answer and score."""

    form: L.Answer
    sql: str
    paraphrase: str
    answer: list
    score: float
    features: dict[str, float]
    error: str | None = None
    probability: float = 0.0
    is_table: bool = False


@dataclass
class Result:
    question: str
    readings: list[Reading]          # one per distinct answer, best first
    candidates: list[Reading]        # every executed candidate, best first
    notes: list[str] = field(default_factory=list)

    @property
    def best(self) -> Reading | None:
        return self.readings[0] if self.readings else None

    @property
    def answer(self) -> list:
        return list(self.best.answer) if self.best else []

    @property
    def sql(self) -> str | None:
        return self.best.sql if self.best else None

    @property
    def paraphrase(self) -> str | None:
        return self.best.paraphrase if self.best else None

    @property
    def confidence(self) -> float:
        return self.best.probability if self.best else 0.0

    @property
    def unsure(self) -> bool:
        return self.confidence < UNSURE


class OpenTable:
    """A loaded table and a model, ready for questions. Load once, ask many times."""

    def __init__(self, table: Table, model: Model):
        self.table, self.model = table, model

    def label(self, name: str) -> str:
        col = self.table.column(name)
        return col.header + (f" ({col.view})" if col.view else "")

    def analyse(self, question: str) -> Analysis:
        return analyse(question, self.table)

    def ask(self, question: str, execute: int = EXECUTE) -> Result:
        """Answer a question: every distinct answer, best first, with the SQL behind it."""
        analysis = self.analyse(question)
        items = derive(analysis, self.model)[:execute]
        candidates = [self._reading(analysis, item) for item in items]
        candidates.sort(key=lambda r: -r.score)
        readings = _distinct_answers(candidates)
        notes = ["the question was cut to its first 2000 characters"] if analysis.truncated else []
        return Result(question, readings, candidates, notes)

    def _reading(self, analysis: Analysis, item: Item) -> Reading:
        den = run(self.table, item.form)
        feats = item.features()
        for fn in ANSWER_FEATURES:
            for name, value in fn(analysis, den).items():
                feats[name] = feats.get(name, 0.0) + value
        score = self.model.score(feats)
        return Reading(item.form, render(item.form), L.paraphrase(item.form, self.label),
                       list(den.values), score, feats, den.error, is_table=den.is_table)


def _distinct_answers(candidates: list[Reading]) -> list[Reading]:
    """The best reading of each distinct answer, with the probability of that answer."""
    if not candidates:
        return []
    top = max(c.score for c in candidates)
    mass: dict[tuple, float] = {}
    best: dict[tuple, Reading] = {}
    for c in candidates:
        key = Denotation(tuple(c.answer), c.is_table).key() if not c.error else ("error", c.sql)
        mass[key] = mass.get(key, 0.0) + math.exp(c.score - top)
        best.setdefault(key, c)
    total = sum(mass.values())
    for key, reading in best.items():
        reading.probability = mass[key] / total
    return sorted(best.values(), key=lambda r: -r.score)


def open(path: str | Path, model: str | Path | Model | None = None,
         table: str | None = None) -> OpenTable:
    """Load a table file (CSV, TSV, Parquet, JSON lines, Excel, SQLite) for questions."""
    loaded = load_table(path, table)
    return OpenTable(loaded, model if isinstance(model, Model) else load_model(model))
