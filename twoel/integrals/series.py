r"""The master-integral series, written once for every number type and every caller.

.. math::

    I(a, b, c; \alpha, \beta, \gamma) = \int\!\!\int r_1^{a} r_2^{b} r_{12}^{c}
        e^{-\alpha r_1 - \beta r_2 - \gamma r_{12}}\, d^3r_1\, d^3r_2

for integers ``a, b, c >= -1`` (and one index ``-2``, below) follows from the master integral
``I(-1,-1,-1) = 16π²/(ABC)``, ``A = α+β``, ``B = β+γ``, ``C = γ+α``
(:func:`twoel.integrals.symbolic.master_integral` derives it with perimetric coordinates) by
differentiation: ``I(a,b,c) = (-∂_α)^{a'} (-∂_β)^{b'} (-∂_γ)^{c'} I(-1,-1,-1)``, ``a' = a+1``.
``-∂_α`` acts on ``A`` and ``C``, ``-∂_β`` on ``A`` and ``B``, ``-∂_γ`` on ``B`` and ``C``, so
the derivatives are ``a'! b'! c'!`` times the Taylor coefficients of
``1/((A-x-y)(B-y-z)(C-z-x))``.  Each factor is a geometric series in two variables,

.. math:: \frac{1}{X-u-v} = \sum_{p,q} F_X[p, q]\, u^p v^q,\qquad
          F_X[p, q] = \binom{p+q}{p} X^{-(p+q+1)},

and the coefficient of ``x^{a'} y^{b'} z^{c'}`` is the two-step convolution

.. math:: Q_m[l_1, n_1] = \sum_{m_1 \le m} F_A[l_1, m_1]\, F_B[m - m_1, n_1],\qquad
          c[l, m, n] = \sum_{l_1 \le l,\, n_1 \le n} Q_m[l_1, n_1]\, F_C[n - n_1, l - l_1].

Every term is positive: there is no cancellation, and each value is accurate to a few units of
the working precision.  :class:`MasterSeries` evaluates this once, for one target
``(a, b, c)`` (pair bases, many exponent sums) or a whole table (Hylleraas bases, few sums),
with any :mod:`twoel.integrals.numbers` type (float64, double-double, mpmath).

One index ``-2`` (``⟨1/r1²⟩``, ``(E - V)²``, the global-operator δ forms):
``I(-2,b,c; α) = ∫_α^∞ I(-1,b,c; α') dα'``, so the ``A`` and ``C`` factors become
``K(p, q) = ∫_0^∞ (A+t)^{-p} (C+t)^{-q} dt`` (:class:`KValues`, float64) and

.. math:: I(-2, b, c) = 16\pi^2\, b'!\, c'! \sum_{m_1 \le b',\, n_1 \le c'}
          F_B[b' - m_1, n_1]\, K(m_1 + 1, c' - n_1 + 1).
"""

from __future__ import annotations

from functools import lru_cache
from math import comb, factorial

import numpy as np

from twoel.errors import InputError
from twoel.integrals.numbers import FLOAT64, NumberType

#: largest power handled (table side); factorials stay far from float64 overflow
MAX_POWER = 60
#: Gauss–Legendre order of K(p, q) for exponent-sum ratios below RECURSION_RATIO
QUADRATURE_ORDER = 32
#: from this ratio max(A, C)/min(A, C) on, K(p, q) comes from the exact recursion
RECURSION_RATIO = 10.0


@lru_cache(maxsize=None)
def _binomials(size: int) -> np.ndarray:
    """``binom(p + q, p)`` for ``p, q < size`` (exact integers, object array)."""
    return np.array([[comb(p + q, p) for q in range(size)] for p in range(size)], dtype=object)


@lru_cache(maxsize=None)
def _float_binomials(size: int) -> np.ndarray:
    return _binomials(size).astype(float)


