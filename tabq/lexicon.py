"""The lexicon: what a model learned, as a file people review, version, diff and share.

A learned weight is an offset from the prior on a named feature (see features.py). The lexical
ones pair a question word or phrase with a meaning and become *entries* (word, kind, meaning),
read from the feature's name by featurenames.py:

    lex:<word>|<fragment>        kind "operator" (sum, cmp:gt, dir:max …) or "fragment" (eq, or …)
    lexcol:<word>|<column>       kind "column"
    lexval:<word>|<column>=<v>   kind "value"

Every other learned weight (`cover`, `ent:exact`, `op:sum` …) goes to the *structure* section under
its feature name, so an export holds everything teaching moved and an import loses nothing.

Support is how many confirmations back a weight: a confirmation supports a feature when the query
chosen for it fires that feature. Teaching records, in each log line, the target's *senses* (its
feature names with the question word taken out); the word part is checked against the logged
question's grams. Older log lines without senses are worked out again from their table when it is
still there unchanged, else counted in `support_unknown`.

An import is itself a log record, so rebuilding a model from its log replays it in order.
Files are read whole and checked completely before anything in a model folder is touched.
The format is described in docs/lexicon.md, its JSON Schema in docs/lexicon.schema.json.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import math
import os
from collections import Counter, defaultdict
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path

from . import logic as L
from . import records
from .analyse import question_grams
from .errors import InputError, TabqError
from .featurenames import KINDS, Pair, open_sense, parse, senses
from .model import Model
from .safeio import atomic_write, open_regular, printable, read_bounded, reason
from .store import ModelFolder

FORMAT = "tabq-lexicon"
VERSION = 1
DECIMALS = 6                 # fixed float format: diffs show real changes, not float noise
MAX_BYTES = 5_000_000        # a lexicon of a busy team is a few hundred kB
MAX_WEIGHT = 1000.0          # far beyond anything learning reaches; stops a file that would
                             # swamp every score
MAX_TEXT = 1000              # characters in a word, meaning or feature name
MAX_SUPPORT = 10**9
MODES = ("merge", "replace")

JSON_TOP = ("format", "version", "confirmations", "support_unknown", "entries", "structure")
JSON_ENTRY = ("word", "kind", "meaning", "learned", "weight", "support")
JSON_STRUCTURE = ("feature", "learned", "weight", "support")
CSV_PREAMBLE = ["format", "version", "confirmations", "support_unknown"]
CSV_HEADER = ["word", "kind", "meaning", "learned", "weight", "support"]


class LexiconError(InputError):
    """A lexicon file is missing, malformed, truncated, hostile or of another version."""


@dataclass(frozen=True)
class Entry:
    """One learned weight. Structure features have kind "structure", no word, and their name as
    meaning."""

    word: str
    kind: str
    meaning: str
    learned: float
    weight: float
    support: int

    @property
    def feature(self) -> str:
        if self.kind == "structure":
            return self.meaning
        return Pair(self.kind, self.word, self.meaning).name

    @property
    def key(self) -> tuple[str, str, str]:
        return (self.word, self.kind, self.meaning)


@dataclass
class Lexicon:
    confirmations: int          # confirmations behind the weights (taught here or imported)
    support_unknown: int        # of those, how many could not be checked for support
    entries: list[Entry]        # lexical pairs, sorted by word, kind, meaning
    structure: list[Entry]      # other learned weights, sorted by feature name

    def all(self) -> list[Entry]:
        return self.entries + self.structure


# ── from a model folder ──────────────────────────────────────────────────────────────────────
def from_folder(folder: ModelFolder) -> Lexicon:
    """The lexicon of a model folder: its learned weights with their support."""
    if not folder.path.is_dir():
        raise InputError(f"{folder.path}: no model folder there")
    model = folder.load()
    return from_model(model, folder.read_log())


def from_model(model: Model, log: list[records.Record]) -> Lexicon:
    """The lexicon of a model and the log it was taught from: its learned weights with their
    support. The app's words view reads this too, so both count support the same way."""
    learned = learned_offsets(model)
    support, confirmations, unknown = _support(log, model)
    entries, structure = [], []
    prior = Model.prior()
    for name, offset in learned.items():
        pair = parse(name)
        weight = _round(prior.weight(name) + offset)
        if pair is None:
            structure.append(Entry("", "structure", name, offset, weight, support[name]))
        else:
            entries.append(Entry(pair.word, pair.kind, pair.meaning, offset, weight,
                                 support[name]))
    return _sorted(Lexicon(confirmations, unknown, entries, structure))


