"""Team words of four kinds (sets, ranges, thresholds, measures): accuracy against the number
of confirmations per word (issue 17).

usage: python benchmarks/teamwords.py [--json] [--keep DIR]

Uses benchmarks/teamwords/ (an invented taxi co-operative; see make_sets.py and the README
there). For k = 0 (the untaught model), 1, 2 and all confirmations per word, teaches a fresh
model folder the first k lines of each word in teach.jsonl (one `teach` call, as
benchmarks/lexicon.py does) and answers the 40 different questions of test.jsonl. For each it
reports how many of the confirmations had a candidate giving the confirmed answer (the others
are logged but teach no reading), the accuracy on the test questions, the share with the right
answer among the candidates (`oracle`), and the accuracy by combination, by kind of word and by
word. The all-taught model's lexicon is then exported, imported into an empty model folder and
measured too. How often a clarifying question was needed is a slot left for the engine change
that asks them: today it is "n/a (not implemented yet)".
"""

from __future__ import annotations

import argparse
import json
import subprocess
import sys
import tempfile
import time
from collections import defaultdict
from pathlib import Path

from tabq.answers import matches
from tabq.model import Model
from tabq.pipeline import DEFINITIONS_DISAGREE
from tabq.store import ModelFolder
from tabq.teaching import EvalReport, Job, evaluate, export_lexicon, import_lexicon
from tabq.teaching import read_examples, teach

HERE = Path(__file__).resolve().parent / "teamwords"
AMOUNTS = [0, 1, 2, None]           # confirmations per word; None: all of them
NOT_YET = "n/a (not implemented yet)"


def per_word(path: Path) -> dict[str, dict]:
    """The extra fields of each line (word, words, word_kinds) by id: read_examples keeps only
    what tabq needs."""
    with open(path, encoding="utf-8") as f:
        return {line["id"]: line for line in map(json.loads, f) if line}


def first_per_word(jobs: list[Job], k: int | None) -> list[Job]:
    """The first k teaching lines of each word (all with k None), in file order."""
    seen: dict[str, int] = defaultdict(int)
    chosen = []
    for job in jobs:
        seen[job.kind] += 1
        if k is None or seen[job.kind] <= k:
            chosen.append(job)
    return chosen


def right_by(report: EvalReport, jobs: list[Job], labels: dict[str, list[str]]) -> dict:
    """Right answers out of questions for each label (a question counts under each of its)."""
    counts: dict[str, list[int]] = defaultdict(lambda: [0, 0])
    for job in jobs:
        got = report.predictions[job.id]["answer"]
        ok = bool(got) and matches(got, job.answer)
        for label in labels[job.id]:
            counts[label][0] += ok
            counts[label][1] += 1
    return {k: f"{r}/{n}" for k, (r, n) in sorted(counts.items())}


def clarifying(report) -> str:
    """Test questions whose answer asks the analyst to pick between taught definitions that fit
    the confirmations alike but answer differently (pipeline.DEFINITIONS_DISAGREE)."""
    asked = sum(DEFINITIONS_DISAGREE in (p.get("unsure_reason") or "")
                for p in report.predictions.values())
    return f"{asked}/{report.examples}"


def measure(model: Model, test: list[Job], teach_jobs: list[Job], fields: dict) -> dict:
    start = time.perf_counter()
    on_test = evaluate(model, test)
    on_teach = evaluate(model, teach_jobs)
    return {
        "test_accuracy": round(on_test.accuracy, 4),
        "test_right": f"{round(on_test.accuracy * on_test.examples)}/{on_test.examples}",
        "test_oracle": round(on_test.oracle, 4),
        "teach_set_accuracy": round(on_teach.accuracy, 4),
        "by_combination": {k: f"{r}/{n}" for k, (r, n) in on_test.by_kind.items()},
        "by_word_kind": right_by(on_test, test, {j.id: fields[j.id]["word_kinds"] for j in test}),
        "by_word": right_by(on_test, test, {j.id: fields[j.id]["words"] for j in test}),
        "right": [j.id for j in test if on_test.predictions[j.id]["answer"]
                  and matches(on_test.predictions[j.id]["answer"], j.answer)],
        "clarifying_questions_needed": clarifying(on_test),
        "answer_seconds": round(time.perf_counter() - start, 1),
    }


