"""Excited S states, transitions and their command line (twoel transition / energy)."""

from __future__ import annotations

import json
import time

import pytest

from twoel import State
from twoel.basis import family_names
from twoel.cli import main
from twoel.errors import InputError, NotBoundError, UnsupportedError
from twoel.reference import lookup
from twoel.analysis.transitions import solve_state, transition
from twoel.units import hartree_to, wavelength_vacuum_nm

#: G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11
#: (from memory; first ~7 digits confirmed by measured ionization energies)
HE = {"2^1S": -2.145974046054417, "2^3S": -2.175229378236791,
      "2^1P": -2.123843086498101359, "2^3P": -2.133164190779283205}


@pytest.mark.parametrize("text", ["2^3S", "2 3S", "2³S", "2_3S", " 2^3s "])
def test_term_symbols_are_accepted(text):
    assert State.parse(text).label == "2^3S"


@pytest.mark.parametrize("text", ["2^2S", "3S", "2^3Q", "1^3S", "2^1S; rm", "0^1S"])
def test_bad_state_names(text):
    with pytest.raises(InputError):
        State.parse(text)


def test_he_2_3S_within_1e_9():
    """He 2³S from the stored boxes, 300 functions: within 1e-9 Eh of Drake (2006)."""
    r = solve_state(2, "2^3S", size=300)
    assert r.state == "2^3S" and r.bound
    assert r.energy_hartree > HE["2^3S"] - 1e-12
    assert r.energy_hartree - HE["2^3S"] < 1e-9


@pytest.mark.slow
@pytest.mark.parametrize("label", ["2^3S", "2^1S"])
def test_he_2S_acceptance(label):
    """Acceptance: S states within 1e-9 Eh with stored parameters in float64, under 30 s
    (default size: 600 functions)."""
    started = time.perf_counter()
    r = solve_state(2, label)
    assert time.perf_counter() - started < 30
    assert r.energy_hartree > HE[label] - 1e-12
    assert r.energy_hartree - HE[label] < 1e-9


def test_reference_rows_for_helium_excited_states():
    for label, value in HE.items():
        ref = lookup(2, label)
        assert ref is not None and ref.value == value and "Drake" in ref.source


def test_h_minus_has_no_bound_triplet_S():
    """H⁻ has a single bound state (1¹S; Hill, J. Math. Phys. 18, 2316 (1977)): the 2³S root
    lies above the H(1s) threshold and is reported as not bound."""
    with pytest.raises(NotBoundError, match="not below"):
        solve_state(1, "2^3S", size=60)


def test_states_the_basis_cannot_represent():
    with pytest.raises(UnsupportedError):
        solve_state(2, "5^1G", size=60)


def test_transition_2_3S_2_3P_small_basis():
    """ΔE(2³S–2³P) from 200-function bases agrees with the difference of Drake's energies."""
    t = transition(2, "2^3S", "2^3P", size=200)
    exact = HE["2^3P"] - HE["2^3S"]
    assert t.energy_hartree == pytest.approx(exact, abs=2e-7)
    assert t.energy_cm1 == pytest.approx(hartree_to(t.energy_hartree, "cm-1"), rel=1e-15)
    assert t.wavelength_vacuum_nm == pytest.approx(wavelength_vacuum_nm(exact), rel=5e-6)
    # the measured 1083.33 nm line (vacuum; e.g. NIST ASD) differs by ~2e-4 relative:
    # fine structure, relativistic, QED and recoil corrections are missing
    assert 1e-4 < abs(t.wavelength_vacuum_nm / 1083.33 - 1) < 5e-4
    assert "nonrelativistic" in t.caution and "infinite" in t.caution


#: He 3³D, Drake (2006 handbook, ch. 11; from memory)
HE_3_3D = -2.055636309453261


@pytest.mark.parametrize("lower, upper, exact", [
    ("2^3S", "2^3P", HE["2^3P"] - HE["2^3S"]),
    ("2^3P", "3^3D", HE_3_3D - HE["2^3P"]),   # the 588 nm line of He (the D3 line)
])
def test_transition_uncertainty_covers_the_error(lower, upper, exact):
    """The stated uncertainty of ΔE (sum of the two level bars) covers the difference from
    Drake's energies and is not absurdly loose; the wavelength bar is λ σ/ΔE."""
    t = transition(2, lower, upper, size=200)
    error = abs(t.energy_hartree - exact)
    assert t.energy_uncertainty_hartree >= error
    assert t.energy_uncertainty_hartree < 100 * max(error, 1e-11)
    assert t.wavelength_uncertainty_nm == pytest.approx(
        t.wavelength_vacuum_nm * t.energy_uncertainty_hartree / t.energy_hartree, rel=1e-12)
    data = t.to_dict()
    assert data["energy_uncertainty_hartree"] == t.energy_uncertainty_hartree
    assert data["energy_uncertainty_cm1"] == pytest.approx(hartree_to(t.energy_uncertainty_hartree, "cm-1"))


def test_transition_text_shows_only_supported_digits(capsys):
    """Every printed energy carries its bar in parentheses and stops at the bar's digit."""
    import re

    assert main(["transition", "--Z", "2", "--from", "2^3P", "--to", "3^3D", "--size", "150"]) == 0
    out = capsys.readouterr().out
    energy_line = next(line for line in out.splitlines() if line.startswith("energy:"))
    values = re.findall(r"([0-9.]+)\((\d)\)", energy_line)
    assert len(values) == 4
    wavelength = re.search(r"vacuum wavelength: ([0-9.]+)\((\d)\) nm", out)
    assert wavelength is not None
    assert "-2.133164190779" not in out.split("(reference")[0]   # no float64 tail on the level


def test_transition_cli_json(capsys):
    code = main(["transition", "--Z", "2", "--from", "2^1S", "--to", "2 1P", "--size", "150", "--json"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    for key in ("energy_cm1", "wavelength_vacuum_nm", "energy_hartree", "energy_ev", "energy_thz"):
        assert key in data
    assert data["lower"] == "2^1S" and data["upper"] == "2^1P"
    exact = HE["2^1P"] - HE["2^1S"]
    assert data["energy_hartree"] == pytest.approx(exact, abs=2e-6)
    assert "nonrelativistic" in data["caution"]


def test_transition_cli_text_gives_the_wavelength_and_its_caution(capsys):
    """The printed vacuum wavelength is 1/ΔE of Drake's energies (CODATA hartree-inverse meter)
    to the basis accuracy (~1e-9 relative at 300 terms of the boxes tuned at N = 600), and the
    nonrelativistic caution is said."""
    import re
    import scipy.constants as sc

    assert main(["transition", "--Z", "2", "--from", "2^3S", "--to", "2^3P", "--size", "300"]) == 0
    out = capsys.readouterr().out
    match = re.search(r"vacuum wavelength: ([0-9.]+)\((\d+)\) nm", out)
    printed = float(match.group(1))
    per_metre = sc.physical_constants["hartree-inverse meter relationship"][0]
    exact = 1e9 / ((HE["2^3P"] - HE["2^3S"]) * per_metre)
    assert printed == pytest.approx(exact, abs=2e-3)
    last_digit = 10.0 ** -len(match.group(1).split(".")[1])
    assert abs(printed - exact) <= int(match.group(2)) * last_digit   # the printed bar covers it
    assert "caution: nonrelativistic" in out


@pytest.mark.parametrize("argv, message", [
    (["--from", "2^3X", "--to", "2^3P"], "unknown"),
    (["--from", "2^3S", "--to", "5^3G"], "represents only"),
    (["--from", "2^3S", "--to", "2^3S"], "same state"),
])
def test_transition_cli_errors(capsys, argv, message):
    assert main(["transition", "--Z", "2", "--size", "60"] + argv) == 2
    err = capsys.readouterr().err
    assert message in err and len(err.strip().splitlines()) == 1


@pytest.mark.skipif("exponential" not in family_names(), reason="exponential family not merged yet")
def test_energy_cli_excited_state_label(capsys):
    assert main(["energy", "--Z", "2", "--state", "2 3S", "--family", "exponential", "--size", "200",
                 "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["state"] == "2^3S"
    assert data["energy_hartree"] - HE["2^3S"] < 1e-8


@pytest.mark.parametrize("label, tolerance", [("2^3S", 2e-9), ("2^1S", 1e-8)])
def test_li_plus_2S_against_accad_1971(label, tolerance):
    """Li⁺ 2³S and 2¹S (300 functions) against Accad, Pekeris & Schiff, Phys. Rev. A 4, 516
    (1971) (values from memory, uncertainty as tabulated in data/reference_energies.csv)."""
    ref = lookup(3, label)
    assert ref is not None and "Accad" in ref.source
    r = solve_state(3, label, size=300)
    assert r.energy_hartree > ref.value - ref.uncertainty - 1e-12
    assert r.energy_hartree - ref.value < tolerance


@pytest.mark.slow
@pytest.mark.parametrize("label", ["3^3S", "3^1P", "3^3P"])
def test_he_n3_states(label):
    """He n = 3 levels (second roots) within 2e-8 Eh of Drake (2006; from memory)."""
    r = solve_state(2, label, size=600)
    ref = lookup(2, label)
    assert r.energy_hartree > ref.value - 1e-12
    assert r.energy_hartree - ref.value < 2e-8


def test_excited_box_file_follows_the_shared_schema():
    """data/exponential_boxes_excited.json uses the schema of every exponential_boxes*.json."""
    from twoel.basis import excited_boxes as xb
    from twoel.reference import read_data_text

    data = json.loads(read_data_text(xb.DATA_FILE))
    assert data["schema"] == "twoel-exponential-boxes/1"
    seen = set()
    for entry in data["sets"]:
        key = (float(entry["Z"]), State.parse(entry["state"]).label)
        assert key not in seen
        seen.add(key)
        assert entry["optimized_size"] > 0 and entry["method"]
        fractions = [b["fraction"] for b in entry["boxes"]]
        assert all(0 < f <= 1 for f in fractions) and sum(fractions) == pytest.approx(1, abs=1e-5)
        for box in entry["boxes"]:
            for edge in ("alpha", "beta", "gamma"):
                lo, hi = box[edge]
                assert 0 <= lo <= hi
    assert {(2.0, "2^1S"), (2.0, "2^3S"), (2.0, "2^1P"), (2.0, "2^3P"), (3.0, "2^1S"), (3.0, "2^3S")} <= seen
