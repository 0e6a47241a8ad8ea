"""What the model has learned each word to mean: lexical weights minus the prior, with how many
confirmations back them.

Support is counted the simple way: live confirmations in the log whose question contains the
word (as the analyser stems it). A feature's name says what it pairs:
`lex:<words>|<fragment>` (an operation), `lexcol:<word>|<column>`, `lexval:<word>|<column>=<v>`.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..analyse import question_grams
from ..model import Model
from ..records import confirmations, live

PREFIXES = ("lex:", "lexcol:", "lexval:")
SHOWN = 0.01             # learned changes smaller than this are noise, not meaning


@dataclass(frozen=True)
class Entry:
    words: str                 # the stemmed word or phrase of the question
    means: str                 # what it is paired with, in plain words
    weight: float              # the model's weight now
    learned: float             # how far teaching moved it from the prior
    support: int               # confirmations whose question holds the words


def meaning(feature: str) -> tuple[str, str] | None:
    """(words, what they mean) of a lexical feature's name, or None for other features."""
    for prefix in PREFIXES:
        if feature.startswith(prefix):
            words, _, what = feature[len(prefix):].partition("|")
            if words.startswith("qtype:"):
                return None
            if prefix == "lexcol:":
                return words, f"the column {what}"
            if prefix == "lexval:":
                col, _, value = what.partition("=")
                return words, f"{col} is {value!r}"
            return words, f"the operation {what}"
    return None


def entries(model: Model, log: list[dict]) -> list[Entry]:
    """Every learned lexical weight, largest change first."""
    prior = Model.prior()
    grams = [set(question_grams(r.question)) for r in confirmations(live(log))]
    out = []
    for name, weight in model.items():
        read = meaning(name)
        learned = weight - prior.weight(name)
        if read is None or abs(learned) < SHOWN:
            continue
        words, means = read
        out.append(Entry(words, means, weight, learned, sum(words in g for g in grams)))
    return sorted(out, key=lambda e: (-abs(e.learned), e.words, e.means))