def taught_run(folder: ModelFolder, chosen: list[Job]) -> dict:
    """Teach the chosen confirmations; which of them reached a reading (per word)."""
    start = time.perf_counter()
    report = teach(folder, chosen)
    seconds = time.perf_counter() - start
    word_of = {j.id: j.kind for j in chosen}
    reached: dict[str, list[int]] = defaultdict(lambda: [0, 0])
    for record in report.records:
        reached[word_of[record.id]][0] += record.query is not None
        reached[word_of[record.id]][1] += 1
    return {"confirmations": len(chosen), "reachable": report.reachable,
            "logged_without_reading": sum(r.query is None for r in report.records),
            "skipped": len(report.skipped),
            "reachable_by_word": {w: f"{r}/{n}" for w, (r, n) in sorted(reached.items())},
            # a reading that gives the answer need not be the word's: read them
            "readings_taught": {r.id: r.query for r in report.records if r.query},
            "teach_seconds": round(seconds, 1)}


def round_trip(source: ModelFolder, work: Path) -> tuple[ModelFolder, dict]:
    """Export the source's lexicon and import it into an empty model folder."""
    exported = work / "team-words.json"
    export_lexicon(source, exported)
    target = ModelFolder(work / "imported")
    import_lexicon(target, exported)
    export_lexicon(target, work / "again.json")
    return target, {"lexicon_bytes": exported.stat().st_size,
                    "round_trip_identical":
                        exported.read_bytes() == (work / "again.json").read_bytes()}


def run(work: Path) -> dict:
    teach_jobs = read_examples(HERE / "teach.jsonl")
    test = read_examples(HERE / "test.jsonl")
    fields = per_word(HERE / "test.jsonl")
    runs = []
    folder = None
    for k in AMOUNTS:
        name = "untaught" if k == 0 else f"{k} per word" if k else "all"
        row: dict = {"model": name}
        if k == 0:
            model = Model.prior()
            row.update(confirmations=0, reachable=0)
        else:
            folder = ModelFolder(work / f"taught-{k or 'all'}")
            row.update(taught_run(folder, first_per_word(teach_jobs, k)))
            model = folder.load()
        row.update(measure(model, test, teach_jobs, fields))
        runs.append(row)
    imported, trip = round_trip(folder, work)
    row = {"model": "all, exported and imported", "confirmations": None, "reachable": None,
           **trip}
    row.update(measure(imported.load(), test, teach_jobs, fields))
    runs.append(row)
    return {"commit": head_commit(), "words": len({j.kind for j in teach_jobs}),
            "teach_questions": len(teach_jobs), "test_questions": len(test),
            "clarifying_questions_needed": NOT_YET, "runs": runs}


def head_commit() -> str | None:
    try:
        out = subprocess.run(["git", "rev-parse", "--short", "HEAD"], cwd=HERE, text=True,
                             capture_output=True, check=True)
    except (OSError, subprocess.CalledProcessError):
        return None
    return out.stdout.strip()


def shown(value: int | None) -> str:
    return "—" if value is None else str(value)


def table(summary: dict) -> str:
    """The runs as a Markdown table, then each run's breakdown."""
    lines = ["| model | taught | reachable | test right | test acc | oracle | teach-set acc "
             "| clarifying questions |", "|---|---|---|---|---|---|---|---|"]
    for r in summary["runs"]:
        lines.append(f"| {r['model']} | {shown(r['confirmations'])} | {shown(r['reachable'])} "
                     f"| {r['test_right']} | {r['test_accuracy']:.1%} | {r['test_oracle']:.1%} "
                     f"| {r['teach_set_accuracy']:.1%} | {r['clarifying_questions_needed']} |")
    for r in summary["runs"]:
        lines.append(f"\n{r['model']}:")
        for key in ("by_combination", "by_word_kind", "by_word", "reachable_by_word",
                    "readings_taught"):
            if key in r:
                lines.append(f"  {key}: " + ", ".join(f"{k} {v}" for k, v in r[key].items()))
        lines.append("  right: " + ", ".join(r["right"]))
        seconds = [f"{k} {r[k]}" for k in ("teach_seconds", "answer_seconds") if k in r]
        lines.append("  seconds: " + ", ".join(seconds))
    return "\n".join(lines)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--keep", metavar="DIR", help="keep the model folders and files here")
    parser.add_argument("--json", action="store_true", help="print the figures as JSON")
    args = parser.parse_args()
    start = time.perf_counter()
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
    summary["total_seconds"] = round(time.perf_counter() - start, 1)
    print(json.dumps(summary, indent=2) if args.json else
          table(summary) + f"\n\ntotal {summary['total_seconds']} s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
