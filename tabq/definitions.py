"""Team words that stand for a row set, learned from confirmed answers.

A team says "the river wards" for three zones, "long hauls" for rides of 20 miles or more,
"the tourist season" for May to September. Nothing in the table explains such words, so
when a confirmed answer is reachable by no reading, `induce` looks for the definitions that
would make it reachable, using the structure of the answer: a count or a sum over rows is
additive over the values of any column, so the definitions that fit are
- a set of values of a small column whose per-value answers add up to the confirmed one (a
  subset sum, searched whole up to MAX_SET_VALUES values; a larger column is not searched);
- a threshold or a range of a number column: cuts between its sorted values, found from
  running totals (each cut is written as the roundest number between its two values);
- a run of months or of hours of a date column (wrapping past December or midnight).
An average is a sum over a count, so it is checked the same way on both. Every definition that
fits is offered to the search as a TEAMWORD atom; the simplest come first, and learning gives
weight to the one that the confirmations back (its feature is `def:<words>|<row set>`, see
featurenames). `offered` lists the definitions a model has learned.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import replace
from weakref import WeakKeyDictionary

import numpy as np

from . import featurenames
from . import logic as L
from .analyse import Analysis, is_id
from .execute import run_many
from .sql import render
from .model import Model
from .table import TABLE, ident

MAX_SET_VALUES = 16      # a column with more values is not searched for sets (2^16 subsets)
MAX_PHRASE_WORDS = 3     # words of a team word
MAX_FORMS = 6            # readings with the team word's place held open, best first
MAX_DEFINITIONS = 24     # definitions offered for one confirmation, simplest first …
PER_COLUMN = 4           # … at most this many of one column, so that every column has its say
DEFINITION_WEIGHT = 1.0  # at least this weight for a definition every confirmation backs
HOLE = "__tabq_hole__"   # the open place: a value no cell holds, replaced per value
STRONG = {"exact", "stem", "partial", "abbrev", "code", "flag", "number", "compound", "quoted",
          "date", "year", "month", "day", "ordinal"}


_OFFERED: WeakKeyDictionary = WeakKeyDictionary()   # model → (its version, its definitions)


def offered(model: Model) -> list[L.Defined]:
    """The definitions a model has learned (a positive weight), as its features spell them."""
    version, found = _OFFERED.get(model, (None, []))
    if version != model.version:
        found = []
        for name, weight in model.items():
            pair = featurenames.parse(name) if name.startswith("def:") else None
            if pair is None or weight <= 0:
                continue
            try:
                rows = L.from_text(pair.meaning)
            except L.LogicTextError:
                continue          # an edited lexicon line that no longer reads: ignored
            if isinstance(rows, L.Rows):
                found.append(L.Defined(pair.word, rows))
        _OFFERED[model] = (model.version, found)
    return found


def defined_in(form_text: str) -> set[L.Defined]:
    """The definitions a candidate's form (as canonical text) uses."""
    if "(defined " not in form_text:
        return set()
    return {node for node in L.walk(L.from_text(form_text)) if isinstance(node, L.Defined)}


def backed(examples: Iterable) -> set[L.Defined]:
    """The definitions that fit every confirmation offered them: each example (learn.Example)
    whose candidates use a definition has a candidate giving its answer that uses it too."""
    used: dict[L.Defined, bool] = {}
    for example in examples:
        seen, right = set(), set()
        for text, ok in zip(example.forms, example.correct):
            in_form = defined_in(text)
            seen |= in_form
            right |= in_form if ok else set()
        for defined in seen:
            used[defined] = used.get(defined, True) and defined in right
    return {defined for defined, fits in used.items() if fits}


def remember(model: Model, examples: Iterable) -> None:
    """Give every definition the confirmations back at least DEFINITION_WEIGHT, so that it is
    offered to later questions (a reading that won without it would teach it nothing), and
    drop the weight of those they refute: a rejected guess is no part of the lexicon."""
    examples = list(examples)
    kept = backed(examples)
    tried = {node for example in examples for text in example.forms
             for node in defined_in(text)}
    for defined in tried:
        name = featurenames.definition(defined.word, L.to_text(defined.rows))
        goal = max(model.weight(name), DEFINITION_WEIGHT) if defined in kept else 0.0
        if model.weight(name) != goal:
            model.update({name: goal - model.weight(name)})


