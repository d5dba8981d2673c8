"""Ions, states, units and reference data."""

import math

import pytest
import scipy.constants as sc

from twoel import Ion, State
from twoel.errors import InputError
from twoel.reference import REQUIRED_COLUMNS, all_references, lookup
from twoel.system import parse_charge_range
from twoel.units import convert_energy, hartree_to, to_hartree, wavelength_vacuum_nm


@pytest.mark.parametrize("text,label", [("1^1S", "1^1S"), ("2^3S", "2^3S"), ("2 3S", "2^3S"),
                                        ("2³S", "2^3S"), ("2¹P", "2^1P"), ("3_3p", "3^3P")])
def test_state_parsing(text, label):
    assert State.parse(text).label == label


@pytest.mark.parametrize("text", ["", "1^3S", "2^2S", "1^1P", "x", "2^1Q", "__import__('os')"])
def test_bad_states(text):
    with pytest.raises(InputError):
        State.parse(text)


def test_roots_follow_hylleraas_undheim_macdonald_order():
    assert State.parse("1^1S").root == 0 and State.parse("2^1S").root == 1
    assert State.parse("2^3S").root == 0 and State.parse("3^3S").root == 1
    assert State.parse("2^1P").root == 0 and State.parse("3^3P").root == 1


def test_ions():
    assert Ion(1).label == "H-" and Ion(2).label == "He" and Ion(3).label == "Li+"
    assert Ion(10).label == "Ne8+" and Ion(10).element == "neon"
    assert Ion.parse("Li").Z == 3 and Ion.parse("helium").Z == 2
    assert Ion(4).threshold_hartree == -8.0
    assert Ion(0.95).is_model and Ion(0.95).note
    for bad in (0, -1, float("nan"), float("inf"), 200, "abc", True, "1e400"):
        with pytest.raises(InputError):
            Ion.parse(bad)


def test_charge_ranges():
    assert parse_charge_range("1:4") == [1, 2, 3, 4]
    assert parse_charge_range("1:2:0.5") == [1, 1.5, 2]
    assert parse_charge_range("He,Li,5") == [2, 3, 5]
    for bad in ("4:1", "1:2:0", "a:b", "", "1:1000"):
        with pytest.raises(InputError):
            parse_charge_range(bad)


def test_units_follow_codata():
    # CODATA via scipy.constants: 1 Eh = 27.211386245988 eV (CODATA 2018/2022)
    assert hartree_to(1.0, "eV") == pytest.approx(sc.physical_constants["Hartree energy in eV"][0], rel=1e-15)
    assert hartree_to(1.0, "cm-1") == pytest.approx(219474.6313632, rel=1e-11)
    assert hartree_to(1.0, "kJ/mol") == pytest.approx(2625.4996394799, rel=1e-9)
    assert hartree_to(1.0, "kcal/mol") == pytest.approx(627.5094740631, rel=1e-9)
    assert hartree_to(1.0, "MHz") == pytest.approx(6.579683920502e9, rel=1e-11)
    assert to_hartree(hartree_to(0.7, "eV"), "ev") == pytest.approx(0.7, rel=1e-15)
    assert convert_energy(1.0, "rydberg", "hartree") == 0.5
    # the He ionization energy 198310.66637 cm^-1 is 58.4 nm in vacuum (Kandula et al. 2011)
    assert wavelength_vacuum_nm(to_hartree(198310.66637, "cm-1")) == pytest.approx(1e7 / 198310.66637, rel=1e-12)
    with pytest.raises(InputError, match="unit"):
        hartree_to(1.0, "furlongs")


def test_reference_table_schema_and_sources():
    rows = all_references()
    assert rows
    for row in rows:
        assert row.source, row
        assert not math.isnan(row.value)
    for Z in range(1, 11):
        assert lookup(Z, "1^1S") is not None, Z
    assert lookup(2).value_text.startswith("-2.9037243770341195983")
    assert set(REQUIRED_COLUMNS) >= {"source", "note", "unit"}


def test_reference_ground_states_are_smooth_in_one_over_Z():
    # E(Z) = -Z² + 5Z/8 + E2 + E3/Z + ... (Baker, Freund, Hill, Morgan, Phys. Rev. A 41, 1247 (1990));
    # fourth differences of Z² (E + Z² - 5Z/8) over Z = 3..10 are tiny if no digit is mistyped
    import numpy as np

    Z = np.arange(3, 11)
    tail = np.array([lookup(z).value + z**2 - 5 * z / 8 for z in Z])
    assert tail[0] == pytest.approx(-0.1576664 + 0.0087 / 3, abs=3e-4)
    assert np.max(np.abs(np.diff(tail * Z**3, 4))) < 1e-4


def test_huge_charges_are_input_errors_not_overflow():
    from fractions import Fraction

    from twoel.system import parse_charge

    for value in (10**400, -10**400, "1" * 500, "1e400", Fraction(10**400, 3)):
        with pytest.raises(InputError, match="'Z' must be") as info:
            Ion.parse(value)
        assert len(str(info.value)) < 200
    with pytest.raises(InputError, match="at most 118"):
        Ion(10**400)
    with pytest.raises(InputError, match="at most 200"):
        parse_charge_range("1:1e308:1e-300")
    assert parse_charge(Fraction(5, 2)) == 2.5


def test_solve_refuses_a_huge_charge_before_any_work():
    from twoel import solve

    with pytest.raises(InputError, match="at most 118"):
        solve(Z=10**400)


def test_numpy_numbers_are_numbers():
    np = pytest.importorskip("numpy")
    from twoel import solve

    assert Ion(np.int64(2)) == Ion(2) == Ion(np.float64(2.0)) == Ion.parse(np.int32(2))
    assert State(np.int64(2), np.int64(3), np.int64(1)).label == "2^3P"
    # the two-parameter screened 1s² value -(Z - 5/16)² = -2.84765625 Eh for He bounds the
    # size-2 energy from above; the NumPy and Python inputs give the same number
    assert solve(Z=np.int64(2), size=2).energy_hartree == solve(Z=2, size=2).energy_hartree < -2.84765625
    assert solve(Z=np.float64(2.0), size=2).energy_hartree == solve(Z=2.0, size=2).energy_hartree
