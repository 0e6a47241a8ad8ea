"""derive: atoms of the question + the grammar → scored candidate logical forms.

The rules come from `grammar/question.lark` (lark compiles the file; we read its rules). A chart
builds forms bottom-up by size: an item of size s applies one rule to atoms and to items whose
sizes sum to s − 1. Every (category, size) cell keeps only its best `beam` items by model score,
so the number of forms stays bounded however permissive the rules are — nothing is enumerated.
Each rule's alias names its specification in `rules.py`: the builder that makes the logical form
(or refuses an ill-typed one) and what it may combine.
"""

from __future__ import annotations

import inspect
import itertools
import string
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from functools import lru_cache
from operator import itemgetter

from lark import Lark

from . import logic as L
from .analyse import Analysis, Atom
from .features import CHILD_FEATURES, NODE_FEATURES, ROOT_FEATURES, Step, fragments, lexical
from .features import lexical_column
from .features import lexical_value
from .model import Model
from .rules import OPERATOR_FRAGMENTS, SPECS, Spec

MAX_SIZE = 6
ROW_BEAM = 40
ANSWER_BEAM = 120
SLOT_LIMIT = 10          # atoms per slot tried in one rule (the best-scoring ones)
PAIR_BEAM = 12           # sub-forms tried on each side of a two-sided rule (and, or, difference)
BUILD_LIMIT = 50         # forms one rule builds per size, most promising first
COMBOS = 16              # fillings of a rule's slots tried with each choice of sub-forms


@dataclass(frozen=True)
class Rule:
    category: str
    symbols: tuple[str, ...]
    alias: str

    @property
    def slots(self) -> list[int]:
        return [i for i, s in enumerate(self.symbols) if s.isupper()]


@lru_cache(maxsize=1)
def rules() -> tuple[Rule, ...]:
    """The composition rules of the grammar file, as lark compiles them, checked against their
    specifications in rules.py."""
    grammar = Lark.open("grammar/question.lark", rel_to=__file__, parser="earley")
    found = []
    for rule in grammar.rules:
        if rule.alias:
            found.append(Rule(rule.origin.name, tuple(s.name for s in rule.expansion), rule.alias))
    check_specs(found, SPECS)
    return tuple(found)


def check_specs(found: Sequence[Rule], specs: Mapping[str, Spec]) -> None:
    """Raise unless the grammar's alternatives and the specs name the same aliases and each spec
    fits its alternative."""
    aliases = {rule.alias for rule in found}
    if aliases - set(specs):
        raise RuntimeError(f"grammar rules without a spec in rules.py: "
                           f"{sorted(aliases - set(specs))}")
    if set(specs) - aliases:
        raise RuntimeError(f"specs in rules.py naming no grammar rule: "
                           f"{sorted(set(specs) - aliases)}")
    for rule in found:
        problem = _disagreement(rule, specs[rule.alias])
        if problem:
            raise RuntimeError(f"the spec of {rule.alias} in rules.py: {problem}")


def _disagreement(rule: Rule, spec: Spec) -> str | None:
    """What in a spec does not fit its grammar alternative, if anything."""
    if not _takes(spec.build, 1 + len(rule.symbols)):
        return f"its builder does not take the analysis and one value for each of {rule.symbols}"
    if spec.fits is not None and not _takes(spec.fits, len(rule.slots)):
        return f"its fits does not take one value for each slot of {rule.symbols}"
    named = {field for fragment in spec.fragments
             for _, field, _, _ in string.Formatter().parse(fragment) if field}
    if named - (set(rule.symbols) & set(OPERATOR_FRAGMENTS)):
        return f"its fragments name {sorted(named)}, not all operator slots of {rule.symbols}"
    return None


def _takes(fn: Callable, count: int) -> bool:
    try:
        inspect.signature(fn).bind(*range(count))
    except TypeError:
        return False
    return True


@dataclass(frozen=True, eq=False)
class Item:
    """A form in the chart, with how it was built (for features) and its score."""

    form: L.Form
    category: str
    size: int
    score: float
    step: Step
    local: tuple[dict, ...]       # this step's feature dicts (shared lexical ones included)
    children: tuple[Item, ...]
    used: frozenset[int]          # question tokens its atoms stand on
    columns: frozenset[str]

    def features(self) -> dict[str, float]:
        """φ of the whole form: the sum of its steps' features."""
        total: dict[str, float] = {}
        stack = [self]
        while stack:
            item = stack.pop()
            for part in item.local:
                for name, value in part.items():
                    total[name] = total.get(name, 0.0) + value
            stack.extend(item.children)
        return total


