"""The command line: answers, JSON, and bad input as one line and an exit code."""

import hashlib
import json
import os
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


# ── a damaged model folder, a full device, strict JSON ────────────────────────────────────────
def _no_constant(name):
    raise ValueError(f"{name} is not JSON")


@pytest.mark.parametrize("value", ["NaN", "Infinity", "1e308"])
def test_a_weights_file_with_a_non_finite_weight_is_one_line_naming_it(demo_csv, tmp_path,
                                                                       value):
    (tmp_path / "weights.json").write_text(
        '{"format": "tabq-weights", "version": 1, "learned": {"cover": %s}}' % value)
    out = tabq("ask", demo_csv, "how many jobs", "--model", tmp_path, "--json")
    assert out.returncode == 1 and out.stdout == ""
    assert out.stderr.count("\n") == 1 and str(tmp_path / "weights.json") in out.stderr
    assert "internal error" not in out.stderr


def test_json_output_is_strict_json_whatever_the_numbers():
    from tabq.cli import _dump
    text = _dump({"answers": [{"answer": [1.5, float("inf"), [float("nan")]],
                               "score": float("-inf"), "probability": 0.25}]})
    data = json.loads(text, parse_constant=_no_constant)
    assert data["answers"][0] == {"answer": [1.5, None, [None]], "score": None,
                                  "probability": 0.25}


def test_a_full_device_on_standard_output_is_one_line(demo_csv):
    if not os.path.exists("/dev/full"):
        pytest.skip("needs /dev/full")
    with open("/dev/full", "w") as full:
        out = subprocess.run([sys.executable, "-m", "tabq", "ask", str(demo_csv),
                              "how many jobs were cancelled", "--json"], stdout=full,
                             stderr=subprocess.PIPE, text=True, timeout=120)
    assert out.returncode == 1
    assert out.stderr == "tabq: cannot write the output: no space left on device\n"


def test_a_dangling_link_in_the_model_folder_is_refused_and_nothing_made(demo_csv, tmp_path):
    model, outside = tmp_path / "m", tmp_path / "outside" / "log"
    model.mkdir()
    outside.parent.mkdir()
    (model / "log.jsonl").symlink_to(outside)
    examples = tmp_path / "confirmed.jsonl"
    examples.write_text('{"question": "how many jobs were cancelled", "answer": [10]}\n')
    out = tabq("teach", demo_csv, examples, "--model", model)
    assert out.returncode == 1 and out.stderr.count("\n") == 1, out.stderr
    assert "symbolic link" in out.stderr and "internal error" not in out.stderr
    assert list(outside.parent.iterdir()) == []


def test_a_log_line_missing_a_field_is_a_one_line_warning(tmp_path):
    (tmp_path / "log.jsonl").write_text(
        '{"kind": "log", "format": "tabq-log", "version": 2}\n'
        '{"kind": "confirmation", "id": "1", "answer": [1], "table": {"path": "t.csv"}}\n')
    out = tabq("lexicon", "show", "--model", tmp_path)
    assert out.returncode == 0, out.stderr
    assert out.stderr.startswith("tabq: warning: ") and out.stderr.count("\n") >= 1
    assert "the field 'question' is missing" in out.stderr and "internal" not in out.stderr
