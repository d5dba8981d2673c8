r"""Correlated integrals with one inverse-square power, and a generic pair-matrix evaluator.

The core tables (:func:`twoel.integrals.kernels.integral_table`) give

.. math:: I(a, b, c; \alpha, \beta, \gamma) = \int\!\!\int r_1^a r_2^b r_{12}^c
          e^{-\alpha r_1 - \beta r_2 - \gamma r_{12}} d^3r_1 d^3r_2

for ``a, b, c >= -1``.  The relativistic and QED operators also need one power ``-2``
(``1/r1²`` in ``(E - V)²``, ``V/r1`` in the regularized Dirac delta, ...).  Integrating over
the exponent, ``I(a-1) = ∫_α^∞ I(a) dα'``, and writing

.. math:: \int_\alpha^\infty \frac{d\alpha'}{(\alpha'+\beta)(\alpha'+\gamma)}
          = \int_0^1 \frac{dt}{\alpha + (1-t)\beta + t\gamma}

gives ``I(-2, -1, -1) = 16π² ∫_0^1 dt / ((β+γ) D(t))`` with ``D = α + (1-t)β + tγ``.  Its
derivatives ``(-∂β)^(b+1) (-∂γ)^(c+1)`` are sums of positive terms (no cancellation), and the
remaining smooth ``t`` integral is done by Gauss–Legendre quadrature.  The other positions of the
``-2`` follow from the permutation symmetry of the master integral,
``I(a, b, c; α, β, γ) = I(b, a, c; β, α, γ) = I(c, b, a; γ, β, α)``.

:func:`pair_matrix` evaluates any operator written as a list of
``((p, q, s), coefficient(bra, ket))`` integrand monomials (the form produced by the SymPy
derivations in :mod:`twoel.integrals.symbolic_states`) between all primitive pairs of a
:class:`twoel.matrices.CorrelatedBasis`, including the exchanged ket.
"""

from __future__ import annotations

from functools import lru_cache
from math import comb, factorial, pi

import numpy as np

from ..errors import InputError, UnsupportedError
from ..integrals.kernels import MAX_POWER, integral_table

#: Gauss–Legendre nodes of the t integral (checked against mpmath in the tests)
T_NODES = 96
_SIXTEEN_PI2 = 16.0 * pi * pi


@lru_cache(maxsize=None)
def _gauss(n: int):
    t, w = np.polynomial.legendre.leggauss(n)
    return 0.5 * (t + 1.0), 0.5 * w


@lru_cache(maxsize=None)
def _binom(size: int) -> np.ndarray:
    return np.array([[comb(i + j, i) for j in range(size)] for i in range(size)], dtype=float)


def inverse_square_table(alpha, beta, gamma, max_power: int) -> np.ndarray:
    """``I(-2, b, c; α, β, γ)`` for ``-1 <= b, c <= max_power``.

    Parameters
    ----------
    alpha, beta, gamma : array_like, shape (E,)
        Exponents (bohr⁻¹); ``α + β > 0``, ``α + γ > 0``, ``β + γ > 0``.
    max_power : int

    Returns
    -------
    ndarray, shape (E, L, L), ``L = max_power + 2``
        ``table[e, b + 1, c + 1]`` in bohr^(b+c+4).
    """
    alpha, beta, gamma = (np.atleast_1d(np.asarray(x, dtype=float)) for x in (alpha, beta, gamma))
    if max_power > MAX_POWER:
        raise InputError(f"integral power {max_power} exceeds the supported maximum {MAX_POWER}")
    L = max_power + 2
    S = beta + gamma
    if np.any(S <= 0) or np.any(alpha + beta <= 0) or np.any(alpha + gamma <= 0):
        raise InputError("integral exponents must satisfy α+β > 0, β+γ > 0 and γ+α > 0")
    E = alpha.shape[0]
    binom = _binom(L)
    # H[e, p, q] = C(p+q, p) / S^(p+q+1): series of 1/(S - x - y)
    k = np.arange(2 * L - 1)
    invS = 1.0 / S[:, None] ** (k[None, :] + 1)
    idx = np.add.outer(np.arange(L), np.arange(L))
    H = binom[None] * invS[:, idx]
    # G[e, m, n] = ∫ C(m+n, m) (1-t)^m t^n / D^(m+n+1) dt: series of 1/(D - x(1-t) - y t)
    t, w = _gauss(T_NODES)
    D = alpha[:, None] + (1.0 - t)[None, :] * beta[:, None] + t[None, :] * gamma[:, None]  # (E, Q)
    invD = 1.0 / D
    pow_1mt = (1.0 - t)[None, :] ** np.arange(L)[:, None]  # (L, Q)
    pow_t = t[None, :] ** np.arange(L)[:, None]
    invD_pow = invD[:, None, :] ** (k[None, :, None] + 1)  # (E, 2L-1, Q)
    G = np.empty((E, L, L))
    for m in range(L):
        # sum over nodes of w (1-t)^m t^n / D^(m+n+1)
        G[:, m, :] = np.einsum("q,q,nq,enq->en", w, pow_1mt[m], pow_t, invD_pow[:, m:m + L, :])
    G *= binom[None]
    # table[m, n] = m! n! Σ_{p<=m, q<=n} H[p, q] G[m-p, n-q] (Leibniz rule)
    out = np.zeros((E, L, L))
    for p in range(L):
        for q in range(L):
            out[:, p:, q:] += H[:, p, q, None, None] * G[:, : L - p, : L - q]
    f = np.array([float(factorial(i)) for i in range(L)])
    return _SIXTEEN_PI2 * out * f[None, :, None] * f[None, None, :]


