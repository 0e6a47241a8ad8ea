"""The names of lexical features, built and read in this one place.

A lexical feature pairs a gram of the question (a stemmed word or phrase of one to three words,
or "qtype:<type>" for the kind of question) with a meaning:

    lex:<gram>|<fragment>           kind "operator" (sum, cmp:gt, dir:max …) or "fragment" (eq …)
    lexcol:<gram>|<column>          kind "column"
    lexval:<gram>|<column>=<value>  kind "value"
    def:<words>|<row set>           kind "definition": a team's words for a row set, the row
                                    set in logic's canonical text ("(in_set zone [...])")

and `op:<fragment>` is a fragment's bias, whatever the words; it pairs no word, so it reads as a
structure feature, like every other name. A name splits at its first "|" (a gram holds none, a
column or value may) and a value's meaning at its first "=" (load.clean_name keeps column names
to a-z, 0-9 and _).

A *sense* is a name with its gram replaced by "*": what a query means, whichever words asked for
it. The log keeps a confirmation's senses to count the lexicon's support.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, replace

KINDS = ("column", "value", "operator", "fragment", "definition")
# Fragments that are operations on values or comparisons; the other fragments are shapes of
# composition (eq, and, or, not, which_of, group_best, top_n, per_group …).
OPERATION_FRAGMENTS = frozenset({"sum", "avg", "min", "max", "median", "count", "first", "last",
                                 "next", "prev"})
OPERATOR_PREFIXES = ("cmp:", "extreme:", "dir:", "group:")
ANY_WORD = "*"               # the word of a sense
QUESTION_TYPE = "qtype:"     # a gram that is the kind of question, not a word of it
PREFIXES = {"operator": "lex:", "fragment": "lex:", "column": "lexcol:", "value": "lexval:",
            "definition": "def:"}


@dataclass(frozen=True)
class Pair:
    """A lexical feature read: a question gram paired with a meaning of some kind."""

    kind: str       # one of KINDS
    word: str       # the gram, or ANY_WORD in a sense
    meaning: str    # the fragment, the column, or "column=value"

    @property
    def name(self) -> str:
        return f"{PREFIXES[self.kind]}{self.word}|{self.meaning}"

    @property
    def cell(self) -> tuple[str, str]:
        """(column, value) of a value pair."""
        column_name, _, cell_value = self.meaning.partition("=")
        return column_name, cell_value

    @property
    def is_question_type(self) -> bool:
        return self.word.startswith(QUESTION_TYPE)

    def with_word(self, word: str) -> Pair:
        return replace(self, word=word)


# ── building ──────────────────────────────────────────────────────────────────────────────────
def lex(gram: str, fragment: str) -> str:
    return f"lex:{gram}|{fragment}"


def op(fragment: str) -> str:
    return f"op:{fragment}"


def column(gram: str, col: str) -> str:
    return f"lexcol:{gram}|{col}"


def definition(words: str, rows_text: str) -> str:
    """Team words standing for a row set (its canonical text): what teaching induced."""
    return f"def:{words}|{rows_text}"


def value(gram: str, col: str, cell_value: object) -> str:
    """The value is written as an f-string writes it (a number or date as its text)."""
    return f"lexval:{gram}|{col}={cell_value}"


# ── reading ───────────────────────────────────────────────────────────────────────────────────
def parse(name: str) -> Pair | None:
    """The pair a lexical feature's name spells, or None for any other feature (op: included)."""
    for prefix, kind in (("lexcol:", "column"), ("lexval:", "value"), ("def:", "definition"),
                         ("lex:", None)):
        if name.startswith(prefix):
            word, bar, meaning = name[len(prefix):].partition("|")
            if not bar or not word or not meaning:
                return None
            return Pair(kind or fragment_kind(meaning), word, meaning)
    return None


def fragment_kind(fragment: str) -> str:
    """A fragment's kind: "operator" (an operation on values, a comparison) or "fragment"."""
    is_operator = fragment in OPERATION_FRAGMENTS or fragment.startswith(OPERATOR_PREFIXES)
    return "operator" if is_operator else "fragment"


def sense(name: str) -> str:
    """A feature name with its question word taken out: what a chosen query means."""
    pair = parse(name)
    if pair is None or pair.kind in ("value", "definition"):
        return name     # a value or a definition is its words' own meaning: keep them
    return pair.with_word(ANY_WORD).name


def senses(features: Mapping[str, float]) -> list[str]:
    """The senses a query fires, sorted: what the log keeps of a confirmation's target."""
    return sorted({sense(name) for name, weight in features.items() if weight})


def open_sense(name: str) -> Pair | None:
    """The pair of a sense whose word was taken out, or None (a value pair, a structure name)."""
    pair = parse(name)
    return pair if pair is not None and pair.word == ANY_WORD else None
