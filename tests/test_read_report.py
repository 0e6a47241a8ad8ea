"""Issue 15, "never answer from a misread table": what was read is shown with every answer
(text, JSON, the app), and a table with a huge header or cell cannot hold a question past its
deadline."""

import types

import pytest

import tabq
from tabq import analyse as analysing
from tabq import execute
from tabq.errors import QueryError
from tabq.model import Model

HUGE = 3_000_000          # characters: a whole report pasted into one cell


def _huge_text() -> str:
    words = ("remark", "north", "quarter", "status", "alpha", "gamma")
    return " ".join(words[i % len(words)] for i in range(HUGE // 5))[:HUGE]


@pytest.fixture(scope="module")
def huge_header(tmp_path_factory):
    path = tmp_path_factory.mktemp("huge") / "huge_header.csv"
    rows = "".join(f"s{i % 3},{i},{i * 1.5}\n" for i in range(30))
    path.write_text(f"site,{_huge_text()},price\n" + rows)
    return tabq.open(path, model=Model.prior())


@pytest.fixture(scope="module")
def huge_cell(tmp_path_factory):
    path = tmp_path_factory.mktemp("huge") / "huge_cell.csv"
    rows = "".join(f"s{i % 3},n{i},{i * 1.5}\n" for i in range(30))
    path.write_text(f"site,note,price\ns0,{_huge_text()},1.5\n" + rows)
    return tabq.open(path, model=Model.prior())


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


# ── a huge header or cell: the analysis looks at a bounded part of it ─────────────────────────
def test_a_huge_header_is_cut_for_matching(huge_header, monkeypatch):
    seen = _longest_text_matched(monkeypatch)
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
