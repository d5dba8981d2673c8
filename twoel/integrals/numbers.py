r"""Number types for the integral engine: float64, double-double and arbitrary precision.

The series of :mod:`twoel.integrals.series` is written once, in terms of a few array operations
(``+``, ``*``, reciprocals, stacking, fancy indexing and a two-operand ``einsum``).  A number type
supplies them for its representation, in the way mpmath writes one algorithm for any precision:

:data:`FLOAT64`        NumPy float64 arrays (the fast path of every solve);
:data:`DOUBLE_DOUBLE`  :class:`~twoel.integrals.doubledouble.DD` arrays, ~32 significant digits;
:func:`arbitrary`      NumPy object arrays of ``mpmath.mpf`` at a chosen number of decimal digits
                       (slow; used for checks and for extended-precision references).

Every input exponent is a float64, which each type represents exactly; integer weights
(binomials, factorials) are converted exactly where the type can hold them.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from twoel.integrals.closed_forms import SIXTEEN_PI_SQUARED
from twoel.integrals.doubledouble import DD


class NumberType:
    """The array operations the integral engine needs from a number type (float64 here)."""

    #: label used in provenance and messages
    name = "float64"
    #: decimal digits carried (about)
    digits = 15.9

    def from_float(self, values) -> np.ndarray:
        """Exact conversion of float64 values."""
        return np.asarray(values, dtype=float)

    def reciprocal(self, x):
        """``1/x`` elementwise."""
        return 1.0 / x

    def integers(self, values) -> np.ndarray:
        """Integer weights (binomials, factorials) as numbers of this type."""
        return np.array([float(v) for v in np.ravel(values)]).reshape(np.shape(values))

    def stack(self, arrays, axis: int):
        """Stack on a new axis; the result is C-contiguous (fixed summation order in einsum)."""
        return np.ascontiguousarray(np.stack(arrays, axis=axis))

    def einsum(self, spec: str, x, y):
        """Two-operand ``einsum`` (sum of products)."""
        return np.einsum(spec, x, y)

    def sixteen_pi_squared(self):
        """The angular factor 16π² of the master integral in this type."""
        return SIXTEEN_PI_SQUARED

    def factorial_weight(self, fa, fb, fc):
        """``16π² · fa · fb · fc`` for integer arrays (broadcast); float64 multiplies in that order."""
        if type(self) is NumberType:
            as_float = lambda v: np.asarray(v, dtype=float)  # noqa: E731
            return SIXTEEN_PI_SQUARED * as_float(fa) * as_float(fb) * as_float(fc)
        product = np.asarray(fa, dtype=object) * np.asarray(fb, dtype=object) * np.asarray(fc, dtype=object)
        return self.integers(product) * self.sixteen_pi_squared()

    def to_float(self, x) -> np.ndarray:
        return np.asarray(x, dtype=float)


class DoubleDoubleType(NumberType):
    """Double-double arrays (:class:`~twoel.integrals.doubledouble.DD`), ~32 digits."""

    name = "double-double"
    digits = 31.9

    def from_float(self, values) -> DD:
        return values if isinstance(values, DD) else DD(np.asarray(values, dtype=float))

    def reciprocal(self, x: DD) -> DD:
        return x.reciprocal()

    def integers(self, values) -> DD:
        flat = [int(v) for v in np.ravel(values)]
        hi = np.array([float(v) for v in flat])
        lo = np.array([float(v - int(h)) for v, h in zip(flat, hi)])
        shape = np.shape(values)
        return DD(hi.reshape(shape), lo.reshape(shape))

    def stack(self, arrays, axis: int) -> DD:
        return DD(np.stack([a.hi for a in arrays], axis=axis), np.stack([a.lo for a in arrays], axis=axis))

    def einsum(self, spec: str, x: DD, y: DD) -> DD:
        return _dd_einsum(spec, x, y)

    def sixteen_pi_squared(self) -> DD:
        hi, lo = _sixteen_pi_squared_parts()
        return DD(hi, lo)

    def to_float(self, x: DD) -> np.ndarray:
        return x.hi + x.lo


def _dd_einsum(spec: str, x: DD, y: DD) -> DD:
    """Two-operand ``einsum`` such as ``"eam,emn->ean"`` in double-double, one row at a time.

    The first output letter is the long axis (the entries of the integral engine); every other
    index is looped over, so that each double-double operation runs on one contiguous row of
    entries, which keeps its many temporaries in cache (about five times faster than
    broadcasting whole blocks).  No repeated letters within an operand.
    """
    inputs, output = spec.replace(" ", "").split("->")
    first, second = inputs.split(",")
    entry = output[0]
    extents = {}
    for letters, operand in ((first, x), (second, y)):
        for axis, c in enumerate(letters):
            extents[c] = operand.hi.shape[axis]
    free = output[1:]
    contracted = "".join(dict.fromkeys(c for c in first + second if c not in output))
    x_parts = [np.ascontiguousarray(np.moveaxis(a, first.index(entry), -1)) for a in (x.hi, x.lo)]
    y_parts = [np.ascontiguousarray(np.moveaxis(a, second.index(entry), -1)) for a in (y.hi, y.lo)]
    x_rest = [c for c in first if c != entry]
    y_rest = [c for c in second if c != entry]
    rows = []
    for outer in np.ndindex(*(extents[c] for c in free)):
        fixed = dict(zip(free, outer))
        total = None
        for inner in np.ndindex(*(extents[c] for c in contracted)):
            fixed.update(zip(contracted, inner))
            xi = tuple(fixed[c] for c in x_rest)
            yi = tuple(fixed[c] for c in y_rest)
            term = DD(*(a[xi] for a in x_parts)) * DD(*(a[yi] for a in y_parts))
            total = term if total is None else total + term
        rows.append(total)
    shape = tuple(extents[c] for c in free) + (extents[entry],)
    hi, lo = (np.ascontiguousarray(np.moveaxis(np.stack([getattr(r, k) for r in rows]).reshape(shape), -1, 0))
              for k in ("hi", "lo"))
    return DD(hi, lo)


@lru_cache(maxsize=1)
def _sixteen_pi_squared_parts() -> tuple[float, float]:
    """16π² as ``hi + lo`` to double-double accuracy (mpmath, computed once)."""
    import mpmath

    with mpmath.workdps(50):
        exact = 16 * mpmath.pi ** 2
        hi = float(exact)
        return hi, float(exact - mpmath.mpf(hi))


class ArbitraryType(NumberType):
    """Object arrays of mpmath numbers at ``decimal_digits`` significant digits.

    The numbers belong to a private mpmath context, so their arithmetic keeps this precision
    whatever the global ``mpmath.mp.dps`` is.
    """

    def __init__(self, decimal_digits: int = 50):
        import mpmath

        self.decimal_digits = int(decimal_digits)
        self.context = mpmath.MPContext()
        self.context.dps = self.decimal_digits
        self.name = f"mpmath-{self.decimal_digits}"
        self.digits = float(self.decimal_digits)

    def from_float(self, values) -> np.ndarray:
        array = np.asarray(values)
        if array.dtype == object:
            return array
        mpf = self.context.mpf
        return np.array([mpf(float(v)) for v in array.ravel()], dtype=object).reshape(array.shape)

    def reciprocal(self, x):
        one = self.context.mpf(1)
        return np.vectorize(lambda v: one / v, otypes=[object])(x)

    def integers(self, values) -> np.ndarray:
        return np.array([int(v) for v in np.ravel(values)], dtype=object).reshape(np.shape(values))

    def einsum(self, spec: str, x, y):
        return np.einsum(spec, x, y, dtype=object)

    def sixteen_pi_squared(self):
        return 16 * self.context.pi ** 2

    def to_float(self, x) -> np.ndarray:
        return np.vectorize(float, otypes=[float])(x)


#: NumPy float64 (the default)
FLOAT64 = NumberType()
#: double-double arrays, ~32 digits
DOUBLE_DOUBLE = DoubleDoubleType()


def arbitrary(decimal_digits: int = 50) -> ArbitraryType:
    """mpmath numbers at ``decimal_digits`` significant digits (checks, references)."""
    if not 16 <= int(decimal_digits) <= 2000:
        raise ValueError(f"decimal digits must be between 16 and 2000, got {decimal_digits}")
    return ArbitraryType(int(decimal_digits))
