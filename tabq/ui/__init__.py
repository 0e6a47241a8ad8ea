"""The terminal app (`tabq ui`): ask a table, confirm answers, teach tabq the team's words."""

from __future__ import annotations

import sys
import warnings
from pathlib import Path

from ..table import ReadChoices


def run(path: str | Path, model: str | Path | None = None, table: str | None = None,
        choices: ReadChoices | None = None) -> None:
    """Start the app on a table file; returns when the person quits. Warnings (a damaged log
    line skipped, say) are held while the screen is the app's and printed after it closes."""
    from .app import TabqApp
    with warnings.catch_warnings(record=True) as held:
        warnings.simplefilter("default")
        TabqApp(path, model, table, choices).run()
    for warning in held:
        print(f"tabq: warning: {' '.join(str(warning.message).split())[:300]}", file=sys.stderr)
