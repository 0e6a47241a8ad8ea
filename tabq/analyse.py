"""analyse: a question and a table's profile in, mentions out.

Mentions become the grammar's atoms: columns, cell values, numbers, dates and operators, each
with the span of the question it stands on (or none: a floating atom) and how good the match is.
The lexicon is permissive on purpose — any column can fill a column slot — and features say how
much each reading should be trusted.
"""

from __future__ import annotations

import datetime
import re
import time
from collections import Counter, defaultdict
from collections.abc import Sequence
from dataclasses import astuple, dataclass, field, replace

from rapidfuzz import fuzz

from . import codes
from . import logic as L
from .errors import QueryError, QuestionError
from .table import ROW, Column, Table, ident
from .prior import CUE_WORDS, CUES, ROW_NOUNS, SYNONYMS, WH_COLUMNS, related
from .rules import OPERATORS
from .text import (MONTHS, DateMention, Words, is_word, normalise, read_question, split_words,
                   stem)
from .wordvectors import similarity

MAX_QUESTION = 2000      # characters; longer questions are cut, and the result says so
MAX_NGRAM = 6
FLOATING_VALUES = 12     # a column with at most this many values offers them without a mention
UNEXPLAINED_WORDS = 6    # words a floating value may stand on (a long question would multiply them)
MAX_HEADER = 1000        # characters of a header matched against a question; a longer one is cut
# The words that ask for a negation, as the prior's cues for "not" spell them.
NEGATION_PHRASES = tuple(tuple(phrase.split()) for phrase, weight in CUES["not"][1].items()
                         if weight > 0)
MAX_CELL = 1000          # characters of a cell matched; no mention names a longer cell whole


class OutOfTime(QueryError):
    """The question's deadline passed while its words were being matched to the table."""


def _in_time(deadline: float | None) -> None:
    """Stop the analysis once the question's deadline has passed (checked between steps of
    the loops whose length the table sets: columns, cells, question words)."""
    if deadline is not None and time.monotonic() >= deadline:
        raise OutOfTime("the question ran past its time limit")


@dataclass(frozen=True)
class Atom:
    """One reading of a piece of the question, ready to fill a grammar slot."""

    slot: str
    value: object                      # a column name, (column, value), a number, a date …
    span: tuple[int, int] | None = None
    quality: str = ""                  # exact / stem / partial / fuzzy / synonym / floating / none
    covers: int = 0                    # content words of the question this reading accounts for


@dataclass
class Analysis:
    words: Words
    table: Table
    atoms: dict[str, list[Atom]]
    col_match: dict[str, str]          # column name → how the question mentions it
    content: frozenset[int]            # token positions that carry content
    grams: tuple[str, ...]             # stemmed unigrams and bigrams, for lexical features
    qtype: str                         # how_many, how_much, who, which, what, when, where, yes_no …
    head: int = -1                     # the word after "how many" / "number of", if any
    wh_head: int = -1                  # the word after a leading "which" / "what", if any
    truncated: bool = False
    spans: dict = field(default_factory=dict)   # column name → span of its mention
    cache: dict = field(default_factory=dict)   # per-question memo of feature dicts
    date_parts: dict = field(default_factory=dict)   # month/day/year → its number column
    row_words: frozenset[int] = frozenset()   # words naming the rows ("journal" of journals.csv)


def analyse(question: str, table: Table, deadline: float | None = None,
            team_words: Sequence[L.Defined] = ()) -> Analysis:
    """Find every reading of the question's words against this table; past `deadline` (a
    time.monotonic() value), raise OutOfTime. `team_words` are the taught definitions a
    model offers (definitions.offered): each one said in the question is a TEAMWORD atom."""
    text = question.replace("\x00", " ").strip()
    if not text or not any(ch.isalnum() for ch in text):
        raise QuestionError("the question is empty: ask something about the table")
    truncated = len(text) > MAX_QUESTION
    words = read_question(text[:MAX_QUESTION])
    row_words = _row_words(words, table)
    content = set(_content_tokens(words, table, row_words))
    atoms: dict[str, list[Atom]] = defaultdict(list)
    col_match, spans = _column_mentions(words, table, content, atoms, deadline)
    _value_mentions(words, table, content, col_match, spans, atoms, deadline)
    _number_mentions(words, table, content, spans, atoms)
    _date_part_mentions(words, table, atoms)
    _day_mentions(words, table, atoms)
    atoms["TEAMWORD"] = _team_word_mentions(words, table, content, team_words)
    atoms["ENTITY"] += _with_column_words(atoms["ENTITY"], spans, content, words)
    for slot, names in OPERATORS.items():
        atoms[slot] = [Atom(slot, name) for name in names]
    atoms["NOT"] = _negations(words) or atoms["NOT"]
    qtype = _qtype(words)
    for atom in _wh_columns(words, table, qtype, spans):
        atoms[atom.slot].append(atom)
    grams = _grams(words) + (f"qtype:{qtype}",)
    return Analysis(words, table, dict(atoms), col_match, frozenset(content), grams,
                    qtype, _head(words, ("how many", "number of")),
                    _head(words, ("which", "what")),
                    truncated, spans, date_parts=date_parts(table), row_words=row_words)


def column_words(analysis: Analysis) -> dict[int, str]:
    """Content words that name a column by its header, each with the column: a reading that
    leaves one unused has likely read another column than the one meant. A fuzzy spelling, a
    synonym ("longest" for a length) or a related word is tabq's guess, not the question
    naming the column."""
    named: dict[int, str] = {}
    for name, span in analysis.spans.items():
        if analysis.col_match.get(name) not in ("fuzzy", "synonym", "related"):
            for i in range(*span):
                if i in analysis.content:
                    named.setdefault(i, name)
    return named


def _row_words(words: Words, table: Table) -> frozenset[int]:
    """Words that name the table's rows rather than a column: a row noun ("records"), a word
    of the table's own name ("journals") or of its id column's header."""
    ids = {stem(w) for col in table.columns if is_id(col, table)
           for w in split_words(header_text(col)) if w not in ("id", "no", "number")}
    headers = {stem(w) for col in table.columns for w in split_words(header_text(col))}
    title = {stem(w) for w in split_words(table.title.replace("_", " "))} - headers
    row_nouns = ({stem(w) for w in ROW_NOUNS} - headers) | title | ids
    tokens = words.tokens
    found = {t.index for t in tokens if not t.stop and t.stem in row_nouns}
    for first, dash, last in zip(tokens, tokens[1:], tokens[2:]):   # "call-out" of callout
        if dash.text == "-" and stem(first.text + last.text) in row_nouns:
            found |= {first.index, last.index}
    return frozenset(found)


def _content_tokens(words: Words, table: Table, row_words: frozenset[int]) -> frozenset[int]:
    cue_stems = {stem(w) for w in CUE_WORDS}
    days = _days_as_rows(words, table)
    return frozenset(
        t.index for t in words.tokens
        if not t.stop and t.stem not in cue_stems and t.index not in row_words
        and t.text not in CUE_WORDS and is_word(t.text) and t.index not in days
    )


ID_ENDINGS = ("id", "_no", " no", "_nr", "_ref", "_number")
_CODE = re.compile(r"[A-Za-z]{1,4}[-_/]?\d{2,}$")   # CW-4012, PB10001: a row's code, not a name
CODES_READ = 20   # of a column's values checked for the code pattern
ROW_NAMES_SHARE = 0.5   # of the rows a text column's distinct values number to name the rows


