"""φ: the features of a (question, logical form, answer) triple, as small registered functions.

Three tables of pure functions:
- NODE_FEATURES see one composition step (a grammar rule applied to atoms and sub-forms);
  a form's features are the sum over its steps, so the beam can score partial forms. Those
  that read the sub-forms are also in CHILD_FEATURES; the others see only the rule and its
  atoms, so the chart computes them once per filling of a rule's slots.
- ROOT_FEATURES see a whole candidate (what it leaves unexplained in the question).
- ANSWER_FEATURES see the executed answer (its size and type against the question word).
Lexical pairs — a question word or phrase with a fragment of the form — are the lexicon that
learning fills in and `tabq lexicon export` writes out; keep their names readable.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from dataclasses import dataclass

from . import featurenames
from . import logic as L
from .analyse import Analysis, Atom, degree_base, header_text, is_id, names_rows
from .definitions import parts
from .answers import Denotation
from .text import is_word, split_words, stem
from .logic import Extreme, Neighbour, Position, walk
from .rules import OPERATOR_FRAGMENTS, spec_of

Features = dict[str, float]
NODE_FEATURES: list[Callable[[Analysis, "Step"], Features]] = []
CHILD_FEATURES: list[Callable[[Analysis, "Step"], Features]] = []
ROOT_FEATURES: list[Callable[[Analysis, frozenset[int], frozenset[str]], Features]] = []
ANSWER_FEATURES: list[Callable[[Analysis, Denotation], Features]] = []


@dataclass(frozen=True)
class Step:
    """One application of a grammar rule: its alias, its atoms, and the columns below it."""

    rule: str
    atoms: tuple[Atom, ...]
    child_columns: tuple[frozenset[str], ...]
    child_forms: tuple = ()
    child_used: tuple[frozenset[int], ...] = ()   # question tokens each sub-form stands on


def node_feature(fn):
    NODE_FEATURES.append(fn)
    return fn


def child_feature(fn):
    """A step feature that reads the step's sub-forms (child_columns, child_forms)."""
    CHILD_FEATURES.append(fn)
    return node_feature(fn)


def root_feature(fn):
    ROOT_FEATURES.append(fn)
    return fn


def answer_feature(fn):
    ANSWER_FEATURES.append(fn)
    return fn


def fragments(step: Step) -> list[str]:
    """The pieces of meaning a step adds, as its rule's spec names them: "sum", "cmp:gt",
    "extreme:max", "dir:min" …"""
    ops = {a.slot: a.value for a in step.atoms if a.slot in OPERATOR_FRAGMENTS}
    return [fragment.format_map(ops) for fragment in spec_of(step.rule).fragments]


def lexical(analysis: Analysis, fragment: str) -> Features:
    """Every question word and phrase paired with a fragment: the learnable lexicon."""
    cache = analysis.cache.setdefault("lex", {})
    if fragment not in cache:
        feats = {featurenames.lex(g, fragment): 1.0 for g in analysis.grams}
        feats[featurenames.op(fragment)] = 1.0
        cache[fragment] = feats
    return cache[fragment]


def lexical_column(analysis: Analysis, col: str) -> Features:
    """Question words paired with a column: how the team's words name its columns."""
    cache = analysis.cache.setdefault("lexcol", {})
    if col not in cache:
        cache[col] = {featurenames.column(g, col): 1.0 for g in analysis.grams if " " not in g}
    return cache[col]


def lexical_value(analysis: Analysis, col: str, value, at: int | None = None) -> Features:
    """Question words paired with a cell value that no word names ("top grade" → grade A):
    the word the value stands on and the phrases around it, or every word when it stands on none."""
    if at is None:
        grams = [g for g in analysis.grams if " " not in g]
    else:
        word = analysis.words.tokens[at].stem
        grams = [g for g in analysis.grams if word in g.split(" ") and g.count(" ") < 2]
    return {featurenames.value(g, col, value): 1.0 for g in grams}


# ── composition steps ─────────────────────────────────────────────────────────────────────────
@node_feature
def size(analysis: Analysis, step: Step) -> Features:
    return {"size": 1.0}


