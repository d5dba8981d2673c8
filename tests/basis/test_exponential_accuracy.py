"""Long accuracy checks of the exponential family against published energies (``-m slow``)."""

import mpmath
import pytest

import twoel
from twoel.reference import lookup


def _error(result, reference_text):
    with mpmath.workdps(40):
        return float(mpmath.mpf(result.provenance["energy_full_text"]) - mpmath.mpf(reference_text))


@pytest.mark.slow
@pytest.mark.parametrize("Z", range(1, 11))
def test_ground_states_twelve_digits(Z):
    # H. Nakashima and H. Nakatsuji, J. Chem. Phys. 127, 224104 (2007) (Z != 2, from memory);
    # C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006) (Z = 2)
    ref = lookup(Z, "1^1S")
    r = twoel.solve(Z, "1^1S", "exponential", 500, error_bar=False)
    err = _error(r, ref.value_text)
    assert 0 < err < 0.5e-12 * abs(ref.value)  # variational, and 12 significant digits


@pytest.mark.slow
@pytest.mark.parametrize("Z", [1, 3])
def test_h_minus_and_li_plus_thirteen_digits(Z):
    # Nakashima & Nakatsuji (2007), from memory
    ref = lookup(Z, "1^1S")
    r = twoel.solve(Z, "1^1S", "exponential", 700, error_bar=False)
    err = _error(r, ref.value_text)
    assert 0 < err < 0.5e-13 * abs(ref.value)


@pytest.mark.slow
def test_helium_2_3S_twelve_digits():
    # G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11,
    # from memory
    r = twoel.solve(2, "2^3S", "exponential", 400, error_bar=False)
    err = _error(r, "-2.175229378236791")
    assert abs(err) < 0.5e-12 * 2.1752  # 12 digits (the reference itself has 16)
    assert err > -2e-15  # variational up to the last digit of the reference
