r"""Fast float64 kernels for the correlated two-electron integral.

.. math::

    I(a, b, c; \alpha, \beta, \gamma) = \int\!\!\int r_1^{a} r_2^{b} r_{12}^{c}
        e^{-\alpha r_1 - \beta r_2 - \gamma r_{12}}\, d^3r_1\, d^3r_2

for integers ``a, b, c >= -1``, ``α + β > 0``, ``β + γ > 0``, ``γ + α > 0`` (so ``γ = 0`` and
``α = β`` are regular).  It follows from the master integral
(:func:`twoel.integrals.symbolic.master_integral`, derived there with perimetric coordinates)

.. math::

    I(-1,-1,-1) = \frac{16\pi^2}{A B C},\qquad A=\alpha+\beta,\; B=\beta+\gamma,\; C=\gamma+\alpha,

by differentiation, ``I(a,b,c) = (-∂_α)^{a+1} (-∂_β)^{b+1} (-∂_γ)^{c+1} I(-1,-1,-1)``.  Because
``-∂_α`` acts on ``A`` and ``C``, ``-∂_β`` on ``A`` and ``B`` and ``-∂_γ`` on ``B`` and ``C``, the
Taylor coefficients of ``1/((A-x-y)(B-y-z)(C-z-x))`` in ``x, y, z`` are the derivatives divided by
``l! m! n!``.  Each factor is a geometric series in two variables with *positive* coefficients,
so a whole table of integrals is a product of three such series: every term is positive, there
is no cancellation, and each entry is accurate to a few ulp.  (The same formula, written as a
triple sum, is checked against SymPy's exact derivatives in the tests.)
"""

from __future__ import annotations

from functools import lru_cache
from math import comb, factorial

import numpy as np

from twoel.integrals.closed_forms import SIXTEEN_PI_SQUARED
from twoel.errors import InputError


#: largest power handled (table side); factorials stay far from float64 overflow
MAX_POWER = 60


@lru_cache(maxsize=None)
def _binomial_table(size: int) -> np.ndarray:
    table = np.zeros((size, size))
    for i in range(size):
        for j in range(size):
            table[i, j] = comb(i + j, i)
    return table


@lru_cache(maxsize=None)
def _factorials(size: int) -> np.ndarray:
    return np.array([float(factorial(k)) for k in range(size)])


def _series_factor(inverse_x: np.ndarray, size: int) -> np.ndarray:
    """Coefficients ``binom(p+q, p) / X^(p+q+1)`` of ``1/(X - u - v)``, shape ``(E, size, size)``."""
    # inverse powers 1/X^(k+1), k = 0 .. 2 size - 2
    powers = np.cumprod(np.repeat(inverse_x[:, None], 2 * size - 1, axis=1), axis=1)
    index = np.add.outer(np.arange(size), np.arange(size))
    return _binomial_table(size)[None] * powers[:, index]


def integral_table(alpha, beta, gamma, max_power: int) -> np.ndarray:
    """All integrals ``I(a, b, c)`` for ``-1 <= a, b, c <= max_power`` at once.

    Parameters
    ----------
    alpha, beta, gamma : array_like, shape (E,)
        Exponents (bohr⁻¹) of ``r1``, ``r2`` and ``r12``.
    max_power : int
        Largest power of ``r1``, ``r2`` or ``r12`` needed.

    Returns
    -------
    ndarray, shape (E, L, L, L) with ``L = max_power + 2``
        ``table[e, a + 1, b + 1, c + 1] = I(a, b, c; alpha[e], beta[e], gamma[e])`` in bohr^(a+b+c+6).
    """
    alpha, beta, gamma = (np.atleast_1d(np.asarray(x, dtype=float)) for x in (alpha, beta, gamma))
    if max_power > MAX_POWER:
        raise InputError(f"integral power {max_power} exceeds the supported maximum {MAX_POWER}")
    size = max_power + 2
    A, B, C = alpha + beta, beta + gamma, gamma + alpha
    if np.any(A <= 0) or np.any(B <= 0) or np.any(C <= 0):
        raise InputError("integral exponents must satisfy α+β > 0, β+γ > 0 and γ+α > 0")
    P1 = _series_factor(1.0 / A, size)  # indices (l1, m1): powers of x, y
    P2 = _series_factor(1.0 / B, size)  # indices (m2, n1): powers of y, z
    P3 = _series_factor(1.0 / C, size)  # indices (n2, l2): powers of z, x
    E = A.shape[0]
    # Q[e, l1, m, n1] = sum_{m1} P1[e, l1, m1] P2[e, m - m1, n1]
    Q = np.zeros((E, size, size, size))
    for m in range(size):
        Q[:, :, m, :] = np.einsum("eam,emn->ean", P1[:, :, : m + 1], P2[:, m::-1, :])
    # c[e, l, m, n] = sum_{l1, n1} Q[e, l1, m, n1] P3[e, n - n1, l - l1]
    coeff = np.zeros((E, size, size, size))
    for l in range(size):
        for n in range(size):
            coeff[:, l, :, n] = np.einsum("eamb,eba->em", Q[:, : l + 1, :, : n + 1],
                                          P3[:, n::-1, l::-1])
    f = _factorials(size)
    weight = SIXTEEN_PI_SQUARED * f[:, None, None] * f[None, :, None] * f[None, None, :]
    return coeff * weight[None]


def integral(a: int, b: int, c: int, alpha, beta, gamma):
    """One integral ``I(a, b, c; α, β, γ)`` (vectorized over the exponents).

    Parameters
    ----------
    a, b, c : int
        Powers of ``r1``, ``r2``, ``r12``; each ``>= -1``.
    alpha, beta, gamma : float or array_like
        Exponents (bohr⁻¹).

    Returns
    -------
    float or ndarray
        The integral in bohr^(a+b+c+6).
    """
    for name, value in (("a", a), ("b", b), ("c", c)):
        if int(value) != value or value < -1:
            raise InputError(f"power '{name}' must be an integer >= -1, got {value!r}")
    scalar = np.ndim(alpha) == 0 and np.ndim(beta) == 0 and np.ndim(gamma) == 0
    alpha, beta, gamma = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (alpha, beta, gamma)))
    shape = alpha.shape
    table = integral_table(alpha.ravel(), beta.ravel(), gamma.ravel(), max(a, b, c))
    values = table[:, a + 1, b + 1, c + 1].reshape(shape)
    return float(values) if scalar else values
