"""Verdicts on energies from other programs (twoel.checking.verdicts) and correlation energies.

Check values and their sources:
* exact He 1¹S -2.903724377034119598 Eh: C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006).
* HF limit He -2.861679995612 Eh: C. F. Bunge et al., Phys. Rev. A 46, 3691 (1992); C. Froese
  Fischer, The Hartree-Fock Method for Atoms (Wiley, 1977) (digits from memory).
* He correlation energy -0.0420444 Eh: the difference of the two (Löwdin's definition).
* -2.9033 Eh (a CISD-like value) lies 4.243770341196e-4 Eh above the exact energy and
  -4.1620004388e-2 Eh below the HF limit, recovering 98.99065 % of the correlation energy
  (hand arithmetic on the two published values above).
* conversion factors (independent of twoel.units): CODATA 2022 hartree = 27.211386245981 eV
  = 219474.63136314 cm⁻¹; 1 Eh = 2625.4996394799 kJ/mol and 627.5094740631 kcal/mol
  (thermochemical calorie 4.184 J; CODATA 2018/2022 Hartree energy × Avogadro; common practice).
"""


import pytest

from twoel.checking.rows import parse_csv_text, read_rows
from twoel.checking.verdicts import check_energy, check_rows, results_frame
from twoel.scf.correlation import correlation_energy, correlation_table
from twoel.errors import InputError, UnsupportedError
from twoel.reference import data_root

EXACT_HE = -2.903724377034119598
HF_HE = -2.861679995612
EV = 27.211386245981
CM1 = 219474.63136314
KJ = 2625.4996394799
KCAL = 627.5094740631


# ----------------------------------------------------------------------------- correlation energy

def test_helium_correlation_energy():
    c = correlation_energy(2)
    assert c.correlation_hartree == pytest.approx(-0.0420444, abs=5e-8)
    assert c.correlation_hartree == pytest.approx(EXACT_HE - HF_HE, abs=1e-15)


def test_correlation_energy_in_laboratory_units():
    c = correlation_energy("He")
    e = EXACT_HE - HF_HE
    assert c.correlation("mhartree") == pytest.approx(1e3 * e, rel=1e-12)
    assert c.correlation("ev") == pytest.approx(e * EV, rel=1e-9)
    assert c.correlation("cm-1") == pytest.approx(e * CM1, rel=1e-9)
    assert c.correlation("kj/mol") == pytest.approx(e * KJ, rel=1e-8)
    assert c.correlation("kcal/mol") == pytest.approx(e * KCAL, rel=1e-8)
    assert set(c.to_dict()) >= {"correlation_hartree", "correlation_mhartree", "correlation_kcal_mol",
                                "correlation_kj_mol", "correlation_cm1", "correlation_ev"}


def test_correlation_table_z_1_to_10():
    """Correlation energies of the two-electron series: about -0.0398 Eh for H- rising in size
    towards the 1/Z limit -0.04666 Eh (E2 exact - E2 HF = -0.157666 + 0.111003; Baker et al.,
    PRA 41, 1247 (1990) and Linderberg, PR 121, 816 (1961); from memory)."""
    frame = correlation_table()
    values = list(frame["correlation_hartree"])
    assert len(values) == 10
    assert values[0] == pytest.approx(-0.0398, abs=1e-4)        # H-: -0.527751 + 0.487930
    assert all(b < a for a, b in zip(values[1:], values[2:]))   # grows in size from He on
    assert -0.04666 < values[-1] < -0.0455


def test_correlation_energy_unknown_ion():
    with pytest.raises(UnsupportedError):
        correlation_energy(11)
    with pytest.raises(UnsupportedError):
        correlation_energy(2.5)


# ----------------------------------------------------------------------------- a CISD-like He energy

def test_cisd_like_helium_energy():
    r = check_energy(2, -2.9033, "hartree", energy_text="-2.9033")
    assert r.difference_hartree == pytest.approx(4.243770341196e-4, abs=1e-15)
    assert r.correlation_recovered_percent == pytest.approx(98.99065, abs=1e-5)
    assert r.error_vs_hartree_fock_hartree == pytest.approx(-4.1620004388e-2, abs=1e-15)
    assert r.correlation_hartree == pytest.approx(-0.0420444, abs=5e-8)
    assert r.agreeing_digits == 3            # |E - E_exact| / |E_exact| = 1.5e-4
    assert r.flags == ()


def test_old_field_name_error_hartree_is_kept():
    """``error_hartree`` (the name before ``difference_hartree``) stays an attribute and a JSON key."""
    r = check_energy(2, -2.9033, "hartree")
    d = r.to_dict()
    assert r.error_hartree == r.difference_hartree == pytest.approx(4.243770341196e-4, abs=1e-15)
    assert d["error_hartree"] == d["difference_hartree"] == r.difference_hartree


@pytest.mark.parametrize("value", [-2.9037243770343, -2.90372437703421, -2.9038, -2.95])
def test_below_exact_is_flagged(value):
    r = check_energy(2, value, "hartree", energy_text=repr(value))
    assert "below_exact" in r.flag_codes
    assert r.error_hartree < 0
    text = dict((f.code, f.explanation) for f in r.flags)["below_exact"]
    assert "not variational" in text and "relativistic" in text


@pytest.mark.parametrize("value", [-2.9037243770341, -2.903724377034, -2.9037])
def test_at_or_above_exact_is_not_flagged(value):
    assert "below_exact" not in check_energy(2, value, "hartree").flag_codes


def test_value_below_the_quoted_bound_is_flagged():
    """Anything below -2.9037243770342 (the exact energy rounded down) is flagged."""
    assert "below_exact" in check_energy(2, -2.9037243770342 - 1e-13, "hartree").flag_codes


