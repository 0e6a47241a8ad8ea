"""Which part of a model trained on WikiTableQuestions transfers to analyst questions?

usage: python benchmarks/wtq_transfer.py MODEL_DIR SET.jsonl ...
MODEL_DIR is a model folder trained by `tabq eval TEST --train TRAIN --model MODEL_DIR`. Prints
the weights that moved most, then right/total per set for the prior, the trained model and
models keeping part of what it learned (see docs/results.md).
"""
import json, sys
from pathlib import Path
import tabq
from tabq.answers import matches
from tabq.store import ModelFolder

prior = tabq.Model.prior()
learned = ModelFolder(sys.argv[1]).load()
P, L = prior.as_dict(), learned.as_dict()
delta = {k: L.get(k, 0.0) - P.get(k, 0.0) for k in set(P) | set(L)}
delta = {k: v for k, v in delta.items() if abs(v) > 1e-9}
print("changed weights", len(delta), "lex:", sum(k.startswith("lex:") for k in delta))
top = sorted(delta.items(), key=lambda kv: -abs(kv[1]))[:40]
for k, v in top: print(f"  {v:+.2f} {k}  (prior {P.get(k,0):+.2f})")

def variant(keep, scale=1.0):
    return tabq.Model({**P, **{k: P.get(k, 0.0) + scale * v for k, v in delta.items() if keep(k)}})

VARIANTS = {"prior": prior, "learned": learned,
            "lex_only": variant(lambda k: k.startswith("lex:")),
            "half": variant(lambda k: True, 0.5),
            "no_lex": variant(lambda k: not k.startswith(("lex:", "lexcol:")))}
sets = [Path(p) for p in sys.argv[2:]]
for name, model in VARIANTS.items():
    res = {}
    for path in sets:
        right = total = 0
        tables = {}
        for line in path.read_text().splitlines():
            ex = json.loads(line)
            tp = (path.parent / ex["table"]).resolve()
            if tp not in tables:
                tables[tp] = tabq.open(tp, model=model)
            r = tables[tp].ask(ex["question"])
            right += matches(r.answer, ex["answer"]); total += 1
        res[path.parent.name + "/" + path.stem] = f"{right}/{total}"
    print(name, res, flush=True)
