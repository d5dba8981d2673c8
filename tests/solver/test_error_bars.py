"""Error bars of single solves: the four-size nested tail and the mixed step's rounding estimate,
checked for coverage against published values."""

import math
from types import SimpleNamespace

import mpmath
import pytest

import twoel
from twoel.basis import get_family
from twoel.errors import InputError
from twoel.solver.error_bar import (NESTED_BAR_FACTOR, estimate_nested_tail, four_size_error_bar_sizes,
                                    nested_error_bar)

# C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)
HE_GROUND = "-2.903724377034119598311159245194404"
# H. Nakashima and H. Nakatsuji, J. Chem. Phys. 127, 224104 (2007) (from memory)
H_MINUS = "-0.5277510165443771965908"
LI_PLUS = "-7.2799134126693059649"
# G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11 (from memory)
HE_2_1S = "-2.145974046054417"
HE_2_3S = "-2.175229378236791"


def _true_error(result, reference: str) -> float:
    with mpmath.workdps(50):
        return float(mpmath.mpf(result.energy_full_text) - mpmath.mpf(reference))


def test_geometric_sequence_gives_the_measured_tail():
    exact, q = -1.0, 0.1
    energies = [exact + 1e-3 * q ** k for k in range(4)]
    est = estimate_nested_tail(energies)
    true_error = energies[-1] - exact
    assert est.ratio == pytest.approx(q)
    assert est.tail_hartree == pytest.approx(true_error, rel=1e-9)  # no 1/3 floor any more
    assert est.variational_bar_hartree == pytest.approx(NESTED_BAR_FACTOR * true_error, rel=1e-9)
    assert est.reliable


def test_the_slower_of_two_ratios_sets_the_tail():
    # steps 1e-3, 1e-5 (ratio 0.01, fast by accident), 1e-6 (ratio 0.1)
    energies = [-1.0, -1.001, -1.00101, -1.001011]
    est = estimate_nested_tail(energies)
    assert est.ratio == pytest.approx(0.1, rel=1e-6)
    assert est.tail_hartree == pytest.approx(1e-6 * 0.1 / 0.9, rel=1e-6)


def test_rising_or_stalling_sequences_are_flagged():
    assert not estimate_nested_tail([-1.0, -1.1, -1.15, -1.12]).reliable
    slowing = estimate_nested_tail([-1.0, -1.1, -1.11, -1.13])  # the last step grows
    assert not slowing.reliable and "not well below 1" in slowing.note
    with pytest.raises(InputError):
        estimate_nested_tail([-1.0, -1.1, -1.11])


def test_exponential_family_declares_four_nested_sizes():
    assert four_size_error_bar_sizes(200) == [71, 100, 141]
    assert four_size_error_bar_sizes(1600) == [566, 800, 1131]
    assert get_family("exponential").nested_sizes(600) == [212, 300, 424]
    assert get_family("hylleraas").nested_sizes(8) == [6, 7]  # unchanged: three sizes, old rule


def _energy(text, error, statistical):
    return SimpleNamespace(text=text, numerical_error_hartree=error,
                           arithmetic={"error_hartree": error} if statistical else {})


def test_a_bar_set_by_the_statistical_rounding_estimate_is_not_reliable():
    """When the mixed step's rounding estimate (not a bound) sets the bar, the bar says so."""
    texts = ["-2.90372437700", "-2.90372437703", "-2.903724377034", "-2.9037243770341"]
    smaller = {n: _energy(t, 1e-13, True) for n, t in zip((566, 800, 1131), texts)}
    bar = nested_error_bar(smaller.__getitem__, 1600, _energy(texts[-1], 1e-13, True), [566, 800, 1131])
    assert not bar["reliable"] and "statistically" in bar["note"]
    assert bar["error_bar_hartree"] >= 1e-13
    # the same numbers with a rigorous arithmetic bound (arb radius) stay reliable
    smaller = {n: _energy(t, 1e-13, False) for n, t in zip((566, 800, 1131), texts)}
    bar = nested_error_bar(smaller.__getitem__, 1600, _energy(texts[-1], 1e-13, False), [566, 800, 1131])
    assert bar["reliable"] and "arithmetic error" in bar["note"]


