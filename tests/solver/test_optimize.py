"""The one nonlinear search (twoel.solver.optimize) on energies with closed-form optima.

* One 1s exponent ζ for both electrons of He: E(ζ) = ζ² - 2Zζ + 5ζ/8, optimum ζ = Z - 5/16 and
  E = -(Z - 5/16)² (common practice: the screened-charge function of every textbook).
* Two independent hydrogenic 1s electrons, E = Σ (ζ_i²/2 - Z_i ζ_i): optimum ζ_i = Z_i,
  E = -Σ Z_i²/2 (hydrogen atom, exact).
* Virial theorem: for E(λζ) = λ²T - λ|V| the best scale is λ = -V/(2T) (Fock, Z. Phys. 63, 855
  (1930)), so one rescaling of any ζ lands on the optimum exactly.
"""

import math

import pytest

from twoel.basis.base import Parameter
from twoel.errors import ConvergenceError, InputError
from twoel.solver.optimize import minimize_energy, minimize_nonlinear, virial_scale

Z = 2.0


def screened(values):
    zeta = values[0]
    kinetic, potential = zeta**2, -2 * Z * zeta + 5 * zeta / 8
    return kinetic + potential, (kinetic, potential)


def test_brent_finds_the_screened_charge():
    opt = minimize_nonlinear(screened, [(1.0,)], encode=lambda v: [math.log(v[0])],
                             decode=lambda x: (math.exp(x[0]),), screen_starts=False,
                             scalar_bounds=(math.log(0.1), math.log(10.0)))
    assert opt.method == "brent-bounded"
    assert opt.values[0] == pytest.approx(Z - 5 / 16, rel=1e-8)
    assert opt.energy == pytest.approx(-(Z - 5 / 16) ** 2, abs=1e-14)


def test_virial_rescaling_lands_on_the_optimum_after_a_poor_search():
    common = dict(encode=lambda v: [math.log(v[0])], decode=lambda x: (math.exp(x[0]),),
                  screen_starts=False, scalar_bounds=(math.log(0.1), math.log(10.0)),
                  scalar_max_iterations=2)
    poor = minimize_nonlinear(screened, [(1.0,)], **common)
    assert abs(poor.values[0] - (Z - 5 / 16)) > 1e-3            # the search alone is far off
    opt = minimize_nonlinear(screened, [(1.0,)], virial=lambda tv: virial_scale(*tv), **common)
    assert opt.virial_steps >= 1
    assert opt.values[0] == pytest.approx(Z - 5 / 16, rel=1e-14)
    assert opt.energy == pytest.approx(-(Z - 5 / 16) ** 2, rel=1e-15)


def two_hydrogens(values):
    a, b = values
    if a > 50:
        raise InputError("test: refused point")  # failed points never become the best
    return a * a / 2 - 1.0 * a + b * b / 2 - 2.0 * b


@pytest.mark.parametrize("outside", ["penalty", "clip"])
def test_nelder_mead_two_hydrogenic_exponents(outside):
    opt = minimize_nonlinear(two_hydrogens, [(0.3, 5.0), (60.0, 1.0), (0.7, 1.5)],
                             encode=lambda v: [math.log(x) for x in v],
                             decode=lambda x: tuple(math.exp(t) for t in x),
                             lower=(-5.0, -5.0), upper=(5.0, 5.0), outside=outside,
                             xatol=1e-10, fatol=1e-15)
    assert opt.method == "nelder-mead"
    assert opt.initial == (0.7, 1.5)                               # the lowest screened start
    assert opt.values == pytest.approx((1.0, 2.0), rel=1e-6)
    assert opt.energy == pytest.approx(-0.5 - 2.0, abs=1e-12)


def test_no_finite_energy_is_a_clear_error():
    def never(values):
        raise InputError("test: every point fails")

    with pytest.raises(ConvergenceError):
        minimize_nonlinear(never, [(1.0, 1.0)], encode=lambda v: list(v), decode=tuple,
                           max_evaluations=20)


def test_minimize_energy_on_named_parameters():
    params = [Parameter("zeta_1", 0.5, 1e-3, 1e3), Parameter("zeta_2", 3.0, 1e-3, 1e3)]
    seen = []

    def energy(v):
        return v["zeta_1"] ** 2 / 2 - v["zeta_1"] + v["zeta_2"] ** 2 / 2 - 2 * v["zeta_2"]

    values, best, record = minimize_energy(energy, params, progress=lambda n, e: seen.append(n),
                                           tolerance=1e-15)
    assert values["zeta_1"] == pytest.approx(1.0, rel=1e-6)
    assert values["zeta_2"] == pytest.approx(2.0, rel=1e-6)
    assert best == pytest.approx(-2.5, abs=1e-12)
    assert record.initial == pytest.approx({"zeta_1": 0.5, "zeta_2": 3.0}, rel=1e-15)
    assert record.final == values
    assert seen == list(range(1, record.n_evaluations + 1))
