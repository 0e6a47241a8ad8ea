"""Teaching a model folder: its log is the model, its weights file a cache of the log.

Every change happens under the folder's lock: read the log, learn, append the new records,
save the weights. Rebuilding replays the log batch by batch, as each was taught, so it gives
the weights that teaching saved.
"""

from __future__ import annotations

from collections import defaultdict

from .. import lexicon, records
from ..featurenames import senses
from ..learn import TEACH_PAIR_BEAM, Example
from ..lexicon import apply_import
from ..model import Model
from ..records import Confirmation, Import, Retraction
from ..store import ModelFolder, as_saved
from .examples import Job, job_of
from .learning import DEFAULT_OBJECTIVE, EPOCHS, Searches, TeachReport, learn_from

REPLAY = 200                  # earlier confirmations replayed with each new batch


def teach(folder: ModelFolder, jobs: list[Job], objective: str = DEFAULT_OBJECTIVE,
          epochs: int = EPOCHS, workers: int | None = None,
          searches: Searches | None = None) -> TeachReport:
    """Teach a model folder: learn from the new jobs plus a replay of recent confirmations,
    then log the new ones and save, all under the folder's lock."""
    with folder.locked():
        log = folder.read_log()
        batch = records.next_batch(log)
        replay = [job_of(r) for r in replayable(log)[-REPLAY:]]
        model = _cached_or_rebuilt(folder, log, objective, epochs, workers, searches)
        taught, report, examples = learn_from(model, replay + jobs, objective, epochs, workers,
                                              searches=searches, fresh=jobs)
        new = [_confirmation(job, examples.get(job.id), batch) for job in jobs]
        folder.append_log(new)
        folder.save(taught, objective=objective, batches=batch)
    report.replayed, report.records = len(replay), new
    report.taught -= len([j for j in replay if j.id in examples])
    return report


def retract(folder: ModelFolder, record: Confirmation, before: Model | None = None,
            objective: str = DEFAULT_OBJECTIVE, epochs: int = EPOCHS,
            searches: Searches | None = None) -> Model:
    """Take back one logged confirmation: append a retraction record, then save the weights
    without it — `before` (the weights saved just before it was taught) when it is still the
    last batch of the log, else the model rebuilt from the log. Returns the saved model."""
    with folder.locked():
        log = folder.read_log()
        last = records.next_batch(log) - 1
        folder.append_log([Retraction(record.id, record.batch, records.now(), last + 1)])
        if before is None or record.batch != last:
            before = rebuild(folder, objective, epochs, workers=1, searches=searches)
        folder.save(before, objective=objective, batches=last + 1)
    return before


def rebuild(folder: ModelFolder, objective: str = DEFAULT_OBJECTIVE, epochs: int = EPOCHS,
            workers: int | None = None, searches: Searches | None = None) -> Model:
    """The model the log describes: every batch taught again, in order, from the prior, each
    starting from the weights as the folder saved them."""
    log = records.live(folder.read_log())
    model = Model.prior()
    batches: dict[int, list[records.Record]] = defaultdict(list)
    for record in log:
        batches[record.batch].append(record)
    seen: list[Confirmation] = []
    for number in sorted(batches):
        for record in batches[number]:
            if isinstance(record, Import):       # a lexicon file loaded in (lexicon.py)
                model = as_saved(apply_import(model, record))
                seen = [] if record.mode == "replace" else seen
        confirmed = records.confirmations(batches[number])
        if not confirmed:
            continue
        replay = [job_of(r) for r in seen[-REPLAY:]]
        new = [job_of(r) for r in confirmed]
        model, _, _ = learn_from(model, replay + new, objective, epochs, workers,
                                 searches=searches, fresh=new)
        model = as_saved(model)
        seen += confirmed
    return model


def current(folder: ModelFolder, objective: str = DEFAULT_OBJECTIVE, epochs: int = EPOCHS,
            workers: int | None = None) -> Model:
    """The folder's model. The weights file is a cache of the log: when it is missing and
    the log taught something, the model is rebuilt from the log and saved."""
    if folder.has_weights() or not folder.has_log():
        return folder.load()
    with folder.locked():
        return _cached_or_rebuilt(folder, folder.read_log(), objective, epochs, workers)


def _cached_or_rebuilt(folder: ModelFolder, log: list[records.Record], objective: str,
                       epochs: int, workers: int | None,
                       searches: Searches | None = None) -> Model:
    """The saved weights, or (under the lock) the log rebuilt and saved when they are gone."""
    if folder.has_weights() or not records.live(log):
        return folder.load()
    model = rebuild(folder, objective, epochs, workers, searches)
    folder.save(model, objective=objective, batches=records.next_batch(log) - 1)
    return folder.load()


def export_lexicon(folder: ModelFolder, out) -> lexicon.Lexicon:
    """Write what the folder learned to a lexicon file (its weights rebuilt first if gone)."""
    current(folder)
    return lexicon.export(folder, out)


def import_lexicon(folder: ModelFolder, path, mode: str = "merge") -> lexicon.ImportReport:
    """Load a lexicon file into the folder, on top of what its log taught."""
    current(folder)
    return lexicon.import_file(folder, path, mode)


def lexicon_of(folder: ModelFolder) -> lexicon.Lexicon:
    """The folder's lexicon, with support counted from its log."""
    current(folder)
    return lexicon.from_folder(folder)


def replayable(log: list[records.Record]) -> list[Confirmation]:
    """Confirmations still in force: not retracted, and after the last lexicon import that
    replaced the whole model."""
    return records.confirmations(records.since_replace(records.live(log)))


def warm(folder: ModelFolder, searches: Searches) -> int:
    """Search the log's recent confirmations ahead of the first teaching, as teaching will
    search them; returns how many were searched."""
    replay = [job_of(r) for r in replayable(folder.read_log())[-REPLAY:]]
    todo = [j for j in replay if searches.get(j, TEACH_PAIR_BEAM) is None]
    if todo:   # fresh=[]: searched with the teaching beam, settles nothing
        learn_from(folder.load(), todo, workers=1, searches=searches, fresh=[])
    return len(todo)


def _confirmation(job: Job, example: Example | None, batch: int) -> Confirmation:
    target, fired = None, []
    if example is not None and example.reachable:
        chosen = example.correct.index(True)
        target, fired = example.forms[chosen], senses(example.features(chosen))
    table = example.table if example is not None and example.table is not None else (
        records.TableRef(job.table, job.table_name, None, job.reading))
    return Confirmation(job.id, job.question, table, job.answer, target, fired, records.now(),
                        batch, None if job.strength == 1.0 else job.strength, job.rows,
                        job.rows_answer, job.meant)
