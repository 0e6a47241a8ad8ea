"""Real people's questions on real, messy tables: the WikiTableQuestions subset in
tests/fixtures/wtq (CC BY-SA 4.0, Pasupat & Liang 2015; see its README), answers only.

These check the untaught model from outside the project: gold answers were written by people
who never saw tabq. Figures measured on this fixture (2026-12-02, untaught prior): top answer
right on 69 of 268 questions (25.7%); a right answer among the executed candidates on 170 (63%);
on the 22 questions chosen for messy cells, 14 have a right candidate. The floors below sit a
little under those figures so that small, deliberate changes to the prior do not trip them.

Learning is checked the same way: taught from the answers of the 351 "extra" questions (55
other tables), the model answered 81 of the same 268 right against 69 untaught (2026-12-03;
278 of the 351 had a candidate with the right answer). No test table is a training table.
On 2026-12-04, after issue 16's ranking work, the untaught prior answers 72 and the taught
model 79: the prior now gets right part of what teaching used to add, so the gap asked for
is 5 (it was 8), and the taught model must also stay at 75 or more on its own.
"""

import json
from pathlib import Path

import pytest

import tabq
from tabq.answers import matches
from tabq.model import Model
from tabq.teaching import evaluate, learn_from, read_examples

FIXTURE = Path(__file__).parent / "fixtures" / "wtq"
# Every question of the fixture asked (84 s) and a model taught from 351 more (169 s), in one
# run on a 2-core machine: run with pytest --long, as CI does.
pytestmark = pytest.mark.long


def questions(splits: tuple[str, ...] = ("train", "test")) -> dict[str, dict]:
    """The fixture's questions in these splits ("extra" holds more training questions only)."""
    lines = (FIXTURE / "questions.jsonl").read_text(encoding="utf-8").splitlines()
    return {q["id"]: q for q in map(json.loads, lines) if q["split"] in splits}


@pytest.fixture(scope="module")
def results():
    tables: dict[str, tabq.OpenTable] = {}
    out = {}
    for qid, q in questions().items():
        if q["table"] not in tables:
            tables[q["table"]] = tabq.open(FIXTURE / q["table"])
        out[qid] = (q, tables[q["table"]].ask(q["question"]))
    return out


def test_every_fixture_table_loads_and_every_question_gets_an_answer(results):
    assert len(results) >= 250
    assert all(result.candidates for _, result in results.values())


def test_untaught_accuracy_on_real_questions(results):
    right = sum(matches(r.answer, q["answer"]) for q, r in results.values())
    assert right / len(results) >= 0.22


def test_candidates_reach_the_right_answer(results):
    reached = sum(any(matches(c.answer, q["answer"]) for c in r.candidates)
                  for q, r in results.values())
    assert reached / len(results) >= 0.58


def test_messy_cells_are_read_as_values(results):
    ids = [line.split()[0] for line in (FIXTURE / "messy_ids.txt").read_text().splitlines()
           if line.strip() and not line.startswith("#")]
    reached = [qid for qid in ids
               if any(matches(c.answer, results[qid][0]["answer"]) for c in results[qid][1].candidates)]
    assert len(reached) >= 12, f"only {len(reached)} of {len(ids)} messy questions reachable"


def test_learning_from_answers_helps_on_unseen_tables(results):
    untaught = sum(matches(r.answer, q["answer"]) for q, r in results.values())
    jobs = read_examples(FIXTURE / "questions.jsonl")
    extra = questions(("extra",))
    model, report, _ = learn_from(Model.prior(), [j for j in jobs if j.id in extra])
    assert report.reachable >= 0.7 * len(extra)      # oracle coverage of the training questions
    test = [j for j in jobs if j.id in results]
    taught = evaluate(model, test)
    right = round(taught.accuracy * len(test))
    assert right >= untaught + 5 and right >= 75, (
        f"taught {right} of {len(test)}, untaught {untaught}")
