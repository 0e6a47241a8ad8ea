"""Issue 15, "never answer from a misread table": tabq's answers from messy files.

The corpus is benchmarks/messy/corpus.py: invented scenarios (a bakery chain's invoices, a
clinic group's appointments, a freight depot's shipments, a tea wholesaler's, a patisserie
supplier's and a plant nursery's orders, a farm shop's till sales) with rows from
random.Random(seed); no outside tool's test corpus is copied. Each expected answer is computed
from the rows before any file is written.

Outside sources, used as a second computation and as writers, never as the expected answer:
- pandas (pandas.read_csv with sep/decimal/thousands/skiprows/skipfooter/na_values/encoding/
  converters/compression, pandas.read_excel, pandas.json_normalize, pandas.read_feather) reads
  every file back: test_pandas_second_computation checks it gives the precomputed answers, which
  shows the file holds the rows;
- openpyxl writes the workbook, pyarrow.feather the Feather file, the duckdb module the DuckDB
  database, Python's codecs the cp1251, cp1252 and UTF-16 text, gzip the .csv.gz.

test_tabq_answers asks each question through the command line's entry, `tabq.cli.main`, with
the arguments, environment and working directory benchmarks/messy_files.py gives the command
(`ask TABLE QUESTION --json`, the untaught model), and compares the top answer with the expected
one. It runs in this process: starting Python and importing tabq for each of the 132 questions
took about half the file's time, and the command as a process is tests/test_cli.py's subject;
the benchmark still runs it as one.
"""

from __future__ import annotations

import contextlib
import datetime
import io
import re
import subprocess
import sys
from pathlib import Path

import pytest

from tabq.cli import main

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "benchmarks"))

import messy_files  # noqa: E402
from messy.corpus import (CASES, CLINIC, Case, Question, Target,  # noqa: E402
                          answer_from_frame, same_answer)


def _pair_id(pair: tuple[Case, Question]) -> str:
    case, question = pair
    words = re.sub(r"\W+", "_", question.text).strip("_")
    return f"{case.name}:{words}"


def _param(case: Case, question: Question) -> object:
    """A clean control's questions are long tests (pytest --long, as CI runs them): they tell
    a messy case's failure from a failure of the wording, and need not run on every change."""
    marks = [pytest.mark.long] if case.name.endswith("_clean") else []
    return pytest.param((case, question), marks=marks, id=_pair_id((case, question)))


PAIRS = [_param(case, question) for case in CASES for question in case.questions]


def _runnable(case: Case) -> None:
    """Only formats no installed library can write are skipped (zstandard, odf, xlwt)."""
    why = case.missing()
    if why:
        pytest.skip(f"{case.name}: {why}")


@pytest.fixture(scope="module")
def model(tmp_path_factory) -> Path:
    """A model folder that does not exist yet: tabq asks with the untaught prior."""
    return tmp_path_factory.mktemp("messy-model") / "model"


@pytest.fixture()
def in_process(monkeypatch: pytest.MonkeyPatch) -> None:
    """messy_files.ask_cli, as `tabq.cli.main` in this process: TABQ_MODEL, the working
    directory and standard input as the subprocess would have them, and its exit code and
    output bytes in the CompletedProcess the benchmark reads. There is no process to stop at
    the benchmark's timeout: a hang would stop the suite instead of failing one question."""
    def ask_cli(target: Target, question: str, model: Path, cwd: Path,
                timeout: float | None = None) -> subprocess.CompletedProcess:
        argv = ["ask", target.arg, question, "--json"]
        out, err = io.StringIO(), io.StringIO()
        with monkeypatch.context() as m, contextlib.ExitStack() as stack:
            m.setenv("TABQ_MODEL", str(model))
            m.chdir(cwd)
            if target.stdin:
                raw = stack.enter_context(target.stdin.open("rb"))
                m.setattr(sys, "stdin", io.TextIOWrapper(raw, encoding="utf-8"))
            with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
                code = main(argv)
        return subprocess.CompletedProcess(argv, code, out.getvalue().encode("utf-8"),
                                           err.getvalue().encode("utf-8"))
    monkeypatch.setattr(messy_files, "ask_cli", ask_cli)


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_pandas_second_computation(case: Case, tmp_path: Path) -> None:
    """pandas, second computation: pandas reading the written file gives the answers computed
    from the rows; so the file holds the rows and a wrong tabq answer is a misreading."""
    _runnable(case)
    case.write(tmp_path)
    frame = case.second(tmp_path)
    for question in case.questions:
        got = answer_from_frame(question, frame)
        assert same_answer(got, question.expected), (question.text, got, question.expected)


@pytest.mark.parametrize("pair", PAIRS)
def test_tabq_answers(pair: tuple[Case, Question], tmp_path: Path, model: Path,
                      in_process: None) -> None:
    case, question = pair
    _runnable(case)
    target = case.write(tmp_path)
    outcome = messy_files.ask_question(case, question, tmp_path, target, model)
    assert outcome.right, (f"{case.difficulty}: {question.text!r} wanted {question.expected}, "
                           f"got {outcome.got} {outcome.problem}")
    mismatch = messy_files.note_mismatch(case, outcome.payload)
    assert mismatch is None, mismatch


def test_every_question_has_a_clean_control() -> None:
    """A messy case asks only what its scenario's clean CSV is asked too, so that its failure
    is about reading the file, not about the wording."""
    controls = {c.scenario: c for c in CASES if c.name.endswith("_clean")}
    for case in CASES:
        asked = {q.text for q in controls[case.scenario].questions}
        assert {q.text for q in case.questions} <= asked, case.name


def test_the_date_cases_tell_day_from_month() -> None:
    """Some days are above 12 (so the order is provable) and reading the dates the other way
    round would change the month counts: the date cases catch a swapped reading."""
    dates = [r["appointment_date"] for r in CLINIC]
    assert any(d.day > 12 for d in dates) and any(d.day <= 12 for d in dates)
    swapped = [datetime.date(d.year, d.day, d.month) for d in dates if d.day <= 12]
    for month in (3, 4):
        right = sum(d.month == month for d in dates)
        assert sum(d.month == month for d in swapped) != right
