"""Reading rows of energies to check: every malformed-input case gives a clear error.

The messages must name the row (and the file line for CSV) and the column; nothing may be
dropped silently.  No physics here: the values are arbitrary test inputs.
"""

import json

import pytest

from twoel.checking import rows as check_input
from twoel.checking.rows import parse_csv_text, parse_json_text, parse_number, read_rows
from twoel.errors import InputError, ResourceError

GOOD = "Z,state,energy,unit,label\n2,1^1S,-2.9033,hartree,CISD\n1,,-0.52,Eh,\n"


def test_good_csv_rows_and_defaults():
    rows = parse_csv_text(GOOD, "good.csv")
    assert len(rows.rows) == 2
    first, second = rows.rows
    assert (first.Z, first.state, first.energy, first.unit, first.label) == (2.0, "1^1S", -2.9033, "hartree", "CISD")
    assert first.line == 2 and first.row == 1
    # empty state -> ground state, empty label -> "row 2"; alias Eh -> hartree
    assert (second.state, second.label, second.unit) == ("1^1S", "row 2", "hartree")


def test_header_is_case_insensitive_and_extra_columns_are_kept():
    text = "z,ENERGY,Unit,basis\nHe,-79.0,eV,cc-pVQZ\n"
    row = parse_csv_text(text).rows[0]
    assert row.Z == 2.0 and row.unit == "ev"
    assert row.extra == {"basis": "cc-pVQZ"}


def test_comments_and_blank_lines_are_counted_not_dropped_silently():
    text = "# invented\n\nZ,energy,unit\n# note\n2,-2.9,hartree\n\n"
    rows = parse_csv_text(text)
    assert len(rows.rows) == 1
    assert rows.comment_lines == 2 and rows.blank_lines == 2


@pytest.mark.parametrize("text", ["-2.9033D+00", "−2.9033", " -2.9033 ", "-2.9033e0", "-2.9033d0"])
def test_number_forms_accepted(text):
    assert parse_number(text) == pytest.approx(-2.9033, abs=0)


@pytest.mark.parametrize("text", ["abc", "2+3", "__import__('os')", "nan", "inf", "1_000", "", "0x10", "-2.9 Eh"])
def test_number_forms_rejected(text):
    with pytest.raises(ValueError):
        parse_number(text)


def test_empty_file():
    with pytest.raises(InputError, match="empty"):
        parse_csv_text("", "e.csv")
    with pytest.raises(InputError, match="empty"):
        parse_csv_text("  \n\n", "e.csv")
    with pytest.raises(InputError, match="empty"):
        parse_json_text("", "e.json")
    with pytest.raises(InputError, match="empty"):
        parse_json_text("[]", "e.json")


def test_header_only_has_no_rows():
    with pytest.raises(InputError, match="no data rows"):
        parse_csv_text("Z,energy,unit\n", "h.csv")


def test_only_comments_has_no_header():
    with pytest.raises(InputError, match="no header"):
        parse_csv_text("# a\n# b\n", "c.csv")


def test_missing_columns_are_named():
    with pytest.raises(InputError, match=r"missing column\(s\) energy, unit"):
        parse_csv_text("Z,state,label\n2,1^1S,x\n", "m.csv")
    with pytest.raises(InputError, match="row 1: missing column 'unit'"):
        parse_json_text(json.dumps([{"Z": 2, "energy": -2.9}]), "m.json")


def test_duplicate_and_unnamed_columns():
    with pytest.raises(InputError, match="'energy' appears twice"):
        parse_csv_text("Z,energy,energy,unit\n2,-2.9,-2.9,hartree\n")
    with pytest.raises(InputError, match="column 3 has no name"):
        parse_csv_text("Z,energy,,unit\n2,-2.9,x,hartree\n")


def test_text_in_numeric_column_names_row_line_and_column():
    text = "Z,energy,unit\n2,-2.9,hartree\n2,minus two point nine,hartree\n"
    with pytest.raises(InputError, match=r"row 2 \(line 3\), column 'energy': 'minus two point nine' is not a number"):
        parse_csv_text(text, "t.csv")


def test_text_in_Z_column():
    with pytest.raises(InputError, match=r"row 1 \(line 2\), column 'Z'"):
        parse_csv_text("Z,energy,unit\nhelium-ish,-2.9,hartree\n")
    with pytest.raises(InputError, match=r"row 1 \(line 2\), column 'Z'.*> 0"):
        parse_csv_text("Z,energy,unit\n-2,-2.9,hartree\n")


