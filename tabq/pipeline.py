"""pipeline: one question through the stages — analyse, derive, execute, score — on an open
table, and the ranked readings that come out. `api.open` is the public way in."""

from __future__ import annotations

import math
import time
from collections.abc import Sequence
from dataclasses import dataclass, field

from . import calibration
from . import logic as L
from .analyse import Analysis, OutOfTime, analyse, column_words, names_rows
from .answers import Denotation
from .definitions import offered, rival
from .derive import PAIR_BEAM, Item, derive
from .errors import QueryError
from .execute import run_many
from .features import ANSWER_FEATURES, answer_score_bound
from .table import ReadReport, Table
from .model import Model
from .sql import render
from .tabular import label

EXECUTE = 60            # candidates executed per question, best first by the features that need no answer
QUESTION_SECONDS = 20.0  # one whole question, analysis included; past it, the best so far, flagged
BATCH = 20              # candidates executed between two checks of whether the rest can matter
SETTLED = 3             # distinct readings that must come out exactly as if all were executed
MASS_TOLERANCE = 0.01   # share of probability the skipped candidates may hold at most
MAX_WORDS = 3           # question words no reading uses, named in the unsure reason
DEFINITIONS_DISAGREE = "what was taught fits two meanings of"   # opens that unsure reason


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
    key: tuple = field(default=(), repr=False, compare=False)   # which answer it is
    unused: tuple[str, ...] = ()     # content words of the question the reading does not use
    unused_columns: tuple[tuple[str, str], ...] = ()   # (word, column) of those naming a column
    #                                                    that holds a row's value, not its name


@dataclass
class Result:
    question: str
    readings: list[Reading]          # one per distinct answer, best first
    candidates: list[Reading]        # every executed candidate, best first
    notes: list[str] = field(default_factory=list)
    complete: bool = True            # false when the time limit stopped the search early
    table: Table | None = field(default=None, repr=False, compare=False)   # the table asked

    @property
    def read(self) -> ReadReport | None:
        """How the table's file was read: what was left out or guessed before any answer."""
        return self.table.report if self.table is not None else None

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
    def unsure_reason(self) -> str | None:
        """Why the top answer needs checking, in words; None when tabq is sure of it."""
        return unsure_reason(self)

    @property
    def unsure(self) -> bool:
        return self.unsure_reason is not None

    def to_pandas(self):
        """The best answer, every row of it, as a pandas DataFrame with named columns (pandas
        is optional: without it, a `frames.MissingPackageError` says so)."""
        from .frames import to_pandas
        return to_pandas(self)

    def to_arrow(self):
        """The best answer, every row of it, as a pyarrow Table with named columns."""
        from .frames import to_arrow
        return to_arrow(self)

    def to_polars(self):
        """The best answer, every row of it, as a polars DataFrame with named columns."""
        from .frames import to_polars
        return to_polars(self)

    def _repr_html_(self) -> str:
        """A notebook's display: the answer, its reading, its SQL and the other readings."""
        from .notebook import result_html
        return result_html(self)