def names_rows(table: Table, name: str) -> bool:
    """A text column with a value for most rows (parcel codes, county names): a word naming it
    ("how many parcels", "counties in Ohio") names the things the rows are, which a reading
    counts or filters without that column, so leaving the word unused is no sign of a misread
    (on the zero-shot sets, top answers ignoring only such words were right 87% of the time,
    those ignoring none 82%, those ignoring a word naming another column 64%)."""
    col = table.column(name)
    return col.kind == "text" and col.distinct >= ROW_NAMES_SHARE * table.row_count > 0


def is_id(col: Column, table: Table) -> bool:
    """A column that names each row once, by an id header ("order_id", "order_no") or by code
    values ("CW-4012"): its word names the rows, and its values are names, not quantities.
    Kept per table: the features ask it of every column in every step of the chart."""
    known = table.cache.setdefault("is_id", {})
    if col.name not in known:
        name = col.base.lower()
        known[col.name] = col.distinct >= table.row_count > 1 and (
            name.endswith(ID_ENDINGS) or col.kind == "text" and bool(col.values) and all(
                _CODE.match(v) for v in col.values[:CODES_READ]))
    return known[col.name]


def question_grams(question: str) -> tuple[str, ...]:
    """The grams `analyse` pairs with meanings, from the question alone: the lexicon uses them
    to tell which logged confirmations back a learned word."""
    words = read_question(question.replace("\x00", " ").strip()[:MAX_QUESTION])
    return _grams(words) + (f"qtype:{_qtype(words)}",)


COMPARATIVE_GRAM = "how much [comparative]"   # how much better / how many more … than


def _grams(words: Words) -> tuple[str, ...]:
    stems = [t.stem for t in words.tokens if is_word(t.text) or t.text == "n't"]
    grams = set(stems) | {f"{a} {b}" for a, b in zip(stems, stems[1:])}
    grams |= {f"{a} {b} {c}" for a, b, c in zip(stems, stems[1:], stems[2:])}
    if _asks_how_much_comparative(words):
        grams.add(COMPARATIVE_GRAM)
    return tuple(sorted(grams))


def _asks_how_much_comparative(words: Words) -> bool:
    """"How much better …than", "how many fewer … than": a difference, whatever the
    comparative; one gram for them all, so that no list of adjectives is needed."""
    texts = [t.text for t in words.tokens]
    if "than" not in texts:
        return False
    for i in range(len(texts) - 2):
        if texts[i] == "how" and texts[i + 1] in ("much", "many"):
            word = texts[i + 2]
            return word in ("more", "less", "fewer", "better", "worse") or bool(
                word.endswith("er") and degree_base(word))
    return False


def _head(words: Words, openers: tuple[str, ...]) -> int:
    """Where the noun that names what is asked for stands: "how many X", "which X"."""
    texts = [t.text for t in words.tokens]
    for i in range(len(texts)):
        for opener in openers:
            parts = opener.split()
            if texts[i : i + len(parts)] == parts and (len(parts) > 1 or i < 3):
                j = i + len(parts)
                break
        else:
            continue
        while j < len(texts) and texts[j] in {"different", "distinct", "unique", "the", "kind",
                                               "kinds", "of", "type", "types", "more", "fewer",
                                               "less"}:   # "how many more tickets …"
            j += 1
        return j
    return -1


def _qtype(words: Words) -> str:
    texts = [t.text for t in words.tokens]
    joined = " ".join(texts)
    if "how many" in joined or joined.startswith("number of") or texts[:1] == ["count"]:
        return "how_many"
    if "how much" in joined or "how long" in joined or "how old" in joined:
        return "how_much"
    first = texts[0] if texts else ""
    if first in {"is", "are", "was", "were", "did", "does", "do", "has", "have", "had", "can"}:
        return "yes_no"
    for wh in ("who", "when", "where", "which", "what"):
        if wh in texts[:4]:
            return wh
    if first in {"list", "name", "show", "give"}:
        return "list"
    return "other"


def _negations(words: Words) -> list[Atom]:
    """One NOT atom on each negation word of the question ("n't", "not", "except" …), so that
    a word negates one condition, not every one: a floating NOT, which every negation word
    pays for, could be applied twice. With no such word a floating one is offered (teaching may
    find a team's own word for it)."""
    texts = [t.text for t in words.tokens]
    found = []
    for phrase in NEGATION_PHRASES:
        n = len(phrase)
        found += [Atom("NOT", "not", (i, i + n), "cue", 0) for i in range(len(texts) - n + 1)
                  if tuple(texts[i:i + n]) == phrase]
    return found


def _wh_columns(words: Words, table: Table, qtype: str, spans: dict) -> list[Atom]:
    """"who …", "where …", "when …" with no column named for the answer: the columns of the
    kind the word asks for (a person, a place, a date), standing on the wh-word."""
    kinds = WH_COLUMNS.get(qtype)
    texts = [t.text for t in words.tokens]
    if not kinds or qtype not in texts[:4]:
        return []
    at = texts.index(qtype)
    return [Atom(slot, col.name, (at, at + 1), "wh", 0) for col in table.columns
            if col.name not in spans and _wh_kind(col, qtype, kinds)
            for slot in set(_slots(col, table)) & {"ANYCOL", "KEYCOL", "DATECOL"}]


def _wh_kind(col: Column, qtype: str, kinds: frozenset[str]) -> bool:
    """Whether a column holds what the wh-word asks for: by its header's words, or its kind
    (a date for "when"), or its values (people's names for "who")."""
    header = {stem(w) for w in split_words(header_text(col))}
    if header & kinds:
        return True
    if qtype == "when":
        return col.kind == "date"
    return qtype == "who" and not header & WH_COLUMNS["where"] and _names_people(col)


_PERSON = re.compile(r"[A-Z][a-z'’.-]+(?: [A-Z][a-z'’.-]+){1,2}")


def _names_people(col: Column) -> bool:
    """Text values that look like people's names: two or three capitalised words, mostly."""
    sample = [str(v) for v in col.values[:50]]
    return col.kind == "text" and len(sample) >= 2 and sum(
        bool(_PERSON.fullmatch(v)) for v in sample) >= 0.8 * len(sample)


# ── columns ───────────────────────────────────────────────────────────────────────────────────
UNIT_WORDS = {"mm", "cm", "m", "km", "g", "kg", "lb", "lbs", "eur", "usd", "gbp", "pct", "min",
              "mins", "sec", "s", "h", "hrs", "no", "num", "number", "the", "of", "a", "in",
              "total", "amount", "value"}


def _column_mentions(words, table, content, atoms, deadline=None):
    stems = [t.stem for t in words.tokens]
    found, headers = {}, {}
    for col in table.columns:
        _in_time(deadline)
        headers[col.name] = _header_words(col)
        found[col.name] = _match_header(headers[col.name], stems, words)
    days = _days_as_rows(words, table)
    for name, (_, span) in list(found.items()):
        if span and set(range(*span)) <= days:   # "how many days": the rows, not day numbers
            found[name] = ("none", None)
    _day_of_month(words, table, found)
    _period_words(words, table, found)
    _near_words(words, headers, found)
    values = _value_index(table)["exact"]
    for name, (quality, span) in list(found.items()):
        if quality in ("synonym", "related") and any(c == name for c, _ in values.get(
                words.tokens[span[0]].text, [])):
            found[name] = ("none", None)
    _drop_modifiers(found)
    # a comparative or a synonym that names a column is content, though it looks like a cue
    content |= {i for quality, span in found.values() if span and quality != "fuzzy"
                for i in range(*span) if not words.tokens[i].stop}
    col_match = {name: quality for name, (quality, _) in found.items()}
    spans = {name: span for name, (_, span) in found.items() if span}
    for col in table.columns:
        span = spans.get(col.name)
        covers = sum(1 for i in range(*span) if i in content) if span else 0
        for slot in _slots(col, table):
            atoms[slot].append(Atom(slot, col.name, span, col_match[col.name], covers))
            if slot == "DATECOL" and span:   # a date says its column: "after 8 May"
                atoms[slot].append(Atom(slot, col.name, None, "none", 0))
    return col_match, spans


