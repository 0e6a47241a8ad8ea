"""How an answer is shown: a `pipeline.Result` as text for a person or as JSON for a program.

Used by `tabq ask` and `tabq demo`; kept apart from cli.py so that nothing imports the CLI back.
"""

from __future__ import annotations

from .pipeline import Reading, Result


def as_json(result: Result, top: int) -> dict:
    """The question, its `top` distinct answers with their SQL, and whether tabq is unsure."""
    return {"question": result.question,
            "answers": [{"answer": [list(v) if isinstance(v, tuple) else v for v in r.answer],
                         "sql": r.sql, "paraphrase": r.paraphrase,
                         "score": round(r.score, 4), "probability": round(r.probability, 4),
                         **({"error": r.error} if r.error else {})}
                        for r in result.readings[:top]],
            "unsure": result.unsure, "notes": result.notes}


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
