"""Hostile or odd input to the energy checker: each case is one clear InputError, never a crash.

Physics of the flags: the exact nonrelativistic He ground-state energy is -2.9037243770341 Eh
(C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)) and the He⁺(1s) + e⁻ threshold is
-Z²/2 = -2 Eh (hydrogenic closed form), so -1e300 Eh lies below the exact energy and any energy
at or above -2 Eh does not bind He.  Unit symbols follow the SI brochure (BIPM 2019): "m" is
milli, "M" is mega.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from twoel.checking import rows as check_input
from twoel.checking.rows import parse_csv_text, parse_json_text, read_rows, read_unit
from twoel.checking.verdicts import check_energy
from twoel.errors import InputError


def test_cr_only_line_ends_are_read():
    rows = parse_csv_text("Z,energy,unit\r2,-2.9033,hartree\r1,-0.52,Eh\r", "mac.csv")
    assert [(r.Z, r.energy, r.line) for r in rows.rows] == [(2.0, -2.9033, 2), (1.0, -0.52, 3)]


def test_field_over_128_kib_is_one_line():
    text = "Z,energy,unit,label\n2,-2.9,hartree," + "x" * (128 * 1024 + 1) + "\n"
    with pytest.raises(InputError, match="longer than 128 KiB") as info:
        parse_csv_text(text, "big.csv")
    assert "\n" not in str(info.value)
    quoted = 'Z,energy,unit,label\n2,-2.9,hartree,"' + "x" * (200 * 1024) + "\n"   # never closed
    with pytest.raises(InputError, match="line"):
        parse_csv_text(quoted, "open-quote.csv")
    doc = json.dumps([{"Z": 2, "energy": -2.9, "unit": "Eh", "label": "y" * (128 * 1024 + 1)}])
    with pytest.raises(InputError, match="longer than 128 KiB"):
        parse_json_text(doc, "big.json")


def test_deep_json_and_400_digit_integer():
    with pytest.raises(InputError, match="nested"):
        parse_json_text("[" * 100_000 + "]" * 100_000, "deep.json")
    with pytest.raises(InputError, match="nested"):
        parse_json_text(json.dumps([{"Z": 2, "energy": -2.9, "unit": "Eh",
                                     "note": [[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[0]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]}]),
                        "deep2.json")
    huge = "1" + "0" * 399
    for doc in (f'[{{"Z": 2, "energy": -{huge}, "unit": "Eh"}}]',
                f'[{{"Z": {huge}, "energy": -2.9, "unit": "Eh"}}]',
                f'[{{"Z": 2, "energy": -1{"0" * 5000}, "unit": "Eh"}}]'):
        with pytest.raises(InputError) as info:
            parse_json_text(doc, "huge.json")
        assert "\n" not in str(info.value) and len(str(info.value)) < 600
    with pytest.raises(InputError, match="Z"):
        parse_csv_text(f"Z,energy,unit\n{huge},-2.9,Eh\n", "huge.csv")


def test_unreadable_and_non_utf8_files(tmp_path, monkeypatch):
    latin = tmp_path / "latin1.csv"
    latin.write_bytes("Z,energy,unit,label\n2,-2.9,hartree,Møller\n".encode("latin-1"))
    with pytest.raises(InputError, match="not UTF-8"):
        read_rows(latin)
    good = tmp_path / "good.csv"
    good.write_text("Z,energy,unit\n2,-2.9,hartree\n")

    def denied(self, *args, **kwargs):     # root reads anything: simulate a permission error
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(Path, "open", denied)
    with pytest.raises(InputError, match="cannot read .*Permission denied"):
        read_rows(good)
    monkeypatch.undo()
    with pytest.raises(InputError, match="not a regular file"):
        read_rows(tmp_path)


@pytest.mark.parametrize("text, unit", [("mEh", "mhartree"), ("MHz", "mhz"), ("cm⁻¹", "cm-1"),
                                        ("cm−1", "cm-1"), ("THz", "thz"), ("Eh", "hartree"),
                                        ("mhz", "mhz"), ("EV", "ev")])
def test_units_read_with_their_case(text, unit):
    assert read_unit(text) == unit


@pytest.mark.parametrize("text", ["MEh", "MHa", "mHz", "Mhartree"])
def test_units_whose_case_changes_the_meaning_are_refused(text):
    with pytest.raises(InputError, match="ambiguous energy unit"):
        read_unit(text)
    with pytest.raises(InputError, match=r"row 1 \(line 2\), column 'unit': ambiguous"):
        parse_csv_text(f"Z,energy,unit\n2,-2903.3,{text}\n")


def test_cm1_as_printed_gives_the_same_verdict_as_hartree():
    # -2.9033 Eh in cm⁻¹ with CODATA 2018 R∞hc: 219474.6313632 cm⁻¹ per Eh (hand product)
    r = check_energy(2, -2.9033 * 219474.6313632, "cm⁻¹")
    assert r.energy_hartree == pytest.approx(-2.9033, rel=1e-9) and r.flags == ()


def test_absurdly_low_energy_is_below_exact_and_positive_is_not_bound():
    low = check_energy(2, -1e300, "hartree")
    assert "below_exact" in low.flag_codes and "implausible" in low.flag_codes
    for value in (2.9033, 0.0, -1.5, -2.0):
        assert "not_bound" in check_energy(2, value, "hartree").flag_codes, value
    assert "not_bound" not in check_energy(2, -2.0001 * 2, "hartree").flag_codes
