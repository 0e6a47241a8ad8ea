"""The lexicon's done-when: a model taught a team's words, exported, imported into an empty
model, answers other questions with the same words as well as the taught model.

usage: python benchmarks/lexicon.py [--keep DIR] [--json]

Uses benchmarks/lexicon/ (an invented seed library; see make_sets.py there): teaches a fresh
model folder the 30 confirmations of teach.jsonl, exports its lexicon, imports that file into
an empty model folder, exports again (the two files must be identical), and measures the
accuracy of the untaught, the taught and the importing model on the 30 different questions of
test.jsonl. Figures of one run; docs/lexicon.md reports them.
"""

from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

from tabq import lexicon
from tabq.model import Model
from tabq.store import ModelFolder
from tabq.teaching import evaluate, read_examples, teach

HERE = Path(__file__).resolve().parent / "lexicon"


def run(work: Path) -> dict:
    teach_jobs = read_examples(HERE / "teach.jsonl")
    test_jobs = read_examples(HERE / "test.jsonl")
    source, target = ModelFolder(work / "taught"), ModelFolder(work / "imported")

    start = time.perf_counter()
    report = teach(source, teach_jobs)
    teach_seconds = time.perf_counter() - start
    exported = work / "team-words.json"
    start = time.perf_counter()
    lexicon.export(source, exported)
    lexicon.import_file(target, exported)
    lexicon.export(target, work / "again.json")
    round_trip_seconds = time.perf_counter() - start

    untaught, taught, imported = Model.prior(), source.load(), target.load()
    summary = {
        "teach_examples": len(teach_jobs), "test_examples": len(test_jobs),
        "taught_reachable": report.reachable,
        "entries": len(lexicon.read(exported)[0].entries),
        "structure": len(lexicon.read(exported)[0].structure),
        "file_bytes": exported.stat().st_size,
        "round_trip_identical": exported.read_bytes() == (work / "again.json").read_bytes(),
        "teach_seconds": round(teach_seconds, 1),
        "export_import_export_seconds": round(round_trip_seconds, 2),
    }
    for name, model in [("untaught", untaught), ("taught", taught), ("imported", imported)]:
        on_test = evaluate(model, test_jobs)
        summary[f"{name}_test_accuracy"] = round(on_test.accuracy, 4)
        summary[f"{name}_teach_accuracy"] = round(evaluate(model, teach_jobs).accuracy, 4)
        summary[f"{name}_test_by_word"] = {k: f"{r}/{n}" for k, (r, n) in on_test.by_kind.items()}
    taught_acc = summary["taught_test_accuracy"]
    summary["imported_over_taught"] = round(summary["imported_test_accuracy"] / taught_acc, 4) \
        if taught_acc else None
    return summary


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--keep", metavar="DIR", help="keep the model folders and files here")
    parser.add_argument("--json", action="store_true", help="print the figures as JSON")
    args = parser.parse_args()
    if args.keep:
        work = Path(args.keep)
        work.mkdir(parents=True, exist_ok=True)
        if any(work.iterdir()):
            print(f"{work}: choose an empty folder", file=sys.stderr)
            return 2
        summary = run(work)
    else:
        with tempfile.TemporaryDirectory() as tmp:
            summary = run(Path(tmp))
    if args.json:
        print(json.dumps(summary, indent=2))
        return 0
    for key, value in summary.items():
        print(f"{key:32s} {value}")
    ok = summary["round_trip_identical"] and (summary["imported_over_taught"] or 0) >= 0.9
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
