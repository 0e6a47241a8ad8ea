"""tabq: plain-English questions about a local table, answered with the SQL that produced them."""

from .api import OpenTable, Reading, Result, open
from .errors import TabqError
from .model import Model


def _version() -> str:
    """The installed distribution's version; "unknown" when run from a checkout not installed."""
    from importlib.metadata import PackageNotFoundError, version
    try:
        return version("tabq")
    except PackageNotFoundError:
        return "unknown"


__version__ = _version()

__all__ = ["Model", "OpenTable", "Reading", "Result", "TabqError", "__version__", "open"]