@node_feature
def column_matches(analysis: Analysis, step: Step) -> Features:
    feats: Features = {}
    spec = spec_of(step.rule)
    for atom in step.atoms:
        if atom.slot.endswith("COL"):
            col = analysis.table.column(atom.value)
            if not (spec.role == "datefilter" and atom.quality == "none"):
                _add(feats, f"col:{atom.quality}")
            _add(feats, f"{spec.role}.col:{atom.quality}")
            if col.view:
                _add(feats, "col:view")
            if is_id(col, analysis.table):
                _add(feats, "col:id")
            if spec.role == "key" and atom is _first_column(step) and _nearly_unique(col, analysis):
                _add(feats, "key:unique")   # groups of one row: a row's value, or a duplicate's sum
            if atom is _first_column(step) and _rows_named(analysis):
                feats.update(_rows_asked(analysis, step, spec.role, atom))
            if atom.covers:
                _add(feats, "cover", atom.covers)
            if atom.span and atom.span[0] == analysis.head and spec.head:
                _add(feats, f"head:{step.rule}")
                if _is_quantity(col, analysis, atom.span):   # "how many goals"
                    _add(feats, f"head:{step.rule}|number")
            # "how many hires": the rows, not hire_days (a date filter's column is told by its
            # dates: "orders from May to July" is order_date whatever word stands on it)
            if atom.span and atom.span[0] == analysis.head and spec.role != "datefilter" \
                    and not (spec.head and atom is _first_column(step)):
                _add(feats, "head:as_condition")
            if atom.span and atom.span[0] == analysis.wh_head and spec.head:
                _add(feats, f"whhead:{step.rule}")
            if "present" in spec.fragments and _participle(analysis, atom):
                _add(feats, "present:participle")   # "the delivered parcels": a delivery date
            if spec.role == "values" and not _of_wh_kind(analysis, col, atom):
                _add(feats, "values.col:not_wh")   # "who delivered …" answered by a parcel id
            if (spec.superlative or spec.aggregating) and atom.span \
                    and _degree_word(analysis, atom.span):
                _add(feats, f"degree_word:{spec.role}")   # "the heaviest": weight orders
                for agg in (a.value for a in step.atoms if a.slot == "AGG"):
                    _add(feats, f"degree_word:group:{agg}")   # … one row, not a group's sum
    return feats


def _participle(analysis: Analysis, atom: Atom) -> bool:
    """A column named by a participle that describes the rows ("the delivered parcels"), not
    one that names the column with its noun ("a delivered date")."""
    if not atom.span or atom.quality == "none":
        return False
    tokens = analysis.words.tokens
    after = tokens[atom.span[1]].text if atom.span[1] < len(tokens) else ""
    return tokens[atom.span[1] - 1].text.endswith("ed") and after not in (
        "date", "dates", "day", "time", "value", "on", "at")


def _first_column(step: Step) -> Atom | None:
    """The rule's own column (the one a head rule answers with), before its measures."""
    return next((atom for atom in step.atoms if atom.slot.endswith("COL")), None)


def _of_wh_kind(analysis: Analysis, col, atom: Atom) -> bool:
    """Whether a column can answer the question's "who", "when" or "where" (true when the
    question has none, or the table no column of its kind): a wh-column atom, a header word
    of its kind (prior.WH_COLUMNS), or a date for "when"."""
    wh_cols = {a.value for a in analysis.atoms.get("ANYCOL", []) if a.quality == "wh"}
    if analysis.qtype not in ("who", "when", "where") or not wh_cols or atom.quality == "wh":
        return True
    from .prior import WH_COLUMNS
    header = {stem(w) for w in split_words(header_text(col))}
    return col.name in wh_cols or bool(header & WH_COLUMNS[analysis.qtype]) or (
        analysis.qtype == "when" and col.kind == "date")


SUPERLATIVES = frozenset({"most", "least", "fewest", "best", "worst", "top"})


def _after_superlative(analysis: Analysis, span: tuple[int, int]) -> bool:
    """Whether a column is named right after a superlative ("the day with the most ozone",
    "the car with the best highway mpg"): that column orders the rows, so a reading that
    answers with its values has the roles the wrong way round."""
    if span[0] == 0:
        return False
    word = analysis.words.tokens[span[0] - 1].text
    return word in SUPERLATIVES or word.endswith("est") and degree_base(word) is not None


