"""Fit the numbers of tabq/calibration.py and print the reliability table.

usage: python benchmarks/calibrate.py [--cache FILE] [--write] [--svg FILE] [SET.jsonl ...]
       python benchmarks/calibrate.py --measure [--svg FILE] SET.jsonl ...

Asks every question of the sets with the untaught model (`Model.prior()`, as the benchmarks
do), keeps each distinct answer's reading scores and whether it is right, then fits:
AGREEMENT (how an answer's readings make its score: the grid value with the most top answers
right), TEMPERATURE (least log loss of "the top answer is right" against the probability shown)
and SURE_AT (the lowest probability from which the top answers of the zeroshot sets are right
at least PRECISION of the time). Every set weighs the same, so the 619 WikiTableQuestions do
not drown the others. Each zeroshot kind is also measured with the constants fitted without it,
and the extra reasons to flag an answer are measured against the probability alone.
`--write` rewrites tabq/calibration.py; `--svg FILE` draws the reliability curve per set.
`--measure` fits nothing: it measures the constants in tabq/calibration.py on the sets given
(the held-out test: benchmarks/zeroshot2/*.jsonl).

The default sets are benchmarks/zeroshot/*.jsonl, tests/fixtures/wtq/questions.jsonl and
benchmarks/vocabulary/test.jsonl; benchmarks/zeroshot2/ is the held-out test, never fitted on.
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

import tabq
from tabq import calibration, pipeline
from tabq.answers import matches

SETS = sorted((ROOT / "benchmarks" / "zeroshot").glob("*.jsonl")) + [
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
                    "unused": list(g[0].unused),
                    **{f: g[0].features.get(f, 0.0) for f in SIGNAL_FEATURES}}
                   for g in groups.values()]
        out.append({"set": name, "id": ex["id"], "kind": ex.get("kind", name),
                    "answers": answers, "complete": result.complete,
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


def top(q: Question, agreement: float, temperature: float) -> Top:
    if not q.answers:
        return Top(False, 0.0, None, q.complete, q.never_used, 0.0)
    scored = ranked(q, agreement)
    p = pipeline.probabilities([s for s, _ in scored], temperature)[0]
    gap = scored[0][0] - scored[1][0] if len(scored) > 1 else math.inf
    return Top(scored[0][1]["right"], p, scored[0][1], q.complete, q.never_used, gap)


def by_set(questions: list[Question]) -> dict[str, list[Question]]:
    out: dict[str, list[Question]] = defaultdict(list)
    for q in questions:
        out[q.set].append(q)
    return dict(out)


def _mean(values: list[float]) -> float:
    return sum(values) / len(values) if values else 0.0


# ── the fits: each set weighs the same ───────────────────────────────────────────────────────
def accuracy(questions: list[Question], agreement: float) -> float:
    return _mean([top(q, agreement, 1.0).right for q in questions])


def fit_agreement(sets: dict[str, list[Question]]) -> float:
    """The agreement whose top answers are right most often, averaged over sets; on a tie the
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
# Candidate reasons to doubt a top answer beyond its probability, each tried as an extra flag;
# the fit keeps those that let a lower SURE_AT reach the precision (see `fit_flag`).
SIGNALS = {
    "words no reading uses": lambda t: len(t.never_used) > 0,
    "1+ words the answer ignores": lambda t: len(t.answer["unused"]) >= 1,
    "2+ words the answer ignores": lambda t: len(t.answer["unused"]) >= 2,
    "3+ words the answer ignores": lambda t: len(t.answer["unused"]) >= 3,
    "strong cue unexplained": lambda t: t.answer["cue:unexplained"] > 0,
    "named value unused": lambda t: (t.answer["num:unused"] + t.answer["date:unused"]
                                     + t.answer["ent:unused"]) > 0,
    "empty answer": lambda t: t.answer["den:empty"] > 0,
    "runner-up within 0.5": lambda t: t.gap < 0.5,
    "runner-up within 1": lambda t: t.gap < 1.0,
}
IGNORED_WORDS = (0, 2, 3)   # what the fit may choose for calibration.IGNORED_WORDS (0: off)
SURE_ATS = tuple(round(0.2 + 0.01 * k, 2) for k in range(80))    # 0.20 … 0.99
FLAG_PREFIX = "zeroshot/"


def flagged(t: Top, sure_at: float, signals: tuple[str, ...]) -> bool:
    """As `pipeline.unsure_reason` decides, with these extra signals."""
    return (t.answer is None or not t.complete or t.probability < sure_at
            or any(SIGNALS[s](t) for s in signals))


@dataclass
class Flags:
    precision: float     # right among the answers not flagged
    share: float         # share flagged
    sure: int
    right_sure: int
    n: int


