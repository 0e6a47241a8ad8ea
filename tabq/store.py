"""store: the model folder — learned weights, the log of confirmations, a lock.

    weights.json    {"format": "tabq-weights", "version": 1, "learned": {...}, ...} — what
                    teaching moved, as offsets from the prior (so a better prior in a later
                    tabq still reaches a taught model)
    log.jsonl       what was taught, one record a line, append-only (records.py): the
                    model itself, of which weights.json is a cache
    lock            held (flock) while a process reads, learns and writes

Weights are written to a temporary file and renamed over the old one, so a kill at any moment
leaves either the old or the new weights. No file of the folder is opened through a symbolic
link, and each is read only when it is a regular file, to a size limit (safeio.py), so a link
cannot send tabq's writes outside the folder and no file can hang it.
"""

from __future__ import annotations

import contextlib
import fcntl
import json
import math
import os
from collections.abc import Iterator
from pathlib import Path

import platformdirs

from . import records
from .errors import ModelError
from .model import FORMAT_VERSION, Model
from .safeio import atomic_write, open_regular, read_bounded, reason

__all__ = ["ModelFolder", "as_saved", "atomic_write", "default_folder"]

WEIGHTS = "weights.json"
LOG = "log.jsonl"
LOCK = "lock"
FORMAT = "tabq-weights"
KNOWN = {WEIGHTS, LOG, LOCK}
MODEL_ENV = "TABQ_MODEL"    # a model folder that stands in for the per-user one everywhere
MAX_WEIGHTS_BYTES = 64 << 20  # a taught model's offsets take a few hundred kB
MAX_OFFSET = 1e6            # far past what teaching or imports reach; keeps every score finite


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
        """The model in the folder: the prior when nothing was learned yet. A weights file
        that is damaged, foreign or holds a weight that is not a finite number is refused and
        left as it is: it is a cache of the log, rebuilt from it once removed."""
        path = self.path / WEIGHTS
        try:
            raw = read_bounded(path, MAX_WEIGHTS_BYTES, ModelError, "weights file")
        except FileNotFoundError:
            return Model.prior()
        try:
            data = json.loads(raw.decode("utf-8"), parse_constant=_no_constant)
        except (UnicodeDecodeError, json.JSONDecodeError, ValueError, RecursionError) as err:
            raise ModelError(f"{path}: not a readable tabq weights file "
                             f"({err.__class__.__name__}); it was left as it is") from err
        if not isinstance(data, dict) or data.get("format") != FORMAT:
            raise ModelError(f"{path}: not a tabq weights file; it was left as it is")
        if data.get("version") != FORMAT_VERSION:
            raise ModelError(f"{path}: weights format version {data.get('version')!r}; this "
                             f"tabq reads version {FORMAT_VERSION}")
        return _from_learned(_checked(data.get("learned"), path))

    def save(self, model: Model, **meta) -> None:
        """Write the weights atomically (temporary file, fsync, rename). When that fails (a
        full disk, say) the old weights file is removed if it can be: every caller logged
        something first, so it no longer matches the log, and the next use rebuilds it."""
        data = {"format": FORMAT, "version": FORMAT_VERSION, **meta, "learned": _learned(model)}
        try:
            text = json.dumps(data, ensure_ascii=False, indent=0, allow_nan=False)
        except ValueError:      # a NaN from learning: keep the old, finite weights
            raise ModelError(f"{self.path}: learning gave a weight that is not a finite number; "
                             "the weights were not saved") from None
        try:
            self.path.mkdir(parents=True, exist_ok=True)
            atomic_write(self.path / WEIGHTS, text)
        except OSError as err:
            dropped = False
            with contextlib.suppress(OSError):
                os.unlink(self.path / WEIGHTS)
                dropped = True
            after = (" the old weights were removed and are rebuilt from the log next time"
                     if dropped else " the weights file was left as it was")
            raise ModelError(f"cannot write the model folder {self.path}: {reason(err)};"
                             f"{after}") from None

    # lexists: a link in place of a file counts as there, so reading it refuses it (safeio)
    def has_weights(self) -> bool:
        return os.path.lexists(self.path / WEIGHTS)

    def has_log(self) -> bool:
        return os.path.lexists(self.path / LOG)

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
        try:
            self.path.mkdir(parents=True, exist_ok=True)
        except OSError as err:
            raise ModelError(f"cannot make the model folder {self.path}: {reason(err)}") from None
        foreign = [p.name for p in self.path.iterdir()
                   if p.name not in KNOWN and not p.name.startswith(".tmp-")]
        if foreign and not (self.path / WEIGHTS).exists() and not (self.path / LOG).exists():
            raise ModelError(f"{self.path}: not a tabq model folder (it holds {foreign[0]!r}); "
                             "choose an empty or new folder")
        try:
            fd = open_regular(self.path / LOCK, os.O_RDWR | os.O_CREAT, ModelError, "lock file")
        except OSError as err:
            raise ModelError(f"cannot write the model folder {self.path}: {reason(err)}") from None
        with os.fdopen(fd, "r+b") as handle:
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


def _checked(learned: object, path: Path) -> dict[str, float]:
    """The learned offsets of a weights file, each a finite number of sensible size: NaN or
    1e308 would make every score NaN or infinite, and `tabq ask --json` print invalid JSON."""
    if not isinstance(learned, dict) or not all(
            isinstance(k, str) and isinstance(v, (int, float)) and not isinstance(v, bool)
            for k, v in learned.items()):
        raise ModelError(f"{path}: learned weights must map feature names to numbers")
    for name, value in learned.items():
        if abs(value) > MAX_OFFSET or not math.isfinite(float(value)):
            raise ModelError(f"{path}: the learned weight of {name[:60]!r} is {value!r}, not a "
                             f"finite number within ±{MAX_OFFSET:g}; the file was left as it "
                             "is (remove it and tabq rebuilds it from the log)")
    return learned


def _no_constant(name: str) -> float:
    """json reads NaN and Infinity unless told not to; a weights file never holds them."""
    raise ValueError(f"{name} is not a weight")


def _from_learned(learned: dict[str, float]) -> Model:
    model = Model.prior()
    model.update(learned)
    return model


def as_saved(model: Model) -> Model:
    """The model as saving and loading it would give it back (offsets rounded): rebuilding
    from the log steps through these, so it reproduces the saved weights exactly."""
    return _from_learned(_learned(model))
