"""learn: weights from (question, table, confirmed answer) alone — the query is never given.

For each example the current model proposes candidates (derive + execute); the ones whose answer
matches the confirmed one are the consistent set. Two objectives move the weights:

- `hinge`: the latent structured hinge with stochastic subgradient steps. Target = the best-scoring
  consistent candidate; rival = argmax of score + cost (cost 1 when its answer differs);
  w += η(φ(target) − φ(rival)); shuffled passes, averaged weights.
- `likelihood`: maximum marginal likelihood of the consistent set, AdaGrad steps with an L1
  penalty that pulls learned changes back toward the prior.

Learning only ever changes an offset from the prior, so an untaught word keeps its prior reading.
An example with no consistent candidate makes no update; it is counted (oracle coverage).

A handful of fresh confirmations (the analyst teaching a word) is then *settled*: plain hinge
steps on those examples alone until each one's reading leads every wrong-answer reading by a
margin. The steps move a feature by its plasticity: a pairing of a content word with a meaning
moves fully, features of the question's frame and of structure move little — so one
confirmation teaches what the new word means, not that every question has that shape.
"""

from __future__ import annotations

import random
from collections.abc import Callable, Iterable
from dataclasses import dataclass

import numpy as np

from .answers import matches
from .pipeline import OpenTable
from .definitions import induce
from .derive import PAIR_BEAM
from .execute import run_on_rows
from .featurenames import parse
from .table import TableRef
from .model import Model
from .text import STOPWORDS, stem

OBJECTIVES = ("hinge", "likelihood")
TRAIN_EXECUTE = 100      # candidates executed per training example (more than when answering)
TEACH_PAIR_BEAM = 24     # sub-forms per side of and/or when teaching a few: a new word's reading
#                          may rank low before it is learned (wider in batch training hurt WTQ)
TEACH_MARGIN = 2.0       # a settled confirmation leads every wrong-answer reading by this
SETTLE_ROUNDS = 30       # passes over the fresh confirmations at most
SETTLE_BATCH = 50        # more fresh examples than this is batch learning: no settling
STRUCTURE_RATE = 0.2     # plasticity of frame and structure features, against 1 for a word's
FRAME_WORDS = frozenset({stem(w) for w in STOPWORDS} | {"number"})


@dataclass(eq=False)
class Example:
    """One confirmed answer and the candidates the model found for it, as sparse vectors.

    The features are kept as flat arrays over the example's own feature names (candidate i owns
    idx[start[i]:start[i + 1]]), not as a dict per candidate: training holds thousands of
    examples of ~100 candidates each, and the dicts took more than twice the memory."""

    question: str
    gold: list
    forms: list[str]            # canonical text of each candidate
    sizes: list[int]
    names: tuple[str, ...]      # the features that fire in some candidate, in order first seen
    idx: np.ndarray             # into names
    val: np.ndarray
    start: np.ndarray
    correct: list[bool]
    table: TableRef | None = None   # the table searched, for the confirmation's log record

    @classmethod
    def of(cls, question: str, gold: list, forms: list[str], sizes: list[int],
           features: list[dict[str, float]], correct: list[bool],
           table: TableRef | None = None) -> Example:
        index: dict[str, int] = {}
        idx, val, start = [], [], [0]
        for feats in features:
            for name, value in feats.items():
                idx.append(index.setdefault(name, len(index)))
                val.append(value)
            start.append(len(idx))
        return cls(question, gold, forms, sizes, tuple(index), np.array(idx, dtype=np.int32),
                   np.array(val, dtype=np.float64), np.array(start, dtype=np.int64), correct,
                   table)

    def features(self, i: int) -> dict[str, float]:
        """Candidate i's features by name."""
        a, b = self.start[i], self.start[i + 1]
        return {self.names[j]: float(v) for j, v in zip(self.idx[a:b], self.val[a:b])}

    @property
    def reachable(self) -> bool:
        return any(self.correct)


