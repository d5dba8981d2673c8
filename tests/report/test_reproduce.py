"""Reproduction of report folders from their provenance: tolerances, strict mode, edited
blocks (constants, computations, numbers), exit codes and malformed files."""

import json
import math
import subprocess
import sys
from pathlib import Path

import pytest

import scipy.constants

from twoel.errors import InputError
from twoel.report import build, reproduce

ROOT = Path(__file__).resolve().parents[2]

#: a two-ion series and a three-size convergence run (Hylleraas sizes 0-2): a few seconds
TINY = {
    "name": "tiny-repro",
    "series": {"Z": "1:2", "state": "1^1S", "family": "hylleraas", "size": 1},
    "convergence": {"Z": 2, "family": "hylleraas", "sizes": [0, 1, 2]},
}


@pytest.fixture(scope="module")
def tiny(tmp_path_factory):
    out = tmp_path_factory.mktemp("repro") / "tiny"
    build.build_report(TINY, out)
    return out / "provenance.json"


def _cli(*args, env=None):
    return subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", *map(str, args)],
                          capture_output=True, text=True, cwd=ROOT, env=env)


def _edited(path: Path, tmp_path: Path, edit, name="edited.json") -> Path:
    data = json.loads(path.read_text(encoding="utf-8"))
    edit(data)
    target = tmp_path / name
    target.write_text(json.dumps(data), encoding="utf-8")
    return target


def test_a_fresh_report_reproduces(tiny, tmp_path):
    done = _cli("--from-provenance", tiny, "--out", tmp_path / "again")
    assert done.returncode == 0, done.stdout + done.stderr
    last = done.stdout.strip().splitlines()[-1]
    assert last.startswith("reproduced within tolerance (tolerance mode)")
    n = sum(len(v) for cols in json.loads(tiny.read_text())["numbers"].values() for v in cols.values())
    assert f"{n} numbers compared" in last
    assert "record digests: every block as written" in done.stdout
    # the CODATA edition scipy ships is the one recorded and checked
    assert f"constants: {build.constants.CODATA_EDITION}" in done.stdout
    again = json.loads((tmp_path / "again" / "provenance.json").read_text())
    assert again["environment"]["threads"].keys() == set(reproduce.THREAD_VARIABLES)


def test_edited_constants_are_detected(tiny, tmp_path):
    key = "Hartree energy in eV"

    def edit(data):
        # CODATA 2018 value (from memory; CODATA 2022 is 27.211 386 245 981(30) eV)
        data["constants"]["values"][key][0] = 27.211386245988
    done = _cli("--from-provenance", _edited(tiny, tmp_path, edit), "--out", tmp_path / "again")
    assert done.returncode == 1, done.stdout + done.stderr
    assert "constants: DIFFER" in done.stdout and repr(key) in done.stdout
    assert scipy.constants.physical_constants[key][0] != 27.211386245988
    assert done.stdout.strip().splitlines()[-1].startswith("NOT reproduced")


def test_edited_computations_are_detected_also_without_digests(tiny, tmp_path):
    def edit(data):
        data["computations"]["convergence"][1]["task"]["size"] = 5
        data["computations"]["series"][0]["result"]["provenance"]["basis"]["powers"][1] = [0, 0, 3]
        del data["digests"]            # the old format: only the re-run comparison can see it
    data = json.loads(tiny.read_text())
    result = build.rebuild_from_provenance(_edited(tiny, tmp_path, edit), tmp_path / "again")
    check = result.reproduction
    assert check["reproduced"] is False and check["digests"]["status"] == "not recorded"
    lines = check["computations"]["mismatches"]
    assert any(line.startswith("computations.convergence[1].task") for line in lines)
    assert any(line.startswith("computations.series[0].result.provenance.basis.powers") for line in lines)
    assert check["beyond"] == []        # the numbers themselves still reproduce
    assert data["computations"]["convergence"][1]["task"]["size"] == 1


def test_an_edit_anywhere_in_a_digested_block_is_detected(tiny, tmp_path):
    def edit(data):
        data["computations"]["series"][1]["result"]["reference_source"] = "someone else"
    done = _cli("--from-provenance", _edited(tiny, tmp_path, edit), "--out", tmp_path / "again")
    assert done.returncode == 1
    assert "the computations block was edited after the build" in done.stdout


def test_tolerance_accepts_a_small_change_and_rejects_a_large_one(tiny, tmp_path):
    data = json.loads(tiny.read_text())
    e = data["numbers"]["series"]["energy_hartree"][1]          # He, size 1 (no error bar)
    tol = reproduce.number_tolerances(data["numbers"])["series"]["energy_hartree"][1]
    assert tol == (reproduce.REL_ENERGY * abs(e), "arithmetic")

    def shift(factor):
        def edit(d):
            d["numbers"]["series"]["energy_hartree"][1] = e + factor * tol[0]
            del d["digests"]
        return edit
    small = build.rebuild_from_provenance(_edited(tiny, tmp_path, shift(0.3), "small.json"), tmp_path / "a")
    assert small.reproduction["reproduced"] is True
    ratio, where = small.reproduction["largest"]
    assert where == "series.energy_hartree[1]" and 0.2 < ratio < 0.4
    large = build.rebuild_from_provenance(_edited(tiny, tmp_path, shift(3.0), "large.json"), tmp_path / "b")
    assert large.reproduction["reproduced"] is False
    assert [line.split(":")[0] for line in large.reproduction["beyond"]] == ["series.energy_hartree[1]"]
    assert large.reproduction["verdict"][-1].startswith("NOT reproduced (tolerance mode): 1 of")


