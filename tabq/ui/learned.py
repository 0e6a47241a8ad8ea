"""What the model has learned each word to mean: the lexicon's word entries (lexicon.py), in
plain words, largest change first.

Support is the lexicon's own count, the one `tabq lexicon show` prints: confirmations whose chosen
reading pairs the word with that meaning.
"""

from __future__ import annotations

from dataclasses import dataclass

from .. import lexicon
from ..featurenames import Pair
from ..model import Model
from ..records import Record

SHOWN = 0.01             # learned changes smaller than this are noise, not meaning


@dataclass(frozen=True)
class Entry:
    words: str                 # the stemmed word or phrase of the question
    means: str                 # what it is paired with, in plain words
    weight: float              # the model's weight now
    learned: float             # how far teaching moved it from the prior
    support: int               # confirmations whose chosen reading pairs the words with it


def plain(pair: Pair) -> str:
    """What a word's pair means, in plain words."""
    if pair.kind == "column":
        return f"the column {pair.meaning}"
    if pair.kind == "value":
        col, value = pair.cell
        return f"{col} is {value!r}"
    return f"the operation {pair.meaning}"


def entries(model: Model, log: list[Record]) -> list[Entry]:
    """Every learned word weight, largest change first (not the question-type pairs)."""
    out = []
    for e in lexicon.from_model(model, log).entries:
        pair = Pair(e.kind, e.word, e.meaning)
        if pair.is_question_type or abs(e.learned) < SHOWN:
            continue
        out.append(Entry(e.word, plain(pair), e.weight, e.learned, e.support))
    return sorted(out, key=lambda e: (-abs(e.learned), e.words, e.means))
