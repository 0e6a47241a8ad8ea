"""Teaching and evaluating over example files, in parallel, with the model folder's log.

Examples are JSON lines: `{"question", "answer"}` for `tabq teach` (the table is given), and
`{"id", "question", "table", "answer"}` for `tabq eval` (the table relative to the file).
"""

from __future__ import annotations

import datetime
import hashlib
import json
import multiprocessing
import os
import sys
import time
from collections import defaultdict
from collections.abc import Iterable
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path

from tqdm import tqdm

from . import api
from .answers import matches
from .errors import InputError, TabqError
from .derive import PAIR_BEAM
from .learn import (SETTLE_BATCH, TEACH_PAIR_BEAM, TRAIN_EXECUTE, Example, candidates,
                    settle, train)
from .lexicon import apply_import, is_confirmation, senses, since_replace
from .model import Model
from .store import ModelFolder

DEFAULT_OBJECTIVE = "hinge"   # better on the WTQ dev split: see docs/results.md
EPOCHS = 3
REPLAY = 200                        # earlier confirmations replayed with each new batch


class ExamplesError(InputError):
    """An examples file is missing, or one of its lines is not an example."""


@dataclass
class Job:
    """One question to answer or learn from, with its gold answer."""

    id: str
    question: str
    table: str
    answer: list
    kind: str | None = None
    extra: dict = field(default_factory=dict)


def read_examples(path: str | Path, table: str | Path | None = None) -> list[Job]:
    """Every example of a JSON-lines file, or a clear error naming the first bad line."""
    path = Path(path)
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except FileNotFoundError:
        raise ExamplesError(f"{path}: no such file") from None
    except (OSError, UnicodeDecodeError) as err:
        raise ExamplesError(f"{path}: cannot be read as text ({err.__class__.__name__})") from None
    jobs = []
    for number, line in enumerate(lines, 1):
        if not line.strip():
            continue
        try:
            data = json.loads(line)
        except json.JSONDecodeError as err:
            raise ExamplesError(f"{path}:{number}: not JSON ({err.msg})") from None
        jobs.append(_job(data, path, number, table))
    if not jobs:
        raise ExamplesError(f"{path}: holds no examples")
    return jobs


def _job(data, path: Path, number: int, table) -> Job:
    where = f"{path}:{number}"
    if not isinstance(data, dict):
        raise ExamplesError(f"{where}: an example must be a JSON object")
    question, answer = data.get("question"), data.get("answer")
    if not isinstance(question, str) or not question.strip():
        raise ExamplesError(f"{where}: needs a non-empty \"question\" string")
    if not isinstance(answer, list):
        answer = [answer] if isinstance(answer, (str, int, float)) else None
    if not answer or not all(isinstance(v, (str, int, float)) for v in answer):
        raise ExamplesError(f"{where}: needs an \"answer\": a list of strings or numbers")
    if table is None:
        name = data.get("table")
        if not isinstance(name, str) or not name:
            raise ExamplesError(f"{where}: needs a \"table\" (a path relative to the file)")
        table = path.parent / name
    return Job(str(data.get("id", number)), question, str(Path(table).resolve()), answer,
               data.get("kind"))


# ── running many questions ────────────────────────────────────────────────────────────────────
_WORKER_MODEL: Model | None = None


def _init(weights: dict[str, float]) -> None:
    global _WORKER_MODEL
    _WORKER_MODEL = Model(weights)


def _by_table(jobs: list[Job]) -> list[list[Job]]:
    groups: dict[str, list[Job]] = defaultdict(list)
    for job in jobs:
        groups[job.table].append(job)
    return list(groups.values())


def _learning_batch(jobs: list[Job], execute: int,
                    pair_beam: int = PAIR_BEAM) -> list[tuple[str, Example | str]]:
    out = []
    try:
        table = api.OpenTable(api.load_table(jobs[0].table), _WORKER_MODEL)
    except TabqError as err:
        return [(job.id, f"table: {err}") for job in jobs]
    for job in jobs:
        try:
            out.append((job.id, candidates(table, job.question, job.answer, execute,
                                           job.extra.get("rows"), job.extra.get("rows_answer"),
                                           job.extra.get("meant"), pair_beam)))
        except TabqError as err:
            out.append((job.id, str(err)))
    return out


def _answer_batch(jobs: list[Job], execute: int) -> list[tuple[str, dict]]:
    out = []
    try:
        table = api.OpenTable(api.load_table(jobs[0].table), _WORKER_MODEL)
    except TabqError as err:
        return [(job.id, {"answer": [], "sql": None, "error": str(err), "oracle": False,
                          "seconds": 0.0}) for job in jobs]
    for job in jobs:
        start = time.perf_counter()
        try:
            result = table.ask(job.question, execute=execute)
        except TabqError as err:
            out.append((job.id, {"answer": [], "sql": None, "error": str(err), "oracle": False,
                                 "seconds": time.perf_counter() - start}))
            continue
        oracle = any(not c.error and matches(c.answer, job.answer) for c in result.candidates)
        out.append((job.id, {"answer": _plain(result.answer), "sql": result.sql,
                             "oracle": oracle, "seconds": time.perf_counter() - start}))
    return out


def _plain(values: list) -> list:
    return [list(v) if isinstance(v, tuple) else v for v in values]


def run_parallel(fn, jobs: list[Job], model: Model, execute: int, label: str,
                 workers: int | None = None, *more) -> dict[str, object]:
    """fn(group, execute, *more) over the jobs grouped by table, on up to `workers` processes,
    with a progress bar."""
    workers = workers or min(2, os.cpu_count() or 1)
    groups = _by_table(jobs)
    results: dict[str, object] = {}
    bar = tqdm(total=len(jobs), desc=label, unit="q", file=sys.stderr,
               disable=len(jobs) < 20 or not sys.stderr.isatty() and os.environ.get(
                   "TABQ_PROGRESS") != "1")
    if workers <= 1 or len(groups) <= 1:
        _init(model.as_dict())
        for group in groups:
            results.update(fn(group, execute, *more))
            bar.update(len(group))
    else:
        context = multiprocessing.get_context("fork")
        with ProcessPoolExecutor(workers, mp_context=context, initializer=_init,
                                 initargs=(model.as_dict(),)) as pool:
            futures = [(pool.submit(fn, group, execute, *more), len(group)) for group in groups]
            for future, n in futures:
                results.update(future.result())
                bar.update(n)
    bar.close()
    return results


# ── teaching ──────────────────────────────────────────────────────────────────────────────────
@dataclass
class TeachReport:
    taught: int
    reachable: int
    replayed: int
    skipped: list[str]          # ids whose question or table failed
    not_simplest: int = 0       # targets larger than the simplest reading giving the answer
    records: list[dict] = field(default_factory=list)   # what teach() appended to the log


def learn_from(model: Model, jobs: list[Job], objective: str = DEFAULT_OBJECTIVE,
               epochs: int = EPOCHS, workers: int | None = None,
               execute: int = TRAIN_EXECUTE, cache: dict[tuple, Example] | None = None,
               fresh: list[Job] | None = None,
               ) -> tuple[Model, TeachReport, dict[str, Example]]:
    """A new model taught by these jobs (the old one is not changed).

    Candidates are searched with the model as it is; the examples none of whose candidates
    gave the confirmed answer are searched again with the model the others taught (what it
    learned about the team's words widens the search where it was blind), and learning runs
    again from the old model on everything found. `cache` (by `example_key`) holds candidate
    searches already done: a long-running caller such as the app passes one so that replayed
    confirmations are not searched again.

    `fresh` names the jobs being taught now (the rest are replayed). A few of them (at most
    SETTLE_BATCH) is an analyst teaching words: the search is wider and the fresh examples are
    settled after training (`learn.settle`), so that one confirmation is enough. More is batch
    learning, left to the averaged passes alone.
    """
    cache = {} if cache is None else cache
    teaching = fresh is not None and len(fresh) <= SETTLE_BATCH
    beam = TEACH_PAIR_BEAM if teaching else PAIR_BEAM
    todo = [job for job in jobs if example_key(job, beam) not in cache]
    found: dict[str, object] = dict(run_parallel(_learning_batch, todo, model, execute,
                                                 "learning", workers, beam)) if todo else {}
    for job in todo:
        if isinstance(found.get(job.id), Example):
            cache[example_key(job, beam)] = found[job.id]
    for job in jobs:
        if job.id not in found:
            found[job.id] = cache[example_key(job, beam)]
    examples = {k: v for k, v in found.items() if isinstance(v, Example)}
    skipped = [k for k, v in found.items() if not isinstance(v, Example)]
    taught, report = _train_on(model, jobs, examples, objective, epochs)
    unreached = [j for j in jobs if j.id in examples and not examples[j.id].reachable]
    if unreached and report.reachable:
        again = run_parallel(_learning_batch, unreached, taught, execute, "searching again",
                             workers, beam)
        found_now = {k: v for k, v in again.items() if isinstance(v, Example) and v.reachable}
        cache.update((example_key(j, beam), found_now[j.id]) for j in unreached
                     if j.id in found_now)
        if found_now:
            examples.update(found_now)
            taught, report = _train_on(model, jobs, examples, objective, epochs)
    if teaching:
        taught = settle(taught, [examples[j.id] for j in fresh if j.id in examples])
    return taught, TeachReport(report.examples, report.reachable, 0, skipped,
                               report.not_simplest), examples


def _train_on(model: Model, jobs: list[Job], examples: dict[str, Example], objective: str,
              epochs: int):
    ordered = [examples[j.id] for j in jobs if j.id in examples]
    weights = [j.extra.get("strength", 1.0) for j in jobs if j.id in examples]
    return train(model, ordered, objective, epochs, weight=lambda i: weights[i])


def example_key(job: Job, pair_beam: int = PAIR_BEAM) -> tuple:
    """What decides a candidate search's outcome besides the model: the cache key."""
    return (job.table, job.question, json.dumps(job.answer, sort_keys=True),
            json.dumps({k: job.extra.get(k) for k in SEARCH_EXTRA}, sort_keys=True), pair_beam)


def live(log: list[dict]) -> list[dict]:
    """The confirmations of a log that still count: retraction records and the confirmations
    they retract are left out (both stay in the log: nothing taught is ever lost)."""
    retracted = {(r["retract"], r.get("of_batch")) for r in log if "retract" in r}
    return [r for r in log if "retract" not in r
            and (r.get("id"), r.get("batch")) not in retracted]


def teach(folder: ModelFolder, jobs: list[Job], objective: str = DEFAULT_OBJECTIVE,
          epochs: int = EPOCHS, workers: int | None = None,
          cache: dict[tuple, Example] | None = None) -> TeachReport:
    """Teach a model folder: learn from the new jobs plus a replay of recent confirmations,
    then log the new ones and save, all under the folder's lock."""
    with folder.locked():
        log = folder.read_log()
        batch = _next_batch(log)
        replay = [_job_of(r) for r in _replayable(live(log))[-REPLAY:]]
        model = folder.load()
        taught, report, examples = learn_from(model, replay + jobs, objective, epochs, workers,
                                              cache=cache, fresh=jobs)
        records = [_record(job, examples.get(job.id), batch) for job in jobs]
        folder.append_log(records)
        folder.save(taught, objective=objective, batches=batch)
    report.replayed, report.records = len(replay), records
    report.taught -= len([j for j in replay if j.id in examples])
    return report


def retract(folder: ModelFolder, record: dict, before: Model | None = None,
            objective: str = DEFAULT_OBJECTIVE, epochs: int = EPOCHS,
            cache: dict[tuple, Example] | None = None) -> Model:
    """Take back one logged confirmation: append a retraction record, then save the weights
    without it — `before` (the weights saved just before it was taught) when it is still the
    last batch of the log, else the model rebuilt from the log. Returns the saved model."""
    with folder.locked():
        log = folder.read_log()
        last = _next_batch(log) - 1
        folder.append_log([{"retract": record["id"], "of_batch": record["batch"],
                            "time": _now(), "batch": last + 1}])
        if before is None or record["batch"] != last:
            before = rebuild(folder, objective, epochs, workers=1, cache=cache)
        folder.save(before, objective=objective, batches=last + 1)
    return before


def rebuild(folder: ModelFolder, objective: str = DEFAULT_OBJECTIVE, epochs: int = EPOCHS,
            workers: int | None = None, cache: dict[tuple, Example] | None = None) -> Model:
    """The model the log describes: every batch taught again, in order, from the prior."""
    log = live(folder.read_log())
    model = Model.prior()
    batches: dict[int, list[dict]] = defaultdict(list)
    for record in log:
        batches[record.get("batch", 0)].append(record)
    seen: list[dict] = []
    for number in sorted(batches):
        for record in batches[number]:
            if record.get("kind") == "import":       # a lexicon file loaded in (lexicon.py)
                model = apply_import(model, record)
                seen = [] if record.get("mode") == "replace" else seen
        confirmed = [r for r in batches[number] if is_confirmation(r)]
        if not confirmed:
            continue
        replay = [_job_of(r) for r in seen[-REPLAY:]]
        new = [_job_of(r) for r in confirmed]
        model, _, _ = learn_from(model, replay + new, objective, epochs, workers, cache=cache,
                                 fresh=new)
        seen += confirmed
    return model


def _replayable(log: list[dict]) -> list[dict]:
    """Confirmations still in force: those after the last lexicon import that replaced all."""
    return [r for r in since_replace(log) if is_confirmation(r)]


SEARCH_EXTRA = ("rows", "rows_answer", "meant")   # Job.extra keys that change a search's outcome
EXTRA = ("strength", *SEARCH_EXTRA)                # Job.extra keys a log record keeps


def _next_batch(log: list[dict]) -> int:
    return 1 + max((r.get("batch", 0) for r in log), default=0)


def _now() -> str:
    return datetime.datetime.now(datetime.timezone.utc).isoformat(timespec="seconds")


def _record(job: Job, example: Example | None, batch: int) -> dict:
    target, fired = None, []
    if example is not None and example.reachable:
        chosen = example.correct.index(True)
        target, fired = example.forms[chosen], senses(example.features(chosen))
    return {"id": job.id, "question": job.question, "table": job.table,
            "fingerprint": _fingerprint(job.table), "answer": job.answer, "query": target,
            "senses": fired,   # what the query means, for the lexicon's support counts
            "time": _now(), "batch": batch,
            **{k: job.extra[k] for k in EXTRA if k in job.extra}}


def _fingerprint(table: str) -> str | None:
    """The sha256 of the table file, as the loader computes it for a plain file."""
    digest = hashlib.sha256()
    try:
        with open(table, "rb") as f:
            for chunk in iter(lambda: f.read(1 << 20), b""):
                digest.update(chunk)
    except OSError:
        return None
    return digest.hexdigest()


def _job_of(record: dict) -> Job:
    extra = {k: record[k] for k in EXTRA if k in record}
    return Job(f"log:{record.get('batch')}:{record.get('id')}", record["question"],
               record["table"], record["answer"], extra=extra)


# ── evaluating ────────────────────────────────────────────────────────────────────────────────
@dataclass
class EvalReport:
    accuracy: float
    oracle: float
    examples: int
    seconds_per_question: float
    by_kind: dict[str, tuple[int, int]]
    predictions: dict[str, dict]


def evaluate(model: Model, jobs: list[Job], workers: int | None = None,
             execute: int = api.EXECUTE) -> EvalReport:
    answers = run_parallel(_answer_batch, jobs, model, execute, "answering", workers)
    right = reach = 0
    kinds: dict[str, list[int]] = defaultdict(lambda: [0, 0])
    seconds = []
    for job in jobs:
        got = answers[job.id]
        ok = matches(got["answer"], job.answer) if got["answer"] else False
        right += ok
        reach += got["oracle"]
        seconds.append(got["seconds"])
        if job.kind:
            kinds[job.kind][0] += ok
            kinds[job.kind][1] += 1
    n = max(len(jobs), 1)
    return EvalReport(right / n, reach / n, len(jobs), sum(seconds) / n,
                      {k: tuple(v) for k, v in sorted(kinds.items())}, answers)


def write_predictions(path: str | Path, jobs: Iterable[Job], report: EvalReport) -> None:
    with open(path, "w", encoding="utf-8") as f:
        for job in jobs:
            got = report.predictions[job.id]
            f.write(json.dumps({"id": job.id, "answer": got["answer"], "sql": got["sql"]},
                               ensure_ascii=False) + "\n")