def test_missing_value_in_required_column():
    with pytest.raises(InputError, match=r"row 1 \(line 2\), column 'energy': missing value"):
        parse_csv_text("Z,energy,unit\n2,,hartree\n")
    with pytest.raises(InputError, match="row 1, column 'energy': missing value"):
        parse_json_text('[{"Z": 2, "energy": null, "unit": "hartree"}]')


def test_unknown_unit_names_row_and_column():
    with pytest.raises(InputError, match=r"row 1 \(line 2\), column 'unit': unknown energy unit 'furlongs'"):
        parse_csv_text("Z,energy,unit\n2,-2.9,furlongs\n")


def test_unknown_state():
    with pytest.raises(InputError, match=r"row 1 \(line 2\), column 'state'"):
        parse_csv_text("Z,state,energy,unit\n2,ground,-2.9,hartree\n")


def test_wrong_number_of_fields():
    with pytest.raises(InputError, match=r"row 1 \(line 2\): has 4 fields but the header has 3"):
        parse_csv_text("Z,energy,unit\n2,-2.9,hartree,extra\n")
    with pytest.raises(InputError, match=r"row 1 \(line 2\): has 2 fields"):
        parse_csv_text("Z,energy,unit\n2,-2.9\n")


def test_all_problems_are_listed_together():
    text = "Z,energy,unit\nx,-2.9,hartree\n2,y,hartree\n2,-2.9,zz\n2,-2.9,hartree\n"
    with pytest.raises(InputError) as info:
        parse_csv_text(text, "many.csv")
    message = str(info.value)
    assert "3 problem(s)" in message
    for part in ("row 1 (line 2), column 'Z'", "row 2 (line 3), column 'energy'", "row 3 (line 4), column 'unit'"):
        assert part in message
    assert "\n" not in message


def test_json_shapes():
    rows = parse_json_text(json.dumps({"rows": [{"Z": "He", "energy": "-2.9", "unit": "hartree", "basis": "x"}]}))
    assert rows.rows[0].Z == 2.0 and rows.rows[0].extra == {"basis": "x"}
    with pytest.raises(InputError, match="'rows' list"):
        parse_json_text('{"data": []}')
    with pytest.raises(InputError, match="expected a JSON list"):
        parse_json_text('"text"')
    with pytest.raises(InputError, match="row 2: expected an object"):
        parse_json_text('[{"Z": 2, "energy": -2.9, "unit": "hartree"}, 5]')
    with pytest.raises(InputError, match=r"not valid JSON \(line 1"):
        parse_json_text("[{")


def test_json_booleans_and_non_finite_are_not_numbers():
    with pytest.raises(InputError, match="row 1, column 'energy'.*true/false"):
        parse_json_text('[{"Z": 2, "energy": true, "unit": "hartree"}]')
    with pytest.raises(InputError, match="row 1, column 'energy'.*not a number"):
        parse_json_text('[{"Z": 2, "energy": NaN, "unit": "hartree"}]')
    with pytest.raises(InputError, match="row 1, column 'Z'"):
        parse_json_text('[{"Z": false, "energy": -2.9, "unit": "hartree"}]')


def test_huge_file_by_size(tmp_path, monkeypatch):
    path = tmp_path / "big.csv"
    path.write_text("Z,energy,unit\n" + "2,-2.9,hartree\n" * 100)
    monkeypatch.setattr(check_input, "MAX_BYTES", 100)
    with pytest.raises(ResourceError, match="exceeds the limit"):
        read_rows(path)


def test_huge_file_by_rows(monkeypatch):
    monkeypatch.setattr(check_input, "MAX_ROWS", 5)
    with pytest.raises(ResourceError, match="more than 5 rows"):
        parse_csv_text("Z,energy,unit\n" + "2,-2.9,hartree\n" * 6)
    with pytest.raises(ResourceError, match="more than 5 rows"):
        parse_json_text(json.dumps([{"Z": 2, "energy": -2.9, "unit": "hartree"}] * 6))


def test_read_rows_files(tmp_path):
    csv_path = tmp_path / "rows.csv"
    csv_path.write_text("\ufeffZ,energy,unit\n2,-2.9,hartree\n", encoding="utf-8")  # BOM tolerated
    assert read_rows(csv_path).format == "csv"
    json_path = tmp_path / "rows.txt"
    json_path.write_text('[{"Z": 2, "energy": -2.9, "unit": "hartree"}]')
    assert read_rows(json_path).format == "json"  # sniffed from the content
    with pytest.raises(InputError, match="no such file"):
        read_rows(tmp_path / "missing.csv")
    bad = tmp_path / "latin1.csv"
    bad.write_bytes("Z,energy,unit,label\n2,-2.9,hartree,caf\xe9\n".encode("latin-1"))
    with pytest.raises(InputError, match="not UTF-8"):
        read_rows(bad)
