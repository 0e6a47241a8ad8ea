"""Every candidate of every question, written down so a refactoring can prove it changed none.

usage: python benchmarks/candidates.py OUT.jsonl [--limit N]
       python benchmarks/candidates.py --compare A.jsonl B.jsonl

For each question of the WTQ fixture (tests/fixtures/wtq), the zero-shot sets and the
vocabulary tests (benchmarks/), under the untaught model and under a model taught the
vocabulary's confirmations, one line holds every executed candidate: its canonical form, its
score (repr, so bit for bit), its features (sorted, values as repr) and a digest of its answer
(a per-group table's rows as a multiset, since ties come back in any order). Two dumps
of the same commit are identical; `--compare` names the first question where two differ.
"""

from __future__ import annotations

import hashlib
import json
import sys
from pathlib import Path

import tabq
from tabq.model import Model

ROOT = Path(__file__).resolve().parent.parent
SETS = [ROOT / "tests/fixtures/wtq/questions.jsonl",
        *sorted((ROOT / "benchmarks/zeroshot").glob("*.jsonl")),
        ROOT / "benchmarks/vocabulary/test.jsonl"]
TAUGHT = ROOT / "benchmarks/vocabulary/teach.jsonl"


def taught_model() -> Model:
    """A model taught the vocabulary's confirmations, in memory (no folder is written)."""
    from tabq.teaching import learn_from, read_examples
    jobs = read_examples(TAUGHT)
    model, _, _ = learn_from(Model.prior(), jobs, workers=1, fresh=jobs)
    return model


def dump(out: Path, limit: int | None) -> None:
    models = {"prior": Model.prior(), "taught": taught_model()}
    tables: dict[tuple, tabq.OpenTable] = {}
    with open(out, "w", encoding="utf-8") as f:
        for path in SETS:
            lines = path.read_text(encoding="utf-8").splitlines()[:limit]
            for line in lines:
                ex = json.loads(line)
                table_path = (path.parent / ex["table"]).resolve()
                for name, model in models.items():
                    key = (table_path, name)
                    if key not in tables:
                        tables[key] = tabq.open(table_path, model=model)
                    result = tables[key].ask(ex["question"])
                    f.write(json.dumps({"set": path.name, "id": ex["id"], "model": name,
                                        "candidates": [_candidate(c) for c in result.candidates]},
                                       ensure_ascii=False, default=str) + "\n")


def _candidate(reading) -> list:
    return [str(reading.form), repr(reading.score),
            sorted((k, repr(v)) for k, v in reading.features.items()),
            _answer(reading), reading.error]


def _answer(reading) -> str:
    """The whole answer as a digest. The rows of a per-group table come back in any order
    among equal values (DuckDB gives no order to ties), so a table is compared as a multiset."""
    values = [repr(v) for v in reading.answer]
    if reading.is_table:
        values.sort()
    return f"{len(values)}:" + hashlib.sha256("\n".join(values).encode()).hexdigest()[:16]


def compare(a: Path, b: Path) -> int:
    left = a.read_text(encoding="utf-8").splitlines()
    right = b.read_text(encoding="utf-8").splitlines()
    for x, y in zip(left, right):
        if x != y:
            ex = json.loads(x)
            print(f"first difference: {ex['set']} {ex['id']} ({ex['model']})")
            return 1
    if len(left) != len(right):
        print(f"{len(left)} lines against {len(right)}")
        return 1
    count = sum(len(json.loads(x)["candidates"]) for x in left)
    print(f"identical: {len(left)} questions, {count} candidates")
    return 0


if __name__ == "__main__":
    if sys.argv[1] == "--compare":
        sys.exit(compare(Path(sys.argv[2]), Path(sys.argv[3])))
    limit = int(sys.argv[sys.argv.index("--limit") + 1]) if "--limit" in sys.argv else None
    dump(Path(sys.argv[1]), limit)