def derive(analysis: Analysis, model: Model, max_size: int = MAX_SIZE,
           row_beam: int = ROW_BEAM, answer_beam: int = ANSWER_BEAM,
           pair_beam: int = PAIR_BEAM) -> list[Item]:
    """The best candidate answer forms, best first, each with its features and score."""
    chart: dict[tuple[str, int], list[Item]] = {}
    scorer = _Scorer(analysis, model)
    scores = _atom_scores(analysis, scorer)
    combos = {rule: _combos(rule, analysis, scores, COMBOS if any(
        not s.isupper() for s in rule.symbols) else COMBOS * 8) for rule in rules()}
    for size in range(1, max_size + 1):
        for rule in rules():
            kids = [s for s in rule.symbols if not s.isupper()]
            if len(kids) > size - 1 or (not kids and size != 1):
                continue
            for sizes in _splits(size - 1, len(kids)):
                accepts = SPECS[rule.alias].accepts or (lambda form: True)
                width = pair_beam if len(kids) > 1 else row_beam
                cells = [[i for i in chart.get((k, s), []) if accepts(i.form)][:width]
                         for k, s in zip(kids, sizes)]
                if any(not c for c in cells):
                    continue
                for item in _apply(rule, combos[rule], cells, scorer, size):
                    chart.setdefault((rule.category, size), []).append(item)
        for category, beam in (("rows", row_beam), ("answer", answer_beam)):
            cell = chart.get((category, size))
            if cell:
                chart[(category, size)] = _prune(cell, beam)
    answers = [item for (cat, _), cell in chart.items() if cat == "answer" for item in cell]
    finals = []
    for item in answers:
        root = {}
        frags = _fragments_of(item)
        for fn in ROOT_FEATURES:
            root.update(fn(analysis, item.used, frags))
        finals.append(_with_root(item, root, model))
    return _prune(finals, len(finals))


def _fragments_of(item: Item) -> frozenset[str]:
    found, stack = set(), [item]
    while stack:
        node = stack.pop()
        found.update(fragments(node.step))
        stack.extend(node.children)
    return frozenset(found)


def _with_root(item: Item, root: dict, model: Model) -> Item:
    return Item(item.form, item.category, item.size, item.score + model.score(root),
                item.step, item.local + (root,), item.children, item.used, item.columns)


def _prune(items: list[Item], beam: int) -> list[Item]:
    best: dict[L.Form, Item] = {}
    for item in items:
        old = best.get(item.form)
        if old is None or item.score > old.score:
            best[item.form] = item
    return sorted(best.values(), key=lambda i: (-i.score, i.size))[:beam]


def _splits(total: int, parts: int):
    if parts == 0:
        if total == 0:
            yield ()
        return
    if parts == 1:
        yield (total,)
        return
    for first in range(1, total):
        for rest in _splits(total - first, parts - 1):
            yield (first, *rest)


@dataclass(frozen=True)
class _Filling:
    """What a rule applied to some atoms contributes whatever its sub-forms: the step features
    that see only the rule and atoms, the lexical pairs, their score, the atoms' columns."""

    local: tuple[dict, ...]      # the step features first, then the lexical pairs
    plain_score: float
    shared_score: float
    columns: frozenset[str]


class _Scorer:
    """Scores of features, cached for one question (the same lexical pairs recur everywhere)."""

    def __init__(self, analysis: Analysis, model: Model):
        self.analysis, self.model = analysis, model
        self.cache: dict[int, float] = {}
        self.fillings: dict[tuple, _Filling] = {}

    def filling(self, rule: Rule, atoms: tuple[Atom, ...]) -> _Filling:
        """The rule's contribution on these atoms, computed once per question (a filling is
        tried with many choices of sub-forms)."""
        key = (rule.alias, *map(id, atoms))   # the analysis's own atoms: ids hash faster
        if key not in self.fillings:
            analysis, step = self.analysis, Step(rule.alias, atoms, ())
            plain = _sum_features(analysis, step, (
                fn for fn in NODE_FEATURES if fn not in CHILD_FEATURES))
            shared = (*(lexical(analysis, f) for f in fragments(step)),
                      *(p for a in atoms for p in _atom_parts(analysis, a)))
            columns = frozenset(c for a in atoms for c in _atom_columns(a))
            self.fillings[key] = _Filling((plain, *shared), self.model.score(plain),
                                          sum(self.score(p) for p in shared), columns)
        return self.fillings[key]

    def score(self, feats: dict) -> float:
        key = id(feats)
        if key not in self.cache or self.cache[key][1] is not feats:
            self.cache[key] = (self.model.score(feats), feats)
        return self.cache[key][0]


def _atom_parts(analysis: Analysis, atom: Atom) -> list[dict]:
    parts = []
    if atom.slot.endswith("COL"):
        parts.append(lexical_column(analysis, atom.value))
    elif atom.slot == "ENTITY" and atom.span is None:
        parts.append(lexical_value(analysis, *atom.value))
    elif atom.slot == "ENTITY" and atom.quality == "floating+word":
        parts.append(lexical_value(analysis, *atom.value, at=atom.span[0]))
    return parts


def _atom_scores(analysis: Analysis, scorer: _Scorer) -> dict[Atom, float]:
    """What each atom scores alone: the order in which the chart tries them."""
    scores = {}
    for slot, atoms in analysis.atoms.items():
        for atom in atoms:
            if slot in OPERATOR_FRAGMENTS:
                scores[atom] = max(scorer.score(lexical(analysis, f.format_map({slot: atom.value})))
                                   for f in OPERATOR_FRAGMENTS[slot])
                continue
            step = Step("probe", (atom,), ())
            feats: dict = {}
            for fn in NODE_FEATURES:
                feats.update(fn(analysis, step))
            scores[atom] = scorer.model.score(feats) + sum(
                scorer.score(p) for p in _atom_parts(analysis, atom))
    return scores