def learned_offsets(model: Model) -> dict[str, float]:
    """Every weight that differs from the prior, rounded to the lexicon's precision."""
    prior = Model.prior()
    out = {}
    for name, value in model.items():
        offset = _round(value - prior.weight(name))
        if offset != 0.0:
            out[name] = offset
    return out


def _round(x: float) -> float:
    return round(x, DECIMALS) + 0.0       # + 0.0 turns -0.0 into 0.0


def _sorted(lexicon: Lexicon) -> Lexicon:
    lexicon.entries.sort(key=lambda e: e.key)
    lexicon.structure.sort(key=lambda e: e.meaning)
    return lexicon


def _support(log: list[records.Record], model: Model) -> tuple[Counter, int, int]:
    """Support of every feature, the confirmations counted, and how many could not be checked."""
    support: Counter = Counter()
    confirmations = unknown = 0
    counted = records.since_replace(records.live(log))   # undone confirmations back nothing
    missing = [r for r in records.confirmations(counted) if r.senses is None]
    found = _senses_again(missing, model) if missing else {}
    for record in counted:
        if isinstance(record, records.Import):
            support.update(record.support)
            confirmations += record.confirmations
            unknown += record.support_unknown
            continue
        confirmations += 1
        fired = record.senses
        if fired is None:
            fired = found.get(id(record))
        if fired is None:
            unknown += 1
            continue
        _count(support, set(fired), question_grams(record.question))
    return support, confirmations, unknown


def _count(support: Counter, fired: set[str], grams: Iterable[str]) -> None:
    """One confirmation's support: every feature its senses fire for its question's grams."""
    open_pairs = []
    for name in fired:
        pair = open_sense(name)
        if pair is None:
            support[name] += 1
        else:
            open_pairs.append(pair)
    # a sense "lex:*|sum" fires "lex:<gram>|sum" for every gram of the question
    for gram in grams:
        for pair in open_pairs:
            if pair.kind in ("column", "value") and " " in gram:
                continue        # column and value pairs take single words only
            support[pair.with_word(gram).name] += 1


def _senses_again(old: list[records.Confirmation], model: Model) -> dict[int, list[str]]:
    """Senses of old log lines, worked out again from their table if it is there unchanged."""
    from .load import load_table
    from .pipeline import OpenTable
    from .learn import TRAIN_EXECUTE
    out: dict[int, list[str]] = {}
    by_table: dict[tuple, list[records.Confirmation]] = defaultdict(list)
    for record in old:
        by_table[record.table.path, record.table.name, record.table.reading].append(record)
    for (path, name, reading), group in by_table.items():
        try:
            table = OpenTable(load_table(path, name, reading), model)
        except TabqError:
            continue
        for record in group:
            # unchanged since? (version 1 logs hashed the file alone: the same fingerprint for
            # one-table formats; for a SQLite table or a sheet the support stays unknown)
            if record.table.fingerprint != table.table.fingerprint:
                continue
            if not record.query:
                out[id(record)] = []       # no reading gave the answer: it taught nothing
                continue
            try:
                result = table.ask(record.question, execute=TRAIN_EXECUTE)
            except TabqError:
                continue
            for cand in result.candidates:
                if str(cand.form) == record.query:
                    out[id(record)] = senses(cand.features)
                    break
    return out


# ── writing ───────────────────────────────────────────────────────────────────────────────────
def file_kind(path: str | Path) -> str:
    suffix = Path(path).suffix.lower()
    if suffix not in (".json", ".csv"):
        raise InputError(f"{path}: a lexicon file ends in .json or .csv")
    return suffix[1:]


def render(lexicon: Lexicon, kind: str) -> str:
    return render_json(lexicon) if kind == "json" else render_csv(lexicon)


def _num(x: float) -> str:
    return f"{x:.{DECIMALS}f}"


