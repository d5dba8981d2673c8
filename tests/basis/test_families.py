"""Trial families against closed forms and published variational values."""

import numpy as np
import pytest

import twoel
from twoel.errors import InputError, UnsupportedError

# exact nonrelativistic limits (data/reference_energies.csv)
HE_EXACT = -2.903724377034119598   # Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)
H_MINUS_EXACT = -0.5277510165443772  # Nakashima & Nakatsuji, J. Chem. Phys. 127, 224104 (2007), from memory
LI_PLUS_EXACT = -7.2799134126693060  # Nakashima & Nakatsuji (2007), from memory


def test_screened_helium_closed_form():
    # E = -(Z - 5/16)^2 at ζ = Z - 5/16 (Kellner, Z. Phys. 44, 91 (1927); exact)
    r = twoel.solve(2, family="screened")
    assert r.energy_hartree == pytest.approx(-(27 / 16) ** 2, abs=1e-12)
    assert r.energy_hartree == pytest.approx(-2.84765625, abs=1e-12)
    assert r.parameters["zeta"] == pytest.approx(1.6875, abs=1e-9)
    assert r.virial_ratio == pytest.approx(2.0, abs=1e-9)


@pytest.mark.parametrize("Z", range(1, 11))
def test_hydrogenic_first_order_energy(Z):
    # first-order perturbation energy -Z² + 5Z/8 (Bethe & Salpeter 1957, exact)
    r = twoel.solve(Z, family="hydrogenic")
    assert r.energy_hartree == pytest.approx(-Z**2 + 5 * Z / 8, abs=1e-12 * Z**2)
    assert r.bound == (Z > 1)  # -1 + 5/8 > -1/2: H⁻ is not bound at first order


@pytest.mark.parametrize("Z", [1, 2, 3, 7.5])
def test_screened_closed_form_any_Z(Z):
    r = twoel.solve(Z, family="screened")
    assert r.energy_hartree == pytest.approx(-(Z - 5 / 16) ** 2, abs=1e-11 * Z**2)


def test_screened_hydrogen_anion_is_not_bound():
    r = twoel.solve(1, family="screened")
    assert not r.bound and r.status == "not bound"
    assert r.ionization_energy_hartree is None
    assert r.to_dict()["ionization_energy_ev"] is None


def test_open_shell_binds_hydrogen_anion():
    # -0.51330 (Chandrasekhar, Astrophys. J. 100, 176 (1944)); reproduced value -0.513302885
    r = twoel.solve(1, family="open-shell")
    assert r.bound and r.energy_hartree < -0.5
    assert r.energy_hartree == pytest.approx(-0.51330, abs=1e-5)
    a, b = sorted(r.parameters.values(), reverse=True)
    assert a == pytest.approx(1.0392, abs=2e-3) and b == pytest.approx(0.2832, abs=2e-3)


def test_open_shell_helium():
    # -2.875661331 (Eckart, Phys. Rev. 36, 878 (1930); digits from memory)
    r = twoel.solve(2, family="open-shell")
    assert r.energy_hartree == pytest.approx(-2.875661331, abs=1e-8)


HYLLERAAS_3 = [(0, 0, 0), (0, 0, 1), (0, 2, 0)]


def test_hylleraas_three_term_helium():
    # e^{-ζs}(1 + c1 u + c2 t²): -2.90243 (Hylleraas, Z. Phys. 54, 347 (1929)), ζ ≈ 1.816
    r = twoel.solve(2, family="hylleraas", options={"coordinates": "stu", "terms": HYLLERAAS_3})
    assert r.energy_hartree == pytest.approx(-2.90243, abs=1e-5)
    assert r.energy_hartree == pytest.approx(-2.90243203, abs=1e-8)
    assert r.parameters["alpha"] == pytest.approx(1.816, abs=1e-3)
    assert r.n_terms == 3


def test_hylleraas_three_term_hydrogen_anion_is_bound():
    # -0.525 309 70, bound (reproduced; cf. Hylleraas, Z. Phys. 60, 624 (1930))
    r = twoel.solve(1, family="hylleraas", options={"coordinates": "stu", "terms": HYLLERAAS_3})
    assert r.bound
    assert r.energy_hartree == pytest.approx(-0.52530970, abs=1e-7)


def test_koga_six_term_helium():
    # e^{-ζs}(1 + u + t² + s + s² + u²): -2.903 329 354 (T. Koga, J. Chem. Phys. 96, 1276 (1992))
    terms = [(0, 0, 0), (0, 0, 1), (0, 2, 0), (1, 0, 0), (2, 0, 0), (0, 0, 2)]
    r = twoel.solve(2, family="hylleraas", options={"coordinates": "stu", "terms": terms})
    assert r.energy_hartree == pytest.approx(-2.903329354, abs=2e-9)


