"""Fit the numbers of tabq/calibration.py and print the reliability table.

usage: python benchmarks/calibrate.py [--cache FILE] [--write] [--refit-temperature] [--svg FILE]
                                     [SET.jsonl ...]
       python benchmarks/calibrate.py --measure [--svg FILE] SET.jsonl ...

Asks every question of the sets with the untaught model (`Model.prior()`, as the benchmarks
do), keeps each distinct answer's reading scores and whether it is right, then fits:
AGREEMENT (how an answer's readings make its score: the grid value with the most top answers
right), TEMPERATURE only with --refit-temperature (least log loss of "the top answer is right"
against the probability shown; kept otherwise, see `fit`) and the unsure flag: GAP_WEIGHT,
COLUMN_WORD_WEIGHT, NOTHING_WEIGHT, VALUE_DOUBT_WEIGHT and GUESSED_COLUMN_WEIGHT by logistic
regression of "the top answer is right" on the runner-up's distance, the column-naming words the
top reading ignores, whether its answer is 0 or nothing, its doubtful readings of a value and
the columns it uses that no word of the question names (one intercept per
family, so the families' different accuracies do not bend the weights), then SURE_SCORE, the
lowest sureness from which the top answers on each table of the FLAG_SETS families are right at
least PRECISION of the time. Every family of sets (a folder) weighs the same, so the 619
WikiTableQuestions do not drown the others nor 5 questions on one table count as 100. Each
kind of the FLAG_SETS is also measured with everything fitted without it, and each candidate
signal's power to tell right top answers from wrong is printed (its AUC per family of sets).
`--write` rewrites tabq/calibration.py; `--svg FILE` draws the reliability curve per set.
`--measure` fits nothing: it measures the constants in tabq/calibration.py on the sets given
(the held-out tests: benchmarks/zeroshot2/*.jsonl, benchmarks/zeroshot4/*.jsonl).

The default sets are benchmarks/zeroshot/*.jsonl, benchmarks/zeroshot3/*.jsonl,
benchmarks/monthday/*.jsonl, tests/fixtures/wtq/questions.jsonl and
benchmarks/vocabulary/test.jsonl; benchmarks/zeroshot2/ and zeroshot4/ are the held-out tests,
never fitted on.
`--cache FILE` keeps the asked questions, so a refit needs no asking.
"""

from __future__ import annotations

import json
import math
import os
import sys
import textwrap
import time
from collections import defaultdict
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import numpy as np

import tabq
from tabq import calibration, pipeline
from tabq.answers import matches

SETS = [path for folder in ("zeroshot", "zeroshot3", "monthday")
        for path in sorted((ROOT / "benchmarks" / folder).glob("*.jsonl"))] + [
    ROOT / "tests" / "fixtures" / "wtq" / "questions.jsonl",
    ROOT / "benchmarks" / "vocabulary" / "test.jsonl"]
AGREEMENTS = (0.0, 0.05, 0.1, 0.2, 0.3, 0.5, 1.0)
TEMPERATURES = tuple(round(0.25 * 1.1 ** k, 4) for k in range(40))   # 0.25 … 10
PRECISION = 0.95    # answers not flagged must be right this often
SIGNAL_FEATURES = ("cue:unexplained", "num:unused", "ent:unused", "date:unused", "den:empty")


@dataclass
class Question:
    set: str
    id: str
    kind: str
    answers: list[dict]    # per distinct answer: reading scores (best first), right, signals
    complete: bool
    never_used: list[str]  # content words of the question no executed reading uses
    question: str = ""
    commit: str = ""       # the code it was asked with (see `commit`)


def set_name(path: Path) -> str:
    return "wtq" if path.parent.name == "wtq" else f"{path.parent.name}/{path.stem}"


