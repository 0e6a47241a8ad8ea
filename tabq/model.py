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
        if weights:
            self.update({k: v for k, v in weights.items()})

    @classmethod
    def prior(cls) -> Model:
        return cls(prior_weights())

    def weight(self, name: str) -> float:
        i = self.index.get(name)
        return 0.0 if i is None else float(self.w[i])

    def score(self, features: Mapping[str, float]) -> float:
        index, w = self.index, self.w
        total = 0.0
        for name, value in features.items():
            i = index.get(name)
            if i is not None:
                total += w[i] * value
        return float(total)

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
