"""How an answer is shown: a `pipeline.Result` as text for a person (a bar chart for a per-group
answer), as JSON for a program, or as the answer's own table in JSON lines, CSV or Markdown for a
spreadsheet, a script or a report.

Used by `tabq ask` and `tabq demo`; kept apart from cli.py so that nothing imports the CLI back.
"""

from __future__ import annotations

import csv
import io
import json
import math

from .errors import QueryError
from .pipeline import Reading, Result
from .table import ReadReport, Table
from .tabular import AnswerTable, answer_table

READ_WIDTH = 100         # characters of the "Read:" line under an answer; the rest is in --json
MORE = "… (see --json)"
SHOWN = 12               # values (or groups) of the best answer shown in text without --all
CHART_WIDTH = 32         # cells of the longest bar
FORMATS = ("text", "json", "ndjson", "csv", "markdown")
BY_SUFFIX = {".txt": "text", ".json": "json", ".ndjson": "ndjson", ".jsonl": "ndjson",
             ".csv": "csv", ".md": "markdown", ".markdown": "markdown"}
DELIMITERS = {",": "comma", ";": "semicolon", "\t": "tab", "|": "bar", " ": "space"}


def as_json(result: Result, top: int, every: bool = False) -> dict:
    """The question, its `top` distinct answers with their SQL and column names (in order of
    probability), how sure tabq is and why not, and how the table was read. With `every`, the
    best answer holds all its rows, not only those kept while ranking."""
    answers = []
    for i, r in enumerate(result.readings[:top]):
        shown = answer_table(r, result.table, every and i == 0)
        answers.append({
            "answer": [list(row) if r.is_table else row[0] for row in shown.rows],
            "columns": list(shown.columns), "sql": r.sql, "paraphrase": r.paraphrase,
            "score": round(r.score, 4), "probability": round(r.probability, 4),
            **({"error": r.error} if r.error else {})})
    return {"question": result.question, "answers": answers,
            "confidence": round(result.confidence, 4), "unsure": result.unsure,
            "unsure_reason": result.unsure_reason, "notes": result.notes,
            "read": read_json(result.table)}


def best_table(result: Result, every: bool = False) -> AnswerTable:
    """The best answer's rows under their names; an error when there is none to give."""
    best = result.best
    if best is None:
        raise QueryError("no reading of this question fits the table")
    if best.error:
        raise QueryError(f"the best reading's query failed: {best.error}")
    return answer_table(best, result.table, every)


def as_ndjson(shown: AnswerTable) -> str:
    """One JSON object a row, keyed by column name (strict JSON: NaN is null)."""
    return "".join(json.dumps(_finite(row), ensure_ascii=False, allow_nan=False) + "\n"
                   for row in shown.records())


def as_csv(shown: AnswerTable) -> str:
    """A header line, then a line a row; a missing value is an empty cell."""
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(shown.columns)
    writer.writerows([["" if v is None else v for v in row] for row in shown.rows])
    return out.getvalue()


def as_markdown(result: Result, shown: AnswerTable) -> str:
    """The answer as a Markdown table, then its reading, its SQL and, if any, why to doubt it:
    ready to paste into a report."""
    numeric = [all(isinstance(row[i], (int, float)) or row[i] is None for row in shown.rows)
               and bool(shown.rows) for i in range(len(shown.columns))]
    lines = ["| " + " | ".join(_md_cell(c) for c in shown.columns) + " |",
             "|" + "|".join("---:" if n else "---" for n in numeric) + "|"]
    lines += ["| " + " | ".join(_md_cell(v) for v in row) + " |" for row in shown.rows]
    lines += ["", f"*Question:* {_md_text(result.question)}  ",
              f"*Reading:* {_md_text(result.paraphrase or '')}  ",
              f"*Sureness:* {result.confidence:.0%}"
              + (f" (unsure: {_md_text(result.unsure_reason)})" if result.unsure else ""), "",
              "```sql", result.sql or "", "```"]
    return "\n".join(lines) + "\n"


def _md_cell(value) -> str:
    return "" if value is None else _md_text(str(value)).replace("|", "\\|")


def _md_text(text: str) -> str:
    return " ".join(text.split()).replace("<", "&lt;")