def render_json(lexicon: Lexicon) -> str:
    """One entry a line, fields in a fixed order, floats in a fixed format: small diffs."""
    def entry(e: Entry) -> str:
        return (f'{{"word": {_str(e.word)}, "kind": {_str(e.kind)}, "meaning": {_str(e.meaning)}, '
                f'"learned": {_num(e.learned)}, "weight": {_num(e.weight)}, '
                f'"support": {e.support}}}')

    def structure(e: Entry) -> str:
        return (f'{{"feature": {_str(e.meaning)}, "learned": {_num(e.learned)}, '
                f'"weight": {_num(e.weight)}, "support": {e.support}}}')

    def block(lines: list[str]) -> str:
        return "[\n" + ",\n".join("    " + line for line in lines) + "\n  ]" if lines else "[]"

    return ("{\n"
            f'  "format": "{FORMAT}",\n'
            f'  "version": {VERSION},\n'
            f'  "confirmations": {lexicon.confirmations},\n'
            f'  "support_unknown": {lexicon.support_unknown},\n'
            f'  "entries": {block([entry(e) for e in lexicon.entries])},\n'
            f'  "structure": {block([structure(e) for e in lexicon.structure])}\n'
            "}\n")


def _str(text: str) -> str:
    return json.dumps(text, ensure_ascii=False)


def render_csv(lexicon: Lexicon) -> str:
    rows = [CSV_PREAMBLE, [FORMAT, VERSION, lexicon.confirmations, lexicon.support_unknown],
            CSV_HEADER]
    rows += [[e.word, e.kind, e.meaning, _num(e.learned), _num(e.weight), e.support]
             for e in lexicon.all()]
    return "".join(",".join(_cell(str(c)) for c in row) + "\n" for row in rows)


def _cell(text: str) -> str:
    """A CSV field, quoted when it must be. Python's csv writer leaves a lone carriage return
    unquoted when lines end in a newline, and its reader then splits the row there."""
    if any(c in text for c in ',"\r\n'):
        return '"' + text.replace('"', '""') + '"'
    return text


def export(folder: ModelFolder, out: str | Path) -> Lexicon:
    """Write a model folder's lexicon to OUT (.json or .csv), atomically."""
    out = Path(out)
    kind = file_kind(out)
    _check_overwrite(out)
    lexicon = from_folder(folder)
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        atomic_write(out, render(lexicon, kind))
    except OSError as err:
        raise TabqError(f"cannot write {out}: {reason(err)}; it was left as it was") from None
    return lexicon


def _check_overwrite(out: Path) -> None:
    """Replace an older lexicon, never some other file (a table, say) that has the same name."""
    if out.is_dir():
        raise InputError(f"{out}: is a folder; give a file name ending in .json or .csv")
    if not os.path.lexists(out):
        return
    with os.fdopen(open_regular(out, os.O_RDONLY, InputError, "file", True), "rb") as f:
        head = f.read(200)
    if head and FORMAT.encode() not in head:
        raise InputError(f"{out}: exists and is not a tabq lexicon; it was left as it is")


# ── reading ───────────────────────────────────────────────────────────────────────────────────
def read(path: str | Path) -> tuple[Lexicon, str]:
    """A lexicon file checked completely, and the sha256 of its bytes; or a LexiconError that
    names the first problem."""
    path = Path(path)
    kind = file_kind(path)
    try:
        raw = read_bounded(path, MAX_BYTES, LexiconError, "lexicon file", follow=True)
    except FileNotFoundError:
        raise LexiconError(f"{path}: no such file") from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise LexiconError(f"{path}: not UTF-8 text; a lexicon is a JSON or CSV text "
                           "file") from None
    data = _parse_json(text, path) if kind == "json" else _parse_csv(text, path)
    return check(data, str(path)), hashlib.sha256(raw).hexdigest()


def _parse_json(text: str, path: Path) -> object:
    def no_repeats(pairs):
        keys = [k for k, _ in pairs]
        if len(keys) != len(set(keys)):
            repeated = next(k for k in keys if keys.count(k) > 1)
            raise LexiconError(f"{path}: the key {repeated!r} appears twice in one object")
        return dict(pairs)

    def no_constant(name):
        raise LexiconError(f"{path}: {name} is not a number a lexicon may hold")

    if not text.strip():
        raise LexiconError(f"{path}: is empty")
    try:
        return json.loads(text, object_pairs_hook=no_repeats, parse_constant=no_constant)
    except json.JSONDecodeError as err:
        # a string left open runs to the end of the file, but the error points at its start
        cut = err.pos >= len(text.rstrip()) or err.msg.startswith("Unterminated string")
        end = " (the file looks cut short)" if cut else ""
        raise LexiconError(f"{path}: not valid JSON at line {err.lineno} column {err.colno}: "
                           f"{err.msg}{end}") from None
    except RecursionError:
        raise LexiconError(f"{path}: nested too deeply to be a lexicon") from None


