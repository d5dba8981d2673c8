"""Restricted Hartree-Fock limit of 1s² (twoel.scf.hartree_fock) against published values.

Sources of the check values (written beside each check):
* HF limits: C. Froese Fischer, The Hartree-Fock Method for Atoms (Wiley, 1977); He also
  C. F. Bunge, J. A. Barrientos, A. V. Bunge, J. A. Cogordan, Phys. Rev. A 46, 3691 (1992).
  He -2.861679995612, Li+ -7.23641520145, H- -0.48792973437 (from memory; the digits are as
  commonly quoted and were not checked against the printed tables here).
* 1s orbital energies: E. Clementi and C. Roetti, At. Data Nucl. Data Tables 14, 177 (1974):
  He -0.91796, Li+ -2.79236, H- -0.04622 (from memory; 5 digits).
* One-function (screened) result E = -(Z - 5/16)² at ζ = Z - 5/16: exact closed form
  (common practice, every textbook treatment of the He variational problem).
* Virial theorem -V/T = 2 at an optimized scale: exact (V. Fock, Z. Phys. 63, 855 (1930)).
* Restricted HF does not bind H-: E_HF(H-) > -1/2 (Froese Fischer 1977; follows from the value).
* 1/Z expansion of the HF energy, E = -Z² + 5Z/8 + E2 + E3/Z + ..., with E2(HF) = -0.111003
  (J. Linderberg, Phys. Rev. 121, 816 (1961); from memory).
"""

import json
import math

import numpy as np
import pytest
import sympy as sp

from twoel.errors import InputError
from twoel.io import dumps_json
from twoel.scf.hartree_fock import (HF_LIMIT, even_tempered, hartree_fock_limit, restricted_energy,
                                slater_integrals, slater_one_electron)
from twoel.integrals.symbolic import alpha, beta, closed_form, gamma
from twoel.reference import lookup

SIZES = (1, 2, 4, 6, 8, 10, 12)

# published limits (value, digits after the decimal point as published)
PUBLISHED = {
    2: (-2.861679995612, 12),   # Froese Fischer 1977; Bunge et al. 1992
    3: (-7.23641520145, 11),    # Froese Fischer 1977 (from memory)
    1: (-0.48792973437, 11),    # Froese Fischer 1977 (from memory)
}


@pytest.fixture(scope="module")
def limits():
    return {Z: hartree_fock_limit(Z, sizes=SIZES) for Z in (1, 2, 3)}


# ----------------------------------------------------------------------------- integrals

def test_coulomb_integral_from_master_integral_with_sympy():
    """(kl|mn) = I(0,0,-1; α, β, 0) = 32π²(α²+3αβ+β²)/(α²β²(α+β)³) (derived from the master integral)."""
    derived = closed_form(0, 0, -1).subs(gamma, 0)
    expected = 32 * sp.pi**2 * (alpha**2 + 3 * alpha * beta + beta**2) / (alpha**2 * beta**2 * (alpha + beta) ** 3)
    assert sp.simplify(derived - expected) == 0


@pytest.mark.parametrize("a,b", [(0, 0), (-1, 0), (0, -1), (1, 0)])
def test_one_electron_integrals_are_factors_of_master_integral(a, b):
    """I(a, b, 0; α, β, 0) = J_a(α) J_b(β) with J_n(s) = 4π (n+2)!/s^(n+3)."""
    derived = closed_form(a, b, 0).subs(gamma, 0)
    J = lambda n, s: 4 * sp.pi * sp.factorial(n + 2) / s ** (n + 3)
    assert sp.simplify(derived - J(a, alpha) * J(b, beta)) == 0
    assert slater_one_electron(a, 1.7) == pytest.approx(float(J(a, sp.Rational(17, 10))), rel=1e-15)


def test_slater_integrals_numeric_against_closed_forms():
    z = np.array([0.7, 1.9, 4.3])
    ints = slater_integrals(z)
    norm = np.sqrt(z**3 / math.pi)
    k, l, m, n = 0, 2, 1, 2
    a, b = z[k] + z[l], z[m] + z[n]
    closed = 32 * math.pi**2 * (a * a + 3 * a * b + b * b) / (a * a * b * b * (a + b) ** 3)
    assert ints.repulsion[k, l, m, n] == pytest.approx(closed * norm[k] * norm[l] * norm[m] * norm[n], rel=1e-13)
    # normalized functions; kinetic ½ζ² and <1/r> = ζ on the diagonal (hydrogenic 1s)
    assert np.allclose(np.diag(ints.overlap), 1.0, rtol=1e-14)
    assert np.allclose(np.diag(ints.kinetic), 0.5 * z**2, rtol=1e-14)
    assert np.allclose(np.diag(ints.nuclear), z, rtol=1e-14)
    # (ζζ|ζζ) = 5ζ/8 for a normalized 1s function (common practice, closed form)
    assert np.allclose([ints.repulsion[i, i, i, i] for i in range(3)], 5 * z / 8, rtol=1e-13)
    # eightfold permutational symmetry
    G = ints.repulsion
    for perm in ((1, 0, 2, 3), (0, 1, 3, 2), (2, 3, 0, 1)):
        assert np.allclose(G, G.transpose(perm), rtol=1e-14, atol=0)


