"""Columns named the way open datasets and quick exports name them (wt, prcp, unitpr, temp_hi),
and "how many <a number column>" asked of one row or of a few.

Every expected answer is computed by pandas from the same rows (a second computation, outside
tabq); the tables are invented here."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import tabq
from tabq.answers import matches


@pytest.fixture(scope="module")
def stations(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    rng = np.random.default_rng(11)
    n = 48
    frame = pd.DataFrame({
        "stn": rng.choice(["Kelso", "Wick", "Oban", "Ayr"], n),
        "dt": pd.date_range("2025-03-01", periods=n, freq="3D").strftime("%Y-%m-%d"),
        "temp_hi": rng.normal(14, 5, n).round(1),
        "temp_lo": rng.normal(4, 4, n).round(1),
        "prcp": rng.gamma(1.2, 3, n).round(1),
        "wt_kg": rng.uniform(1, 40, n).round(2),
        "unitpr": rng.uniform(2, 60, n).round(2),
        "qty": rng.integers(1, 30, n),
    })
    path = tmp_path_factory.mktemp("terse") / "readings.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, expected", [
    ("what is the total precipitation", lambda f: f.prcp.sum()),
    ("what is the average unit price", lambda f: f.unitpr.mean()),
    ("what is the heaviest weight", lambda f: f.wt_kg.max()),
    ("what is the total quantity", lambda f: f.qty.sum()),
    ("what was the average high temperature", lambda f: f.temp_hi.mean()),
    ("how many readings had precipitation above 5", lambda f: int((f.prcp > 5).sum())),
])
def test_a_shortened_header_is_the_word_it_shortens(stations, question, expected):
    frame, table = stations
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas


def test_one_shared_word_does_not_name_a_column_of_two():
    """temp alone says temp_hi and temp_lo equally: neither is an abbreviation mention."""
    from tabq.analyse import _shortened_mention
    from tabq.text import read_question
    words = read_question("what is the average temperature")
    assert _shortened_mention({"temp", "hi"}, words) is None
    assert _shortened_mention({"temp", "hi"}, read_question("the peak temperature")) is not None


@pytest.fixture(scope="module")
def players(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    frame = pd.DataFrame({
        "player": ["Ada Brenner", "Tomas Ruiz", "Keiko Mori", "Lars Holm", "Priya Nair",
                   "Omar Haddad"],
        "club": ["Riverside", "Riverside", "Harbour FC", "Riverside", "Mill Town", "Mill Town"],
        "goals": [3, 5, 9, 15, 11, 17],
        "assists": [0, 4, 1, 11, 2, 7],
    })
    path = tmp_path_factory.mktemp("players") / "players.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, expected", [
    ("how many goals did Keiko Mori score", lambda f: f.goals[f.player == "Keiko Mori"].sum()),
    ("how many assists did Lars Holm have", lambda f: f.assists[f.player == "Lars Holm"].sum()),
    ("how many goals did Riverside players score", lambda f: f.goals[f.club == "Riverside"].sum()),
    ("how many players scored more than 10 goals", lambda f: int((f.goals > 10).sum())),
])
def test_how_many_of_a_number_column_reads_it_rather_than_counting_rows(players, question,
                                                                         expected):
    frame, table = players
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas


@pytest.mark.parametrize("question, expected", [
    ("which 2 players scored the most goals",
     lambda f: set(f.nlargest(2, "goals").player)),
    ("the 3 players with the most assists", lambda f: set(f.nlargest(3, "assists").player)),
    ("which players scored 15 goals", lambda f: set(f.player[f.goals == 15])),
])
def test_a_number_after_which_or_the_counts_the_answers(players, question, expected):
    frame, table = players
    assert set(table.ask(question).answer) == expected(frame), question   # pandas


@pytest.mark.parametrize("question, expected", [
    ("what was the peak temperature", lambda f: f.temp_hi.max()),
    ("which station had the warmest day", lambda f: f.stn[f.temp_hi.idxmax()]),
    ("which station had the heaviest parcel", lambda f: f.stn[f.wt_kg.idxmax()]),
    ("when was the coldest night", lambda f: f.dt[f.temp_lo.idxmin()]),
])
def test_a_measure_adjective_orders_by_the_column_it_names(stations, question, expected):
    frame, table = stations
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas


@pytest.fixture(scope="module")
def trips(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    """Headers a stemmer spoils (hwy → hwi, cty → cti) and a header that is only its unit;
    each row is one trip of one of three vans."""
    rng = np.random.default_rng(1204)
    n = 40
    frame = pd.DataFrame({
        "van": rng.choice(["Elm", "Rook", "Sedge"], n),
        "cty": rng.integers(9, 30, n),
        "hwy": rng.integers(14, 44, n),
        "kg": rng.uniform(50, 900, n).round(1),
    })
    path = tmp_path_factory.mktemp("terse") / "vans.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, expected", [
    ("what is the average highway mileage", lambda f: f.hwy.mean()),
    ("how many trips did more than 30 on the highway", lambda f: int((f.hwy > 30).sum())),
    # three vans make the 40 trips: "how many vans" counts the vans, not their trips
    ("how many vans do more than 30 on the highway", lambda f: f.van[f.hwy > 30].nunique()),
    ("what is the lowest city mileage", lambda f: f.cty.min()),
    ("what is the heaviest load", lambda f: f.kg.max()),
    ("what is the total weight carried by Rook", lambda f: f.kg[f.van == "Rook"].sum()),
])
def test_a_header_spoiled_by_stemming_or_only_a_unit_is_still_named(trips, question, expected):
    frame, table = trips
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas
