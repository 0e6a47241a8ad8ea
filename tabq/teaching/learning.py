"""Learning from many confirmations: candidate searches (cached, in parallel), then training."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from .. import logic as L
from ..analyse import phrase_span, phrase_stems
from ..definitions import defined_in, remember

from ..pipeline import OpenTable
from ..derive import PAIR_BEAM
from ..learn import SETTLE_BATCH, TEACH_PAIR_BEAM, TRAIN_EXECUTE, Example, candidates, settle
from ..learn import train
from ..model import Model
from ..records import Confirmation
from .examples import Job
from .pool import run_parallel, search_batch

DEFAULT_OBJECTIVE = "hinge"   # better on the WTQ dev split: see docs/results.md
EPOCHS = 3


class Searches:
    """Candidate searches already done, by job and beam. A long-running caller (the app) keeps
    one, so that replayed confirmations are not searched again with each new one."""

    def __init__(self) -> None:
        self.found: dict[tuple, Example] = {}

    def get(self, job: Job, beam: int) -> Example | None:
        return self.found.get((job.search_key, beam))

    def put(self, job: Job, beam: int, example: Example) -> None:
        self.found[job.search_key, beam] = example

    def search_here(self, table: OpenTable, job: Job) -> Example:
        """Search a fresh confirmation on a table already open, as teaching would search it."""
        example = candidates(table, job.question, job.answer, TRAIN_EXECUTE, job.rows,
                             job.rows_answer, job.meant, TEACH_PAIR_BEAM)
        self.put(job, TEACH_PAIR_BEAM, example)
        return example


@dataclass
class TeachReport:
    taught: int
    reachable: int
    replayed: int
    skipped: list[str]          # ids whose question or table failed
    not_simplest: int = 0       # targets larger than the simplest reading giving the answer
    records: list[Confirmation] = field(default_factory=list)   # what teach() logged


def learn_from(model: Model, jobs: list[Job], objective: str = DEFAULT_OBJECTIVE,
               epochs: int = EPOCHS, workers: int | None = None,
               execute: int = TRAIN_EXECUTE, searches: Searches | None = None,
               fresh: list[Job] | None = None,
               ) -> tuple[Model, TeachReport, dict[str, Example]]:
    """A new model taught by these jobs (the old one is not changed).

    Candidates are searched with the model as it is; the examples none of whose candidates
    gave the confirmed answer are searched again with the model the others taught (what it
    learned about the team's words widens the search where it was blind), and learning runs
    again from the old model on everything found.

    `fresh` names the jobs being taught now (the rest are replayed). A few of them (at most
    SETTLE_BATCH) is an analyst teaching words: the search is wider and the fresh examples are
    settled after training (`learn.settle`), so that one confirmation is enough. More is batch
    learning, left to the averaged passes alone.
    """
    searches = Searches() if searches is None else searches
    teaching = fresh is not None and len(fresh) <= SETTLE_BATCH
    beam = TEACH_PAIR_BEAM if teaching else PAIR_BEAM
    todo = [job for job in jobs if searches.get(job, beam) is None]
    found: dict[str, object] = dict(run_parallel(search_batch, todo, model, execute,
                                                 "learning", workers, beam)) if todo else {}
    for job in todo:
        if isinstance(found.get(job.id), Example):
            searches.put(job, beam, found[job.id])
    for job in jobs:
        if job.id not in found:
            found[job.id] = searches.get(job, beam)
    examples = {k: v for k, v in found.items() if isinstance(v, Example)}
    skipped = [k for k, v in found.items() if not isinstance(v, Example)]
    shared = shared_definitions(jobs, examples)
    if shared:   # each confirmation of a team word judges every definition the others found
        again = run_parallel(search_batch, shared, model, execute, "comparing definitions",
                             workers, beam)
        examples.update({k: v for k, v in again.items() if isinstance(v, Example)})
    taught, report = _train_on(model, jobs, examples, objective, epochs)
    unreached = [j for j in jobs if j.id in examples and not examples[j.id].reachable]
    if unreached and report.reachable:
        again = run_parallel(search_batch, unreached, taught, execute, "searching again",
                             workers, beam)
        found_now = {k: v for k, v in again.items() if isinstance(v, Example) and v.reachable}
        for job in unreached:
            if job.id in found_now:
                searches.put(job, beam, found_now[job.id])
        if found_now:
            examples.update(found_now)
            taught, report = _train_on(model, jobs, examples, objective, epochs)
    if teaching:
        taught = settle(taught, [examples[j.id] for j in fresh if j.id in examples])
    remember(taught, examples.values())
    return taught, TeachReport(report.examples, report.reachable, 0, skipped,
                               report.not_simplest), examples


def shared_definitions(jobs: list[Job], examples: dict[str, Example]) -> list[Job]:
    """The jobs that say a team word some example's candidates define, each with every
    definition of its words that any example found (none already offered to it)."""
    by_word: dict[str, set[L.Defined]] = {}
    own: dict[str, set[L.Defined]] = {}
    for job_id, example in examples.items():
        own[job_id] = {node for text in example.forms for node in defined_in(text)}
        for defined in own[job_id]:
            by_word.setdefault(defined.word, set()).add(defined)
    out = []
    for job in jobs:
        stems = phrase_stems(job.question)
        offer = {d for word, defs in by_word.items() if phrase_span(stems, word) for d in defs}
        if job.id in examples and offer - own.get(job.id, set()):
            out.append(replace(job, team_words=tuple(sorted(offer, key=str))))
    return out


def _train_on(model: Model, jobs: list[Job], examples: dict[str, Example], objective: str,
              epochs: int):
    ordered = [examples[j.id] for j in jobs if j.id in examples]
    weights = [j.strength for j in jobs if j.id in examples]
    return train(model, ordered, objective, epochs, weight=lambda i: weights[i])
