"""A question word names a header by meaning alone, through the shipped word vectors
(tabq/wordvectors.py, built by tools/make_vectors.py): words neither the header's letters, the
hand synonyms nor WordNet link. Answers are computed by pandas (a second computation) over an
invented ferry operator's runs."""

import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches
from tabq.text import stem
from tabq.wordvectors import similarity

SKIPPERS = ["Morag Dunn", "Ewan Price", "Isla Ferris", "Callum Reid"]
BOATS = ["Kestrel", "Puffin", "Gannet"]


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    rng = random.Random(7)
    frame = pd.DataFrame([{
        "run_id": f"R{100 + i}", "skipper": rng.choice(SKIPPERS), "boat": rng.choice(BOATS),
        "freight_tonnes": round(rng.uniform(2, 40), 1), "diesel_litres": rng.randint(80, 400),
        "revenue_gbp": round(rng.uniform(300, 4000), 2)} for i in range(60)])
    path = tmp_path_factory.mktemp("ferry") / "ferry_runs.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


def test_related_words_score_above_unrelated():
    assert similarity(stem("rainfall"), stem("precipitation")) > 0.55
    assert similarity(stem("captain"), stem("skipper")) > 0.55
    assert similarity(stem("captain"), stem("diesel")) < 0.3
    assert similarity("no-such-stem", stem("rain")) == 0.0


@pytest.mark.parametrize("question, expected", [
    # fuel → diesel_litres: before the vectors, the question's filter was summed in another column
    ("How much fuel did the Kestrel use altogether?",
     lambda d: d[d.boat == "Kestrel"].diesel_litres.sum()),
    # vessel → boat, fuel → diesel_litres: before, a skipper was answered
    ("Which vessel burned the most fuel on average?",
     lambda d: d.groupby("boat").diesel_litres.mean().idxmax()),
    ("Which captain carried the most cargo in total?",
     lambda d: d.groupby("skipper").freight_tonnes.sum().idxmax()),
    ("How many runs earned more than 3000?", lambda d: (d.revenue_gbp > 3000).sum()),
])
def test_header_named_by_meaning(runs, question, expected):
    frame, table = runs
    result = table.ask(question)
    assert matches(result.answer, [expected(frame)]), (question, result.answer, result.sql)

