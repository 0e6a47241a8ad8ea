"""The command line: a thin layer over the Python API. Errors become one line and an exit code."""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from . import api
from .errors import TabqError

EXAMPLES = {
    "ask": 'tabq ask sample_tables/repair_jobs.csv "how many jobs were cancelled"',
    "demo": "tabq demo",
}


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="tabq", description="Answer plain-English questions about a local table.",
        epilog="Every answer comes with the SQL that produced it: check it before acting on it.")
    parser.add_argument("-V", "--version", action="version", version=f"tabq {_version()}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND")

    ask = commands.add_parser("ask", help="answer one question about a table",
                              description="Answer one question about a table, with the SQL "
                              "and a plain reading of it.",
                              epilog=f"example: {EXAMPLES['ask']}")
    ask.add_argument("table", help="a CSV, TSV, Parquet, JSON-lines, Excel or SQLite file")
    ask.add_argument("question", help="the question, in plain English")
    ask.add_argument("--table", dest="table_name", metavar="NAME",
                     help="which table or sheet of a SQLite or Excel file")
    ask.add_argument("--model", metavar="DIR", help="a model folder (default: the untaught model)")
    ask.add_argument("--top", type=int, default=3, metavar="K",
                     help="how many distinct answers to show (default 3)")
    ask.add_argument("--json", action="store_true", help="print JSON instead of text")
    ask.set_defaults(run=_ask)

    demo = commands.add_parser("demo", help="ask the demo tables a few questions",
                               description="Ask the invented demo tables (a community bike "
                               "workshop) a few questions and show the answers with their SQL.",
                               epilog=f"example: {EXAMPLES['demo']}")
    demo.set_defaults(run=_demo)
    return parser


def _version() -> str:
    from importlib.metadata import PackageNotFoundError, version
    try:
        return version("tabq")
    except PackageNotFoundError:
        return "unknown"


def main(argv: list[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if not getattr(args, "run", None):
        parser.print_help()
        return 2
    try:
        return args.run(args)
    except TabqError as err:
        print(f"tabq: {_one_line(str(err))}", file=sys.stderr)
        return err.exit_code
    except KeyboardInterrupt:
        print("tabq: stopped", file=sys.stderr)
        return 130
    except Exception as err:  # a bug of ours: still one line, never a traceback
        print(f"tabq: internal error ({err.__class__.__name__}): {_one_line(str(err))}",
              file=sys.stderr)
        return 1


def _one_line(text: str) -> str:
    return " ".join(text.split())[:300]


def _ask(args: argparse.Namespace) -> int:
    table = api.open(args.table, model=args.model, table=args.table_name)
    result = table.ask(args.question)
    top = max(1, args.top)
    if args.json:
        print(json.dumps(_as_json(result, top), ensure_ascii=False, indent=2))
    else:
        print(format_result(result, top))
    return 0


def _as_json(result: api.Result, top: int) -> dict:
    return {"question": result.question,
            "answers": [{"answer": [list(v) if isinstance(v, tuple) else v for v in r.answer],
                         "sql": r.sql, "paraphrase": r.paraphrase,
                         "score": round(r.score, 4), "probability": round(r.probability, 4),
                         **({"error": r.error} if r.error else {})}
                        for r in result.readings[:top]],
            "unsure": result.unsure, "notes": result.notes}


def format_answer(reading: api.Reading, limit: int = 12) -> str:
    if reading.error:
        return f"(no answer: {reading.error})"
    if not reading.answer:
        return "(no rows)"
    shown = [" = ".join(map(str, v)) if isinstance(v, tuple) else str(v)
             for v in reading.answer[:limit]]
    more = len(reading.answer) - limit
    return ", ".join(shown) + (f" … and {more} more" if more > 0 else "")


def format_result(result: api.Result, top: int = 3) -> str:
    """The answer, its SQL, its reading and how sure the model is; then the runners-up."""
    best = result.best
    if best is None:
        return "No reading of this question fits the table."
    sure = f"{best.probability:.0%} of the model's belief"
    lines = [f"Answer:   {format_answer(best)}",
             f"Reading:  {best.paraphrase}",
             f"SQL:      {best.sql}",
             f"Sureness: {sure}" + ("  — unsure: check the SQL and the other readings"
                                    if result.unsure else "")]
    lines += [f"Note:     {note}" for note in result.notes]
    others = result.readings[1:top]
    if others:
        lines.append("Other readings:")
        for reading in others:
            lines.append(f"  {format_answer(reading, 6)}  ({reading.probability:.0%}) — "
                         f"{reading.paraphrase}")
    return "\n".join(lines)


def _demo(args: argparse.Namespace) -> int:
    from .demo import run_demo
    run_demo(print)
    return 0



if __name__ == "__main__":
    sys.exit(main())
