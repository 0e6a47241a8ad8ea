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
from tabq import logic as L
from tabq.answers import matches
from tabq.output import as_json, format_result
from tabq.ui.app import TabqApp
from tabq.ui.widgets import AnswerList

ZEROSHOT = Path(__file__).resolve().parent.parent / "benchmarks" / "zeroshot"


@pytest.fixture(scope="module")
def results() -> list[pipeline.Result]:
    """Every zero-shot question, asked untaught as the benchmark asks it: 100 questions, 25 s in
    one run on a 2-core machine, so the tests over them are long ones."""
    out = []
    for path in sorted(ZEROSHOT.glob("*.jsonl")):
        table = tabq.open(path.parent / "penguins.csv" if "penguins" in path.name
                          else path.parent / "ticket_sales.csv", model=tabq.Model.prior())
        for line in path.read_text(encoding="utf-8").splitlines():
            out.append(table.ask(json.loads(line)["question"]))
    return out


def _descending(values: list[float]) -> bool:
    return all(a >= b for a, b in itertools.pairwise(values))


@pytest.mark.long
def test_answers_are_listed_in_order_of_probability(results):
    several = [r for r in results if len(r.readings) > 1]
    assert len(several) >= 80              # the property is seen on many lists, not on one
    for result in results:
        probabilities = [r.probability for r in result.readings]
        assert _descending(probabilities), result.question
        assert abs(sum(probabilities) - 1) < 1e-9, result.question
        assert result.confidence == max(probabilities)


@pytest.mark.long
def test_answers_given_by_several_readings_still_rank_by_probability(results):
    """The case that once went wrong: an answer lower down backed by many readings."""
    backed = 0
    for result in results:
        counts = {}
        for c in result.candidates:
            counts[pipeline.answer_key(c)] = counts.get(pipeline.answer_key(c), 0) + 1
        backed += any(counts[pipeline.answer_key(r)] > 1 for r in result.readings[1:])
    assert backed >= 20


@pytest.mark.long
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


@pytest.mark.long
def test_the_unsure_flag_says_why(results):
    flagged = [r for r in results if r.unsure]
    assert flagged and len(flagged) < len(results)
    for result in results:
        text = format_result(result)
        if result.unsure:
            assert f"unsure: {result.unsure_reason}." in text
        else:
            assert result.unsure_reason is None and "unsure" not in text
        if result.complete:
            assert result.unsure == (pipeline.sureness(result) < calibration.SURE_SCORE)


def test_a_search_cut_short_is_unsure_whatever_its_probability():
    result = _result([4.0, -3.0])         # far ahead of its runner-up: sure when complete
    assert not result.unsure
    result.complete = False
    assert result.unsure and "time limit" in result.unsure_reason


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
            question.insert_text_at_cursor("which island has the most penguins")   # pasted
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


# ── the unsure decision itself ──────────────────────────────────────────────────────────────
def _result(scores: list[float], unused_columns=()) -> pipeline.Result:
    """A result of one reading per answer with these scores, ranked and weighed as `ask` does."""
    readings = [pipeline.Reading(form=None, sql=f"q{i}", paraphrase="", answer=[i + 1], score=s,
                                 features={}, key=(i,)) for i, s in enumerate(scores)]
    readings[0].unused_columns = tuple(unused_columns)
    ranked = pipeline._distinct_answers(readings)
    return pipeline.Result("q", ranked, ranked)


def test_the_runner_ups_distance_is_the_score_difference_capped():
    assert pipeline.runner_up_gap(_result([2.0, 1.25, -1.0])) == pytest.approx(0.75)
    assert pipeline.runner_up_gap(_result([4.0, -3.0])) == calibration.GAP_CAP
    assert pipeline.runner_up_gap(_result([1.0])) == calibration.GAP_CAP


def test_sureness_weighs_the_distance_and_each_ignored_column_word():
    result = _result([2.0, 1.5], [("bills", "bill_length_mm"), ("deep", "bill_depth_mm")])
    assert pipeline.sureness(result) == pytest.approx(
        calibration.GAP_WEIGHT * 0.5 - 2 * calibration.COLUMN_WORD_WEIGHT)


