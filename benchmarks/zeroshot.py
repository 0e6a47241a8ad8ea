"""Zero-shot accuracy: the untaught model's top answer on questions written apart from the engine,
and how far its unsure flag can be trusted: the share right among answers not flagged, and the
share flagged.

usage: python benchmarks/zeroshot.py [SET.jsonl ...] [--show-wrong]
Defaults to every set in benchmarks/zeroshot/. Answers in the sets were computed by pandas
(see benchmarks/zeroshot/make_sets.py); they are compared with tabq's answer matcher.
"""

from __future__ import annotations

import json
import sys
import time
from collections import defaultdict
from pathlib import Path

import tabq
from tabq.answers import matches

HERE = Path(__file__).parent / "zeroshot"


def run(paths: list[Path], show_wrong: bool) -> float:
    tables: dict[Path, tabq.OpenTable] = {}
    by_kind: dict[str, list[int]] = defaultdict(lambda: [0, 0])
    right = total = sure = right_sure = 0
    times = []
    for path in paths:
        for line in path.read_text(encoding="utf-8").splitlines():
            ex = json.loads(line)
            table_path = (path.parent / ex["table"]).resolve()
            if table_path not in tables:
                tables[table_path] = tabq.open(table_path, model=tabq.Model.prior())
            t0 = time.perf_counter()
            result = tables[table_path].ask(ex["question"])
            times.append(time.perf_counter() - t0)
            ok = matches(result.answer, ex["answer"])
            right += ok
            total += 1
            sure += not result.unsure
            right_sure += ok and not result.unsure
            kind = by_kind[ex.get("kind", "all")]
            kind[0] += ok
            kind[1] += 1
            if show_wrong and not ok:
                print(f"✗ [{ex.get('kind')}] {ex['question']}"
                      f"{'  (flagged: ' + result.unsure_reason + ')' if result.unsure else ''}"
                      f"\n    want {ex['answer']}"
                      f"\n    got  {result.answer[:6]}  {result.best.form if result.best else ''}")
    for kind, (r, n) in sorted(by_kind.items()):
        print(f"  {kind:16s} {r:3d}/{n:<3d} {r / n:5.0%}")
    times.sort()
    print(f"zero-shot accuracy {right / total:.1%} ({right}/{total}); "
          f"median {times[len(times) // 2] * 1000:.0f} ms per question")
    print("right among answers not flagged unsure: "
          + (f"{right_sure / sure:.1%} ({right_sure}/{sure})" if sure else "none was sure")
          + f"; flagged unsure {1 - sure / total:.1%} ({total - sure}/{total})")
    return right / total


if __name__ == "__main__":
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    sets = [Path(a) for a in args] or sorted(HERE.glob("*.jsonl"))
    run(sets, "--show-wrong" in sys.argv)