def candidates(table: OpenTable, question: str, gold: list,
               execute: int = TRAIN_EXECUTE, rows: list[int] | None = None,
               rows_gold: list | None = None, meant: str | None = None,
               pair_beam: int = PAIR_BEAM, team_words: tuple = ()) -> Example:
    """The model's candidates for a question, each marked by whether it gives the gold answer.

    An analyst who picks between readings that agree on the whole table says more: with `rows`
    and `rows_gold` (the answer on those rows alone) a candidate is consistent only when it
    gives both; with `meant` (a form's canonical text, when no rows tell the readings apart)
    only that form is. `team_words` are definitions other confirmations induced, offered
    here too so that this answer can tell the ones that fit it from the ones that do not.
    """
    result = table.ask(question, execute=execute, pair_beam=pair_beam, team_words=team_words)
    cands = result.candidates
    correct = [not c.error and matches(c.answer, gold) for c in cands]
    if not any(correct):   # a team word nothing explains: search what it could stand for
        defined = induce(table, question, gold)
        if defined:
            cands = table.ask(question, execute=execute, pair_beam=pair_beam,
                              team_words=[*team_words, *defined]).candidates
            correct = [not c.error and matches(c.answer, gold) for c in cands]
    if rows and rows_gold is not None:
        correct = [ok and _gives(table, c.form, rows, rows_gold) for ok, c in zip(correct, cands)]
    if meant is not None:
        correct = [ok and str(c.form) == meant for ok, c in zip(correct, cands)]
    return Example.of(question, list(gold), [str(c.form) for c in cands],
                      [_size(c.form) for c in cands], [c.features for c in cands], correct,
                      table.table.reference)


def _gives(table: OpenTable, form, rows: list[int], gold: list) -> bool:
    den = run_on_rows(table.table, form, tuple(rows))
    return not den.error and matches(den.values, gold)


def _size(form) -> int:
    from .logic import size
    return size(form)


@dataclass
class Packed:
    """An example's features as flat arrays: candidate i owns idx[start[i]:start[i+1]]."""

    idx: np.ndarray
    val: np.ndarray
    start: np.ndarray
    correct: np.ndarray
    sizes: np.ndarray

    def scores(self, w: np.ndarray) -> np.ndarray:
        if len(self.idx) == 0:
            return np.zeros(len(self.correct))
        return np.add.reduceat(w[self.idx] * self.val, self.start[:-1]) if len(
            self.start) > 1 else np.zeros(0)

    def phi(self, i: int, dim: int) -> tuple[np.ndarray, np.ndarray]:
        a, b = self.start[i], self.start[i + 1]
        return self.idx[a:b], self.val[a:b]


def pack(example: Example, model: Model) -> Packed:
    """Index every feature in the model (new ones start at zero) and flatten the example."""
    new = {name: 0.0 for name in example.names if name not in model.index}
    if new:
        model.update(new)
    in_model = np.array([model.index[name] for name in example.names], dtype=np.int64)
    # reduceat needs a non-empty slice per candidate: every candidate has at least "size"
    return Packed(in_model[example.idx], example.val, example.start,
                  np.array(example.correct, dtype=bool), np.array(example.sizes))


@dataclass
class Report:
    examples: int = 0
    reachable: int = 0          # examples with at least one consistent candidate
    right_before: int = 0       # top candidate consistent, before training (first pass)
    not_simplest: int = 0       # targets (last pass) larger than the simplest consistent one
    updates: int = 0

    @property
    def oracle(self) -> float:
        return self.reachable / self.examples if self.examples else 0.0


def train(model: Model, examples: list[Example], objective: str = "likelihood",
          epochs: int = 3, rate: float | None = None, l1: float = 1e-4, seed: int = 0,
          weight: Callable[[int], float] | None = None) -> tuple[Model, Report]:
    """Learn from examples; returns a new model (prior + learned offset) and what happened.

    `weight(i)` scales example i's updates (a clarified pick counts more than a plain confirm).
    """
    if objective not in OBJECTIVES:
        raise ValueError(f"objective must be one of {OBJECTIVES}")
    learned = Model(model.as_dict())
    packed = [pack(ex, learned) for ex in examples]
    report = Report(examples=len(examples), reachable=sum(ex.reachable for ex in examples))
    base = learned.w.copy()
    step = _hinge if objective == "hinge" else _likelihood
    state = _State(len(base), rate if rate is not None else (0.1 if objective == "hinge" else 0.3),
                   l1)
    order = list(range(len(packed)))
    rng = random.Random(seed)
    for epoch in range(epochs):
        rng.shuffle(order)
        for i in order:
            p = packed[i]
            if not p.correct.any():
                continue
            scale = weight(i) if weight else 1.0
            w = base + state.delta
            scores = p.scores(w)
            if epoch == 0 and scores.argmax() == np.flatnonzero(p.correct)[
                    scores[p.correct].argmax()]:
                report.right_before += 1
            target = int(np.flatnonzero(p.correct)[scores[p.correct].argmax()])
            if epoch == epochs - 1 and p.sizes[target] > p.sizes[p.correct].min():
                report.not_simplest += 1
            report.updates += step(state, p, scores, target, scale)
            state.tick()
    learned.w = base + (state.averaged() if objective == "hinge" else state.delta)
    learned.version += 1
    return learned, report


