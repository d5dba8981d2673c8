"""The single pair evaluator (twoel.integrals.pairs): K(p, q), one power -2, table vs pair series,
exchange symmetrization and bad operator input."""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pytest
import sympy as sp

from twoel.errors import InputError
from twoel.integrals import pairs
from twoel.integrals.pairs import (PairEngine, PairIntegrals, inverse_square_table, k_integral,
                                   operator_matrices, primitive_matrices)
from twoel.basis.correlated import CorrelatedBasis


@pytest.mark.parametrize("A, C, p, q", [
    (sp.Rational(7, 10), sp.Rational(21, 20), 1, 1),   # ρ = 1.5, quadrature
    (sp.Rational(7, 10), sp.Rational(7, 2), 3, 5),     # ρ = 5, quadrature
    (sp.Rational(3, 2), sp.Rational(3, 10), 10, 2),    # ρ = 5, A > C
    (sp.Rational(1, 5), sp.Rational(30), 2, 9),        # ρ = 150, recursion
    (sp.Rational(40), sp.Rational(1, 250), 6, 6),      # ρ = 10⁴, recursion
])
def test_k_integral_matches_exact_sympy(A, C, p, q):
    """K(p, q) = ∫_0^∞ (A+t)^-p (C+t)^-q dt against SymPy's exact rational-plus-logarithm value."""
    t = sp.symbols("t", positive=True)
    exact = float(sp.N(sp.integrate((A + t) ** -p * (C + t) ** -q, (t, 0, sp.oo)), 30))
    assert k_integral(float(A), float(C), p, q) == pytest.approx(exact, rel=2e-14)


def _k_exact(A, C, N):
    """K(p, q) for p + q <= N by the partial-fraction recursion in 60-digit arithmetic."""
    mp.mp.dps = 60
    A, C = mp.mpf(A), mp.mpf(C)
    d, K = C - A, {}
    for n in range(2, N + 1):
        for p in range(n + 1):
            q = n - p
            if q == 0:
                K[p, q] = A ** (1 - p) / (p - 1)
            elif p == 0:
                K[p, q] = C ** (1 - q) / (q - 1)
            elif n == 2:
                K[p, q] = mp.log(C / A) / d
            else:
                K[p, q] = (K[p, q - 1] - K[p - 1, q]) / d
    return K


def test_k_integral_over_ratios_and_powers():
    """Relative error below 2e-13 for ρ = max(A,C)/min(A,C) from 1.2 to 10⁶ and p + q <= 20, in one
    vectorized call (quadrature and recursion groups mixed)."""
    ratios = [1.2, 2.9, 3.1, 9.9, 10.0, 80.0, 3000.0, 1e6]
    A = np.array([0.7] * len(ratios) + [0.7 * r for r in ratios])
    C = np.array([0.7 * r for r in ratios] + [0.7] * len(ratios))
    exact = [_k_exact(a, c, 20) for a, c in zip(A, C)]
    for n in (2, 5, 12, 13, 20):
        for p in range(n + 1):
            values = k_integral(A, C, p, n - p)
            reference = np.array([float(e[p, n - p]) for e in exact])
            assert np.max(np.abs(values / reference - 1)) < 2e-13, (p, n - p)


def _minus_two_exact(b, c, point):
    """I(-2, b, c) from the closed form 16π² ln(C/A)/(B (C - A)) of I(-2,-1,-1) by SymPy derivatives."""
    al, be, ga = sp.symbols("alpha beta gamma", positive=True)
    expr = 16 * sp.pi**2 / (be + ga) * sp.log((al + ga) / (al + be)) / (ga - be)
    expr = sp.diff(expr, be, b + 1) * (-1) ** (b + 1)
    expr = sp.diff(expr, ga, c + 1) * (-1) ** (c + 1)
    return float(sp.N(expr.subs(dict(zip((al, be, ga), point))), 30))


@pytest.mark.parametrize("point", [
    (sp.Rational(13, 10), sp.Rational(7, 10), sp.Rational(2, 5)),
    (sp.Rational(1, 100), sp.Rational(30), sp.Rational(1, 50)),   # A/C = 1000
    (sp.Rational(5), sp.Rational(-3, 10), sp.Rational(6)),        # negative β
])
def test_inverse_square_integrals_match_exact_sympy(point):
    """Pair series and table give I(-2, b, c) to 1e-12 (the former corrections table lost 5
    digits at A/C = 1000)."""
    x = [float(v) for v in point]
    series = PairIntegrals(*x)
    table = inverse_square_table(*([v] for v in x), 6)
    for b, c in [(-1, -1), (0, 0), (2, 1), (1, 4), (6, 2), (0, 6)]:
        exact = _minus_two_exact(b, c, point)
        assert float(series(-2, b, c)) == pytest.approx(exact, rel=1e-12)
        assert table[0, b + 1, c + 1] == pytest.approx(exact, rel=1e-12)


