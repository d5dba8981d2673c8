"""Report folders: contents, provenance re-runs bit for bit (--strict), overwrite refusal, atomic writes,
and parallel sweeps equal to serial ones."""

import csv
import json
import math
import os
import subprocess
import sys
from pathlib import Path

import pytest

import twoel.io as tio
from twoel.errors import InputError
from twoel.report import build, plots
from twoel.analysis.sweep import geometric_extrapolation, resolve_jobs, series_frame, solve_many

from latex_check import check_latex_table

ROOT = Path(__file__).resolve().parents[2]

SMALL = {
    "name": "small",
    "title": "Small test report",
    "scenario": "Invented scenario for a test.",
    "series": {"Z": "1:2", "state": "1^1S", "family": "hylleraas", "size": 1},
    "convergence": {"Z": 2, "family": "hylleraas", "sizes": [0, 1, 2, 3]},
    "levels": {"Z": 2, "family": "hylleraas", "states": [{"state": "1^1S", "size": 1},
                                                         {"state": "2^3S", "size": 1}]},
}


@pytest.fixture(scope="module")
def small_report(tmp_path_factory):
    out = tmp_path_factory.mktemp("reports") / "small"
    result = build.build_report(SMALL, out, html=True)
    return out, result


def test_report_folder_contents(small_report):
    out, result = small_report
    for name in ("index.md", "index.html", "provenance.json", "references.bib"):
        assert (out / name).is_file(), name
    for table in ("series", "convergence", "levels"):
        for ext in ("md", "csv", "tex", "json"):
            assert (out / "tables" / f"{table}.{ext}").stat().st_size > 50
        check_latex_table((out / "tables" / f"{table}.tex").read_text(encoding="utf-8"))
    for fig in ("residuals", "convergence", "levels"):
        assert (out / "figures" / f"{fig}.png").read_bytes()[:4] == b"\x89PNG"
        assert (out / "figures" / f"{fig}.svg").read_text(encoding="utf-8").lstrip().startswith("<?xml")
    index = (out / "index.md").read_text(encoding="utf-8")
    assert "figures/convergence.png" in index and "[schwartz2006]" in index
    assert "--from-provenance" in index
    assert sorted(result.files) == sorted(str(p.relative_to(out)) for p in out.rglob("*") if p.is_file())
    assert not [p for p in out.parent.iterdir() if p.name.startswith(".")]     # no temp leftovers


def test_provenance_records_everything(small_report):
    out, _ = small_report
    data = json.loads((out / "provenance.json").read_text(encoding="utf-8"))
    assert data["format"] == build.PROVENANCE_FORMAT
    assert data["packages"]["numpy"] and data["packages"]["twoel"]
    assert data["constants"]["edition"].startswith("CODATA")
    assert data["config"]["series"]["Z"] == [1.0, 2.0]
    record = data["computations"]["convergence"][3]
    assert record["task"] == {"Z": 2.0, "family": "hylleraas", "size": 3}
    basis = record["result"]["provenance"]["basis"]
    # singlet Hylleraas terms r1^i r2^j r12^k with i <= j and i + j + k <= 3: 6 + 4 + 2 + 1 = 13
    assert len(basis["powers"]) == record["result"]["n_terms"] == 13
    assert record["result"]["parameters"]["alpha"] > 0
    # the numbers block holds exactly what the CSV tables hold
    with (out / "tables" / "series.csv").open(encoding="utf-8") as handle:
        energies = [float(row["energy_hartree"]) for row in csv.DictReader(handle)]
    assert energies == data["numbers"]["series"]["energy_hartree"]


