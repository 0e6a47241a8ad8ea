"""One default model for `tabq.open`, `tabq ask` and `tabq teach`: the folder $TABQ_MODEL names,
else the per-user one. The demo and `tabq eval` ask with the untaught model whatever was taught."""

import json
import os
import subprocess
import sys
from pathlib import Path

import platformdirs
import pytest

import tabq
from tabq import demo
from tabq.store import MODEL_ENV, default_folder

QUESTION = "how many no-shows were there"      # untaught, read as "the number of rows": 240
TAUGHT = [10]
UNTAUGHT = [240]


def tabq_cli(*args, env: dict) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "tabq", *map(str, args)], capture_output=True,
                          text=True, timeout=300, env=env)


@pytest.fixture(scope="module")
def taught(tmp_path_factory, demo_csv) -> dict:
    """An environment whose $TABQ_MODEL folder `tabq teach`, without --model, has taught."""
    root = tmp_path_factory.mktemp("default-model")
    env = {**os.environ, MODEL_ENV: str(root / "team-model"), "XDG_DATA_HOME": str(root / "xdg")}
    confirmed = root / "confirmed.jsonl"
    confirmed.write_text(json.dumps({"question": QUESTION, "answer": TAUGHT}) + "\n")
    out = tabq_cli("teach", demo_csv, confirmed, env=env)
    assert out.returncode == 0, out.stderr
    return env


def test_default_folder_is_tabq_model_else_the_per_user_folder(monkeypatch, tmp_path):
    per_user = Path(platformdirs.user_data_dir("tabq", appauthor=False)) / "model"
    monkeypatch.setenv(MODEL_ENV, str(tmp_path / "team"))
    assert default_folder() == tmp_path / "team"
    monkeypatch.setenv(MODEL_ENV, "~/team")
    assert default_folder() == Path.home() / "team"
    monkeypatch.setenv(MODEL_ENV, "")
    assert default_folder() == per_user
    monkeypatch.delenv(MODEL_ENV)
    assert default_folder() == per_user


def test_teach_without_model_teaches_the_tabq_model_folder(taught):
    assert (Path(taught[MODEL_ENV]) / "weights.json").is_file()
    assert not Path(taught["XDG_DATA_HOME"]).exists()       # the per-user folder is untouched


def test_open_and_ask_answer_with_the_taught_default(taught, demo_csv, monkeypatch):
    asked = tabq_cli("ask", demo_csv, QUESTION, "--json", env=taught)
    assert asked.returncode == 0, asked.stderr
    best = json.loads(asked.stdout)["answers"][0]
    monkeypatch.setenv(MODEL_ENV, taught[MODEL_ENV])
    opened = tabq.open(demo_csv).ask(QUESTION)
    assert best["answer"] == opened.answer == TAUGHT
    assert best["sql"] == opened.sql


def test_the_untaught_model_on_request(taught, demo_csv, monkeypatch):
    monkeypatch.setenv(MODEL_ENV, taught[MODEL_ENV])
    assert tabq.open(demo_csv, model=tabq.Model.prior()).ask(QUESTION).answer == UNTAUGHT


def test_demo_asks_with_the_untaught_model(taught, monkeypatch):
    monkeypatch.setenv(MODEL_ENV, taught[MODEL_ENV])
    monkeypatch.setattr(demo, "demo_questions", lambda: [QUESTION])
    said: list[str] = []
    demo.run_demo(said.append)
    assert "untaught model" in said[0]
    assert f"\nAnswer:   {UNTAUGHT[0]}\n" in "\n".join(said)


def test_eval_without_model_measures_the_untaught_model(taught, demo_csv, tmp_path):
    examples = tmp_path / "test.jsonl"
    examples.write_text(json.dumps({"id": "1", "question": QUESTION, "table": str(demo_csv),
                                    "answer": TAUGHT}) + "\n")
    untaught = tabq_cli("eval", examples, "--json", env=taught)
    with_model = tabq_cli("eval", examples, "--json", "--model", taught[MODEL_ENV], env=taught)
    assert untaught.returncode == with_model.returncode == 0, untaught.stderr + with_model.stderr
    assert json.loads(untaught.stdout)["accuracy"] == 0.0
    assert json.loads(with_model.stdout)["accuracy"] == 1.0


def test_a_tabq_model_that_is_a_file_is_one_line_and_exit_1(demo_csv, tmp_path):
    (tmp_path / "not-a-folder").write_text("x")
    env = {**os.environ, MODEL_ENV: str(tmp_path / "not-a-folder")}
    out = tabq_cli("ask", demo_csv, QUESTION, env=env)
    assert out.returncode == 1
    assert out.stderr.startswith("tabq: ") and "not-a-folder" in out.stderr
    assert len(out.stderr.strip().splitlines()) == 1