def _parse_csv(text: str, path: Path) -> dict:
    """The CSV as the same structure the JSON file has, so one check covers both."""
    try:
        reader = csv.reader(io.StringIO(text, newline=""))
        rows, lines = [], []
        for row in reader:
            rows.append(row)
            lines.append(reader.line_num)     # a quoted field may span lines
    except csv.Error as err:
        raise LexiconError(f"{path}: not readable as CSV ({err})") from None
    if len(rows) < 3:
        raise LexiconError(f"{path}: too short for a lexicon: it needs the format line, its "
                           "values and the column names")
    if rows[0] != CSV_PREAMBLE:
        raise LexiconError(f"{path}: line 1 must be {','.join(CSV_PREAMBLE)}")
    if len(rows[1]) != len(CSV_PREAMBLE):
        raise LexiconError(f"{path}: line 2 must hold {len(CSV_PREAMBLE)} values")
    if rows[2] != CSV_HEADER:
        raise LexiconError(f"{path}: line 3 must be {','.join(CSV_HEADER)}")
    fmt, version, confirmations, unknown = rows[1]
    data: dict = {"format": fmt, "version": _csv_int(version, path, 2, "version"),
                  "confirmations": _csv_int(confirmations, path, 2, "confirmations"),
                  "support_unknown": _csv_int(unknown, path, 2, "support_unknown"),
                  "entries": [], "structure": []}
    for number, row in zip(lines[3:], rows[3:]):
        if not row:
            continue
        if len(row) != len(CSV_HEADER):
            raise LexiconError(f"{path}: line {number} has {len(row)} fields, not "
                               f"{len(CSV_HEADER)}")
        word, kind, meaning, learned, weight, support = row
        values = {"learned": _csv_float(learned, path, number, "learned"),
                  "weight": _csv_float(weight, path, number, "weight"),
                  "support": _csv_int(support, path, number, "support")}
        if kind == "structure":
            if word:
                raise LexiconError(f"{path}: line {number}: a structure row has no word")
            data["structure"].append({"feature": meaning, **values})
        else:
            data["entries"].append({"word": word, "kind": kind, "meaning": meaning, **values})
    return data


def _csv_int(cell: str, path: Path, line: int, field: str) -> int:
    try:
        return int(cell)
    except ValueError:
        raise LexiconError(f"{path}: line {line}: {field} must be a whole number, "
                           f"not {cell[:40]!r}") from None


def _csv_float(cell: str, path: Path, line: int, field: str) -> float:
    try:
        value = float(cell)
    except ValueError:
        raise LexiconError(f"{path}: line {line}: {field} must be a number, "
                           f"not {cell[:40]!r}") from None
    return value


def check(data: object, where: str) -> Lexicon:
    """Every field of a parsed lexicon checked; the first problem is named."""
    if not isinstance(data, dict):
        raise LexiconError(f"{where}: a lexicon is a JSON object, not {_type(data)}")
    if data.get("format") != FORMAT:
        raise LexiconError(f"{where}: not a tabq lexicon (format {data.get('format')!r}, "
                           f"expected {FORMAT!r})")
    version = data.get("version")
    if version != VERSION or isinstance(version, bool):
        raise LexiconError(f"{where}: lexicon format version {version!r}; this tabq reads "
                           f"version {VERSION}")
    _keys(data, JSON_TOP, where)
    confirmations = _count_field(data, "confirmations", where)
    unknown = _count_field(data, "support_unknown", where)
    if unknown > confirmations:
        raise LexiconError(f"{where}: support_unknown is larger than confirmations")
    for section in ("entries", "structure"):
        if not isinstance(data[section], list):
            raise LexiconError(f"{where}: {section} must be a list, not {_type(data[section])}")
    entries = [_entry(item, f"{where}: entry {i + 1}") for i, item in enumerate(data["entries"])]
    structure = [_structure(item, f"{where}: structure {i + 1}")
                 for i, item in enumerate(data["structure"])]
    seen: dict[str, str] = {}
    for label, e in [(f"entry {i + 1}", e) for i, e in enumerate(entries)] + [
            (f"structure {i + 1}", e) for i, e in enumerate(structure)]:
        if e.feature in seen:
            raise LexiconError(f"{where}: {label} repeats {seen[e.feature]}")
        seen[e.feature] = label
    return _sorted(Lexicon(confirmations, unknown, entries, structure))