# Words that name a period of a date: "which month", "the busiest weekday" name the date
# column whose month or day of the week is asked for, whatever its header says.
PERIOD_NAMES = frozenset({"month", "months", "monthly", "year", "years", "yearly", "weekday"})


def _period_words(words: Words, table: Table, found: dict) -> None:
    """When the question names no date column, a period word names each (a synonym): its
    month is asked for. One named ("delivered each month") is the one the period is of."""
    said = next((i for i, t in enumerate(words.tokens) if t.text in PERIOD_NAMES), None)
    dates = [col for col in table.columns if col.kind == "date" and col.view is None]
    if said is None or any(found[col.name][1] for col in dates):
        return
    for col in dates:
        found[col.name] = ("synonym", (said, said + 1))


NEAR = 0.55   # word-vector cosine from which a word names a header: staff → employees is 0.64,
#               unrelated pairs stay below 0.4


def _near_words(words: Words, headers: dict[str, tuple], found: dict) -> None:
    """A content word that names no column by its letters, a synonym or WordNet names the header
    nearest it in meaning by the shipped word vectors (rainfall → precip, staff → employees),
    when that header is named by nothing else. Only the nearest: related words are often
    neighbours, not synonyms (students are near teachers). A cue word ("highest" is near
    height) and a month name say something else."""
    taken = {i for _, span in found.values() if span for i in range(*span)}
    taken |= {i for d in words.dates for i in range(d.start, d.end)}
    spelled = {h for all_stems, _, _ in headers.values() for h in all_stems}
    cores = {name: core for name, (_, core, _) in headers.items()}
    for tok in words.tokens:
        if tok.index in taken or tok.stem in spelled or tok.stop or tok.text in CUE_WORDS \
                or tok.text in MONTHS or not tok.text.isalpha():
            continue   # a header's own word left unnamed was dropped on purpose ("how many days")
        name, closeness = _nearest_header(tok, cores)
        if closeness >= NEAR and not found[name][1]:
            found[name] = ("related", (tok.index, tok.index + 1))


def _nearest_header(tok, cores: dict[str, set[str]]) -> tuple[str, float]:
    """The column whose header words come nearest the word (or its degree's adjective)."""
    base = degree_base(tok.text)
    stems = {tok.stem, stem(base)} if base else {tok.stem}
    best = ("", 0.0)
    for name, core in cores.items():
        closeness = max((similarity(s, h) for s in stems for h in core), default=0.0)
        if closeness > best[1]:
            best = (name, closeness)
    return best


def _drop_modifiers(found: dict) -> None:
    """A word related to a header only by meaning is no mention of it when another column's name
    follows it: in "the lowest temperature", lowest says which temperature, not a grade."""
    named = {span[0] for quality, span in found.values()
             if span and quality not in ("related", "fuzzy", "none")}
    for name, (quality, span) in list(found.items()):
        if quality == "related" and span[1] in named:
            found[name] = ("none", None)


def _header_words(col: Column) -> tuple[list[str], set[str], set[str]]:
    """The stems of a header, those of them that must be said for an exact mention, and those
    words as written (a stem cuts a joined header short: basesal → bases)."""
    words = split_words(header_text(col)) or split_words(col.base.replace("_", " "))
    stems = [stem(w) for w in words]
    written = {w for w in words if w not in UNIT_WORDS} or set(words)
    core = {stem(w) for w in written}
    return stems, core, written


def header_text(col: Column) -> str:
    """A header's words as the question may say them. A header can be a whole paragraph (or a
    misread cell): its first MAX_HEADER characters are matched, so it cannot slow every
    question down."""
    return col.header[:MAX_HEADER].replace("_", " ")


def _match_header(header: tuple[list[str], set[str], set[str]], stems: list[str], words: Words):
    """The best mention of a header in the question: (quality, span).

    The longest run of question words that are all header words wins; it is exact when it
    says every header word but units ("bill length" for "bill_length_mm").
    """
    all_stems, core, written = header
    best_run = None
    i = 0
    while i < len(stems):
        j = i
        while j < len(stems) and stems[j] in all_stems and not (
                words.tokens[j].stop and stems[j] not in core):
            j += 1
        said = {stems[k] for k in range(i, j)} & core
        if said and (best_run is None or len(said) > best_run[0]):
            best_run = (len(said), (i, j), said == core)
        i = max(j, i + 1)
    if best_run:
        return ("exact" if best_run[2] else "partial"), best_run[1]
    for i, s in enumerate(stems):
        if words.tokens[i].stop or not s[0].isalnum():
            continue
        base = degree_base(words.tokens[i].text)
        if any(h in SYNONYMS.get(s, ()) or (base and (h in (base, _y_noun(base))
                                                      or h in SYNONYMS.get(base, ())))
               for h in core):
            return "synonym", (i, i + 1)
    # a stem can spoil a shortening's letters (hwy → hwi): the header as written says it too
    shortened = _shortened_mention(core, words) or _shortened_mention(written, words)
    if shortened:
        return "abbrev", shortened
    joined = _joined_mention(written, words)
    if joined:
        return joined
    span = _related_mention(core, written, words)
    if span:
        return "related", span
    for i, s in enumerate(stems):
        if len(s) >= 4 and not words.tokens[i].stop and any(
                len(h) >= 4 and fuzz.ratio(s, h) >= 84 for h in core):
            return "fuzzy", (i, i + 1)
    return "none", None


def _related_mention(core: set[str], written: set[str], words: Words) -> tuple[int, int] | None:
    """The span of a question word that names the header by a word related in meaning
    (prior.related, from WordNet): heaviest → weight, whole or shortened (wt), pupils →
    enrollee of enrltot. Tried after every reading of the words' own letters, as it guesses
    more."""
    for tok in words.tokens:
        if not tok.stop and tok.stem[:1].isalnum() and core & _related(tok):
            return tok.index, tok.index + 1
    if not any(_related(tok) for tok in words.tokens):
        return None
    joined = _joined_mention(written, words, related=True)
    return _shortened_mention(core, words, related=True) or (joined[1] if joined else None)


def _related(tok) -> frozenset[str]:
    """What a content word may mean by prior.related; a cue word ("total", "number") says an
    operator, and a degree (heaviest, hotter) its adjective's attribute."""
    if tok.stop:
        return frozenset()
    own = related(tok.stem)
    base = degree_base(tok.text)
    if base and not own:   # a regular degree (longest); "number" is a word of its own, no numb
        return related(base, DEGREE_RELATIONS)
    return related(tok.stem, DEGREE_RELATIONS) if tok.text in CUE_WORDS else own


RELATED_SHORT = 0.6   # a shortening of a related word drops much of it: temp, not year of yearn


