"""Fused, pruned execution gives the answers that running every candidate alone gives.

- run_many (candidates sharing a scan fused) against execute._execute (each form's own SQL,
  alone) on the demo table, palmerpenguins and the WTQ fixture tables;
- ask() with its pruning against ask() forced to execute every candidate, under the prior and
  under a sharper model (so that pruning really happens);
- pandas as an outside computation of fused aggregates and best groups on palmerpenguins
  (the palmerpenguins package's CSV, Horst, Hill & Gorman 2020).
"""

import itertools
import json
import random
from pathlib import Path

import pandas as pd
import pytest

import tabq
from tabq import execute, pipeline
from tabq import logic as L
from tabq.analyse import analyse
from tabq.answers import Denotation, matches
from tabq.derive import derive
from tabq.features import ANSWER_FEATURES, answer_score_bound
from tabq.model import Model
from tabq.sql import render

FIXTURE = Path(__file__).parent / "fixtures" / "wtq"
DEMO_QUESTIONS = (Path(__file__).parent.parent / "sample_tables" / "demo_questions.txt")
PENGUIN_QUESTIONS = [
    "how many penguins live on dream island", "which island has the most penguins",
    "average body mass of gentoo penguins", "which species has the heaviest average body mass",
    "how many penguins have no sex recorded", "the three islands with the most adelie penguins",
    "total flipper length of chinstrap penguins", "were there any penguins heavier than 6000 g",
    "how many different islands are there", "what is the longest bill of a female penguin",
]


def wtq_questions(n: int) -> list[tuple[Path, str]]:
    lines = (FIXTURE / "questions.jsonl").read_text(encoding="utf-8").splitlines()
    picked = [q for q in map(json.loads, lines) if q["split"] != "extra"][::4][:n]
    return [(FIXTURE / q["table"], q["question"]) for q in picked]


def cases(penguins_csv, demo_csv, wtq: int) -> list[tuple[Path, str]]:
    demo = [q for q in DEMO_QUESTIONS.read_text().splitlines() if q.strip()]
    return ([(demo_csv, q) for q in demo] + [(penguins_csv, q) for q in PENGUIN_QUESTIONS]
            + wtq_questions(wtq))


def same(a: Denotation, b: Denotation) -> bool:
    if a.error or b.error:
        return bool(a.error) == bool(b.error)
    return a.is_table == b.is_table and matches(list(a.values), list(b.values))


@pytest.mark.long   # 42 questions, each of its 60 best readings run twice: about 14 s
def test_fused_answers_equal_each_query_alone(penguins_csv, demo_csv):
    tables: dict[Path, tuple] = {}
    compared = fused_groups = 0
    for path, question in cases(penguins_csv, demo_csv, 16):
        if path not in tables:
            tables[path] = (tabq.open(path).table, tabq.open(path).table)
        fused_table, alone_table = tables[path]
        forms = [i.form for i in derive(analyse(question, fused_table), Model.prior())[:60]]
        fused = execute.run_many(fused_table, forms)
        for form, den in zip(forms, fused, strict=True):
            alone = execute._execute(alone_table, render(form), 30.0, form.tabular)
            assert same(den, alone), (question, render(form), den, alone)
            compared += 1
        fused_groups += sum(isinstance(f, (L.GroupBest, L.GroupTop, L.Aggregate)) for f in forms)
    assert compared > 1500 and fused_groups > 500


def _ask_everything(table: pipeline.OpenTable, question: str) -> pipeline.Result:
    original = pipeline._can_skip
    pipeline._can_skip = lambda done, rest, bound: not rest
    try:
        return table.ask(question)
    finally:
        pipeline._can_skip = original


@pytest.mark.long   # 30 questions asked twice per model, once running every reading: 25 s
@pytest.mark.parametrize("sharpness", [1.0, 4.0])
def test_pruned_ask_gives_the_answer_of_executing_everything(penguins_csv, demo_csv, sharpness):
    model = Model({k: v * sharpness for k, v in Model.prior().items()})
    opened: dict[Path, pipeline.OpenTable] = {}
    pruned = 0
    for path, question in cases(penguins_csv, demo_csv, 4):
        table = opened.setdefault(path, tabq.open(path, model=model))
        fast, full = table.ask(question), _ask_everything(table, question)
        pruned += len(fast.candidates) < len(full.candidates)
        settled = pipeline.SETTLED
        assert [(r.sql, r.answer) for r in fast.readings[:settled]] == [
            (r.sql, r.answer) for r in full.readings[:settled]], question
        assert abs(fast.confidence - full.confidence) <= pipeline.MASS_TOLERANCE + 1e-9, question
    if sharpness > 1:
        assert pruned >= 3   # the test must see pruning happen, not only full runs