class OpenTable:
    """A loaded table and a model, ready for questions. Load once, ask many times."""

    def __init__(self, table: Table, model: Model):
        self.table, self.model = table, model

    def label(self, name: str) -> str:
        return label(self.table, name)

    def analyse(self, question: str, deadline: float | None = None,
                team_words: Sequence[L.Defined] = ()) -> Analysis:
        """The question's words read against the table, with the team words the model has
        learned and any others given (teaching offers the definitions it induced)."""
        return analyse(question, self.table, deadline, [*offered(self.model), *team_words])

    def ask(self, question: str, execute: int = EXECUTE,
            seconds: float = QUESTION_SECONDS, pair_beam: int = PAIR_BEAM,
            team_words: Sequence[L.Defined] = ()) -> Result:
        """Answer a question: every distinct answer, best first, with the SQL behind it.

        The best `execute` candidates by the features that need no answer are run, best first
        and in batches; the rest are skipped once they can no longer change the SETTLED best
        distinct readings nor hold more than MASS_TOLERANCE of the probability, whatever their
        answers (`features.answer_score_bound`). So the answer is the one running them all
        would give under the same model. `pair_beam` widens the search of two-sided
        conditions (teaching does, where a new word's reading may rank low before it is learned).

        `seconds` bounds the whole question from the moment it is asked: reading its words
        against the table, the search and the queries. Past it, the readings checked by then
        are returned, flagged (`complete` is false); when none was, a QueryError says so.
        """
        deadline = time.monotonic() + seconds
        try:
            analysis = self.analyse(question, deadline, team_words)
        except OutOfTime:
            raise _too_slow(seconds, "matching its words to the table") from None
        items = derive(analysis, self.model, pair_beam=pair_beam)[:execute]
        if items and time.monotonic() >= deadline:
            raise _too_slow(seconds, "looking for readings")
        bound = answer_score_bound(analysis, self.model)
        candidates: list[Reading] = []
        complete = True
        for start in range(0, len(items), BATCH):
            if _can_skip(candidates, items[start:], bound):
                break
            batch = items[start:start + BATCH]
            for item, den in zip(batch, run_many(self.table, [i.form for i in batch],
                                                 deadline=deadline)):
                if den is None:
                    complete = False
                else:
                    candidates.append(self._reading(analysis, item, den))
            if not complete:
                break
        if not complete and not candidates:
            raise _too_slow(seconds, "running its queries")
        candidates.sort(key=lambda r: -r.score)
        readings = _distinct_answers(candidates)
        notes = ["the question was cut to its first 2000 characters"] if analysis.truncated else []
        if not complete:
            notes.append(f"stopped at the {seconds:g} s limit: the best of the {len(candidates)} "
                         f"readings checked by then, of {len(items)}")
        return Result(question, readings, candidates, notes, complete, self.table)

    def _reading(self, analysis: Analysis, item: Item, den: Denotation) -> Reading:
        feats = item.features()
        for fn in ANSWER_FEATURES:
            for name, value in fn(analysis, den).items():
                feats[name] = feats.get(name, 0.0) + value
        score = self.model.score(feats)
        unused = sorted(analysis.content - item.used)
        named = analysis.cache.get("column_words")
        if named is None:           # once per question, not per reading
            named = analysis.cache["column_words"] = column_words(analysis)
        tokens = analysis.words.tokens
        return Reading(item.form, render(item.form), self._paraphrase(item.form),
                       list(den.values), score, feats, den.error, is_table=den.is_table,
                       key=_key(self.table, den), unused=tuple(tokens[i].text for i in unused),
                       unused_columns=tuple((tokens[i].text, named[i]) for i in unused
                                            if i in named
                                            and not names_rows(self.table, named[i])))

    def _paraphrase(self, form: L.Answer) -> str:
        cache = self.table.cache.setdefault("paraphrases", {})
        if form not in cache:
            cache[form] = L.paraphrase(form, self.label)
        return cache[form]