class IntegralTables:
    """All ``I(a, b, c)`` needed for a set of exponent sums, with at most one power ``-2``."""

    def __init__(self, exps: np.ndarray, max_power: int, need_inverse_square: bool):
        a, b, g = exps[:, 0], exps[:, 1], exps[:, 2]
        self.max_power = max_power
        self.regular = integral_table(a, b, g, max_power)
        self.need_inverse_square = need_inverse_square
        if need_inverse_square:
            self.sq1 = inverse_square_table(a, b, g, max_power)  # I(-2, b, c; α, β, γ)
            self.sq2 = inverse_square_table(b, a, g, max_power)  # I(a, -2, c) = I(-2, a, c; β, α, γ)
            self.sq3 = inverse_square_table(g, b, a, max_power)  # I(a, b, -2) = I(-2, b, a; γ, β, α)

    def lookup(self, local: np.ndarray, pa: np.ndarray, pb: np.ndarray, pc: np.ndarray,
               coefficient: np.ndarray, name: str) -> np.ndarray:
        """``coefficient · I(pa, pb, pc)`` for each pair; terms with zero coefficient are skipped."""
        out = np.zeros(local.shape[0])
        nonzero = coefficient != 0
        if not np.any(nonzero):
            return out
        low = np.minimum(np.minimum(pa, pb), pc)
        n_square = (pa == -2).astype(int) + (pb == -2) + (pc == -2)
        bad = nonzero & ((low < -2) | (n_square > 1))
        if np.any(bad):
            raise UnsupportedError(f"operator {name!r} needs an integral with two inverse-square "
                                   "powers or a power below -2 for this basis")
        if np.any(np.maximum(np.maximum(pa, pb), pc)[nonzero] > self.max_power):
            raise ArithmeticError("integral table too small")  # pragma: no cover - guard
        regular = nonzero & (low >= -1)
        if np.any(regular):
            out[regular] = coefficient[regular] * self.regular[local[regular], pa[regular] + 1,
                                                               pb[regular] + 1, pc[regular] + 1]
        if np.any(nonzero & (low == -2)):
            if not self.need_inverse_square:
                raise ArithmeticError("inverse-square tables not prepared")  # pragma: no cover
            for mask, table, i, j in ((pa == -2, self.sq1, pb, pc), (pb == -2, self.sq2, pa, pc),
                                      (pc == -2, self.sq3, pb, pa)):
                sel = nonzero & mask
                if np.any(sel):
                    out[sel] = coefficient[sel] * table[local[sel], i[sel] + 1, j[sel] + 1]
        return out


#: primitive pairs evaluated per block (bounds memory of the integral tables)
_PAIR_BLOCK = 30_000