CORRECTION_SET = {
    "inv_r1_squared": [(0.5, (-2, 0, 0)), (0.5, (0, -2, 0))],
    "inv_r12_squared": [(1.0, (0, 0, -2))],
    "p1_dot_p2": [("grad12", pairs.UNIT)],
    "p1sq_p2sq": [("lap1lap2", pairs.UNIT)],
    "gradsq_over_r1": [(g, [(0.5, (-1, 0, 0)), (0.5, (0, -1, 0))]) for g in ("grad11", "grad22")],
    "kinetic": "kinetic",
}


@pytest.mark.parametrize("sign", [1, -1])
def test_tables_and_pair_series_agree(sign):
    """Two exponent rows and powers up to 3: the matrices from whole tables equal the pair
    series evaluated one pair at a time (-2 powers included).  The derivative integrands sum
    terms of both signs (triplet: direct minus exchanged), hence 1e-12 of the largest entry."""
    rng = np.random.default_rng(11)
    n = 7
    powers = rng.integers(0, 4, (n, 3))
    exponents = np.where(rng.random((n, 1)) < 0.5, [[2.1, 0.9, 0.1]], [[1.4, 1.4, 0.0]])
    basis = CorrelatedBasis(powers, exponents, sign=sign)
    tables = primitive_matrices(basis, CORRECTION_SET)
    for name, spec in CORRECTION_SET.items():
        pieces = pairs.exchange_symmetrized(pairs._pieces(name, spec))
        scale = np.max(np.abs(tables[name]))
        for p in range(n):
            for q in range(p, n):
                single = PairEngine(basis, np.array([p]), np.array([q])).primitive(pieces)[0]
                assert abs(single - tables[name][p, q]) <= 1e-12 * scale, (name, p, q)


def test_exchange_symmetrized_operator():
    """A one-sided operator r1 has, between (1 ± P12) functions, the matrix of (r1 + r2)/2; both
    equal the half of the full (1 ± P)…(1 ± P) matrix computed pair by pair on the full grid."""
    rng = np.random.default_rng(2)
    n = 5
    basis = CorrelatedBasis(rng.integers(0, 2, (n, 3)),
                            np.column_stack([rng.uniform(1, 2, n), rng.uniform(0.3, 1, n), rng.uniform(0, 0.4, n)]),
                            sign=-1)
    one_sided = operator_matrices(basis, {"o": [(1.0, (1, 0, 0))]})["o"]
    symmetric = operator_matrices(basis, {"o": [(0.5, (1, 0, 0)), (0.5, (0, 1, 0))]})["o"]
    engine = PairEngine(basis)
    # <(1-P)χ_p| r1 |(1-P)χ_q>/2 = <χ_p| r1 + r2 |(1-P)χ_q>/2 (P r1 P = r2)
    full = 0.5 * (engine.primitive([("unit", [(1.0, (1, 0, 0))])])
                  + engine.primitive([("unit", [(1.0, (0, 1, 0))])]))
    assert np.max(np.abs(one_sided - symmetric)) < 1e-14 * np.max(np.abs(symmetric))
    assert np.max(np.abs(one_sided - full)) < 1e-14 * np.max(np.abs(full))


def test_bad_operator_input():
    basis = CorrelatedBasis([[0, 0, 0]], [[1.0, 1.0, 0.0]])
    with pytest.raises(InputError, match="unknown integrand"):
        operator_matrices(basis, {"x": [("gradient", pairs.UNIT)]})
    with pytest.raises(InputError, match="empty"):
        operator_matrices(basis, {"x": []})
    with pytest.raises(InputError, match="unknown specification"):
        operator_matrices(basis, {"x": "potential"})
    with pytest.raises(InputError, match="diverges"):
        operator_matrices(basis, {"x": [(1.0, (-3, 0, 0))]})
    with pytest.raises(InputError, match="diverges"):
        k_integral(1.0, 2.0, 1, 0)
