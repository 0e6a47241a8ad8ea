"""records: the model folder's log — everything ever taught, one typed record a line.

The log is the model: the weights file is a cache of it (`teaching.rebuild` replays it). This
module alone turns records into log lines and back, so every reader sees the same fields:

    {"kind": "log", "format": "tabq-log", "version": 2}          first line of a new log
    {"kind": "confirmation", "id", "question", "table": {"path", "name", "fingerprint"},
     "answer", "query", "senses", "time", "batch", ["strength", "rows", "rows_answer", "meant"]}
    {"kind": "import", "source", "sha256", "mode", "time", "confirmations", "support_unknown",
     "learned", "support", "batch"}
    {"kind": "retraction", "retract", "of_batch", "time", "batch"}

Version 1 logs (before the header) still load: a line without "kind" is a confirmation whose
"table" is a path (its "fingerprint" beside it), and a line with "retract" is a retraction.
A record kind a later tabq adds goes in `KINDS` with its own class.

Lines are appended whole with one write and synced before anyone is told they were saved. A torn
last line (a write cut short by a kill, a full disk or a quota) was never reported saved: the
next append cuts it off, and a reader skips it with a warning. A damaged line elsewhere is
skipped with a warning too, and left in the file — the log is never rewritten.
"""

from __future__ import annotations

import datetime
import json
import math
import os
import warnings
from dataclasses import dataclass, field
from pathlib import Path

from .errors import ModelError
from .safeio import open_regular, read_bounded, reason
from .table import ReadChoices, TableRef

LOG_FORMAT = "tabq-log"
LOG_VERSION = 2
HEADER = {"kind": "log", "format": LOG_FORMAT, "version": LOG_VERSION}
MAX_LOG_BYTES = 1 << 30     # a confirmation takes 1–3 kB: hundreds of thousands fit


class LogWarning(UserWarning):
    """Something in a log was skipped or repaired; what was taught is still there."""


@dataclass(frozen=True)
class Confirmation:
    """An analyst said this answer to this question about this table is right."""

    id: str
    question: str
    table: TableRef
    answer: list
    query: str | None = None         # the reading taught (canonical form), None if none gave it
    senses: list[str] | None = None  # the reading's features without their words (lexicon
    #                                  support); None in version 1 lines that lack them
    time: str = ""
    batch: int = 0
    strength: float | None = None    # a pick among look-alikes says more than a confirmation
    rows: list[int] | None = None    # rows that told the picked reading from its look-alikes
    rows_answer: list | None = None  # the picked reading's answer on those rows
    meant: str | None = None         # the picked form, when no rows told them apart


@dataclass(frozen=True)
class Import:
    """A lexicon file loaded into the model (merged into it or replacing it)."""

    source: str
    sha256: str
    mode: str                        # "merge" or "replace"
    time: str
    confirmations: int
    support_unknown: int
    learned: dict[str, float]
    support: dict[str, int] = field(default_factory=dict)
    batch: int = 0


@dataclass(frozen=True)
class Retraction:
    """An undo: the confirmation `of_id` of batch `of_batch` no longer counts (it stays logged)."""

    of_id: str
    of_batch: int | None
    time: str
    batch: int = 0


Record = Confirmation | Import | Retraction


# ── one record ⇄ one line ─────────────────────────────────────────────────────────────────────
def encode(record: Record) -> dict:
    """The JSON object of a record, as its log line holds it."""
    if isinstance(record, Confirmation):
        table = record.table
        data = {"kind": "confirmation", "id": record.id, "question": record.question,
                "table": {"path": table.path, "name": table.name,
                          "fingerprint": table.fingerprint,
                          **({"reading": table.reading.as_dict()} if table.reading else {})},
                "answer": record.answer, "query": record.query, "senses": record.senses,
                "time": record.time, "batch": record.batch}
        for key in ("strength", "rows", "rows_answer", "meant"):
            if getattr(record, key) is not None:
                data[key] = getattr(record, key)
        return data
    if isinstance(record, Import):
        return {"kind": "import", "source": record.source, "sha256": record.sha256,
                "mode": record.mode, "time": record.time, "confirmations": record.confirmations,
                "support_unknown": record.support_unknown, "learned": record.learned,
                "support": record.support, "batch": record.batch}
    return {"kind": "retraction", "retract": record.of_id, "of_batch": record.of_batch,
            "time": record.time, "batch": record.batch}


