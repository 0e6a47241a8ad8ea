"""Build a benchmark of questions that name terse headers by related words (issue 16, item 2).

One invented table, schools.csv: fee-paying and state schools of an invented county, under
the terse headers a survey export uses (enrltot, estab_yr, expnstu, feeann, distkm). The
questions say what the headers mean in everyday words ("pupils", "founded", "spends", "charges",
"farthest"), none of them written inside a header. Written before the engine read WordNet; each
answer is a pandas expression beside its question (no answer typed by hand).

    python benchmarks/related_words/make_set.py

Answer format as benchmarks/zeroshot2 (id, question, table, answer, answer_rounded, kind).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent
SEED = 16020002
DISTRICTS = ["Northmoor", "Eastvale", "Saltmarsh", "Holloway Fen"]
NAMES = ["Brackenhurst Academy", "Kestrel Lane School", "St Aldric's College", "Wrenfield High",
         "Oakhollow Primary", "Marrowby Grammar", "Thistledown School", "Fernacre Academy",
         "Quillon Park School", "Harrowgate Lodge", "Larkspur Primary", "Cinderford College",
         "Pellham Cross School", "Rookwood Academy", "Stanmere Primary", "Gorsey Bank High",
         "Ivel Mead School", "Ashdown Priory", "Wyvern Hill Primary", "Bramblecote School",
         "Elderwick Academy", "Corran Vale High"]


def table() -> pd.DataFrame:
    rng = np.random.default_rng(SEED)
    n = len(NAMES)
    private = rng.random(n) < 0.4
    enrl = rng.integers(120, 1600, n)
    df = pd.DataFrame({
        "school": NAMES,
        "dstrct": rng.choice(DISTRICTS, n, p=[0.3, 0.3, 0.2, 0.2]),
        "estab_yr": rng.integers(1860, 2015, n),
        "enrltot": enrl,
        "tchrs": np.maximum(8, (enrl / rng.uniform(14, 22, n)).round().astype(int)),
        "expnstu": (rng.normal(7800, 1400, n) + private * 2500).round(0).astype(int),
        "feeann": np.where(private, (rng.normal(14000, 3500, n) / 50).round() * 50, 0).astype(int),
        "distkm": rng.uniform(0.8, 24.0, n).round(1),
        "attndpct": rng.uniform(88.0, 98.5, n).round(1),
    })
    return df


def questions(t: pd.DataFrame) -> list[tuple[str, str, object]]:
    """(question, kind, answer as pandas computes it)."""
    by = t.set_index("school")
    paying = t[t.feeann > 0]
    return [
        ("Which school has the most pupils?", "argmax", t.loc[t.enrltot.idxmax(), "school"]),
        ("How many students does Kestrel Lane School have?", "lookup",
         by.loc["Kestrel Lane School", "enrltot"]),
        ("How many pupils are there in total in Northmoor?", "sum_filter",
         t[t.dstrct == "Northmoor"].enrltot.sum()),
        ("How many schools have fewer than 400 students?", "count_filter",
         int((t.enrltot < 400).sum())),
        ("Which school has the fewest students?", "argmin", t.loc[t.enrltot.idxmin(), "school"]),
        ("Average number of pupils per school in Eastvale", "avg_filter",
         t[t.dstrct == "Eastvale"].enrltot.mean()),
        ("Which school was founded first?", "argmin", t.loc[t.estab_yr.idxmin(), "school"]),
        ("In what year was Marrowby Grammar founded?", "lookup",
         by.loc["Marrowby Grammar", "estab_yr"]),
        ("How many schools were founded after 1990?", "count_filter",
         int((t.estab_yr > 1990).sum())),
        ("Which school was established most recently?", "argmax",
         t.loc[t.estab_yr.idxmax(), "school"]),
        ("Which school charges the highest fee?", "argmax", t.loc[t.feeann.idxmax(), "school"]),
        ("How much does Rookwood Academy charge?", "lookup", by.loc["Rookwood Academy", "feeann"]),
        ("How many schools charge nothing?", "count_filter", int((t.feeann == 0).sum())),
        ("What do parents pay on average at schools in Saltmarsh?", "avg_filter",
         t[t.dstrct == "Saltmarsh"].feeann.mean()),
        ("Which school is the most expensive?", "argmax", t.loc[t.feeann.idxmax(), "school"]),
        ("Which school spends the most per pupil?", "argmax",
         t.loc[t.expnstu.idxmax(), "school"]),
        ("How much does Wrenfield High spend per student?", "lookup",
         by.loc["Wrenfield High", "expnstu"]),
        ("What is the average spending per pupil in Holloway Fen?", "avg_filter",
         t[t.dstrct == "Holloway Fen"].expnstu.mean()),
        ("How many schools spend more than 9000 per pupil?", "count_filter",
         int((t.expnstu > 9000).sum())),
        ("Which school is farthest away?", "argmax", t.loc[t.distkm.idxmax(), "school"]),
        ("How far is Ashdown Priory?", "lookup", by.loc["Ashdown Priory", "distkm"]),
        ("How many teachers does Fernacre Academy employ?", "lookup",
         by.loc["Fernacre Academy", "tchrs"]),
        ("Which district has the most students in total?", "group_argmax",
         t.groupby("dstrct").enrltot.sum().idxmax()),
        ("Which school has the best attendance?", "argmax",
         t.loc[t.attndpct.idxmax(), "school"]),
        ("How many fee-paying schools have more than 800 pupils?", "count_filter",
         int(((paying.enrltot > 800)).sum())),
    ]


def _plain(value: object) -> object:
    if isinstance(value, np.integer):
        return int(value)
    if isinstance(value, np.floating):
        return float(value)
    return value


def _rounded(value: object) -> object:
    return round(value, 2) if isinstance(value, float) and not math.isnan(value) else value


def main() -> None:
    t = table()
    t.to_csv(HERE / "schools.csv", index=False)
    with open(HERE / "schools.jsonl", "w", encoding="utf-8") as f:
        for n, (question, kind, answer) in enumerate(questions(t), 1):
            answer = _plain(answer)
            f.write(json.dumps({"id": f"rw-{n:02d}", "question": question, "table": "schools.csv",
                                "answer": [answer], "answer_rounded": [_rounded(answer)],
                                "kind": kind}) + "\n")


if __name__ == "__main__":
    main()
