"""The column named right after a superlative orders the rows; another column named in the
question is the one answered (issue 16): "the rainfall on the day with the most sunshine" reads
the rainfall of the sunniest day, not the sunshine of the wettest. "The 3 highest sunshine
readings" answers with the very column it orders by.

The table is an invented allotment society's daily weather log, built here; every expected
answer is computed by pandas beside its check (`pandas:` comments). The model is the untaught
prior.
"""

from __future__ import annotations

import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches


def weather_rows() -> list[dict]:
    rng = random.Random(2611)
    days = pd.date_range("2026-05-01", periods=61, freq="D")
    return [{"logged_on": d.strftime("%Y-%m-%d"), "rainfall": round(rng.uniform(0, 30), 1),
             "sunshine": round(rng.uniform(0, 14), 1), "windspeed": round(rng.uniform(2, 60), 1)}
            for d in days]


@pytest.fixture(scope="module")
def frame() -> pd.DataFrame:
    return pd.DataFrame(weather_rows())


@pytest.fixture(scope="module")
def table(tmp_path_factory, frame):
    path = tmp_path_factory.mktemp("weather") / "allotment_weather.csv"
    frame.to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, answered, ordered", [
    ("What was the rainfall on the day with the most sunshine?", "rainfall", "sunshine"),
    ("What was the windspeed on the day with the highest rainfall?", "windspeed", "rainfall"),
    ("How much sunshine was there on the day with the lowest windspeed?", "sunshine",
     "windspeed"),
])
def test_the_column_after_a_superlative_orders(table, frame, question, answered, ordered):
    best = frame[ordered].idxmin() if "lowest" in question else frame[ordered].idxmax()
    assert matches(table.ask(question).answer, [frame.loc[best, answered]])   # pandas


def test_a_superlative_over_one_column_answers_with_it(table, frame):
    result = table.ask("List the 3 highest sunshine figures.")
    assert matches(result.answer, list(frame.sunshine.nlargest(3)))          # pandas
