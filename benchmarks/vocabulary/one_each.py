"""One confirmation per team word: does it carry to related questions?

    python benchmarks/vocabulary/one_each.py

Teaches a fresh model folder the first confirmed question of each word in teach.jsonl, one
`teach` call per confirmation (as an analyst confirming six answers one after another), then
answers test.jsonl (other boats, moorings, parties; 20 of 34 on the other year's sheet) and
prints accuracy overall and by word as a Markdown row for docs/results.md.
"""

from __future__ import annotations

import tempfile
import time
from pathlib import Path

from tabq.store import ModelFolder
from tabq.teaching import evaluate, read_examples, teach

HERE = Path(__file__).resolve().parent


def main() -> None:
    first: dict[str, object] = {}
    for job in read_examples(HERE / "teach.jsonl"):
        first.setdefault(job.kind, job)
    tests = read_examples(HERE / "test.jsonl")
    with tempfile.TemporaryDirectory() as tmp:
        folder = ModelFolder(Path(tmp) / "model")
        start = time.perf_counter()
        for job in first.values():
            teach(folder, [job])
        seconds = time.perf_counter() - start
        report = evaluate(folder.load(), tests)
    right = round(report.accuracy * report.examples)
    words = ", ".join(f"{kind} {r}/{n}" for kind, (r, n) in report.by_kind.items())
    print(f"| one confirmation per word ({len(first)}, one `teach` each) "
          f"| {report.accuracy:.1%} ({right}/{report.examples}) | {report.oracle:.1%} "
          f"| {words} |")
    print(f"teaching took {seconds:.0f} s for {len(first)} confirmations")


if __name__ == "__main__":
    main()