def decode(data: dict) -> Record:
    """A record from its JSON object (either log version); KeyError/TypeError/ValueError when
    a field is missing or of the wrong kind."""
    kind = data.get("kind") or ("retraction" if "retract" in data else "confirmation")
    if kind == "confirmation":
        return _confirmation(data)
    if kind == "import":
        return Import(str(data["source"]), str(data["sha256"]), _mode(data["mode"]),
                      str(data.get("time", "")), int(data.get("confirmations", 0)),
                      int(data.get("support_unknown", 0)), _numbers(data["learned"]),
                      _numbers(data.get("support") or {}), int(data.get("batch", 0)))
    if kind == "retraction":
        of_batch = data.get("of_batch")
        return Retraction(str(data["retract"]), None if of_batch is None else int(of_batch),
                          str(data.get("time", "")), int(data.get("batch", 0)))
    raise ValueError(f"unknown record kind {str(kind)[:40]!r}")


def _confirmation(data: dict) -> Confirmation:
    table = data["table"]
    if isinstance(table, str):          # version 1: a path, the fingerprint beside it
        ref = TableRef(table, None, data.get("fingerprint"))
    else:
        ref = TableRef(str(table["path"]), table.get("name"), table.get("fingerprint"),
                       ReadChoices.of(table.get("reading")))
    question, answer = data["question"], data["answer"]
    if not isinstance(question, str) or not isinstance(answer, list):
        raise TypeError("a confirmation needs a question string and an answer list")
    senses = _optional(data, "senses", list)
    strength = data.get("strength")
    return Confirmation(str(data.get("id", "")), question, ref, answer,
                        _optional(data, "query", str),
                        None if senses is None else [str(s) for s in senses],
                        str(data.get("time", "")), int(data.get("batch", 0)),
                        None if strength is None else float(_finite(strength)),
                        _optional(data, "rows", list), _optional(data, "rows_answer", list),
                        _optional(data, "meant", str))


def _optional(data: dict, key: str, kind: type):
    """A field that may be absent or null, else must be of `kind`: a string where a list
    belongs would be read one character at a time, far from here."""
    value = data.get(key)
    if value is not None and not isinstance(value, kind):
        raise TypeError(f"{key} must be {kind.__name__}, not {type(value).__name__}")
    return value


def _finite(value: object) -> int | float:
    """A number as the log holds it (an int stays an int); NaN, infinities, text and
    true/false are damage."""
    if isinstance(value, bool) or not isinstance(value, (int, float)) or (
            isinstance(value, float) and not math.isfinite(value)):
        raise ValueError(f"{str(value)[:40]} is not a finite number")
    return value


def _mode(mode: object) -> str:
    if mode not in ("merge", "replace"):
        raise ValueError(f"unknown import mode {str(mode)[:40]!r}")
    return str(mode)


def _numbers(mapping: object) -> dict:
    if not isinstance(mapping, dict):
        raise TypeError("expected an object of numbers")
    return {str(k): _finite(v) for k, v in mapping.items()}


# ── the log file ──────────────────────────────────────────────────────────────────────────────
def read(path: Path) -> list[Record]:
    """Every record of a log file, oldest first; [] when there is none. Damaged lines are
    skipped with a LogWarning; a log written by a newer tabq is refused, and so is a log that
    is a link, not a regular file, or larger than MAX_LOG_BYTES (safeio.py)."""
    try:
        lines = read_bounded(path, MAX_LOG_BYTES, ModelError, "log").split(b"\n")
    except FileNotFoundError:
        return []
    records: list[Record] = []
    for number, raw in enumerate(lines, 1):
        if not raw.strip():
            continue
        torn = number == len(lines)        # no newline after it: a write that never completed
        try:
            data = json.loads(raw.decode("utf-8"))
            if not isinstance(data, dict):
                raise TypeError("not an object")
            if data.get("kind") == "log":
                _check_version(data, path)
                continue
            records.append(decode(data))
        except ModelError:
            raise
        except (UnicodeDecodeError, json.JSONDecodeError, KeyError, TypeError,
                ValueError) as err:
            why = ("a torn last line (a write cut short) was skipped" if torn else
                   f"line {number} is damaged ({_damage(err)}) and was skipped; "
                   "it is left in the file")
            warnings.warn(f"{path}: {why}", LogWarning, stacklevel=2)
    return records


