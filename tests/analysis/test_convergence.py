"""Convergence sequences, extrapolation and the honesty of the error bars."""

import json
import math

import mpmath
import pytest

import twoel
from twoel.cli import main
from twoel.analysis.convergence import (ConvergenceStudy, default_sizes, differences_and_ratios, estimate_tail,
                               run_study, trusted_digits)
from twoel.errors import InputError

# C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)
HE_GROUND = "-2.903724377034119598311159245194404"
# H. Nakashima and H. Nakatsuji, J. Chem. Phys. 127, 224104 (2007) (from memory, widely quoted)
H_MINUS = "-0.5277510165443771965908"
LI_PLUS = "-7.2799134126693059649"


def test_geometric_sequence_tail_is_recovered():
    exact, q = -1.0, 0.5
    energies = [exact + 1e-3 * q**k for k in range(6)]
    est = estimate_tail(energies)
    true_error = energies[-1] - exact
    assert est.ratio == pytest.approx(0.5)
    assert est.tail_hartree == pytest.approx(true_error, rel=1e-9)
    assert true_error < est.variational_bar_hartree <= 100 * true_error


def test_fast_apparent_ratio_is_not_trusted():
    energies = [-1 + 1e-3, -1 + 1e-5, -1 + 1e-7]  # ratio 0.01 -> tail floor at ratio 1/3
    est = estimate_tail(energies)
    assert est.tail_hartree == pytest.approx((1e-5 - 1e-7) * 0.5)
    # the extrapolated value itself uses the measured ratio (exact for this geometric sequence)
    assert est.extrapolated_hartree == pytest.approx(-1.0, abs=1e-12)
    assert abs(est.extrapolated_hartree + 1.0) < est.extrapolated_bar_hartree


def test_irregular_sequences_are_flagged():
    est = estimate_tail([-1.0, -1.1, -1.05])
    assert not est.reliable and est.note
    with pytest.raises(InputError):
        estimate_tail([-1.0, -1.1])


def test_differences_ratios_and_digits():
    d, q = differences_and_ratios([-1.0, -1.5, -1.75])
    assert d == [None, 0.5, 0.25] and q == [None, None, 0.5]
    assert trusted_digits(-2.9037, 1e-4) == 4
    assert default_sizes(400, 3) == [200, 283, 400]


def test_study_on_small_bases():
    study = run_study(2, "1^1S", [30, 42, 60])
    assert isinstance(study, ConvergenceStudy)
    frame = study.to_frame()
    assert list(frame["size"]) == [30, 42, 60]
    assert {"energy_hartree", "difference_hartree", "ratio"} <= set(frame.columns)
    true_error = study.variational_hartree - float(HE_GROUND)
    assert 0 < true_error < study.variational_error_bar_hartree
    json.dumps(study.to_dict())
    # the true error is taken from the decimal texts, so it survives beyond float64 resolution
    with mpmath.workdps(50):
        expected = float(mpmath.mpf(study.energy_texts[-1]) - mpmath.mpf(HE_GROUND))
    assert study.to_dict()["true_error_hartree"] == expected


def test_cli_converge_and_energy_json(capsys):
    assert main(["converge", "--Z", "2", "--sizes", "30,42,60", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert [row["size"] for row in doc["rows"]] == [30, 42, 60]
    assert doc["digits"] >= 5
    assert main(["energy", "--Z", "2", "--family", "exponential", "--size", "60", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert isinstance(doc["energy_hartree_text"], str)
    assert doc["error_bar_hartree"] > 0
    assert main(["converge", "--Z", "2", "--sizes", "30,20,60"]) == 2


def _true_error(result, reference):
    with mpmath.workdps(40):
        return float(mpmath.mpf(result.provenance["energy_full_text"]) - mpmath.mpf(reference))


@pytest.mark.slow
@pytest.mark.parametrize("Z, reference", [(2, HE_GROUND), (1, H_MINUS), (3, LI_PLUS)])
def test_error_bar_is_honest(Z, reference):
    r = twoel.solve(Z, "1^1S", "exponential", 400)
    err = _true_error(r, reference)
    assert 0 < err <= r.error_bar_hartree <= 100 * err
