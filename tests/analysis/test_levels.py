"""Quantum defects, their propagated uncertainties and Ritz fits (twoel.analysis.levels)."""

from __future__ import annotations

import numpy as np
import pytest

from twoel.analysis import levels as lv
from twoel.errors import InputError
from twoel.reference import lookup


@pytest.mark.parametrize("Z", [2.0, 3.0, 2.5, 10.0])
def test_hydrogenic_energy_gives_back_its_defect(Z):
    n = np.arange(2, 9)
    delta = np.linspace(-0.05, 0.4, n.size)
    zeta, threshold = Z - 1.0, -0.5 * Z**2
    energy = lv.rydberg_energy(n, delta, threshold, zeta)
    got, _ = lv.quantum_defect(n, energy, threshold, zeta)
    np.testing.assert_allclose(got, delta, rtol=0, atol=1e-12 * Z**2)
    np.testing.assert_allclose(lv.effective_n(energy, threshold, zeta), n - delta, rtol=1e-13)


def test_defect_uncertainty_is_the_closed_form_and_the_derivative():
    n, zeta, threshold, sigma_e = 4, 1.0, -2.0, 1e-7
    energy = float(lv.rydberg_energy(n, 0.14, threshold, zeta))
    _, sigma = lv.quantum_defect([n], [energy], threshold, zeta, [sigma_e])
    n_star = n - 0.14
    # closed form: σ_δ = n*³ σ_E / ζ² = n* σ_E / (2 (E_th − E))
    assert sigma[0] == pytest.approx(n_star**3 * sigma_e / zeta**2, rel=1e-12)
    assert sigma[0] == pytest.approx(n_star * sigma_e / (2 * (threshold - energy)), rel=1e-12)
    h = 1e-7
    up, _ = lv.quantum_defect([n], [energy + h], threshold, zeta)
    down, _ = lv.quantum_defect([n], [energy - h], threshold, zeta)
    assert abs(up[0] - down[0]) / (2 * h) * sigma_e == pytest.approx(sigma[0], rel=1e-6)


def test_no_defect_without_a_coulomb_tail_and_above_threshold():
    with pytest.raises(InputError):
        lv.quantum_defect([1], [-0.52], -0.5, 0.0)
    delta, sigma = lv.quantum_defect([2], [-1.9], -2.0, 1.0, [1e-6])  # above E_th: not bound
    assert np.isnan(delta[0]) and np.isnan(sigma[0])


def test_ritz_fit_recovers_exact_coefficients():
    n = np.arange(2, 9)
    truth = (0.1397, 0.0276, 0.0186)
    delta = lv.ritz_defect(n, *truth)
    fit = lv.fit_ritz(n, delta, np.full(n.size, 1e-9), L=0, multiplicity=1)
    assert [fit.coefficients[k] for k in lv.RITZ_TERMS] == pytest.approx(truth, abs=1e-9)
    assert fit.dof == 4 and fit.chi2 < 1e-6 and fit.exceeds_bars is False
    assert fit.series == "^1S" and max(abs(r) for r in fit.residuals) < 1e-12


def test_ritz_fit_keeps_fewer_terms_than_points():
    n = np.array([2, 3, 4])
    delta = lv.ritz_defect(n, 0.0687, -0.024)
    fit = lv.fit_ritz(n, delta, [1e-8] * 3, L=1, multiplicity=3)
    assert list(fit.coefficients) == ["delta_0", "delta_2"] and fit.dof == 1
    assert fit.coefficients["delta_0"] == pytest.approx(0.0687, abs=1e-9)
    with pytest.raises(InputError):
        lv.fit_ritz([2, 3], [0.1, 0.1], [1e-3, 1e-3])
    with pytest.raises(InputError):
        lv.fit_ritz(n, delta, terms=3)


