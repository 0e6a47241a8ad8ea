"""The Python API: open a table, ask it questions, get ranked answers with their SQL.

    >>> table = tabq.open("sample_tables/repair_jobs.csv")
    >>> result = table.ask("how many jobs were waiting for parts")
    >>> result.answer, result.sql, result.paraphrase
"""

from __future__ import annotations

import os
from pathlib import Path

from .frames import is_frame, load_frame
from .load import load_table
from .model import Model
from .pipeline import OpenTable, Reading, Result
from .store import ModelFolder
from .table import ReadChoices
from .teaching import current

__all__ = ["OpenTable", "Reading", "Result", "open"]


def open(path: str | Path | object, model: str | Path | Model | None = None,
         table: str | None = None, choices: ReadChoices | None = None) -> OpenTable:
    """Load a table file (CSV, TSV, Parquet, JSON lines, Excel, SQLite) for questions, or a
    table already in memory: a pandas, polars or Arrow table or a DuckDB relation, copied into
    tabq's own DuckDB table (for a frame, `table` is its name, whose words name the rows:
    "penguins"; `choices` do not apply).

    `model` is a model folder or a `Model`; without one, the default folder's, as `tabq ask`
    uses ($TABQ_MODEL, else the per-user folder). `Model.prior()` is the untaught model.
    A folder whose weights file is missing is rebuilt from its log first. `choices` overrule
    tabq's reading guesses (header line, decimal mark, encoding) when they were wrong.
    """
    chosen = model if isinstance(model, Model) else current(ModelFolder(model))  # fails first
    if is_frame(path) or not isinstance(path, (str, os.PathLike)):
        return OpenTable(load_frame(path, table), chosen)   # refuses what is neither
    return OpenTable(load_table(path, table, choices), chosen)
