"""The command line: answers, JSON, and bad input as one line and an exit code."""

import hashlib
import json
import subprocess
import sys

import pytest


def tabq(*args, timeout=120):
    return subprocess.run([sys.executable, "-m", "tabq", *map(str, args)], capture_output=True,
                          text=True, timeout=timeout)


def test_ask_prints_answer_sql_and_reading(demo_csv):
    out = tabq("ask", demo_csv, "How many jobs were cancelled?")
    assert out.returncode == 0
    assert "Answer:   10" in out.stdout
    assert 'SELECT COUNT(*) FROM "t" WHERE "status" = \'Cancelled\'' in out.stdout
    assert "Reading:" in out.stdout


def test_ask_json_shape(demo_csv):
    out = tabq("ask", demo_csv, "How many jobs were cancelled?", "--json", "--top", "2")
    data = json.loads(out.stdout)
    assert data["question"] == "How many jobs were cancelled?"
    assert 1 <= len(data["answers"]) <= 2
    assert set(data["answers"][0]) >= {"answer", "sql", "paraphrase", "score"}


def _bad_files(tmp_path):
    (tmp_path / "empty.csv").write_bytes(b"")
    (tmp_path / "garbage.csv").write_bytes(bytes(range(256)) * 16)
    (tmp_path / "fake.sqlite").write_bytes(b"SQLite format 3\0 not really")
    return {"missing": tmp_path / "missing.csv", "empty": tmp_path / "empty.csv",
            "garbage": tmp_path / "garbage.csv", "fake": tmp_path / "fake.sqlite"}


@pytest.mark.parametrize("kind", ["missing", "empty", "garbage", "fake"])
def test_bad_files_get_one_line_and_exit_2(tmp_path, kind):
    out = tabq("ask", _bad_files(tmp_path)[kind], "how many rows")
    assert out.returncode == 2
    assert "Traceback" not in out.stderr + out.stdout
    assert len(out.stderr.strip().splitlines()) == 1


def test_empty_question_is_an_input_error(demo_csv):
    out = tabq("ask", demo_csv, "   ")
    assert out.returncode == 2 and "question" in out.stderr


@pytest.mark.parametrize("question", [
    "how many rows where a = '1'; DROP TABLE t; --",
    "\") ; COPY (SELECT 1) TO 'pwned.csv' ; --",
    "how many ☃ rows 𝔘𝔫𝔦𝔠𝔬𝔡𝔢 \x01 \\ \" ' `",
    "a" * 5000,
])
def test_hostile_questions_are_just_text(tmp_path, question):
    table = tmp_path / "ok.csv"
    table.write_text("a,b\n1,2\n3,4\n")
    before = hashlib.sha256(table.read_bytes()).hexdigest()
    out = subprocess.run([sys.executable, "-m", "tabq", "ask", str(table), question],
                         capture_output=True, text=True, timeout=120, cwd=tmp_path)
    assert out.returncode in (0, 2), out.stderr
    assert "Traceback" not in out.stderr + out.stdout
    assert hashlib.sha256(table.read_bytes()).hexdigest() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["ok.csv"]


def test_demo_runs(tmp_path):
    out = tabq("demo", timeout=300)
    assert out.returncode == 0
    assert out.stdout.count("Q: ") >= 8 and "SQL:" in out.stdout


def test_a_reader_that_leaves_early_is_not_an_error(demo_csv):
    # `tabq ask … --json | head -c 1`: the pipe closes before tabq has written everything
    proc = subprocess.Popen([sys.executable, "-m", "tabq", "ask", str(demo_csv),
                             "how many jobs were cancelled", "--json", "--top", "50"],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    proc.stdout.read(1)
    proc.stdout.close()
    err = proc.stderr.read().decode()
    assert proc.wait(timeout=120) == 0
    assert "error" not in err and "Traceback" not in err