def test_a_close_runner_up_is_flagged_and_says_both_probabilities():
    close = calibration.SURE_SCORE / calibration.GAP_WEIGHT / 2    # half the distance needed
    result = _result([1.0, 1.0 - close])
    p, q = (r.probability for r in result.readings)
    assert result.unsure_reason == f"the runner-up is close ({p:.0%} against {q:.0%})"
    far = _result([1.0, 1.0 - 2 * calibration.SURE_SCORE / calibration.GAP_WEIGHT])
    assert not far.unsure and far.unsure_reason is None


def test_an_ignored_column_word_can_flag_an_answer_a_distance_alone_would_not():
    """The same distance is sure without the ignored word and unsure with it; the reason names
    the word and the column it names."""
    gap = (calibration.SURE_SCORE + calibration.COLUMN_WORD_WEIGHT / 2) / calibration.GAP_WEIGHT
    assert not _result([1.0, 1.0 - gap]).unsure
    result = _result([1.0, 1.0 - gap], [("bills", "bill_length_mm")])
    assert result.unsure
    assert "its reading ignores 'bills', which names bill_length_mm" in result.unsure_reason


def test_the_reading_that_ignores_a_named_column_is_the_one_pandas_disagrees_with(penguins_csv):
    """'longest bills on average': pandas' answer is the species of the highest mean bill
    length. Of tabq's readings that pick a species by an average, the one averaging
    bill_length_mm leaves no column word unused and gives pandas' answer; those averaging
    another measure ignore 'bills', which names a bill column, and give another species."""
    import pandas as pd
    frame = pd.read_csv(penguins_csv)
    means = frame.groupby("species")[["bill_length_mm", "flipper_length_mm", "body_mass_g"]]
    want = means.mean()["bill_length_mm"].idxmax()
    table = tabq.open(penguins_csv, model=tabq.Model.prior())
    result = table.ask("Which species has the longest bills on average?")
    best_mean = [c for c in result.candidates if isinstance(c.form, L.GroupBest)
                 and c.form.key == "species" and c.form.fn == "avg"
                 and isinstance(c.form.rows, L.All) and c.form.direction == "max"]
    on_bills = [c for c in best_mean if c.form.measure == "bill_length_mm"]
    elsewhere = [c for c in best_mean if c.form.measure in ("flipper_length_mm", "body_mass_g")]
    assert len(on_bills) == 1 and elsewhere
    assert matches(on_bills[0].answer, [want]) and not on_bills[0].unused_columns
    for c in elsewhere:
        assert not matches(c.answer, [want])
        assert [w for w, _ in c.unused_columns] == ["bills"]
        assert c.unused_columns[0][1].startswith("bill_")


# ── what else lowers the sureness ───────────────────────────────────────────────────────────
HIVES = """hive,apiary,frames,honey_kg
Bramble,north,10,12.5
Clover,north,12,20.0
Heather,south,12,8.0
Linden,north,14,31.5
Sorrel,south,16,14.0
Teasel,north,8,5.5
Yarrow,south,12,18.0
"""


@pytest.fixture()
def hives(tmp_path):
    path = tmp_path / "hives.csv"
    path.write_text(HIVES, encoding="utf-8")
    return path


def test_a_word_naming_the_rows_is_no_ignored_column_word(hives):
    """"hives" names the hive column, whose values name every row: counting the north hives
    needs no hive value, so the word left unused says nothing against the answer. "frames"
    names a column of amounts, and a reading that leaves it unused still counts it."""
    import pandas as pd
    frame = pd.read_csv(hives)
    table = tabq.open(hives, model=tabq.Model.prior())
    result = table.ask("How many hives are in the north apiary?")
    assert matches(result.answer, [int((frame["apiary"] == "north").sum())])   # pandas
    analysis = table.analyse("How many hives are in the north apiary?")
    assert "hive" in pipeline.column_words(analysis).values()
    assert pipeline.names_rows(table.table, "hive")
    assert not pipeline.names_rows(table.table, "frames")
    assert not result.best.unused_columns
    counted = table.ask("How many north hives have 12 frames?")
    want = int(((frame["apiary"] == "north") & (frame["frames"] == 12)).sum())   # pandas
    ignoring = [c for c in counted.candidates if not matches(c.answer, [want])
                and "frames" in c.unused]
    assert ignoring and all(("frames", "frames") in c.unused_columns for c in ignoring)


