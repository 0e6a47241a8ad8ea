"""Hostile and random input: questions and small tables drawn by hypothesis.

Whatever is asked of whatever table, tabq raises nothing but its own errors, and every candidate
it executed is SQL that sqlglot parses again and DuckDB runs. Kept small (few examples, no
deadline) so the whole file runs in well under a minute.
"""

import csv
import string
from pathlib import Path

import pytest
import sqlglot
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import tabq
from tabq.errors import TabqError

SAMPLE = Path(__file__).parent.parent / "sample_tables" / "repair_jobs.csv"
FUZZ = settings(max_examples=25, deadline=None, derandomize=True,
                suppress_health_check=[HealthCheck.function_scoped_fixture,
                                       HealthCheck.too_slow])

_demo = None


def demo() -> tabq.OpenTable:
    global _demo
    if _demo is None:
        _demo = tabq.open(SAMPLE)
    return _demo


SQLISH = st.sampled_from([
    "'; DROP TABLE t; --", "\") ; COPY (SELECT 1) TO 'pwned.csv' ; --", "read_csv('/etc/passwd')",
    "ATTACH 'x.db'", "SET enable_external_access = true", "1 OR 1=1", "\\", "`", "$$", "/*",
])
WORDS = st.sampled_from(["how many", "jobs", "cancelled", "average", "price", "most", "mechanic",
                         "after", "2025", "not", "total", "which", "first", "more than", "40"])
QUESTIONS = st.one_of(
    st.text(max_size=200),
    st.lists(st.one_of(WORDS, SQLISH, st.text(max_size=8)), max_size=25).map(" ".join),
    st.text(alphabet=st.characters(codec="utf-8"), min_size=2000, max_size=3000),
    st.text(alphabet=st.characters(max_codepoint=31), max_size=50),
)


def check_result(table: tabq.OpenTable, result) -> None:
    for reading in result.candidates:
        sqlglot.parse_one(reading.sql, read="duckdb")   # re-parses
        table.table.con.execute(reading.sql).fetchmany(1)   # and runs on the locked connection


@pytest.mark.long   # 25 drawn questions, some of 2000-3000 characters: about 10 s
@FUZZ
@given(QUESTIONS)
def test_any_question_gets_an_answer_or_a_tabq_error(question):
    table = demo()
    try:
        result = table.ask(question)
    except TabqError:
        return
    check_result(table, result)


HEADERS = st.one_of(st.text(max_size=12), st.sampled_from(
    ["", " ", "select", "order", "__row", "rowid", "a\"b", "x;y", "Total", "ünïcødé", "1st"]))
CELLS = st.one_of(st.none(), st.integers(-10**6, 10**6).map(str), st.floats(allow_nan=True).map(str),
                  st.text(alphabet=string.printable, max_size=10),
                  st.sampled_from(["", "NA", "—", "2025-03-01", "7,169", "yes", "no", "Total"]))


@FUZZ
@given(headers=st.lists(HEADERS, min_size=1, max_size=5),
       rows=st.lists(st.lists(CELLS, max_size=6), max_size=12),
       question=st.one_of(WORDS, st.lists(WORDS, max_size=6).map(" ".join), st.text(max_size=30)))
def test_any_small_table_loads_or_fails_cleanly(tmp_path_factory, headers, rows, question):
    path = tmp_path_factory.mktemp("fuzz") / "table.csv"
    with path.open("w", newline="", encoding="utf-8") as f:
        csv.writer(f).writerows([headers] + [["" if c is None else c for c in r] for r in rows])
    before = path.read_bytes()
    try:
        table = tabq.open(path)
        result = table.ask(question)
    except TabqError:
        pass
    else:
        check_result(table, result)
    assert path.read_bytes() == before
    assert sorted(p.name for p in path.parent.iterdir()) == ["table.csv"]
