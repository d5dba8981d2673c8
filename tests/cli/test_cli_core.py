"""Command line: the energy and series contracts and clean errors.

Check values: He exact -2.9037243770341196 Eh (C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006));
CODATA 2022 hartree = 27.211386245981 eV; one screened 1s² product gives E = -(Z - 5/16)² and
the unscreened hydrogenic product E = -Z² + 5Z/8 (closed forms).
"""

import json
import subprocess
import sys

import pytest

from twoel.cli import main


def run_cli(capsys, *argv):
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


def test_energy_json_contract(capsys):
    code, out, _err = run_cli(capsys, "energy", "--Z", "2", "--family", "hylleraas", "--size", "4", "--json")
    assert code == 0
    data = json.loads(out)
    for key in ("Z", "state", "family", "n_terms", "energy_hartree", "ionization_energy_hartree",
                "ionization_energy_ev", "reference_energy_hartree", "parameters", "bound"):
        assert key in data
    assert data["state"] == "1^1S" and data["family"] == "hylleraas" and data["bound"] is True
    assert isinstance(data["energy_hartree"], float)
    # Schwartz (2006) reference attached
    assert data["reference_energy_hartree"] == pytest.approx(-2.9037243770341196, abs=1e-15)
    # a variational upper bound; 22 Hylleraas terms come within 1e-4 Eh (from memory: ~1e-5)
    assert -2.9037243770341196 < data["energy_hartree"] < -2.9036
    # so the ionization energy lies just below the exact 0.9037243770341196 Eh; CODATA eV factor
    assert 0.9036 < data["ionization_energy_hartree"] < 0.9037243770341196
    assert data["ionization_energy_ev"] == pytest.approx(data["ionization_energy_hartree"] * 27.211386245981,
                                                         rel=1e-11)
    assert set(data["parameters"]) == {"alpha"}
    assert data["provenance"]["version"]


def test_energy_summary_prints_units_and_reference(capsys):
    code, out, _ = run_cli(capsys, "energy", "--Z", "He", "--family", "screened")
    assert code == 0
    # -(2 - 5/16)² = -2.84765625 Eh, printed with its units and the published reference
    assert "-2.84765625" in out and "eV" in out and "cm⁻¹" in out and "Schwartz" in out


def test_not_bound_is_reported_as_such(capsys):
    code, out, _ = run_cli(capsys, "energy", "--Z", "1", "--family", "screened", "--json")
    data = json.loads(out)
    assert code == 4 and data["bound"] is False and data["ionization_energy_hartree"] is None
    # -(1 - 5/16)² = -0.47265625 Eh lies above H(1s) + e⁻ = -0.5 Eh
    assert data["energy_hartree"] == pytest.approx(-0.47265625, abs=1e-12)
    code, out, _ = run_cli(capsys, "energy", "--Z", "1", "--family", "screened")
    assert code == 4
    assert "not bound" in out


@pytest.mark.parametrize("argv", [
    ["energy", "--Z", "0"], ["energy", "--Z", "-3"], ["energy", "--Z", "abc"],
    ["energy", "--Z", "2", "--family", "nope"], ["energy", "--Z", "2", "--size", "100000"],
    ["energy", "--Z", "2", "--state", "7^5Q"], ["energy", "--Z", "2", "--param", "alpha=__import__"],
    ["series", "--Z", "10:1"], ["energy"], ["energy", "--Z", "2", "--terms", "1,2"],
])
def test_bad_input_is_one_line_and_nonzero(capsys, argv):
    try:
        code = main(argv)
    except SystemExit as exc:  # argparse usage errors
        code = exc.code
    err = capsys.readouterr().err
    assert code != 0
    assert "Traceback" not in err
    assert len(err.strip().splitlines()) == 1, err


def test_series_formats(capsys):
    code, out, _ = run_cli(capsys, "series", "--Z", "2:3", "--family", "screened", "--format", "csv")
    assert code == 0
    lines = out.strip().splitlines()
    assert lines[0].startswith("Z,") and len(lines) == 3
    code, out, _ = run_cli(capsys, "series", "--Z", "2,3", "--family", "screened", "--format", "json")
    rows = json.loads(out)
    assert [r["ion"] for r in rows] == ["He", "Li+"]
    assert rows[1]["energy_hartree"] == pytest.approx(-(3 - 5 / 16) ** 2, abs=1e-11)
    code, out, _ = run_cli(capsys, "series", "--Z", "2:3", "--family", "screened", "--format", "latex")
    assert out.count(r"\begin{tabular}") == out.count(r"\end{tabular}") == 1
    code, out, _ = run_cli(capsys, "series", "--Z", "1:2", "--family", "screened")
    assert out.startswith("| Z |")


def test_console_entry_point_runs_as_module():
    proc = subprocess.run([sys.executable, "-m", "twoel", "energy", "--Z", "2", "--family", "hydrogenic", "--json"],
                          capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr
    assert json.loads(proc.stdout)["energy_hartree"] == pytest.approx(-2.75, abs=1e-12)   # -4 + 5/4


def test_every_help_page_renders(capsys):
    from twoel.cli import build_parser

    parser = build_parser()
    with pytest.raises(SystemExit) as exc:
        parser.parse_args(["--help"])
    assert exc.value.code == 0
    commands = parser._subparsers._group_actions[0].choices
    # every landed command is still there
    assert set(commands) == {"energy", "series", "converge", "transition", "properties", "spectrum",
                             "hf", "check", "report", "levels"}
    for name in commands:
        with pytest.raises(SystemExit) as exc:
            parser.parse_args([name, "--help"])
        assert exc.value.code == 0, name
