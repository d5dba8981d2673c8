"""Double-double and fixed-point kernels, mixed and extended refinement, precision options."""

import math
from fractions import Fraction

import mpmath
import numpy as np
import pytest

import twoel
from twoel.solver import refine as precision
from twoel.basis import get_family
from twoel.errors import InputError, UnsupportedError
from twoel.integrals import precise
from twoel.integrals.doubledouble import DD, dd_dot, two_prod, two_sum
from twoel.system import Ion, State

# C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)
HE_GROUND = "-2.903724377034119598311159245194404"
#: basis size at which the stored He boxes give 18 digits in extended precision
HE_EIGHTEEN_DIGIT_SIZE = 2263


def test_error_free_transformations_are_exact():
    rng = np.random.default_rng(0)
    a, b = rng.normal(size=50) * 1e3, rng.normal(size=50)
    s, e = two_sum(a, b)
    p, f = two_prod(a, b)
    for k in range(50):
        assert Fraction(s[k]) + Fraction(e[k]) == Fraction(a[k]) + Fraction(b[k])
        assert Fraction(p[k]) + Fraction(f[k]) == Fraction(a[k]) * Fraction(b[k])


def test_double_double_reciprocal_and_dot():
    x = DD(np.array([3.0, 0.7, 123.456]))
    r = x.reciprocal()
    with mpmath.workdps(50):
        for k, v in enumerate([3.0, 0.7, 123.456]):
            exact = 1 / mpmath.mpf(v)
            got = mpmath.mpf(float(r.hi[k])) + mpmath.mpf(float(r.lo[k]))
            assert abs(got - exact) / exact < 1e-30
    v = DD(np.array([1e16, 1.0, -1e16]))
    one = dd_dot(v, DD(np.ones(3)))
    assert float(one.to_float()) == 1.0  # cancellation survives in double-double


def _basis(N, sign, seed=1):
    fam = get_family("exponential")
    ion = Ion(2)
    state = State.parse("1^1S" if sign > 0 else "2^3S")
    values = {p.name: p.initial for p in fam.parameters(ion, state, N, {})}
    return fam.build(ion, state, N, values, {}), ion, state


@pytest.mark.parametrize("sign", [1, -1])
def test_float64_double_double_and_fixed_point_kernels_agree(sign):
    from flint import arb, ctx

    basis, _ion, _state = _basis(16, sign)
    m = basis.matrices()
    dd = precise.dd_matrices(basis.exponents, sign)
    old = ctx.prec
    ctx.prec = 200
    try:
        exact = precise.arb_matrices(basis.exponents, sign, 200)
        for name in precise.NAMES:
            ref = getattr(m, name)
            scale = np.max(np.abs(ref))
            assert np.max(np.abs(dd[name].to_float() - ref)) <= 1e-13 * scale
            worst = 0.0
            for i in range(0, 16, 3):
                for j in range(0, 16, 2):
                    diff = exact[name][i, j] - arb(float(dd[name].hi[i, j])) - arb(float(dd[name].lo[i, j]))
                    worst = max(worst, abs(float(diff.mid())) / scale)
            assert worst < 1e-29, name
    finally:
        ctx.prec = old


def test_mixed_and_extended_refinements_agree():
    from twoel.solver.eigen import solve_generalized

    basis, ion, state = _basis(80, 1)
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(2.0), m.overlap)
    mixed = precision.mixed_refine(basis.exponents, 1, 2.0, eig, 0)
    ext = precision.extended_refine(basis.exponents, 1, 2.0, mixed.energy_hartree, mixed.vector, 24, 16)
    with mpmath.workdps(40):
        diff = abs(mpmath.mpf(mixed.text) - mpmath.mpf(ext.text))
        assert float(diff) <= max(mixed.numerical_error_hartree, 1e-22)
        # both are upper bounds of the exact energy (Rayleigh-Ritz)
        assert mpmath.mpf(ext.text) > mpmath.mpf(HE_GROUND)
    assert ext.numerical_error_hartree < 1e-23
    # the refined energy is below (better than) the plain float64 one, which dropped directions
    assert mixed.energy_hartree <= eig.values[0] + 1e-15


