r"""Radial moments of zero-power (exponential) S bases with the refined eigenvector, in
double-double arithmetic.

The float64 eigenvector of a large exponential basis is limited by the conditioning of the
overlap (for He 1¹S at N = 600 its energy is ~2e-9 Eh above the refined one), and the refined
vector of :func:`twoel.solver.refine.mixed_refine` cannot be used with float64 matrices: its norm
cancels completely.  Here the needed integrals
(the all-positive series of :mod:`twoel.integrals.series`) are evaluated in double-double
(:data:`twoel.integrals.numbers.DOUBLE_DOUBLE`, ~32 digits) and contracted with the refined vector in
double-double, giving ``⟨r1⟩, ⟨r1²⟩, ⟨1/r1⟩, ⟨r12⟩, ⟨r12²⟩, ⟨1/r12⟩`` and the virial ratio
to the accuracy of the refined wave function.
"""

from __future__ import annotations

import numpy as np

from twoel.errors import UnsupportedError
from twoel.integrals.doubledouble import DD, dd_dot, dd_sum
from twoel.integrals.numbers import DOUBLE_DOUBLE
from twoel.integrals.series import MasterSeries
from twoel.integrals.zero_power import columns, exponent_sums

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


def _block(bra, ket):
    """Double-double moment matrices (with 16π²) of bra rows × ket columns."""
    shape = (bra.shape[0], ket.shape[0])
    sums = exponent_sums(*columns(bra, ket, DD))
    A, B, C = (DD(np.broadcast_to(x.hi, shape).reshape(-1), np.broadcast_to(x.lo, shape).reshape(-1)) for x in sums)
    series = MasterSeries(A, B, C, DOUBLE_DOUBLE)
    integrals: dict = {}
    out = {}
    for name, terms in MOMENTS.items():
        acc = None
        for coefficient, abc in terms:
            if abc not in integrals:
                integrals[abc] = series.integral(*abc)
            term = integrals[abc] * DD(float(coefficient))
            acc = term if acc is None else acc + term
        out[name] = DD(acc.hi.reshape(shape), acc.lo.reshape(shape))
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