def _ask_group(args: tuple[str, str, list[dict]]) -> list[dict]:
    """Every question on one table: its distinct answers as the pipeline groups them."""
    name, table_path, examples = args
    table = tabq.open(table_path, model=tabq.Model.prior())
    out = []
    for ex in examples:
        try:
            result = table.ask(ex["question"])
        except tabq.errors.TabqError:
            out.append({"set": name, "id": ex["id"], "kind": ex.get("kind", name),
                        "answers": [], "complete": True, "never_used": []})
            continue
        groups: dict[tuple, list[pipeline.Reading]] = defaultdict(list)
        for c in result.candidates:               # best first
            groups[pipeline.answer_key(c)].append(c)
        answers = [{"scores": [r.score for r in g],
                    "right": bool(not g[0].error and matches(g[0].answer, ex["answer"])),
                    "unused": list(g[0].unused), "unused_columns": len(g[0].unused_columns),
                    "nothing": pipeline.gives_nothing(g[0]),
                    "value_doubts": len(pipeline.value_doubts(g[0])),
                    "size": len(g[0].answer), "features": dict(g[0].features),
                    "kinds": sorted({type(v).__name__ for v in g[0].answer}),
                    **{f: g[0].features.get(f, 0.0) for f in SIGNAL_FEATURES}}
                   for g in groups.values()]
        out.append({"set": name, "id": ex["id"], "kind": ex.get("kind", name),
                    "question": ex["question"], "answers": answers, "complete": result.complete,
                    "never_used": list(pipeline.never_used(result.candidates))})
    return out


def commit() -> str:
    """The commit the fit ran on, + when the working tree differs from it."""
    import subprocess
    head = subprocess.run(["git", "-C", str(ROOT), "rev-parse", "--short", "HEAD"],
                          capture_output=True, text=True, check=False).stdout.strip()
    dirty = subprocess.run(["git", "-C", str(ROOT), "status", "--porcelain", "--untracked-files=no"],
                           capture_output=True, text=True, check=False).stdout.strip()
    return (head or "unknown") + ("+" if dirty else "")


def collect(paths: list[Path]) -> list[Question]:
    """Ask every question, tables spread over up to two processes."""
    jobs: dict[tuple[str, str], list[dict]] = defaultdict(list)
    for path in paths:
        for line in path.read_text(encoding="utf-8").splitlines():
            ex = json.loads(line)
            jobs[set_name(path), str((path.parent / ex["table"]).resolve())].append(ex)
    with ProcessPoolExecutor(min(2, os.cpu_count() or 1)) as pool:
        done = pool.map(_ask_group, [(n, t, exs) for (n, t), exs in jobs.items()])
        return [Question(**q, commit=commit()) for group in done for q in group]


def load(paths: list[Path], cache: Path | None) -> list[Question]:
    if cache and cache.exists():
        return [Question(**q) for q in json.loads(cache.read_text(encoding="utf-8"))]
    start = time.perf_counter()
    questions = collect(paths)
    print(f"asked {len(questions)} questions in {time.perf_counter() - start:.0f} s")
    if cache:
        cache.write_text(json.dumps([q.__dict__ for q in questions]), encoding="utf-8")
    return questions


# ── what a setting of the constants does to one question ─────────────────────────────────────
def ranked(q: Question, agreement: float) -> list[tuple[float, dict]]:
    """The distinct answers by their score, as `pipeline._distinct_answers` ranks them."""
    scored = [(pipeline.answer_score(a["scores"], agreement), a) for a in q.answers]
    return sorted(scored, key=lambda pair: -pair[0])


@dataclass
class Top:
    right: bool
    probability: float
    answer: dict | None
    complete: bool
    never_used: list[str]
    gap: float           # the top answer's score less the runner-up's (inf when alone)
    readings: int = 0    # readings giving the top answer


def top(q: Question, agreement: float, temperature: float) -> Top:
    if not q.answers:
        return Top(False, 0.0, None, q.complete, q.never_used, 0.0)
    scored = ranked(q, agreement)
    p = pipeline.probabilities([s for s, _ in scored], temperature)[0]
    gap = scored[0][0] - scored[1][0] if len(scored) > 1 else math.inf
    return Top(scored[0][1]["right"], p, scored[0][1], q.complete, q.never_used, gap,
               len(scored[0][1]["scores"]))


def by_set(questions: list[Question]) -> dict[str, list[Question]]:
    out: dict[str, list[Question]] = defaultdict(list)
    for q in questions:
        out[q.set].append(q)
    return dict(out)


def by_family(questions: list[Question]) -> dict[str, list[Question]]:
    """The sets of one folder together (zeroshot, zeroshot3, monthday, wtq, vocabulary): the
    fits weigh families the same, so 5 questions of one table do not count as much as 619."""
    out: dict[str, list[Question]] = defaultdict(list)
    for q in questions:
        out[q.set.split("/")[0]].append(q)
    return dict(out)