def _keys(item: dict, wanted: tuple[str, ...], where: str) -> None:
    missing = [k for k in wanted if k not in item]
    if missing:
        raise LexiconError(f"{where}: {missing[0]!r} is missing (the file may be cut short)")
    extra = [k for k in item if k not in wanted]
    if extra:
        raise LexiconError(f"{where}: unknown field {str(extra[0])[:40]!r}")


def _count_field(item: dict, name: str, where: str, top: int = MAX_SUPPORT) -> int:
    value = item[name]
    if isinstance(value, bool) or not isinstance(value, int) or not 0 <= value <= top:
        raise LexiconError(f"{where}: {name} must be a whole number from 0 to {top}, "
                           f"not {_short(value)}")
    return value


def _text_field(item: dict, name: str, where: str) -> str:
    value = item[name]
    if not isinstance(value, str) or not value or len(value) > MAX_TEXT:
        raise LexiconError(f"{where}: {name} must be a non-empty string of at most {MAX_TEXT} "
                           f"characters, not {_short(value)}")
    return value


def _weight_field(item: dict, name: str, where: str) -> float:
    value = item[name]
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(
            value) or abs(value) > MAX_WEIGHT:
        raise LexiconError(f"{where}: {name} must be a number between -{MAX_WEIGHT:g} and "
                           f"{MAX_WEIGHT:g}, not {_short(value)}")
    return float(value)


def _entry(item: object, where: str) -> Entry:
    if not isinstance(item, dict):
        raise LexiconError(f"{where}: must be an object, not {_type(item)}")
    _keys(item, JSON_ENTRY, where)
    word, kind, meaning = (_text_field(item, k, where) for k in ("word", "kind", "meaning"))
    if kind not in KINDS:
        raise LexiconError(f"{where}: kind must be one of {', '.join(KINDS)}, not {kind[:40]!r}")
    if "|" in word:
        raise LexiconError(f"{where}: a word cannot hold '|'")
    if kind == "value" and "=" not in meaning:
        raise LexiconError(f"{where}: a value's meaning is column=value")
    if kind == "definition" and not _row_set(meaning):
        raise LexiconError(f"{where}: a definition's meaning must be a row set such as "
                           f'(in_set zone ["North" "East"]) or (cmp miles ge 20), '
                           f"not {meaning[:60]!r}")
    return Entry(word, kind, meaning, _weight_field(item, "learned", where),
                 _weight_field(item, "weight", where), _count_field(item, "support", where))


def _row_set(text: str) -> bool:
    try:
        return isinstance(L.from_text(text), L.Rows)
    except L.LogicTextError:
        return False


def _structure(item: object, where: str) -> Entry:
    if not isinstance(item, dict):
        raise LexiconError(f"{where}: must be an object, not {_type(item)}")
    _keys(item, JSON_STRUCTURE, where)
    feature = _text_field(item, "feature", where)
    if parse(feature) is not None:
        raise LexiconError(f"{where}: {feature[:60]!r} pairs a word with a meaning; it belongs "
                           "in entries")
    return Entry("", "structure", feature, _weight_field(item, "learned", where),
                 _weight_field(item, "weight", where), _count_field(item, "support", where))


def _type(value: object) -> str:
    return {dict: "an object", list: "a list", str: "a string", bool: "true/false",
            int: "a number", float: "a number", type(None): "null"}.get(type(value), "a value")


def _short(value: object) -> str:
    if isinstance(value, (dict, list)):
        return _type(value)
    return repr(value)[:40]


# ── importing ─────────────────────────────────────────────────────────────────────────────────
@dataclass
class ImportReport:
    entries: int
    mode: str
    batch: int


def import_file(folder: ModelFolder, path: str | Path, mode: str = "merge") -> ImportReport:
    """Load a lexicon file into a model folder: checked whole first, then logged and applied
    under the folder's lock. Merge adds the file's learned offsets; replace makes them the
    model's."""
    if mode not in MODES:
        raise InputError(f"import mode must be one of {', '.join(MODES)}")
    lexicon, digest = read(path)
    with folder.locked():
        log = folder.read_log()
        model = folder.load()             # a damaged model is refused before anything is written
        if mode == "merge":
            _refuse_repeat(records.since_replace(log), digest, path)
        record = records.Import(
            str(Path(path).resolve()), digest, mode, records.now(), lexicon.confirmations,
            lexicon.support_unknown, {e.feature: e.learned for e in lexicon.all()},
            {e.feature: e.support for e in lexicon.all() if e.support}, records.next_batch(log))
        model = apply_import(model, record)
        folder.append_log([record])
        folder.save(model, batches=record.batch)
    return ImportReport(len(lexicon.all()), mode, record.batch)


