"""Measuring a model on examples with known answers (`tabq eval`)."""

from __future__ import annotations

import json
from collections import defaultdict
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path

from ..answers import matches
from ..errors import TabqError
from ..pipeline import EXECUTE
from ..model import Model
from ..safeio import reason
from .examples import Job
from .pool import answer_batch, run_parallel


@dataclass
class EvalReport:
    accuracy: float
    oracle: float
    examples: int
    seconds_per_question: float
    by_kind: dict[str, tuple[int, int]]
    predictions: dict[str, dict]


def evaluate(model: Model, jobs: list[Job], workers: int | None = None,
             execute: int = EXECUTE) -> EvalReport:
    answers = run_parallel(answer_batch, jobs, model, execute, "answering", workers)
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
    """One {"id", "answer", "sql"} a line; a full disk is said as one line naming the file."""
    try:
        with open(path, "w", encoding="utf-8") as f:
            for job in jobs:
                got = report.predictions[job.id]
                f.write(json.dumps({"id": job.id, "answer": got["answer"], "sql": got["sql"]},
                                   ensure_ascii=False) + "\n")
    except OSError as err:
        raise TabqError(f"cannot write the predictions to {path}: {reason(err)}") from None
