"""tabq.learn.train on tiny hand-made examples whose right update can be worked out by hand."""

import math

import numpy as np
import pytest

from tabq.learn import (STRUCTURE_RATE, TEACH_MARGIN, Example, _State, pack, plasticity, settle,
                        train)
from tabq.model import Model
from tabq.text import stem


def _example(features, correct, question="q"):
    return Example.of(question, ["gold"], [f"c{i}" for i in range(len(features))],
                      [1] * len(features), features, correct)


A_RIGHT_B_WRONG = [{"a": 1.0}, {"b": 1.0}]


# ── hinge ─────────────────────────────────────────────────────────────────────────────────────
def test_hinge_one_step_moves_target_up_and_rival_down_by_the_averaged_amount():
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    model, report = train(Model(), [ex], "hinge", epochs=1, rate=0.1)
    # One update at count 1: delta = ±0.1, acc = ±1·0.1, then tick → count 2;
    # averaged = delta − acc/count = 0.1 − 0.1/2 = 0.05.
    assert model.weight("a") == pytest.approx(0.05, abs=1e-12)
    assert model.weight("b") == pytest.approx(-0.05, abs=1e-12)
    assert report.updates == 1 and report.examples == 1 and report.reachable == 1


def test_hinge_averaging_matches_state_averaged():
    state = _State(2, 0.1, 0.0)
    state.delta += np.array([0.1, -0.1])
    state.acc += 1 * np.array([0.1, -0.1])
    state.tick()
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    model, _ = train(Model(), [ex], "hinge", epochs=1, rate=0.1)
    assert [model.weight("a"), model.weight("b")] == pytest.approx(list(state.averaged()))


def test_hinge_two_epochs_keeps_moving_until_the_margin_is_met():
    # Epoch 1: scores (0,0) → update, delta a=.1 b=-.1. Epoch 2: scores (.1,-.1), with cost the
    # wrong one scores .9 > .1 → another update, delta a=.2 b=-.2, acc = .1 + 2·.1 = .3, count 3.
    # averaged = .2 − .3/3 = .1
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    model, report = train(Model(), [ex], "hinge", epochs=2, rate=0.1)
    assert report.updates == 2
    assert model.weight("a") == pytest.approx(0.1, abs=1e-12)
    assert model.weight("b") == pytest.approx(-0.1, abs=1e-12)


def test_hinge_makes_no_update_when_the_correct_top_beats_every_wrong_one_by_the_cost():
    start = Model({"a": 2.0, "b": 0.0, "c": -0.5})
    ex = _example([{"a": 1.0}, {"b": 1.0}, {"c": 1.0}], [True, False, False])
    model, report = train(start, [ex], "hinge", epochs=3, rate=0.1)
    assert report.updates == 0
    assert report.right_before == 1
    assert model.as_dict() == pytest.approx(start.as_dict())


def test_hinge_updates_when_the_correct_top_wins_by_less_than_the_cost():
    start = Model({"a": 0.5, "b": 0.0})
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    model, report = train(start, [ex], "hinge", epochs=1, rate=0.1)
    assert report.right_before == 1 and report.updates == 1
    assert model.weight("a") > 0.5 and model.weight("b") < 0.0


def test_hinge_target_is_the_best_scoring_correct_candidate():
    # two correct candidates; the better-scoring one (c) is the target, a is left alone
    start = Model({"a": 0.0, "b": 0.0, "c": 0.3})
    ex = _example([{"a": 1.0}, {"b": 1.0}, {"c": 1.0}], [True, False, True])
    model, _ = train(start, [ex], "hinge", epochs=1, rate=0.1)
    assert model.weight("a") == pytest.approx(0.0)
    assert model.weight("c") == pytest.approx(0.35)
    assert model.weight("b") == pytest.approx(-0.05)


# ── likelihood ────────────────────────────────────────────────────────────────────────────────
def test_likelihood_one_step_raises_a_and_lowers_b_by_the_adagrad_amount():
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    model, report = train(Model(), [ex], "likelihood", epochs=1, rate=0.3, l1=1e-4)
    # probs (.5,.5), wanted (1,0): gradient +.5 / −.5; AdaGrad eta = .3/sqrt(.25+1e-8)
    eta = 0.3 / math.sqrt(0.25 + 1e-8)
    expected = 0.5 * eta - eta * 1e-4
    assert model.weight("a") == pytest.approx(expected, rel=1e-9)
    assert model.weight("b") == pytest.approx(-expected, rel=1e-9)
    assert report.updates == 1


def test_likelihood_several_epochs_keep_raising_the_correct_one():
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    one, _ = train(Model(), [ex], "likelihood", epochs=1)
    three, _ = train(Model(), [ex], "likelihood", epochs=3)
    assert three.weight("a") > one.weight("a") > 0 > one.weight("b") > three.weight("b")


def test_likelihood_with_every_candidate_correct_has_no_gradient():
    ex = _example(A_RIGHT_B_WRONG, [True, True])
    model, _ = train(Model(), [ex], "likelihood", epochs=2, l1=0.0)
    assert model.weight("a") == pytest.approx(0.0) and model.weight("b") == pytest.approx(0.0)


