"""Expectation values, Drachman-regularized δ functions, cusp ratios and densities."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from twoel.basis import excited_boxes as xb
from twoel.basis import family_names
from twoel.basis.exponential_excited import basis_from_boxes
from twoel.cli import main
from twoel.properties.densities import pair_distribution, radial_density
from twoel.solver.eigen import solve_generalized
from twoel.errors import InputError
from twoel.basis.correlated import CorrelatedBasis
from twoel.basis.p_basis import PBasis
from twoel.properties.expectation import expectation_values
from twoel.results import Wavefunction
from twoel.system import State

#: He 1¹S, per electron (G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical
#: Physics (2006), ch. 11, tables; from memory)
HE_GROUND = {"r1": 0.929472294874, "r1_squared": 1.193482995019, "inv_r1": 1.688316800717,
             "inv_r12": 0.945818448800, "r12": 1.422070255566, "delta_r1": 1.810429318,
             "delta_r12": 0.106345371, "p1_p2": 0.159069475}

#: a 3-box test basis for He 1¹S (edges from a short optimization; test fixture only)
GROUND_BOXES = [xb.Box(alpha=(0.766, 2.536), beta=(0.817, 2.538), gamma=(0.077, 0.776), fraction=1 / 3),
                xb.Box(alpha=(0.98, 6.58), beta=(0.98, 5.45), gamma=(0.238, 3.10), fraction=1 / 3),
                xb.Box(alpha=(2.17, 18.0), beta=(0.35, 9.68), gamma=(0.022, 4.08), fraction=1 / 3)]


def _ground_state(size):
    basis = basis_from_boxes(GROUND_BOXES, State.parse("1^1S"), size)
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(2.0), m.overlap)
    return Wavefunction(basis, eig.vectors[:, 0])


@pytest.fixture(scope="module")
def ground():
    wf = _ground_state(200)
    return wf, expectation_values(wf, 2.0)


def test_hydrogenic_product_exact_values():
    """1s(Z)² = e^{-Z r1 - Z r2} is an exact eigenfunction without 1/r12 (repulsion=0): exact
    closed forms ⟨r⟩ = 3/(2Z), ⟨r²⟩ = 3/Z², ⟨1/r⟩ = Z, ⟨1/r²⟩ = 2Z², ⟨δ³(r1)⟩ = Z³/π,
    ⟨δ³(r12)⟩ = Z³/(8π), ⟨1/r12⟩ = 5Z/8, ⟨r12⟩ = 35/(16Z), ⟨r12²⟩ = 6/Z², ⟨p⁴⟩ = 5Z⁴ (hydrogen
    1s), ⟨∇1·∇2⟩ = 0, cusp -Z (Kato), virial 2, and the norm of (1 + P12)e^{-Zr1-Zr2},
    2(π/Z³)²; read through the JSON record (the names are the JSON contract)."""
    Z = 2.5
    wf = Wavefunction(CorrelatedBasis([[0, 0, 0]], [[Z, Z, 0.0]], sign=1), np.array([1.0]))
    v = expectation_values(wf, Z, repulsion=0.0)
    exact = {"r1": 1.5 / Z, "r1_squared": 3 / Z**2, "inv_r1": Z, "inv_r1_squared": 2 * Z**2,
             "delta_r1": Z**3 / math.pi, "delta_r1_regularized": Z**3 / math.pi,
             "delta_r12": Z**3 / (8 * math.pi), "delta_r12_regularized": Z**3 / (8 * math.pi),
             "inv_r12": 5 * Z / 8, "r12": 35 / (16 * Z), "r12_squared": 6 / Z**2,
             "p1_fourth": 5 * Z**4, "cusp_nucleus": -Z, "virial_ratio": 2.0,
             "energy_hartree": -Z**2, "kinetic_hartree": Z**2, "potential_hartree": -2 * Z**2,
             "normalization": 2 * (math.pi / Z**3) ** 2}
    record = json.loads(json.dumps(v.to_dict()))
    for key, value in exact.items():
        assert getattr(v, key) == pytest.approx(value, rel=1e-12), key
        assert record[key] == pytest.approx(value, rel=1e-12), key
    assert abs(v.grad1_dot_grad2) < 1e-13 and abs(record["grad1_dot_grad2"]) < 1e-13
    assert record["units"]["delta_r1"] == "bohr^-3" and record["units"]["p1_fourth"] == "bohr^-4"


@pytest.mark.parametrize("sign", [1, -1])
def test_hydrogenic_1s2p_exact_values(sign):
    """1s2p (P basis, repulsion=0) is exact: per electron ⟨1/r⟩ = (Z + Z/4)/2,
    ⟨r⟩ = (3/(2Z) + 5/Z)/2, ⟨δ³(r1)⟩ = Z³/(2π) (the 2p orbital vanishes at the nucleus)."""
    Z = 2.0
    wf = Wavefunction(PBasis([[Z / 2, Z, 0.0]], sign=sign), np.array([1.0]))
    v = expectation_values(wf, Z, repulsion=0.0)
    assert v.energy_hartree == pytest.approx(-Z**2 / 2 - Z**2 / 8, rel=1e-13)
    assert v.inv_r1 == pytest.approx((Z + Z / 4) / 2, rel=1e-13)
    assert v.r1 == pytest.approx((1.5 / Z + 5 / Z) / 2, rel=1e-13)
    assert v.delta_r1 == pytest.approx(Z**3 / (2 * math.pi), rel=1e-13)
    assert v.delta_r1_regularized == pytest.approx(Z**3 / (2 * math.pi), rel=1e-12)
    assert v.virial_ratio == pytest.approx(2.0, rel=1e-13)
    assert v.cusp_nucleus == pytest.approx(-Z, rel=1e-13)  # the 1s electron's Kato cusp


def test_ground_state_small_basis(ground):
    """200 exponentials (energy 1.5e-8 Eh above the exact value): moments to < 5e-7 relative
    (measured 2e-8 to 3e-7), regularized δ ~1e-6, direct δ only ~1e-5 to 1e-4."""
    _wf, v = ground
    for key in ("r1", "r1_squared", "inv_r1", "inv_r12", "r12"):
        assert getattr(v, key) == pytest.approx(HE_GROUND[key], rel=5e-7), key
    reg1 = abs(v.delta_r1_regularized / HE_GROUND["delta_r1"] - 1)
    dir1 = abs(v.delta_r1 / HE_GROUND["delta_r1"] - 1)
    reg12 = abs(v.delta_r12_regularized / HE_GROUND["delta_r12"] - 1)
    dir12 = abs(v.delta_r12 / HE_GROUND["delta_r12"] - 1)
    assert reg1 < 3e-6 and reg12 < 3e-6
    assert reg1 < dir1 / 5 and reg12 < dir12 / 5
    # sign convention: ⟨∇1·∇2⟩ = -⟨p1·p2⟩; Drake's table entry is ⟨p1·p2⟩ = +0.159069475
    assert -v.grad1_dot_grad2 == pytest.approx(HE_GROUND["p1_p2"], rel=1e-5)
    assert v.virial_ratio == pytest.approx(2.0, abs=1e-6)
    assert v.cusp_nucleus == pytest.approx(-2.0, abs=2e-3)  # Kato: -Z
    assert v.cusp_electron == pytest.approx(0.5, abs=3e-3)  # Kato: 1/2
    assert v.normalization == pytest.approx(1.0, abs=1e-12)


def test_densities_normalize_and_reproduce_moments():
    """∫ D dr = ∫ P du = 1 (exact: definition) by quadrature, and the first moments equal the
    analytic ⟨r1⟩ and ⟨r12⟩ of the same wave function (an independent evaluation)."""
    wf = _ground_state(40)
    v = expectation_values(wf, 2.0)
    x, w = np.polynomial.legendre.leggauss(60)
    s = (x + 1) / 2
    r = 3.0 * (s / (1 - s)) ** 2
    wr = 3.0 * (w / 2) * 2 * s / (1 - s) ** 3
    D = radial_density(wf, grid=r).values
    P = pair_distribution(wf, grid=r).values
    assert wr @ D == pytest.approx(1.0, abs=1e-9)
    assert wr @ (r * D) == pytest.approx(v.r1, rel=1e-8)
    assert wr @ P == pytest.approx(1.0, abs=1e-9)
    assert wr @ (r * P) == pytest.approx(v.r12, rel=1e-8)
    grid = radial_density(wf, points=50)
    assert grid.grid.shape == grid.values.shape == (50,) and np.all(grid.values >= 0)


def test_triplet_vanishes_at_coalescence():
    """A triplet spatial function is zero at r12 = 0: ⟨δ³(r12)⟩ = 0 exactly, cusp undefined."""
    wf_basis = basis_from_boxes(xb.generic_boxes(type("I", (), {"Z": 2.0})(), State.parse("2^3S")),
                                State.parse("2^3S"), 30)
    m = wf_basis.matrices()
    eig = solve_generalized(m.hamiltonian(2.0), m.overlap)
    v = expectation_values(Wavefunction(wf_basis, eig.vectors[:, 0]), 2.0)
    assert abs(v.delta_r12) < 1e-11 * v.delta_r1  # zero up to rounding of direct - exchange
    assert math.isnan(v.cusp_electron) and any("triplet" in n for n in v.notes)


def test_bad_inputs():
    wf = Wavefunction(CorrelatedBasis([[0, 0, 0]], [[2.0, 2.0, 0.0]]), np.array([1.0]))
    with pytest.raises(InputError):
        expectation_values(wf)  # no Z for a bare wave function
    with pytest.raises(InputError):
        expectation_values(wf, -1.0)
    with pytest.raises(InputError):
        expectation_values("1^1S", 2.0)
    with pytest.raises(InputError):
        radial_density(wf, grid=[-1.0, 1.0])


def test_properties_cli_json(capsys):
    """2³P through the command: virial ratio 2 (exact for the optimized state), Kato's
    electron-nucleus cusp -Z (T. Kato, Commun. Pure Appl. Math. 10, 151 (1957)); a triplet has
    no electron-electron cusp (written null in standard JSON)."""
    assert main(["properties", "--Z", "2", "--state", "2^3P", "--size", "300", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["state"] == "2^3P"
    ev = data["expectation_values"]
    assert ev["virial_ratio"] == pytest.approx(2.0, abs=1e-5)
    assert ev["units"]["delta_r1"] == "bohr^-3"
    assert ev["cusp_nucleus"] == pytest.approx(-2.0, abs=0.02)
    assert ev["cusp_electron"] is None  # triplet: undefined (standard JSON has no NaN)


def test_double_double_moments_of_the_hydrogenic_product():
    """twoel.properties.precise on 1s(Z)²: ⟨r⟩ = 3/(2Z), ⟨r²⟩ = 3/Z², ⟨1/r⟩ = Z, ⟨1/r12⟩ = 5Z/8,
    ⟨r12²⟩ = 2⟨r²⟩ (closed forms; ⟨r1·r2⟩ = 0 for s orbitals)."""
    from twoel.properties.precise import refined_moments

    Z = 1.75
    basis = CorrelatedBasis([[0, 0, 0]], [[Z, Z, 0.0]], sign=1)
    m = refined_moments(basis, np.array([3.0]))
    exact = {"r1": 1.5 / Z, "r1_squared": 3 / Z**2, "inv_r1": Z, "inv_r12": 5 * Z / 8,
             "r12_squared": 6 / Z**2}
    for key, value in exact.items():
        assert m[key] == pytest.approx(value, rel=1e-15), key


@pytest.fixture(scope="module")
def ground_600():
    from twoel import solve

    return expectation_values(solve(2, "1^1S", family="exponential", size=600), refine=False)


@pytest.mark.slow
@pytest.mark.skipif("exponential" not in family_names(), reason="exponential family not available")
def test_ground_state_float64_accuracy(ground_600):
    """What the float64 eigenvector of the exponential family (N = 600) reaches (measured:
    ⟨1/r12⟩ 3.6e-9, ⟨r1²⟩ 1.8e-8, regularized δ 3.6e-7 / 1.7e-7, direct δ 1.9e-6 / 2.6e-5,
    virial 5e-9), against Drake (2006; from memory)."""
    v = ground_600
    assert v.inv_r12 == pytest.approx(HE_GROUND["inv_r12"], rel=1e-8)
    assert v.r1_squared == pytest.approx(HE_GROUND["r1_squared"], rel=5e-8)
    assert v.r1 == pytest.approx(HE_GROUND["r1"], rel=1e-8)
    assert v.delta_r1_regularized == pytest.approx(HE_GROUND["delta_r1"], rel=1e-6)
    assert v.delta_r12_regularized == pytest.approx(HE_GROUND["delta_r12"], rel=1e-6)
    assert v.virial_ratio == pytest.approx(2.0, abs=2e-8)


@pytest.mark.slow
@pytest.mark.skipif("exponential" not in family_names(), reason="exponential family not available")
def test_ground_state_acceptance_moments():
    """Acceptance (Drake 2006, from memory): ⟨1/r12⟩ and ⟨r1²⟩ to 1e-9 relative and virial
    ratio 2 to 1e-9, from the refined eigenvector in double-double (N = 300; measured ~1e-11)."""
    from twoel import solve

    v = expectation_values(solve(2, "1^1S", family="exponential", size=300))
    assert v.inv_r12 == pytest.approx(HE_GROUND["inv_r12"], rel=1e-9)
    assert v.r1_squared == pytest.approx(HE_GROUND["r1_squared"], rel=1e-9)
    assert v.r1 == pytest.approx(HE_GROUND["r1"], rel=1e-9)
    assert v.inv_r1 == pytest.approx(HE_GROUND["inv_r1"], rel=1e-9)
    assert v.r12 == pytest.approx(HE_GROUND["r12"], rel=1e-9)
    assert v.virial_ratio == pytest.approx(2.0, abs=1e-9)


@pytest.mark.slow
@pytest.mark.skipif("exponential" not in family_names(), reason="exponential family not available")
@pytest.mark.xfail(strict=True, reason="not met with this basis: the regularized δ forms are float64 evaluations of "
                   "the float64 eigenvector (measured 3.6e-7 and 1.7e-7 relative at N = 600); the "
                   "two-scale Hylleraas basis meets it (tests/properties/test_two_scale_deltas.py)")
def test_ground_state_acceptance_deltas(ground_600):
    """Acceptance (Drake 2006, from memory): regularized δ³(r1), δ³(r12) to 1e-7 relative."""
    v = ground_600
    assert v.delta_r1_regularized == pytest.approx(HE_GROUND["delta_r1"], rel=1e-7)
    assert v.delta_r12_regularized == pytest.approx(HE_GROUND["delta_r12"], rel=1e-7)


@pytest.mark.parametrize("uniform_exponents", [False, True])
def test_pairwise_matrices_equal_the_core_builder(uniform_exponents):
    """The core builder (whole integral tables when powers differ between pairs) equals the pair
    series evaluated one primitive pair at a time, and its kinetic matrix (terms generated by
    twoel.integrals.symbolic) equals the gradient and Laplacian forms of
    twoel.integrals.symbolic_states."""
    from twoel.integrals.pairs import PairEngine
    from twoel.basis.correlated import build_matrices, primitive_operator_matrices
    from twoel.integrals.hamiltonian import HAMILTONIAN

    rng = np.random.default_rng(5)
    n = 8
    powers = rng.integers(0, 3, (n, 3))
    if uniform_exponents:
        exponents = np.tile([1.7, 1.1, 0.0], (n, 1))
    else:
        exponents = np.column_stack([rng.uniform(1, 3, n), rng.uniform(0.2, 1.5, n), rng.uniform(0, 0.5, n)])
    for sign in (1, -1):
        basis = CorrelatedBasis(powers, exponents, sign=sign)
        core = build_matrices(basis)
        for name in ("overlap", "kinetic", "nuclear", "repulsion"):
            a = getattr(core, name)
            single = np.array([[PairEngine(basis, np.array([p]), np.array([q])).primitive(HAMILTONIAN[name])[0]
                                for q in range(n)] for p in range(n)])
            single = 0.5 * (single + single.T)
            assert np.max(np.abs(a - single)) <= 1e-13 * np.max(np.abs(a)), name
        forms = primitive_operator_matrices(basis, {
            "gradient": [("grad11", [(0.5, (0, 0, 0))]), ("grad22", [(0.5, (0, 0, 0))])],
            "laplacian": [("laplacian", [(1.0, (0, 0, 0))])]})
        for form in forms.values():
            assert np.max(np.abs(form - core.kinetic)) <= 1e-13 * np.max(np.abs(core.kinetic))


def test_refined_eigenvector_is_kept_and_reused():
    """The solve keeps its refined eigenvector; the expectation values reuse it instead of
    repeating the refinement, so they see the extended-precision vector when one was made."""
    from twoel import solve

    r = solve(2, "1^1S", family="exponential", size=60, precision="extended", error_bar=False)
    wf = r.wavefunction
    assert wf.refined_coefficients.shape == (60,)
    assert wf.refined_energy_hartree == r.energy_hartree
    v = expectation_values(r)
    assert any(repr(r.energy_hartree) in note for note in v.notes)
    plain = expectation_values(wf.__class__(wf.basis, wf.coefficients), 2.0, refine=True)
    assert plain.inv_r12 == pytest.approx(v.inv_r12, rel=1e-10)  # mixed and extended vectors agree