def _shortened_mention(core: set[str], words: Words, related: bool = False
                       ) -> tuple[int, int] | None:
    """The span of question words whose shortenings are the header's words, as terse headers
    write them: wt for weight, prcp for precipitation, unitpr for unit price, temp hi for a
    high (or peak, by a synonym) temperature. Every header word must be said, so that one
    shared word (temp of temp_lo) does not name a column by itself."""
    said: dict[str, tuple[int, int]] = {}   # header word → the first and last word saying it
    content = [t for t in words.tokens if not t.stop and t.text[:1].isalpha()]
    for k, tok in enumerate(content):
        following = content[k + 1] if k + 1 < len(content) else None
        for h in core:
            if h in said or not h.isalpha():
                continue
            if any(_shortens(h, full) for full in _spellings(tok)) or related and any(
                    _shortens(h, full) and len(h) <= RELATED_SHORT * len(full)
                    for full in _related(tok)):
                said[h] = (tok.index, tok.index)
            elif following and following.index - tok.index == 1 and _joins(h, tok, following):
                said[h] = (tok.index, following.index)   # both words: "population density"
    if not core or set(said) != core:
        return None
    first, last = min(a for a, _ in said.values()), max(b for _, b in said.values())
    return (first, last + 1) if last - first <= 2 else None


# Pieces a joined header writes around its words and that no question needs to say:
# inmetro, percbelowpoverty, poptotal.
JOINED_FILLERS = ("in", "of", "per", "perc", "pct", "below", "above", "total", "tot", "num",
                  "avg", "mean", "is", "has", "no")
JOINED_SHARE = 0.4   # of a joined header's letters question words must say for a partial mention
JOINED_MAX = 30      # letters of a joined header read; a longer one is no abbreviation


def _joined_mention(written: set[str], words: Words, related: bool = False
                   ) -> tuple[str, tuple[int, int]] | None:
    """A header of abbreviations run together (poptotal, percbelowpoverty, inmetro, basesal)
    named by the question words it is made of: "population" is pop (and total is a filler),
    "metro" is inmetro, "percentage of college graduates" is percollege, "base salary" is
    basesal. Every letter explained (by question words and fillers) is an abbrev mention; a
    question word saying a good share of the letters ("poverty" of percbelowpoverty) a partial
    mention on that word. A word that only says a filler ("percentage" for perc) names no
    column: it would name every perc… header; nor does a word's short start or shortening
    alone (mar of March is no partial mention of margin). Only a header of one long word is
    read so: a header of several words is matched word by word above."""
    if len(written) != 1:
        return None
    header = next(iter(written))
    if not (5 <= len(header) <= JOINED_MAX and header.isalpha()):
        return None
    if related:   # a unit closing the header (distkm) needs no word, as in a header of words
        header = next((header[:-len(u)] for u in UNIT_WORDS if len(u) > 1 and u.isalpha()
                       and header.endswith(u) and len(header) - len(u) >= 4), header)
    content = [t for t in words.tokens
               if not t.stop and t.text.isalpha() and _joined_spellings(t, related)]
    pieces = _header_pieces(header, content, related)
    if all(kind == "filler" for _, _, kind in pieces):
        return None
    at = sorted({tok.index for tok, _, _ in pieces if tok is not None})
    if at[-1] - at[0] > 2:   # a filler said far off ("pupils … in total") is no part of it
        at = sorted({tok.index for tok, _, kind in pieces if tok is not None and kind != "filler"})
    if sum(k for _, k, _ in pieces) == len(header) and at and at[-1] - at[0] <= 2:
        return "abbrev", (at[0], at[-1] + 1)
    if related:   # a share of the letters said by a related word is a guess on a guess
        return None
    said = [(tok, k) for tok, k, kind in pieces if kind == "word"]
    if said and sum(k for _, k in said) >= JOINED_SHARE * len(header):
        tok = max(said, key=lambda piece: piece[1])[0]
        return "partial", (tok.index, tok.index + 1)
    return None


def _header_pieces(header: str, content: list, related: bool = False
                   ) -> list[tuple[object, int, str]]:
    """The best reading of a joined header as pieces (question token or None, letters, kind):
    most letters explained, then most said by question words (not as fillers, then at all),
    then fewest pieces. A piece is a "word": a question word (or its stem) of at least 4
    letters as written inside the header, or its start of at least 4 letters at the header's
    start or end (dens of densely); "weak": a 3-letter start there (pop of population, sal of
    salary) or a shortening (yrs of years); or a "filler". A word's start inside the header
    would be any word's: lar of largest is no part of dollars."""
    n = len(header)
    # position → (letters, letters said by non-filler words, by any word, -pieces, pieces)
    best: list = [None] * (n + 1)
    best[0] = (0, 0, 0, 0, [])
    for i in range(n):
        if best[i] is None:
            continue
        letters, said, spoken, count, pieces = best[i]
        options = [(None, len(f), "filler") for f in JOINED_FILLERS if header.startswith(f, i)]
        for tok in content:
            # a related word's start must drop much of it: temp of temperature, not bran(d)
            extra = _related_pieces(tok) if related else set()
            for spelling in _joined_spellings(tok, related):
                common = _common_start(header, i, spelling)
                options += [(tok, k, "word" if k >= 4 else "weak") for k in range(3, common + 1)
                            if (k == len(spelling) and k >= 4) or (i == 0 or i + k == n) and (
                                spelling not in extra or k <= RELATED_SHORT * len(spelling))]
                options += [(tok, k, "weak") for k in range(3, 6) if i + k <= n
                            and (i == 0 or i + k == n) and _skeleton(header[i:i + k])
                            and _shortens(header[i:i + k], spelling)]
        for tok, k, kind in options:
            if header[i:i + k] in JOINED_FILLERS:
                kind = "filler"   # "percentage" says no more than perc does
            step = (letters + k, said + (0 if kind == "filler" else k),
                    spoken + (tok is not None) * k, count - 1, pieces + [(tok, k, kind)])
            if best[i + k] is None or step[:4] > best[i + k][:4]:
                best[i + k] = step
        gap = (letters, said, spoken, count, pieces)   # a letter no piece explains
        if best[i + 1] is None or gap[:4] > best[i + 1][:4]:
            best[i + 1] = gap
    return best[n][4]


def _joined_spellings(tok, related: bool = False) -> set[str]:
    """What a question word may say inside a joined header. A cue or a superlative says it only
    through the words it stands for ("expensive" → price of libprice): its own start would be
    any word's (lar of largest is no part of dollars)."""
    extra = _related_pieces(tok) if related else set()
    if tok.text in CUE_WORDS or tok.text.endswith("est"):
        return _spellings(tok) - {tok.text, tok.stem} | extra
    return {tok.text, tok.stem, *SYNONYMS.get(tok.stem, ())} | extra


DEGREE_RELATIONS = ("attr",)


def _related_pieces(tok) -> set[str]:
    """The related words a question word may say inside a joined header: of 4 letters or more,
    as a shorter one would be a guess on a guess (tot, to tot up, in enrltot is no total)."""
    return {w for w in _related(tok) if len(w) >= 4}


def _skeleton(piece: str) -> bool:
    """Whether a piece is written as shortenings are, by dropping vowels (yrs, qty): popa is
    no shortening of population, only letters of it in order."""
    return not any(letter in "aeiou" for letter in piece[1:])


def _common_start(header: str, i: int, word: str) -> int:
    """How many letters of `word` the header spells from position i."""
    k = 0
    while i + k < len(header) and k < len(word) and header[i + k] == word[k]:
        k += 1
    return k


def _spellings(tok) -> set[str]:
    """A question word and the words it may stand for (peak → high, warmest → temperature)."""
    out = {tok.text, tok.stem, *SYNONYMS.get(tok.stem, ())}
    base = degree_base(tok.text)
    if base:   # the base's own letters say too little: wet (wettest) is not wt (weight)
        out |= set(SYNONYMS.get(base, ()))
    return out


