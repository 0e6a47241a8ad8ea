"""Differences asked with any comparative ("how much higher … than …") and numbers joined to
the word naming their column ("3-bedroom", "4-cylinder"): an equality on that column, not a
threshold. The table is an invented letting agency's flats, built here; every expected answer
is computed by pandas beside its check. The model is the untaught prior."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import tabq
from tabq.answers import matches


@pytest.fixture(scope="module")
def flats(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    rng = np.random.default_rng(3012)
    n = 90
    frame = pd.DataFrame({
        "flat": [f"FL-{500 + i}" for i in range(n)],
        "district": rng.choice(["Northgate", "Saltmarsh", "Quarry Hill"], n),
        "bedrooms": rng.choice([1, 2, 3, 4], n, p=[0.2, 0.35, 0.3, 0.15]),
        "rent": rng.uniform(600, 2200, n).round(0),
        "floor_m2": rng.uniform(30, 140, n).round(1),
    })
    path = tmp_path_factory.mktemp("flats") / "flats.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, expected", [
    ("How many more 3-bedroom flats are there than 1-bedroom ones?",
     lambda f: int((f.bedrooms == 3).sum() - (f.bedrooms == 1).sum())),
    ("How many 2-bedroom flats are there?", lambda f: int((f.bedrooms == 2).sum())),
    ("How many 4-bedroom flats rent for more than 1500?",
     lambda f: int(((f.bedrooms == 4) & (f.rent > 1500)).sum())),
])
def test_a_number_joined_to_a_column_word_is_its_value(flats, question, expected):
    frame, table = flats
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas


@pytest.mark.parametrize("question, expected", [
    ("How much higher is the average rent in Northgate than in Saltmarsh?",
     lambda f: f.rent[f.district == "Northgate"].mean() - f.rent[f.district == "Saltmarsh"].mean()),
    ("How much bigger is the average floor area in Northgate than in Quarry Hill?",
     lambda f: f.floor_m2[f.district == "Northgate"].mean()
     - f.floor_m2[f.district == "Quarry Hill"].mean()),
])
def test_how_much_with_any_comparative_asks_for_a_difference(flats, question, expected):
    frame, table = flats
    assert expected(frame) > 0   # the question's premise holds in the data
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas
