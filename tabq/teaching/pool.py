"""Many questions at once: jobs grouped by table, on up to two worker processes.

Each group loads its table once in a worker; the model is sent to the workers once, when the
pool starts.
"""

from __future__ import annotations

import multiprocessing
import os
import sys
import time
from collections import defaultdict
from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor

from tqdm import tqdm

from ..answers import matches
from ..pipeline import OpenTable
from ..errors import TabqError
from ..learn import Example, candidates
from ..load import load_table
from ..model import Model
from ..progress import drawing
from .examples import Job

_WORKER_MODEL: Model | None = None

COUNTED_FROM = 20      # questions from which a search shows a counting bar (fewer: a line)


def _init(weights: dict[str, float]) -> None:
    global _WORKER_MODEL
    _WORKER_MODEL = Model(weights)


def _by_table(jobs: list[Job]) -> list[list[Job]]:
    groups: dict[tuple, list[Job]] = defaultdict(list)
    for job in jobs:
        groups[job.table, job.table_name, job.reading].append(job)
    return list(groups.values())


def _open(jobs: list[Job]) -> OpenTable:
    first = jobs[0]
    return OpenTable(load_table(first.table, first.table_name, first.reading), _WORKER_MODEL)


def search_batch(jobs: list[Job], execute: int, pair_beam: int) -> list[tuple[str, Example | str]]:
    """Each job's candidates, marked by whether they give its answer; or why it failed."""
    out: list[tuple[str, Example | str]] = []
    try:
        table = _open(jobs)
    except TabqError as err:
        return [(job.id, f"table: {err}") for job in jobs]
    for job in jobs:
        try:
            out.append((job.id, candidates(table, job.question, job.answer, execute, job.rows,
                                           job.rows_answer, job.meant, pair_beam,
                                           job.team_words)))
        except TabqError as err:
            out.append((job.id, str(err)))
    return out


_NO_ANSWER = {"confidence": 0.0, "unsure": True, "unsure_reason": "no answer"}


def answer_batch(jobs: list[Job], execute: int) -> list[tuple[str, dict]]:
    """Each job's top answer and SQL, how sure of it and why not, whether a candidate gave its
    gold answer, and the time."""
    out = []
    try:
        table = _open(jobs)
    except TabqError as err:
        return [(job.id, {"answer": [], "sql": None, "error": str(err), "oracle": False,
                          **_NO_ANSWER, "seconds": 0.0}) for job in jobs]
    for job in jobs:
        start = time.perf_counter()
        try:
            result = table.ask(job.question, execute=execute)
        except TabqError as err:
            out.append((job.id, {"answer": [], "sql": None, "error": str(err), "oracle": False,
                                 **_NO_ANSWER, "seconds": time.perf_counter() - start}))
            continue
        oracle = any(not c.error and matches(c.answer, job.answer) for c in result.candidates)
        out.append((job.id, {"answer": _plain(result.answer), "sql": result.sql,
                             "confidence": result.confidence, "unsure": result.unsure,
                             "unsure_reason": result.unsure_reason,
                             "oracle": oracle, "seconds": time.perf_counter() - start}))
    return out


def _plain(values: list) -> list:
    return [list(v) if isinstance(v, tuple) else v for v in values]


def run_parallel(fn: Callable, jobs: list[Job], model: Model, execute: int, label: str,
                 workers: int | None = None, *more) -> dict[str, object]:
    """fn(group, execute, *more) over the jobs grouped by table, on up to `workers` processes,
    with a progress bar on a terminal."""
    workers = workers or min(2, os.cpu_count() or 1)
    groups = _by_table(jobs)
    results: dict[str, object] = {}
    bar = tqdm(total=len(jobs), desc=label, unit="q", file=sys.stderr,
               disable=len(jobs) < COUNTED_FROM or drawing() or not sys.stderr.isatty()
               and os.environ.get("TABQ_PROGRESS") != "1")
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
