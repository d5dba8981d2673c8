r"""Double-double numbers on NumPy arrays: ``x = hi + lo`` with ``|lo| <= ulp(hi)/2`` (~32 digits).

Error-free transformations after Dekker, Numer. Math. 18, 224 (1971) and Knuth (TAOCP vol. 2,
4.2.2); the arithmetic follows Hida, Li & Bailey, "Algorithms for quad-double precision floating
point arithmetic", ARITH-15 (2001).  No fused multiply-add is assumed (Dekker splitting).  Only
``+ - *``, integer multiples and reciprocals are provided: that is all the generated zero-power
integrals (:mod:`twoel.integrals.generated.zero_power_kernels`) and the energy refinement need.
"""

from __future__ import annotations

import numpy as np

_SPLITTER = 134217729.0  # 2^27 + 1


def two_sum(a, b):
    """``s + e == a + b`` exactly, ``s = fl(a + b)``."""
    s = a + b
    bb = s - a
    e = (a - (s - bb)) + (b - bb)
    return s, e


def quick_two_sum(a, b):
    """As :func:`two_sum` for ``|a| >= |b|``."""
    s = a + b
    return s, b - (s - a)


def _split(a):
    t = _SPLITTER * a
    hi = t - (t - a)
    return hi, a - hi


def two_prod(a, b):
    """``p + e == a * b`` exactly, ``p = fl(a * b)`` (Dekker)."""
    p = a * b
    ah, al = _split(a)
    bh, bl = _split(b)
    e = ((ah * bh - p) + ah * bl + al * bh) + al * bl
    return p, e


class DD:
    """An array of double-double numbers (``hi``, ``lo`` broadcastable NumPy arrays)."""

    __slots__ = ("hi", "lo")
    __array_priority__ = 1000

    def __init__(self, hi, lo=None):
        self.hi = np.asarray(hi, dtype=float)
        self.lo = np.zeros_like(self.hi) if lo is None else np.asarray(lo, dtype=float)

    @staticmethod
    def _coerce(other) -> "DD":
        if isinstance(other, DD):
            return other
        if isinstance(other, int) and abs(other) < 2**53:
            return DD(float(other), 0.0)
        if isinstance(other, (float, np.ndarray, np.floating)):
            return DD(other, 0.0)
        raise TypeError(f"cannot mix DD with {type(other).__name__}")

    def __add__(self, other):
        y = self._coerce(other)
        s, e = two_sum(self.hi, y.hi)
        t, f = two_sum(self.lo, y.lo)
        e = e + t
        s, e = quick_two_sum(s, e)
        e = e + f
        return DD(*quick_two_sum(s, e))

    __radd__ = __add__

    def __neg__(self):
        return DD(-self.hi, -self.lo)

    def __sub__(self, other):
        return self + (-self._coerce(other))

    def __rsub__(self, other):
        return self._coerce(other) + (-self)

    def __mul__(self, other):
        if isinstance(other, int) and other in (1, 2, 4, 8, -1, -2, -4, -8):
            return DD(self.hi * other, self.lo * other)  # exact
        y = self._coerce(other)
        p, e = two_prod(self.hi, y.hi)
        e = e + (self.hi * y.lo + self.lo * y.hi)
        return DD(*quick_two_sum(p, e))

    __rmul__ = __mul__

    def reciprocal(self) -> "DD":
        """``1 / self`` to double-double accuracy (one Newton step on ``1/hi``)."""
        q1 = 1.0 / self.hi
        r = DD(1.0) - self * q1
        q2 = r.hi * q1
        r = r - self * q2
        q3 = r.hi * q1
        s, e = quick_two_sum(q1, q2)
        return DD(s, e) + q3

    def __getitem__(self, index):
        return DD(self.hi[index], self.lo[index])

    @property
    def shape(self):
        return self.hi.shape

    def to_float(self) -> np.ndarray:
        return self.hi + self.lo

    def reshape(self, shape) -> "DD":
        return DD(self.hi.reshape(shape), self.lo.reshape(shape))

    def transpose(self) -> "DD":
        return DD(self.hi.T, self.lo.T)


def dd_sum(x: DD, axis: int = -1) -> DD:
    """Sum along ``axis`` by pairwise double-double additions (``O(n)`` work, ``log n`` steps)."""
    hi = np.moveaxis(x.hi, axis, -1)
    lo = np.moveaxis(x.lo, axis, -1)
    acc = DD(hi, lo)
    while acc.hi.shape[-1] > 1:
        n = acc.hi.shape[-1]
        half = n // 2
        pair = DD(acc.hi[..., :half], acc.lo[..., :half]) + DD(acc.hi[..., half:2 * half],
                                                                acc.lo[..., half:2 * half])
        if n % 2:
            pair = DD(np.concatenate([pair.hi, acc.hi[..., -1:]], axis=-1),
                      np.concatenate([pair.lo, acc.lo[..., -1:]], axis=-1))
        acc = pair
    return DD(acc.hi[..., 0], acc.lo[..., 0])


def dd_matvec(matrix: DD, vector: DD) -> DD:
    """``matrix @ vector`` in double-double (matrix ``(n, n)``, vector ``(n,)``)."""
    products = matrix * DD(vector.hi[None, :], vector.lo[None, :])
    return dd_sum(products, axis=1)


def dd_dot(x: DD, y: DD) -> DD:
    """``Σ x_i y_i`` in double-double."""
    return dd_sum(x * y, axis=0)