def read_json(table: Table | None) -> dict | None:
    """How the table's file was read, in full (None for a table made in memory)."""
    report = table.report if table is not None else None
    if report is None:
        return None
    return {"format": report.format, "rows": table.row_count,
            "columns": sum(1 for col in table.columns if col.view is None),
            "header_line": report.header_line, "encoding": report.encoding,
            "delimiter": report.delimiter, "decimal_mark": report.decimal_mark,
            "sources": list(report.sources),
            "skipped": [{"why": s.why, "rows": s.rows, "lines": list(s.lines)}
                        for s in report.skipped],
            "columns_read": [{"header": c.header, "name": c.name, "kind": c.kind,
                              "parsed": round(c.parsed, 4) if math.isfinite(c.parsed) else None,
                              "how": c.how}
                             for c in report.columns],
            "guesses": list(report.guesses), "notes": report.notes()}


def read_line(report: ReadReport | None, width: int = READ_WIDTH) -> str | None:
    """What was left out or guessed in reading the table, on one line of at most `width`
    characters; None when there is nothing to say."""
    notes = report.notes() if report is not None else []
    if not notes:
        return None
    line = "Read:     " + " ".join("; ".join(notes).split())
    if len(line) <= width:
        return line
    cut = line[:width - len(MORE)]
    if " " in cut[len("Read:     "):]:
        cut = cut[:cut.rindex(" ")]          # a whole word, not half of one
    return cut.rstrip(" ;,(") + " " + MORE


def read_details(table: Table) -> list[tuple[str, bool]]:
    """How the table was read, line by line for the app: (text, whether it needs a look) —
    what was left out or guessed, and columns whose cells did not all read as their kind."""
    report = table.report
    if report is None:
        return [("Made in memory, not read from a file.", False)]
    how = [f"{report.format.upper() or 'a file'}"]
    if report.encoding:
        how.append(f"text in {report.encoding}")
    if report.delimiter:
        how.append(f"{DELIMITERS.get(report.delimiter, repr(report.delimiter))}-separated")
    if report.decimal_mark:
        how.append(f"decimal {'comma' if report.decimal_mark == ',' else 'point'}")
    if report.header_line:
        how.append(f"header on line {report.header_line}")
    lines = [("Read as " + ", ".join(how) + ".", False)]
    if report.sources:
        lines.append((f"Made of {len(report.sources)} files: {', '.join(report.sources)}.", True))
    lines += [(note[0].upper() + note[1:].rstrip(".") + ".", True)
              for note in report.notes() if note]
    lines += [(_column_line(c.header, c.kind, c.parsed, c.how), c.parsed < 1)
              for c in report.columns if c.parsed < 1 or c.how]
    if not report.notes() and not report.sources:
        lines.append(("No rows were left out and nothing was guessed.", False))
    return lines


def _column_line(header: str, kind: str, parsed: float, how: str) -> str:
    name = header if len(header) <= 40 else header[:39] + "…"
    share = f", {int(parsed * 100)}% of its cells read as such" if parsed < 1 else ""
    return f"{name}: {kind}{share}" + (f" ({how})" if how else "") + "."


def format_answer(reading: Reading, limit: int = 12) -> str:
    """A reading's values on one line: at most `limit`, then how many more there are."""
    if reading.error:
        return f"(no answer: {reading.error})"
    if not reading.answer:
        return "(no rows)"
    shown = [" = ".join(map(str, v)) if isinstance(v, tuple) else str(v)
             for v in reading.answer[:limit]]
    more = len(reading.answer) - limit
    return ", ".join(shown) + (f" … and {more} more" if more > 0 else "")