def _degree_word(analysis: Analysis, span: tuple[int, int]) -> bool:
    """Whether a column was named by a comparative or superlative ("warmest", "heavier")."""
    return span[1] - span[0] == 1 and degree_base(analysis.words.tokens[span[0]].text) is not None


@node_feature
def value_matches(analysis: Analysis, step: Step) -> Features:
    feats: Features = {}
    for atom in step.atoms:
        if atom.slot == "ENTITY":
            _add(feats, f"ent:{atom.quality}")
            if atom.quality == "floating+col":
                _add(feats, "ent:floating")
                if atom.value[1] is True or str(atom.value[1]).lower() in ("yes", "y", "true"):
                    _add(feats, "ent:floating_yes")
            if atom.quality == "floating+col" and analysis.col_match.get(atom.value[0]) == "exact":
                _add(feats, "ent:floating+col_exact")
            if atom.quality == "floating+col" and atom.span \
                    and atom.span[0] <= analysis.head < atom.span[1] \
                    and _of_names(analysis.table.column(atom.value[0])):
                _add(feats, "ent:floating_counted")   # "how many drivers": not one driver's rows
        elif atom.slot == "CONTAINS":
            _add(feats, f"contains:{atom.quality}")
        elif atom.slot == "TEAMWORD":   # the taught definition itself is what weighs
            _add(feats, featurenames.definition(atom.value.word, L.to_text(atom.value.rows)))
            _add(feats, "teamword:parts", parts(atom.value.rows))   # the simplest first
        if atom.slot in ("ENTITY", "CONTAINS", "NUMBER", "DATE", "PERIOD", "DAY", "TEAMWORD") \
                and atom.covers:
            _add(feats, "cover", atom.covers)
            if atom.quality == "quoted":
                _add(feats, "cover:quoted")
    return feats


COUNT_OPENERS = frozenset({"which", "what", "top", "bottom", "first", "last", "the", "list",
                           "name", "show", "give"})


@node_feature
def answer_count(analysis: Analysis, step: Step) -> Features:
    """A number right after "which", "top", "the" … ("which 2 players", "top 5 products") says
    how many answers are asked for: read as a cell value or a threshold it is misread."""
    span = _answer_count_span(analysis)
    if span is None:
        return {}
    takes_count = any(f.startswith(("top_n", "group_top")) for f in spec_of(step.rule).fragments)
    for atom in step.atoms:
        if atom.slot in ("NUMBER", "ENTITY") and atom.span == span:
            return {"num:answer_count" if takes_count else "num:answer_count_misread": 1.0}
    return {}


def _answer_count_span(analysis: Analysis) -> tuple[int, int] | None:
    if "answer_count" not in analysis.cache:
        tokens = analysis.words.tokens
        numbers = {a.span for a in analysis.atoms.get("NUMBER", []) if a.span}
        analysis.cache["answer_count"] = next(
            ((i + 1, i + 2) for i, tok in enumerate(tokens[:-2])
             if tok.text in COUNT_OPENERS and (i + 1, i + 2) in numbers
             and not tokens[i + 2].stop), None)
    return analysis.cache["answer_count"]


@node_feature
def direction_asked(analysis: Analysis, step: Step) -> Features:
    """A superlative's direction (the most or the least) floats on no word: only a word that
    asks for one ("most", "cheapest", "top", any "-est") makes it more than a guess."""
    if not spec_of(step.rule).superlative:
        return {}
    asked = _asked_directions(analysis)
    for atom in step.atoms:
        if atom.slot == "DIR" and atom.value not in asked:
            return {"dir:unasked": 1.0}
    return {}


