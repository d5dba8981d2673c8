"""Integral kernels against exact SymPy values, independent quadrature and closed forms."""

import math

import numpy as np
import pytest
import scipy.integrate
import sympy as sp

from twoel.integrals import integral, integral_table
from twoel.integrals import symbolic


def test_master_integral_derivation():
    # closed form 16π²/((α+β)(β+γ)(γ+α)): Pekeris, Phys. Rev. 112, 1649 (1958)
    a, b, g = symbolic.alpha, symbolic.beta, symbolic.gamma
    expected = 16 * sp.pi**2 / ((a + b) * (b + g) * (g + a))
    assert sp.simplify(symbolic.master_integral() - expected) == 0
    # the polynomial route equals plain sympy differentiation of the master integral
    for a_, b_, c_ in [(0, -1, -1), (1, 0, -1), (0, 0, 0), (-1, 2, 1)]:
        direct = symbolic.master_integral()
        for var, order in ((a, a_ + 1), (b, b_ + 1), (g, c_ + 1)):
            direct = (-1) ** order * sp.diff(direct, var, order)
        assert sp.simplify(direct - symbolic.closed_form(a_, b_, c_)) == 0


SAMPLE = [(-1, -1, -1), (0, 0, 0), (0, 0, -1), (-1, 0, 0), (1, 2, 0), (2, 0, 3), (3, 3, -1),
          (0, 4, 1), (5, 1, 2), (-1, 2, 4), (6, 6, 6), (2, -1, 5)]
EXPONENTS = [(sp.Rational(3, 2), sp.Rational(7, 4), 0), (2, 2, 0), (sp.Rational(5, 3), sp.Rational(1, 2), sp.Rational(1, 3)),
             (sp.Rational(1, 5), 3, sp.Rational(9, 7))]


@pytest.mark.parametrize("abc", SAMPLE)
@pytest.mark.parametrize("exps", EXPONENTS)
def test_kernel_matches_exact_sympy(abc, exps):
    a, b, c = abc
    exact = symbolic.exact_value(a, b, c, *exps) * sp.pi**2
    value = integral(a, b, c, float(exps[0]), float(exps[1]), float(exps[2]))
    assert value == pytest.approx(float(exact), rel=1e-13)


def _quadrature(a, b, c, alpha, beta, gamma):
    """∫ over r1, r2 and r12 in the triangle domain with d³r1 d³r2 = 8π² r1 r2 r12 dr1 dr2 dr12."""
    def f(r12, r2, r1):
        return (8 * math.pi**2 * r1 ** (a + 1) * r2 ** (b + 1) * r12 ** (c + 1)
                * math.exp(-alpha * r1 - beta * r2 - gamma * r12))
    cut = 45.0 / min(alpha, beta)
    value, _err = scipy.integrate.tplquad(f, 0, cut, 0, cut, lambda r1, r2: abs(r1 - r2),
                                          lambda r1, r2: r1 + r2, epsabs=0, epsrel=1e-10)
    return value


@pytest.mark.parametrize("abc,exps", [((0, 0, -1), (2.0, 2.0, 0.0)), ((1, 0, 2), (1.3, 0.9, 0.4)),
                                      ((-1, 1, 0), (2.5, 1.1, 0.2))])
def test_kernel_matches_independent_quadrature(abc, exps):
    assert integral(*abc, *exps) == pytest.approx(_quadrature(*abc, *exps), rel=1e-7)


def test_table_is_consistent_with_single_integrals_and_regular_at_gamma_zero_alpha_equal_beta():
    table = integral_table([1.7], [1.7], [0.0], 4)
    assert np.all(np.isfinite(table)) and np.all(table > 0)
    assert table[0, 3, 2, 5] == pytest.approx(integral(2, 1, 4, 1.7, 1.7, 0.0), rel=1e-15)


def test_hydrogenic_closed_forms():
    # ∫ e^{-2ζ r} d³r = π/ζ³; <1/r12> of 1s² = 5ζ/8 (Bethe & Salpeter 1957)
    zeta = 1.37
    norm = integral(0, 0, 0, 2 * zeta, 2 * zeta, 0.0)
    assert norm == pytest.approx((math.pi / zeta**3) ** 2, rel=1e-14)
    assert integral(0, 0, -1, 2 * zeta, 2 * zeta, 0.0) / norm == pytest.approx(5 * zeta / 8, rel=1e-14)


def test_bad_powers_raise():
    from twoel.errors import InputError

    with pytest.raises(InputError):
        integral(-2, 0, 0, 1.0, 1.0, 0.0)
    with pytest.raises(InputError):
        integral(0, 0, 0, -1.0, 0.5, 0.0)