def test_rerun_from_provenance_is_bit_for_bit(small_report, tmp_path):
    out, _ = small_report
    rerun = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", "--from-provenance",
                            str(out / "provenance.json"), "--out", str(tmp_path / "again"), "--jobs", "2",
                            "--strict"], capture_output=True, text=True, cwd=ROOT)
    assert rerun.returncode == 0, rerun.stdout + rerun.stderr
    assert rerun.stdout.strip().splitlines()[-1].startswith("reproduced all") and "bit for bit" in rerun.stdout
    for table in ("series", "convergence", "levels"):
        assert (tmp_path / "again" / "tables" / f"{table}.csv").read_bytes() == \
               (out / "tables" / f"{table}.csv").read_bytes()
    old = json.loads((out / "provenance.json").read_text())["numbers"]
    new = json.loads((tmp_path / "again" / "provenance.json").read_text())["numbers"]
    assert build.compare_numbers(old, new) == []


def test_a_changed_number_is_reported(small_report, tmp_path):
    out, _ = small_report
    data = json.loads((out / "provenance.json").read_text())
    numbers = data["numbers"]
    changed = json.loads(json.dumps(numbers))
    x = changed["series"]["energy_hartree"][0]
    changed["series"]["energy_hartree"][0] = float.fromhex(x.hex()) + 2 ** -50 * abs(x)
    diffs = build.compare_numbers(numbers, changed)
    assert len(diffs) == 1 and diffs[0].startswith("series.energy_hartree[0]")
    data["numbers"] = changed
    data.pop("digests")             # else the edit itself is reported (see test_reproduce.py)
    doctored = tmp_path / "provenance.json"
    doctored.write_text(json.dumps(data))
    result = build.rebuild_from_provenance(doctored, tmp_path / "again")
    assert result.reproduction["identical"] is False and len(result.reproduction["differences"]) == 1
    # 2^-50 relative is within the 1e-12 float64 tolerance of an energy, but not bit for bit
    assert result.reproduction["reproduced"] is True and result.reproduction["mode"] == "tolerance"
    strict = build.rebuild_from_provenance(doctored, tmp_path / "strict", mode="strict")
    assert strict.reproduction["reproduced"] is False and len(strict.reproduction["beyond"]) == 1


def test_overwrite_refusal(small_report, tmp_path):
    out = tmp_path / "existing"
    out.mkdir()
    (out / "mine.txt").write_text("user data")
    cli = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", "--config",
                          str(_config_file(tmp_path)), "--out", str(out)], capture_output=True, text=True, cwd=ROOT)
    assert cli.returncode == 2 and "refusing to overwrite" in cli.stderr and cli.stderr.count("\n") == 1
    assert (out / "mine.txt").read_text() == "user data"
    with pytest.raises(InputError, match="refusing"):
        with tio.atomic_directory(out):
            pass
    # --overwrite replaces only a folder that twoel wrote: a user's folder is refused too
    with pytest.raises(InputError):
        with tio.atomic_directory(out, overwrite=True):
            pass
    assert (out / "mine.txt").read_text() == "user data"
    ours = tmp_path / "ours"
    ours.mkdir()
    (ours / "provenance.json").write_text(json.dumps({"format": "twoel-report-provenance"}))
    with tio.atomic_directory(ours, overwrite=True) as folder:
        (folder / "new.txt").write_text("new")
    assert sorted(p.name for p in ours.iterdir()) == ["new.txt"]
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".")) == []


def _config_file(folder: Path) -> Path:
    path = folder / "config.json"
    path.write_text(json.dumps({"name": "tiny", "series": {"Z": [2], "size": 0}}))
    return path


def test_interrupted_build_leaves_nothing(tmp_path, monkeypatch):
    calls = {"n": 0}
    real = plots.figure_bytes

    def failing(fig, fmt):
        calls["n"] += 1
        if calls["n"] == 2:     # the SVG of the first figure, after its PNG was written
            raise KeyboardInterrupt("simulated interruption")
        return real(fig, fmt)

    monkeypatch.setattr(plots, "figure_bytes", failing)
    with pytest.raises(KeyboardInterrupt):
        build.build_report({"name": "x", "series": {"Z": [1, 2], "size": 0}}, tmp_path / "x")
    assert calls["n"] == 2
    assert list(tmp_path.iterdir()) == []


