"""Error bars of ``twoel converge`` against published values: float64 P states, families
without a converging size, and binding below the one-electron threshold."""

import json

import mpmath
import pytest

from twoel.analysis.convergence import NOT_A_SEQUENCE, run_study, trusted_digits
from twoel.cli import main

# G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11
# (from memory)
HE_2_3P = "-2.133164190779283205"
HE_2_1P = "-2.123843086498101359"
# C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)
HE_GROUND = "-2.903724377034119598311159245194404"
# critical nuclear charge of the two-electron ion, Estienne, Busuttil, Moini and Drake,
# Phys. Rev. Lett. 112, 173001 (2014) (from memory): below it no bound state exists
Z_CRITICAL = 0.911028


def _true_error(study, reference):
    with mpmath.workdps(40):
        return float(mpmath.mpf(study.energy_texts[-1]) - mpmath.mpf(reference))


def _correct_digits(text, reference):
    """Significant digits of ``text`` that agree with ``reference`` when both are rounded."""
    with mpmath.workdps(40):
        value, exact = mpmath.mpf(text), mpmath.mpf(reference)
        n = 0
        while n < 25 and mpmath.nstr(value, n + 1) == mpmath.nstr(exact, n + 1):
            n += 1
        return n


@pytest.mark.slow
@pytest.mark.parametrize("state, reference", [("2^3P", HE_2_3P), ("2^1P", HE_2_1P)])
def test_p_bar_covers_true_error(state, reference):
    """P rows are refined beyond float64 (double-double matrices): each row's arithmetic error
    is far below the truncation error that the bar describes."""
    study = run_study(2, state, [100, 141, 200, 283, 400])
    error = _true_error(study, reference)
    # the study's tail keeps the 1/3 ratio floor (an apparently fast ratio is not trusted); the
    # boxes tuned at N = 600 converge faster than that at these sizes, so the bar is 40-70x
    # the error here: covering, and loose within a factor 100
    assert 0 < error <= study.variational_error_bar_hartree <= 100 * error
    assert all(0 < u < 1e-15 for u in study.numerical_errors)
    exact = float(reference)
    assert abs(study.extrapolated_hartree - exact) <= study.extrapolated_error_bar_hartree
    # the digits claimed are right
    assert study.digits <= _correct_digits(study.energy_texts[-1], reference)


@pytest.mark.slow
@pytest.mark.parametrize("state, reference", [("2^3P", HE_2_3P), ("2^1P", HE_2_1P)])
def test_stagnating_float64_p_sequence_keeps_an_honest_bar(state, reference):
    # (about 4 s each) sizes where float64 energies stagnate (before: bars 2e-11 and 1.4e-12 for true errors ~1e-9, 4e-10)
    study = run_study(2, state, [200, 283, 400, 566, 800])
    error = _true_error(study, reference)
    assert 0 < error <= study.variational_error_bar_hartree <= 30 * error
    assert study.digits <= _correct_digits(study.energy_texts[-1], reference)


def test_digits_follow_the_bar():
    # a bar of 3e-9 on -2.13: the half unit of the 9th significant digit (5e-9) covers it
    assert trusted_digits(-2.1331641898, 3e-9) == 9
    assert trusted_digits(-2.1331641898, 2e-11) == 11
    assert trusted_digits(-2.0, None) == 0


@pytest.mark.parametrize("family, state, reference", [
    ("screened", "1^1S", HE_GROUND), ("hydrogenic", "1^1S", HE_GROUND)])
def test_family_without_a_converging_size_gets_no_bar(family, state, reference, capsys):
    study = run_study(2, state, [10, 20, 40], family=family)
    assert _true_error(study, reference) > 1e-2  # far from converged ...
    assert study.error_bar_hartree is None and not study.reliable  # ... and no bar says otherwise
    assert study.extrapolated_hartree is None
    assert main(["converge", "--Z", "2", "--family", family, "--sizes", "10,20,40", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["error_bar_hartree"] is None and doc["reliable"] is False
    assert main(["converge", "--Z", "2", "--family", family, "--sizes", "10,20,40", "--quiet"]) == 0
    text = capsys.readouterr().out
    assert NOT_A_SEQUENCE in text and "± 0" not in text


def test_below_critical_charge_is_not_bound(capsys):
    assert 0.5 < Z_CRITICAL
    study = run_study(0.5, "1^1S", [50, 71, 100])
    assert study.threshold_hartree == -0.125
    assert not study.bound[-1] and study.may_be_unbound
    assert study.extrapolated_hartree is None
    assert main(["converge", "--Z", "0.5", "--sizes", "50,71,100", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["bound"] is False and doc["extrapolated_hartree"] is None
    assert [row["bound"] for row in doc["rows"]] == [False, False, False]
    assert main(["converge", "--Z", "0.5", "--sizes", "50,71,100", "--quiet"]) == 0
    text = capsys.readouterr().out
    assert "extrapolated" not in text.replace("no extrapolated", "") and "not bound" in text


def test_above_critical_charge_is_bound():
    study = run_study(1, "1^1S", [30, 42, 60])
    assert all(study.bound) and not study.may_be_unbound
    assert study.extrapolated_hartree < study.threshold_hartree


def test_printed_energies_carry_their_bar(capsys):
    assert main(["converge", "--Z", "2", "--sizes", "30,42,60", "--quiet"]) == 0
    text = capsys.readouterr().out
    line = next(l for l in text.splitlines() if l.startswith("variational"))
    value = line.split("=")[1].split()[0]
    digits, bar = value.split("(")
    # the printed value agrees with the published one within its printed uncertainty
    last = len(digits.split(".")[1])
    assert abs(float(digits) - float(HE_GROUND)) <= int(bar.rstrip(")")) * 10.0 ** -last
