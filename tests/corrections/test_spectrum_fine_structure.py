"""2³P fine structure of He against measured intervals (source named beside each value)."""

import numpy as np
import pytest

from twoel.basis.p_basis import PBasis
from twoel.corrections.p_states import (fields, fine_structure, frame, preset_p_basis,
                                        solve_p_state)
from twoel.corrections.quadrature import decay_rates, perimetric_grid
from twoel.solver.eigen import solve_generalized
from twoel.units import convert_energy, hartree_to

# T. Zelevinsky, D. Farkas, G. Gabrielse, Phys. Rev. Lett. 95, 203001 (2005) (from memory):
# ν(J=0-1) = 29 616 951.66(70) kHz, ν(J=1-2) = 2 291 175.59(51) kHz
NU01_MHZ = 29616.95166
NU12_MHZ = 2291.17559
# G. W. F. Drake, Springer Handbook of AMO Physics (2006), ch. 11 (from memory)
E_2_3P = -2.133164190779


@pytest.fixture(scope="module")
def helium_3p():
    basis = preset_p_basis(2.0, -1)
    energy, c = solve_p_state(basis, 2.0, 0)
    return basis, c, energy


def test_2_3p_energy_is_a_variational_upper_bound(helium_3p):
    _basis, _c, energy = helium_3p
    assert E_2_3P < energy < E_2_3P + 1e-7  # measured 5.5e-8 Eh above


def test_2_3p_fine_structure_intervals(helium_3p):
    """First-order Breit–Pauli omits α³ terms of about 1 MHz (the stated accuracy); measured
    residuals +0.77 MHz (J=0-1, +2.6e-5) and +0.67 MHz (J=1-2, +2.9e-4)."""
    basis, c, energy = helium_3p
    fs = fine_structure(basis, c, 2.0, energy, 32)
    nu01, nu12 = hartree_to(fs.interval_01_hartree, "mhz"), hartree_to(fs.interval_12_hartree, "mhz")
    assert nu01 == pytest.approx(NU01_MHZ, abs=1.0)
    assert nu12 == pytest.approx(NU12_MHZ, abs=1.0)
    # the anomalous magnetic moment factor is needed: without it the J=1-2 interval is worse
    plain = fine_structure(basis, c, 2.0, energy, 32, anomalous=False)
    assert abs(hartree_to(plain.interval_12_hartree, "mhz") - NU12_MHZ) > 10 * abs(nu12 - NU12_MHZ)
    # quadrature of the traces converged: fewer nodes change them little
    coarse = fine_structure(basis, c, 2.0, energy, 24)
    assert coarse.A_electron_au == pytest.approx(fs.A_electron_au, rel=1e-5)
    assert coarse.tensor_au == pytest.approx(fs.tensor_au, rel=1e-5)
    assert coarse.A_nuclear_au == pytest.approx(fs.A_nuclear_au, rel=1e-4)
    d = fs.to_dict()
    assert d["interval_01"] == d["interval_01_hartree"] and d["a_so"] == d["spin_orbit_hartree"]


def _quadrature_matrices(basis, Z, nodes):
    """Test oracle: overlap and Hamiltonian ``Σ_a ⟨Φ_a|·|Φ'_a⟩`` by quadrature Galerkin."""
    r1, r2, r12, W, _u = perimetric_grid(nodes, *decay_rates(basis))
    v1, v2 = frame(r1, r2, r12)
    phi, d = fields(basis, r1, r2, r12, v1, v2)
    P = basis.n_primitives
    fa = np.transpose(phi, (0, 2, 1)).reshape(-1, P)
    wa = np.repeat(W, 3)
    S = fa.T @ (wa[:, None] * fa)
    H = fa.T @ ((wa * np.repeat(-Z / r1 - Z / r2 + 1.0 / r12, 3))[:, None] * fa)
    fd = np.transpose(d, (0, 2, 3, 4, 1)).reshape(-1, P)
    H += 0.5 * fd.T @ (np.repeat(W, 18)[:, None] * fd)
    return 0.5 * (S + S.T), 0.5 * (H + H.T)


def test_exact_p_integrals_agree_with_the_quadrature_oracle():
    """The P-basis pair integrals (the z component with the common factor 2 dropped, so
    Σ_a over the multiplet is 6 times them) equal an independent quadrature Galerkin
    (measured: 7e-13 relative at 40 nodes), and so do the energies."""
    terms = [(0, 0, 0), (1, 0, 0), (0, 1, 0), (0, 0, 1)]
    basis = PBasis(np.tile([0.55, 2.0, 0.0], (4, 1)), sign=-1, powers=np.array(terms))
    m = basis.matrices()
    S, H = _quadrature_matrices(basis, 2.0, 40)
    assert np.max(np.abs(S / 6 - m.overlap)) < 1e-10 * np.max(np.abs(m.overlap))
    assert np.max(np.abs(H / 6 - m.hamiltonian(2.0))) < 1e-10 * np.max(np.abs(m.hamiltonian(2.0)))
    exact, _c = solve_p_state(basis, 2.0)
    assert float(solve_generalized(H, S).values[0]) == pytest.approx(exact, abs=1e-10)
    assert E_2_3P < exact < -2.13  # above Drake (2006, from memory): a variational bound


def test_measured_intervals_in_data():
    from twoel.reference import all_references

    rows = {r.quantity: r for r in all_references("measured_ionization_energies.csv") if r.state == "2^3P"}
    assert convert_energy(rows["fine_structure_interval_01"].value, "mhz", "mhz") == pytest.approx(NU01_MHZ)
    assert "Zelevinsky" in rows["fine_structure_interval_12"].source
