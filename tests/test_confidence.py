"""An answer's probability is also its rank: on real questions the answer listed first shows
the highest probability, in the text, in --json and in the app; and the unsure flag says why."""

import asyncio
import itertools
import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

import tabq
from tabq import calibration, pipeline
from tabq.answers import matches
from tabq.output import as_json, format_result
from tabq.ui.app import TabqApp
from tabq.ui.widgets import AnswerList

ZEROSHOT = Path(__file__).resolve().parent.parent / "benchmarks" / "zeroshot"


@pytest.fixture(scope="module")
def results() -> list[pipeline.Result]:
    """Every zero-shot question, asked untaught as the benchmark asks it."""
    out = []
    for path in sorted(ZEROSHOT.glob("*.jsonl")):
        table = tabq.open(path.parent / "penguins.csv" if "penguins" in path.name
                          else path.parent / "ticket_sales.csv", model=tabq.Model.prior())
        for line in path.read_text(encoding="utf-8").splitlines():
            out.append(table.ask(json.loads(line)["question"]))
    return out


def _descending(values: list[float]) -> bool:
    return all(a >= b for a, b in itertools.pairwise(values))


def test_answers_are_listed_in_order_of_probability(results):
    several = [r for r in results if len(r.readings) > 1]
    assert len(several) >= 80              # the property is seen on many lists, not on one
    for result in results:
        probabilities = [r.probability for r in result.readings]
        assert _descending(probabilities), result.question
        assert abs(sum(probabilities) - 1) < 1e-9, result.question
        assert result.confidence == max(probabilities)


def test_answers_given_by_several_readings_still_rank_by_probability(results):
    """The case that once went wrong: an answer lower down backed by many readings."""
    backed = 0
    for result in results:
        counts = {}
        for c in result.candidates:
            counts[pipeline.answer_key(c)] = counts.get(pipeline.answer_key(c), 0) + 1
        backed += any(counts[pipeline.answer_key(r)] > 1 for r in result.readings[1:])
    assert backed >= 20


def test_json_and_text_show_the_same_order(results):
    for result in results:
        shown = as_json(result, 5)
        listed = [a["probability"] for a in shown["answers"]]
        assert _descending(listed) and shown["confidence"] == listed[0], result.question
        assert shown["unsure"] == (shown["unsure_reason"] is not None)
        text = format_result(result, 5)
        top = int(re.search(r"Sureness: (\d+)%", text).group(1))
        others = [int(p) for p in re.findall(r"\((\d+)%\) — ", text)]
        assert _descending([top] + others), text


def test_the_unsure_flag_says_why(results):
    flagged = [r for r in results if r.unsure]
    assert flagged and len(flagged) < len(results)
    for result in results:
        text = format_result(result)
        if result.unsure:
            assert f"unsure: {result.unsure_reason}." in text
        else:
            assert result.unsure_reason is None and "unsure" not in text
            assert result.confidence >= calibration.SURE_AT


def test_a_search_cut_short_is_unsure_whatever_its_probability(results):
    result = next(r for r in results if not r.unsure)
    result.complete = False
    try:
        assert result.unsure and "time limit" in result.unsure_reason
    finally:
        result.complete = True


def test_many_agreeing_readings_never_outshow_a_better_ranked_answer():
    """However the readings of each answer are spread, the answer ranked first shows the
    highest probability (the listing sorts by `answer_score`, the softmax is over the same)."""
    groups = ([3.0], [2.9, 2.9, 2.9, 2.9, 2.9, 2.9], [1.0, 1.0], [-5.0] * 40)
    scored = sorted(((pipeline.answer_score(g), g) for g in groups), reverse=True)
    probabilities = pipeline.probabilities([s for s, _ in scored])
    assert _descending(probabilities) and probabilities[0] > probabilities[1]


def test_the_app_lists_answers_in_order_of_probability(penguins_csv, tmp_path):
    async def run():
        app = TabqApp(penguins_csv, tmp_path / "m")
        async with app.run_test(size=(100, 32)) as pilot:
            for _ in range(1200):
                if app.session is not None and app.loaded.is_set():
                    break
                await pilot.pause(0.05)
            question = app.query_one("#question")
            question.focus()
            await pilot.press(*"which island has the most penguins")
            await pilot.press("enter")
            for _ in range(1200):
                if app.result is not None:
                    break
                await pilot.pause(0.05)
            listed = app.query_one(AnswerList)
            shown = [int(p) for i in range(listed.option_count)
                     for p in re.findall(r"(\d+)%", str(listed.get_option_at_index(i).prompt))]
            assert len(shown) > 1 and _descending(shown)
    asyncio.run(run())


def test_eval_reports_accuracy_among_sure_answers_and_predictions_say_how_sure(tmp_path):
    """Questions on the zero-shot penguins: the predictions carry each answer's confidence and
    flag, and the report's two figures are counted from them."""
    lines = (ZEROSHOT / "penguins.jsonl").read_text(encoding="utf-8").splitlines()[:12]
    examples = tmp_path / "set.jsonl"
    examples.write_text("\n".join(json.dumps({**json.loads(line), "table": str(
        ZEROSHOT / "penguins.csv")}) for line in lines) + "\n", encoding="utf-8")
    out = tmp_path / "predictions.jsonl"
    run = subprocess.run([sys.executable, "-m", "tabq", "eval", str(examples), "--predictions",
                          str(out), "--json", "--workers", "1"], capture_output=True, text=True,
                         check=False)
    assert run.returncode == 0, run.stderr
    report = json.loads(run.stdout)
    predictions = [json.loads(line) for line in out.read_text(encoding="utf-8").splitlines()]
    assert len(predictions) == 12
    for p in predictions:
        assert 0 < p["confidence"] <= 1 and p["unsure"] == (p["unsure_reason"] is not None)
    gold = {json.loads(line)["id"]: json.loads(line)["answer"] for line in lines}
    sure = [p for p in predictions if not p["unsure"]]
    assert sure, "some of these plain questions are answered surely"
    right = sum(matches(p["answer"], gold[p["id"]]) for p in sure)
    assert report["sure_accuracy"] == round(right / len(sure), 4)
    assert report["flagged"] == round(1 - len(sure) / 12, 4)
    text = subprocess.run([sys.executable, "-m", "tabq", "eval", str(examples), "--workers", "1"],
                          capture_output=True, text=True, check=False).stdout
    assert "right among answers not flagged unsure: " in text and "flagged unsure " in text
