r"""Zero-power Hamiltonian matrices beyond float64: double-double arrays and exact fixed point.

Both paths evaluate the *same* generated closed forms as the float64 builder
(:mod:`twoel.integrals.generated.zero_power_kernels`: polynomials with integer coefficients in
``a, b, c = 1/A, 1/B, 1/C``), only with other number types:

``double-double``  NumPy :class:`~twoel.integrals.doubledouble.DD` arrays (~32 digits), used by the
                   default mixed-precision refinement; a few times the float64 cost.
``fixed point``    Python integers in NumPy object arrays.  The float64 exponents are exact binary
                   fractions, so the pair sums ``A, B, C`` are exact integers at scale ``2^Q``;
                   ``1/A`` is rounded once to ``P`` bits and everything after is exact integer
                   arithmetic.  The matrices are then handed to python-flint ``arb_mat``
                   (Johansson, IEEE Trans. Comput. 66, 1281 (2017)) at the working precision.

All values carry the factor 16π²; matrices are ``<φ_p|O|(1 ± P12) φ_q>`` like
:func:`twoel.basis.correlated.primitive_operator_matrices` with
``O`` = overlap, kinetic, nuclear (``1/r1 + 1/r2``, unit charge) and repulsion (``1/r12``).

Bases of total ``L >= 1`` (:class:`twoel.basis.angular.AngularBasis` with zero powers) take the
same three paths with the generated pieces of
:mod:`twoel.integrals.generated.angular_zero_power` (one polynomial set per bra/ket channel
pair, :func:`twoel.integrals.symbolic_states.zero_power_angular_pieces`); every function here
accepts ``L`` and the channel ``electron1_l`` of each primitive (:func:`angular_arguments`).
"""

from __future__ import annotations

import math

import numpy as np

from twoel.integrals.doubledouble import DD
from twoel.integrals.generated import angular_zero_power as _angular
from twoel.integrals.generated import zero_power_kernels as _exponential
from twoel.integrals.numbers import DOUBLE_DOUBLE
from twoel.integrals.zero_power import columns, exponent_sums, kinetic_numerator

NAMES = ("overlap", "kinetic", "nuclear", "repulsion")


# ---------------------------------------------------------------------------------------------
# double-double
# ---------------------------------------------------------------------------------------------

def _dd_block(bra: np.ndarray, ket: np.ndarray):
    """Double-double overlap, kinetic, nuclear, repulsion for bra rows × ket columns (÷16π²)."""
    first, second = columns(bra, ket, DD)
    A, B, C = exponent_sums(first, second)
    ov, nu, re, k1, k2 = _exponential.zero_power_integrals(A.reciprocal(), B.reciprocal(), C.reciprocal())
    kinetic = kinetic_numerator(first, second, ov, k1, k2) * DD(0.25)
    return {"overlap": ov, "kinetic": kinetic, "nuclear": nu, "repulsion": re}


def angular_arguments(basis) -> dict:
    """``{"L": ..., "electron1_l": ...}`` of a basis of ``L >= 1`` (empty for S bases): the
    keyword arguments of the functions of this module."""
    L = int(getattr(basis, "angular_momentum", 0))
    if L == 0:
        return {}
    return {"L": L, "electron1_l": np.asarray(basis.electron1_l, dtype=np.int64)}


def _channels(L: int, electron1_l, N: int) -> np.ndarray:
    if L == 0:
        return np.zeros(N, dtype=np.int64)
    if not 1 <= L <= _angular.MAX_L:
        raise ValueError(f"no zero-power pieces for L = {L}")
    l1 = np.full(N, L, dtype=np.int64) if electron1_l is None else np.asarray(electron1_l, dtype=np.int64)
    if l1.shape != (N,) or np.any(l1 < 0) or np.any(l1 > L):
        raise ValueError("electron1_l needs one channel 0..L per primitive")
    return l1


def _exponent_monomial(exps, powers, one):
    """``Π exps[k]^powers[k]`` (``one`` when every power is zero)."""
    value = None
    for x, n in zip(exps, powers):
        for _ in range(n):
            value = x if value is None else value * x
    return one if value is None else value


def _dd_angular_block(key, bra: np.ndarray, ket: np.ndarray):
    """Double-double overlap, kinetic, nuclear, repulsion (÷16π²) of an ``L >= 1`` channel pair."""
    first, second = columns(bra, ket, DD)
    A, B, C = exponent_sums(first, second)
    function, _fixed = _angular.PIECES[key]
    pieces = function(A.reciprocal(), B.reciprocal(), C.reciprocal())
    exps = first + second
    kinetic = None
    for monomial, piece in zip(_angular.MONOMIALS[key], pieces[3:]):
        term = piece if not any(monomial) else _exponent_monomial(exps, monomial, None) * piece
        kinetic = term if kinetic is None else kinetic + term
    inverse = DD(float(_angular.DENOMINATORS[key])).reciprocal()
    return {"overlap": pieces[0] * inverse, "nuclear": pieces[1] * inverse,
            "repulsion": pieces[2] * inverse, "kinetic": kinetic * inverse}


