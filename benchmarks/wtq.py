"""Learning from answers on WikiTableQuestions: train on dev-train, evaluate on dev-test.

usage: python benchmarks/wtq.py WTQ_DIR [--train N] [--test N] [--objective hinge|likelihood]
WTQ_DIR is the folder with dev-train.jsonl, dev-test.jsonl and tables/ (see its README; the
data is CC BY-SA 4.0 and is not copied here). Prints accuracy, oracle coverage, training time
and peak memory as a Markdown row for docs/results.md. Tables of the two files are disjoint.
"""

from __future__ import annotations

import argparse
import json
import resource
import tempfile
import time
from pathlib import Path

from tabq.learn import OBJECTIVES
from tabq.model import Model
from tabq.teaching import DEFAULT_OBJECTIVE, evaluate, learn_from, read_examples


def subset(path: Path, n: int | None, out: Path) -> Path:
    """The first n examples with absolute table paths (tabq eval reads tables relative)."""
    with open(path, encoding="utf-8") as f, open(out, "w", encoding="utf-8") as g:
        for i, line in enumerate(f):
            if n is not None and i >= n:
                break
            ex = json.loads(line)
            ex["table"] = str((path.parent / ex["table"]).resolve())
            g.write(json.dumps(ex, ensure_ascii=False) + "\n")
    return out


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("wtq", type=Path)
    parser.add_argument("--train", type=int, default=None)
    parser.add_argument("--test", type=int, default=None)
    parser.add_argument("--objective", choices=OBJECTIVES, default=DEFAULT_OBJECTIVE)
    args = parser.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        train_jobs = read_examples(subset(args.wtq / "dev-train.jsonl", args.train,
                                          Path(tmp) / "train.jsonl"))
        test_jobs = read_examples(subset(args.wtq / "dev-test.jsonl", args.test,
                                         Path(tmp) / "test.jsonl"))
    prior = Model.prior()
    start = time.perf_counter()
    model, report, _ = learn_from(prior, train_jobs, args.objective)
    trained_s = time.perf_counter() - start
    before = evaluate(prior, test_jobs)
    after = evaluate(model, test_jobs)
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    children = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024
    print(f"| {args.objective} | {len(train_jobs)} | {len(test_jobs)} | {before.accuracy:.1%} | "
          f"{after.accuracy:.1%} | {after.oracle:.1%} | {report.reachable / max(report.taught, 1):.1%} "
          f"| {trained_s / 60:.1f} min | {max(peak, children):.0f} MB |")


if __name__ == "__main__":
    main()
