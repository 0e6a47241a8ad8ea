"""How a result is shown: the text of `tabq ask` and `tabq demo`, and the JSON of `--json`."""

import dataclasses
import json

import pytest

import tabq
from tabq.api import Result
from tabq.model import Model
from tabq.output import as_json, format_answer, format_result


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