def _mean(values: list[float]) -> float:
    return sum(values) / len(values) if values else 0.0


# ── the fits: each family of sets weighs the same ─────────────────────────────────────────────
def accuracy(questions: list[Question], agreement: float) -> float:
    return _mean([top(q, agreement, 1.0).right for q in questions])


def fit_agreement(sets: dict[str, list[Question]]) -> float:
    """The agreement whose top answers are right most often, averaged over families; on a tie the
    smaller one (the best reading alone is the simplest ranker)."""
    return max(AGREEMENTS, key=lambda a: (round(_mean([accuracy(qs, a) for qs in sets.values()]),
                                                9), -a))


def log_loss(questions: list[Question], agreement: float, temperature: float) -> float:
    loss = []
    for q in questions:
        t = top(q, agreement, temperature)
        p = min(max(t.probability, 1e-6), 1 - 1e-6)
        loss.append(-math.log(p if t.right else 1 - p))
    return _mean(loss)


def fit_temperature(sets: dict[str, list[Question]], agreement: float) -> float:
    return min(TEMPERATURES, key=lambda t: _mean([log_loss(qs, agreement, t)
                                                  for qs in sets.values()]))


# ── the unsure flag ─────────────────────────────────────────────────────────────────────────
FLAG_SETS = ("zeroshot", "zeroshot3", "monthday")   # plain questions written for tabq's tables
L2 = 1e-3           # ridge, so a set whose answers are all right (or all wrong) stays finite


def sureness_inputs(t: Top) -> tuple[float, float, float, float, float]:
    """What `pipeline.sureness` weighs: the runner-up's distance, capped, the words naming
    a column that the top reading leaves unused, whether the top answer is 0 or nothing, its
    doubtful readings of a value (`pipeline.value_doubts`) and its guessed columns
    (`pipeline.guessed_columns`)."""
    answer = t.answer or {}
    return (min(t.gap, calibration.GAP_CAP), float(answer.get("unused_columns", 0)),
            float(answer.get("nothing", False)), float(answer.get("value_doubts", 0)),
            float(answer.get("features", {}).get(pipeline.GUESSED_COLUMN, 0.0)))


def flag_sets(sets: dict[str, list]) -> dict[str, list]:
    """The sets the flag's promise is fitted on. On the others (real Wikipedia questions,
    untaught team words) no threshold reaches PRECISION short of flagging nearly every answer,
    so they teach the weights (with an intercept of their own) but not the threshold."""
    return {name: v for name, v in sets.items() if name.split("/")[0] in FLAG_SETS}


@dataclass
class Fit:
    agreement: float
    temperature: float
    gap_weight: float = 0.0
    column_word_weight: float = 0.0
    nothing_weight: float = 0.0
    value_doubt_weight: float = 0.0
    guessed_column_weight: float = 0.0
    sure_score: float = -math.inf

    def tops(self, questions: list[Question]) -> list[Top]:
        return [top(q, self.agreement, self.temperature) for q in questions]

    def sureness(self, t: Top) -> float:
        gap, words, nothing, doubts, guessed = sureness_inputs(t)
        return self.gap_weight * gap - self.column_word_weight * words \
            - self.nothing_weight * nothing - self.value_doubt_weight * doubts \
            - self.guessed_column_weight * guessed

    def flagged(self, t: Top) -> bool:
        """As `pipeline.unsure_reason` decides."""
        return t.answer is None or not t.complete or self.sureness(t) < self.sure_score


def fit_weights(tops: dict[str, list[Top]]) -> tuple[float, float, float, float, float]:
    """Logistic regression of "the top answer is right" on `sureness_inputs`, with one intercept
    per family (what its accuracy is, which a new question does not say), each family weighing
    the same; Newton's method. Returns the gap's weight, then the column words', the empty
    answer's, the value doubts' and the guessed columns' weights (as costs)."""
    names = sorted(tops)
    rows = [(names.index(n), t) for n in names for t in tops[n] if t.answer is not None]
    x = np.array([[*sureness_inputs(t), *(float(k == i) for k in range(len(names)))]
                  for i, t in rows])
    y = np.array([float(t.right) for _, t in rows])
    weight = np.array([1.0 / len(tops[names[i]]) for i, _ in rows])
    ridge = L2 * np.eye(x.shape[1])
    theta = np.zeros(x.shape[1])
    for _ in range(50):
        p = 1 / (1 + np.exp(-x @ theta))
        gradient = x.T @ (weight * (p - y)) + ridge @ theta
        hessian = (x * (weight * p * (1 - p))[:, None]).T @ x + ridge
        step = np.linalg.solve(hessian, gradient)
        theta -= step
        if np.abs(step).max() < 1e-10:
            break
    return (round(float(theta[0]), 3), *(round(float(-theta[k]), 3) for k in range(1, 5)))