@pytest.mark.parametrize("Z,exact,rel", [(2, HE_EXACT, 1e-7), (3, LI_PLUS_EXACT, 1e-7), (1, H_MINUS_EXACT, 2e-6)])
def test_hylleraas_omega_8_near_the_limit(Z, exact, rel):
    r = twoel.solve(Z, family="hylleraas", size=8)
    diff = r.energy_hartree - exact
    assert diff > -1e-12, "variational bound violated"
    assert diff < rel * abs(exact)
    assert r.virial_ratio == pytest.approx(2.0, abs=1e-6)
    assert r.bound


def test_energies_never_rise_with_omega_nested_fixed_exponent():
    energies = [twoel.solve(2, family="hylleraas", size=w, parameters={"alpha": 2.2}).energy_hartree
                for w in range(0, 8)]
    assert all(b <= a + 1e-13 for a, b in zip(energies, energies[1:]))
    assert all(e > HE_EXACT for e in energies)


def test_energies_never_rise_with_omega_optimized():
    energies = [twoel.solve(3, family="hylleraas", size=w).energy_hartree for w in range(0, 7)]
    assert all(b <= a + 1e-12 for a, b in zip(energies, energies[1:]))
    assert energies[-1] > LI_PLUS_EXACT


def test_virial_ratio_at_optimum():
    for family, options in (("screened", None), ("open-shell", None),
                            ("hylleraas", {"coordinates": "stu", "terms": HYLLERAAS_3})):
        r = twoel.solve(2, family=family, options=options)
        assert r.virial_ratio == pytest.approx(2.0, abs=1e-6), family


def test_hydrogenic_limit_without_repulsion():
    # with 1/r12 switched off the exact energy is -Z² (two hydrogenic 1s electrons)
    from twoel.basis import get_family
    from twoel.solver.eigen import solve_generalized
    from twoel.system import GROUND, Ion

    fam = get_family("hylleraas")
    basis = fam.build(Ion(3), GROUND, 4, {"alpha": 3.0}, {})
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(3, repulsion_scale=0.0), m.overlap)
    assert eig.values[0] == pytest.approx(-9.0, abs=1e-12)


def test_non_integer_charge_is_a_model_with_a_note():
    r = twoel.solve(1.5, family="screened")
    assert r.ion == "Z=1.5" and r.reference is None
    assert any("model" in n for n in r.notes)


def test_triplet_hylleraas_two_exponents_gives_a_bound_2_3S():
    # 2^3S of He lies at -2.175229378 (Drake 2006 handbook, from memory); HUM upper bound
    r = twoel.solve(2, "2^3S", family="hylleraas", size=5, options={"exponents": 2})
    assert r.bound and -2.1753 < r.energy_hartree < -2.17
    assert r.energy_hartree > -2.175229378236791


def test_matrices_are_symmetric_and_overlap_positive():
    from twoel.basis import get_family
    from twoel.system import GROUND, Ion

    basis = get_family("hylleraas").build(Ion(2), GROUND, 5, {"alpha": 1.9, "beta": 2.3}, {"exponents": 2})
    m = basis.matrices()
    for mat in (m.overlap, m.kinetic, m.nuclear, m.repulsion):
        assert np.allclose(mat, mat.T, rtol=0, atol=1e-14 * np.abs(mat).max())
    d = 1 / np.sqrt(np.diag(m.overlap))
    assert np.linalg.eigvalsh(m.overlap * np.outer(d, d)).min() > -1e-12


def test_bad_inputs_raise_clear_errors():
    with pytest.raises(InputError, match="Z"):
        twoel.solve(0)
    with pytest.raises(InputError, match="Z"):
        twoel.solve("xyz")
    with pytest.raises(InputError, match="family"):
        twoel.solve(2, family="nonsense")
    with pytest.raises(InputError, match="size"):
        twoel.solve(2, family="hylleraas", size=500)
    with pytest.raises(InputError, match="state"):
        twoel.solve(2, state="banana")
    with pytest.raises(UnsupportedError):
        twoel.solve(2, state="2^1S", family="screened")
    with pytest.raises(InputError, match="parameter"):
        twoel.solve(2, family="screened", parameters={"zeta": -1.0})
    with pytest.raises(InputError, match="option"):
        twoel.solve(2, family="hylleraas", options={"nonsense": 1})
