"""store: the model folder — weights learned on top of the prior.

The folder holds `weights.json` (`{"format": "tabq-weights", "version": 1, "weights": {...}}`).
No folder, or a folder with no weights yet, means the untaught prior.
"""

from __future__ import annotations

import json
from pathlib import Path

from .errors import ModelError
from .model import FORMAT_VERSION, Model

WEIGHTS = "weights.json"


def load_model(folder: str | Path | None) -> Model:
    """The model in a folder: the prior plus what was learned there."""
    model = Model.prior()
    if folder is None:
        return model
    path = Path(folder) / WEIGHTS
    if not path.exists():
        return model
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, json.JSONDecodeError) as err:
        raise ModelError(f"{path}: not a tabq weights file ({err.__class__.__name__})") from err
    if not isinstance(data, dict) or data.get("format") != "tabq-weights":
        raise ModelError(f"{path}: not a tabq weights file")
    if data.get("version") != FORMAT_VERSION:
        raise ModelError(f"{path}: weights format version {data.get('version')!r}, "
                         f"this tabq reads version {FORMAT_VERSION}")
    weights = data.get("weights")
    if not isinstance(weights, dict) or not all(
            isinstance(v, (int, float)) for v in weights.values()):
        raise ModelError(f"{path}: weights must map feature names to numbers")
    return Model(weights)