@pytest.mark.parametrize("Z, state, size, reference", [
    (2, "1^1S", 200, HE_GROUND),
    (1, "1^1S", 200, H_MINUS),
    (3, "1^1S", 200, LI_PLUS),
    (2, "1^1S", 400, HE_GROUND),
    (2, "2^1S", 200, HE_2_1S),
    (2, "2^1S", 400, HE_2_1S),
    (2, "2^3S", 200, HE_2_3S),
])
def test_nested_bar_covers_the_published_value_within_thirty(Z, state, size, reference):
    """1 <= bar / true error <= 30 where the tail sets the bar (the 1/3 floor made these 31-149),
    or the bar covers and says it is unreliable (a sharply slowing sequence)."""
    r = twoel.solve(Z, state, "exponential", size)
    error = _true_error(r, reference)
    assert r.provenance["error_bar"]["sizes"] == four_size_error_bar_sizes(size) + [size]
    assert 0 < error <= r.error_bar_hartree
    if r.reliable:
        assert r.error_bar_hartree <= 30 * error
    else:
        assert "slowing" in r.provenance["error_bar"]["note"]


def test_rounding_estimate_covers_the_extended_energy_of_the_same_basis():
    """The mixed step's matrix-rounding estimate is at or above its actual deviation from the
    extended-precision energy of the same basis (He 1¹S, N = 300)."""
    mixed = twoel.solve(2, "1^1S", "exponential", 300, error_bar=False)
    extended = twoel.solve(2, "1^1S", "exponential", 300, precision="extended", digits=24, error_bar=False)
    arithmetic = mixed.provenance["refinement"]["arithmetic"]
    assert arithmetic["samples"] > 0 and 0 < arithmetic["relative_errors"][0] < 2.0 ** -100
    assert arithmetic["error_hartree"] == min(3 * arithmetic["sigma_hartree"], arithmetic["law_hartree"])
    with mpmath.workdps(50):
        deviation = abs(float(mpmath.mpf(mixed.energy_full_text) - mpmath.mpf(extended.energy_full_text)))
    assert deviation <= mixed.provenance["numerical_error_hartree"]


@pytest.mark.slow
@pytest.mark.parametrize("Z, size, reference", [(2, 800, HE_GROUND), (3, 1200, LI_PLUS), (2, 1131, HE_GROUND)])
def test_rounding_estimate_covers_large_bases(Z, size, reference):
    """Where the rounding matters (He N = 800: 4.3e-16 Eh, Li⁺ N = 1200: 1.5e-17 Eh, He N = 1131:
    1.5e-17 Eh), the estimate covers the deviation from the extended-precision energy, and the
    extended energy is closer to the published value (Schwartz 2006; Nakashima & Nakatsuji 2007)."""
    mixed = twoel.solve(Z, "1^1S", "exponential", size, error_bar=False)
    extended = twoel.solve(Z, "1^1S", "exponential", size, precision="extended", digits=22, error_bar=False)
    with mpmath.workdps(50):
        deviation = abs(float(mpmath.mpf(mixed.energy_full_text) - mpmath.mpf(extended.energy_full_text)))
    assert 1e-18 < deviation <= mixed.provenance["numerical_error_hartree"] <= 100 * deviation
    assert 0 < _true_error(extended, reference)


@pytest.mark.slow
def test_helium_1600_float64_bar_is_flagged_and_covers():
    """At N = 1600 the mixed step's rounding estimate sets the bar: it covers the error against
    Schwartz (2006) and says reliable: false; in extended precision the bar is reliable and within 30."""
    r = twoel.solve(2, "1^1S", "exponential", 1600)
    error = _true_error(r, HE_GROUND)
    assert 0 < error <= r.error_bar_hartree
    assert r.reliable is False and "statistically" in r.provenance["error_bar"]["note"]
    assert math.isfinite(r.error_bar_hartree)


