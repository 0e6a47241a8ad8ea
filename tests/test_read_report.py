"""Issue 15, "never answer from a misread table": what was read is shown with every answer
(text, JSON, the app), and a table with a huge header or cell cannot hold a question past its
deadline."""

import dataclasses
import json
import subprocess
import sys
import types

import duckdb
import pytest

import tabq
from tabq import analyse as analysing
from tabq import execute
from tabq.errors import QueryError
from tabq.model import Model
from tabq.output import READ_WIDTH, as_json, format_result, read_line
from tabq.table import ColumnRead, ReadReport

HUGE = 3_000_000          # characters: a whole report pasted into one cell


def _huge_text() -> str:
    words = ("remark", "north", "quarter", "status", "alpha", "gamma")
    return " ".join(words[i % len(words)] for i in range(HUGE // 5))[:HUGE]


def _parquet(path, select: str, *params) -> tabq.OpenTable:
    """A generated table, written by DuckDB: Parquet keeps a huge header or cell as it is."""
    with duckdb.connect() as con:
        con.execute(f"COPY ({select}) TO '{path}' (FORMAT parquet)", list(params))
    return tabq.open(path, model=Model.prior())


@pytest.fixture(scope="module")
def huge_header(tmp_path_factory):
    name = _huge_text().replace('"', "")
    return _parquet(tmp_path_factory.mktemp("huge") / "huge_header.parquet",
                    f"SELECT 's' || (i % 3) AS site, i AS \"{name}\", i * 1.5 AS price "
                    "FROM range(30) t(i)")


@pytest.fixture(scope="module")
def huge_cell(tmp_path_factory):
    return _parquet(tmp_path_factory.mktemp("huge") / "huge_cell.parquet",
                    "SELECT 's' || (i % 3) AS site, CASE WHEN i = 0 THEN ? ELSE 'n' || i END "
                    "AS note, i * 1.5 AS price FROM range(30) t(i)", _huge_text())


def _longest_text_matched(monkeypatch) -> list[int]:
    """Record the length of every text the analysis splits into words or normalises."""
    seen = [0]
    for name in ("split_words", "normalise"):
        real = getattr(analysing, name)

        def spy(text, *args, _real=real, **kwargs):
            seen[0] = max(seen[0], len(text))
            return _real(text, *args, **kwargs)
        monkeypatch.setattr(analysing, name, spy)
    return seen


def _messy_report() -> ReadReport:
    """What the loaders will say of a messy export (until they do, made here)."""
    report = ReadReport(format="csv", encoding="cp1252", delimiter=";", decimal_mark=",",
                        header_line=4, guesses=["decimal comma"],
                        columns=[ColumnRead("price", "price", "number", 0.9, "decimal comma")])
    report.skip("preamble", [1, 2, 3])
    return report


@pytest.fixture(scope="module")
def cancelled(demo_csv):
    return tabq.open(demo_csv, model=Model.prior()).ask("how many jobs were cancelled")


def _with_report(result, report):
    table = dataclasses.replace(result.table, report=report)
    return dataclasses.replace(result, table=table)


# ── what was read, shown with the answer ──────────────────────────────────────────────────────
def test_the_notes_are_one_line_under_the_answer(cancelled):
    lines = format_result(_with_report(cancelled, _messy_report())).splitlines()
    assert lines[0] == "Answer:   10"
    assert lines[1] == "Read:     3 preamble rows left out (lines 1, 2, 3); decimal comma"
    assert lines[2].startswith("Reading:") and any(ln.startswith("SQL:") for ln in lines)
    assert any(ln.startswith("Sureness:") for ln in lines)


def test_nothing_left_out_or_guessed_adds_no_line(cancelled):
    plain = ReadReport(format="csv", columns=[ColumnRead("site", "site", "text")])
    assert read_line(plain) is None and read_line(None) is None
    assert "Read:" not in format_result(_with_report(cancelled, plain))


def test_many_notes_are_cut_to_one_line_that_points_to_the_json():
    report = _messy_report()
    report.guesses += [f"column {i} read as dates, day first" for i in range(10)]
    line = read_line(report)
    assert len(line) <= READ_WIDTH and line.endswith("… (see --json)")
    assert line.startswith("Read:     3 preamble rows left out (lines 1, 2, 3); decimal comma;")


def test_the_json_carries_the_whole_report(cancelled):
    read = json.loads(json.dumps(as_json(_with_report(cancelled, _messy_report()), 1)))["read"]
    assert read == {
        "format": "csv", "rows": 240, "columns": 11, "header_line": 4, "encoding": "cp1252",
        "delimiter": ";", "decimal_mark": ",", "sources": [],
        "skipped": [{"why": "preamble", "rows": 3, "lines": [1, 2, 3]}],
        "columns_read": [{"header": "price", "name": "price", "kind": "number", "parsed": 0.9,
                          "how": "decimal comma"}],
        "guesses": ["decimal comma"],
        "notes": ["3 preamble rows left out (lines 1, 2, 3)", "decimal comma"]}
    assert as_json(dataclasses.replace(cancelled, table=None), 1)["read"] is None


def test_a_real_csv_through_tabq_ask(tmp_path):
    path = tmp_path / "payments.csv"
    amounts = ["100000.01", "200000.02", "203042.03"]    # DuckDB sums them to 503042.05999999994
    path.write_text("payee,amount\n" + "".join(f"p{i},{a}\n" for i, a in enumerate(amounts)))
    ask = [sys.executable, "-m", "tabq", "ask", str(path), "what is the total amount"]
    text = subprocess.run(ask, capture_output=True, text=True, timeout=120)
    assert text.returncode == 0, text.stderr
    assert "Answer:   503042.06\n" in text.stdout
    data = json.loads(subprocess.run(ask + ["--json"], capture_output=True, text=True,
                                     timeout=120).stdout)
    assert data["answers"][0]["answer"] == [503042.06]
    read = data["read"]
    assert (read["format"], read["rows"], read["columns"]) == ("csv", 3, 2)
    assert [c["header"] for c in read["columns_read"]] == ["payee", "amount"]
    assert isinstance(read["notes"], list)


# ── a huge header or cell: the analysis looks at a bounded part of it ─────────────────────────
def test_a_huge_header_is_cut_for_matching(huge_header, monkeypatch):
    seen = _longest_text_matched(monkeypatch)
    assert max(len(col.header) for col in huge_header.table.columns) > HUGE // 2
    result = huge_header.ask("what is the total price for site s1")
    assert result.answer == [sum(i * 1.5 for i in range(30) if i % 3 == 1)]
    assert seen[0] <= analysing.MAX_HEADER
    # the reading names the column by a cut header, not by three megabytes of it
    assert all(len(r.paraphrase) < 1000 for r in result.candidates)


def test_a_huge_cell_is_cut_for_matching(huge_cell, monkeypatch):
    huge_cell.table.cache.pop("value_index", None)     # built again, under the spy
    seen = _longest_text_matched(monkeypatch)
    result = huge_cell.ask("how many rows have site s2")
    assert result.answer == [10]
    assert max(len(str(v)) for col in huge_cell.table.columns for v in col.values) > HUGE // 2
    assert seen[0] <= analysing.MAX_CELL


# ── the deadline covers the whole question ────────────────────────────────────────────────────
class Clock:
    """A clock that moves one second each time it is read, from the real time: a deadline of
    `n` seconds passes after `n` readings, whatever the machine's speed."""

    def __init__(self, start: float) -> None:
        self.now, self.reads = start, 0

    def monotonic(self) -> float:
        self.reads += 1
        self.now += 1.0
        return self.now


def test_the_analysis_checks_the_deadline(huge_header, monkeypatch):
    clock = Clock(0.0)
    monkeypatch.setattr(analysing, "time", clock)
    monkeypatch.setattr("tabq.pipeline.time", clock)
    with pytest.raises(QueryError) as caught:
        huge_header.ask("what is the total price for site s1", seconds=3)
    message = str(caught.value)
    assert "3 s limit" in message and "\n" not in message
    assert clock.reads <= 4            # it stopped at the first check past the deadline


def test_past_the_deadline_the_readings_checked_so_far_are_flagged(demo_csv, monkeypatch):
    table = tabq.open(demo_csv, model=Model.prior())
    real = execute.time.monotonic
    reads = [0]

    def late() -> float:             # the first batch of queries runs, then time is up
        reads[0] += 1
        return real() if reads[0] <= 2 else real() + 1e6
    monkeypatch.setattr(execute, "time", types.SimpleNamespace(monotonic=late))
    result = table.ask("how many jobs were cancelled")
    assert not result.complete and result.unsure
    assert result.candidates and any("limit" in note for note in result.notes)


def test_past_the_deadline_before_any_query_is_one_clean_error(demo_csv, monkeypatch):
    table = tabq.open(demo_csv, model=Model.prior())
    monkeypatch.setattr(execute, "time", types.SimpleNamespace(monotonic=lambda: 1e12))
    with pytest.raises(QueryError, match="before any reading was checked"):
        table.ask("how many jobs were cancelled")
