"""How a result shows itself in a notebook (`Result._repr_html_`): the answer (a per-group answer
as a table with a bar a row), its reading, its SQL, how sure tabq is, and the other readings.

Every piece of text is HTML-escaped: headers and cells come from someone's file.
"""

from __future__ import annotations

from html import escape

from .tabular import answer_table

ROWS_SHOWN = 20          # rows of a long answer shown; the rest are counted
OTHERS_SHOWN = 4         # other readings listed
BAR_PX = 160             # width of the longest bar
BAR_COLOUR = "#c8863a"
MUTED = "color:#6b7280"


def result_html(result) -> str:
    """The whole display, one <div>."""
    best = result.best
    if best is None:
        return _box("<p>No reading of this question fits the table.</p>")
    parts = [f"<div style='{MUTED}'>Q: {escape(result.question)}</div>",
             _answer_html(result, best),
             f"<p><b>Reading:</b> {escape(best.paraphrase)}<br/>"
             f"<b>Sureness:</b> {best.probability:.0%}"
             + (f" — <span style='color:#b45309'>unsure: {escape(result.unsure_reason)}</span>"
                if result.unsure else "") + "</p>",
             f"<pre style='white-space:pre-wrap'><code>{escape(best.sql)}</code></pre>"]
    parts += [f"<p style='{MUTED}'>{escape(note)}</p>" for note in result.notes]
    others = result.readings[1:1 + OTHERS_SHOWN]
    if others:
        items = "".join(f"<li>{_short(r)} ({r.probability:.0%}) — {escape(r.paraphrase)}</li>"
                        for r in others)
        parts.append(f"<details><summary>Other readings</summary><ul>{items}</ul></details>")
    return _box("".join(parts))


def _box(inner: str) -> str:
    return f"<div class='tabq-result' style='line-height:1.4'>{inner}</div>"


def _answer_html(result, best) -> str:
    if best.error:
        return f"<p><b>No answer:</b> {escape(best.error)}</p>"
    shown = answer_table(best, result.table)
    if not best.is_table:
        if len(shown.rows) == 1:
            return f"<p style='font-size:1.3em'><b>{escape(_text(shown.rows[0][0]))}</b></p>"
        return _table_html(shown.columns, shown.rows, bars=False)
    return _table_html(shown.columns, shown.rows, bars=True)


def _table_html(columns, rows, bars: bool) -> str:
    """Rows under their column names; with `bars`, a bar for the last column's value."""
    numbers = [r[-1] for r in rows if _is_number(r[-1])]
    top = max((abs(v) for v in numbers), default=0) or 1
    head = "".join(f"<th style='text-align:left'>{escape(c)}</th>" for c in columns)
    body = []
    for row in rows[:ROWS_SHOWN]:
        cells = "".join(f"<td>{escape(_text(v))}</td>" for v in row)
        if bars:
            width = round(abs(row[-1]) / top * BAR_PX) if _is_number(row[-1]) else 0
            cells += (f"<td><div style='background:{BAR_COLOUR};height:0.8em;"
                      f"width:{width}px'></div></td>")
        body.append(f"<tr>{cells}</tr>")
    more = len(rows) - ROWS_SHOWN
    if more > 0:
        body.append(f"<tr><td colspan='{len(columns) + bars}' style='{MUTED}'>… and {more} "
                    "more rows (to_pandas() gives them all)</td></tr>")
    return (f"<table><thead><tr>{head}{'<th></th>' if bars else ''}</tr></thead>"
            f"<tbody>{''.join(body)}</tbody></table>")


def _short(reading, most: int = 4) -> str:
    if reading.error:
        return "<i>failed</i>"
    if not reading.answer:
        return "<i>no rows</i>"
    if reading.is_table:
        return f"<i>a table of {len(reading.answer)} rows</i>"
    shown = ", ".join(escape(_text(v)) for v in reading.answer[:most])
    return "<b>" + shown + (" …" if len(reading.answer) > most else "") + "</b>"


def _text(value) -> str:
    return "(missing)" if value is None else str(value)


def _is_number(value) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool)