def _asked_directions(analysis: Analysis) -> frozenset[str]:
    if "directions" not in analysis.cache:
        from .prior import CUES, cue_key
        grams = set(analysis.grams)
        # net of the cues' weights: "more than 20" cancels what "more" asks for
        asked = {way for way in ("max", "min")
                 for fragment in (way, f"dir:{way}", f"extreme:{way}")
                 if sum(weight for phrase, weight in CUES[fragment][1].items()
                        if cue_key(phrase) in grams) > 0}
        if any(t.text.endswith("est") and len(t.text) > 5 for t in analysis.words.tokens):
            asked |= {"max", "min"}     # a superlative the cues do not list asks for one
        analysis.cache["directions"] = frozenset(asked)
    return analysis.cache["directions"]


@node_feature
def counted_noun(analysis: Analysis, step: Step) -> Features:
    """"Which depots had more than 20 late deliveries", "which clients placed the most orders":
    a number or a "most" followed by the things it counts, not by a unit of a measure, asks for
    a count of rows (in each group), not for a sum or an order of some column standing on the
    noun (order_date on "orders")."""
    numbers, nouns, most = _counted(analysis)
    feats: Features = {}
    frags = spec_of(step.rule).fragments
    if most and "count" in frags and any(atom.slot == "DIR" for atom in step.atoms):
        _add(feats, "noun:counted")       # "the most orders": a count explains the noun
    for atom in step.atoms:
        if atom.slot == "NUMBER" and atom.span in numbers and "having" in frags:
            _add(feats, "num:counts_things" if "count" in frags else "num:counted_as_amount")
        elif atom.slot.endswith("COL") and atom.span and atom.span[0] in nouns \
                and spec_of(step.rule).role != "datefilter" \
                and analysis.table.column(atom.value).kind in ("number", "date"):
            _add(feats, "noun:counted_as_amount")
    return feats


COUNTING_WORDS = frozenset({"most", "fewest", "least", "more", "fewer"})


def _counted(analysis: Analysis) -> tuple[frozenset, frozenset, bool]:
    """The spans of the numbers, and the positions of the nouns, where a number or a counting
    word ("most", "fewer" …) is followed within two words by a plural noun that is no number
    column's unit (the last word of its header: "20 kg", "10 days" with hire_days); and
    whether a counting word is."""
    if "counted" not in analysis.cache:
        units = {stem(words[-1]) for col in analysis.table.columns if col.kind == "number"
                 for words in [split_words(header_text(col))] if words}
        tokens, numbers, nouns = analysis.words.tokens, set(), set()
        starts = [atom.span for atom in analysis.atoms.get("NUMBER", []) if atom.span]
        starts += [(i, i + 1) for i, t in enumerate(tokens) if t.text in COUNTING_WORDS]
        for span in starts:
            for at in range(span[1], min(span[1] + 2, len(tokens))):
                token = tokens[at]
                if token.stop or not is_word(token.text):
                    break
                if _plural(token.text) and token.stem not in units:
                    numbers.add(span)
                    nouns.add(at)
                    break
        most = any(tokens[span[0]].text in COUNTING_WORDS for span in numbers)
        analysis.cache["counted"] = frozenset(numbers), frozenset(nouns), most
    return analysis.cache["counted"]


def _plural(word: str) -> bool:
    return len(word) > 3 and word.endswith("s") and not word.endswith("ss")


@node_feature
def compound_numbers(analysis: Analysis, step: Step) -> Features:
    """A number joined to the word that names a column ("4-cylinder") is that column's value
    (an ENTITY of quality "compound"), not a threshold to compare with."""
    if not spec_of(step.rule).compares_numbers:
        return {}
    compounds = {a.span for a in analysis.atoms.get("ENTITY", []) if a.quality == "compound"}
    return {"num:compound_compared": 1.0} if any(
        a.slot == "NUMBER" and a.span in compounds for a in step.atoms) else {}


# A header that says its values are already rates, shares or averages (percbelowpoverty,
# pass_rate, avg_income, cost_per_unit): adding them up means nothing.
RATE_HEADER = re.compile(r"^(perc|pct|percent|avg|average|mean)|(perc|pct|percent|rate|ratio)$"
                         r"|(^|_)(per|pct|perc|percent|rate|ratio|avg|mean|share)(_|$)")