def pair_matrices(basis, operators: dict) -> dict[str, np.ndarray]:
    """Primitive-pair matrices ``Σ_terms ∫ coefficient · r1^p r2^q r12^s χ_p (1 ± P12) χ_q``.

    Parameters
    ----------
    basis : twoel.matrices.CorrelatedBasis
    operators : dict
        Name to either a callable ``terms(i1, j1, k1, a1, b1, g1, i2, j2, k2, a2, b2, g2)``
        returning ``[((p, q, s), coefficient), ...]`` (coefficients may be arrays over pairs), or
        a fixed list ``[((p, q, s), number), ...]`` for multiplicative operators.

    Returns
    -------
    dict of ndarray, shape (P, P)
        Unsymmetrized primitive matrices (contract and symmetrize with :func:`contract`).
    """
    P = basis.n_primitives
    result = {name: np.zeros((P, P)) for name in operators}
    bra_p, bra_e = basis.powers, basis.exponents
    zeros = [np.zeros(1) for _ in range(12)]
    shifts = np.array([s for spec in operators.values()
                       for s, _c in (spec(*zeros) if callable(spec) else spec)]).reshape(-1, 3)
    for exchanged, weight in ((False, 1.0), (True, float(basis.sign))):
        ket_p = bra_p[:, [1, 0, 2]] if exchanged else bra_p
        ket_e = bra_e[:, [1, 0, 2]] if exchanged else bra_e
        bra_u, bra_i = np.unique(bra_e, axis=0, return_inverse=True)
        ket_u, ket_i = np.unique(ket_e, axis=0, return_inverse=True)
        unique_e = (bra_u[:, None, :] + ket_u[None, :, :]).reshape(-1, 3)
        inverse = (bra_i.reshape(-1)[:, None] * ket_u.shape[0] + ket_i.reshape(-1)[None, :]).ravel()
        order = np.argsort(inverse, kind="stable")
        rows_all, cols_all = np.divmod(order, P)
        keys = inverse[order]
        total = bra_p[:, None, :] + ket_p[None, :, :]
        max_power = int(total.max() + max(0, shifts.max()))
        need_sq = bool(shifts.min() <= -2)
        size = max_power + 2
        block = max(1, _PAIR_BLOCK // (size**3))
        for start in range(0, unique_e.shape[0], block):
            stop = min(start + block, unique_e.shape[0])
            tables = IntegralTables(unique_e[start:stop], max_power, need_sq)
            lo, hi = np.searchsorted(keys, [start, stop])
            rows, cols = rows_all[lo:hi], cols_all[lo:hi]
            local = keys[lo:hi] - start
            pw = total[rows, cols]
            bp, be, kp, ke = bra_p[rows], bra_e[rows], ket_p[cols], ket_e[cols]
            args = (bp[:, 0], bp[:, 1], bp[:, 2], be[:, 0], be[:, 1], be[:, 2],
                    kp[:, 0], kp[:, 1], kp[:, 2], ke[:, 0], ke[:, 1], ke[:, 2])
            for name, spec in operators.items():
                listed = spec(*args) if callable(spec) else spec
                acc = np.zeros(rows.shape[0])
                for shift, coefficient in listed:
                    coefficient = np.broadcast_to(np.asarray(coefficient, dtype=float), acc.shape)
                    acc += tables.lookup(local, pw[:, 0] + shift[0], pw[:, 1] + shift[1],
                                         pw[:, 2] + shift[2], coefficient, name)
                result[name][rows, cols] += weight * acc
    return result


def pair_matrix(basis, terms, name: str = "operator") -> np.ndarray:
    """One primitive-pair matrix (see :func:`pair_matrices`)."""
    return pair_matrices(basis, {name: terms})[name]


def contract(matrix: np.ndarray, contraction) -> np.ndarray:
    """Contract a primitive matrix with the basis contraction and symmetrize it."""
    out = matrix if contraction is None else contraction.T @ matrix @ contraction
    return 0.5 * (out + out.T)


def basis_matrix(basis, terms, name: str = "operator") -> np.ndarray:
    """Contracted, symmetrized matrix of an operator given as integrand terms (see :func:`pair_matrix`)."""
    return contract(pair_matrix(basis, terms, name), basis.contraction)


def basis_matrices(basis, operators: dict) -> dict[str, np.ndarray]:
    """Contracted, symmetrized matrices of several operators (tables built once)."""
    return {name: contract(m, basis.contraction) for name, m in pair_matrices(basis, operators).items()}
