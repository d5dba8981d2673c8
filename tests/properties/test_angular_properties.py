"""Expectation values of D states: the coalescence (direct δ) matrices of any L.

Checks against outside facts: the direct and the regularized δ (Drachman, J. Phys. B 14, 2733
(1981)) are two independent formulas that must agree for an accurate wave function; the
triplet δ(r12) vanishes exactly; and for 1s3d the inner electron is nearly hydrogenic
(``⟨1/r⟩ = Z`` for 1s, ``1/9`` for a 3d electron seeing charge 1: exact closed forms)."""

from __future__ import annotations

import math
import warnings

import numpy as np
import pytest

import twoel
from twoel.basis.angular import AngularBasis
from twoel.properties.operators import coalescence_matrices


@pytest.fixture(scope="module")
def d_values():
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        out = {}
        for label in ("3^1D", "3^3D"):
            result = twoel.solve(2, label, size=300, error_bar=False)
            out[label] = twoel.expectation_values(result)
    return out


@pytest.mark.slow
def test_direct_and_regularized_delta_agree_for_3_1d(d_values):
    v = d_values["3^1D"]
    assert v.delta_r1 == pytest.approx(v.delta_r1_regularized, rel=1e-5)
    assert v.delta_r12 == pytest.approx(v.delta_r12_regularized, rel=1e-3)
    # the 1s electron at the nucleus: Z³/π per 1s electron, halved per electron, screening tiny
    assert v.delta_r1 == pytest.approx(0.5 * 2**3 / math.pi, rel=1e-3)


@pytest.mark.slow
def test_inner_and_outer_electrons_of_1s3d(d_values):
    # ½(⟨1/r⟩_1s + ⟨1/r⟩_3d) with Z = 2 and charge 1 for the outer electron: (2 + 1/9)/2
    for label in ("3^1D", "3^3D"):
        assert d_values[label].inv_r1 == pytest.approx((2 + 1 / 9) / 2, rel=1e-4)
        # ⟨1/r²⟩: 2Z² for 1s; 1/(n³(l + 1/2)) = 1/67.5 for 3d with charge 1
        assert d_values[label].inv_r1_squared == pytest.approx((8 + 1 / 67.5) / 2, rel=2e-3)


@pytest.mark.slow
def test_triplet_delta_r12_vanishes(d_values):
    v = d_values["3^3D"]
    assert abs(v.delta_r12) < 1e-12
    assert v.delta_r1 == pytest.approx(v.delta_r1_regularized, rel=1e-5)


def test_angular_factor_at_coalescence_is_the_orientation_average():
    """One primitive ``χ = (ε·r1)^L e^{-r1 - 3 r2}``: ``⟨χ|δ³(r2)|χ⟩ = ∫|ε·r1|^{2L} e^{-2 r1} d³r1
    = L!/(2L+1)!! · 4π (2L+2)!/2^{2L+3}`` (the orientation average of ``|ε·r̂|^{2L}`` times a
    radial closed form); the exchanged ket ``(ε·r2)^L`` and ``δ³(r1)`` (bra factor ``r1^L``)
    vanish there, and ``delta_r1`` is the per-electron half of the sum."""
    for L, average in ((1, 1 / 3), (2, 2 / 15), (3, 6 / 105)):
        basis = AngularBasis(np.array([[1.0, 3.0, 0.0]]), sign=1, angular_momentum=L,
                             electron1_l=np.array([L]))
        m = coalescence_matrices(basis, cusps=False)
        expected = 0.5 * average * 4 * math.pi * math.factorial(2 * L + 2) / 2.0 ** (2 * L + 3)
        assert m["delta_r1"][0, 0] == pytest.approx(expected, rel=1e-12)