@node_feature
def sum_of_rates(analysis: Analysis, step: Step) -> Features:
    """A total (sum, a group's sum) of a number column whose header names a rate or average."""
    if not {"sum", "group:sum"} & set(fragments(step)):
        return {}
    for atom in step.atoms:
        if atom.slot.endswith("COL"):
            col = analysis.table.column(atom.value)
            if col.kind == "number" and RATE_HEADER.search(col.name.lower()):
                return {"sum:of_rate": 1.0}
    return {}


THRESHOLD_WORDS = frozenset({"than", "over", "above", "below", "under", "least", "most",
                             "exceeding", "beyond"})   # a number after one is a threshold


@node_feature
def threshold_as_value(analysis: Analysis, step: Step) -> Features:
    """A number said right after a comparison word ("hotter than 90", "over 26") read as a cell
    value: the question asks for a threshold, so the reading is doubtful (`pipeline.sureness`)."""
    tokens = analysis.words.tokens
    for atom in step.atoms:     # its span may hold the words before the number ("hotter than 90")
        if atom.slot == "ENTITY" and atom.quality == "number" and atom.span and any(
                t.text in THRESHOLD_WORDS for t in tokens[max(0, atom.span[0] - 2):atom.span[1]]):
            return {"num:threshold_as_value": 1.0}
    return {}


@node_feature
def comparisons(analysis: Analysis, step: Step) -> Features:
    if not spec_of(step.rule).compares_numbers:
        return {}
    col = next(a for a in step.atoms if a.slot == "NUMCOL")
    info = analysis.table.column(col.value)
    feats: Features = {}
    for atom in step.atoms:
        if atom.slot == "NUMBER" and info.minimum is not None:
            if not info.minimum <= atom.value <= info.maximum:
                _add(feats, "cmp:out_of_range")
    return feats


@child_feature
def nesting(analysis: Analysis, step: Step) -> Features:
    """Two superlatives in one form, or conditions stacked deep, are rarely what was asked."""
    feats: Features = {}
    spec = spec_of(step.rule)
    if spec.aggregating and step.child_forms and isinstance(
            step.child_forms[0], (Extreme, Position, Neighbour)):
        _add(feats, "agg.on_single")
    if spec.superlative:
        for form in step.child_forms:
            if any(isinstance(n, (Extreme, Position)) for n in walk(form)):
                _add(feats, "super:nested")
    return feats


@child_feature
def answered_after_superlative(analysis: Analysis, step: Step) -> Features:
    """The column named right after a superlative orders the rows ("the temperature on the day
    with the most ozone"): a reading that answers with it and orders by another column has the
    roles the wrong way round ("the 3 highest ozone readings" orders by ozone itself)."""
    atom = _first_column(step)
    if spec_of(step.rule).role != "values" or atom is None or not atom.span \
            or not _after_superlative(analysis, atom.span):
        return {}
    others = {a.value for a in step.atoms if a.slot.endswith("COL")} - {atom.value}
    if others or any(cols - {atom.value} for cols in step.child_columns):
        return {"values.after_superlative": 1.0}
    return {}


@child_feature
def repeated_columns(analysis: Analysis, step: Step) -> Features:
    """How often a column comes back: in two sub-forms, or in a sub-form and this step's atoms."""
    named = [a.value for a in step.atoms if a.slot.endswith("COL")]
    if len(step.child_columns) + len(named) < 2:
        return {}
    seen: set[str] = set()
    repeats = 0
    for cols in step.child_columns:
        repeats += len(seen & cols)
        seen |= cols
    for col in named:
        repeats += col in seen
        seen.add(col)
    return {"col:repeated": float(repeats)} if repeats else {}


@child_feature
def share_whole(analysis: Analysis, step: Step) -> Features:
    """"Of the delivered parcels, what percentage were late", "what percentage of rose orders
    came back": the words that name the parcels or orders name the whole, not the part."""
    if not step.child_used or not any(
            f.startswith("share:") for f in spec_of(step.rule).fragments):
        return {}
    phrase = _whole_phrase(analysis)
    said = step.child_used[0]      # the whole of a share within another set, else the part
    if len(step.child_used) == 2 and said & phrase:
        return {"share:whole_named": 1.0}
    if len(step.child_used) == 1 and said and said <= phrase:
        return {"share:whole_as_part": 1.0}
    return {}


