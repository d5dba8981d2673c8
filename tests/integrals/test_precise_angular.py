"""Zero-power matrices of L >= 1 beyond float64: double-double and exact fixed point.

The generated pieces (:mod:`twoel.integrals.generated.angular_zero_power`) are checked against
the independent float64 path (generated term lists summed over the master series of
:mod:`twoel.integrals.series`), and the two extended number types against each other."""

from __future__ import annotations

import mpmath
import numpy as np
import pytest

from twoel.basis import get_family
from twoel.basis.angular import AngularBasis
from twoel.integrals import generate, precise
from twoel.integrals.numbers import DOUBLE_DOUBLE
from twoel.integrals.pairs import primitive_matrices
from twoel.solver.eigen import solve_generalized
from twoel.solver.refine import extended_refine, mixed_refine
from twoel.system import Ion, State

OPERATORS = {"overlap": [(1.0, (0, 0, 0))], "kinetic": "kinetic",
             "nuclear": [(1.0, (-1, 0, 0)), (1.0, (0, -1, 0))], "repulsion": [(1.0, (0, 0, -1))]}
CASES = [(1, [1] * 6), (2, [2, 1, 2, 1, 2, 1]), (2, [0, 1, 2, 0, 1, 2]), (3, [3, 2, 3, 2, 3, 2])]


def _exponents(seed: int, n: int = 6) -> np.ndarray:
    rng = np.random.default_rng(seed)
    ex = rng.uniform(0.3, 3.0, (n, 3))
    ex[:, 2] = rng.uniform(0.0, 0.8, n)
    return ex


def _basis(state: str, size: int):
    """The stored exponential basis of He ``state`` with ``size`` terms."""
    return get_family("exponential").build(Ion.parse(2), State.parse(state), size, None, {})


@pytest.mark.parametrize("sign", [1, -1])
@pytest.mark.parametrize("L, channels", CASES)
def test_double_double_matrices_match_the_series_path(L, channels, sign):
    ex = _exponents(L + 10 * (sign + 1) + sum(channels))
    basis = AngularBasis(ex, sign=sign, angular_momentum=L, electron1_l=np.array(channels))
    series = primitive_matrices(basis, OPERATORS)
    dd = precise.dd_matrices(ex, sign, **precise.angular_arguments(basis))
    for name in precise.NAMES:
        scale = np.abs(series[name]).max()
        assert np.abs(dd[name].to_float() - series[name]).max() <= 1e-13 * scale, name


@pytest.mark.parametrize("L, channels", CASES)
def test_fixed_point_entries_match_double_double(L, channels):
    ex = _exponents(7 * L)
    dd = precise.dd_matrices(ex, -1, L=L, electron1_l=channels)
    rows, cols = np.triu_indices(len(channels))
    fixed, P = precise.fixed_point_entries(ex, -1, 150, rows, cols, L=L, electron1_l=channels)
    factor = DOUBLE_DOUBLE.sixteen_pi_squared()
    with mpmath.workdps(50):
        f = mpmath.mpf(float(factor.hi)) + mpmath.mpf(float(factor.lo))
        for name in precise.NAMES:
            scale = max(abs(int(v)) for v in fixed[name]) * 2.0 ** -P
            for n, (i, j) in enumerate(zip(rows, cols)):
                x = (mpmath.mpf(dd[name].hi[i, j]) + mpmath.mpf(dd[name].lo[i, j])) / f
                y = mpmath.mpf(int(fixed[name][n])) * mpmath.mpf(2) ** -P
                assert abs(x - y) <= 1e-28 * scale, (name, i, j)


def test_s_primitives_are_unchanged_by_the_angular_arguments():
    ex = _exponents(3)
    plain = precise.dd_matrices(ex, 1)
    explicit = precise.dd_matrices(ex, 1, L=0)
    for name in precise.NAMES:
        assert np.array_equal(plain[name].hi, explicit[name].hi)
    assert precise.angular_arguments(_basis("1^1S", 10)) == {}


def test_bad_channels_are_refused():
    with pytest.raises(ValueError, match="electron1_l"):
        precise.dd_matrices(_exponents(1), 1, L=2, electron1_l=[3] * 6)
    with pytest.raises(ValueError, match="L = 4"):
        precise.dd_matrices(_exponents(1), 1, L=4)


@pytest.mark.parametrize("state", ["2^1P", "3^3D"])
def test_mixed_step_agrees_with_the_extended_solve_of_the_same_basis(state):
    """The mixed (double-double) energy of a P and a D basis against the arb solve of the
    exactly assembled matrices: the difference lies within the mixed step's stated error."""
    basis = _basis(state, 120)
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(2.0), m.overlap)
    angular = precise.angular_arguments(basis)
    mixed = mixed_refine(basis.exponents, basis.sign, 2.0, eig, 0, angular=angular)
    extended = extended_refine(basis.exponents, basis.sign, 2.0, mixed.energy_hartree, mixed.vector,
                               24, angular=angular)
    with mpmath.workdps(40):
        difference = abs(float(mpmath.mpf(mixed.text) - mpmath.mpf(extended.text)))
    assert extended.numerical_error_hartree < 1e-22
    assert difference <= mixed.numerical_error_hartree
    assert mixed.numerical_error_hartree < 1e-15
    # the refinement moved the energy down from the float64 solve (variational, same basis)
    assert mixed.energy_hartree <= eig.values[0] + 1e-15


@pytest.mark.slow
def test_generated_angular_pieces_are_up_to_date(capsys):
    assert generate.main(["--check", "angular_zero_power"]) == 0
    assert "angular_zero_power.py" in capsys.readouterr().out