class _State:
    """The learned offset from the prior, with what each objective keeps about its history."""

    def __init__(self, dim: int, rate: float, l1: float):
        self.delta = np.zeros(dim)
        self.sum_sq = np.full(dim, 1e-8)       # AdaGrad
        self.acc = np.zeros(dim)                # averaging: Σ c·Δ
        self.count = 1
        self.rate, self.l1 = rate, l1

    def tick(self) -> None:
        self.count += 1

    def averaged(self) -> np.ndarray:
        return self.delta - self.acc / self.count


def _hinge(state: _State, p: Packed, scores: np.ndarray, target: int, scale: float) -> int:
    cost = (~p.correct).astype(float)
    rival = int((scores + cost).argmax())
    if p.correct[rival]:
        return 0
    idx, val = _difference(p, [target], rival, state.rate * scale)
    np.add.at(state.delta, idx, val)
    np.add.at(state.acc, idx, state.count * val)
    return 1


def _difference(p: Packed, targets, rival: int, rate) -> tuple[np.ndarray, np.ndarray]:
    """rate · (mean φ of the targets − φ(rival)) as sparse (index, value) pairs; `rate` is one
    number or one per feature."""
    parts = [p.phi(t, 0) for t in targets]
    ri, rv = p.phi(rival, 0)
    idx = np.concatenate([i for i, _ in parts] + [ri])
    val = np.concatenate([v / len(parts) for _, v in parts] + [-rv])
    return idx, val * (rate[idx] if isinstance(rate, np.ndarray) else rate)


def settle(model: Model, examples: list[Example], margin: float = TEACH_MARGIN,
           rate: float = 0.1, rounds: int = SETTLE_ROUNDS) -> Model:
    """Hinge steps on these examples alone until each leads every wrong-answer reading by
    `margin` (or `rounds` passes). Consistent readings tied at the top share the step, so the
    settling does not pick between readings the analyst did not tell apart."""
    settled = Model(model.as_dict())
    packed = [pack(ex, settled) for ex in examples if ex.reachable and not all(ex.correct)]
    rates = rate * _plasticities(settled)
    w = settled.w.copy()
    for _ in range(rounds):
        moved = False
        for p in packed:
            scores = p.scores(w)
            best, worst = scores[p.correct].max(), scores[~p.correct].max()
            if best - worst >= margin:
                continue
            targets = np.flatnonzero(p.correct & (scores >= best - 1e-9))
            rival = int(np.flatnonzero(~p.correct)[scores[~p.correct].argmax()])
            idx, val = _difference(p, targets, rival, rates)
            np.add.at(w, idx, val)
            moved = True
        if not moved:
            break
    settled.w = w
    settled.version += 1
    return settled


def plasticity(name: str) -> float:
    """How far a settling step moves this feature: 1 for a content word paired with a meaning,
    STRUCTURE_RATE for the rest (frame words, the question type, structure, answer shape)."""
    pair = parse(name)
    if pair is None or pair.is_question_type:
        return STRUCTURE_RATE
    return 1.0 if any(word not in FRAME_WORDS for word in pair.word.split()) else STRUCTURE_RATE


def _plasticities(model: Model) -> np.ndarray:
    rates = np.full(len(model.w), STRUCTURE_RATE)
    for name, i in model.index.items():
        rates[i] = plasticity(name)
    return rates


def _likelihood(state: _State, p: Packed, scores: np.ndarray, target: int, scale: float) -> int:
    probs = _softmax(scores)
    good = np.where(p.correct, scores, -np.inf)
    wanted = _softmax(good)
    coef = wanted - probs                      # ∂ log Σ_good p / ∂ score_i
    per_feature = np.repeat(coef, np.diff(p.start)) * p.val
    grad = np.zeros_like(state.delta)
    np.add.at(grad, p.idx, per_feature)
    touched = np.unique(p.idx)
    g = grad[touched] * scale
    state.sum_sq[touched] += g * g
    eta = state.rate / np.sqrt(state.sum_sq[touched])
    moved = state.delta[touched] + eta * g
    # L1 toward the prior: shrink the learned offset, stopping at zero
    state.delta[touched] = np.sign(moved) * np.maximum(np.abs(moved) - eta * state.l1, 0.0)
    return 1


def _softmax(x: np.ndarray) -> np.ndarray:
    top = np.max(x[np.isfinite(x)]) if np.isfinite(x).any() else 0.0
    e = np.exp(np.where(np.isfinite(x), x - top, -np.inf))
    return e / e.sum()


def evaluate(examples: Iterable[Example]) -> dict[str, float]:
    """Share of examples whose top candidate (by the scores they were ranked with) is right."""
    examples = list(examples)
    right = sum(1 for ex in examples if ex.correct and ex.correct[0])
    reach = sum(ex.reachable for ex in examples)
    n = max(len(examples), 1)
    return {"accuracy": right / n, "oracle": reach / n, "examples": len(examples)}
