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