def _table_weight(size: int, number: NumberType):
    """``16π² l! m! n!`` for ``l, m, n < size`` in the number type."""
    f = np.array([factorial(k) for k in range(size)], dtype=object)
    return number.factorial_weight(f[:, None, None], f[None, :, None], f[None, None, :])


@lru_cache(maxsize=None)
def _float_table_weight(size: int) -> np.ndarray:
    return _table_weight(size, FLOAT64)


def check_exponents(A, B, C) -> None:
    """Raise :class:`InputError` unless the exponent sums are positive (the integral converges)."""
    if np.any(np.asarray(A) <= 0) or np.any(np.asarray(B) <= 0) or np.any(np.asarray(C) <= 0):
        raise InputError("integral exponents must satisfy α+β > 0, β+γ > 0 and γ+α > 0")


class MasterSeries:
    r"""``I(a, b, c)`` for a fixed set of exponent sums ``A, B, C`` (flat arrays, one per entry).

    Parameters
    ----------
    A, B, C : array of the number type, shape (E,)
        ``α+β``, ``β+γ``, ``γ+α`` (bohr⁻¹), all positive.
    number : NumberType
        The arithmetic (:data:`twoel.integrals.numbers.FLOAT64` by default).

    The two convolutions of the module docstring are evaluated in one of two ways, chosen by
    what is asked for:

    * :meth:`table` (all targets, few entries: Hylleraas bases) contracts whole factor
      tensors ``F_X[e, p, q]`` with the number type's ``einsum``;
    * :meth:`integral` (one target at a time, many entries: pair series) works on rows: each
      factor ``F_X[p, q]``, each partial sum ``Q_m[l1, n1]`` and each coefficient is one
      contiguous array over the entries, computed when first needed and cached, so targets
      share their work and no unused term is formed.
    """

    def __init__(self, A, B, C, number: NumberType = FLOAT64):
        self.number = number
        self._sums = {"A": A, "B": B, "C": C}
        self._inverse: dict = {}
        self._rows: dict = {}
        self._partial_rows: dict = {}
        self._tensors: dict = {}

    # -- the factors -------------------------------------------------------------------------

    def _inverse_power(self, name: str, k: int):
        """``X^{-k}`` (``k >= 1``), by repeated multiplication, cached."""
        powers = self._inverse.setdefault(name, [self.number.reciprocal(self._sums[name])])
        while len(powers) < k:
            powers.append(powers[-1] * powers[0])
        return powers[k - 1]

    def factor_row(self, name: str, p: int, q: int):
        """``F_X[p, q] = binom(p+q, p) X^{-(p+q+1)}`` over the entries (one multiplication per
        distinct weight; a weight of 1 is free)."""
        weight = comb(p + q, p)
        key = (name, p + q, weight)
        if key not in self._rows:
            power = self._inverse_power(name, p + q + 1)
            self._rows[key] = power if weight == 1 else power * self.number.integers(np.array(weight, dtype=object))
        return self._rows[key]

    def factor(self, name: str, size: int):
        """The tensor ``F_X[e, p, q]`` for ``p, q < size`` (shape ``(E, size, size)``)."""
        cached = self._tensors.get(name)
        if cached is None or cached[0] < size:
            number = self.number
            if number is FLOAT64:  # vectorized: gather the powers, times the binomial table
                powers = np.stack([self._inverse_power(name, k) for k in range(1, 2 * size)], axis=-1)
                index = np.add.outer(np.arange(size), np.arange(size))
                tensor = powers[:, index] * _float_binomials(size)[None]
            else:
                rows = [self.factor_row(name, p, q) for p in range(size) for q in range(size)]
                tensor = number.stack(rows, axis=-1).reshape((-1, size, size))
            cached = self._tensors[name] = (size, tensor)
        return cached[1]

    # -- one target: rows ----------------------------------------------------------------------

    def partial_row(self, m: int, l1: int, n1: int):
        """``Q_m[l1, n1] = Σ_{m1 <= m} F_A[l1, m1] F_B[m - m1, n1]`` over the entries."""
        key = (m, l1, n1)
        if key not in self._partial_rows:
            total = None
            for m1 in range(m + 1):
                term = self.factor_row("A", l1, m1) * self.factor_row("B", m - m1, n1)
                total = term if total is None else total + term
            self._partial_rows[key] = total
        return self._partial_rows[key]

    def coefficient(self, l: int, m: int, n: int):
        """``c[l, m, n] = Σ_{l1 <= l, n1 <= n} Q_m[l1, n1] F_C[n - n1, l - l1]`` over the entries
        (the integral divided by ``16π² l! m! n!``)."""
        total = None
        for l1 in range(l + 1):
            for n1 in range(n + 1):
                term = self.partial_row(m, l1, n1) * self.factor_row("C", n - n1, l - l1)
                total = term if total is None else total + term
        return total

    # -- all targets: tensors ------------------------------------------------------------------

    def coefficient_table(self, size: int):
        """``c[e, l, m, n]`` for all ``l, m, n < size``, shape ``(E, size, size, size)``."""
        number = self.number
        FA, FB, FC = (self.factor(name, size) for name in "ABC")
        partial = [number.einsum("eam,emn->ean", FA[:, :, : m + 1], FB[:, m::-1, :]) for m in range(size)]
        Q = number.stack(partial, axis=2)  # (E, l1, m, n1)
        planes = []
        for l in range(size):
            rows = [number.einsum("eamb,eba->em", Q[:, : l + 1, :, : n + 1], FC[:, n::-1, l::-1])
                    for n in range(size)]
            planes.append(number.stack(rows, axis=-1))
        return number.stack(planes, axis=1)

    def integral(self, a: int, b: int, c: int):
        """``I(a, b, c)`` for every entry (``a, b, c >= -1``), in bohr^(a+b+c+6)."""
        weight = self.number.factorial_weight(factorial(a + 1), factorial(b + 1), factorial(c + 1))
        return self.coefficient(a + 1, b + 1, c + 1) * weight

    def table(self, max_power: int):
        """All ``I(a, b, c)``, ``-1 <= a, b, c <= max_power``: ``table[e, a+1, b+1, c+1]``."""
        size = max_power + 2
        weight = _float_table_weight(size) if self.number is FLOAT64 else _table_weight(size, self.number)
        return self.coefficient_table(size) * weight[None]