@dataclass
class Flags:
    precision: float     # right among the answers not flagged
    share: float         # share flagged
    sure: int
    right_sure: int
    n: int


def flags(tops: list[Top], f: Fit) -> Flags:
    sure = [t for t in tops if not f.flagged(t)]
    right = sum(t.right for t in sure)
    return Flags(right / len(sure) if sure else 1.0, 1 - len(sure) / max(len(tops), 1),
                 len(sure), right, len(tops))


def worst(tops: dict[str, list[Top]], f: Fit) -> float:
    """The lowest share right among sure answers over the families: the promise is made to
    each kind of question, so a family the others outnumber must keep it too."""
    return min(flags(ts, f).precision for ts in tops.values())


def fit_sure_score(tops: dict[str, list[Top]], f: Fit) -> float:
    """The lowest threshold from which the sure answers of every set given (each table of the
    flag's families: an analyst asks about one table) are right PRECISION of the time; when
    none is, the one with the best worst set. Candidates: each question's sureness."""
    levels = sorted({round(f.sureness(t), 3) for ts in tops.values() for t in ts
                     if t.answer is not None})
    tried = [Fit(f.agreement, f.temperature, f.gap_weight, f.column_word_weight,
                 f.nothing_weight, f.value_doubt_weight, f.guessed_column_weight, level)
             for level in levels]
    fits = [g for g in tried if worst(tops, g) >= PRECISION]
    return (fits[0] if fits else max(tried, key=lambda g: worst(tops, g))).sure_score


def fit(questions: list[Question], refit_temperature: bool = False) -> Fit:
    """Every constant but TEMPERATURE, which is kept unless asked: it also bounds the candidates
    a search may skip (`pipeline._can_skip`), which teaching depends on (0.8631, fitted on these
    families, made tests/test_wtq_fixture's taught model fall short)."""
    sets = by_family(questions)
    agreement = fit_agreement(sets)
    temperature = (fit_temperature(sets, agreement) if refit_temperature
                   else calibration.TEMPERATURE)
    tops = {name: [top(q, agreement, temperature) for q in qs] for name, qs in sets.items()}
    f = Fit(agreement, temperature, *fit_weights(tops))
    tables = {name: f.tops(qs) for name, qs in by_set(questions).items()}
    f.sure_score = fit_sure_score(flag_sets(tables), f)   # each table keeps the promise
    return f


def held_out_kinds(questions: list[Question]) -> list[tuple[Top, Fit]]:
    """Each kind of the flag's sets measured with everything fitted without that kind."""
    out = []
    kinds = {(q.set, q.kind) for q in questions if q.set.split("/")[0] in FLAG_SETS}
    for kind in sorted(kinds):
        f = fit([q for q in questions if (q.set, q.kind) != kind])
        tops = f.tops([q for q in questions if (q.set, q.kind) == kind])
        out += [(t, f) for t in tops]
    return out


# ── the study: how well each candidate signal tells right top answers from wrong ────────────
# Each maps a top answer to a number that is higher when the answer is more likely right.
CANDIDATES = {
    "runner-up's distance": lambda t: min(t.gap, 10.0),
    "probability shown": lambda t: t.probability,
    "readings giving it": lambda t: t.readings,
    "- words naming a column it ignores": lambda t: -t.answer["unused_columns"],
    "- answer 0 or nothing": lambda t: -float(t.answer.get("nothing", False)),
    "- doubtful value readings": lambda t: -float(t.answer.get("value_doubts", 0)),
    "- columns no word names": lambda t: -t.answer.get("features", {}).get("col:none", 0.0),
    "- words it ignores": lambda t: -len(t.answer["unused"]),
    "- words no reading uses": lambda t: -len(t.never_used),
    "- strong cue unexplained": lambda t: -t.answer["cue:unexplained"],
    "- named value unused": lambda t: -(t.answer["num:unused"] + t.answer["date:unused"]
                                        + t.answer["ent:unused"]),
}


