"""tabq: plain-English questions about a local table, answered with the SQL that produced them."""

from .api import OpenTable, Reading, Result, open
from .errors import TabqError
from .model import Model

__all__ = ["Model", "OpenTable", "Reading", "Result", "TabqError", "open"]