def parts(rows: L.Rows) -> int:
    """How much a definition says: its values, or its bounds. Fewer is simpler."""
    return len(rows.values) if isinstance(rows, L.InSet) else (
        2 if isinstance(rows, (L.Between, L.Hours, L.Months)) else 1)


def rival(best, candidates: list) -> tuple | None:
    """Another taught definition of a word the best reading uses that answers the question
    differently in a reading otherwise the same: (the one used, the rival, the rival's
    reading), of pipeline.Reading's `best` and `candidates`. The data cannot tell them apart;
    the analyst can. (Readings, examples and the open table are passed in, not imported: the
    modules that own them import this one.)"""
    shape = _shape(best.form)
    if shape is None:
        return None
    for other in candidates:
        if other.form != best.form and other.answer != best.answer and not other.error \
                and _shape(other.form) == shape:
            mine = [n for n in L.walk(best.form) if isinstance(n, L.Defined)]
            theirs = [n for n in L.walk(other.form) if isinstance(n, L.Defined)]
            for a, b in zip(mine, theirs):
                if a != b:
                    return a, b, other
    return None


def _shape(form: L.Form) -> str | None:
    """A form's text with each definition's meaning left out; None when it uses none."""
    used = [n for n in L.walk(form) if isinstance(n, L.Defined)] if isinstance(
        form, L.Form) else []
    if not used:
        return None
    text = L.to_text(form)
    for node in used:
        text = text.replace(L.to_text(node), f'(defined "{node.word}")')
    return text


# ── induction ─────────────────────────────────────────────────────────────────────────────────
def induce(table, question: str, gold: list) -> list[L.Defined]:
    """Definitions of the question's unexplained words that make its confirmed answer
    reachable: `table` is a pipeline.OpenTable, `gold` the confirmed answer."""
    if len(gold) != 1 or not _is_number(gold[0]):
        return []
    analysis = table.analyse(question)
    found: list[L.Defined] = []
    for phrase in unexplained_phrases(analysis):
        open_place = L.Defined(phrase, L.All())   # the place a definition will fill
        result = table.ask(question, team_words=[open_place])
        forms = [c.form for c in result.candidates if _additive(c.form, open_place)]
        for form in forms[:MAX_FORMS]:
            for rows in _fitting(table.table, form, open_place, float(gold[0])):
                defined = L.Defined(phrase, rows)
                if defined not in found:
                    found.append(defined)
        if found:
            break
    return _simplest(found)


def _simplest(found: list[L.Defined]) -> list[L.Defined]:
    """The simplest definitions, at most PER_COLUMN of each column: a count is given by a
    threshold of nearly any number column, and those must not crowd out a set of places."""
    kept, per_column = [], {}
    for defined in sorted(found, key=lambda d: parts(d.rows)):
        col = defined.rows.col
        if per_column.get(col, 0) < PER_COLUMN:
            per_column[col] = per_column.get(col, 0) + 1
            kept.append(defined)
    return kept[:MAX_DEFINITIONS]


def unexplained_phrases(analysis: Analysis) -> list[str]:
    """Runs of content words that no column, value, number or date names: team words."""
    tokens = analysis.words.tokens
    named = {i for atoms in analysis.atoms.values() for a in atoms
             if a.span and a.quality in STRONG for i in range(*a.span)}
    named |= {i for name, span in analysis.spans.items()
              if analysis.col_match.get(name) in STRONG for i in range(*span)}
    runs, run = [], []
    for i, tok in enumerate(tokens):
        if i in analysis.content and i not in named:
            run.append(tok.text)
        elif run:
            runs.append(run)
            run = []
    if run:
        runs.append(run)
    return [" ".join(r[:MAX_PHRASE_WORDS]) for r in runs]


def _is_number(x) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def _additive(form: L.Form, open_place: L.Defined) -> bool:
    """A count, sum or average whose rows are the open place and other conditions, all
    joined by "and": its answer over a union of values adds up per value."""
    if not isinstance(form, L.Aggregate) or form.fn not in ("count", "sum", "avg"):
        return False
    return _conjunct(form.rows, open_place)