def _shortens(short: str, word: str) -> bool:
    """Whether `short` is `word` shortened: its first letter, then some of the others in order
    (qty, stn, wt). At least two letters, and shorter than the word."""
    if not 2 <= len(short) < len(word) or short[0] != word[0]:
        return False
    rest = iter(word[1:])
    return all(letter in rest for letter in short[1:])


def _joins(short: str, first, second) -> bool:
    """A header word run together from two question words: unitpr for "unit price"."""
    return any(short[:k] in (first.text, first.stem) or _shortens(short[:k], first.text)
               for k in range(2, len(short) - 1)
               if any(_shortens(short[k:], w) or short[k:] == w
                      for w in (second.text, second.stem)))


def _y_noun(base: str) -> str:
    """The noun under an adjective in -y, as its comparative's base has it: windi (windier) →
    wind, sunni → sun; other bases are returned as they are."""
    if len(base) >= 5 and base.endswith("i"):
        noun = base[:-1]
        return noun[:-1] if noun[-1] == noun[-2] and noun[-1] not in "aeiousl" else noun
    return base


def degree_base(word: str) -> str | None:
    """The stem under a comparative or superlative: heaviest → heavi, longer → long."""
    for suffix, repl in (("iest", "i"), ("ier", "i"), ("est", ""), ("er", "")):
        if word.endswith(suffix) and len(word) - len(suffix) >= 3:
            root = word[: -len(suffix)] + repl
            if len(root) >= 4 and root[-1] == root[-2] and root[-1] not in "aeiousl":
                root = root[:-1]   # biggest → big
            return stem(root)
    return None


def _slots(col: Column, table: Table) -> list[str]:
    if col.view and is_id(table.column(col.base), table):
        return []   # "BK-0091" holds a number, but it is a name, not a quantity
    slots = []
    if col.view is None:
        slots.append("ANYCOL")
    if col.kind == "number":
        slots += ["NUMCOL", "ORDCOL"]
        if col.integer and col.view is None and 1 < col.distinct <= 20:
            slots.append("KEYCOL")
    elif col.kind == "date":
        slots += ["DATECOL", "ORDCOL"]
    elif col.distinct < max(table.row_count, 2) or table.row_count <= 1:
        slots.append("KEYCOL")
    return slots


# ── cell values ───────────────────────────────────────────────────────────────────────────────
def _value_index(table: Table) -> dict:
    """Per table, once: normalised cell text and its stems → (column, value)."""
    if "value_index" in table.cache:
        return table.cache["value_index"]
    exact: dict[str, list] = defaultdict(list)
    by_stem: dict[str, list] = defaultdict(list)
    by_word: dict[str, list] = defaultdict(list)
    for col in table.columns:
        if col.kind not in ("text", "bool") or col.view is not None:
            continue
        for value in col.values:
            text = str(value)
            norm = normalise(text[:MAX_CELL])
            if not norm:
                continue
            whole = len(text) <= MAX_CELL   # a longer cell is found by the words it starts with
            if whole:
                exact[norm].append((col.name, value))
            vstems = tuple(stem(w) for w in split_words(norm))
            if vstems:
                if whole:
                    by_stem[" ".join(vstems)].append((col.name, value))
                for w in set(vstems):
                    by_word[w].append((col.name, value, vstems))
    index = {"exact": exact, "stem": by_stem, "word": by_word, "name": _names_index(table)}
    table.cache["value_index"] = index
    return index


def _names_index(table: Table) -> dict[str, list]:
    """The names of the well-known things columns write as codes (Ohio for OH, Denmark for
    DK, codes.py) → (column, value)."""
    names: dict[str, list] = defaultdict(list)
    for col in table.columns:
        for name, value in codes.names_of(col).items():
            names[name].append((col.name, value))
    return names


def _value_mentions(words, table, content, col_match, col_spans, atoms, deadline=None):
    index = _value_index(table)
    tokens = words.tokens
    found: dict[tuple, Atom] = {}

    def add(slot, value, span, quality):
        covers = sum(1 for i in range(*span) if i in content)
        key = (slot, value)
        old = found.get(key)
        rank = ("exact", "stem", "partial", "fuzzy", "quoted")
        if old is None or (covers, -rank.index(quality) if quality in rank else 0) > (
                old.covers, -rank.index(old.quality) if old.quality in rank else 0):
            found[key] = Atom(slot, value, span, quality, covers)

    for text, at in words.quoted:
        for col, value in index["exact"].get(normalise(text), []):
            add("ENTITY", (col, value), (at, at + 1), "exact")
        for col in table.columns:
            if col.kind == "text" and col.view is None:
                add("CONTAINS", (col.name, text), (at, at + 1), "quoted")
    for i in range(len(tokens)):
        _in_time(deadline)
        for j in range(i + 1, min(len(tokens), i + MAX_NGRAM) + 1):
            span_tokens = tokens[i:j]
            if j - i == 1 and len(tokens[i].text) == 1 and tokens[i].text.isalpha():
                _letter(index, tokens, i, col_spans, add)
                continue
            if not any(k in content for k in range(i, j)) and j - i == 1 and tokens[i].stop:
                continue
            if not any(is_word(t.text) for t in span_tokens):
                continue
            phrase = " ".join(t.text for t in span_tokens)
            stems = " ".join(t.stem for t in span_tokens if is_word(t.text))
            hits = index["exact"].get(phrase) or index["exact"].get(phrase.replace(" - ", "-"))
            for col, value in hits or []:
                add("ENTITY", (col, value), (i, j), "exact")
            if not hits:
                for col, value in index["stem"].get(stems, []):
                    add("ENTITY", (col, value), (i, j), "stem")
            for col, value in index["name"].get(phrase) or index["name"].get(stems, []):
                add("ENTITY", (col, value), (i, j), "code")   # "Ohio" for OH
            _partial(index, span_tokens, stems, (i, j), content, add, table)
    _fuzzy(index, tokens, content, found, add, deadline)
    _coded_values(table, words, col_spans, content, add)
    _floating(table, words, found, col_match, col_spans, content, atoms)
    atoms["ENTITY"] += _flags(table, col_spans, content)
    for atom in found.values():
        atoms[atom.slot].append(atom)


VALUE_CODE_LETTERS = (2, 4)   # a coded value of a small column: pt, ft, PAC, WNC


def _coded_values(table: Table, words: Words, col_spans, content, add) -> None:
    """A small column's short coded values said in full: pt by "part-timers" (the initials of
    words in a row), PAC by "Pacific" (the start of a word, at least 3 letters). Words that
    name a column are not read so, nor columns of codes whose names codes.py knows."""
    named = {i for span in col_spans.values() for i in range(*span)}
    said = [t for t in words.tokens if not t.stop and t.index not in named and t.text.isalpha()]
    for col in table.columns:
        if col.kind != "text" or col.view is not None or col.distinct > FLOATING_VALUES \
                or codes.names_of(col):
            continue
        for value in col.values:
            code = str(value).lower()
            if VALUE_CODE_LETTERS[0] <= len(code) <= VALUE_CODE_LETTERS[1] and code.isalpha():
                for span in _spelled_out(code, said, words, content):
                    add("ENTITY", (col.name, value), span, "abbrev")


def _spelled_out(code: str, said: list, words: Words, content) -> list[tuple[int, int]]:
    """The spans of words that a code shortens: its letters their initials, one word each, the
    words in a row (a hyphen may join them); or one word it starts (3 letters at least)."""
    spans = [(t.index, t.index + 1) for t in said if t.index in content
             and len(code) >= 3 and len(t.text) > len(code) and t.text.startswith(code)]
    for k in range(len(said) - len(code) + 1):
        run = said[k:k + len(code)]
        joined = all(words.tokens[i].text == "-" for a, b in zip(run, run[1:])
                     for i in range(a.index + 1, b.index))
        if joined and "".join(t.text[0] for t in run) == code:
            spans.append((run[0].index, run[-1].index + 1))
    return spans