def test_a_fast_ratio_that_jumps_up_is_floored_and_flagged():
    """Steps 6e-6, 2.3e-8, 5.9e-10 (ratios 0.004, 0.026: the nested He 5¹P sequence at
    N = 212..600) slow down sharply; the geometric tail of the last ratio would be ~1.5e-11 Eh
    while the remaining error was 1.8e-10 Eh.  After a rise by more than 4x the ratio is taken
    as 0.1 and the bar flagged."""
    from twoel.solver.error_bar import SLOWING_FLOOR

    energies = [-2.0, -2.0 - 6.05e-6, -2.0 - 6.05e-6 - 2.29e-8, -2.0 - 6.05e-6 - 2.29e-8 - 5.86e-10]
    est = estimate_nested_tail(energies)
    assert est.reliable is False and "slowing" in est.note
    assert est.ratio == SLOWING_FLOOR
    assert est.variational_bar_hartree > 1.8e-10
    # a steady fast sequence keeps its measured ratio and stays reliable
    steady = estimate_nested_tail([-2.0, -2.0 - 1e-6, -2.0 - 1.02e-6, -2.0 - 1.0204e-6])
    assert steady.reliable and abs(steady.ratio - 0.02) < 1e-6


def test_a_fast_ratio_that_rises_is_extrapolated_one_step():
    """He 2³P at N = 71..200 (tuned boxes): steps 6.2e-4, 2.4e-6, 2.5e-8 (ratios 0.0039,
    0.0105); the remaining error was 1.25e-9 Eh, above the bar 9.4e-10 of the last ratio.  The
    next ratio is taken as q2·sqrt(q2/q1) = 0.017: the bar covers, and a rise below 3x stays
    reliable."""
    d = (6.165e-4, 2.4017e-6, 2.5237e-8)
    energies = [-2.1325451585, -2.1325451585 - d[0], -2.1325451585 - d[0] - d[1],
                -2.1325451585 - d[0] - d[1] - d[2]]
    est = estimate_nested_tail(energies)
    q1, q2 = d[1] / d[0], d[2] / d[1]
    assert est.ratio == pytest.approx(q2 * (q2 / q1) ** 0.5, rel=1e-6)
    assert est.variational_bar_hartree > 1.25e-9 and est.reliable and "slowing" in est.note


def test_a_basis_tuned_inside_the_nested_sizes_keeps_the_ratio_floor():
    """He 4³P with boxes tuned at N = 500 on the refined energy, solved at N = 600 (nested
    212..600): steps 3.2e-8, 5.3e-10, 1.4e-12 (ratios 0.017, 0.003) against a remaining error of
    6.1e-13 Eh.  With the tuning size inside the nested range the ratio is at least 1/3."""
    from twoel.solver.error_bar import MIN_RATIO, nested_error_bar

    class Energy:
        def __init__(self, value):
            self.text, self.numerical_error_hartree, self.arithmetic = repr(value), 0.0, {}

    d = (3.206e-8, 5.305e-10, 1.436e-12)
    values = {212: -2.0323243, 300: -2.0323243 - d[0], 424: -2.0323243 - d[0] - d[1]}
    last = Energy(values[424] - d[2])
    plain = nested_error_bar(lambda n: Energy(values[n]), 600, last, [212, 300, 424])
    guarded = nested_error_bar(lambda n: Energy(values[n]), 600, last, [212, 300, 424], tuned_at=500)
    assert plain["error_bar_hartree"] < 6.1e-13 <= guarded["error_bar_hartree"]
    assert guarded["ratio"] == pytest.approx(MIN_RATIO) and "tuned at N = 500" in guarded["note"]
    assert guarded["reliable"] is False
    outside = nested_error_bar(lambda n: Energy(values[n]), 600, last, [212, 300, 424], tuned_at=200)
    assert outside["error_bar_hartree"] == plain["error_bar_hartree"]
