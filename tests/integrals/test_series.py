"""The one integral engine: the same series in float64, double-double and mpmath, against the
exact derivatives of the master integral 16π²/((α+β)(β+γ)(γ+α)) (Pekeris, Phys. Rev. 112,
1649 (1958))."""

from __future__ import annotations

import mpmath
import numpy as np
import pytest
import sympy as sp

from twoel.errors import InputError
from twoel.integrals import symbolic
from twoel.integrals.doubledouble import DD
from twoel.integrals.numbers import DOUBLE_DOUBLE, FLOAT64, arbitrary
from twoel.integrals.series import MasterSeries, integral_table, pair_sums

# The zero-power closed forms in float64, double-double and fixed point are compared in
# tests/solver/test_refine.py (test_float64_double_double_and_fixed_point_kernels_agree).

# exponents that are exact binary fractions, so SymPy sees the same numbers as the engine;
# γ = 0 and α = β are regular points of the formula
EXPONENTS = [(1.75, 0.5, 0.375), (2.0, 2.0, 0.0), (0.125, 3.0, 1.25)]


def _exact_table(max_power: int) -> dict:
    """``I(a, b, c) / π²`` by SymPy differentiation, exact rationals, for the EXPONENTS."""
    out = {}
    for a in range(-1, max_power + 1):
        for b in range(-1, max_power + 1):
            for c in range(-1, max_power + 1):
                for e, (al, be, ga) in enumerate(EXPONENTS):
                    value = symbolic.exact_value(a, b, c, sp.Rational(al), sp.Rational(be), sp.Rational(ga))
                    out[e, a + 1, b + 1, c + 1] = value
    return out


@pytest.fixture(scope="module")
def exact4():
    return _exact_table(3)


def _alphas():
    return tuple(np.array([row[k] for row in EXPONENTS]) for k in range(3))


def test_float64_double_double_and_mpmath_tables_agree_with_the_exact_derivatives(exact4):
    """Each number type reaches its own precision on the same table (all terms positive)."""
    alpha, beta, gamma = _alphas()
    f64 = integral_table(alpha, beta, gamma, 3)
    dd = integral_table(alpha, beta, gamma, 3, DOUBLE_DOUBLE)
    arb = integral_table(alpha, beta, gamma, 3, arbitrary(60))
    mpmath.mp.dps = 60
    pi2 = mpmath.pi ** 2
    worst = {"float64": 0.0, "double-double": 0.0, "mpmath": 0.0}
    for key, rational in exact4.items():
        exact = mpmath.mpf(rational.p) / rational.q * pi2
        worst["float64"] = max(worst["float64"], abs(mpmath.mpf(f64[key]) / exact - 1))
        dd_value = mpmath.mpf(dd.hi[key]) + mpmath.mpf(dd.lo[key])
        worst["double-double"] = max(worst["double-double"], abs(dd_value / exact - 1))
        worst["mpmath"] = max(worst["mpmath"], abs(arb[key] / exact - 1))
    mpmath.mp.dps = 15
    assert worst["float64"] < 5e-15
    assert worst["double-double"] < 1e-30
    assert worst["mpmath"] < 1e-55


def test_one_target_and_the_whole_table_agree():
    """The pair-series route (one (a, b, c) for many pairs) and the table route sum the same
    positive terms (in another order: equal to a few ulp)."""
    rng = np.random.default_rng(7)
    alpha, beta, gamma = rng.uniform(0.2, 4.0, (3, 50))
    table = integral_table(alpha, beta, gamma, 5)
    for a, b, c in [(0, 0, 0), (-1, 2, 1), (5, -1, 3), (2, 2, -1)]:
        series = MasterSeries(*pair_sums(alpha, beta, gamma))
        np.testing.assert_allclose(series.integral(a, b, c), table[:, a + 1, b + 1, c + 1], rtol=2e-15, atol=0)


def test_number_types_report_their_names_and_refuse_silly_precisions():
    assert FLOAT64.name == "float64" and DOUBLE_DOUBLE.name == "double-double"
    assert arbitrary(40).name == "mpmath-40"
    with pytest.raises(ValueError):
        arbitrary(5)


def test_divergent_or_negative_exponent_sums_are_refused():
    with pytest.raises(InputError):
        integral_table([1.0], [-1.0], [0.5], 2)
    with pytest.raises(InputError):
        integral_table([1.0], [1.0], [0.5], 99)


def test_double_double_einsum_matches_float_einsum_on_exact_inputs():
    rng = np.random.default_rng(3)
    x = rng.integers(-50, 50, (4, 3, 5)).astype(float)
    y = rng.integers(-50, 50, (4, 5, 2)).astype(float)
    out = DOUBLE_DOUBLE.einsum("eam,emn->ean", DD(x), DD(y))
    np.testing.assert_array_equal(out.hi, np.einsum("eam,emn->ean", x, y))  # small integers: exact
    np.testing.assert_array_equal(out.lo, 0.0)
    np.testing.assert_array_equal(FLOAT64.einsum("eab,eba->e", x[:, :2, :2], y[:, :2, :2]),
                                  np.einsum("eab,eba->e", x[:, :2, :2], y[:, :2, :2]))