def _dd_values(L: int, l1: np.ndarray, sign: int, exponents, swapped, rows, cols) -> dict[str, DD]:
    """``<φ_rows|O|(1 ± P12) φ_cols>`` (÷16π²) on the grid ``rows × cols`` (index arrays)."""
    if L == 0:
        direct = _dd_block(exponents[rows], exponents[cols])
        exchange = _dd_block(exponents[rows], swapped[cols])
        return {name: direct[name] + exchange[name] * sign for name in NAMES}
    hi = {name: np.zeros((rows.size, cols.size)) for name in NAMES}
    lo = {name: np.zeros((rows.size, cols.size)) for name in NAMES}
    for la in np.unique(l1[rows]):
        r = np.nonzero(l1[rows] == la)[0]
        for lb in np.unique(l1[cols]):
            c = np.nonzero(l1[cols] == lb)[0]
            direct = _dd_angular_block((L, int(la), int(lb)), exponents[rows[r]], exponents[cols[c]])
            exchange = _dd_angular_block((L, int(la), L - int(lb)), exponents[rows[r]], swapped[cols[c]])
            grid = np.ix_(r, c)
            for name in NAMES:
                value = direct[name] + exchange[name] * sign
                hi[name][grid], lo[name][grid] = value.hi, value.lo
    return {name: DD(hi[name], lo[name]) for name in NAMES}


def dd_matrices(exponents: np.ndarray, sign: int, block: int | None = None, L: int = 0,
                electron1_l=None) -> dict[str, DD]:
    """Double-double primitive matrices (full, symmetric) of a zero-power basis.

    Parameters
    ----------
    exponents : ndarray, shape (N, 3)
        ``(α, β, γ)`` in bohr⁻¹.
    sign : int
        Exchange sign (+1 singlet, -1 triplet).
    block : int, optional
        Bra rows per block.
    L : int
        Total angular momentum (0: S primitives).
    electron1_l : array_like of int, shape (N,), optional
        Channel ``l`` of electron 1 per primitive (``L >= 1``; default ``L`` for all).

    Returns
    -------
    dict of :class:`DD`, each ``(N, N)``, including the factor 16π² (as a double-double).
    """
    exponents = np.asarray(exponents, dtype=float)
    N = exponents.shape[0]
    l1 = _channels(L, electron1_l, N)
    if block is None:  # ~16k pairs per block: temporaries stay in cache (measured optimum)
        block = max(16, 16384 // max(N, 1))
    swapped = exponents[:, [1, 0, 2]]
    hi = {name: np.zeros((N, N)) for name in NAMES}
    lo = {name: np.zeros((N, N)) for name in NAMES}
    for start in range(0, N, block):
        stop = min(start + block, N)
        values = _dd_values(L, l1, sign, exponents, swapped, np.arange(start, stop), np.arange(start, N))
        for name in NAMES:
            hi[name][start:stop, start:] = values[name].hi
            lo[name][start:stop, start:] = values[name].lo
    factor = DOUBLE_DOUBLE.sixteen_pi_squared()
    lower = np.tril_indices(N, -1)
    out = {}
    for name in NAMES:
        h, l = hi[name], lo[name]
        h[lower] = h.T[lower]
        l[lower] = l.T[lower]
        out[name] = DD(h, l) * factor
    return out


def dd_hamiltonian(matrices: dict[str, DD], Z: float) -> DD:
    """``T - Z·V_nuc + V_ee`` in double-double (``Z`` taken as exact)."""
    return matrices["kinetic"] - matrices["nuclear"] * DD(float(Z)) + matrices["repulsion"]


# ---------------------------------------------------------------------------------------------
# fixed point (exact integers) -> arb
# ---------------------------------------------------------------------------------------------

def _exact_scale(exponents: np.ndarray) -> int:
    """Smallest ``Q`` with every exponent an integer multiple of ``2^-Q`` (exact)."""
    q = 0
    for value in np.unique(exponents.ravel()):
        if value == 0:
            continue
        _mantissa, exponent = math.frexp(float(value))
        q = max(q, 53 - exponent)
    return q


def fixed_point_entries(exponents: np.ndarray, sign: int, bits: int, rows, cols, L: int = 0,
                        electron1_l=None):
    """Fixed-point integers of the entries ``(rows[n], cols[n])`` of the zero-power matrices.

    Parameters
    ----------
    exponents : ndarray, shape (N, 3)
    sign : int
    bits : int
        Relative precision wanted for every entry (bits).
    rows, cols : array_like of int
        The entries wanted.
    L, electron1_l
        Total angular momentum and channels, as for :func:`dd_matrices`.

    Returns
    -------
    (dict name -> object array of int, P) with ``entry / (16π²) = int · 2^-P``.

    Notes
    -----
    The exponents are exact integers at scale ``2^Q``; ``1/A`` is rounded once to ``P`` fraction
    bits and each product is truncated back to ``P`` bits (``((x*y) >> P)``, generated by
    :func:`twoel.integrals.symbolic.zero_power_source`).  ``P`` exceeds ``bits`` by enough to
    cover the smallest entries (``~A_max^-6``) and the truncations (a few units of ``2^-P``).
    """
    exponents = np.asarray(exponents, dtype=float)
    N = exponents.shape[0]
    Q = _exact_scale(exponents)
    E = np.empty((N, 3), dtype=object)
    for i in range(N):
        for k in range(3):
            E[i, k] = int(math.ldexp(float(exponents[i, k]), Q))
    largest = max(2.0 * float(np.max(exponents[:, :2].sum(axis=1))),
                  2.0 * float(np.max(exponents[:, 1:].sum(axis=1))), 1.0)
    P = int(bits) + (7 + 2 * int(L)) * int(math.ceil(math.log2(largest))) + 16
    rows, cols = np.asarray(rows), np.asarray(cols)
    if L:
        return _fixed_angular_entries(E, Q, P, _channels(L, electron1_l, N), L, sign, rows, cols), P
    total = {}
    one = 1 << (P + Q)
    for exchanged, weight in ((False, 1), (True, sign)):
        ket = E[:, [1, 0, 2]] if exchanged else E
        first = (E[rows, 0], E[rows, 1], E[rows, 2])
        second = (ket[cols, 0], ket[cols, 1], ket[cols, 2])
        A, B, C = exponent_sums(first, second)
        ov, nu, re, k1, k2 = _exponential.zero_power_integrals_fixed(one // A, one // B, one // C, P)
        kinetic = kinetic_numerator(first, second, ov, k1, k2) >> (2 * Q + 2)
        values = {"overlap": ov, "nuclear": nu, "repulsion": re, "kinetic": kinetic}
        for name, value in values.items():
            total[name] = value * weight if name not in total else total[name] + value * weight
    return total, P


def _fixed_angular_entries(E, Q: int, P: int, l1, L: int, sign: int, rows, cols) -> dict:
    """Fixed-point entries (``· 2^-P``, ÷16π²) of an ``L >= 1`` basis (see :func:`fixed_point_entries`).

    The pieces come at scale ``2^P`` times ``D``; a kinetic monomial of degree ``d`` in the
    exponents (integers at ``2^Q``) is lifted to ``2^{2Q}``, and the sum divided by ``2^{2Q} D``.
    """
    total = {name: np.zeros(rows.size, dtype=object) for name in NAMES}
    one = 1 << (P + Q)
    for exchanged, weight in ((False, 1), (True, sign)):
        ket = E[:, [1, 0, 2]] if exchanged else E
        ket_l = (L - l1) if exchanged else l1
        codes = l1[rows] * (L + 1) + ket_l[cols]
        for code in np.unique(codes):
            sel = np.nonzero(codes == code)[0]
            key = (L, int(code) // (L + 1), int(code) % (L + 1))
            first = tuple(E[rows[sel], k] for k in range(3))
            second = tuple(ket[cols[sel], k] for k in range(3))
            A, B, C = exponent_sums(first, second)
            _function, fixed = _angular.PIECES[key]
            pieces = fixed(one // A, one // B, one // C, P)
            D = _angular.DENOMINATORS[key]
            kinetic = 0
            for monomial, piece in zip(_angular.MONOMIALS[key], pieces[3:]):
                lift = Q * (2 - sum(monomial))
                kinetic = kinetic + (_exponent_monomial(first + second, monomial, 1) << lift) * piece
            values = {"overlap": pieces[0] // D, "nuclear": pieces[1] // D, "repulsion": pieces[2] // D,
                      "kinetic": (kinetic >> (2 * Q)) // D}
            for name, value in values.items():
                total[name][sel] += value * weight
    return total


def fixed_point_matrices(exponents: np.ndarray, sign: int, bits: int, L: int = 0, electron1_l=None):
    """Fixed-point integer matrices of a zero-power basis (every entry of
    :func:`fixed_point_entries`).

    Returns
    -------
    (dict name -> list of lists of int, P) with ``entry / (16π²) = int · 2^-P``.
    """
    N = np.asarray(exponents).shape[0]
    rows, cols = np.triu_indices(N)
    total, P = fixed_point_entries(exponents, sign, bits, rows, cols, L, electron1_l)
    out = {}
    for name in NAMES:
        full = np.empty((N, N), dtype=object)
        full[rows, cols] = total[name]
        full[cols, rows] = total[name]
        out[name] = full.tolist()
    return out, P


def arb_matrices(exponents: np.ndarray, sign: int, bits: int, L: int = 0, electron1_l=None) -> dict:
    """``flint.arb_mat`` matrices (including 16π²) at the current ``flint.ctx.prec``."""
    from flint import arb, arb_mat, fmpz_mat

    fixed, scale = fixed_point_matrices(exponents, sign, bits, L, electron1_l)
    factor = 16 * arb.pi() ** 2 * arb(2) ** (-scale)
    return {name: arb_mat(fmpz_mat(rows)) * factor for name, rows in fixed.items()}