def _conjunct(rows: L.Rows, place: L.Defined) -> bool:
    if rows == place:
        return True
    return isinstance(rows, L.And) and (_conjunct(rows.left, place) or _conjunct(rows.right, place))


def _swap(form: L.Form, place: L.Defined, rows: L.Rows) -> L.Form:
    """The form with the open place filled by `rows`."""
    if form == place:
        return rows
    if isinstance(form, L.And):
        return L.And(_swap(form.left, place, rows), _swap(form.right, place, rows))
    if isinstance(form, L.Aggregate):
        return replace(form, rows=_swap(form.rows, place, rows))
    return form


# ── the search over one column ────────────────────────────────────────────────────────────────
def _fitting(table, form: L.Aggregate, place: L.Defined, gold: float) -> list[L.Rows]:
    out: list[L.Rows] = []
    for col in table.columns:
        if col.view is not None or is_id(col, table):   # a word is no list of order numbers
            continue
        if col.kind in ("text", "bool") and 2 <= col.distinct <= MAX_SET_VALUES:
            values = [v for v in col.values if v is not None]
            totals = _per_value(table, form, place, [L.Eq(col.name, v) for v in values])
            out += [L.InSet(col.name, tuple(values[i] for i in s))
                    for s in _subsets(totals, form.fn, gold)]
        elif col.kind == "number" and col.distinct >= 2:
            out += _cuts(table, form, place, col, gold)
        elif col.kind == "date":
            months = list(range(1, 13))
            totals = _per_value(table, form, place, [L.Months(col.name, m, m) for m in months])
            out += [L.Months(col.name, months[a], months[b])
                    for a, b in _runs(totals, form.fn, gold, wrap=True)]
            hours = list(range(24))
            totals = _per_value(table, form, place, [L.Hours(col.name, h, h) for h in hours])
            out += [L.Hours(col.name, hours[a], hours[b])
                    for a, b in _runs(totals, form.fn, gold, wrap=True)]
    return out


def _per_value(table, form: L.Aggregate, place: L.Defined, rows: list[L.Rows]) -> np.ndarray:
    """(sum, count) of the form's rows with the open place filled by each row set."""
    queries = []
    for r in rows:
        filled = _swap(form.rows, place, r)
        queries += [L.Aggregate("sum", form.col, filled) if form.col else
                    L.Aggregate("count", None, filled), L.Aggregate("count", None, filled)]
    dens = run_many(table, queries)
    values = [d.values[0] if d and not d.error and d.values and d.values[0] is not None else 0.0
              for d in dens]
    return np.array(values, dtype=float).reshape(-1, 2)


def _fits(sums: np.ndarray, counts: np.ndarray, fn: str, gold: float) -> np.ndarray:
    got = counts if fn == "count" else sums if fn == "sum" else np.divide(
        sums, counts, out=np.full_like(sums, np.nan), where=counts > 0)
    return np.isclose(got, gold, rtol=1e-6, atol=1e-6) & (counts > 0)


def _subsets(totals: np.ndarray, fn: str, gold: float) -> list[tuple[int, ...]]:
    """Index sets of values whose rows together give the answer, fewest values first; never
    every value (that is no word at all)."""
    n = len(totals)
    masks = np.arange(1, 2 ** n - 1, dtype=np.int64)
    bits = (masks[:, None] >> np.arange(n)) & 1
    ok = _fits(bits @ totals[:, 0], bits @ totals[:, 1], fn, gold)
    chosen = sorted((tuple(np.flatnonzero(b)) for b in bits[ok]), key=len)
    return chosen[:MAX_DEFINITIONS]


def _runs(totals: np.ndarray, fn: str, gold: float, wrap: bool) -> list[tuple[int, int]]:
    """(first, last) runs of neighbouring values whose rows give the answer."""
    n = len(totals)
    out = []
    for length in range(1, n):
        for first in range(n if wrap else n - length + 1):
            idx = [(first + k) % n for k in range(length)]
            if _fits(totals[idx, 0].sum(keepdims=True), totals[idx, 1].sum(keepdims=True),
                     fn, gold)[0]:
                out.append((first, idx[-1]))
    return out[:MAX_DEFINITIONS]