def format_result(result: Result, top: int = 3, every: bool = False,
                  colour: bool = False, cut_hint: str = "") -> str:
    """The answer, its SQL, its reading and how sure the model is; then the runners-up. A
    per-group answer is drawn as bars; a long answer is cut at SHOWN values unless `every`.
    `colour` adds terminal colours to the bars (the CLI asks for them on a terminal, without
    NO_COLOR). `cut_hint` follows a cut answer: how to see all of it, where there is a way."""
    best = result.best
    read = read_line(result.read)     # under the answer: a row left out can change it
    if best is None:
        return "\n".join(["No reading of this question fits the table."] + ([read] if read else []))
    sure = f"{best.probability:.0%} of the model's belief"
    lines = _best_lines(result, best, every, colour, cut_hint) + ([read] if read else [])
    lines += [f"Reading:  {best.paraphrase}",
              f"SQL:      {best.sql}",
              f"Sureness: {sure}" + (f"  — unsure: {result.unsure_reason}. Check the SQL "
                                     "and the other readings" if result.unsure else "")]
    lines += [f"Note:     {note}" for note in result.notes]
    others = result.readings[1:top]
    if others:
        lines.append("Other readings:")
        for reading in others:
            lines.append(f"  {format_answer(reading, 6)}  ({reading.probability:.0%}) — "
                         f"{reading.paraphrase}")
    return "\n".join(lines)


def _best_lines(result: Result, best: Reading, every: bool, colour: bool,
                cut_hint: str) -> list[str]:
    """The "Answer:" line; for a per-group answer, a bar chart under it."""
    if best.error or not best.answer:
        return [f"Answer:   {format_answer(best)}"]
    shown = answer_table(best, result.table, every)
    if not best.is_table:
        values = [row[0] for row in shown.rows]
        kept = values if every else values[:SHOWN]
        line = format_answer(Reading(best.form, best.sql, best.paraphrase, kept, best.score, {}),
                             len(kept))
        if len(kept) < len(values):       # more past those kept while ranking: "1000+"
            line += f" … and {len(values) - len(kept)}{'' if shown.complete else '+'} more"
            line += f" ({cut_hint})" if cut_hint else ""
        return [f"Answer:   {line}"]
    rows = shown.rows if every else shown.rows[:SHOWN]
    more = len(shown.rows) - len(rows)
    head = (f"Answer:   a table of {len(shown.rows)}{'' if shown.complete else '+'} rows "
            f"({', '.join(shown.columns)})")
    lines = [head] + ["  " + line for line in bar_chart_lines(shown.columns, rows, colour)]
    if more > 0:
        lines.append(f"  … and {more} more rows" + (f" ({cut_hint})" if cut_hint else ""))
    return lines


def bar_chart_lines(columns: tuple[str, ...], rows, colour: bool = False,
                    width: int = CHART_WIDTH) -> list[str]:
    """A per-group answer as a table with a bar per row, scaled to the largest value: the key
    columns, the value, the bar. Laid out by rich; coloured only when `colour`."""
    from rich.console import Console
    from rich.table import Table as RichTable
    from rich.text import Text

    from .ui.chart import bar_rows
    table = RichTable(box=None, pad_edge=False, show_header=True,
                      header_style="bold cyan" if colour else "")
    table.add_column(" · ".join(columns[:-1]))
    table.add_column(columns[-1], justify="right")
    table.add_column("")
    for label, bar, value in bar_rows([tuple(r) for r in rows], width):
        table.add_row(label, value, Text(bar, style="yellow" if colour else ""))
    out = io.StringIO()
    console = Console(file=out, width=200, force_terminal=colour, no_color=not colour,
                      color_system="standard" if colour else None, highlight=False)
    console.print(table)
    return [line.rstrip() for line in out.getvalue().splitlines()]


def render(result: Result, fmt: str, top: int = 3, every: bool = False,
           colour: bool = False) -> str:
    """The result in one of FORMATS, as the text to print or write (ending in a newline)."""
    if fmt == "text":
        return format_result(result, top, every, colour, "--all shows every one") + "\n"
    if fmt == "json":
        return dump_json(as_json(result, top, every)) + "\n"
    shown = best_table(result, every)
    if fmt == "ndjson":
        return as_ndjson(shown)
    if fmt == "csv":
        return as_csv(shown)
    return as_markdown(result, shown)


def dump_json(data: object) -> str:
    """Strict JSON: a number JSON cannot hold (NaN, an infinity) is written as null, never as
    the bare NaN or Infinity that JSON readers refuse."""
    return json.dumps(_finite(data), ensure_ascii=False, indent=2, allow_nan=False)


def _finite(data: object) -> object:
    if isinstance(data, float) and not math.isfinite(data):
        return None
    if isinstance(data, dict):
        return {k: _finite(v) for k, v in data.items()}
    if isinstance(data, (list, tuple)):
        return [_finite(v) for v in data]
    return data