def test_strict_mode_flags_one_ulp(tiny, tmp_path):
    def edit(d):
        x = d["numbers"]["convergence"]["energy_hartree"][2]
        d["numbers"]["convergence"]["energy_hartree"][2] = math.nextafter(x, 0.0)
        del d["digests"]
    path = _edited(tiny, tmp_path, edit)
    loose = build.rebuild_from_provenance(path, tmp_path / "loose")
    assert loose.reproduction["reproduced"] is True and loose.reproduction["identical"] is False
    done = _cli("--from-provenance", path, "--out", tmp_path / "strict", "--strict")
    assert done.returncode == 1
    assert "mode: strict" in done.stdout and "convergence.energy_hartree[2]" in done.stdout
    assert done.stdout.strip().splitlines()[-1].startswith("NOT reproduced (strict mode)")


def test_uncertainty_is_the_tolerance_when_recorded():
    numbers = {"levels": {"energy_hartree": [-2.9, -2.1], "error_bar_hartree": [1e-9, None],
                          "reference_hartree": [-2.9, -2.1], "reference_uncertainty_hartree": [1e-12, 0.0],
                          "difference_hartree": [1e-10, 2e-10]}}
    tols = reproduce.number_tolerances(numbers)["levels"]
    assert tols["energy_hartree"] == [(1e-9, "uncertainty"), (2.1e-12, "arithmetic")]
    assert tols["reference_hartree"] == [(1e-12, "uncertainty"), (0.0, "exact")]
    assert tols["difference_hartree"][0][0] == pytest.approx(1e-9 + 1e-12)
    # Aitken gain (1 + 2p)^2 for E = 1 + 0.5^k: q = 1/2, p = 1, gain 9
    e = [1 + 0.5 ** k for k in range(3)]
    conv = reproduce.number_tolerances({"c": {"energy_hartree": e, "extrapolated_hartree": [None, None, 1.0]}})
    assert conv["c"]["extrapolated_hartree"][2][0] == pytest.approx(9 * 1e-12 * max(map(abs, e)))


@pytest.mark.parametrize("edit, message", [
    (lambda d: d.__setitem__("numbers", {"series": {"energy_hartree": ["-2.9"]}}), "list of numbers"),
    (lambda d: d.__setitem__("config", [1, 2]), "'config'"),
    (lambda d: d.__setitem__("computations", {"series": [{"task": 3}]}), "computations.series"),
    (lambda d: d.pop("numbers"), "'numbers'"),
])
def test_malformed_provenance_is_one_line_exit_2(tiny, tmp_path, edit, message):
    done = _cli("--from-provenance", _edited(tiny, tmp_path, edit), "--out", tmp_path / "again")
    assert done.returncode == 2 and done.stderr.count("\n") == 1 and message in done.stderr, done.stderr
    assert "Traceback" not in done.stderr and not (tmp_path / "again").exists()
    with pytest.raises(InputError):
        build.read_provenance(_edited(tiny, tmp_path, edit, "again.json"))


def test_old_format_without_new_blocks_reads_as_not_recorded(tiny, tmp_path):
    def edit(d):
        for name in ("digests", "environment", "constants"):
            d.pop(name)
    result = build.rebuild_from_provenance(_edited(tiny, tmp_path, edit), tmp_path / "again")
    check = result.reproduction
    assert check["reproduced"] is True
    assert "constants: not recorded" in "\n".join(check["verdict"])
    assert any("recorded: not recorded" in line for line in check["environment"])


@pytest.mark.slow
@pytest.mark.parametrize("threads", [None, "1"])
def test_committed_demo_reproduces(tmp_path, threads):
    import os

    provenance = ROOT / "reports" / "demo-isoelectronic" / "provenance.json"
    if not provenance.is_file():
        pytest.skip("demo report not in this checkout")
    env = {k: v for k, v in os.environ.items() if k != "OPENBLAS_NUM_THREADS"}
    if threads:
        env["OPENBLAS_NUM_THREADS"] = threads
    done = _cli("--from-provenance", provenance, "--out", tmp_path / "again", env=env)
    assert done.returncode == 0, done.stdout + done.stderr
    assert "reproduced within tolerance" in done.stdout


def test_error_bar_tolerance_is_float64_not_the_energy_uncertainty():
    numbers = {"levels": {"energy_hartree": [-2.9], "error_bar_hartree": [1e-9]}}
    tol = reproduce.number_tolerances(numbers)["levels"]["error_bar_hartree"][0]
    assert tol == (reproduce.ERROR_BAR_GAIN * 1e-12 * 2.9, "arithmetic")
    changed = {"levels": {"energy_hartree": [-2.9 + 1e-10], "error_bar_hartree": [1e-9 + 1e-13]}}
    check = reproduce.compare_within(numbers, changed)
    assert check["beyond"] == [] and check["within_uncertainty_only"] == 1      # the energy only
    assert check["largest"][1] == "levels.energy_hartree[0]"