SHARE_WORDS = frozenset({"percentage", "percent", "share", "fraction", "proportion", "pct"})
VERBS = frozenset({"is", "are", "was", "were", "have", "has", "had", "do", "does", "did",
                   "came", "come", "went", "go", "got", "get", "paid", "took", "made"})


def _whole_phrase(analysis: Analysis) -> frozenset[int]:
    """The words that name the rows a share is taken of: after an opening "of" or "among" up
    to the question word, or after "percentage of" up to the verb."""
    if "whole" not in analysis.cache:
        tokens = analysis.words.tokens
        texts = [t.text for t in tokens]
        start = 1 if texts[:1] in (["of"], ["among"]) else next(
            (i + 2 for i in range(len(texts) - 1)
             if texts[i] in SHARE_WORDS and texts[i + 1] == "of"), None)
        found = set()
        for at in range(start or len(texts), len(texts)):
            if texts[at] in VERBS or texts[at] in ("what", "how", "which", ",") \
                    or not is_word(texts[at]) and texts[at] != "'s":
                break
            found.add(at)
        analysis.cache["whole"] = frozenset(found)
    return analysis.cache["whole"]


@child_feature
def negation_scope(analysis: Analysis, step: Step) -> Features:
    """A negation word negates the condition whose words follow it ("weren't paid by card"),
    not one said elsewhere ("in 2023, … weren't paid by card"): how far away the words are."""
    word = next((a.span for a in step.atoms if a.slot == "NOT" and a.span), None)
    if word is None or not step.child_used:
        return {}
    after = [i for i in step.child_used[0] if i >= word[1]]
    return {"not:gap": float(min(after) - word[1])} if after else {"not:before": 1.0}


ROW_NAME_SHARE = 0.9      # of the rows a column's distinct values number to name them
UNIQUE_GROUP_ROWS = 1.1   # rows per value at most for a column to group nothing


def _nearly_unique(col, analysis: Analysis) -> bool:
    """Whether a column's values are mostly one row's each (journal titles, district names)."""
    rows = analysis.table.row_count
    return rows > 3 and col.distinct * UNIQUE_GROUP_ROWS >= rows


def _rows_asked(analysis: Analysis, step: Step, role: str, atom: Atom) -> Features:
    """When the question names the table's rows ("which journal …", "the 3 most cited
    journals" of journals.csv), it asks for rows, named by the rows' own name column: not a
    group of another column, nor the measure that orders them."""
    if role == "key" and _one_row_described(analysis):
        return {"key.one_row_described": 1.0}
    if role == "key" and atom.quality == "none" and analysis.wh_head in analysis.row_words:
        return {"key.rows_asked": 1.0}
    if role != "values":
        return {}
    if atom.quality == "none" and atom.value == _row_name_column(analysis):
        return {"values.row_name": 1.0}
    if step.rule == "top_values" or sum(1 for other in step.atoms if other.slot.endswith("COL")
                                        and other.value == atom.value) > 1:
        return {"values.rows_as_measure": 1.0}
    return {}


def _rows_named(analysis: Analysis) -> bool:
    """Whether the question asks for rows by their noun: after "which"/"what", or after a
    superlative ("the two cheapest journals", "the 3 most cited journals")."""
    from .prior import CUE_WORDS
    tokens = analysis.words.tokens
    for i in analysis.row_words:
        before = [t.text for t in tokens[max(0, i - 2):i]]
        superlative = bool(before) and (before[-1].endswith("est") or before[-1] in CUE_WORDS
                                        or "most" in before or "least" in before)
        if i == analysis.wh_head or superlative:
            return True
    return False


def _one_row_described(analysis: Analysis) -> bool:
    """Whether a superlative describes a row by its noun ("the cheapest order", "the most cited
    journal"): one row, not a group. "The most journals" counts them, so a bare "most" is not
    one."""
    tokens = analysis.words.tokens
    for i in analysis.row_words:
        before = [t.text for t in tokens[max(0, i - 2):i]]
        if before and (before[-1].endswith("est") or len(before) == 2 and before[0] in (
                "most", "least") and not tokens[i - 1].stop):
            return True
    return False


