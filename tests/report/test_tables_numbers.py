"""Number formatting: digit grouping and the concise (parenthesis) uncertainty notation.

Rules checked: BIPM/JCGM 100:2008 (GUM) §7.2.2 for the concise notation, ISO 80000-1 §7.3.1 and
the BIPM SI Brochure (9th ed., 2019) §5.4.4 for groups of three digits.
"""

import pytest

from twoel.errors import InputError
from twoel.report.numbers import (format_uncertain, group_digits, latex_number, latex_scientific,
                                  round_to_decimals, text_scientific, to_decimal)


def test_concise_notation_of_the_helium_ground_state():
    # He ground state, C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006), with a 2e-12 bar
    text = format_uncertain("-2.903724377034119598311159245194404", "2e-12")
    assert text == "-2.903724377034(2)"
    assert group_digits(text) == "-2.903 724 377 034(2)"


@pytest.mark.parametrize("value, unc, digits, expected", [
    (1.23456, 0.0012, 1, "1.235(1)"),
    (1.23456, 0.0012, 2, "1.2346(12)"),
    (1.23456, 0.0096, 1, "1.23(1)"),        # 0.0096 rounds up to 0.01: one place up
    (0.000123456, 2.5e-8, 2, "0.000123456(25)"),
    (12345.6, 47, 1, "12350(50)"),          # uncertainty above the units digit: written in full
    ("6082.99", "0.15", 2, "6082.99(15)"),   # H- detachment, Lykke et al., PRA 43, 6104 (1991)
    (-0.5, None, 1, "-0.5"),
])
def test_concise_notation_cases(value, unc, digits, expected):
    assert format_uncertain(value, unc, uncertainty_digits=digits) == expected


def test_value_rounded_half_even_at_the_uncertainty_digit():
    assert format_uncertain("2.125", "0.01") == "2.12(1)"
    assert format_uncertain("2.135", "0.01") == "2.14(1)"


def test_max_decimals_drops_an_uncertainty_beyond_them():
    assert format_uncertain("-2.903724377034119598", "1e-33", max_decimals=6) == "-2.903724"
    assert format_uncertain("-2.9037243770", None, max_decimals=4) == "-2.9037"
    assert format_uncertain(1.0, 0.2, max_decimals=4) == "1.0(2)"


def test_text_keeps_digits_beyond_float64():
    text = format_uncertain("-0.5277510165443771965908", "1e-22")
    assert text == "-0.5277510165443771965908(1)"
    assert len(text.split(".")[1].split("(")[0]) == 22


def test_grouping_rules():
    assert group_digits("3.1415926") == "3.141 592 6"
    assert group_digits("1234.5") == "1234.5"            # four digits stay together
    assert group_digits("198310.66637") == "198 310.666 37"
    assert group_digits("-12345678") == "-12 345 678"
    assert group_digits("1.5e-05") == "1.5e-05"
    assert group_digits("n/a") == "n/a"


def test_latex_forms():
    assert latex_number("-2.903724377034(2)") == r"$-2.903\,724\,377\,034(2)$"
    assert latex_scientific(1.2038e-5) == r"$1.20\times 10^{-5}$"
    assert text_scientific(-4.36e-2) == "-4.36e-02"


def test_bad_input_is_an_input_error():
    with pytest.raises(InputError):
        to_decimal("1.2.3")
    with pytest.raises(InputError):
        to_decimal(float("nan"))
    with pytest.raises(InputError):
        format_uncertain(1.0, 0.1, uncertainty_digits=0)
    assert round_to_decimals(-0.0001, 2) == "0.00"
