"""The earliest or latest date of some rows ("when did we last …", "the most recent …"), on a
table not sorted by date, so that the first or last row is not the answer. Answers computed by
pandas (a second computation) over an invented caterer's bookings."""

import datetime
import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches

CLIENTS = ["Harbour Lights", "Oakfield School", "Pennine Rotary", "Mill Street Surgery"]


@pytest.fixture(scope="module")
def bookings(tmp_path_factory):
    rng = random.Random(11)
    start = datetime.date(2025, 1, 1)
    frame = pd.DataFrame([{
        "booking_ref": f"B{200 + i}", "client": rng.choice(CLIENTS),
        "occasion": rng.choice(["lunch", "dinner", "wake", "wedding"]),
        "booked_for": (start + datetime.timedelta(days=rng.randint(0, 360))).isoformat(),
        "courses": rng.randint(1, 4), "covers": rng.randint(10, 200)} for i in range(80)])
    frame = frame.sample(frac=1, random_state=3).reset_index(drop=True)   # not in date order
    path = tmp_path_factory.mktemp("bookings") / "bookings.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


def _latest(frame, column, value):
    return frame[frame[column] == value].booked_for.max()


def _earliest(frame, column, value):
    return frame[frame[column] == value].booked_for.min()


@pytest.mark.parametrize("question, expected", [
    ("When did we last cater for Oakfield School?",
     lambda d: _latest(d, "client", "Oakfield School")),
    # "first" is also the number 1, a value of courses: read as the operation, not a filter
    ("When did we first cater for Pennine Rotary?",
     lambda d: _earliest(d, "client", "Pennine Rotary")),
    ("What was the date of the most recent wake?", lambda d: _latest(d, "occasion", "wake")),
    ("When was the latest wedding?", lambda d: _latest(d, "occasion", "wedding")),
    ("What is the earliest booking date?", lambda d: d.booked_for.min()),
])
def test_earliest_or_latest_date(bookings, question, expected):
    frame, table = bookings
    result = table.ask(question)
    assert matches(result.answer, [expected(frame)]), (question, result.answer, result.sql)


def test_the_table_is_not_in_date_order(bookings):
    """Else the first or last row would give the same answers and the test would prove less."""
    frame, _ = bookings
    oakfield = frame[frame.client == "Oakfield School"]
    assert oakfield.booked_for.iloc[-1] != oakfield.booked_for.max()
    rotary = frame[frame.client == "Pennine Rotary"]
    assert rotary.booked_for.iloc[0] != rotary.booked_for.min()

