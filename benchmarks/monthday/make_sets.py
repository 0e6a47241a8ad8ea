"""Build the month/day-column sets: daily logs that hold their dates as separate number columns.

Written before the engine learned to read a month name or a day and month against such columns
(issue 16, "right out of the box"). Two invented tables, seeded, and questions whose answers are
one small pandas expression each (none is typed by hand):

  hive_log.csv / hive_log.jsonl    an invented apiary's daily log, 1 April - 30 September, with
                                   no year: columns mth (1-12) and day (1-31)
  ferry_log.csv / ferry_log.jsonl  an invented ferry's daily log, 1 March 2023 - 31 October
                                   2024: columns year, month, day

Run from anywhere: python benchmarks/monthday/make_sets.py (numpy and pandas; nothing is
downloaded). Then: python benchmarks/zeroshot.py benchmarks/monthday/*.jsonl --show-wrong
Answer format as in benchmarks/zeroshot2 (a JSON list; a per-group table is [key, value] rows).
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent


def hive_table() -> pd.DataFrame:
    rng = np.random.default_rng(16_0420)
    days = pd.date_range("2001-04-01", "2001-09-30")   # the year is never written out
    season = np.sin((days.day_of_year - 90) / 183 * np.pi)
    table = pd.DataFrame({
        "mth": days.month, "day": days.day,
        "hive_kg": np.round(38 + 14 * season + rng.normal(0, 1.5, len(days)), 1),
        "max_temp": np.round(12 + 14 * season + rng.normal(0, 3, len(days)), 1),
        "rain_mm": np.round(np.where(rng.random(len(days)) < 0.6, 0,
                                     rng.gamma(1.5, 3.0, len(days))), 1),
        "foragers": rng.poisson(20 + 30 * season),
    })
    table.loc[rng.choice(len(table), 9, replace=False), "hive_kg"] = np.nan   # scale offline
    return table


def ferry_table() -> pd.DataFrame:
    rng = np.random.default_rng(16_0301)
    days = pd.date_range("2023-03-01", "2024-10-31")
    summer = np.sin((days.day_of_year - 80) / 365 * 2 * np.pi)
    return pd.DataFrame({
        "year": days.year, "month": days.month, "day": days.day,
        "passengers": rng.poisson(420 + 260 * summer),
        "cars": rng.poisson(90 + 50 * summer),
        "wave_m": np.round(np.abs(1.6 - 0.8 * summer + rng.normal(0, 0.5, len(days))), 2),
    })


def hive_questions(t: pd.DataFrame) -> list[tuple[str, str, object]]:
    md = t.mth * 100 + t.day
    return [
        ("count_date", "How many days in July had a max temp above 25?",
         int(((t.mth == 7) & (t.max_temp > 25)).sum())),
        ("lookup", "What was the hive weight on 18 June?",
         t.hive_kg[(t.mth == 6) & (t.day == 18)].item()),
        ("lookup", "How much rain fell on July 4th?",
         t.rain_mm[(t.mth == 7) & (t.day == 4)].item()),
        ("count_date", "How many days before June had more than 5 mm of rain?",
         int(((t.mth < 6) & (t.rain_mm > 5)).sum())),
        ("count_date", "How many days after 20 August had a max temp below 18?",
         int(((md > 820) & (t.max_temp < 18)).sum())),
        ("aggregate", "What was the highest max temp in May?", t.max_temp[t.mth == 5].max()),
        ("negation", "How many days were not in August?", int((t.mth != 8).sum())),
        ("per_month", "What was the average hive weight in each month?",
         [[int(m), v] for m, v in t.groupby("mth").hive_kg.mean().items()]),
        ("difference", "How much hotter was July than May on average?",
         t.max_temp[t.mth == 7].mean() - t.max_temp[t.mth == 5].mean()),
        ("argmax_group", "Which month had the most rain in total?",
         int(t.groupby("mth").rain_mm.sum().idxmax())),
        ("count_date", "How many days were logged in September?", int((t.mth == 9).sum())),
        ("argmax_row", "On which day of May was the max temp highest?",
         int(t.day[t.mth == 5][t.max_temp[t.mth == 5].idxmax()])),
        ("aggregate", "What was the total rain in June?", t.rain_mm[t.mth == 6].sum()),
        ("count", "How many days had over 40 foragers?", int((t.foragers > 40).sum())),
        ("count_date", "How many days after 15 September had more than 2 mm of rain?",
         int(((md > 915) & (t.rain_mm > 2)).sum())),
        ("count", "How many days are in the log?", len(t)),
    ]


def ferry_questions(t: pd.DataFrame) -> list[tuple[str, str, object]]:
    return [
        ("lookup", "How many passengers sailed on 18 June 2024?",
         int(t.passengers[(t.year == 2024) & (t.month == 6) & (t.day == 18)].item())),
        ("count_date", "How many days in July 2023 had waves above 1 metre?",
         int(((t.year == 2023) & (t.month == 7) & (t.wave_m > 1)).sum())),
        ("count_date", "How many days in November had waves above 2 metres?",   # 2023 only
         int(((t.month == 11) & (t.wave_m > 2)).sum())),
        ("aggregate", "What was the highest wave height in January 2024?",
         t.wave_m[(t.year == 2024) & (t.month == 1)].max()),
        ("aggregate", "How many cars were carried in 2024?", int(t.cars[t.year == 2024].sum())),
    ]


def _plain(value):
    if isinstance(value, list):
        return [_plain(v) for v in value]
    if isinstance(value, (np.integer,)):
        return int(value)
    if isinstance(value, (np.floating, float)):
        return float(value)
    return value


def write(name: str, table: pd.DataFrame, questions) -> None:
    table.to_csv(HERE / f"{name}.csv", index=False)
    lines = []
    for n, (kind, question, answer) in enumerate(questions, 1):
        answer = _plain(answer)
        lines.append(json.dumps({"id": f"{name}-{n:02d}", "question": question,
                                 "table": f"{name}.csv",
                                 "answer": answer if isinstance(answer, list) else [answer],
                                 "kind": kind}))
    (HERE / f"{name}.jsonl").write_text("\n".join(lines) + "\n", encoding="utf-8")


if __name__ == "__main__":
    hive = hive_table()
    write("hive_log", hive, hive_questions(hive))
    ferry = ferry_table()
    write("ferry_log", ferry, ferry_questions(ferry))
