"""`twoel check` and `twoel hf` on the command line (output contracts and error messages).

Check values: He -2.9033 Eh is +4.243770e-04 Eh above the exact energy -2.9037243770341196 Eh
(C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)) and recovers 98.991 % of the correlation
energy (HF limit -2.861679995612 Eh: C. F. Bunge et al., Phys. Rev. A 46, 3691 (1992); digits
from memory), by hand arithmetic on the two published values.
"""

import json

import pytest

from twoel.cli import main


def run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:  # argparse usage errors exit with status 2
        code = exc.code
    out, err = capsys.readouterr()
    return code, out, err


def test_check_one_energy_json(capsys):
    code, out, err = run(capsys, "check", "--Z", "2", "--energy", "-2.9033", "--unit", "hartree", "--json")
    assert code == 0, err
    row = json.loads(out)
    assert row["error_hartree"] == pytest.approx(0.000424, abs=5e-7)
    assert row["correlation_recovered_percent"] == pytest.approx(99.0, abs=0.05)
    assert row["flags"] == []


def test_check_one_energy_table(capsys):
    code, out, _ = run(capsys, "check", "--Z", "He", "--energy", "-2.9033", "--unit", "Eh")
    assert code == 0
    assert "+4.243770e-04" in out and "98.991" in out
    assert "Schwartz" in out


def _flags_column(table: str) -> str:
    """The flags cell of the one data row of a ``check`` table."""
    header, _rule, row = table.splitlines()[:3]
    names = [c.strip() for c in header.strip("|").split("|")]
    return [c.strip() for c in row.strip("|").split("|")][names.index("flags")]


@pytest.mark.parametrize("energy,flagged", [
    ("-2.90372437703425", True),     # 1.3e-13 Eh below the exact -2.9037243770341196 (Schwartz 2006)
    ("-2.9037243770341", False),     # 2e-14 Eh above it
])
def test_check_flags_below_exact_in_table(capsys, energy, flagged):
    code, out, _ = run(capsys, "check", "--Z", "2", "--energy", energy, "--unit", "hartree")
    assert code == 0
    assert (_flags_column(out) == "below_exact") is flagged
    assert ("not variational" in out) is flagged


def test_check_mixed_unit_file_json_and_csv(tmp_path, capsys):
    path = tmp_path / "rows.csv"
    path.write_text("Z,state,energy,unit,label\n2,1^1S,-2.9033,hartree,a\n2,1^1S,-79.0043,eV,b\n"
                    "2,1^1S,-1821.93,kcal/mol,c\n")
    code, out, err = run(capsys, "check", "--file", str(path), "--json")
    assert code == 0, err
    rows = json.loads(out)
    assert [r["label"] for r in rows] == ["a", "b", "c"]
    assert all(r["flags"] == [] for r in rows)
    assert {r["unit"] for r in rows} == {"hartree", "ev", "kcal/mol"}
    code, out, _ = run(capsys, "check", "--file", str(path), "--format", "csv")
    assert code == 0 and out.splitlines()[0].startswith("row,label,Z")
    assert len(out.strip().splitlines()) == 4


def test_check_json_file(tmp_path, capsys):
    path = tmp_path / "rows.json"
    path.write_text(json.dumps([{"Z": 1, "energy": -0.4879, "unit": "hartree", "label": "HF"}]))
    code, out, _ = run(capsys, "check", "--file", str(path), "--json")
    assert code == 0 and json.loads(out)[0]["flags"] == ["above_hartree_fock", "not_bound"]


def test_malformed_file_is_one_line_error_naming_row_and_column(tmp_path, capsys):
    path = tmp_path / "bad.csv"
    path.write_text("Z,energy,unit\n2,-2.9,hartree\n2,oops,hartree\n")
    code, out, err = run(capsys, "check", "--file", str(path))
    assert code == 2 and out == ""
    assert err.count("\n") == 1
    assert "row 2 (line 3), column 'energy'" in err and "Traceback" not in err


@pytest.mark.parametrize("argv,fragment", [
    (("check", "--Z", "2", "--energy", "-2.9"), "--unit"),
    (("check", "--Z", "2", "--energy", "abc", "--unit", "hartree"), "not a number"),
    (("check", "--Z", "2", "--energy", "-2.9", "--unit", "parsec"), "unknown energy unit"),
    (("check", "--file", "x.csv", "--Z", "2"), "not both"),
    (("check", "--file", "/nonexistent/rows.csv"), "no such file"),
])
def test_check_usage_errors(capsys, argv, fragment):
    code, _out, err = run(capsys, *argv)
    assert code == 2 and fragment in err


def test_output_file_is_not_overwritten_unless_forced(tmp_path, capsys):
    target = tmp_path / "out.json"
    args = ("check", "--Z", "2", "--energy", "-2.9033", "--unit", "hartree", "--json", "--output", str(target))
    assert run(capsys, *args)[0] == 0
    first = target.read_text()
    assert json.loads(first)["error_hartree"] > 0
    code, _out, err = run(capsys, *args)
    assert code == 2 and "--force" in err
    assert run(capsys, *args, "--force")[0] == 0
    assert [p.name for p in tmp_path.iterdir()] == ["out.json"]  # no temporary file left


def test_hf_json_contract(capsys):
    code, out, err = run(capsys, "hf", "--Z", "2", "--sizes", "1,2,4:8:2", "--json")
    assert code == 0, err
    d = json.loads(out)
    # HF limit (Bunge et al. 1992, see above), reached to 2e-9 Eh with 8 functions
    assert d["energy_hartree"] == pytest.approx(-2.861679995612, abs=2e-9)
    # 1s orbital energy: E. Clementi and C. Roetti, At. Data Nucl. Data Tables 14, 177 (1974) (from memory)
    assert d["orbital_energy_hartree"] == pytest.approx(-0.91796, abs=1e-5)
    assert [s["size"] for s in d["convergence"]] == [1, 2, 4, 6, 8]
    # one 1s Slater function: the screened closed form E = -(Z - 5/16)²
    assert d["convergence"][0]["energy_hartree"] == pytest.approx(-(2 - 5 / 16) ** 2, abs=1e-12)


def test_hf_text_and_split_shell(capsys):
    code, out, _ = run(capsys, "hf", "--Z", "H", "--sizes", "1,2,4")
    assert code == 0 and "does not bind H-" in out and "| 4 |" in out
    code, out, _ = run(capsys, "hf", "--Z", "H", "--split-shell", "--sizes", "4", "--json")
    d = json.loads(out)
    assert code == 0 and d["is_hartree_fock"] is False and d["energy_hartree"] < -0.5
    assert any("NOT Hartree-Fock" in n for n in d["notes"])


def test_hf_correlation_table(capsys):
    code, out, _ = run(capsys, "hf", "--correlation", "--json")
    rows = json.loads(out)
    assert code == 0 and len(rows) == 10
    assert rows[1]["correlation_hartree"] == pytest.approx(-0.0420444, abs=5e-8)


@pytest.mark.parametrize("argv,fragment", [
    (("hf",), "--Z"),
    (("hf", "--Z", "2", "--sizes", "4,2"), "increase"),
    (("hf", "--Z", "2", "--sizes", "a"), "sizes"),
    (("hf", "--Z", "0"), "Z"),
])
def test_hf_usage_errors(capsys, argv, fragment):
    code, _out, err = run(capsys, *argv)
    assert code == 2 and fragment in err