def test_interrupted_file_write_keeps_the_old_file(tmp_path, monkeypatch):
    target = tmp_path / "table.csv"
    tio.atomic_write_text(target, "old\n")
    assert oct(target.stat().st_mode & 0o777) != "0o600"        # ordinary permissions, not mkstemp's

    def boom(fd):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(os, "fsync", boom)
    with pytest.raises(OSError, match="simulated"):
        tio.atomic_write_text(target, "new content that must not appear half-written\n")
    assert target.read_text() == "old\n"
    assert [p.name for p in tmp_path.iterdir()] == ["table.csv"]
    with pytest.raises(InputError, match="refusing"):
        tio.atomic_write_bytes(target, b"x", overwrite=False)
    with pytest.raises(InputError, match="does not exist"):
        tio.atomic_write_bytes(tmp_path / "nope" / "f", b"x")


def test_parallel_sweep_equals_serial():
    tasks = [{"Z": z, "size": 2} for z in (1, 2, 3, 4)]
    serial = solve_many(tasks, jobs=1)
    parallel = solve_many(tasks, jobs=2)
    assert [r.Z for r in parallel] == [1.0, 2.0, 3.0, 4.0]
    for a, b in zip(serial, parallel):
        da, db = a.to_dict(), b.to_dict()
        da.pop("elapsed_seconds"), db.pop("elapsed_seconds")
        assert da == db
        assert a.energy_hartree.hex() == b.energy_hartree.hex()
    fs = series_frame([1, 2, 3, 4], {"size": 2}, results=serial)
    fp = series_frame([1, 2, 3, 4], {"size": 2}, jobs=2)
    assert fs.equals(fp)


def test_jobs_resolution_and_errors():
    assert resolve_jobs(None, 5) == 1 and resolve_jobs(1, 5) == 1
    cores = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else (os.cpu_count() or 1)
    assert resolve_jobs(0, 100) == cores
    assert resolve_jobs(8, 3) == min(3, cores)
    with pytest.raises(InputError):
        resolve_jobs(-1, 3)


def test_geometric_extrapolation_is_exact_for_a_geometric_sequence():
    # E_k = E_inf + c q^k: the Aitken estimate is exact (Aitken, Proc. R. Soc. Edinb. 46, 289 (1926))
    e = [-2.9 + 0.1 * 0.3 ** k for k in range(6)]
    est = geometric_extrapolation(e)
    assert all(abs(x + 2.9) < 1e-14 for x in est[2:])
    assert math.isnan(geometric_extrapolation([1.0, 2.0, 4.0])[2])      # growing increments: no estimate
    assert all(math.isnan(x) for x in geometric_extrapolation([1.0, 0.5])[:2])


def test_config_errors_are_one_line():
    with pytest.raises(InputError, match="unknown setting"):
        build.normalize_config({"name": "a", "series": {"Z": [2], "colour": 1}})
    with pytest.raises(InputError, match="at least one"):
        build.normalize_config({"name": "a"})
    with pytest.raises(InputError, match="increase"):
        build.normalize_config({"convergence": {"Z": 2, "sizes": [3, 1]}})
    with pytest.raises(InputError, match="name"):
        build.normalize_config({"name": "../x", "series": {"Z": [2]}})
    cli = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet"], capture_output=True,
                         text=True, cwd=ROOT)
    assert cli.returncode == 2 and "--demo" in cli.stderr


def test_demo_config_is_valid_and_small():
    config = build.normalize_config(build.DEMO_CONFIG)
    assert "Invented scenario" in config["scenario"]
    tasks = build.report_tasks(config)
    assert sum(len(t) for t in tasks.values()) <= 20
    # small bases only, so that the README demo stays well under a minute
    limits = {"hylleraas": 6, "exponential": 300}
    for ts in tasks.values():
        for t in ts:
            assert (t.get("size") or 0) <= limits[t.get("family", "hylleraas")], t


