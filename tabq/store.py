"""store: the model folder — learned weights, the log of confirmations, a lock.

    weights.json    {"format": "tabq-weights", "version": 1, "learned": {...}, ...} — what
                    teaching moved, as offsets from the prior (so a better prior in a later
                    tabq still reaches a taught model)
    log.jsonl       what was taught, one record a line, append-only (records.py): the
                    model itself, of which weights.json is a cache
    lock            held (flock) while a process reads, learns and writes

Weights are written to a temporary file and renamed over the old one, so a kill at any moment
leaves either the old or the new weights.
"""

from __future__ import annotations

import contextlib
import fcntl
import json
import os
import tempfile
from collections.abc import Iterator
from pathlib import Path

import platformdirs

from . import records
from .errors import ModelError
from .model import FORMAT_VERSION, Model

WEIGHTS = "weights.json"
LOG = "log.jsonl"
LOCK = "lock"
FORMAT = "tabq-weights"
KNOWN = {WEIGHTS, LOG, LOCK}
MODEL_ENV = "TABQ_MODEL"    # a model folder that stands in for the per-user one everywhere


def default_folder() -> Path:
    """The model folder used when none is given (`tabq ask`, `teach`, `ui`, `lexicon` and
    `tabq.open`): the folder named by $TABQ_MODEL, else the per-user one (platformdirs)."""
    named = os.environ.get(MODEL_ENV, "").strip()
    if named:
        return Path(named).expanduser()
    return Path(platformdirs.user_data_dir("tabq", appauthor=False)) / "model"


class ModelFolder:
    """One model on disk. Read it with `load`; teach under `locked()`."""

    def __init__(self, path: str | Path | None = None):
        self.path = Path(path) if path is not None else default_folder()
        if self.path.exists() and not self.path.is_dir():
            raise ModelError(f"{self.path}: a model must be a folder, this is a file")

    # ── weights ────────────────────────────────────────────────────────────────────────────
    def load(self) -> Model:
        """The model in the folder: the prior when nothing was learned yet."""
        path = self.path / WEIGHTS
        if not path.exists():
            return Model.prior()
        try:
            data = json.loads(path.read_text(encoding="utf-8"))
        except (OSError, UnicodeDecodeError, json.JSONDecodeError) as err:
            raise ModelError(f"{path}: not a readable tabq weights file "
                             f"({err.__class__.__name__}); it was left as it is") from err
        if not isinstance(data, dict) or data.get("format") != FORMAT:
            raise ModelError(f"{path}: not a tabq weights file; it was left as it is")
        if data.get("version") != FORMAT_VERSION:
            raise ModelError(f"{path}: weights format version {data.get('version')!r}; this "
                             f"tabq reads version {FORMAT_VERSION}")
        learned = data.get("learned")
        if not isinstance(learned, dict) or not all(
                isinstance(k, str) and isinstance(v, (int, float)) and not isinstance(v, bool)
                for k, v in learned.items()):
            raise ModelError(f"{path}: learned weights must map feature names to numbers")
        return _from_learned(learned)

    def save(self, model: Model, **meta) -> None:
        """Write the weights atomically (temporary file, fsync, rename)."""
        self.path.mkdir(parents=True, exist_ok=True)
        data = {"format": FORMAT, "version": FORMAT_VERSION, **meta, "learned": _learned(model)}
        atomic_write(self.path / WEIGHTS, json.dumps(data, ensure_ascii=False, indent=0))

    def has_weights(self) -> bool:
        return (self.path / WEIGHTS).exists()

    def has_log(self) -> bool:
        return (self.path / LOG).exists()

    # ── log ──────────────────────────────────────────────────────────────────────────────
    def read_log(self) -> list[records.Record]:
        """Every record of the folder's log, oldest first (see records.py)."""
        return records.read(self.path / LOG)

    def append_log(self, new: list[records.Record]) -> None:
        """Add records to the log, synced to disk before returning."""
        records.append(self.path / LOG, new)

    # ── lock ───────────────────────────────────────────────────────────────────────────────
    @contextlib.contextmanager
    def locked(self) -> Iterator[ModelFolder]:
        """Hold the folder for one read-learn-write: other teachers wait, nothing is lost."""
        self.path.mkdir(parents=True, exist_ok=True)
        foreign = [p.name for p in self.path.iterdir()
                   if p.name not in KNOWN and not p.name.startswith(".tmp-")]
        if foreign and not (self.path / WEIGHTS).exists() and not (self.path / LOG).exists():
            raise ModelError(f"{self.path}: not a tabq model folder (it holds {foreign[0]!r}); "
                             "choose an empty or new folder")
        with open(self.path / LOCK, "a+") as handle:
            fcntl.flock(handle, fcntl.LOCK_EX)
            try:
                yield self
            finally:
                fcntl.flock(handle, fcntl.LOCK_UN)


def _learned(model: Model) -> dict[str, float]:
    """What a weights file keeps of a model: its offsets from the prior, to 9 decimals."""
    prior = Model.prior()
    learned = {k: round(v - prior.weight(k), 9) for k, v in sorted(model.items())}
    return {k: v for k, v in learned.items() if v != 0.0}


def _from_learned(learned: dict[str, float]) -> Model:
    model = Model.prior()
    model.update(learned)
    return model


def as_saved(model: Model) -> Model:
    """The model as saving and loading it would give it back (offsets rounded): rebuilding
    from the log steps through these, so it reproduces the saved weights exactly."""
    return _from_learned(_learned(model))


def atomic_write(path: Path, text: str) -> None:
    fd, tmp = tempfile.mkstemp(prefix=".tmp-", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as f:
            f.write(text)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, path)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise
