"""Build the periods set (issue 16): which month, year or weekday had the most or least, and
conditions on the day of the week, over two invented tables.

  bakehouse.csv / bakehouse.jsonl  wholesale bread orders of an invented bakehouse, 2023-2024
  climbing.csv / climbing.jsonl    sessions at an invented indoor climbing centre, 2024

Every answer is computed here by one small pandas expression beside its question; no answer
is typed by hand. Run from anywhere (nothing is downloaded):
    python benchmarks/periods/make_set.py

Answer format as benchmarks/zeroshot2 (each jsonl line: id, question, table, answer,
answer_rounded, kind): a JSON list (a set); a month is "YYYY-MM" text, a year a number, a day
of the week its English name ("Saturday"); a per-period table is a list of [key, value] rows;
yes/no questions answer "yes"/"no". Aggregates skip missing values, as SQL does.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import numpy as np
import pandas as pd

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
from answer_sets import Table, rounded, to_answer  # noqa: E402

HERE = Path(__file__).resolve().parent


# ======================================================================================
# Table 1: Hobbs & Quill Bakehouse (invented), wholesale bread for cafés and shops in invented
# villages. One row per order, 2023-2024; the bakehouse takes no order on a Sunday.
# ======================================================================================
BAKE_SEED = 16_2023_08
BAKERS = {"Odile Marchetti": 0.42, "Bram Tuckwell": 0.33, "Sunniva Eke": 0.25}
CAFES = ["The Kettle Loft", "Pell's Corner", "Marrowby Deli", "Foxglove Tearoom",
         "Upper Sallow Store", "Wrenfield Cafe", "The Old Dairy"]
CAFE_WEIGHTS = [0.2, 0.18, 0.16, 0.14, 0.12, 0.11, 0.09]
BREADS = {"sourdough": (4.6, 0.3), "rye": (4.1, 0.15), "baguette": (2.2, 0.25),
          "brioche": (3.8, 0.12), "focaccia": (3.4, 0.18)}
# orders per weekday, Monday first (Sunday closed); and a season of orders per month
DAY_WEIGHTS = np.array([1.0, 0.8, 0.9, 1.1, 1.5, 1.9, 0.0])
MONTH_WEIGHTS = {1: 0.7, 2: 0.75, 3: 0.9, 4: 1.0, 5: 1.15, 6: 1.3, 7: 1.45, 8: 1.35,
                 9: 1.05, 10: 0.95, 11: 0.9, 12: 1.25}


def make_bakehouse(path: Path) -> None:
    rng = np.random.default_rng(BAKE_SEED)
    days = pd.date_range("2023-01-01", "2024-12-31", freq="D")
    weight = np.array([DAY_WEIGHTS[d.day_of_week] * MONTH_WEIGHTS[d.month]
                       * (1.15 if d.year == 2024 else 1.0) for d in days])
    n = 620
    placed = np.sort(rng.choice(len(days), size=n, p=weight / weight.sum()))
    breads = list(BREADS)
    rows = []
    for i, day in enumerate(placed):
        date = days[day]
        bread = rng.choice(breads, p=[BREADS[b][1] for b in breads])
        loaves = int(rng.integers(6, 41))
        amount = round(loaves * BREADS[bread][0] * rng.uniform(0.95, 1.05), 2)
        late = rng.random() < (0.22 if date.day_of_week == 5 else 0.08)
        rating = int(rng.choice([2, 3, 4, 5], p=[0.08, 0.22, 0.4, 0.3]))
        rows.append({
            "order_no": f"HQ-{3001 + i}",
            "placed_on": date.date().isoformat(),
            "baker": rng.choice(list(BAKERS), p=list(BAKERS.values())),
            "cafe": rng.choice(CAFES, p=CAFE_WEIGHTS),
            "bread": bread,
            "loaves": loaves,
            "amount": amount,
            "late": "yes" if late else "no",
            "rating": "" if rng.random() < 0.35 else rating,
        })
    pd.DataFrame(rows).to_csv(path, index=False)


# ======================================================================================
# Table 2: Cragfoot Climbing Centre (invented). One row per instructed session in 2024.
# ======================================================================================
CLIMB_SEED = 16_2024_07
INSTRUCTORS = {"Mara Lindqvist": 0.3, "Tobias Wrenn": 0.26, "Ayo Castellane": 0.24,
               "Perpetua Holm": 0.2}
WALLS = {"Boulder Cave": 0.4, "North Face": 0.35, "Kids Corner": 0.25}
CLIMB_DAYS = np.array([0.7, 0.9, 1.2, 0.8, 1.0, 1.6, 1.4])
CLIMB_MONTHS = {1: 1.3, 2: 1.2, 3: 1.05, 4: 0.95, 5: 0.8, 6: 0.7, 7: 0.75, 8: 0.9,
                9: 1.0, 10: 1.15, 11: 1.35, 12: 1.1}


def make_climbing(path: Path) -> None:
    rng = np.random.default_rng(CLIMB_SEED)
    days = pd.date_range("2024-01-01", "2024-12-31", freq="D")
    weight = np.array([CLIMB_DAYS[d.day_of_week] * CLIMB_MONTHS[d.month] for d in days])
    n = 480
    held = np.sort(rng.choice(len(days), size=n, p=weight / weight.sum()))
    rows = []
    for day in held:
        date = days[day]
        wall = rng.choice(list(WALLS), p=list(WALLS.values()))
        climbers = int(rng.integers(2, 13)) + (3 if date.day_of_week >= 5 else 0)
        fee = round(climbers * (9.5 if wall == "Kids Corner" else 14.0), 2)
        rows.append({
            "session_date": date.date().isoformat(),
            "instructor": rng.choice(list(INSTRUCTORS), p=list(INSTRUCTORS.values())),
            "wall": wall,
            "climbers": climbers,
            "fee": fee,
            "cancelled": "yes" if rng.random() < 0.07 else "no",
        })
    pd.DataFrame(rows).to_csv(path, index=False)


# ======================================================================================
# Helpers: a period as the answers name it, and picks that refuse a tie.
# ======================================================================================
def month(dates: pd.Series) -> pd.Series:
    return dates.dt.strftime("%Y-%m")


def weekday(dates: pd.Series) -> pd.Series:
    return dates.dt.day_name()


def best(s: pd.Series, largest: bool = True) -> list:
    """The label of a Series' maximum (or minimum); fails on a tie (the question would be
    ambiguous to a reader)."""
    s = s.dropna()
    out = list(s[s == (s.max() if largest else s.min())].index)
    assert len(out) == 1, ("a tie", s.name, out)
    return out


def top(s: pd.Series, n: int, largest: bool = True) -> list:
    """The labels of the n largest (or smallest) values; fails if a tie crosses the cut."""
    s = s.dropna().sort_values(ascending=not largest)
    assert len(s) > n and s.iloc[n - 1] != s.iloc[n], (s.name, s.iloc[: n + 1].tolist())
    return list(s.index[:n])


def per(keys: pd.Series, values: pd.Series | None = None, fn: str = "count") -> Table:
    grouped = keys.value_counts() if values is None else values.groupby(keys).agg(fn)
    return Table([[k, v] for k, v in grouped.sort_index().items()])


# ======================================================================================
# Questions: (kind, question, pandas expression over the DataFrame d).
#   best_period    which month / year / weekday had the most or least (count or aggregate)
#   top_periods    the n busiest (or quietest) months
#   weekday        a condition on the day of the week (a day, weekend, weekdays)
#   nearby         questions that must keep their reading: per-period tables, month filters,
#                  the best value of a text column, date comparisons
# ======================================================================================
def bakehouse_questions():
    def P(d):
        return pd.to_datetime(d.placed_on)

    def dow(d):
        return P(d).dt.day_of_week          # Monday 0 … Sunday 6

    return [
        ("best_period", "Which month had the most orders?",
         lambda d: best(month(P(d)).value_counts())),
        ("best_period", "Which month had the fewest orders?",
         lambda d: best(month(P(d)).value_counts(), largest=False)),
        ("best_period", "Which year had the highest total amount?",
         lambda d: best(d.amount.groupby(P(d).dt.year).sum())),
        ("best_period", "In which month were the most loaves ordered?",
         lambda d: best(d.loaves.groupby(month(P(d))).sum())),
        ("best_period", "Which weekday is busiest?",
         lambda d: best(weekday(P(d)).value_counts())),
        ("best_period", "On which day of the week were the fewest orders placed?",
         lambda d: best(weekday(P(d)).value_counts(), largest=False)),
        ("best_period", "What was the month with the lowest average rating?",
         lambda d: best(d.rating.groupby(month(P(d))).mean(), largest=False)),
        ("best_period", "Which month had the highest average amount?",
         lambda d: best(d.amount.groupby(month(P(d))).mean())),
        ("best_period", "Which month of 2023 had the most orders?",
         lambda d: best(month(P(d)[P(d).dt.year == 2023]).value_counts())),
        ("best_period", "Which month had the most late orders?",
         lambda d: best(month(P(d)[d.late == "yes"]).value_counts())),
        ("best_period", "Which weekday had the most late orders?",
         lambda d: best(weekday(P(d)[d.late == "yes"]).value_counts())),
        ("best_period", "Which year had the most orders?",
         lambda d: best(P(d).dt.year.value_counts())),
        ("best_period", "Which month had the most sourdough orders?",
         lambda d: best(month(P(d)[d.bread == "sourdough"]).value_counts())),
        ("top_periods", "What were the 3 busiest months?",
         lambda d: top(month(P(d)).value_counts(), 3)),
        ("weekday", "Were any orders placed on a Sunday?",
         lambda d: bool((dow(d) == 6).any())),
        ("weekday", "How many orders were placed on Mondays?",
         lambda d: (dow(d) == 0).sum()),
        ("weekday", "How many orders were placed at the weekend?",
         lambda d: (dow(d) >= 5).sum()),
        ("weekday", "How many weekday orders were there?",
         lambda d: (dow(d) < 5).sum()),
        ("weekday", "What was the total amount of Saturday orders?",
         lambda d: d.amount[dow(d) == 5].sum()),
        ("weekday", "How many late orders were there on Fridays?",
         lambda d: ((dow(d) == 4) & (d.late == "yes")).sum()),
        ("weekday", "How many orders were placed on a Friday in March 2024?",
         lambda d: ((dow(d) == 4) & (month(P(d)) == "2024-03")).sum()),
        ("weekday", "What is the average rating of orders placed on a Tuesday?",
         lambda d: d.rating[dow(d) == 1].mean()),
        ("nearby", "How many orders were placed each month?",
         lambda d: per(month(P(d)))),
        ("nearby", "What was the total amount per year?",
         lambda d: per(P(d).dt.year, d.amount, "sum")),
        ("nearby", "How many orders were placed in May 2024?",
         lambda d: (month(P(d)) == "2024-05").sum()),
        ("nearby", "Which baker took the most orders?",
         lambda d: best(d.baker.value_counts())),
        ("nearby", "Which cafe ordered the most loaves?",
         lambda d: best(d.loaves.groupby(d.cafe).sum())),
        ("nearby", "How many orders were placed after 1 October 2024?",
         lambda d: (P(d) > "2024-10-01").sum()),
    ]


def climbing_questions():
    def S(d):
        return pd.to_datetime(d.session_date)

    def dow(d):
        return S(d).dt.day_of_week

    return [
        ("best_period", "Which month had the most climbers?",
         lambda d: best(d.climbers.groupby(month(S(d))).sum())),
        ("best_period", "Which month had the most sessions?",
         lambda d: best(month(S(d)).value_counts())),
        ("best_period", "Which day of the week had the highest total fees?",
         lambda d: best(d.fee.groupby(weekday(S(d))).sum())),
        ("best_period", "Which weekday has the fewest sessions?",
         lambda d: best(weekday(S(d)).value_counts(), largest=False)),
        ("best_period", "In which month were the most sessions cancelled?",
         lambda d: best(month(S(d)[d.cancelled == "yes"]).value_counts())),
        ("best_period", "Which month had the highest average number of climbers?",
         lambda d: best(d.climbers.groupby(month(S(d))).mean())),
        ("best_period", "Which month was the quietest?",
         lambda d: best(month(S(d)).value_counts(), largest=False)),
        ("top_periods", "Which 2 months had the fewest sessions?",
         lambda d: top(month(S(d)).value_counts(), 2, largest=False)),
        ("weekday", "How many sessions were held on Saturdays?",
         lambda d: (dow(d) == 5).sum()),
        ("weekday", "Were any sessions cancelled on a Wednesday?",
         lambda d: bool(((dow(d) == 2) & (d.cancelled == "yes")).any())),
        ("weekday", "How many climbers came at the weekend?",
         lambda d: d.climbers[dow(d) >= 5].sum()),
        ("weekday", "What was the average fee of weekend sessions?",
         lambda d: d.fee[dow(d) >= 5].mean()),
        ("weekday", "How many Sunday sessions did Mara Lindqvist lead?",
         lambda d: ((dow(d) == 6) & (d.instructor == "Mara Lindqvist")).sum()),
        ("weekday", "How many sessions were cancelled on weekdays?",
         lambda d: ((dow(d) < 5) & (d.cancelled == "yes")).sum()),
        ("weekday", "How many Thursday sessions were there on the North Face?",
         lambda d: ((dow(d) == 3) & (d.wall == "North Face")).sum()),
        ("nearby", "What was the average number of climbers per month?",
         lambda d: per(month(S(d)), d.climbers, "mean")),
        ("nearby", "Which instructor led the most sessions?",
         lambda d: best(d.instructor.value_counts())),
        ("nearby", "How many sessions were there in August?",
         lambda d: (S(d).dt.month == 8).sum()),
        ("nearby", "Which wall had the highest average number of climbers?",
         lambda d: best(d.climbers.groupby(d.wall).mean())),
        ("nearby", "What was the total fee in July?",
         lambda d: d.fee[S(d).dt.month == 7].sum()),
        ("nearby", "How many sessions were held before March?",
         lambda d: (S(d) < "2024-03-01").sum()),
    ]


def check_tables(b: pd.DataFrame, c: pd.DataFrame) -> None:
    """Facts the questions lean on."""
    placed = pd.to_datetime(b.placed_on)
    assert not (placed.dt.day_of_week == 6).any()          # closed on Sundays
    assert set(placed.dt.year) == {2023, 2024}
    assert (pd.to_datetime(c.session_date).dt.year == 2024).all()
    assert b.order_no.is_unique


def write_set(name: str, table: str, prefix: str, d: pd.DataFrame, questions) -> list[dict]:
    out = []
    for i, (kind, question, fn) in enumerate(questions, start=1):
        raw = fn(d)
        ans = to_answer(raw)
        assert ans, f"empty answer: {question}"
        out.append({"id": f"{prefix}-{i:02d}", "question": question, "table": table,
                    "answer": ans, "answer_rounded": rounded(ans), "kind": kind})
    assert len({r["question"] for r in out}) == len(out)
    with (HERE / name).open("w", encoding="utf-8") as f:
        for r in out:
            f.write(json.dumps(r, ensure_ascii=False) + "\n")
    return out


def main() -> None:
    make_bakehouse(HERE / "bakehouse.csv")
    make_climbing(HERE / "climbing.csv")
    b = pd.read_csv(HERE / "bakehouse.csv")
    c = pd.read_csv(HERE / "climbing.csv")
    check_tables(b, c)
    for name, table, prefix, d, qs in [
        ("bakehouse.jsonl", "bakehouse.csv", "bq", b, bakehouse_questions()),
        ("climbing.jsonl", "climbing.csv", "cl", c, climbing_questions()),
    ]:
        rows = write_set(name, table, prefix, d, qs)
        kinds = pd.Series([r["kind"] for r in rows]).value_counts().sort_index()
        print(f"{name}: {len(rows)} questions; " + ", ".join(f"{k} {v}" for k, v in kinds.items()))


if __name__ == "__main__":
    main()