def test_integral_input_checks():
    with pytest.raises(InputError):
        slater_integrals([1.0, -2.0])
    with pytest.raises(InputError):
        even_tempered(1.0, 1.0, 4)
    with pytest.raises(InputError):
        even_tempered(-1.0, 2.0, 4)
    with pytest.raises(InputError):
        even_tempered(1.0, 2.0, 0)


# ----------------------------------------------------------------------------- closed forms

@pytest.mark.parametrize("Z", [1.0, 2.0, 3.0, 5.5])
def test_one_function_gives_the_screened_closed_form(Z):
    """One 1s function: optimum ζ = Z - 5/16, E = -(Z - 5/16)², ε = ζ²/2 - Zζ + 5ζ/8 (exact)."""
    r = hartree_fock_limit(Z, sizes=(1,))
    zeta = Z - 5 / 16
    assert r.energy_hartree == pytest.approx(-zeta**2, abs=1e-12)
    assert r.convergence[0].a == pytest.approx(zeta, rel=1e-6)
    assert r.orbital_energy_hartree == pytest.approx(zeta**2 / 2 - Z * zeta + 5 * zeta / 8, abs=1e-6)


# ----------------------------------------------------------------------------- published limits

@pytest.mark.parametrize("Z", [2, 3, 1])
def test_limit_within_1e_9_of_published_and_not_below(limits, Z):
    """He, Li+, H-: within 1e-9 Eh of Froese Fischer (1977) / Bunge et al. (1992), never below.

    'Never below' allows half a unit of the last published digit (the published value is rounded).
    """
    value, decimals = PUBLISHED[Z]
    r = limits[Z]
    assert abs(r.energy_hartree - value) < 1e-9
    assert r.energy_hartree >= value - 0.5 * 10.0**-decimals
    # and the converged basis really reached ~1e-11 (the honest reach of this method)
    assert r.estimated_error_hartree < 1e-10


def test_every_basis_energy_is_an_upper_bound(limits):
    """Variational principle: no basis size gives an energy below the published limit."""
    for Z, r in limits.items():
        value, decimals = PUBLISHED[Z]
        for step in r.convergence:
            assert step.energy_hartree >= value - 0.5 * 10.0**-decimals


def test_convergence_is_monotonic_and_fast(limits):
    r = limits[2]
    energies = [s.energy_hartree for s in r.convergence]
    assert all(b <= a + 1e-12 for a, b in zip(energies, energies[1:]))
    # N = 1 is the screened function (error ~1.4e-2); N = 8 is already within 1e-8
    assert energies[0] - PUBLISHED[2][0] == pytest.approx(-(2 - 5 / 16) ** 2 + 2.861679995612, abs=1e-9)
    eight = next(s for s in r.convergence if s.size == 8)
    assert eight.energy_hartree - PUBLISHED[2][0] < 1e-8


@pytest.mark.parametrize("Z,eps", [(2, -0.91796), (3, -2.79236), (1, -0.04622)])
def test_orbital_energy_koopmans(limits, Z, eps):
    """1s orbital energies, Clementi & Roetti (1974) (from memory; 5 decimals)."""
    assert limits[Z].orbital_energy_hartree == pytest.approx(eps, abs=1e-5)


def test_orbital_energy_is_h_plus_j_of_the_stored_orbital(limits):
    """Closed-shell 1s²: the Fock eigenvalue ε equals h + J of the normalized orbital (exact
    identity).  ε comes from diagonalizing F in the orthogonalized basis; h + J is evaluated
    here from the primitive integrals and the coefficients stored in the provenance."""
    for Z, r in limits.items():
        z = np.array(r.provenance["exponents"])
        c = np.array(r.provenance["coefficients"])
        ints = slater_integrals(z)
        h = c @ (ints.kinetic - Z * ints.nuclear) @ c
        J = np.einsum("klmn,k,l,m,n->", ints.repulsion, c, c, c, c)
        assert c @ ints.overlap @ c == pytest.approx(1.0, abs=1e-10)
        assert h + J == pytest.approx(r.orbital_energy_hartree, abs=1e-8)


