r"""Radial moments of zero-power (exponential) S bases with the refined eigenvector, in
double-double arithmetic.

The float64 eigenvector of a large exponential basis is limited by the conditioning of the
overlap (for He 1¹S at N = 600 its energy is ~2e-9 Eh above the refined one), and the refined
vector of :func:`twoel.solver.refine.mixed_refine` cannot be used with float64 matrices: its norm
cancels completely.  Here the needed integrals

.. math:: I(a, b, c) = 16\pi^2 a'! b'! c'! \sum \binom{l_1+m_1}{l_1}\binom{m_2+n_1}{n_1}
          \binom{n_2+l_2}{l_2} A^{-(l_1+m_1+1)} B^{-(m_2+n_1+1)} C^{-(n_2+l_2+1)}

(the all-positive series of :mod:`twoel.integrals.pairs`) are evaluated in double-double
(:mod:`twoel.integrals.doubledouble`, ~32 digits) and contracted with the refined vector in
double-double, giving ``⟨r1⟩, ⟨r1²⟩, ⟨1/r1⟩, ⟨r12⟩, ⟨r12²⟩, ⟨1/r12⟩`` and the virial ratio
to the accuracy of the refined wave function.
"""

from __future__ import annotations

from math import comb, factorial, pi

import numpy as np

from twoel.errors import UnsupportedError
from twoel.integrals.doubledouble import DD, dd_dot, dd_sum, two_sum

#: (name, [(coefficient, (a, b, c))]) with the factor 1/2 of the per-electron average
MOMENTS = {
    "overlap": [(1, (0, 0, 0))],
    "r1": [(1, (1, 0, 0)), (1, (0, 1, 0))],
    "r1_squared": [(1, (2, 0, 0)), (1, (0, 2, 0))],
    "inv_r1": [(1, (-1, 0, 0)), (1, (0, -1, 0))],
    "r12": [(2, (0, 0, 1))],
    "r12_squared": [(2, (0, 0, 2))],
    "inv_r12": [(2, (0, 0, -1))],
}


def _sum4(x1, x2, y1, y2) -> DD:
    s1, e1 = two_sum(x1, x2)
    s2, e2 = two_sum(y1, y2)
    return DD(s1, e1) + DD(s2, e2)


def _series(a: int, b: int, c: int, inv) -> DD:
    """``I(a,b,c) / (16π²)`` in double-double (``inv`` caches reciprocal powers)."""
    ap, bp, cp = a + 1, b + 1, c + 1
    total = None
    for l1 in range(ap + 1):
        l2 = ap - l1
        for m1 in range(bp + 1):
            m2 = bp - m1
            for n1 in range(cp + 1):
                n2 = cp - n1
                weight = comb(l1 + m1, l1) * comb(m2 + n1, n1) * comb(n2 + l2, l2)
                term = inv("A", l1 + m1 + 1) * inv("B", m2 + n1 + 1) * inv("C", n2 + l2 + 1) * DD(float(weight))
                total = term if total is None else total + term
    return total * DD(float(factorial(ap) * factorial(bp) * factorial(cp)))


def _block(bra, ket):
    a1, b1, g1 = (bra[:, k][:, None] for k in range(3))
    a2, b2, g2 = (ket[:, k][None, :] for k in range(3))
    shape = (bra.shape[0], ket.shape[0])
    a1, b1, g1, a2, b2, g2 = (np.broadcast_to(x, shape) for x in (a1, b1, g1, a2, b2, g2))
    base = {"A": _sum4(a1, a2, b1, b2).reciprocal(), "B": _sum4(b1, b2, g1, g2).reciprocal(),
            "C": _sum4(g1, g2, a1, a2).reciprocal()}
    cache: dict = {}

    def inv(name, n):
        key = (name, n)
        if key not in cache:
            cache[key] = base[name] if n == 1 else inv(name, n - 1) * base[name]
        return cache[key]

    out = {}
    integrals: dict = {}
    for name, terms in MOMENTS.items():
        acc = None
        for coefficient, abc in terms:
            if abc not in integrals:
                integrals[abc] = _series(*abc, inv)
            term = integrals[abc] * DD(float(coefficient))
            acc = term if acc is None else acc + term
        out[name] = acc
    return out


def refined_moments(basis, vector: np.ndarray, block: int = 40) -> dict[str, float]:
    """Per-electron moments of ``Σ c_i (1 ± P12) e^{-α_i r1 - β_i r2 - γ_i r12}`` in double-double.

    Parameters
    ----------
    basis : CorrelatedBasis
        Zero powers, no contraction.
    vector : ndarray
        Coefficients (any normalization), e.g. the refined vector of
        :func:`twoel.solver.refine.mixed_refine`.
    """
    if np.any(basis.powers) or basis.contraction is not None:
        raise UnsupportedError("double-double moments need a zero-power, uncontracted basis")
    e = np.asarray(basis.exponents, dtype=float)
    swapped = e[:, [1, 0, 2]]
    c = np.asarray(vector, dtype=float)
    sign = float(basis.sign)
    totals: dict = {}
    N = e.shape[0]
    for start in range(0, N, block):
        stop = min(start + block, N)
        direct = _block(e[start:stop], e)
        exchange = _block(e[start:stop], swapped)
        for name in MOMENTS:
            M = direct[name] + exchange[name] * DD(sign)
            rows = dd_sum(M * DD(c[None, :]), axis=1)
            value = dd_dot(rows, DD(c[start:stop]))
            totals[name] = value if name not in totals else totals[name] + value
    norm = totals["overlap"]
    out = {}
    for name in MOMENTS:
        if name == "overlap":
            continue
        ratio = totals[name] * norm.reciprocal()
        out[name] = 0.5 * float(ratio.hi + ratio.lo)
    return out