def _refuse_repeat(log: list[records.Record], digest: str, path) -> None:
    for record in log:
        if isinstance(record, records.Import) and record.sha256 == digest:
            raise InputError(f"{path}: this same file was already merged into the model (on "
                             f"{record.time}); merging it again would count it twice")


def apply_import(model: Model, record: records.Import) -> Model:
    """The model after an import record (used by import and by rebuilding from the log)."""
    learned = record.learned
    if record.mode == "replace":
        out = Model.prior()
    else:
        out = Model(model.as_dict())
    out.update(learned)
    return out


def imports(folder: ModelFolder) -> list[records.Import]:
    """The import records of a folder's log, oldest first."""
    return [r for r in folder.read_log() if isinstance(r, records.Import)]


# ── reading for people ────────────────────────────────────────────────────────────────────────
def matching(lexicon: Lexicon, word: str | None) -> list[Entry]:
    """Entries whose word or phrase holds the given word (compared by stem, as questions are)."""
    if not word:
        return lexicon.all()
    from .text import split_words, stem
    wanted = {stem(w) for w in split_words(word)} | {word.lower()}
    return [e for e in lexicon.entries if wanted & set(e.word.split()) or e.word == word.lower()]


def as_table(entries: list[Entry]) -> str:
    """A plain text table, one entry a line."""
    if not entries:
        return "(no entries)"
    rows = [("word", "kind", "meaning", "learned", "weight", "support")]
    rows += [(printable(e.word) or "—", printable(e.kind), printable(e.meaning),
              f"{e.learned:+.3f}", f"{e.weight:+.3f}", str(e.support)) for e in entries]
    widths = [min(max(len(r[i]) for r in rows), 40) for i in range(6)]
    lines = []
    for row in rows:
        cells = [_fit(c, w) for c, w in zip(row, widths)]
        lines.append("  ".join(c.rjust(w) if i >= 3 else c.ljust(w)
                               for i, (c, w) in enumerate(zip(cells, widths))).rstrip())
    return "\n".join(lines)


def _fit(text: str, width: int) -> str:
    return text if len(text) <= width else text[:width - 1] + "…"


@dataclass
class Difference:
    added: list[Entry]
    removed: list[Entry]
    changed: list[tuple[Entry, Entry]]


def diff(a: Lexicon, b: Lexicon) -> Difference:
    old = {e.feature: e for e in a.all()}
    new = {e.feature: e for e in b.all()}
    order = sorted(set(old) | set(new), key=lambda f: _place(old.get(f) or new[f]))
    return Difference([new[f] for f in order if f not in old],
                      [old[f] for f in order if f not in new],
                      [(old[f], new[f]) for f in order if f in old and f in new
                       and (old[f].learned, old[f].support) != (new[f].learned, new[f].support)])


def _place(entry: Entry) -> tuple:
    """Entries in file order: word pairs first, then structure weights."""
    return (entry.kind == "structure", entry.key)


def describe(entry: Entry) -> str:
    """An entry for a person to read: imported text is escaped where it could act on the
    terminal."""
    if entry.kind == "structure":
        return f"structure {printable(entry.meaning)}"
    return f"{entry.word!r} → {printable(entry.kind)} {printable(entry.meaning)}"


def diff_text(d: Difference, a: Lexicon, b: Lexicon) -> str:
    lines = []
    for e in d.added:
        lines.append(f"+ {describe(e)}  learned {e.learned:+.3f}  support {e.support}")
    for e in d.removed:
        lines.append(f"- {describe(e)}  learned {e.learned:+.3f}  support {e.support}")
    for old, new in d.changed:
        lines.append(f"~ {describe(new)}  learned {old.learned:+.3f} → {new.learned:+.3f}  "
                     f"support {old.support} → {new.support}")
    lines.append(f"{len(d.added)} added, {len(d.removed)} removed, {len(d.changed)} changed; "
                 f"confirmations {a.confirmations} → {b.confirmations}")
    return "\n".join(lines)
