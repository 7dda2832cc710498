"""Diversity indices of a distribution of counts, as ecologists and information scientists use them.

All logarithms are natural. For counts ``n_i`` with total ``N`` and shares ``p_i = n_i / N``:

- Shannon entropy ``H = -sum p_i ln p_i`` (Shannon 1948);
- Pielou evenness ``J = H / ln S`` over the ``S`` values present (Pielou 1966);
- the effective number of values, Hill's number of order 1, ``exp(H)`` (Hill 1973);
- Gini-Simpson ``1 - sum p_i^2``, the chance that two entries drawn with replacement differ
  (Simpson 1949);
- Heip evenness ``(exp(H) - 1) / (S - 1)`` (Heip 1974).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass


@dataclass(frozen=True)
class Diversity:
    total: int
    values: int
    shannon: float
    pielou: float | None
    hill1: float
    gini_simpson: float
    heip: float | None


def shares(counts: Sequence[float]) -> list[float]:
    total = float(sum(counts))
    return [c / total for c in counts] if total > 0 else []


def shannon(counts: Sequence[float]) -> float:
    return -sum(p * math.log(p) for p in shares(counts) if p > 0)


def diversity(counts: Sequence[float]) -> Diversity:
    """Every index at once; evenness is undefined (None) with fewer than two values present."""
    present = [c for c in counts if c > 0]
    h = shannon(present)
    s = len(present)
    return Diversity(
        total=int(sum(present)),
        values=s,
        shannon=h,
        pielou=h / math.log(s) if s > 1 else None,
        hill1=math.exp(h) if present else 0.0,
        gini_simpson=1.0 - sum(p * p for p in shares(present)) if present else 0.0,
        heip=(math.exp(h) - 1.0) / (s - 1) if s > 1 else None,
    )