def _ranked(atoms: list[Atom], scores: dict[Atom, float]) -> list[Atom]:
    """Atoms best first; among equal scores the columns take turns, so that a cut-off keeps
    one value of every column before a second value of any ("no-shows": each small column's
    values are equally likely before teaching, and teaching can only find what is tried)."""
    turn: dict[tuple, int] = {}

    def key(atom: Atom):
        score = round(scores[atom], 6)
        column = atom.value[0] if isinstance(atom.value, tuple) else atom.value
        turn[score, column] = turn.get((score, column), -1) + 1
        return -score, turn[score, column]

    keys = {atom: key(atom) for atom in atoms}
    return sorted(atoms, key=keys.__getitem__)


def _combos(rule: Rule, analysis: Analysis, scores: dict[Atom, float], limit: int):
    """The rule's best `limit` fillings of its slots, atoms on disjoint spans."""
    lists = []
    for symbol in rule.symbols:
        if symbol.isupper():
            atoms = _ranked(analysis.atoms.get(symbol, []), scores)
            atoms = atoms[:SLOT_LIMIT * 2 if symbol == "ENTITY" else SLOT_LIMIT]
            lists.append([(atom, scores[atom], _token_mask(atom)) for atom in atoms])
    found = []
    for picks in itertools.product(*lists):   # thousands for a rule of two values and more
        taken = 0
        for _, _, mask in picks:
            if mask & taken:
                break
            taken |= mask
        else:
            found.append((sum(score for _, score, _ in picks), picks, taken))
    found.sort(key=lambda c: -c[0])
    best = [(score, tuple(atom for atom, _, _ in picks), _tokens(taken))
            for score, picks, taken in found[:limit]]
    fits = SPECS[rule.alias].fits
    return best if fits is None else [c for c in best if fits(*(a.value for a in c[1]))]


def _token_mask(atom: Atom) -> int:
    """The question tokens an atom stands on, as bits."""
    return sum(1 << i for i in range(*atom.span)) if atom.span else 0


def _tokens(mask: int) -> frozenset[int]:
    return frozenset(i for i in range(mask.bit_length()) if mask >> i & 1)


def _apply(rule: Rule, combos, cells: list[list[Item]], scorer: _Scorer, size: int):
    """Build the rule's most promising forms: best sub-forms with best slot fillings first."""
    analysis = scorer.analysis
    builder = SPECS[rule.alias].build
    plans = []
    for kids in itertools.product(*cells):
        used = frozenset()
        for kid in kids:
            if used & kid.used:
                break
            used |= kid.used
        else:
            base = sum(k.score for k in kids)
            plans.extend((base + est, kids, atoms, spans, used)
                         for est, atoms, spans in combos if not spans & used)
    plans.sort(key=itemgetter(0), reverse=True)   # stable: equal estimates keep their order
    built = 0
    for _, kids, atoms, spans, used in plans:
        item = _build(rule, builder, analysis, scorer, atoms, kids, size, used | spans)
        if item is not None:
            yield item
            built += 1
            if built >= BUILD_LIMIT:
                return


def _build(rule, builder, analysis, scorer, atoms, kids, size, used) -> Item | None:
    form = builder(analysis, *_args(rule, atoms, kids))
    if form is None:
        return None
    step = Step(rule.alias, atoms, tuple(k.columns for k in kids), tuple(k.form for k in kids),
                tuple(k.used for k in kids))
    filling = scorer.filling(rule, atoms)
    from_kids = _sum_features(analysis, step, CHILD_FEATURES)
    local = (from_kids, *filling.local) if from_kids else filling.local
    score = sum(k.score for k in kids) + filling.shared_score + scorer.model.score(
        from_kids, start=filling.plain_score)
    columns = filling.columns.union(*(k.columns for k in kids))
    return Item(form, rule.category, size, score, step, local, kids, used, columns)


def _sum_features(analysis: Analysis, step: Step, functions) -> dict[str, float]:
    total: dict = {}
    for fn in functions:
        for name, value in fn(analysis, step).items():
            total[name] = total.get(name, 0.0) + value
    return total


def _atom_columns(atom: Atom) -> tuple[str, ...]:
    if atom.slot.endswith("COL"):
        return (atom.value,)
    if atom.slot in ("ENTITY", "CONTAINS"):
        return (atom.value[0],)
    return ()


def _args(rule: Rule, atoms: tuple[Atom, ...], kids: tuple[Item, ...]) -> list:
    if not kids:
        return [atom.value for atom in atoms]
    args, a, k = [], iter(atoms), iter(kids)
    for symbol in rule.symbols:
        args.append(next(a).value if symbol.isupper() else next(k).form)
    return args
