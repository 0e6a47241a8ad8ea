"""Messy files: does `tabq ask` answer right from files exported the awkward ways real ones are?

usage: python benchmarks/messy_files.py [--case NAME]

Every case of benchmarks/messy/corpus.py is written into a fresh temporary folder and each of its
questions is asked through the real command line (`python -m tabq ask TABLE QUESTION --json`)
with the untaught prior model (TABQ_MODEL set to a fresh empty folder). The top answer is compared
with the answer computed from the rows before the file was written: numbers within a relative
tolerance of 1e-6, lists as multisets. Asking must leave the folder as the case wrote it.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

sys.path.insert(0, str(Path(__file__).resolve().parent))   # `messy` when run from anywhere

from messy.corpus import BY_NAME, CASES, Case, Question, Target, is_right  # noqa: E402

TIMEOUT = 120   # seconds for one question: a hang is a wrong answer, not a stuck benchmark


@dataclass
class Outcome:
    """What the command line did with one question."""

    case: str
    question: Question
    got: list | None = None
    problem: str = ""              # why there is no answer to compare, or what went wrong
    payload: dict | None = None    # the --json output

    @property
    def right(self) -> bool:
        return not self.problem and self.got is not None and is_right(self.question, self.got)


def listing(folder: Path) -> dict[str, int]:
    """Every file and folder below `folder` with its size: what asking must not change."""
    return {str(p.relative_to(folder)): (p.stat().st_size if p.is_file() else -1)
            for p in sorted(folder.rglob("*"))}


def ask_cli(target: Target, question: str, model: Path, cwd: Path,
            timeout: float = TIMEOUT) -> subprocess.CompletedProcess:
    """`tabq ask TARGET QUESTION --json` in a subprocess, run from the case's folder so that
    anything written relative to the working directory would show in its listing."""
    env = {**os.environ, "TABQ_MODEL": str(model)}
    command = [sys.executable, "-m", "tabq", "ask", target.arg, question, "--json"]
    stdin = target.stdin.open("rb") if target.stdin else subprocess.DEVNULL
    try:
        return subprocess.run(command, stdin=stdin, capture_output=True, env=env, cwd=cwd,
                              timeout=timeout)
    finally:
        if target.stdin:
            stdin.close()


def top_answer(done: subprocess.CompletedProcess) -> tuple[list | None, str, dict | None]:
    """The best answer's values, or why there is none; and the parsed JSON."""
    err = done.stderr.decode("utf-8", "replace").strip()
    if done.returncode:
        return None, f"exit {done.returncode}: {err.splitlines()[-1] if err else ''}", None
    try:
        payload = json.loads(done.stdout)
    except ValueError:
        return None, "the output is not JSON", None
    answers = payload.get("answers") or []
    if not answers:
        return None, "no answer", payload
    if answers[0].get("error"):
        return None, f"query failed: {answers[0]['error']}", payload
    return answers[0]["answer"], "", payload


def ask_question(case: Case, question: Question, folder: Path, target: Target,
                 model: Path) -> Outcome:
    """Ask one question of a written case; the folder's listing must not change."""
    before = listing(folder)
    try:
        done = ask_cli(target, question.text, model, folder)
    except subprocess.TimeoutExpired:
        return Outcome(case.name, question, problem=f"no answer within {TIMEOUT} s")
    got, problem, payload = top_answer(done)
    problem = problem.replace(str(folder), "<folder>")
    after = listing(folder)
    if after != before:
        changed = sorted(set(after.items()) ^ set(before.items()))
        problem = f"the folder changed: {changed[:3]}"
    return Outcome(case.name, question, got, problem, payload)


def note_mismatch(case: Case, payload: dict | None) -> str | None:
    """When the JSON says how the file was read (a "read" key), whether it carries a note
    exactly when the case expects one; None when there is nothing to check yet."""
    if not payload or "read" not in payload:
        return None
    read = payload["read"]
    noted = bool(payload.get("notes")) or (isinstance(read, dict) and bool(read.get("notes")))
    if noted == case.expect_note:
        return None
    return f"expected {'a' if case.expect_note else 'no'} note about the reading; got " \
           f"{payload.get('notes')!r} / {read!r}"


def run_case(case: Case, model: Path) -> list[Outcome]:
    """Write the case into a fresh folder and ask each of its questions."""
    with tempfile.TemporaryDirectory(prefix=f"messy-{case.name}-") as tmp:
        folder = Path(tmp)
        target = case.write(folder)
        return [ask_question(case, q, folder, target, model) for q in case.questions]


def _shown(values: Any, width: int = 22) -> str:
    text = json.dumps(values, ensure_ascii=False)
    return text if len(text) <= width else text[: width - 1] + "…"


def report(outcomes: Sequence[Outcome], skipped: Sequence[tuple[str, str]]) -> None:
    print(f"{'case':34s} {'question':40s} {'expected':22s} {'got':22s} result")
    for o in outcomes:
        got = _shown(o.got) if o.got is not None else o.problem[:60]
        mark = "right" if o.right else "WRONG"
        note = note_mismatch(BY_NAME[o.case], o.payload)
        print(f"{o.case:34s} {o.question.text[:40]:40s} {_shown(o.question.expected):22s} "
              f"{got:22s} {mark}" + (f"  (note: {note})" if note else ""))
    for name, why in skipped:
        print(f"{name:34s} skipped: {why}")
    right = sum(o.right for o in outcomes)
    cases_right = len({o.case for o in outcomes}) - len({o.case for o in outcomes if not o.right})
    print(f"\n{right}/{len(outcomes)} questions right; {cases_right}/"
          f"{len({o.case for o in outcomes})} cases all right; {len(skipped)} cases skipped")


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--case", choices=sorted(BY_NAME), metavar="NAME",
                        help="run this case only")
    args = parser.parse_args(argv)
    cases = [BY_NAME[args.case]] if args.case else CASES
    outcomes: list[Outcome] = []
    skipped = [(c.name, c.missing() or "") for c in cases if c.missing()]
    with tempfile.TemporaryDirectory(prefix="messy-model-") as model:
        for case in cases:
            if not case.missing():
                outcomes += run_case(case, Path(model) / "model")
    report(outcomes, skipped)
    return 0 if all(o.right for o in outcomes) else 1


if __name__ == "__main__":
    sys.exit(main())
