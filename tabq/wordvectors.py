"""wordvectors: how related in meaning two word stems are, from small shipped word vectors.

tabq/data/word_vectors.npz holds one int8 vector per English stem (13,730 stems, 128 numbers
each), built once by tools/make_vectors.py from a sentence encoder; see that script for how and
tabq/data/MINILM-LICENSE for the source. Read with numpy on first use (about 40 ms, once per
process), and only when a question has a word that nothing else explains.
"""

from __future__ import annotations

from functools import lru_cache
from importlib import resources

import numpy as np

SCALE = 127 * 127   # both vectors are unit length × 127 (int8)


@lru_cache(maxsize=1)
def _table() -> tuple[dict[str, int], np.ndarray]:
    with resources.as_file(resources.files("tabq") / "data" / "word_vectors.npz") as path:
        data = np.load(path)
        stems, vectors = data["stems"], data["vectors"].astype(np.int32)
    return {s: i for i, s in enumerate(stems.tolist())}, vectors


def similarity(a: str, b: str) -> float:
    """Cosine of two stems' vectors (about 0 for unrelated words, 0.5 and up for a word and its
    near-synonym or measure); 0 when either stem is unknown."""
    index, vectors = _table()
    i, j = index.get(a), index.get(b)
    if i is None or j is None:
        return 0.0
    return float(vectors[i] @ vectors[j]) / SCALE