def test_virial_ratio(limits):
    """-V/T = 2 at the optimized scale (Fock 1930)."""
    for r in limits.values():
        assert r.virial_ratio == pytest.approx(2.0, abs=1e-8)


def test_restricted_hf_does_not_bind_h_minus(limits):
    r = limits[1]
    assert r.energy_hartree > -0.5
    assert not r.bound
    assert limits[2].bound and limits[3].bound


def test_json_record_agrees_with_published_limit(limits):
    """The ``hf --json`` record: energy and E - E_published within 1e-9 Eh of Bunge et al. (1992)."""
    d = json.loads(dumps_json(limits[2].to_dict()))
    assert abs(d["energy_hartree"] - PUBLISHED[2][0]) < 1e-9
    assert abs(d["difference_hartree"]) < 1e-9
    assert [row["size"] for row in d["convergence"]] == list(SIZES)
    # step_hartree = E(N=1) - E(N=2) > 0: from -(Z - 5/16)² (closed form) to within 1e-5 Eh
    # of the published limit (N = 2 is 7e-6 Eh above it)
    assert d["convergence"][1]["step_hartree"] == pytest.approx(
        -(2 - 5 / 16) ** 2 - PUBLISHED[2][0], abs=1e-5)


# ----------------------------------------------------------------------------- 1/Z expansion

def test_table_follows_the_1_over_z_expansion():
    """A fit to the tabulated Z = 4..10 limits (computed rows of data/hartree_fock_limits.csv)
    must give E2(HF) = -0.111003 (Linderberg 1961, from memory) to 1e-4."""
    Z = np.arange(4, 11, dtype=float)
    E = np.array([lookup(z, "1^1S", HF_LIMIT).value for z in Z])
    rest = E + Z**2 - 5 * Z / 8
    coeffs = np.polyfit(1 / Z, rest, 3)
    assert coeffs[-1] == pytest.approx(-0.111003, abs=1e-4)


def test_computed_energies_follow_the_1_over_z_expansion():
    """Energies computed now for Z = 4..10 (8 functions, ~1e-11 Eh from the limit) give E2(HF)."""
    Z = np.arange(4, 11, dtype=float)
    E = np.array([hartree_fock_limit(z, sizes=(8,)).energy_hartree for z in Z])
    rest = E + Z**2 - 5 * Z / 8
    coeffs = np.polyfit(1 / Z, rest, 3)
    assert coeffs[-1] == pytest.approx(-0.111003, abs=1e-5)


# ----------------------------------------------------------------------------- bad input

@pytest.mark.parametrize("sizes", [(), (4, 2), (0,), (31,), (2, 2), ("x",), (2.5,)])
def test_bad_sizes(sizes):
    with pytest.raises(InputError):
        hartree_fock_limit(2, sizes=sizes)


@pytest.mark.parametrize("Z", [0, -1, "Xx", float("nan")])
def test_bad_charge(Z):
    with pytest.raises(InputError):
        hartree_fock_limit(Z, sizes=(1,))


def test_fixed_basis_energy_is_an_upper_bound():
    sol = restricted_energy(2.0, 0.5, 1.5, 8)
    assert sol.energy > PUBLISHED[2][0]
    assert sol.iterations < 50


# ----------------------------------------------------------------------------- large charges

@pytest.mark.parametrize("Z", [50.0, 80.0, 118.0])
def test_large_charges_converge_and_follow_the_1_over_z_expansion(Z):
    """At large Z the SCF stops at double-precision rounding (the Fock matrix grows like Z²)
    instead of failing.  E_HF + Z² - 5Z/8 = E2 + E3/Z + ... with E2(HF) = -0.111003 (Linderberg
    1961, from memory) and |E3/Z| < 3e-5 for Z >= 50: the energy must match to 5e-5 Eh."""
    result = hartree_fock_limit(Z, sizes=(1, 2, 4, 6))
    assert result.energy_hartree + Z**2 - 5 * Z / 8 == pytest.approx(-0.111003, abs=5e-5)
    assert result.energy_hartree > -Z**2                    # above the bare-nucleus bound
    assert result.virial_ratio == pytest.approx(2.0, abs=1e-8)
    # a larger fixed basis (the Z-scaled start of 12 and 14 functions, where the SCF used to
    # stall above its commutator threshold and the whole run failed) converges to the same law
    from twoel.scf.hartree_fock import _seed

    for n in (12, 14):
        sol = restricted_energy(Z, *_seed(Z, n), n)
        assert sol.energy + Z**2 - 5 * Z / 8 == pytest.approx(-0.111003, abs=5e-5)
