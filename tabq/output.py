"""How an answer is shown: a `pipeline.Result` as text for a person or as JSON for a program.

Used by `tabq ask` and `tabq demo`; kept apart from cli.py so that nothing imports the CLI back.
"""

from __future__ import annotations

import math

from .pipeline import Reading, Result
from .table import ReadReport, Table

READ_WIDTH = 100         # characters of the "Read:" line under an answer; the rest is in --json
MORE = "… (see --json)"
DELIMITERS = {",": "comma", ";": "semicolon", "\t": "tab", "|": "bar", " ": "space"}


def as_json(result: Result, top: int) -> dict:
    """The question, its `top` distinct answers with their SQL (in order of probability), how
    sure tabq is and why not, and how the table was read."""
    return {"question": result.question,
            "answers": [{"answer": [list(v) if isinstance(v, tuple) else v for v in r.answer],
                         "sql": r.sql, "paraphrase": r.paraphrase,
                         "score": round(r.score, 4), "probability": round(r.probability, 4),
                         **({"error": r.error} if r.error else {})}
                        for r in result.readings[:top]],
            "confidence": round(result.confidence, 4), "unsure": result.unsure,
            "unsure_reason": result.unsure_reason, "notes": result.notes,
            "read": read_json(result.table)}


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


def format_result(result: Result, top: int = 3) -> str:
    """The answer, its SQL, its reading and how sure the model is; then the runners-up."""
    best = result.best
    read = read_line(result.read)     # under the answer: a row left out can change it
    if best is None:
        return "\n".join(["No reading of this question fits the table."] + ([read] if read else []))
    sure = f"{best.probability:.0%} of the model's belief"
    lines = [f"Answer:   {format_answer(best)}"] + ([read] if read else [])
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
