"""Golden files: question → expected logical form, read by one loader."""

from pathlib import Path

import pytest

import tabq
from tabq.logic import from_text

GOLDEN = Path(__file__).parent / "fixtures" / "golden"


def load_pairs(name: str) -> list[tuple[str, str]]:
    pairs = []
    for line in (GOLDEN / name).read_text(encoding="utf-8").splitlines():
        if line.strip() and not line.startswith("#"):
            question, form = line.rsplit(" ; ", 1)
            pairs.append((question.strip(), form.strip()))
    return pairs


@pytest.fixture(scope="module")
def demo(demo_csv):
    return tabq.open(demo_csv)


@pytest.mark.parametrize("question,expected", load_pairs("demo_forms.txt"))
def test_demo_question_reads_as_expected(demo, question, expected):
    assert demo.ask(question).best.form == from_text(expected)