def test_ritz_fit_flags_residuals_beyond_the_bars():
    n = np.arange(2, 8)
    delta = lv.ritz_defect(n, 0.14, 0.03, 0.0) + 1e-4 * np.array([1, -1, 1, -1, 1, -1])
    fit = lv.fit_ritz(n, delta, np.full(n.size, 1e-6))
    assert fit.exceeds_bars is True and fit.chi2_per_dof > 100
    assert "scaled" in fit.note
    unweighted = lv.fit_ritz(n, delta)  # no bars: no χ², no verdict
    assert unweighted.chi2 is None and unweighted.exceeds_bars is None and not unweighted.weighted


def _reference_defects(multiplicity: int, letter: str, ns):
    """(n, δ, σ_δ) of He from the tabulated reference energies."""
    points = []
    for n in ns:
        ref = lookup(2, f"{n}^{multiplicity}{letter}")
        if ref is not None:
            d, s = lv.quantum_defect([n], [ref.value], -2.0, 1.0, [ref.uncertainty])
            points.append((n, float(d[0]), float(s[0])))
    return points


#: Rydberg-limit quantum defects δ₀ of He (G. W. F. Drake, Springer Handbook of Atomic, Molecular
#: and Optical Physics (2006), ch. 11; from memory)
DRAKE_LIMITS = {(1, "S"): 0.140, (3, "S"): 0.297, (1, "P"): -0.012, (3, "P"): 0.068,
                (1, "D"): 0.002, (3, "D"): 0.003}


@pytest.mark.parametrize("series", list(DRAKE_LIMITS))
def test_defects_of_the_reference_energies_approach_the_known_limits(series):
    points = _reference_defects(*series, range(1 + "SPD".index(series[1]) + 1, 6))
    n, delta, _ = points[-1]  # n = 5 (4 for ³P, the highest tabulated)
    assert n >= 4
    assert abs(delta - DRAKE_LIMITS[series]) < 3e-3
    if len(points) >= lv.MIN_FIT_POINTS:
        ns, ds, ss = zip(*[p for p in points if p[0] >= 2])
        fit = lv.fit_ritz(ns, ds, ss)
        assert abs(fit.coefficients["delta_0"] - DRAKE_LIMITS[series]) < 1.5e-3
        # energies good to 1e-15 Eh: a three-term expansion cannot follow them, and says so
        assert fit.exceeds_bars is True


def test_level_states_are_bounded_before_expanding():
    states = lv.level_states(3, 1)
    labels = [s.label for s in states]
    assert labels == ["1^1S", "2^1S", "3^1S", "2^3S", "3^3S", "2^1P", "3^1P", "2^3P", "3^3P"]
    assert [s.label for s in lv.level_states(2, 3)] == ["1^1S", "2^1S", "2^3S", "2^1P", "2^3P"]
    for n_max, L_max in ((0, 0), (lv.MAX_N + 1, 0), (10**9, 1), (3, lv.MAX_L + 1), (3, -1), (2.5, 1), (True, 0)):
        with pytest.raises(InputError):
            lv.level_states(n_max, L_max)


def test_compute_levels_keeps_refused_states_as_not_available():
    table = lv.compute_levels(2, 2, 1, family="hylleraas", size=2)
    status = {level.state: level.status for level in table.levels}
    assert status["2^1P"] == status["2^3P"] == lv.NOT_AVAILABLE
    assert all(lv.NOT_AVAILABLE_TEXT in level.message for level in table.levels
               if level.status == lv.NOT_AVAILABLE)
    assert status["1^1S"] == lv.COMPUTED
    ground = next(level for level in table.levels if level.state == "1^1S")
    assert ground.ionization_energy_hartree == pytest.approx(-2.0 - ground.energy_hartree)
    assert table.provenance["version"] and table.provenance["scipy"]


def test_hydride_has_no_quantum_defect():
    table = lv.compute_levels(1, 1, 0, size=40)
    (level,) = table.levels
    assert level.status == lv.COMPUTED and level.quantum_defect is None
    assert table.fits == () and lv.NO_DEFECT_NOTE in table.notes
