"""JSON output of the command line: standard JSON (RFC 8259) only, compact records by default."""

import dataclasses
import json

import numpy as np
import pytest
from scipy.constants import physical_constants

from twoel.io import dumps_json


def _strict_loads(text: str):
    """Parse ``text`` as RFC 8259 JSON: the literals NaN, Infinity, -Infinity are refused."""
    def refuse(name):
        raise ValueError(f"non-standard JSON literal {name}")

    return json.loads(text, parse_constant=refuse)


def test_non_finite_numbers_become_null_everywhere():
    """RFC 8259 has no literal for infinity or NaN: they must become null, also inside NumPy
    scalars and arrays, tuples and nested mappings, and never the strings "inf"/"nan"."""
    payload = {"a": float("inf"), "b": -float("inf"), "c": float("nan"),
               "d": np.float32("nan"), "e": np.array([1.5, np.inf, -np.inf]),
               "f": (np.float64("inf"), {"g": [float("nan")]}), "h": 2.5, "i": np.int64(3)}
    text = dumps_json(payload)
    data = _strict_loads(text)
    assert data == {"a": None, "b": None, "c": None, "d": None, "e": [1.5, None, None],
                    "f": [None, {"g": [None]}], "h": 2.5, "i": 3}
    for word in ("inf", "nan", "Infinity", "NaN"):
        assert word not in text


def test_energy_record_with_an_infinite_condition_number(capsys):
    """A singular overlap (condition number inf) is written as null by the energy command's
    encoder, in the compact and in the full record."""
    from twoel import solve
    from twoel.cli.common import energy_record

    result = solve(2.0, "1^1S", family="hylleraas", size=1, optimize=False)
    singular = dataclasses.replace(result, condition_number=float("inf"), virial_ratio=float("nan"))
    for full in (False, True):
        text = dumps_json(energy_record(singular, full=full))
        data = _strict_loads(text)
        assert data["condition_number"] is None and data["virial_ratio"] is None
        assert "Infinity" not in text and "NaN" not in text


@pytest.fixture(scope="module")
def energy_outputs():
    """``twoel energy --json`` with and without ``--full`` for He in 300 exponential terms."""
    import contextlib
    import io

    from twoel.cli import main

    texts = {}
    for extra in ([], ["--full"]):
        out = io.StringIO()
        with contextlib.redirect_stdout(out):
            assert main(["energy", "--Z", "2", "--family", "exponential", "--size", "300",
                         "--json", "--quiet", *extra]) == 0
        texts["full" if extra else "compact"] = out.getvalue()
    return texts


def test_default_energy_json_is_compact(energy_outputs):
    """The default record is tens of lines of standard JSON; its energy agrees with Schwartz's
    He ground state -2.903724377034119598 Eh (C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006))
    to the ~1e-11 Eh that 300 exponential terms reach, within the printed error bar."""
    text = energy_outputs["compact"]
    assert len(text.splitlines()) < 200
    data = _strict_loads(text)
    assert "basis" not in data["provenance"] and "boxes" not in data["provenance"]
    assert data["provenance"]["constants"].startswith("CODATA")
    assert data["energy_hartree"] == pytest.approx(-2.903724377034120, abs=1e-10)
    assert 0 < data["energy_hartree"] + 2.903724377034120 <= data["error_bar_hartree"]
    # I = E(He+) - E(He) = -2 Eh - E, in eV with the CODATA hartree
    hartree_ev = physical_constants["Hartree energy in eV"][0]
    assert data["ionization_energy_ev"] == pytest.approx((2.903724377034120 - 2) * hartree_ev, abs=1e-9)


def test_full_energy_json_keeps_everything(energy_outputs):
    """``--full`` prints the whole record as before (basis included); every key of the compact
    record is spelled as in the full one and holds the same value."""
    compact = _strict_loads(energy_outputs["compact"])
    full = _strict_loads(energy_outputs["full"])
    assert full["provenance"]["basis"]
    volatile = {"elapsed_seconds", "provenance", "record"}
    for key, value in compact.items():
        if key not in volatile:
            assert full[key] == value, key
    for key, value in compact["provenance"].items():
        assert full["provenance"][key] == value, key


def test_converge_json_compact_and_full(capsys):
    """``twoel converge --json`` keeps every row but only a short provenance; ``--full`` adds the
    boxes of the last basis.  The energies are variational upper bounds of Schwartz's He value
    (C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006))."""
    from twoel.cli import main

    argv = ["converge", "--Z", "2", "--sizes", "50,71,100", "--json", "--quiet"]
    assert main(argv) == 0
    compact = _strict_loads(capsys.readouterr().out)
    assert main(argv + ["--full"]) == 0
    full = _strict_loads(capsys.readouterr().out)
    assert "boxes" not in compact["provenance"]["last"] and full["provenance"]["last"]["boxes"]
    assert [r["size"] for r in compact["rows"]] == [50, 71, 100]
    assert [r["energy_hartree"] for r in compact["rows"]] == [r["energy_hartree"] for r in full["rows"]]
    assert all(r["energy_hartree"] > -2.903724377034120 for r in compact["rows"])
