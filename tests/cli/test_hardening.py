"""Bad input to twoel's writers, size options and API numbers: one-line refusals, never a traceback.

Every path here lies in pytest's ``tmp_path`` or certainly does not exist; the "device" case is
a FIFO made in ``tmp_path`` (nothing outside the temporary folder is touched).
"""

from __future__ import annotations

import json
import os
import stat

import pytest

from twoel import io as tio
from twoel.errors import InputError




def one_line_refusal(code, err):
    assert code == 2, err
    assert err.startswith("twoel: error: ") and err.count("\n") == 1 and "Traceback" not in err


# --- 1. safe output -------------------------------------------------------------------------

def test_fifo_and_folder_are_never_replaced(tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    folder = tmp_path / "afolder"
    folder.mkdir()
    (folder / "keep.txt").write_text("mine")
    for target, kind in ((fifo, "FIFO"), (folder, "folder")):
        with pytest.raises(InputError, match=f"is a.*{kind}.*not a regular file"):
            tio.atomic_write_text(target, "x\n")
    assert stat.S_ISFIFO(os.stat(fifo).st_mode)
    assert (folder / "keep.txt").read_text() == "mine"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["afolder", "pipe"]   # no temporary left


def test_fake_character_device_is_refused(tmp_path, monkeypatch):
    target = tmp_path / "dev-like"
    target.write_text("untouched")
    real_stat = os.stat

    def fake_stat(path, *args, **kwargs):
        info = real_stat(path, *args, **kwargs)
        if os.fspath(path) == os.fspath(target):
            return os.stat_result((stat.S_IFCHR | 0o666,) + tuple(info)[1:])
        return info

    monkeypatch.setattr(tio.os, "stat", fake_stat)
    with pytest.raises(InputError, match="character device"):
        tio.atomic_write_bytes(target, b"x")
    monkeypatch.undo()
    assert target.read_text() == "untouched"


def test_missing_folder_file_parent_and_unwritable_folder(tmp_path, monkeypatch):
    plain = tmp_path / "plain.txt"
    plain.write_text("a file")
    with pytest.raises(InputError, match="does not exist"):
        tio.atomic_write_text(tmp_path / "missing" / "out.json", "x")
    with pytest.raises(InputError, match="under a file|is a file"):
        tio.atomic_write_text(plain / "out.json", "x")

    def denied(*args, **kwargs):     # root ignores permission bits: simulate a read-only folder
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(tio.tempfile, "mkstemp", denied)
    with pytest.raises(InputError, match="Permission denied"):
        tio.atomic_write_text(tmp_path / "out.json", "x")
    assert plain.read_text() == "a file"


def test_cli_output_under_a_file_is_one_line(tmp_path, run_cli):
    plain = tmp_path / "plain.txt"
    plain.write_text("a file")
    code, _, err = run_cli("check", "--Z", "2", "--energy", "-2.9", "--json",
                       "--out", str(plain / "x.json"))
    one_line_refusal(code, err)


def test_replaced_file_keeps_its_mode(tmp_path):
    target = tmp_path / "table.csv"
    target.write_text("old\n")
    os.chmod(target, 0o640)
    tio.atomic_write_text(target, "new\n")
    assert target.read_text() == "new\n" and stat.S_IMODE(target.stat().st_mode) == 0o640
    fresh = tmp_path / "fresh.csv"
    tio.atomic_write_text(fresh, "x")
    mask = os.umask(0)
    os.umask(mask)
    assert stat.S_IMODE(fresh.stat().st_mode) == 0o666 & ~mask


def _twoel_folder(path):
    path.mkdir()
    (path / "provenance.json").write_text(json.dumps({"format": "twoel-report-provenance",
                                                      "format_version": 1}))
    (path / "index.md").write_text("old report")


def test_folder_replace_only_of_a_twoel_folder(tmp_path):
    ours = tmp_path / "report"
    _twoel_folder(ours)
    with tio.atomic_directory(ours, overwrite=True) as folder:
        (folder / "new.txt").write_text("new")
    assert sorted(p.name for p in ours.iterdir()) == ["new.txt"]

    foreign = tmp_path / "photos"
    foreign.mkdir()
    (foreign / "holiday.jpg").write_text("precious")
    (foreign / "provenance.json").write_text(json.dumps({"format": "something-else"}))
    with pytest.raises(InputError, match="not a folder twoel wrote"):
        with tio.atomic_directory(foreign, overwrite=True):
            raise AssertionError("must refuse before building")
    assert (foreign / "holiday.jpg").read_text() == "precious"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["photos", "report"]


def test_root_home_and_current_folder_are_refused_before_anything(tmp_path, monkeypatch):
    home = tmp_path / "home"
    _twoel_folder(home)                      # even a twoel folder is refused when it is home/cwd
    work = tmp_path / "work"
    _twoel_folder(work)
    monkeypatch.setenv("HOME", str(home))
    monkeypatch.chdir(work)
    for target, reason in ((home, "home folder"), (work, "current folder"), (".", "current folder"),
                           (tmp_path, "holding the")):
        with pytest.raises(InputError, match=reason):
            with tio.atomic_directory(target, overwrite=True):
                raise AssertionError("must refuse before building")
    assert tio._protected(tio.Path("/")) == "the root folder"    # checked on the name only
    assert (home / "index.md").read_text() == "old report"
    assert (work / "index.md").read_text() == "old report"


# --- 2. bounds before expansion -------------------------------------------------------------

@pytest.mark.parametrize("argv, words", [
    (("hf", "--Z", "2", "--sizes", "1:100000000"), ("--sizes", "at most 30", "100000000")),
    (("hf", "--Z", "2", "--sizes", "1," + "9" * 5000), ("--sizes", "at most 30", "5000 digits")),
    (("energy", "--Z", "2", "--terms", "0,0,99999999999999999999"),
     ("--terms", "at most 60", "99999999999999999999")),
    (("energy", "--Z", "2", "--size", "9" * 5000), ("--size", "at most", "5000 digits")),
])
def test_huge_sizes_and_powers_are_refused_on_the_text(run_cli, argv, words):
    code, _, err = run_cli(*argv)
    assert code == 2 and err.count("\n") == 1 and "Traceback" not in err, err
    for word in words:
        assert word in err


def test_size_list_counts_a_range_before_expanding_it(monkeypatch):
    import argparse

    from twoel.cli import common

    built = []
    real_range = range
    monkeypatch.setattr(common, "range", lambda *a: built.append(a) or real_range(*a), raising=False)
    with pytest.raises(argparse.ArgumentTypeError, match="at most 1000 sizes, got 100000"):
        common.size_list("1:100000")
    assert built == []                                   # refused before any range was built
    with pytest.raises(argparse.ArgumentTypeError, match="at most 6000 terms"):
        common.term_list(";".join(["0,0,1"] * 6001))
    assert common.size_list("1,2,4:14:2") == (1, 2, 4, 6, 8, 10, 12, 14)


# --- 3. the energy checker on the command line ----------------------------------------------

def test_check_csv_escapes_formula_labels(tmp_path, run_cli):
    import csv
    import io

    rows = tmp_path / "rows.csv"
    rows.write_text("Z,energy,unit,label\n" + "".join(
        f"2,-2.9033,hartree,{start}cmd|x\n" for start in ("=", "+", "-", "@")) + "2,-2.9033,hartree,CISD\n")
    out = tmp_path / "out.csv"
    code, _, err = run_cli("check", "--file", str(rows), "--format", "csv", "--out", str(out))
    assert code == 0, err
    labels = [r["label"] for r in csv.DictReader(io.StringIO(out.read_text()))]
    assert labels == ["'=cmd|x", "'+cmd|x", "'-cmd|x", "'@cmd|x", "CISD"]


def test_check_cli_units_and_hostile_files(tmp_path, run_cli):
    code, out, err = run_cli("check", "--Z", "2", "--energy", "-2903.3", "--unit", "MEh")
    one_line_refusal(code, err)
    assert "ambiguous" in err
    code, out, err = run_cli("check", "--Z", "2", "--energy", str(-2.9033 * 219474.6313632),
                         "--unit", "cm⁻¹", "--json")
    assert code == 0 and json.loads(out)["flags"] == [], err
    deep = tmp_path / "deep.json"
    deep.write_text("[" * 100_000 + "]" * 100_000)
    latin = tmp_path / "latin.csv"
    latin.write_bytes(b"Z,energy,unit,label\n2,-2.9,hartree,M\xf8ller\n")
    for path in (deep, latin, tmp_path / "no-such-file.csv"):
        code, _, err = run_cli("check", "--file", str(path))
        one_line_refusal(code, err)
    code, out, err = run_cli("check", "--Z", "2", "--energy=-1e300", "--unit", "Eh", "--json")
    assert code == 0 and "below_exact" in json.loads(out)["flags"], err


# --- 4. hf at large charges -------------------------------------------------------------------

@pytest.mark.slow
def test_hf_default_sizes_at_z_118(run_cli):
    """Was 'no converged SCF' after tens of seconds; E2(HF) = -0.111003 (from memory) to 5e-5."""
    code, out, err = run_cli("hf", "--Z", "118", "--json", "--quiet")
    assert code == 0, err
    energy = json.loads(out)["energy_hartree"]
    assert energy + 118**2 - 5 * 118 / 8 == pytest.approx(-0.111003, abs=5e-5)


# --- 5. regressions: negative numbers, huge powers, tiny charges ----------------------------

@pytest.mark.parametrize("text", ["-1e300", "-2.9033D+00", "-.5e1", "-2.9033"])
def test_a_negative_number_after_an_option_is_a_value(run_cli, text):
    """``--energy -1e300`` was read by argparse as an unknown option."""
    code, out, err = run_cli("check", "--Z", "2", "--energy", text, "--unit", "Eh", "--json")
    assert code == 0, err
    assert json.loads(out)["energy_text"] == text


def test_a_negative_charge_is_refused_as_a_value(run_cli):
    code, _, err = run_cli("energy", "--Z", "-inf")
    one_line_refusal(code, err.replace("twoel energy: error:", "twoel: error:"))
    assert "'Z'" in err and "-inf" in err


@pytest.mark.parametrize("term", [(0, 0, 100), (100, 0, 0), (0, 0, 10**400), (0, 0, float("inf")),
                                  (61, 0, 0)])
def test_api_refuses_huge_hylleraas_powers_as_input_errors(term):
    """Powers near 100 raised a raw OverflowError from the integrals' factorials."""
    from twoel import solve

    with pytest.raises(InputError, match="at most 60|non-negative integers"):
        solve(2, family="hylleraas", options={"terms": [(0, 0, 0), term]})


def test_the_cli_and_the_family_share_the_power_bound():
    from twoel.basis import hylleraas
    from twoel.cli import common

    assert common.MAX_TERM_POWER == hylleraas.MAX_TERM_POWER


@pytest.mark.parametrize("family", ["hylleraas", "exponential", "screened"])
def test_one_small_charge_rule_for_every_family(run_cli, family):
    """``energy --Z 1e-6 --family hylleraas`` ran for about 20 s before saying 'not bound'."""
    import time

    from twoel.basis.exponential_boxes import MIN_CHARGE

    start = time.perf_counter()
    code, out, err = run_cli("energy", "--Z", "1e-6", "--family", family)
    one_line_refusal(code, err)
    assert f"Z >= {MIN_CHARGE:g}" in err and out == ""
    assert time.perf_counter() - start < 3.0               # refused before any basis is built


def test_below_the_critical_charge_the_search_stops_at_once():
    """No two-electron state is bound below Z_c = 0.911 028 2 (Estienne, Busuttil, Moini, Drake,
    Phys. Rev. Lett. 112, 173001 (2014), from memory): the optimizer stops after a few steps."""
    import warnings

    from twoel import solve
    from twoel.solver.pipeline import HOPELESS_EVALUATIONS

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        result = solve(0.01, family="hylleraas", size=2)
    assert not result.bound
    assert result.optimizer["method"] == "stopped early"
    assert result.optimizer["n_evaluations"] == HOPELESS_EVALUATIONS
    assert "critical charge" in result.optimizer["message"]


# --- 6. found by a hostile-input campaign -----------------------------------------------------

@pytest.mark.parametrize("argv, words", [
    (("converge", "--Z", "2", "--largest", "1" + "0" * 399), ("--largest", "at most 100000")),
    (("converge", "--Z", "2", "--count", "100000"), ("--count", "at most 50")),
    (("converge", "--Z", "2", "--count", "2"), ("--count", "at least 3")),
    (("converge", "--Z", "2", "--sizes", "1,2," + "9" * 400), ("--sizes", "at most 100000")),
])
def test_converge_bounds_its_numbers_on_the_text(run_cli, argv, words):
    """--largest 10^399 and --count 100000 were internal errors (OverflowError)."""
    code, _, err = run_cli(*argv)
    assert code == 2 and err.count("\n") == 1 and "Traceback" not in err, err
    for word in words:
        assert word in err


def test_an_output_name_too_long_for_the_system_is_one_line(run_cli, tmp_path):
    code, _, err = run_cli("check", "--Z", "2", "--energy", "-2.9", "--unit", "Eh",
                           "--out", str(tmp_path / ("x" * 300)))
    one_line_refusal(code, err)
    assert "File name too long" in err
    assert list(tmp_path.iterdir()) == []


def test_no_command_is_one_line(run_cli):
    code, out, err = run_cli()
    one_line_refusal(code, err)
    assert "give a command" in err and "energy" in err and out == ""


def test_a_report_over_a_file_is_refused_before_solving(run_cli, tmp_path, monkeypatch):
    from twoel.analysis import sweep

    def refuse(*_args, **_kwargs):
        raise AssertionError("solved before the output folder was checked")

    monkeypatch.setattr(sweep, "solve_many", refuse)
    plain = tmp_path / "existing.txt"
    plain.write_text("keep")
    code, _, err = run_cli("report", "--quiet", "--demo", "--out", str(plain), "--overwrite")
    one_line_refusal(code, err)
    assert "not a folder" in err and plain.read_text() == "keep"


def test_energy_of_an_unbound_state_has_its_own_exit_code(run_cli):
    """Z = 0.7 lies below the critical charge Z_c ≈ 0.911 (Estienne et al., Phys. Rev. Lett.
    112, 173001 (2014)), so no 1¹S root is below -Z²/2: exit 4 and the words "not bound"."""
    from twoel.cli.energy import NOT_BOUND_EXIT_CODE

    code, out, _ = run_cli("energy", "--Z", "0.7", "--family", "exponential", "--size", "40")
    assert code == NOT_BOUND_EXIT_CODE == 4
    assert "not bound" in out and "threshold (one-electron ion): -0.245 Eh" in out
    code, out, _ = run_cli("energy", "--Z", "2", "--family", "exponential", "--size", "40", "--json")
    assert code == 0