def _row_name_column(analysis: Analysis) -> str | None:
    """The first text column that names nearly every row on its own (a title, a district)."""
    rows = analysis.table.row_count
    return next((col.name for col in analysis.table.columns if col.kind == "text"
                 and col.view is None and col.distinct >= ROW_NAME_SHARE * rows > 0), None)


def _add(feats: Features, name: str, value: float = 1.0) -> None:
    feats[name] = feats.get(name, 0.0) + value


# ── whole candidates ──────────────────────────────────────────────────────────────────────────
NAME_LENGTH = 4   # characters a text value has at least, on average, to be a name, not a code


def _of_names(col) -> bool:
    """Whether a text column holds names (drivers, towns), not flags or short codes."""
    values = [str(v) for v in col.values if v is not None]
    return col.distinct > 2 and bool(values) and \
        sum(map(len, values)) / len(values) >= NAME_LENGTH


@root_feature
def counted_column_unused(analysis: Analysis, used: frozenset[int],
                          frags: frozenset[str]) -> Features:
    """"How many drivers are there": the word counted names a text column whose values repeat
    and are names (the drivers of the parcels), so a reading that leaves it unused counts the
    rows instead. A column whose values name the rows ("how many parcels") counts them either
    way, and one of flags or short codes ("how many bikes" over a bike-type code, "how many
    late deliveries" over a Y/N column) is a property of the rows counted."""
    head = analysis.head
    if head < 0 or head in used:
        return {}
    for name, span in analysis.spans.items():
        col = analysis.table.column(name)
        if span[0] <= head < span[1] and analysis.col_match.get(name) in ("exact", "stem") \
                and col.kind == "text" and not names_rows(analysis.table, name) \
                and not is_id(col, analysis.table) and _of_names(col):
            return {"head:counted_column_unused": 1.0}
    return {}


@root_feature
def unexplained_cues(analysis: Analysis, used: frozenset[int], frags: frozenset[str]) -> Features:
    """A word that plainly asks for an operation ("before", "total", "not") the form lacks."""
    from .prior import STRONG_CUES
    missed = sum(1 for g in analysis.grams if g in STRONG_CUES and not STRONG_CUES[g] & frags)
    return {"cue:unexplained": float(missed)} if missed else {}


def _says_operation(analysis: Analysis, span: tuple[int, int], frags: frozenset[str]) -> bool:
    """An ordinal the form reads as its operation ("when did we first …": the first row), not
    as the number 1 it also spells."""
    from .prior import STRONG_CUES
    word = analysis.words.tokens[span[0]].stem
    return bool(STRONG_CUES.get(word, frozenset()) & frags)


@root_feature
def unexplained(analysis: Analysis, used: frozenset[int], frags: frozenset[str]) -> Features:
    """Numbers, dates and exact cell values the question names but the form ignores."""
    feats: Features = {}
    for atom in analysis.atoms.get("NUMBER", []):
        is_operation = atom.quality == "ordinal" and _says_operation(analysis, atom.span, frags)
        if not set(range(*atom.span)) & used and not is_operation:
            _add(feats, "num:unused")
        elif set(range(*atom.span)) & used and is_operation:
            _add(feats, "num:ordinal_twice")   # "first" as the earliest and as a value 1
    for atom in (analysis.atoms.get("PERIOD", []) + analysis.atoms.get("DATE", [])
                 + analysis.atoms.get("DAY", [])):
        if not set(range(*atom.span)) & used:
            _add(feats, "date:unused")
    for atom in analysis.atoms.get("TEAMWORD", []):
        if not set(range(*atom.span)) & used:
            _add(feats, "teamword:unused")
    seen = set()
    for atom in analysis.atoms.get("ENTITY", []):
        if atom.span and atom.quality == "exact" and atom.covers and atom.span not in seen:
            seen.add(atom.span)
            if not set(range(*atom.span)) & used:
                _add(feats, "ent:unused")
    measure = _asked_measure(analysis)
    if measure and not set(range(*measure)) & used:
        _add(feats, "head:unused_measure")
    if measure and "count" in frags:
        _add(feats, "head:counted_measure")
    return feats