def auc(tops: list[Top], signal) -> float:
    """The chance a right top answer has the higher signal than a wrong one (ties half)."""
    right = [signal(t) for t in tops if t.answer is not None and t.right]
    wrong = [signal(t) for t in tops if t.answer is not None and not t.right]
    if not right or not wrong:
        return math.nan
    wins = sum((r > w) + 0.5 * (r == w) for r in right for w in wrong)
    return wins / (len(right) * len(wrong))


def study(f: Fit, sets: dict[str, list[Question]]) -> None:
    families: dict[str, list[Top]] = defaultdict(list)
    for name, qs in sets.items():
        family = name.split("/")[0]
        families["flag sets" if family in FLAG_SETS else family] += f.tops(qs)
    print("\neach signal's AUC (0.5: says nothing) on the top answers, per family of sets")
    print(f"  {'':36s}" + "".join(f"{n:>12s}" for n in families))
    for name, signal in CANDIDATES.items():
        print(f"  {name:36s}" + "".join(f"{auc(ts, signal):12.2f}" for ts in families.values()))


# ── measuring ───────────────────────────────────────────────────────────────────────────────
def reliability(tops: list[Top], bins: int = 10) -> list[tuple[float, float, float, int]]:
    """Per probability bin: low edge, mean probability, share right, questions."""
    rows = []
    for b in range(bins):
        inside = [t for t in tops if b / bins <= t.probability < (b + 1) / bins
                  or b == bins - 1 and t.probability == 1.0]
        if inside:
            rows.append((b / bins, _mean([t.probability for t in inside]),
                         _mean([t.right for t in inside]), len(inside)))
    return rows


def curves(f: Fit, sets: dict[str, list[Question]]) -> dict[str, list]:
    """Reliability in bins of 0.2 per family of sets (zeroshot, zeroshot2, wtq, vocabulary)."""
    families: dict[str, list[Top]] = defaultdict(list)
    for name, qs in sets.items():
        families[name.split("/")[0]] += f.tops(qs)
    return {name: reliability(tops, 5) for name, tops in families.items()}


def svg(series: dict[str, list[tuple[float, float, float, int]]], path: Path) -> None:
    """The reliability curve: share right against the probability shown, one line per series,
    each point a bin (its area the number of questions), with the diagonal of perfect
    calibration. (The unsure flag is no threshold on the probability: see `Fit.sureness`.)"""
    size, pad = 360, 48
    colours = ("#2b6cb0", "#c05621", "#2f855a", "#6b46c1", "#b83280", "#975a16", "#2c7a7b")

    def xy(p: float, r: float) -> str:
        return f"{pad + p * size:.1f},{pad + (1 - r) * size:.1f}"

    diagonal = f"M{pad},{pad + size} L{pad + size},{pad}"
    parts = [(f'<svg xmlns="http://www.w3.org/2000/svg" width="{size + 2 * pad + 170}" '
              f'height="{size + 2 * pad}" font-family="sans-serif" font-size="12">'),
             '<rect width="100%" height="100%" fill="white"/>',
             f'<rect x="{pad}" y="{pad}" width="{size}" height="{size}" fill="none" stroke="#999"/>',
             f'<path d="{diagonal}" stroke="#bbb" stroke-dasharray="4 4"/>',
             (f'<text x="{pad}" y="{pad - 16}" font-weight="bold">How often the top answer is '
              'right, by the probability shown (untaught model; bins of 0.2)</text>')]
    for k in range(0, 11, 2):
        v = k / 10
        parts += [(f'<text x="{pad + v * size:.0f}" y="{pad + size + 16}" text-anchor="middle">'
                   f'{v:.1f}</text>'),
                  (f'<text x="{pad - 6}" y="{pad + (1 - v) * size + 4:.0f}" text-anchor="end">'
                   f'{v:.1f}</text>')]
    middle = pad + size / 2
    parts += [(f'<text x="{middle}" y="{pad + size + 36}" text-anchor="middle">'
               'probability shown for the top answer</text>'),
              (f'<text x="14" y="{middle}" text-anchor="middle" '
               f'transform="rotate(-90 14 {middle})">share of top answers right</text>')]
    for i, (name, rows) in enumerate(series.items()):
        colour = colours[i % len(colours)]
        points = " ".join(xy(p, r) for _, p, r, _ in rows)
        parts.append(f'<polyline points="{points}" fill="none" stroke="{colour}" '
                     'stroke-width="2"/>')
        for _, p, r, n in rows:
            x, y = xy(p, r).split(",")
            parts.append(f'<circle cx="{x}" cy="{y}" r="{2 + math.sqrt(n) / 2:.1f}" '
                         f'fill="{colour}" fill-opacity="0.5"><title>{n} questions</title>'
                         '</circle>')
        total = sum(n for *_, n in rows)
        parts.append(f'<text x="{pad + size + 14}" y="{pad + 14 + 20 * i}" fill="{colour}">'
                     f'{name} ({total})</text>')
    parts.append("</svg>")
    path.write_text("\n".join(parts) + "\n", encoding="utf-8")