def test_committed_demo_report_is_consistent():
    folder = ROOT / "reports" / "demo-isoelectronic"
    if not folder.is_dir():
        pytest.skip("demo report not generated in this checkout")
    data = build.read_provenance(folder / "provenance.json")
    assert data["config"] == build.normalize_config(build.DEMO_CONFIG)
    with (folder / "tables" / "series.csv").open(encoding="utf-8") as handle:
        rows = list(csv.DictReader(handle))
    assert [float(r["energy_hartree"]) for r in rows] == data["numbers"]["series"]["energy_hartree"]
    # every energy is a variational upper bound to its published reference
    for r in rows:
        assert float(r["energy_hartree"]) > float(r["reference_hartree"])


@pytest.mark.slow
def test_demo_command_runs(tmp_path):
    done = subprocess.run([sys.executable, "-m", "twoel", "report", "--demo", "--quiet", "--out",
                           str(tmp_path / "demo")], capture_output=True, text=True, cwd=ROOT, timeout=300)
    assert done.returncode == 0, done.stderr
    assert (tmp_path / "demo" / "index.md").is_file()


def test_toml_config_and_name_option(tmp_path):
    (tmp_path / "study.toml").write_text('name = "toml-study"\n[series]\nZ = "2"\nsize = 0\n', encoding="utf-8")
    config = build.load_config(tmp_path / "study.toml")
    assert build.normalize_config(config)["series"] == {"size": 0, "Z": [2.0]}
    done = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", "--config",
                           str(tmp_path / "study.toml"), "--name", "named"], capture_output=True,
                          text=True, cwd=tmp_path,
                          env={**os.environ, "PYTHONPATH": os.pathsep.join([str(ROOT), os.environ.get("PYTHONPATH", "")])})
    assert done.returncode == 0, done.stderr
    assert (tmp_path / "reports" / "named" / "tables" / "series.csv").is_file()
    (tmp_path / "bad.json").write_text("{not json", encoding="utf-8")
    with pytest.raises(InputError, match="not valid JSON"):
        build.load_config(tmp_path / "bad.json")


def test_correlation_figure_appears_when_hartree_fock_limits_exist(tmp_path, monkeypatch):
    # HF limits: C. Froese Fischer, The Hartree-Fock Method for Atoms (Wiley, 1977); Z = 2 also
    # C. F. Bunge et al., Phys. Rev. A 46, 3691 (1992) (digits from memory)
    from twoel.reference import ReferenceValue

    limits = {z: ReferenceValue("froesefischer1977", z, "1^1S", "hartree_fock_limit", v, repr(v), "hartree",
                                1e-11, "numerical HF", "C. Froese Fischer (1977)", "", "test")
              for z, v in {1.0: -0.48792973437, 2.0: -2.861679995612}.items()}
    monkeypatch.setattr(build, "_hartree_fock_limits", lambda charges: limits)
    build.build_report({"name": "hf", "series": {"Z": [1, 2], "size": 1}}, tmp_path / "hf")
    assert (tmp_path / "hf" / "figures" / "correlation.svg").is_file()
    index = (tmp_path / "hf" / "index.md").read_text(encoding="utf-8")
    assert "correlation.png" in index and "[froesefischer1977]" in index
    assert "@book{froesefischer1977" in (tmp_path / "hf" / "references.bib").read_text(encoding="utf-8")


def test_spectroscopy_caveat_numbers():
    # He: exact nonrelativistic ionization energy 0.903 724 377 Eh (Schwartz 2006) times
    # 219 474.631 36 cm-1/Eh (CODATA 2018/2022 hartree-inverse metre) = 198 344.6 cm-1; measured
    # 198 310.666 37(20) cm-1 (Kandula et al., Phys. Rev. A 84, 062512 (2011)).
    text = build._caveat()
    assert "198344.6 cm-1" in text and "34 cm-1" in text and "Kandula" in text
