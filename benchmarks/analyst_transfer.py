"""Would weights learned from analyst questions make a better untaught model? Leave one family out.

usage: python benchmarks/analyst_transfer.py SET.jsonl ...
Each set's folder is a family (zeroshot2, zeroshot4, ...). Every question's candidates are found
once with the prior (`learn.candidates`, as teaching does); then, for each family, hinge steps
on all the other families' questions (3 passes, averaged) move some of the weights, and the
held-out family's questions are re-ranked by the learned weights over the same candidates. The
weights moved: all, the table-independent ones (no `lexcol:`/`lexval:`/`def:`), the word-to-
operator pairs (`lex:`) only, or the structure ones only; at two step sizes. Prints right
answers per family and in all, the prior first (see docs/results.md).
"""

from __future__ import annotations

import json
import random
import sys
from collections import defaultdict
from pathlib import Path

import numpy as np

import tabq
from tabq.learn import candidates, pack

TABLE_SPECIFIC = ("lexcol:", "lexval:", "def:")
MOVED = {"all": lambda name: True,
         "independent": lambda name: not name.startswith(TABLE_SPECIFIC),
         "lex": lambda name: name.startswith("lex:"),
         "structure": lambda name: not name.startswith(TABLE_SPECIFIC + ("lex:",))}
RATES = (0.1, 0.03)


def examples(paths: list[Path]) -> list[tuple[str, object]]:
    found, tables = [], {}
    for path in paths:
        for line in path.read_text(encoding="utf-8").splitlines():
            ex = json.loads(line)
            table_path = (path.parent / ex["table"]).resolve()
            if table_path not in tables:
                tables[table_path] = tabq.open(table_path, model=tabq.Model.prior())
            found.append((path.parent.name,
                          candidates(tables[table_path], ex["question"], ex["answer"])))
    return found


def train(prior: tabq.Model, train_on: list, moved, rate: float) -> tabq.Model:
    model = tabq.Model(prior.as_dict())
    packed = [pack(ex, model) for ex in train_on]
    mask = np.array([float(moved(name)) for name in sorted(model.index, key=model.index.get)])
    delta, acc, count = np.zeros(len(model.w)), np.zeros(len(model.w)), 1
    order = list(range(len(packed)))
    rng = random.Random(0)
    for _ in range(3):
        rng.shuffle(order)
        for i in order:
            p, count = packed[i], count + 1
            if not p.correct.any() or p.correct.all():
                continue
            scores = p.scores(model.w + delta)
            target = int(np.flatnonzero(p.correct)[scores[p.correct].argmax()])
            rival = int((scores + ~p.correct).argmax())
            if not p.correct[rival]:
                (ti, tv), (ri, rv) = p.phi(target, 0), p.phi(rival, 0)
                idx = np.concatenate([ti, ri])
                step = np.concatenate([tv, -rv]) * rate * mask[idx]
                np.add.at(delta, idx, step)
                np.add.at(acc, idx, count * step)
    model.w = model.w + delta - acc / count
    return model


def right(model: tabq.Model, held_out: list) -> int:
    total = 0
    for ex in held_out:
        p = pack(ex, model)
        total += bool(len(p.correct)) and bool(p.correct[int(p.scores(model.w).argmax())])
    return total


def main() -> None:
    found = examples([Path(p) for p in sys.argv[1:]])
    prior, totals = tabq.Model.prior(), defaultdict(int)
    for family in sorted({f for f, _ in found}):
        held_out = [ex for f, ex in found if f == family]
        train_on = [ex for f, ex in found if f != family]
        line = {"prior": right(prior, held_out)}
        for name, moved in MOVED.items():
            for rate in RATES:
                line[f"{name}@{rate}"] = right(train(prior, train_on, moved, rate), held_out)
        for key, value in line.items():
            totals[key] += value
        print(family, len(held_out), line, flush=True)
    print("all", len(found), dict(totals))


if __name__ == "__main__":
    main()