def test_truncate_text():
    assert precision.truncate_text("-2.90372437703411959831", 3e-16) == "-2.9037243770341196"
    assert precision.truncate_text("-0.52775101654", 2e-6) == "-0.527751"


def test_precision_options_are_checked():
    with pytest.raises(InputError, match="precision"):
        twoel.solve(2, family="exponential", size=20, precision="quad")
    with pytest.raises(InputError, match="digits"):
        twoel.solve(2, family="exponential", size=20, digits=20)
    with pytest.raises(InputError, match="digits"):
        twoel.solve(2, family="exponential", size=20, precision="extended", digits=2)
    with pytest.raises(UnsupportedError, match="exponential"):
        twoel.solve(2, family="hylleraas", size=2, precision="extended")


def test_extended_solve_fills_text_and_error_bar():
    r = twoel.solve(2, "1^1S", "exponential", 60, precision="extended", digits=20)
    assert isinstance(r.energy_hartree_text, str)
    assert r.error_bar_hartree is not None and r.error_bar_hartree > 0
    with mpmath.workdps(40):
        true_error = mpmath.mpf(r.provenance["energy_full_text"]) - mpmath.mpf(HE_GROUND)
        assert 0 < true_error < r.error_bar_hartree  # honest bar for the upper bound


@pytest.mark.slow
def test_helium_extended_fourteen_digits():
    r = twoel.solve(2, "1^1S", "exponential", 800, precision="extended", digits=20, error_bar=False)
    with mpmath.workdps(40):
        err = float(mpmath.mpf(r.provenance["energy_full_text"]) - mpmath.mpf(HE_GROUND))
    assert 0 < err < 2.9e-14  # >= 14 significant digits


def test_error_bar_companions_follow_the_digit_target():
    """When the mixed step cannot vouch for the digit target, the smaller bases of the error bar
    are refined in extended precision too (their texts carry more digits than the mixed 32)."""
    r = twoel.solve(2, "1^1S", "exponential", 40, precision="extended", digits=34)
    bar = r.provenance["error_bar"]
    assert bar["sizes"] == [14, 20, 28, 40]
    assert all(len(t.lstrip("-").replace(".", "")) > 33 for t in bar["energy_texts"])
    with mpmath.workdps(60):
        true_error = mpmath.mpf(r.provenance["energy_full_text"]) - mpmath.mpf(HE_GROUND)
        assert 0 < true_error < r.error_bar_hartree


def test_long_steps_are_announced():
    stages = []
    twoel.solve(2, "1^1S", "exponential", 40, precision="extended", digits=34, on_stage=stages.append)
    assert stages[0].startswith("float64 build and solve (exponential, size 40")
    assert any(s.startswith("extended precision, N = 40") for s in stages)
    assert [s for s in stages if s.startswith("error bar")] == ["error bar: smaller basis N = 14",
                                                                 "error bar: smaller basis N = 20",
                                                                 "error bar: smaller basis N = 28"]


def test_mixed_step_measures_the_lost_digits():
    """The 128-bit step reports how many digits its arithmetic lost (arb radius over one ulp);
    the extended precision starts from it.  A larger, more ill-conditioned basis loses more."""
    small = twoel.solve(2, "1^1S", "exponential", 30).provenance["refinement"]["lost_digits"]
    large = twoel.solve(2, "1^1S", "exponential", 300).provenance["refinement"]["lost_digits"]
    assert 0 < small < large < 38


