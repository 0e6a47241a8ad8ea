"""score: a linear model over sparse features, w·φ, with a numpy weight vector.

Features are names (strings) with values; the model keeps an index from name to position in its
weight vector and grows it as new features are learned. Unknown features weigh nothing.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping

import numpy as np

from .prior import prior_weights

FORMAT_VERSION = 1


class Model:
    """Weights by feature name. `Model.prior()` is the untaught model."""

    def __init__(self, weights: Mapping[str, float] | None = None):
        self.index: dict[str, int] = {}
        self.w = np.zeros(0, dtype=np.float64)
        self.version = 0   # bumps on every change, so callers can drop cached scores
        self._by_name: dict[str, float] = {}
        self._by_name_of: tuple | None = None
        if weights:
            self.update({k: v for k, v in weights.items()})

    @classmethod
    def prior(cls) -> Model:
        return cls(prior_weights())

    def weight(self, name: str) -> float:
        i = self.index.get(name)
        return 0.0 if i is None else float(self.w[i])

    def score(self, features: Mapping[str, float], start: float = 0.0) -> float:
        """w·φ, added to `start`: a score computed in parts, each continuing the sum of the one
        before, comes out bit for bit as the score of the merged features (the beam breaks ties
        by score, so a last-bit difference would change which forms it keeps)."""
        weights = self._weights_by_name()
        total = start
        for name, value in features.items():
            w = weights.get(name)
            if w is not None:
                total += w * value
        return total

    def _weights_by_name(self) -> dict[str, float]:
        """The weights as a plain dict: the chart scores thousands of small feature dicts per
        question, and Python floats are several times faster there than numpy scalars."""
        key = (self.version, id(self.w), len(self.w))
        if self._by_name_of != key:
            values = self.w.tolist()
            self._by_name = {name: values[i] for name, i in self.index.items()}
            self._by_name_of = key
        return self._by_name

    def update(self, delta: Mapping[str, float], scale: float = 1.0) -> None:
        """w[name] += scale · delta[name], adding features not seen before."""
        new = [name for name in delta if name not in self.index]
        if new:
            start = len(self.w)
            for offset, name in enumerate(new):
                self.index[name] = start + offset
            self.w = np.concatenate([self.w, np.zeros(len(new))])
        for name, value in delta.items():
            self.w[self.index[name]] += scale * value
        self.version += 1

    def items(self) -> Iterable[tuple[str, float]]:
        for name, i in self.index.items():
            yield name, float(self.w[i])

    def as_dict(self) -> dict[str, float]:
        return dict(self.items())