def _flags(table: Table, col_spans, content) -> list[Atom]:
    """A 0/1 column named by its word stands for its 1: "metro counties" are inmetro = 1,
    "remote staff" remote = 1; "non-metro" negates it (a NOT atom on "non")."""
    flags = []
    for col in table.columns:
        span = col_spans.get(col.name)
        if span and col.kind == "number" and col.view is None and col.integer \
                and col.distinct == 2 and (col.minimum, col.maximum) == (0, 1):
            covers = sum(1 for i in range(*span) if i in content)
            flags.append(Atom("ENTITY", (col.name, 1), span, "flag", covers))
    return flags


def _letter(index, tokens, i: int, col_spans, add) -> None:
    """A one-letter cell value ("size a", "grade of c") is read after its column's name; a letter
    elsewhere is read only when it is no article ("a size", "how many a…") and no piece of
    another word ("e-bike", "o'clock")."""
    beside = {"-", "'", "’", "/", "&", "."}
    glued = any(0 <= k < len(tokens) and tokens[k].text in beside for k in (i - 1, i + 1))
    for col, value in index["exact"].get(tokens[i].text, []):
        span = col_spans.get(col)
        after = span and 0 <= i - span[1] <= 1 and all(tokens[k].stop for k in range(span[1], i))
        if after or not (tokens[i].stop or glued):
            add("ENTITY", (col, value), (i, i + 1), "exact")


def _with_column_words(entities: list[Atom], col_spans, content, words: Words) -> list[Atom]:
    """"dream island", "rating of 1": a value beside its column's name is one mention. Only a
    function word may come between ("of"): a cue cannot ("readings before 3 April" is no
    mention of the date 3 April)."""
    merged = []
    for atom in entities:
        if atom.span is None or atom.quality.startswith("floating"):
            continue
        span = col_spans.get(atom.value[0])
        if span and span[0] >= atom.span[1] and _said_in_plural(words, span, atom.value[0]):
            continue   # "Ohio counties" are many rows: no one county named Ohio
        gap = range(min(span[1], atom.span[1]), max(span[0], atom.span[0])) if span else ()
        if span and len(gap) <= 1 and all(words.tokens[i].stop for i in gap) and (
                span[1] <= atom.span[0] or atom.span[1] <= span[0]):
            start, end = min(span[0], atom.span[0]), max(span[1], atom.span[1])
            covers = sum(1 for i in range(start, end) if i in content)
            merged.append(Atom("ENTITY", atom.value, (start, end), atom.quality, covers))
    return merged


def _said_in_plural(words: Words, span: tuple[int, int], column: str) -> bool:
    """Whether a singular header is said in the plural ("counties" for county)."""
    said = words.tokens[span[1] - 1].text
    written = set(split_words(column.replace("_", " ").lower()))
    return said not in written and said.endswith("s") and stem(said) in {
        stem(w) for w in written}


def _partial(index, span_tokens, stems, span, content, add, table):
    """A phrase inside a longer cell: "derboven" in "Willy Derboven (BEL)"."""
    parts = stems.split()
    if not parts or not any(k in content for k in range(*span)) or _names_a_column(parts, table):
        return
    candidates = index["word"].get(parts[0], [])
    if len(candidates) > 200:   # a very common word says little
        return
    text = " ".join(t.text for t in span_tokens)
    n = len(parts)
    inside = [(col, value) for col, value, vstems in candidates
              if len(vstems) > n and any(list(vstems[k:k + n]) == parts for k in range(len(vstems)))]
    per_column = Counter(col for col, _ in inside)
    for col, value in inside:
        if per_column[col] > 1 and per_column[col] >= table.column(col).distinct:
            continue   # in every value of the column ("sales" in sales_01.csv, sales_02.csv)
        add("ENTITY", (col, value), span, "partial")
        add("CONTAINS", (col, text), span, "partial")


def _names_a_column(parts: list[str], table: Table) -> bool:
    """Whether a phrase's stems are all words of one header: "district" (or "counties") names
    the column, not the school district whose name holds the word."""
    headers = table.cache.get("header_stems")
    if headers is None:       # once per table, not per phrase
        headers = table.cache["header_stems"] = [
            frozenset(stem(w) for w in split_words(header_text(col))) for col in table.columns]
    return any(set(parts) <= header for header in headers)


def _fuzzy(index, tokens, content, found, add, deadline=None):
    """Misspelt or differently written cell values, only for words nothing else explained."""
    taken = {i for a in found.values() if a.span for i in range(*a.span)}
    values = index["exact"]
    if len(values) > 20000:
        return
    keys = list(values)
    for i in range(len(tokens)):
        _in_time(deadline)
        for j in (i + 1, i + 2, i + 3):
            if j > len(tokens) or not all(k in content and k not in taken for k in range(i, j)):
                continue
            phrase = " ".join(t.text for t in tokens[i:j])
            if len(phrase) < 4:
                continue
            for key in keys:
                if abs(len(key) - len(phrase)) <= 3 and fuzz.ratio(phrase, key) >= 85:
                    for col, value in values[key]:
                        add("ENTITY", (col, value), (i, j), "fuzzy")


def _floating(table, words, found, col_match, col_spans, content, atoms):
    """Values of small columns, offered without a mention of the value.

    When the column is named ("refunded" → refunded = yes) the value stands on that name, so
    the same words cannot also be read as the column elsewhere in the form. Otherwise the value
    may stand on a content word that nothing in the table explains ("no-shows" → status = did
    not arrive): a team word only teaching can pair with its value, so the pairing must be
    among the candidates for teaching to find it.
    """
    anchored = {a.value for a in found.values() if a.slot == "ENTITY"}
    unknown = _unexplained_words(words, found, col_spans, content)
    for col in table.columns:
        if col.view is not None or col.kind not in ("text", "bool"):
            continue
        if not 1 < col.distinct <= FLOATING_VALUES or col.distinct >= table.row_count:
            continue
        for value in col.values:
            if (col.name, value) in anchored:
                continue
            value = (col.name, _typed(col, value))
            span = col_spans.get(col.name)
            if span:
                covers = sum(1 for i in range(*span) if i in content)
                atoms["ENTITY"].append(Atom("ENTITY", value, span, "floating+col", covers))
                continue
            atoms["ENTITY"].append(Atom("ENTITY", value, None, "floating", 0))
            atoms["ENTITY"].extend(Atom("ENTITY", value, (i, i + 1), "floating+word", 1)
                                   for i in unknown)


def _unexplained_words(words, found, col_spans, content) -> list[int]:
    """Content words no column, cell value or number of the table accounts for."""
    explained = {i for a in found.values() if a.span and a.quality in ("exact", "stem", "quoted")
                 for i in range(*a.span)}
    explained |= {i for span in col_spans.values() for i in range(*span)}
    return [i for i in sorted(content) if i not in explained
            and not any(ch.isdigit() for ch in words.tokens[i].text)][:UNEXPLAINED_WORDS]


def _joined_column(words: Words, span: tuple[int, int], col_spans: dict) -> str | None:
    """The column named by the word hyphen-joined after a number ("4-cylinder", "3-bedroom"):
    the number is that column's value. The word may repeat the one that named the column
    ("4-cylinder … than 8-cylinder ones"), which is matched once."""
    tokens = words.tokens
    if span[1] + 1 >= len(tokens) or tokens[span[1]].text != "-":
        return None
    word = tokens[span[1] + 1].stem
    return next((name for name, (start, end) in col_spans.items()
                 if any(tokens[i].stem == word for i in range(start, end))), None)


