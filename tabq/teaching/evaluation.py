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
    sure: int = 0                 # answers not flagged unsure
    right_sure: int = 0           # of which right

    @property
    def sure_accuracy(self) -> float | None:
        """Right among the answers not flagged unsure; None when every answer was flagged."""
        return self.right_sure / self.sure if self.sure else None

    @property
    def flagged(self) -> float:
        """The share of answers flagged unsure."""
        return 1 - self.sure / self.examples if self.examples else 0.0


def evaluate(model: Model, jobs: list[Job], workers: int | None = None,
             execute: int = EXECUTE) -> EvalReport:
    answers = run_parallel(answer_batch, jobs, model, execute, "answering", workers)
    right = reach = sure = right_sure = 0
    kinds: dict[str, list[int]] = defaultdict(lambda: [0, 0])
    seconds = []
    for job in jobs:
        got = answers[job.id]
        ok = matches(got["answer"], job.answer) if got["answer"] else False
        right += ok
        reach += got["oracle"]
        sure += not got["unsure"]
        right_sure += ok and not got["unsure"]
        seconds.append(got["seconds"])
        if job.kind:
            kinds[job.kind][0] += ok
            kinds[job.kind][1] += 1
    n = max(len(jobs), 1)
    return EvalReport(right / n, reach / n, len(jobs), sum(seconds) / n,
                      {k: tuple(v) for k, v in sorted(kinds.items())}, answers,
                      sure, right_sure)


def write_predictions(path: str | Path, jobs: Iterable[Job], report: EvalReport) -> None:
    """One {"id", "answer", "sql", "confidence", "unsure", "unsure_reason"} a line; a full disk
    is said as one line naming the file."""
    try:
        with open(path, "w", encoding="utf-8") as f:
            for job in jobs:
                got = report.predictions[job.id]
                line = {"id": job.id, "answer": got["answer"], "sql": got["sql"],
                        "confidence": round(got["confidence"], 4), "unsure": got["unsure"],
                        "unsure_reason": got["unsure_reason"]}
                f.write(json.dumps(line, ensure_ascii=False) + "\n")
    except OSError as err:
        raise TabqError(f"cannot write the predictions to {path}: {reason(err)}") from None
