"""tabq: plain-English questions about a local table, answered with the SQL that produced them."""

from .api import OpenTable, Reading, Result, open
from .errors import TabqError

__all__ = ["OpenTable", "Reading", "Result", "TabqError", "open"]