def _cuts(table, form: L.Aggregate, place: L.Defined, col, gold: float) -> list[L.Rows]:
    """Thresholds and ranges of a number column that give the answer."""
    values = _distinct_numbers(table, col.name)
    if len(values) < 2:
        return []
    totals = _per_value_grouped(table, form, place, col.name, values)
    sums, counts = np.cumsum(totals[:, 0]), np.cumsum(totals[:, 1])
    whole_s, whole_c = sums[-1], counts[-1]
    out: list[L.Rows] = []
    for k in range(1, len(values)):       # the cut between values[k-1] and values[k]
        below, above = (sums[k - 1], counts[k - 1]), (whole_s - sums[k - 1], whole_c - counts[k - 1])
        cut = _roundest(values[k - 1], values[k])
        if _fits(np.array([above[0]]), np.array([above[1]]), form.fn, gold)[0]:
            out.append(L.Cmp(col.name, "ge", cut))
        if _fits(np.array([below[0]]), np.array([below[1]]), form.fn, gold)[0]:
            out.append(L.Cmp(col.name, "lt", cut))
    if not out:   # a threshold says less than a range: ranges only when none fits
        out += _ranges(values, totals, form.fn, gold, col.name)
    return out[:MAX_DEFINITIONS]


def _ranges(values, totals, fn, gold, name) -> list[L.Rows]:
    s = np.concatenate([[0.0], np.cumsum(totals[:, 0])])
    c = np.concatenate([[0.0], np.cumsum(totals[:, 1])])
    n = len(values)
    i, j = np.triu_indices(n)
    ok = _fits(s[j + 1] - s[i], c[j + 1] - c[i], fn, gold)
    found = sorted(zip(i[ok], j[ok]), key=lambda p: p[1] - p[0])
    out = []
    for a, b in found[:MAX_DEFINITIONS]:
        low = values[a] if a == 0 else _roundest(values[a - 1], values[a])
        high = values[b] if b == n - 1 else _roundest_below(values[b], values[b + 1])
        out.append(L.Between(name, low, high))
    return out


def _distinct_numbers(table, name: str) -> list[float]:
    col = ident(name)
    rows = table.con.execute(f"SELECT DISTINCT {col} FROM {TABLE} WHERE {col} IS NOT NULL "
                             f"ORDER BY 1").fetchall()
    return [float(r[0]) for r in rows]


def _per_value_grouped(table, form, place, name: str, values: list[float]) -> np.ndarray:
    """Per-value (sum, count) for a number column in one query, the open place filled by
    `name = v` for each value v (a correlated subquery per value)."""
    filled = _swap(form.rows, place, L.Eq(name, HOLE))
    measure = L.Aggregate("sum", form.col, filled) if form.col else \
        L.Aggregate("count", None, filled)
    count = L.Aggregate("count", None, filled)
    hole, col = "'" + HOLE + "'", ident(name)
    outer = (f"SELECT v, ({render(measure).replace(hole, 'vals.v')}), "
             f"({render(count).replace(hole, 'vals.v')}) FROM (SELECT DISTINCT {col} AS v "
             f"FROM {TABLE} WHERE {col} IS NOT NULL) AS vals ORDER BY v")
    rows = table.con.execute(outer).fetchall()
    by_value = {float(v): (s or 0.0, c or 0.0) for v, s, c in rows}
    return np.array([by_value.get(v, (0.0, 0.0)) for v in values], dtype=float)


def _roundest(low: float, high: float) -> float:
    """The roundest number above `low` and at most `high`: a cut as a person would write it."""
    for digits in range(-6, 7):
        step = 10.0 ** -digits
        candidate = math.ceil(low / step + 1e-9) * step
        if low < candidate <= high:
            return float(round(candidate, max(digits, 0)))
    return high


def _roundest_below(low: float, high: float) -> float:
    """The roundest number at least `low` and below `high`."""
    for digits in range(-6, 7):
        step = 10.0 ** -digits
        candidate = math.floor(high / step - 1e-9) * step
        if low <= candidate < high:
            return float(round(candidate, max(digits, 0)))
    return low