def test_answer_score_bound_holds_for_any_answer(demo_csv):
    table = tabq.open(demo_csv)
    rng = random.Random(4)
    pool = [0, 1, 2.5, -3, "yes", "no", "Wharf Shed", "2025-03-01", None, True, ("a", 1)]
    answers = [Denotation(()), Denotation((), error="boom"), Denotation((None, None))]
    for n in (1, 2, 3, 25):
        for _ in range(40):
            values = tuple(rng.choice(pool) for _ in range(n))
            answers.append(Denotation(values))
            answers.append(Denotation(tuple((v, 1) for v in values), is_table=True))
    questions = ["how many jobs", "what is the total price", "when was the first job",
                 "who fixed the most bikes", "which mechanic", "where was it", "were there any",
                 "list the mechanics", "price of job 40", "the mechanic of job 3"]
    for question, model in itertools.product(questions, (Model.prior(), Model({"den:many": 2.0,
                                                                               "den:table": 1.0}))):
        analysis = analyse(question, table.table)
        bound = answer_score_bound(analysis, model)
        for den in answers:
            feats: dict = {}
            for fn in ANSWER_FEATURES:
                for name, value in fn(analysis, den).items():
                    feats[name] = feats.get(name, 0.0) + value
            assert model.score(feats) <= bound + 1e-9, (question, den, feats)


def test_fused_aggregates_and_groups_agree_with_pandas(penguins_csv):
    """pandas computes the same answers from the same CSV, outside tabq."""
    frame = pd.read_csv(penguins_csv)
    table = tabq.open(penguins_csv).table
    gentoo, female = L.Eq("species", "Gentoo"), L.Eq("sex", "female")
    forms = [
        L.Aggregate("avg", "body_mass_g", gentoo), L.Aggregate("max", "bill_length_mm", gentoo),
        L.Aggregate("count", None, gentoo), L.Aggregate("sum", "flipper_length_mm", gentoo),
        L.GroupBest("island", "count", None, L.All(), "max"),
        L.GroupBest("island", "avg", "body_mass_g", L.All(), "min"),
        L.GroupTop("island", "sum", "body_mass_g", 2, female, "max"),
        L.GroupTop("island", "count", None, 2, female, "max"),
    ]
    got = execute.run_many(table, forms)
    g = frame[frame.species == "Gentoo"]
    by_island = frame.groupby("island")
    f_island = frame[frame.sex == "female"].groupby("island")
    expected = [
        [g.body_mass_g.mean()], [g.bill_length_mm.max()], [len(g)], [g.flipper_length_mm.sum()],
        [by_island.size().idxmax()], [by_island.body_mass_g.mean().idxmin()],
        list(f_island.body_mass_g.sum().sort_values(ascending=False).index[:2]),
        list(f_island.size().sort_values(ascending=False).index[:2]),
    ]
    for form, den, want in zip(forms, got, expected, strict=True):
        assert matches(list(den.values), want), (render(form), den.values, want)


def test_aggregates_over_different_rows_share_one_scan(penguins_csv, monkeypatch):
    """Each aggregate alone on its rows, all in one query (CASE WHEN its condition); pandas
    computes the same answers from the palmerpenguins CSV, outside tabq."""
    frame = pd.read_csv(penguins_csv)
    table = tabq.open(penguins_csv).table
    queries = []
    fetch = execute._fetch
    monkeypatch.setattr(execute, "_fetch", lambda t, sql, *a, **k: queries.append(sql) or fetch(
        t, sql, *a, **k))
    heavy = L.Cmp("body_mass_g", "gt", 6000)
    forms = [
        L.Aggregate("count", None, L.Eq("island", "Dream")),
        L.Aggregate("avg", "body_mass_g", L.Eq("species", "Chinstrap")),
        L.Aggregate("max", "bill_length_mm",
                    L.And(L.Eq("sex", "female"), L.Eq("island", "Biscoe"))),
        L.Aggregate("count_distinct", "island", L.Not(L.Eq("species", "Adelie"))),
        L.Aggregate("sum", "flipper_length_mm", L.All()),
        L.YesNo(heavy), L.YesNo(L.Cmp("body_mass_g", "gt", 9000)),
    ]
    got = execute.run_many(table, forms)
    assert len(queries) == 1 and "CASE WHEN" in queries[0]
    f = frame
    expected = [
        [int((f.island == "Dream").sum())],
        [f[f.species == "Chinstrap"].body_mass_g.mean()],
        [f[(f.sex == "female") & (f.island == "Biscoe")].bill_length_mm.max()],
        [f[f.species != "Adelie"].island.nunique()],
        [f.flipper_length_mm.sum()],
        ["yes" if (f.body_mass_g > 6000).any() else "no"], ["no"],
    ]
    for form, den, want in zip(forms, got, expected, strict=True):
        assert matches(list(den.values), want), (render(form), den.values, want)