def test_an_answer_of_zero_or_nothing_lowers_the_sureness_and_says_so():
    result = _result([2.0, 1.5])
    sure = pipeline.sureness(result)
    result.readings[0].answer = [0]
    assert pipeline.sureness(result) == pytest.approx(sure - calibration.NOTHING_WEIGHT)
    gap = (calibration.SURE_SCORE + calibration.NOTHING_WEIGHT / 2) / calibration.GAP_WEIGHT
    zero = _result([1.0, 1.0 - gap])
    assert not zero.unsure
    zero.readings[0].answer = [0]
    assert zero.unsure and "its answer is 0 or nothing" in zero.unsure_reason
    for nothing in ([], [None], [0.0]):
        zero.readings[0].answer = nothing
        assert pipeline.gives_nothing(zero.readings[0])
    for something in ([False], ["0"], [0, 1], [3]):
        zero.readings[0].answer = something
        assert not pipeline.gives_nothing(zero.readings[0])


def test_a_threshold_read_as_a_cell_value_is_a_doubt(hives):
    """"more than 12 frames": 12 is a value of frames, so one reading counts the hives with
    exactly 12; it carries the doubt, the reading that compares does not and gives pandas'
    answer, and a top answer with the doubt is less sure by VALUE_DOUBT_WEIGHT."""
    import pandas as pd
    frame = pd.read_csv(hives)
    table = tabq.open(hives, model=tabq.Model.prior())
    result = table.ask("How many hives have more than 12 frames?")
    equal = [c for c in result.candidates if isinstance(c.form, L.Aggregate)
             and isinstance(c.form.rows, L.Eq) and c.form.rows.col == "frames"]
    above = [c for c in result.candidates if isinstance(c.form, L.Aggregate)
             and isinstance(c.form.rows, L.Cmp) and c.form.rows.col == "frames"
             and c.form.rows.op == "gt"]
    assert equal and above
    assert all(pipeline.value_doubts(c) == ["num:threshold_as_value"] for c in equal)
    assert matches(equal[0].answer, [int((frame["frames"] == 12).sum())])   # pandas
    assert matches(above[0].answer, [int((frame["frames"] > 12).sum())])    # pandas
    assert not pipeline.value_doubts(above[0])
    doubted = _result([2.0, 1.5])
    sure = pipeline.sureness(doubted)
    doubted.readings[0].features = {"num:threshold_as_value": 1.0}
    assert pipeline.sureness(doubted) == pytest.approx(sure - calibration.VALUE_DOUBT_WEIGHT)


def test_a_column_no_word_names_is_a_guess_that_lowers_the_sureness(hives):
    """"How many hives have more than 12?" names no column: every reading picks one, and the
    one shown says so; a top answer with a guessed column is less sure by
    GUESSED_COLUMN_WEIGHT per column."""
    table = tabq.open(hives, model=tabq.Model.prior())
    result = table.ask("How many hives have more than 12?")
    assert pipeline.guessed_columns(result.best) >= 1
    named = table.ask("How many hives have more than 12 frames?")
    assert pipeline.guessed_columns(named.best) == 0
    guessed = _result([2.0, 1.5])
    sure = pipeline.sureness(guessed)
    guessed.readings[0].features = {pipeline.GUESSED_COLUMN: 2.0}
    assert pipeline.sureness(guessed) == pytest.approx(
        sure - 2 * calibration.GUESSED_COLUMN_WEIGHT)
    gap = (calibration.SURE_SCORE + calibration.GUESSED_COLUMN_WEIGHT / 2) / \
        calibration.GAP_WEIGHT
    close = _result([1.0, 1.0 - gap])
    assert not close.unsure
    close.readings[0].features = {pipeline.GUESSED_COLUMN: 1.0}
    assert close.unsure and "no word of the question names" in close.unsure_reason