@pytest.mark.slow
def test_helium_extended_eighteen_digits():
    """He 1¹S to >= 18 significant digits with the stored boxes (one command, a few minutes);
    the error bar from the nested bases N/2, N/√2 contains the true error and is < 100x it."""
    from twoel.analysis.convergence import trusted_digits

    r = twoel.solve(2, "1^1S", "exponential", HE_EIGHTEEN_DIGIT_SIZE, precision="extended",
                    digits=20)
    with mpmath.workdps(40):
        err = float(mpmath.mpf(r.provenance["energy_full_text"]) - mpmath.mpf(HE_GROUND))
    assert 0 < err < 2.9e-18  # >= 18 significant digits (|E| = 2.9037 Eh)
    assert err < r.error_bar_hartree < 100 * err
    assert trusted_digits(r.energy_hartree, r.error_bar_hartree) >= 18  # measured: 18, bar 39x the error


def test_clear_errors_for_unservable_requests():
    from twoel.cli import main
    from twoel.errors import ResourceError

    with pytest.raises(ResourceError, match="extended precision is limited"):
        twoel.solve(2, family="exponential", size=2600, precision="extended")
    assert main(["energy", "--Z", "2", "--family", "exponential", "--digits", "20"]) == 2


def test_optimize_keeps_the_starting_edges_when_they_are_lower(monkeypatch):
    """The optimizer sees only the float64 energy; if its edges refine to a higher energy than
    the starting (stored) ones, the variational principle keeps the starting ones and says so."""
    from twoel.solver import pipeline
    from twoel.solver.optimize import OptimizationRecord

    def poor_optimizer(energy, params, progress=None, **_):
        # a deliberately poor point that the virial rescaling cannot undo (one box moved)
        values = {p.name: p.initial * (1.5 if p.name.startswith("box1_") else 1.0) for p in params}
        return values, energy(values), OptimizationRecord("test", 1, True, "", {}, values)

    monkeypatch.setattr(pipeline, "minimize_energy", poor_optimizer)
    stored = twoel.solve(2, "1^1S", "exponential", 60, error_bar=False)
    r = twoel.solve(2, "1^1S", "exponential", 60, optimize=True, error_bar=False)
    assert r.energy_hartree == stored.energy_hartree
    assert r.parameters == stored.parameters
    assert any("starting edges are kept" in w for w in r.warnings)
    assert r.optimizer["kept_start"] is True


def test_virial_ratio_describes_the_refined_vector():
    """-<V>/<T> = 2 for the exact state (virial theorem, exact); the refined vector's ratio is
    reported (the float64 start's is ~1e-8 off at N = 800 in its last digits)."""
    import warnings

    import twoel

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        r = twoel.solve(2, "1^1S", family="exponential", size=300)
    assert abs(r.virial_ratio - 2.0) < 1e-10
    assert r.kinetic_hartree == pytest.approx(-r.energy_hartree, rel=1e-10)  # T = -E for the exact state


def test_digit_target_chooses_the_size_or_refuses_before_the_run():
    """--digits without --size picks the smallest stored size whose measured error (against
    Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)) leaves that many digits; beyond the stored
    sizes it refuses; a too small --size is said before the run."""
    import warnings

    from twoel.basis import get_family
    from twoel.errors import AccuracyWarning, ResourceError
    from twoel.solver import pipeline
    from twoel.system import Ion, State

    fam, he, ground = get_family("exponential"), Ion(2), State.parse("1^1S")
    assert pipeline._size_for_digits(fam, he, ground, 14, None, 600) == 800
    assert pipeline._size_for_digits(fam, he, ground, 18, None, 600) == 2263
    with pytest.raises(ResourceError, match="about 18 digits"):
        pipeline._size_for_digits(fam, he, ground, 20, None, 600)
    with pytest.warns(AccuracyWarning, match="about 15 digits.*the basis, not the arithmetic"):
        pipeline._size_for_digits(fam, he, ground, 20, 800, 800)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        pipeline._size_for_digits(fam, he, ground, 12, 800, 800)  # enough: no warning
