"""Central finite differences in the six electron coordinates (test helper).

Fourth-order stencils (common practice) with step ``H``; coordinates ``x = (r1, r2)`` as one
array of six numbers.
"""

from __future__ import annotations

import numpy as np

H = 1e-3
FIRST = ((-2, 1 / 12), (-1, -8 / 12), (1, 8 / 12), (2, -1 / 12))
SECOND = ((-2, -1 / 12), (-1, 16 / 12), (0, -30 / 12), (1, 16 / 12), (2, -1 / 12))


def stencil(f, x, index, weights, power):
    """``∂^power f / ∂x_index^power`` at ``x`` from the stencil ``weights``."""
    total = 0.0
    for step, weight in weights:
        y = x.copy()
        y[index] += step * H
        total += weight * f(y)
    return total / H**power


def grad(f, x, n):
    """Gradient of ``f`` with respect to electron ``n`` (1 or 2)."""
    return np.array([stencil(f, x, 3 * (n - 1) + d, FIRST, 1) for d in range(3)])


def lap(f, x, n):
    """Laplacian of ``f`` with respect to electron ``n``."""
    return sum(stencil(f, x, 3 * (n - 1) + d, SECOND, 2) for d in range(3))
