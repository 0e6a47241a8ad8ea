"""Questions that ask for the table's rows by their noun (issue 16): "which <thing> is the most
expensive", "the two cheapest <things>", "the 3 most borrowed <things>" over a table named after
its rows, whose rows are named by a title column and whose price is a terse joined header.
The answer is rows' titles: not a group of another column (whose sum would favour the publisher
of many titles), nor the measure that orders them.

The table is an invented lending library's catalogue of board games, built here; every expected
answer is computed by pandas beside its check (`pandas:` comments). The model is the untaught
prior.
"""

from __future__ import annotations

import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches

PUBLISHERS = ["Tallowmere Games", "Brackenfold", "Quill & Pawn"]


def game_rows() -> list[dict]:
    """60 games, one row each, from three publishers (one publishes most of them)."""
    rng = random.Random(1604)
    rows = []
    for i in range(60):
        rows.append({"title": f"Game {chr(65 + i % 26)}{i // 26 + 1}",
                     "publisher": rng.choices(PUBLISHERS, weights=[6, 2, 2])[0],
                     "listprice": round(rng.uniform(12, 95), 2),
                     "loans": rng.randrange(0, 400),
                     "players": rng.randrange(2, 9)})
    return rows


@pytest.fixture(scope="module")
def frame() -> pd.DataFrame:
    return pd.DataFrame(game_rows())


@pytest.fixture(scope="module")
def table(tmp_path_factory, frame):
    path = tmp_path_factory.mktemp("rows") / "games.csv"
    frame.to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


def test_which_row_is_the_most_expensive(table, frame):
    assert frame.listprice.is_unique
    # pandas: the title of the game with the highest list price
    expected = frame.loc[frame.listprice.idxmax(), "title"]
    assert matches(table.ask("Which game is the most expensive?").answer, [expected])


def test_the_n_cheapest_rows_are_titles(table, frame):
    # pandas: the titles of the two games with the lowest list price
    expected = list(frame.nsmallest(2, "listprice").title)
    assert matches(table.ask("Name the two cheapest games.").answer, expected)


def test_the_n_rows_with_the_most_of_a_measure_are_titles(table, frame):
    assert frame.loans.nlargest(4).is_unique
    # pandas: the titles of the three games with the most loans
    expected = list(frame.nlargest(3, "loans").title)
    assert matches(table.ask("What are the 3 most loaned games?").answer, expected)


def test_the_measure_itself_when_it_is_asked_for(table, frame):
    # pandas: the three highest list prices (the question names the prices, not the games)
    expected = list(frame.listprice.nlargest(3))
    assert matches(table.ask("What are the 3 highest list prices?").answer, expected)


# ── a row described by a superlative, its noun told by code values ────────────────────────────
# An invented mobile knife-sharpening service's call-outs: each row is a call-out named by a code
# ("SV-7001"), with no id header; the busiest van has the largest sums, so a group's total
# would name it whatever the question says.

VANS = ["Larkspur", "Moorgate", "Thistlecombe"]


def callout_rows() -> list[dict]:
    """80 call-outs; the dearest and farthest is a small van's, the cheapest the busiest's."""
    rng = random.Random(2412)
    rows = [{"callout": f"SV-{7001 + i}", "van": rng.choices(VANS, weights=[7, 2, 1])[0],
             "fee": round(rng.uniform(8, 140), 2), "dist_km": round(rng.uniform(1, 60), 1),
             "knives": rng.randrange(1, 30)} for i in range(80)]
    rows[17].update(van="Moorgate", fee=188.5, dist_km=74.2)
    rows[41].update(van="Larkspur", fee=6.4)
    return rows


@pytest.fixture(scope="module")
def callouts(tmp_path_factory) -> tuple:
    frame = pd.DataFrame(callout_rows())
    path = tmp_path_factory.mktemp("callouts") / "sharpening.csv"
    frame.to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior()), frame


@pytest.mark.parametrize("question, measure, pick", [
    ("Which van did the most expensive call-out?", "fee", "idxmax"),
    ("Which van made the cheapest callout?", "fee", "idxmin"),
    ("Which van drove the longest callout?", "dist_km", "idxmax"),
])
def test_a_superlative_row_is_one_row_not_a_group(callouts, question, measure, pick):
    table, frame = callouts
    # pandas: the van of the one call-out with the highest (lowest) measure
    expected = frame.loc[getattr(frame[measure], pick)(), "van"]
    # pandas: the van with the largest (smallest) total of the measure, which it must not be
    assert expected != getattr(frame.groupby("van")[measure].sum(), pick)()
    assert matches(table.ask(question).answer, [expected])


def test_the_most_rows_is_still_a_count(callouts):
    table, frame = callouts
    # pandas: the van with the most call-outs ("the most callouts" counts them, no adjective)
    expected = frame.van.value_counts().idxmax()
    assert matches(table.ask("Which van made the most callouts?").answer, [expected])
