"""How a result is shown: the text of `tabq ask` and `tabq demo`, and the JSON of `--json`."""

import dataclasses
import json

import pytest

import tabq
from tabq.answers import clean
from tabq.api import Result
from tabq.model import Model
from tabq.output import as_json, format_answer, format_result
from tabq.ui.chart import bar_rows


@pytest.fixture(scope="module")
def per_site(demo_csv) -> Result:
    return tabq.open(demo_csv, model=Model.prior()).ask("number of jobs for each site")


def test_a_table_answer_is_pairs_in_text_and_lists_in_json(per_site):
    assert per_site.best.is_table
    assert " = " in format_answer(per_site.best)
    first = as_json(per_site, 1)["answers"][0]
    assert all(isinstance(row, list) for row in first["answer"])
    assert json.loads(json.dumps(first))["sql"] == per_site.sql


def test_a_failed_reading_shows_its_error(per_site):
    failed = dataclasses.replace(per_site.best, error="ran past its time limit")
    assert format_answer(failed) == "(no answer: ran past its time limit)"
    result = dataclasses.replace(per_site, readings=[failed])
    assert as_json(result, 3)["answers"][0]["error"] == "ran past its time limit"
    assert "error" not in as_json(per_site, 3)["answers"][0]


def test_long_answers_are_cut_and_counted(per_site):
    long = dataclasses.replace(per_site.best, answer=list(range(20)), is_table=False)
    assert format_answer(long, 6) == "0, 1, 2, 3, 4, 5 … and 14 more"


def test_no_reading_is_said_plainly():
    nothing = Result("how many", readings=[], candidates=[])
    assert format_result(nothing) == "No reading of this question fits the table."


# ── numbers without float noise ───────────────────────────────────────────────────────────────
@pytest.mark.parametrize("raw, shown", [
    (0.1 + 0.2, "0.3"),
    (503042.0600000001, "503042.06"),          # a sum of money as DuckDB adds it
    (503042.05999999994, "503042.06"),
    (1e20, "1e+20"),                           # no made-up digits past what a float holds
    (123456789012345.67, "123456789012345.67"),   # the cents of a large sum survive
    (-0.0, "0"),
    (1e-7, "1e-07"),                           # a tiny number is not rounded away
    (1.23456789e-12, "1.23456789e-12"),
    (42.0, "42"),                              # integers stored as floats
    (2.9999999999999996, "3"),
    (1 / 3, "0.3333333333"),
])
def test_numbers_are_shown_without_float_noise(per_site, raw, shown):
    value = clean(raw)
    assert str(value) == shown
    assert isinstance(value, int) == ("." not in shown and "e" not in shown)
    reading = dataclasses.replace(per_site.best, answer=[value], is_table=False)
    assert format_answer(reading) == shown
    result = dataclasses.replace(per_site, readings=[reading])
    assert json.dumps(as_json(result, 1)["answers"][0]["answer"]) == f"[{shown}]"


def test_a_group_value_in_the_app_is_the_answer_not_two_decimals():
    rows = bar_rows([("a", clean(0.0004)), ("b", clean(503042.0600000001)), ("c", 7)], 10)
    assert [value for _, _, value in rows] == ["0.0004", "503,042.06", "7"]
