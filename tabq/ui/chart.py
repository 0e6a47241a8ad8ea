"""Bars as text: a per-group answer drawn with block characters, so a glance compares groups."""

from __future__ import annotations

from ..answers import tidy

EIGHTHS = " ▏▎▍▌▋▊▉"
LABEL_MOST = 18


def bar_rows(rows: list[tuple], width: int) -> list[tuple[str, str, str]]:
    """(label, bar, value) per group row: label = every column but the last, value = the last.

    Bars are scaled to the largest absolute value; rows whose value is not a number get no bar.
    """
    values = [row[-1] if isinstance(row[-1], (int, float)) and not isinstance(row[-1], bool)
              else None for row in rows]
    top = max((abs(v) for v in values if v is not None), default=0) or 1
    out = []
    for row, value in zip(rows, values):
        label = " · ".join("(missing)" if v is None else str(v) for v in row[:-1])
        if len(label) > LABEL_MOST:
            label = label[:LABEL_MOST - 1] + "…"
        bar = _bar(abs(value) / top * width) if value is not None else ""
        out.append((label, bar, _number(row[-1])))
    return out


def bar_chart(rows: list[tuple], width: int = 40) -> str:
    """The bars as lines of text, labels and values aligned."""
    drawn = bar_rows(rows, max(width, 1))
    if not drawn:
        return "(no groups)"
    left = max(len(label) for label, _, _ in drawn)
    return "\n".join(f"{label:<{left}} {bar:<{width}} {value}" for label, bar, value in drawn)


def _bar(cells: float) -> str:
    whole, part = int(cells), int(round((cells - int(cells)) * 8))
    if part == 8:
        whole, part = whole + 1, 0
    return "█" * whole + (EIGHTHS[part] if part else "")


def _number(value) -> str:
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        # the value as the answer gives it (no fixed 2 decimals: 0.0004 is not 0.00)
        return f"{tidy(value) if isinstance(value, float) else value:,}"
    return "(missing)" if value is None else str(value)