def unsure_reason(result: Result) -> str | None:
    """The reason to doubt the top answer, or None: its `sureness` is below the fitted
    `calibration.SURE_SCORE` (tabq/calibration.py says how each weight was fitted). The reason
    names what lowered it most first: a close runner-up, or words naming a column the reading
    ignores; then the words no reading uses, which tabq cannot read at all."""
    best = result.best
    if best is None:
        return "no reading fits"
    if not result.complete:
        return "the search stopped at its time limit"
    clash = rival(best, result.candidates)
    if clash:
        used, other, reading = clash
        label_of = result.table and (lambda c: label(result.table, c)) or str
        return (f"{DEFINITIONS_DISAGREE} '{used.word}': "
                f"{L.paraphrase(used.rows, label_of).removeprefix('rows where ')} or "
                f"{L.paraphrase(other.rows, label_of).removeprefix('rows where ')} "
                f"(which gives {', '.join(map(str, reading.answer[:3]))}); confirm the one meant")
    if sureness(result) >= calibration.SURE_SCORE:
        return None
    parts = []          # (how much it lowered the sureness, what it says)
    if len(result.readings) > 1 and runner_up_gap(result) < calibration.GAP_CAP:
        parts.append((calibration.GAP_WEIGHT * (calibration.GAP_CAP - runner_up_gap(result)),
                      f"the runner-up is close ({best.probability:.0%} against "
                      f"{result.readings[1].probability:.0%})"))
    if best.unused_columns:
        named = best.unused_columns[:MAX_WORDS]
        columns = ", ".join(dict.fromkeys(label(result.table, c) for _, c in named))
        parts.append((calibration.COLUMN_WORD_WEIGHT * len(best.unused_columns),
                      f"its reading ignores {_quoted(tuple(w for w, _ in named))}, which "
                      f"{'names' if len(named) == 1 else 'name'} {columns}"))
    for doubt in value_doubts(best):
        parts.append((calibration.VALUE_DOUBT_WEIGHT, VALUE_DOUBTS[doubt]))
    if guessed_columns(best):
        parts.append((calibration.GUESSED_COLUMN_WEIGHT * guessed_columns(best),
                      "it uses a column that no word of the question names"))
    if gives_nothing(best):
        parts.append((calibration.NOTHING_WEIGHT, "its answer is 0 or nothing, as a misread "
                                                  "filter that no row passes would give"))
    words = never_used(result.candidates)[:MAX_WORDS]
    if words:
        parts.append((0.0, f"no reading uses {_quoted(words)}"))
    return "; ".join(text for _, text in sorted(parts, key=lambda p: -p[0]))


def runner_up_gap(result: Result) -> float:
    """How far the top answer's score is above the runner-up's (`GAP_CAP` when alone): the
    softmax keeps it as the log ratio of their probabilities."""
    if len(result.readings) < 2 or result.readings[1].probability <= 0:
        return calibration.GAP_CAP
    gap = math.log(result.readings[0].probability / result.readings[1].probability)
    return min(calibration.TEMPERATURE * gap, calibration.GAP_CAP)


def sureness(result: Result) -> float:
    """The linear score the unsure flag thresholds: the runner-up's distance (capped), less a
    weight per question word that names a column the top reading leaves unused, less a weight
    when the top answer is 0 or nothing, one per doubtful reading of a value and one per
    column it uses that no word names."""
    best = result.best
    named = len(best.unused_columns) if best else 0
    return (calibration.GAP_WEIGHT * runner_up_gap(result)
            - calibration.COLUMN_WORD_WEIGHT * named
            - calibration.NOTHING_WEIGHT * float(best is not None and gives_nothing(best))
            - calibration.VALUE_DOUBT_WEIGHT * float(len(value_doubts(best)) if best else 0)
            - calibration.GUESSED_COLUMN_WEIGHT * (guessed_columns(best) if best else 0.0))


# Ways the top reading may have misread a value the question names, and the reason shown.
VALUE_DOUBTS = {
    "num:threshold_as_value": "it reads a number said after a comparison word as a cell value",
    "ent:partial": "it matches a value by only part of its name",
}


GUESSED_COLUMN = "col:none"   # the feature counting a reading's columns no word names


def guessed_columns(reading: Reading) -> float:
    """How many columns the reading uses that no word of the question names (a date filter's
    column, told by its dates, is not counted): on the zero-shot sets such top answers were
    right about a third of the time, against four in five overall."""
    return reading.features.get(GUESSED_COLUMN, 0.0)


def value_doubts(reading: Reading) -> list[str]:
    """Which of the VALUE_DOUBTS the reading's features show."""
    return [name for name in VALUE_DOUBTS if reading.features.get(name, 0.0) > 0]


