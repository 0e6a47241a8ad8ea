"""The terminal app (`tabq ui`): ask a table, confirm answers, teach tabq the team's words."""

from __future__ import annotations

from pathlib import Path


def run(path: str | Path, model: str | Path | None = None, table: str | None = None) -> None:
    """Start the app on a table file; returns when the person quits."""
    from .app import TabqApp
    TabqApp(path, model, table).run()