def constants_text(f: Fit, questions: list[Question]) -> str:
    """tabq/calibration.py as the fit makes it."""
    sets = textwrap.fill(", ".join(f"{name} ({len(qs)})" for name, qs in
                                   by_set(questions).items()) + " questions", 96)
    return f'''"""The fitted numbers that turn candidate scores into the probability shown and the unsure flag.

Fitted by benchmarks/calibrate.py on {time.strftime("%Y-%m-%d")}, untaught model (Model.prior()), on
{sets};
benchmarks/zeroshot2/ and benchmarks/zeroshot4/ were kept out as the held-out tests. Each family
of sets (a folder: zeroshot, zeroshot3, monthday, wtq, vocabulary) weighs the same in every fit.
AGREEMENT: the value whose top answers are right most often (ties to the smaller). TEMPERATURE
is kept from its fit of 2026-12-04 at 5ba6539 (least log loss of "the top answer is right"
against its probability on zeroshot, wtq and vocabulary/test, each file weighing the same): it
also bounds which candidates a search may skip, which teaching depends on, and the value fitted
on these families (0.8631) made tests/test_wtq_fixture's taught model fall short. The unsure
flag thresholds `pipeline.sureness` = GAP_WEIGHT × the runner-up's distance in score (capped at
GAP_CAP) − COLUMN_WORD_WEIGHT × the question words naming a column that the top reading ignores
(not one whose values name the rows: `analyse.names_rows`) − NOTHING_WEIGHT when the top answer
is 0 or nothing − VALUE_DOUBT_WEIGHT × its doubtful readings of a value (`pipeline.VALUE_DOUBTS`:
a number after a comparison word read as a cell value, a value matched by part of its name)
− GUESSED_COLUMN_WEIGHT × the columns it uses that no word of the question names
(`pipeline.guessed_columns`). The five weights: logistic regression of "the top answer is
right" on those inputs, one intercept per family. SURE_SCORE: the lowest sureness from which
the top answers on each table of the zeroshot, zeroshot3 and monthday families are right at
least 95% of the time (on WikiTableQuestions and the untaught team words no threshold gets
there short of flagging nearly all). GAP_CAP is set, not fitted: a runner-up 3 points behind
holds under 5% of the top answer's probability.
Asked at commit {", ".join(sorted({q.commit for q in questions}))} ("+": with uncommitted changes).
Refit: python benchmarks/calibrate.py --write.
"""

AGREEMENT = {f.agreement}  # weight of the log-sum-exp bonus for other readings giving the same answer
TEMPERATURE = {f.temperature}  # answer scores are divided by this before the softmax
GAP_CAP = {calibration.GAP_CAP}  # the runner-up's distance counts up to this much
GAP_WEIGHT = {f.gap_weight}  # sureness per point of distance between the top answer and the runner-up
COLUMN_WORD_WEIGHT = {f.column_word_weight}  # sureness lost per word naming a column the top reading ignores
NOTHING_WEIGHT = {f.nothing_weight}  # sureness lost when the top answer is 0 or nothing
VALUE_DOUBT_WEIGHT = {f.value_doubt_weight}  # sureness lost per doubtful reading of a value
GUESSED_COLUMN_WEIGHT = {f.guessed_column_weight}  # sureness lost per column no word names
SURE_SCORE = {f.sure_score}  # the sureness from which the top answer is not flagged unsure
'''