def flags(tops: list[Top], sure_at: float, signals: tuple[str, ...] = ()) -> Flags:
    sure = [t for t in tops if not flagged(t, sure_at, signals)]
    right = sum(t.right for t in sure)
    return Flags(right / len(sure) if sure else 1.0, 1 - len(sure) / max(len(tops), 1),
                 len(sure), right, len(tops))


def pooled(tops: dict[str, list[Top]], sure_at: float, signals: tuple[str, ...]) -> Flags:
    """Precision and share flagged with every set weighing the same."""
    each = [flags(ts, sure_at, signals) for ts in tops.values()]
    sure = sum(f.sure / f.n for f in each)
    right = sum(f.right_sure / f.n for f in each)
    return Flags(right / sure if sure else 1.0, 1 - sure / len(each), 0, 0, len(each))


def fit_sure_at(tops: dict[str, list[Top]], signals: tuple[str, ...]) -> float:
    """The lowest threshold whose sure answers are right PRECISION of the time; when none is,
    the one with the best precision."""
    fits = [s for s in SURE_ATS if pooled(tops, s, signals).precision >= PRECISION]
    return fits[0] if fits else max(SURE_ATS, key=lambda s: pooled(tops, s, signals).precision)


def signal_effects(tops: dict[str, list[Top]]) -> list[tuple[str, float, Flags]]:
    """Each signal added to the probability: the threshold the fit would pick and what it
    gives, to compare with the probability alone."""
    return [(name, sure_at, pooled(tops, sure_at, (name,)))
            for name in SIGNALS for sure_at in [fit_sure_at(tops, (name,))]]


# ── fitting all three, and measuring ─────────────────────────────────────────────────────────
def flag_sets(sets: dict[str, list]) -> dict[str, list]:
    """The sets the flag's promise is fitted on: plain questions written for tabq's tables. On
    the others (real Wikipedia questions, untaught team words) no threshold reaches PRECISION
    short of flagging nearly every answer, so they are measured, not fitted on."""
    return {name: v for name, v in sets.items() if name.startswith(FLAG_PREFIX)}


@dataclass
class Fit:
    agreement: float
    temperature: float
    sure_at: float
    ignored_words: int

    @property
    def signals(self) -> tuple[str, ...]:
        return ignored(self.ignored_words)

    def tops(self, questions: list[Question]) -> list[Top]:
        return [top(q, self.agreement, self.temperature) for q in questions]


def fit(questions: list[Question]) -> Fit:
    sets = by_set(questions)
    agreement = fit_agreement(sets)
    temperature = fit_temperature(sets, agreement)
    tops = {name: [top(q, agreement, temperature) for q in qs]
            for name, qs in flag_sets(sets).items()}
    options = [Fit(agreement, temperature, fit_sure_at(tops, ignored(n)), n)
               for n in IGNORED_WORDS]
    return min(options, key=lambda f: _flag_cost(f, tops))     # on a tie, the first: no signal


def ignored(words: int) -> tuple[str, ...]:
    """The signal calibration.IGNORED_WORDS turns on, as named in SIGNALS."""
    return (f"{words}+ words the answer ignores",) if words else ()


def _flag_cost(f: Fit, tops: dict[str, list[Top]]) -> tuple[bool, float]:
    """Short of the precision first, then the share flagged."""
    got = pooled(tops, f.sure_at, f.signals)
    return got.precision < PRECISION, round(got.share, 9)


def held_out_kinds(questions: list[Question]) -> list[tuple[Top, Fit]]:
    """Each kind of the flag's sets measured with the constants fitted without that kind."""
    out = []
    kinds = {(q.set, q.kind) for q in questions if q.set.startswith(FLAG_PREFIX)}
    for kind in sorted(kinds):
        f = fit([q for q in questions if (q.set, q.kind) != kind])
        tops = f.tops([q for q in questions if (q.set, q.kind) == kind])
        out += [(t, f) for t in tops]
    return out


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