def _damage(err: Exception) -> str:
    """What is wrong with a log line, in a few words."""
    if isinstance(err, KeyError):
        return f"the field {str(err.args[0])[:40]!r} is missing"
    if isinstance(err, json.JSONDecodeError):
        return "not JSON"
    if isinstance(err, UnicodeDecodeError):
        return "not UTF-8"
    return f"{err.__class__.__name__}: {str(err)[:80]}"


def _check_version(header: dict, path: Path) -> None:
    version = header.get("version")
    if header.get("format") != LOG_FORMAT or not isinstance(version, int):
        raise ModelError(f"{path}: not a tabq log; it was left as it is")
    if version > LOG_VERSION:
        raise ModelError(f"{path}: log format version {version}, written by a newer tabq; "
                         f"this tabq reads up to version {LOG_VERSION}")


def append(path: Path, records: list[Record]) -> None:
    """Add records to the log: one write, then fsync, before returning. A torn tail left by an
    earlier write that never completed is cut off first (it was never reported saved). The log
    is never opened through a link, so a link cannot send the write outside the folder."""
    if not records:
        return
    lines = [json.dumps(encode(r), ensure_ascii=False) for r in records]
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd = open_regular(path, os.O_RDWR | os.O_APPEND | os.O_CREAT, ModelError, "log")
        with os.fdopen(fd, "a+b") as f:
            if f.seek(0, os.SEEK_END) == 0:
                lines.insert(0, json.dumps(HEADER))
            else:
                _cut_torn_tail(f, path)
            f.write("".join(line + "\n" for line in lines).encode("utf-8"))
            f.flush()
            os.fsync(f.fileno())
    except OSError as err:      # a full disk or a read-only folder: nothing was reported saved
        raise ModelError(f"cannot write the model folder {path.parent}: {reason(err)}; "
                         "the new records were not saved") from None


def _cut_torn_tail(f, path: Path) -> None:
    """Truncate the bytes after the last newline (an incomplete line), with a warning."""
    size = f.seek(0, os.SEEK_END)
    f.seek(max(0, size - 1))
    if f.read(1) == b"\n":
        return
    f.seek(0)
    end = f.read().rfind(b"\n") + 1
    f.truncate(end)
    f.seek(end)
    warnings.warn(f"{path}: a torn last line ({size - end} bytes, a write cut short) was cut "
                  "off before appending", LogWarning, stacklevel=3)


# ── what still counts ─────────────────────────────────────────────────────────────────────────
def live(records: list[Record]) -> list[Record]:
    """The records that still count: retractions and the confirmations they retract are left
    out (both stay in the log: nothing taught is ever lost)."""
    retracted = {(r.of_id, r.of_batch) for r in records if isinstance(r, Retraction)}
    return [r for r in records if not isinstance(r, Retraction)
            and not (isinstance(r, Confirmation) and (r.id, r.batch) in retracted)]


def since_replace(records: list[Record]) -> list[Record]:
    """The records after the last lexicon import that replaced the whole model (included)."""
    last = max((i for i, r in enumerate(records)
                if isinstance(r, Import) and r.mode == "replace"), default=0)
    return records[last:]


def confirmations(records: list[Record]) -> list[Confirmation]:
    return [r for r in records if isinstance(r, Confirmation)]


def next_batch(records: list[Record]) -> int:
    """The batch number the next teaching, import or undo gets."""
    return 1 + max((r.batch for r in records), default=0)


def now() -> str:
    """A record's time: UTC, to the second."""
    return datetime.datetime.now(datetime.timezone.utc).isoformat(timespec="seconds")