def report(name: str, tops: list[Top], fitted: Fit) -> str:
    f = flags(tops, fitted)
    right = sum(t.right for t in tops)
    return (f"  {name:24s} {len(tops):4d}  accuracy {right / max(len(tops), 1):6.1%}  "
            f"right among sure {f.precision:6.1%} ({f.right_sure}/{f.sure})  "
            f"flagged {f.share:6.1%}")


def constants(f: Fit) -> str:
    return (f"AGREEMENT = {f.agreement}, TEMPERATURE = {f.temperature}, GAP_WEIGHT = "
            f"{f.gap_weight}, COLUMN_WORD_WEIGHT = {f.column_word_weight}, "
            f"NOTHING_WEIGHT = {f.nothing_weight}, VALUE_DOUBT_WEIGHT = {f.value_doubt_weight}, "
            f"GUESSED_COLUMN_WEIGHT = {f.guessed_column_weight}, SURE_SCORE = {f.sure_score}")


def print_reliability(tops: list[Top]) -> None:
    print("  bin      questions  mean probability  share right")
    for low, p, r, n in reliability(tops):
        print(f"  {low:.1f}–{low + 0.1:.1f}  {n:9d}  {p:16.1%}  {r:11.1%}")


def measure(sets: dict[str, list[Question]], picture: Path | None) -> None:
    """The constants in use, measured on sets they were not fitted on."""
    f = Fit(calibration.AGREEMENT, calibration.TEMPERATURE, calibration.GAP_WEIGHT,
            calibration.COLUMN_WORD_WEIGHT, calibration.NOTHING_WEIGHT,
            calibration.VALUE_DOUBT_WEIGHT, calibration.GUESSED_COLUMN_WEIGHT,
            calibration.SURE_SCORE)
    print(f"measured with {constants(f)}")
    for name, qs in sets.items():
        print(report(name, f.tops(qs), f))
    families: dict[str, list[Question]] = defaultdict(list)
    for name, qs in sets.items():
        families[name.split("/")[0]] += qs
    if len(families) < len(sets):
        for name, qs in families.items():
            print(report(f"{name}, all", f.tops(qs), f))
    print_reliability([t for qs in sets.values() for t in f.tops(qs)])
    if picture:
        svg(curves(f, sets), picture)


def main(argv: list[str]) -> None:
    cache = Path(argv[argv.index("--cache") + 1]) if "--cache" in argv else None
    picture = Path(argv[argv.index("--svg") + 1]) if "--svg" in argv else None
    values = {argv[argv.index(flag) + 1] for flag in ("--cache", "--svg") if flag in argv}
    paths = [Path(a) for a in argv if not a.startswith("--") and a not in values] or SETS
    questions = load(paths, cache)
    sets = by_set(questions)
    if "--measure" in argv:
        measure(sets, picture)
        return
    print("top answers right, by AGREEMENT (0: the best reading alone, 1: all readings' mass)")
    for a in AGREEMENTS:
        print(f"  {a:4}  " + "  ".join(f"{n} {accuracy(qs, a):6.1%}" for n, qs in sets.items()))
    f = fit(questions, "--refit-temperature" in argv)
    print(f"\nfitted: {constants(f)}; TEMPERATURE by least log loss here would be "
          f"{fit_temperature(by_family(questions), f.agreement)}")
    print("\nfitted on every set, measured on each")
    for name, qs in sets.items():
        print(report(name, f.tops(qs), f))
    kinds = held_out_kinds(questions)
    sure = [t for t, g in kinds if not g.flagged(t)]
    print(f"\neach kind of {', '.join(FLAG_SETS)} measured with everything fitted without it: "
          f"right among sure {_mean([t.right for t in sure]):.1%} ({sum(t.right for t in sure)}/"
          f"{len(sure)}), flagged {1 - len(sure) / max(len(kinds), 1):.1%} of {len(kinds)}")
    study(f, sets)
    print("\nreliability, every fitting question, fitted constants")
    print_reliability(f.tops(questions))
    if picture:
        svg(curves(f, sets), picture)
    if "--write" in argv:
        (ROOT / "tabq" / "calibration.py").write_text(constants_text(f, questions),
                                                      encoding="utf-8")
        print("wrote tabq/calibration.py")


if __name__ == "__main__":
    main(sys.argv[1:])