def integral_table(alpha, beta, gamma, max_power: int, number: NumberType = FLOAT64):
    """All integrals ``I(a, b, c)`` for ``-1 <= a, b, c <= max_power`` at once.

    Parameters
    ----------
    alpha, beta, gamma : array_like, shape (E,)
        Exponents (bohr⁻¹) of ``r1``, ``r2`` and ``r12`` (float64 values).
    max_power : int
        Largest power of ``r1``, ``r2`` or ``r12`` needed (``<= MAX_POWER``).
    number : NumberType
        Arithmetic of the evaluation (float64, double-double or mpmath).

    Returns
    -------
    array of the number type, shape (E, L, L, L) with ``L = max_power + 2``
        ``table[e, a + 1, b + 1, c + 1] = I(a, b, c; alpha[e], beta[e], gamma[e])`` in bohr^(a+b+c+6).
    """
    alpha, beta, gamma = (np.atleast_1d(np.asarray(x, dtype=float)) for x in (alpha, beta, gamma))
    if max_power > MAX_POWER:
        raise InputError(f"integral power {max_power} exceeds the supported maximum {MAX_POWER}")
    A, B, C = pair_sums(alpha, beta, gamma, number)
    return MasterSeries(A, B, C, number).table(max_power)


def integral(a: int, b: int, c: int, alpha, beta, gamma):
    """One integral ``I(a, b, c; α, β, γ)`` in float64 (vectorized over the exponents).

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
    if max(a, b, c) > MAX_POWER:
        raise InputError(f"integral power {max(a, b, c)} exceeds the supported maximum {MAX_POWER}")
    scalar = np.ndim(alpha) == 0 and np.ndim(beta) == 0 and np.ndim(gamma) == 0
    alpha, beta, gamma = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (alpha, beta, gamma)))
    shape = alpha.shape
    A, B, C = pair_sums(alpha.ravel(), beta.ravel(), gamma.ravel())
    values = MasterSeries(A, B, C).integral(int(a), int(b), int(c)).reshape(shape)
    return float(values) if scalar else values


def pair_sums(alpha, beta, gamma, number: NumberType = FLOAT64):
    """``A = α+β``, ``B = β+γ``, ``C = γ+α`` in the number type, after checking they are positive."""
    check_exponents(alpha + beta, beta + gamma, gamma + alpha)
    if number is FLOAT64:
        return alpha + beta, beta + gamma, gamma + alpha
    al, be, ga = (number.from_float(x) for x in (alpha, beta, gamma))
    return al + be, be + ga, ga + al


# ---------------------------------------------------------------------------------------------
# one index -2: K(p, q) = ∫_0^∞ (A+t)^{-p} (C+t)^{-q} dt (float64)
# ---------------------------------------------------------------------------------------------

@lru_cache(maxsize=None)
def _legendre(order: int):
    x, w = np.polynomial.legendre.leggauss(order)
    return 0.5 * (x + 1.0), 0.5 * w


class IntegerPowers:
    """Cached integer powers of a float64 array (binary exponentiation)."""

    def __init__(self, base: np.ndarray):
        self.base = base
        self.cache = {0: np.ones_like(base), 1: base}

    def __call__(self, n: int) -> np.ndarray:
        if n not in self.cache:
            half = self(n // 2)
            self.cache[n] = half * half * (self.base if n % 2 else 1.0)
        return self.cache[n]


class KValues:
    r"""``K(p, q) = ∫_0^∞ (A+t)^{-p} (C+t)^{-q} dt`` for arrays ``A, C > 0``, cached per ``(p, q)``.

    With ``ρ = max(A, C)/min(A, C)``:

    * ``ρ >= RECURSION_RATIO``: the exact recursion ``K(p, q) = (K(p, q-1) - K(p-1, q))/(C - A)``
      from ``K(p, 0) = A^{1-p}/(p-1)``, ``K(0, q) = C^{1-q}/(q-1)``,
      ``K(1, 1) = ln(C/A)/(C - A)``; the subtracted term is smaller by ~``1/ρ``, so there is
      no cancellation (relative error < 1e-13 for ``p + q <= 26``; the tests check against SymPy
      and 60-digit mpmath);
    * ``ρ < RECURSION_RATIO``: Gauss–Legendre quadrature after ``t = M(1/u - 1)``,
      ``M = sqrt(AC)``, which puts both poles at negative ``u`` and makes the integrand smooth:
      16 nodes for ``ρ <= 3`` and ``p + q <= 12``, else 32 (relative error ~1e-14).
    """

    def __init__(self, A: np.ndarray, C: np.ndarray):
        A, C = A.reshape(-1), C.reshape(-1)
        self.n = A.shape[0]
        ratio = np.maximum(A, C) / np.minimum(A, C)
        far = ratio >= RECURSION_RATIO
        self.far = np.nonzero(far)[0]
        self.close = np.nonzero(~far & (ratio <= 3.0))[0]
        self.middle = np.nonzero(~far & (ratio > 3.0))[0]
        self.A, self.C = A, C
        self._nodes: dict = {}
        self._recursion: dict = {}
        self._values: dict = {}

    def _quadrature(self, group: str, index: np.ndarray, order: int, p: int, q: int) -> np.ndarray:
        key = (group, order)
        if key not in self._nodes:
            u, w = _legendre(order)
            a, c = self.A[index, None], self.C[index, None]
            M = np.sqrt(a * c)
            self._nodes[key] = (IntegerPowers(np.broadcast_to(u, (index.size, order)).copy()),
                                IntegerPowers(1.0 / (u * a + M * (1.0 - u))),
                                IntegerPowers(1.0 / (u * c + M * (1.0 - u))), M * w)
        up, ia, ic, wm = self._nodes[key]
        integrand = ia(p) * ic(q) if p and q else (ia(p) if p else ic(q))
        if p + q > 2:
            integrand = integrand * up(p + q - 2)
        return np.einsum("ij,ij->i", integrand, wm)

    def _recursive(self, p: int, q: int) -> np.ndarray:
        key = (p, q)
        if key not in self._recursion:
            a, c = self.A[self.far], self.C[self.far]
            if q == 0:
                value = a ** (1 - p) / (p - 1)
            elif p == 0:
                value = c ** (1 - q) / (q - 1)
            elif p == q == 1:
                value = np.log(c / a) / (c - a)
            else:
                value = (self._recursive(p, q - 1) - self._recursive(p - 1, q)) / (c - a)
            self._recursion[key] = value
        return self._recursion[key]

    def value(self, p: int, q: int) -> np.ndarray:
        """``K(p, q)`` for every entry (bohr^(p+q-1)); needs ``p, q >= 0`` and ``p + q >= 2``."""
        if p < 0 or q < 0 or p + q < 2:
            raise InputError(f"K({p}, {q}) diverges (needs p, q >= 0 and p + q >= 2)")
        key = (p, q)
        if key not in self._values:
            out = np.empty(self.n)
            if self.far.size:
                out[self.far] = self._recursive(p, q)
            if self.close.size:
                order = 16 if p + q <= 12 else QUADRATURE_ORDER
                out[self.close] = self._quadrature("close", self.close, order, p, q)
            if self.middle.size:
                out[self.middle] = self._quadrature("middle", self.middle, QUADRATURE_ORDER, p, q)
            self._values[key] = out
        return self._values[key]

    def table(self, size: int) -> np.ndarray:
        """``G[e, m, n] = K(m + 1, n + 1)`` for ``m, n < size``."""
        return np.stack([np.stack([self.value(m + 1, n + 1) for n in range(size)], -1)
                         for m in range(size)], -2)


class InverseSquareSeries:
    """``I(-2, b, c)`` (the ``-2`` on the coordinate whose exponents enter ``first`` and ``third``,
    the ``A`` and ``C`` of the module formula) for fixed exponent sums, float64.

    Parameters
    ----------
    first, free, third : ndarray, shape (E,)
        The exponent sums that play ``A``, ``B`` and ``C``.
    """

    def __init__(self, first: np.ndarray, free: np.ndarray, third: np.ndarray):
        self._free = MasterSeries(None, free, None)
        self._k = KValues(first, third)
        self._size = 0
        self._G = None

    def _tables(self, size: int):
        if size > self._size:
            self._size = size
            self._G = self._k.table(size)
        return self._free.factor("B", self._size), self._G

    def coefficient(self, bp: int, cp: int) -> np.ndarray:
        """``Σ_{m1 <= b', n1 <= c'} F_B[b' - m1, n1] K(m1 + 1, c' - n1 + 1)``."""
        H, G = self._tables(max(bp, cp) + 1)
        return np.einsum("emn,emn->e", H[:, bp::-1, : cp + 1], G[:, : bp + 1, cp::-1])

    def integral(self, b: int, c: int) -> np.ndarray:
        """``I(-2, b, c)`` for every entry (bohr^(b+c+4))."""
        return FLOAT64.factorial_weight(1, factorial(b + 1), factorial(c + 1)) * self.coefficient(b + 1, c + 1)

    def table(self, max_power: int) -> np.ndarray:
        """``I(-2, b, c)`` for ``-1 <= b, c <= max_power``: ``table[e, b + 1, c + 1]``."""
        L = max_power + 2
        return np.stack([np.stack([self.integral(b - 1, c - 1) for c in range(L)], -1) for b in range(L)], -2)