def _typed(col: Column, value):
    if col.kind == "bool":
        return {"true": True, "false": False}.get(str(value).lower(), value)
    return value


# ── team words ────────────────────────────────────────────────────────────────────────────────
def _team_word_mentions(words: Words, table: Table, content: set[int],
                        team_words: Sequence[L.Defined]) -> list[Atom]:
    """Where the question says a taught team word (its stems in a row), for a table that has
    the columns its definition reads."""
    stems = [t.stem for t in words.tokens]
    names = {col.name for col in table.columns}
    atoms = []
    for defined in team_words:
        span = phrase_span(stems, defined.word)
        if span and set(L.columns_of(defined.rows)) <= names:
            atoms.append(Atom("TEAMWORD", defined, span, "taught",
                              sum(1 for k in range(*span) if k in content)))
    return atoms


def phrase_span(stems: list[str], phrase: str) -> tuple[int, int] | None:
    """Where a team word's stems first stand in a row among a question's stems, or None."""
    said = phrase_stems(phrase)
    for i in range(len(stems) - len(said) + 1 if said else 0):
        if stems[i:i + len(said)] == said:
            return i, i + len(said)
    return None


def phrase_stems(phrase: str) -> list[str]:
    """A question's or a team word's stems as a question's tokens carry them."""
    return [t.stem for t in read_question(phrase).tokens if is_word(t.text)]


# ── numbers and dates ─────────────────────────────────────────────────────────────────────────
def _number_mentions(words, table, content, col_spans, atoms):
    for number in words.numbers:
        span = (number.start, number.end)
        atoms["NUMBER"].append(Atom("NUMBER", number.value, span, "ordinal" if number.ordinal
                                    else "number", 1))
        joined = _joined_column(words, span, col_spans)
        for col in table.columns:
            named = col_spans.get(col.name)
            beside = named and (0 <= span[0] - named[1] <= 1 or 0 <= named[0] - span[1] <= 1)
            if col.kind == "number" and (beside or _has_value(table, col, number.value)):
                atoms["ENTITY"].append(Atom("ENTITY", (col.name, _num(number.value)), span,
                                            "compound" if col.name == joined else "number", 1))
    latest = _latest_year(table)
    for date in words.dates:
        span = (date.start, date.end)
        if date.day and date.month and not date.year and latest:
            date = replace(date, year=_year_of(table, date.month, date.day) or latest)
        if date.day and date.month and date.year:
            atoms["DATE"].append(Atom("DATE", date, span, "date", 1))
            for col in table.columns:
                if col.kind == "date":
                    atoms["ENTITY"].append(Atom("ENTITY", (col.name, _as_date(date)), span,
                                                "date", 1))
        elif date.year and not date.month:
            atoms["DATE"].append(Atom("DATE", date, span, "year", 1))
            atoms["PERIOD"].append(Atom("PERIOD", date, span, "year", 1))
        elif date.month:
            atoms["PERIOD"].append(Atom("PERIOD", date, span, "month", span[1] - span[0]))
            if date.year or latest:   # "before October 2024" compares with the month's bounds
                year = date.year or _year_of(table, date.month) or latest
                atoms["DATE"].append(Atom("DATE", replace(date, year=year),
                                          span, "month", span[1] - span[0]))


def _year_of(table: Table, month: int, day: int | None = None) -> int | None:
    """The latest year in which a day (or a month) without a year falls inside the span of the
    table's dates: "after 17 November" of jobs from March 2025 to February 2026 is in 2025.
    None when it falls in none of their years."""
    spans = [(str(col.minimum)[:10], str(col.maximum)[:10]) for col in table.columns
             if col.kind == "date" and col.minimum is not None and col.maximum is not None]
    spans = [(lo, hi) for lo, hi in spans if lo[:4].isdigit() and hi[:4].isdigit()]
    if not spans:
        return None
    first, last = min(lo for lo, _ in spans), max(hi for _, hi in spans)
    for year in range(int(last[:4]), int(first[:4]) - 1, -1):
        start = f"{year:04d}-{month:02d}-{day or 1:02d}"
        end = f"{year:04d}-{month:02d}-{day or 31:02d}"
        if start <= last and end >= first:
            return year
    return None


def _latest_year(table: Table) -> int | None:
    """The year a date without one is read in: that of the latest date in the table's date
    columns (so the one year they all hold, or the latest of several; the paraphrase shows it)."""
    years = [int(str(col.maximum)[:4]) for col in table.columns
             if col.kind == "date" and col.maximum is not None and str(col.maximum)[:4].isdigit()]
    return max(years, default=None)


# ── dates held as number columns ──────────────────────────────────────────────────────────────
# A daily log may keep its dates as whole numbers: a month column (1-12), a day of the month
# (1-31), a year. A month name is then a value of the month column ("in July": month = 7), a
# day and month two values ("on 18 June": day = 18 and month = 6), and a date compared
# ("before 10 June") a comparison the rule compare_month_day builds from a DATE atom with no
# year. No date is made up from the parts: the year, when the table has none, is unknown.
DATE_PART_HEADERS = {
    "month": frozenset({"month", "mon", "mo", "mth", "mnth"}),
    "day": frozenset({"day", "dy", "dd", "dom", "mday", "day month"}),
    "year": frozenset({"year", "yr", "yyyy"}),
}
DATE_PART_RANGES = {"month": (1, 12), "day": (1, 31), "year": (1000, 2100)}
_PART_FILLERS = frozenset({"num", "number", "no", "nr", "of", "the", "in"})
# Words before a bare "may" (or "mar", "jun" …) that make it a month: "in May", "than May".
_MONTH_LEAD = frozenset({"in", "of", "than", "before", "after", "since", "until", "till",
                         "between", "during", "from", "to", "through", "except", "outside",
                         "and", "or"})


def date_parts(table: Table) -> dict[str, str]:
    """The number columns that hold a date's parts, by part (month, day, year): whole numbers in
    the part's range under a header that names it ("Month", "mth", "day_of_month"). None
    without a month column: a day or a year alone is no part of a date a question can name."""
    if "date_parts" in table.cache:
        return table.cache["date_parts"]
    found: dict[str, str] = {}
    for col in table.columns:
        part = _date_part(col)
        if part and part not in found:
            found[part] = col.name
    table.cache["date_parts"] = found = found if "month" in found else {}
    return found


def _date_part(col: Column) -> str | None:
    if col.kind != "number" or not col.integer or col.view is not None or col.minimum is None:
        return None
    said = " ".join(w for w in split_words(header_text(col)) if w not in _PART_FILLERS)
    for part, spellings in DATE_PART_HEADERS.items():
        low, high = DATE_PART_RANGES[part]
        if said in spellings and low <= col.minimum and col.maximum <= high:
            return part
    return None


def _one_row_per_day(table: Table) -> bool:
    """Whether each row is one day: its year (when a column holds it), month and day are
    found in no other row."""
    parts = date_parts(table)
    if "day" not in parts:
        return False
    if "one_row_per_day" not in table.cache:
        keys = ", ".join(ident(parts[p]) for p in ("year", "month", "day") if p in parts)
        days = table.con.execute(f"SELECT count(*) FROM (SELECT DISTINCT {keys} FROM t)")
        table.cache["one_row_per_day"] = days.fetchone()[0] == table.row_count
    return table.cache["one_row_per_day"]


