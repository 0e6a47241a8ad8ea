"""docs/answers-out.md stays true: each `$ tabq ask … --format csv|ndjson` example on the demo
tables is asked again and must print what the page shows, and each answer is checked against
pandas computing the same question on the same file."""

import json
import re
import shlex
from pathlib import Path

import pandas as pd
import pytest

from tabq.cli import main

ROOT = Path(__file__).resolve().parent.parent
PAGE = ROOT / "docs" / "answers-out.md"


def examples() -> list[tuple[list[str], str]]:
    """(arguments, printed output) of the page's data-format examples."""
    blocks = re.findall(r"```\n\$ tabq (ask [^\n]*--format (?:csv|ndjson)[^\n]*)\n(.*?)```",
                        PAGE.read_text(encoding="utf-8"), flags=re.S)
    return [(shlex.split(command), printed) for command, printed in blocks]


def test_the_page_has_its_examples():
    assert len(examples()) >= 2


@pytest.mark.parametrize("args, printed", examples(), ids=lambda v: str(v)[:40])
def test_each_example_prints_what_the_page_shows(args, printed, capsys, monkeypatch):
    monkeypatch.chdir(ROOT)
    assert main(args) == 0
    assert capsys.readouterr().out == printed


def test_the_examples_agree_with_pandas():
    jobs = pd.read_csv(ROOT / "sample_tables" / "repair_jobs.csv")
    by_service = dict(zip(*[list(col) for col in zip(*[
        line.split(",") for line in examples()[0][1].splitlines()[1:]])]))
    expected = jobs["service"].value_counts()                          # source: pandas
    assert {k: int(v) for k, v in by_service.items()} == expected.to_dict()
    months = [json.loads(line) for line in examples()[1][1].splitlines()]
    per_month = pd.to_datetime(jobs["date_in"]).dt.strftime("%Y-%m").value_counts()
    assert {m["month"]: m["count"] for m in months} == per_month.to_dict()
