"""The one definition of δ³(r1), δ³(r12) and ⟨p1⁴⟩ (twoel.properties.operators): closed forms,
and the same numbers in the properties and in the corrections."""

import math

import numpy as np
import pytest

from twoel import constants
from twoel.basis.correlated import CorrelatedBasis
from twoel.corrections.one_electron import dirac_1s, lamb_shift_1s
from twoel.corrections.qed import qed_correction
from twoel.corrections.relativistic import breit_pauli_s
from twoel.corrections.spectrum import preset_basis
from twoel.properties.expectation import expectation_values
from twoel.properties.operators import operator_values
from twoel.results import Wavefunction
from twoel.solver.eigen import solve_generalized
from twoel.system import State


def _product(Z):
    """1s(Z)² = e^{-Z r1 - Z r2}: an exact eigenfunction of the model without 1/r12."""
    return Wavefunction(CorrelatedBasis([[0, 0, 0]], [[Z, Z, 0.0]], sign=1), np.array([1.0]))


@pytest.mark.parametrize("Z", [1.0, 2.5])
def test_hydrogenic_product_closed_forms_in_both_layers(Z):
    """Exact closed forms of the hydrogenic 1s² product (repulsion = 0): per electron
    ⟨δ³(r1)⟩ = |ψ_1s(0)|² = Z³/π, ⟨δ³(r12)⟩ = ∫|ψ_1s|⁴ = Z³/(8π), ⟨p1⁴⟩ = 5Z⁴ (hydrogen 1s);
    the regularized forms equal the direct ones for an exact eigenfunction."""
    wf = _product(Z)
    props = expectation_values(wf, Z, repulsion=0.0)
    corr = operator_values(wf, Z, repulsion=0.0)
    exact_d1, exact_d12, exact_p4 = Z**3 / math.pi, Z**3 / (8 * math.pi), 5 * Z**4
    for value in (props.delta_r1, props.delta_r1_regularized, corr.delta_r1_direct, corr.delta_r1_regularized):
        assert value == pytest.approx(exact_d1, rel=1e-12)
    for value in (props.delta_r12, props.delta_r12_regularized, corr.delta_r12_direct,
                  corr.delta_r12_regularized):
        assert value == pytest.approx(exact_d12, rel=1e-12)
    assert props.p1_fourth == pytest.approx(exact_p4, rel=1e-12)
    assert corr.p1_fourth == pytest.approx(exact_p4, rel=1e-12)
    assert corr.p4_sum == pytest.approx(2 * exact_p4, rel=1e-12)  # ⟨p1⁴ + p2⁴⟩
    assert corr.to_dict()["p4_sum"] == pytest.approx(2 * exact_p4, rel=1e-12)


def test_properties_and_corrections_give_the_same_helium_values():
    """He 1¹S in the small two-scale basis: the expectation values and the operator values of
    the corrections are the same definitions (agreement to rounding), and both are near
    G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11
    (from memory): ⟨δ³(r1)⟩ = 1.810429318, ⟨δ³(r12)⟩ = 0.106345371 (regularized, 3e-8 here)."""
    basis = preset_basis(2.0, State.parse("1^1S"), "fast")
    m = basis.matrices()
    wf = Wavefunction(basis, solve_generalized(m.hamiltonian(2.0), m.overlap).vectors[:, 0])
    props = expectation_values(wf, 2.0)
    corr = operator_values(wf, 2.0)
    pairs = [(props.delta_r1, corr.delta_r1_direct), (props.delta_r12, corr.delta_r12_direct),
             (props.delta_r1_regularized, corr.delta_r1_regularized),
             (props.delta_r12_regularized, corr.delta_r12_regularized),
             (props.p1_fourth, corr.p1_fourth), (-props.grad1_dot_grad2, corr.p1_dot_p2)]
    for a, b in pairs:
        assert a == pytest.approx(b, rel=1e-10)
    assert corr.delta_r1_regularized == pytest.approx(1.810429318, rel=3e-8)
    assert corr.delta_r12_regularized == pytest.approx(0.106345371, rel=1e-6)


@pytest.mark.parametrize("Z", [2.0, 10.0])
def test_breit_pauli_of_the_hydrogenic_model_is_the_dirac_energy(Z):
    """For two independent 1s electrons the one-electron Breit–Pauli terms, -⅛⟨p⁴⟩ + (Zπ/2)⟨δ³(r)⟩
    per electron, are the α² term of the Dirac 1s energy, -Z⁴α²/8 (exact expansion of
    c²[√(1 - (Zα)²) - 1]); they agree to the omitted relative order (Zα)²."""
    alpha = constants.FINE_STRUCTURE.value
    values = operator_values(_product(Z), Z, repulsion=0.0)
    bp = breit_pauli_s(Z, "1^1S", values, orbit_orbit=0.0)
    one_electron_terms = bp.mass_velocity_hartree + bp.darwin_one_electron_hartree
    assert one_electron_terms == pytest.approx(-Z**4 * alpha**2 / 4, rel=1e-12)
    dirac_alpha2 = dirac_1s(Z) + Z**2 / 2
    assert one_electron_terms == pytest.approx(2 * dirac_alpha2, rel=2 * (Z * alpha) ** 2)


def test_qed_of_the_hydrogenic_model_is_twice_the_1s_lamb_shift():
    """The atom's α³ one-electron term with ⟨δ³(r1)⟩ of two independent 1s electrons equals
    twice the 1s Lamb shift of the ion (exact for that model; Li⁺ has no published two-electron
    Bethe logarithm in the table, so both sides use the hydrogenic one)."""
    Z = 3.0
    values = operator_values(_product(Z), Z, repulsion=0.0)
    qed = qed_correction(Z, "1^1S", values.delta_r1_regularized, 0.0, 0.0)
    assert qed.bethe_log.approximate
    assert qed.one_electron_hartree == pytest.approx(2 * lamb_shift_1s(Z), rel=1e-12)