def _days_as_rows(words: Words, table: Table) -> frozenset[int]:
    """The words "day"/"days" that name the rows of a log kept one row a day ("how many days",
    "the windiest day"), not its day-of-month column: all but "day of …" and "which day"."""
    tokens = words.tokens
    candidates = [t.index for t in tokens if t.stem == "day"]
    if not candidates or not _one_row_per_day(table):
        return frozenset()
    return frozenset(i for i in candidates
                     if not (i + 1 < len(tokens) and tokens[i + 1].text == "of")
                     and not (i > 0 and tokens[i - 1].text in ("which", "what")))


def _day_of_month(words: Words, table: Table, found: dict) -> None:
    """"day of the month" names the day column, whole: its "month" is no mention of the month
    column."""
    day, month = date_parts(table).get("day"), date_parts(table).get("month")
    texts = [t.text for t in words.tokens]
    for i in range(len(texts) - 2):
        j = i + 3 if texts[i + 2] == "the" else i + 2
        if day and words.tokens[i].stem == "day" and texts[i + 1] == "of" \
                and j < len(texts) and texts[j] in ("month", "months"):
            found[day] = ("exact", (i, j + 1))
            span = found[month][1]
            if span and i <= span[0] and span[1] <= j + 1:
                found[month] = ("none", None)
            return


def _date_part_mentions(words: Words, table: Table, atoms) -> None:
    """A month name, a day and a year said in the question, as values of the columns that
    hold them, and a date after a comparison word or at an end of a range as a DATE atom that
    compare_month_day or between_month_days can compare."""
    parts = date_parts(table)
    if not parts:
        return
    dates = _month_mentions(words)
    ends = _range_ends(words, dates)
    for date in dates:
        span = (date.start, date.end)
        ops = _compared_by(words, date) + ends.get(date.start, ())
        quality = "number" if ops else "exact"   # "before 10 June" is rarely "on 10 June"
        for part, value, at in _said_parts(date, words):
            if part in parts:
                atoms["ENTITY"].append(Atom("ENTITY", (parts[part], value), (at, at + 1),
                                            quality, 1))
        if ops and (parts.get("year") or not date.year):
            atoms["DATE"].append(Atom("DATE", ComparedDate(*astuple(date), ops=ops), span,
                                      "month_day", span[1] - span[0]))


# Days of the week said of a date column: ISO days (Monday 1 … Sunday 7) from first to last.
WEEK_DAYS = {name: (i, i) for i, name in enumerate(
    ("monday", "tuesday", "wednesday", "thursday", "friday", "saturday", "sunday"), start=1)}
WEEK_PARTS = {"weekend": (6, 7), "weekday": (1, 5), "workday": (1, 5)}
# "which weekday", "per weekday", "the busiest weekday": a day of the week asked for, not the
# working week, which a singular "weekday" names only before a noun or after "on a"
_DAY_ASKERS = frozenset({"which", "what", "each", "every", "per", "by", "the"})


def _day_mentions(words: Words, table: Table, atoms) -> None:
    """Days of the week ("on Mondays", "Saturday orders"), the weekend and the working week
    ("weekday orders", "on weekdays") as DAY atoms a date column's day_of_week can take. A
    singular "weekday" names the day of the week asked for instead ("which weekday is
    busiest": a period of per_period and period_best), unless "a" or "on" comes before it or a
    noun after it ("weekday orders")."""
    if not any(col.kind == "date" for col in table.columns):
        return
    tokens = words.tokens
    for i, token in enumerate(tokens):
        word = token.text[:-1] if token.text.endswith("s") else token.text
        days = WEEK_DAYS.get(word) or WEEK_PARTS.get(word)
        if days is None:
            continue
        if token.text == "weekday" and not _working_week(tokens, i):
            continue
        atoms["DAY"].append(Atom("DAY", days, (i, i + 1), "day", 1))


def _working_week(tokens, i: int) -> bool:
    before = tokens[i - 1].text if i else ""
    after = tokens[i + 1] if i + 1 < len(tokens) else None
    return before in ("a", "on", "any") or (
        before not in _DAY_ASKERS and after is not None and not after.stop)


@dataclass(frozen=True)
class ComparedDate(DateMention):
    """A date said right after a comparison word ("before 10 June", "since July"), with the
    comparisons that word asks for: compare_month_day builds only those, as the comparison
    words float and one of them could otherwise be read twice ("after 20 August … below 18")."""

    ops: tuple[str, ...] = ()


# A range of dates: "between May and July", "from 1 June to 15 August", "May through July".
_RANGE_JOINERS = frozenset({"and", "to", "through", "until", "till", "-", "–"})


def _range_ends(words: Words, dates: list[DateMention]) -> dict[int, tuple[str, ...]]:
    """Where two dates make a range, by the start of each: "from" for its first end, "to" for
    its last (ComparedDate.ops, for between_month_days)."""
    texts = [t.text for t in words.tokens]
    starts = {d.start: d for d in dates}
    ends: dict[int, tuple[str, ...]] = {}
    for first in dates:
        second = starts.get(first.end + 1)
        if second and first.end < len(texts) and texts[first.end] in _RANGE_JOINERS and (
                texts[first.end] != "and" or first.start and texts[first.start - 1] == "between"):
            ends[first.start] = ends.get(first.start, ()) + ("from",)
            ends[second.start] = ends.get(second.start, ()) + ("to",)
    return ends


def _compared_by(words: Words, date: DateMention) -> tuple[str, ...]:
    """The comparisons (gt, lt, ge, le) that the one or two words before a date ask for, by the
    prior's cues: "before" lt, "since" ge, "prior to" lt."""
    texts = [t.text for t in words.tokens[max(0, date.start - 2):date.start]]
    phrases = {" ".join(texts[k:]) for k in range(len(texts))}
    return tuple(op for op in OPERATORS["CMP"]
                 if any(CUES[f"cmp:{op}"][1].get(p, 0) >= 1.0 for p in phrases))


def _month_mentions(words: Words) -> list[DateMention]:
    """The question's dates that name a month, and a short month name that is also a word
    ("may") when a preposition leads it ("in May", "than May")."""
    dates = [d for d in words.dates if d.month]
    taken = {i for d in words.dates for i in range(d.start, d.end)}
    tokens = words.tokens
    for t in tokens:
        if t.index not in taken and t.text in MONTHS and t.index > 0 \
                and tokens[t.index - 1].text in _MONTH_LEAD:
            dates.append(DateMention(None, MONTHS[t.text], None, t.index, t.index + 1))
    return dates


def _said_parts(date: DateMention, words: Words) -> list[tuple[str, int, int]]:
    """(part, value, token) for each part of a date mention: the month name's token, the day's
    number, the year's."""
    found = []
    for i in range(date.start, date.end):
        text = words.tokens[i].text
        if text in MONTHS:
            found.append(("month", date.month, i))
        elif date.year and text == str(date.year):
            found.append(("year", date.year, i))
        elif date.day and re.fullmatch(rf"0?{date.day}(st|nd|rd|th)?", text):
            found.append(("day", date.day, i))
    return found


def _num(value: float):
    return int(value) if float(value).is_integer() else value


def _as_date(date: DateMention) -> datetime.date | None:
    try:
        return datetime.date(date.year, date.month, date.day)
    except (TypeError, ValueError):
        return None


def _has_value(table: Table, col: Column, value: float) -> bool:
    if col.minimum is None or not (col.minimum <= value <= col.maximum):
        return False
    key = ("has", col.name, value)
    if key not in table.cache:
        from .sql import has_value
        found = table.con.execute(has_value(col.name, _num(value))).fetchone()
        table.cache[key] = found is not None
    return table.cache[key]


__all__ = ["Analysis", "Atom", "analyse", "ROW"]