def _asked_measure(analysis: Analysis) -> tuple[int, int] | None:
    """The span of a number column that "how many" or "how much" asks for ("how many goals did
    Ada score" with a goals column): counting rows leaves it unanswered."""
    if analysis.qtype not in ("how_many", "how_much"):
        return None
    for name, span in analysis.spans.items():
        if span[0] == analysis.head and analysis.col_match.get(name) in (
                "exact", "stem", "abbrev", "partial", "related") \
                and _is_quantity(analysis.table.column(name), analysis, span):
            return span
    return None


def _is_quantity(col, analysis: Analysis, span: tuple[int, int]) -> bool:
    """Whether "how many <word>" asks for a number column's amount: "goals" with a goals column
    does, "tickets" with a ticket column (one ticket a row, its number) counts rows. The
    question's word must be the header's word as written, plural for plural, or end a header
    of joined words as written ("adults" of popadults), or name it by meaning ("pupils" of
    enrltot)."""
    if col.kind != "number":
        return False
    if analysis.col_match.get(col.name) == "related":
        return True   # "how many pupils" of enrltot: the header's meaning, not its letters
    said = analysis.words.tokens[span[0]].text
    return any(word == said or (len(said) >= 4 and word.endswith(said))
               for word in split_words(header_text(col)))


# ── answers ───────────────────────────────────────────────────────────────────────────────────
@answer_feature
def answer_shape(analysis: Analysis, den: Denotation) -> Features:
    q = analysis.qtype
    if den.error:
        return {"den:empty": 1.0}
    if not den.values:
        return {"den:empty": 1.0}
    if all(v is None for v in den.values):
        return {"den:null": 1.0}
    feats: Features = {f"den:{q}|{den.kind}": 1.0}
    if len(den.values) > 1:
        feats["den:many"] = 1.0
        if not den.is_table:    # a table answers "how many … per month" with many numbers
            feats[f"den:{q}|many"] = 1.0
        if len(den.values) > 20:
            feats["den:huge"] = 1.0
    if den.is_table:
        feats["den:table"] = 1.0
    return feats


@answer_feature
def answer_count_kept(analysis: Analysis, den: Denotation) -> Features:
    """"Which 3 clients …", "the 5 longest trips": as many answers as the number asks for."""
    span = _answer_count_span(analysis)
    if span is None or den.error or den.is_table or not den.values:
        return {}
    asked = next((a.value for a in analysis.atoms.get("NUMBER", []) if a.span == span), None)
    if asked is None:
        return {}
    return {"den:answer_count" if len(den.values) == asked else "den:answer_count_off": 1.0}


@answer_feature
def repeated_values(analysis: Analysis, den: Denotation) -> Features:
    """A list with repeats: the different values were probably meant."""
    if den.is_table or len(den.values) < 2:
        return {}
    keys = [repr(v) for v in den.values]
    return {"den:repeats": 1.0} if len(set(keys)) < len(keys) else {}


@answer_feature
def repeats_question(analysis: Analysis, den: Denotation) -> Features:
    """An answer that only repeats a number of the question is rarely what was asked."""
    asked = {a.value for a in analysis.atoms.get("NUMBER", [])}
    if len(den.values) == 1 and isinstance(den.values[0], (int, float)) and not isinstance(
            den.values[0], bool) and float(den.values[0]) in asked:
        return {"den:repeats_number": 1.0}
    return {}


def answer_score_bound(analysis: Analysis, model) -> float:
    """The most the answer features above can add to a candidate's score, whatever the answer.

    An answer is empty, all missing, or of one kind with optional extras (many values, huge,
    a table, repeats, a repeated number); the bound takes the best kind and every extra that
    helps. Keep it in step with the functions above: tests/test_execute.py checks it on many
    answers.
    """
    w = model.weight
    q = analysis.qtype
    extras = ("den:many", f"den:{q}|many", "den:huge", "den:table", "den:repeats",
              "den:repeats_number", "den:answer_count", "den:answer_count_off")
    kinds = max(w(f"den:{q}|{kind}") for kind in ("number", "text", "date", "yesno", "table"))
    return max(w("den:empty"), w("den:null"), kinds + sum(max(0.0, w(e)) for e in extras))