def gives_nothing(reading: Reading) -> bool:
    """An answer of no value, or of the single number 0: what a filter that no row passes
    gives ("taller than 1 metre" read as height_cm = 1). On the sets the flag is fitted on
    such top answers were nearly always wrong, though 0 can be the true answer."""
    values = reading.answer
    if not values or all(v is None for v in values):
        return True
    only = values[0]
    return len(values) == 1 and isinstance(only, (int, float)) and not isinstance(only, bool) \
        and only == 0


def _quoted(words: tuple[str, ...]) -> str:
    return ", ".join(f"'{w}'" for w in words)


def never_used(candidates: list[Reading]) -> tuple[str, ...]:
    """Content words of the question that no executed reading uses: words tabq cannot read."""
    if not candidates:
        return ()
    common = set(candidates[0].unused).intersection(*(c.unused for c in candidates[1:]))
    return tuple(w for w in candidates[0].unused if w in common)


def _too_slow(seconds: float, doing: str) -> QueryError:
    """Past the limit with no reading checked: an error, since "no reading fits" would be
    untrue."""
    return QueryError(f"the question ran past its {seconds:g} s limit while {doing}, before any "
                      "reading was checked")


def _key(table: Table, den: Denotation) -> tuple:
    """Which answer a denotation is (normalising a long list costs; each is done once)."""
    if den.error:
        return ()
    cache = table.cache.setdefault("keys", {})
    if id(den) not in cache or cache[id(den)][0] is not den:
        cache[id(den)] = (den, den.key())
    return cache[id(den)][1]


def answer_key(reading: Reading) -> tuple:
    """Which answer a reading gives; each failed query is an answer of its own."""
    return reading.key if not reading.error else ("error", reading.sql)


def _can_skip(done: list[Reading], rest: list[Item], bound: float) -> bool:
    """Whether no candidate in `rest` can matter, whatever its answer: each one's score is at
    most its answer-free score plus `bound`. An answer's score is its best reading's, so a
    skipped candidate can at most add an answer of that score or raise one to it."""
    if not done or not rest or calibration.AGREEMENT:
        return not rest     # with a bonus for agreeing readings the bound below does not hold
    best: dict[tuple, float] = {}
    for r in done:
        best[answer_key(r)] = max(r.score, best.get(answer_key(r), -math.inf))
    readings = sorted(best.values(), reverse=True)
    best_rest = max(i.score for i in rest) + bound + 1e-9
    if len(readings) < SETTLED or best_rest >= readings[SETTLED - 1]:
        return False
    top, t = readings[0], calibration.TEMPERATURE
    held = sum(math.exp((s - top) / t) for s in readings)
    skipped = sum(math.exp((i.score + bound - top) / t) for i in rest)
    return skipped <= MASS_TOLERANCE * held


def answer_score(scores: list[float], agreement: float = calibration.AGREEMENT) -> float:
    """One score for an answer from the scores of the readings that give it: the best one's,
    plus `agreement` times what log-sum-exp adds for the others (0: the best alone)."""
    top = max(scores)
    return top + agreement * math.log(sum(math.exp(s - top) for s in scores))


def probabilities(scores: list[float],
                  temperature: float = calibration.TEMPERATURE) -> list[float]:
    """A softmax over answer scores: so the higher score always shows the higher probability."""
    top = max(scores)
    weights = [math.exp((s - top) / temperature) for s in scores]
    total = sum(weights)
    return [w / total for w in weights]


def _distinct_answers(candidates: list[Reading]) -> list[Reading]:
    """The best reading of each distinct answer, ranked by the answer's score, with the
    answer's probability: the list is in order of probability too."""
    groups: dict[tuple, list[Reading]] = {}
    for c in sorted(candidates, key=lambda r: -r.score):
        groups.setdefault(answer_key(c), []).append(c)
    scored = [(answer_score([r.score for r in g]), g[0]) for g in groups.values()]
    scored.sort(key=lambda pair: -pair[0])          # stable: ties keep the best reading first
    for (_, reading), p in zip(scored, probabilities([s for s, _ in scored])):
        reading.probability = p
    return [reading for _, reading in scored]