def svg(series: dict[str, list[tuple[float, float, float, int]]], sure_at: float,
        path: Path) -> None:
    """The reliability curve: share right against the probability shown, one line per series,
    each point a bin (its area the number of questions), with the diagonal of perfect
    calibration and the threshold below which an answer is flagged."""
    size, pad = 360, 48
    colours = ("#2b6cb0", "#c05621", "#2f855a", "#6b46c1", "#b83280", "#975a16", "#2c7a7b")

    def xy(p: float, r: float) -> str:
        return f"{pad + p * size:.1f},{pad + (1 - r) * size:.1f}"

    diagonal = f"M{pad},{pad + size} L{pad + size},{pad}"
    at = pad + sure_at * size
    parts = [(f'<svg xmlns="http://www.w3.org/2000/svg" width="{size + 2 * pad + 170}" '
              f'height="{size + 2 * pad}" font-family="sans-serif" font-size="12">'),
             '<rect width="100%" height="100%" fill="white"/>',
             f'<rect x="{pad}" y="{pad}" width="{size}" height="{size}" fill="none" stroke="#999"/>',
             f'<path d="{diagonal}" stroke="#bbb" stroke-dasharray="4 4"/>',
             f'<path d="M{at:.1f},{pad} V{pad + size}" stroke="#c9a25a" stroke-dasharray="2 3"/>',
             (f'<text x="{at - 4:.1f}" y="{pad + 14}" text-anchor="end" fill="#a0781f">'
              f'unsure below {sure_at:.0%}</text>'),
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
benchmarks/zeroshot2/ was kept out as the held-out test. AGREEMENT:
the value whose top answers are right most often, averaged over the sets (ties to the smaller).
TEMPERATURE: least log loss of "the top answer is right" against its probability, each set
weighing the same. SURE_AT and IGNORED_WORDS: of the thresholds from which the top answers of
the zeroshot sets are right at least 95% of the time, the one flagging the fewest (on the other
sets no threshold gets there short of flagging nearly all), tried with IGNORED_WORDS off, 2 and 3.
Asked at commit {", ".join(sorted({q.commit for q in questions}))} ("+": with uncommitted changes).
Refit: python benchmarks/calibrate.py --write.
"""

AGREEMENT = {f.agreement}  # weight of the log-sum-exp bonus for other readings giving the same answer
TEMPERATURE = {f.temperature}  # answer scores are divided by this before the softmax
SURE_AT = {f.sure_at}  # the top answer's probability from which it is not flagged unsure
IGNORED_WORDS = {f.ignored_words}  # flagged too when its reading ignores this many content words (0: off)
'''


def report(name: str, tops: list[Top], fitted: Fit) -> str:
    f = flags(tops, fitted.sure_at, fitted.signals)
    right = sum(t.right for t in tops)
    return (f"  {name:24s} {len(tops):4d}  accuracy {right / max(len(tops), 1):6.1%}  "
            f"right among sure {f.precision:6.1%} ({f.right_sure}/{f.sure})  "
            f"flagged {f.share:6.1%}")


def measure(sets: dict[str, list[Question]], picture: Path | None) -> None:
    """The constants in use, measured on sets they were not fitted on."""
    f = Fit(calibration.AGREEMENT, calibration.TEMPERATURE, calibration.SURE_AT,
            calibration.IGNORED_WORDS)
    print(f"measured with AGREEMENT = {f.agreement}, TEMPERATURE = {f.temperature}, "
          f"SURE_AT = {f.sure_at}, IGNORED_WORDS = {f.ignored_words}")
    for name, qs in sets.items():
        print(report(name, f.tops(qs), f))
    print("  bin      questions  mean probability  share right")
    for low, p, r, n in reliability([t for qs in sets.values() for t in f.tops(qs)]):
        print(f"  {low:.1f}–{low + 0.1:.1f}  {n:9d}  {p:16.1%}  {r:11.1%}")
    if picture:
        svg(curves(f, sets), f.sure_at, picture)


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
    f = fit(questions)
    print(f"\nfitted: AGREEMENT = {f.agreement}, TEMPERATURE = {f.temperature}, "
          f"SURE_AT = {f.sure_at}, IGNORED_WORDS = {f.ignored_words}")
    print("\nfitted on every set, measured on each")
    for name, qs in sets.items():
        print(report(name, f.tops(qs), f))
    kinds = held_out_kinds(questions)
    sure = [t for t, g in kinds if not flagged(t, g.sure_at, g.signals)]
    print(f"\neach kind of {FLAG_PREFIX}* measured with the constants fitted without it: right "
          f"among sure {_mean([t.right for t in sure]):.1%} ({sum(t.right for t in sure)}/"
          f"{len(sure)}), flagged {1 - len(sure) / max(len(kinds), 1):.1%} of {len(kinds)}")
    tops = {name: f.tops(qs) for name, qs in flag_sets(sets).items()}
    alone = pooled(tops, fit_sure_at(tops, ()), ())
    print(f"\nextra reasons to flag, on {FLAG_PREFIX}* (probability alone: right among sure "
          f"{alone.precision:.1%}, flagged {alone.share:.1%})")
    for name, sure_at, g in signal_effects(tops):
        print(f"  {name:30s} sure at {sure_at:.2f}: right among sure {g.precision:6.1%}, "
              f"flagged {g.share:6.1%}")
    print("\nreliability, every fitting question, fitted constants")
    print("  bin      questions  mean probability  share right")
    for low, p, r, n in reliability(f.tops(questions)):
        print(f"  {low:.1f}–{low + 0.1:.1f}  {n:9d}  {p:16.1%}  {r:11.1%}")
    if picture:
        svg(curves(f, sets), f.sure_at, picture)
    if "--write" in argv:
        (ROOT / "tabq" / "calibration.py").write_text(constants_text(f, questions),
                                                      encoding="utf-8")
        print("wrote tabq/calibration.py")


if __name__ == "__main__":
    main(sys.argv[1:])