# ── unreachable examples, shared behaviour ────────────────────────────────────────────────────
@pytest.mark.parametrize("objective", ["hinge", "likelihood"])
def test_an_example_with_no_correct_candidate_makes_no_update_and_is_unreachable(objective):
    start = Model({"a": 0.25, "b": -0.5})
    ex = _example(A_RIGHT_B_WRONG, [False, False])
    model, report = train(start, [ex], objective, epochs=2)
    assert report.examples == 1 and report.reachable == 0 and report.oracle == 0.0
    assert report.updates == 0 and report.right_before == 0
    assert model.weight("a") == pytest.approx(0.25) and model.weight("b") == pytest.approx(-0.5)


@pytest.mark.parametrize("objective", ["hinge", "likelihood"])
def test_reachable_counts_only_examples_with_a_correct_candidate(objective):
    exs = [_example(A_RIGHT_B_WRONG, [True, False], "q1"),
           _example([{"c": 1.0}, {"d": 1.0}], [False, False], "q2"),
           _example([{"e": 1.0}], [True], "q3")]
    _, report = train(Model(), exs, objective, epochs=1)
    assert (report.examples, report.reachable) == (3, 2)
    assert report.oracle == pytest.approx(2 / 3)


@pytest.mark.parametrize("objective", ["hinge", "likelihood"])
def test_train_returns_a_new_model_and_leaves_the_input_alone(objective):
    start = Model({"a": 0.0})
    before = start.as_dict()
    ex = _example(A_RIGHT_B_WRONG, [True, False])
    model, _ = train(start, [ex], objective, epochs=1)
    assert model is not start and start.as_dict() == before and "b" not in start.index
    assert model.weight("a") > 0


def test_unknown_objective_is_refused():
    with pytest.raises(ValueError):
        train(Model(), [], "perceptron")


def test_pack_indexes_new_features_at_zero_and_flattens():
    model = Model({"a": 1.5})
    p = pack(_example([{"a": 1.0, "x": 2.0}, {"y": 3.0}], [True, False]), model)
    assert model.weight("x") == 0.0 and "y" in model.index
    assert list(p.start) == [0, 2, 3]
    assert list(p.scores(model.w)) == pytest.approx([1.5, 0.0])


def test_an_example_keeps_each_candidates_features_by_name():
    feats = [{"a": 1.0, "x": 2.0}, {"x": 0.5, "b": -1.0}, {"size": 1.0}]
    ex = _example(feats, [False, True, False])
    assert [ex.features(i) for i in range(3)] == feats
    assert ex.names == ("a", "x", "b", "size")    # each name once, in the order first seen


# ── settling fresh confirmations ──────────────────────────────────────────────────────────────
WORD = "lexval:takings|status=paid"          # a content word paired with a meaning
FRAME = f"lex:{stem('how')} {stem('many')}|count"   # frame words only (grams are stemmed)
STRUCTURE = "size"


def test_plasticity_moves_a_content_word_fully_and_frame_and_structure_a_little():
    assert plasticity(WORD) == 1.0
    assert plasticity("lexcol:no show|status") == 1.0
    assert plasticity("lex:of takings|sum") == 1.0          # one content word is enough
    assert plasticity(FRAME) == STRUCTURE_RATE
    assert plasticity(f"lex:number {stem('of')}|count") == STRUCTURE_RATE
    assert plasticity("lex:qtype:how_many|count") == STRUCTURE_RATE
    assert plasticity(STRUCTURE) == STRUCTURE_RATE
    assert plasticity("answer:number") == STRUCTURE_RATE


def test_settle_steps_until_the_confirmed_reading_leads_by_the_margin():
    # target {WORD, STRUCTURE}, rival {other}: each step moves WORD by 0.1, STRUCTURE by
    # +0.02 and "other" by −0.02, so the gap grows 0.14 a step from 0: 15 steps reach 2.1.
    ex = _example([{WORD: 1.0, STRUCTURE: 1.0}, {"other": 1.0}], [True, False])
    model = settle(Model(), [ex], rate=0.1)
    assert model.weight(WORD) == pytest.approx(1.5)
    assert model.weight(STRUCTURE) == pytest.approx(0.3)
    assert model.weight("other") == pytest.approx(-0.3)
    gap = model.weight(WORD) + model.weight(STRUCTURE) - model.weight("other")
    assert TEACH_MARGIN <= gap < TEACH_MARGIN + 0.14


def test_settle_leaves_an_example_that_already_leads_by_the_margin_alone():
    ex = _example([{WORD: 1.0}, {"other": 1.0}], [True, False])
    model = Model({WORD: 3.0, "other": 0.0})
    settled = settle(model, [ex])
    assert settled.as_dict() == model.as_dict()


def test_settle_shares_the_step_between_consistent_readings_tied_at_the_top():
    # two readings give the confirmed answer with equal scores: settling must not pick one
    ex = _example([{WORD: 1.0}, {"lexcol:takings|fee": 1.0}, {"other": 1.0}],
                  [True, True, False])
    model = settle(Model(), [ex], rate=0.1)
    assert model.weight(WORD) == pytest.approx(model.weight("lexcol:takings|fee"))
    assert model.weight(WORD) > 0 > model.weight("other")


def test_settle_does_not_change_the_model_it_is_given():
    ex = _example([{WORD: 1.0}, {"other": 1.0}], [True, False])
    model = Model({WORD: 0.0})
    settle(model, [ex])
    assert model.weight(WORD) == 0.0