def test_above_hartree_fock_is_flagged():
    r = check_energy(2, -2.8605, "hartree", energy_text="-2.8605")
    assert "above_hartree_fock" in r.flag_codes
    assert r.correlation_recovered_percent < 0
    # a rounded HF energy: above the limit only within the printed digits, and it says so
    r = check_energy(2, -2.8616799956, "hartree", energy_text="-2.8616799956")
    text = dict((f.code, f.explanation) for f in r.flags)["above_hartree_fock"]
    assert "within the rounding" in text
    assert r.correlation_recovered_percent == pytest.approx(0.0, abs=1e-6)


def test_hartree_fock_limit_itself_recovers_zero_percent():
    r = check_energy(2, HF_HE, "hartree")
    assert r.correlation_recovered_percent == pytest.approx(0.0, abs=1e-12)
    assert r.flags == ()


# ----------------------------------------------------------------------------- units

@pytest.mark.parametrize("unit,factor", [("ev", EV), ("kcal/mol", KCAL), ("kj/mol", KJ), ("cm-1", CM1),
                                         ("mhartree", 1000.0), ("rydberg", 2.0)])
def test_right_unit_gives_same_verdict(unit, factor):
    r = check_energy(2, -2.9033 * factor, unit)
    assert r.energy_hartree == pytest.approx(-2.9033, rel=1e-9)
    assert r.correlation_recovered_percent == pytest.approx(98.99, abs=0.01)
    assert "unit_probably_wrong" not in r.flag_codes


@pytest.mark.parametrize("unit,factor", [("ev", EV), ("kcal/mol", KCAL), ("kj/mol", KJ), ("cm-1", CM1),
                                         ("mhartree", 1000.0), ("rydberg", 2.0)])
def test_value_in_other_unit_labelled_hartree_is_caught(unit, factor):
    r = check_energy(2, -2.9033 * factor, "hartree")
    assert "unit_probably_wrong" in r.flag_codes
    assert r.suggested_unit == unit
    # the other checks assume the unit as given, so they do not pile up
    assert "below_exact" not in r.flag_codes


def test_hartree_value_labelled_ev_is_caught():
    r = check_energy(2, -2.9033, "eV")
    assert r.flag_codes[0] == "unit_probably_wrong" and r.suggested_unit == "hartree"
    assert "not_bound" not in r.flag_codes


def test_implausible_in_every_unit_and_lost_sign():
    r = check_energy(2, 2.9033, "hartree")
    assert "implausible" in r.flag_codes
    assert "minus sign" in r.flags[0].explanation
    assert "implausible" in check_energy(2, -50.0, "hartree").flag_codes


def test_unknown_unit_is_an_input_error():
    with pytest.raises(InputError, match="unknown energy unit"):
        check_energy(2, -2.9, "furlongs")


# ----------------------------------------------------------------------------- binding and coverage

def test_unbound_h_minus():
    """H- restricted HF -0.48793 Eh lies above H(1s) + e- = -0.5 Eh (Froese Fischer 1977)."""
    r = check_energy(1, -0.4879, "hartree")
    assert "not_bound" in r.flag_codes
    assert "does not bind H-" in dict((f.code, f.explanation) for f in r.flags)["not_bound"]
    assert "not_bound" not in check_energy(1, -0.5262, "hartree").flag_codes


def test_excited_state_has_exact_but_no_hf_comparison():
    """He 2³S -2.175229378236791 (Drake 2006 handbook, from memory)."""
    r = check_energy(2, -2.17521, "hartree", state="2^3S")
    assert r.error_hartree == pytest.approx(-2.17521 + 2.175229378236791, abs=1e-12)
    assert r.correlation_recovered_percent is None
    assert "no_hartree_fock_limit" in r.flag_codes


def test_ion_without_reference_still_gets_unit_and_binding_checks():
    r = check_energy(11, -110.0, "hartree")
    assert r.error_hartree is None and "no_reference" in r.flag_codes
    assert "unit_probably_wrong" in check_energy(11, -110.0 * EV, "hartree").flag_codes


def test_bad_energy_values():
    for bad in (float("nan"), float("inf"), "2.9", True):
        with pytest.raises(InputError):
            check_energy(2, bad, "hartree")


# ----------------------------------------------------------------------------- files

def test_mixed_unit_file(tmp_path):
    path = tmp_path / "mixed.csv"
    path.write_text("Z,state,energy,unit,label\n"
                    f"2,1^1S,-2.9033,hartree,a\n"
                    f"2,1^1S,{-2.9033 * EV!r},eV,b\n"
                    f"2,1^1S,{-2.9033 * KCAL!r},kcal/mol,c\n"
                    f"He,1^1S,-2.9033,kcal/mol,d\n")
    results = check_rows(read_rows(path).rows)
    assert [r.label for r in results] == ["a", "b", "c", "d"]
    for r in results[:3]:
        assert r.error_hartree == pytest.approx(0.000424377, abs=1e-8)
        assert r.flags == ()
    assert results[3].suggested_unit == "hartree"
    frame = results_frame(results)
    assert list(frame["row"]) == [1, 2, 3, 4]


def test_shipped_demo_file_is_labelled_invented_and_checks():
    path = data_root().joinpath("demo_check_rows.csv")
    text = path.read_text(encoding="utf-8")
    assert "INVENTED" in text.splitlines()[0]
    rows = parse_csv_text(text, "demo_check_rows.csv")
    results = check_rows(rows.rows)
    assert len(results) == len(rows.rows) >= 10
    units = {r.unit for r in results}
    assert {"hartree", "ev", "kcal/mol"} <= units
    codes = {c for r in results for c in r.flag_codes}
    assert {"below_exact", "above_hartree_fock", "unit_probably_wrong", "not_bound"} <= codes
