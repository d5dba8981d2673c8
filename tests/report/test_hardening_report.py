"""Hardening of ``twoel report``: signals during the build, the --jobs cap, configuration values
checked before any work, and levels that are not bound."""

import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

import twoel.io as tio
from twoel.analysis import sweep
from twoel.errors import InputError
from twoel.report import build

ROOT = Path(__file__).resolve().parents[2]

#: enough tables and figures that the hidden folder lives for a while (measured ~2 s)
SLOW = {"name": "slow", "series": {"Z": "1:6", "size": 1},
        "convergence": {"Z": 2, "sizes": [0, 1, 2, 3, 4]}}


def _env():
    return {**os.environ, "PYTHONPATH": str(ROOT), "OPENBLAS_NUM_THREADS": "1"}


@pytest.mark.parametrize("signum, delay", [(signal.SIGTERM, 0.0), (signal.SIGHUP, 0.0),
                                           (signal.SIGTERM, 0.3)])
def test_a_signal_during_the_build_removes_the_hidden_folder(tmp_path, signum, delay):
    if signum == signal.SIGHUP and signal.getsignal(signal.SIGHUP) == signal.SIG_IGN:
        pytest.skip("SIGHUP is ignored in this run (started under nohup): the child inherits that")
    config = tmp_path / "slow.json"
    config.write_text(json.dumps(SLOW))
    out = tmp_path / "reports" / "slow"
    out.parent.mkdir()
    proc = subprocess.Popen([sys.executable, "-m", "twoel", "report", "--quiet", "--config",
                             str(config), "--out", str(out)], cwd=tmp_path, env=_env(),
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    try:
        deadline = time.monotonic() + 60
        while not list(out.parent.glob(".slow.building.*")):
            assert proc.poll() is None, "the build ended before its hidden folder was seen"
            assert time.monotonic() < deadline, "no hidden folder appeared"
            time.sleep(0.002)
        time.sleep(delay)                               # 0: as the folder is made; 0.3 s: mid-write
        assert proc.poll() is None
        sent = time.monotonic()
        proc.send_signal(signum)
        _stdout, stderr = proc.communicate(timeout=20)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
    assert time.monotonic() - sent < 10
    assert proc.returncode == 128 + signum, stderr
    assert stderr.count("\n") == 1 and signal.Signals(signum).name in stderr
    assert list(out.parent.iterdir()) == []          # neither the report nor a hidden folder


def test_the_signal_handlers_are_restored(tmp_path):
    before = {s: signal.getsignal(s) for s in (signal.SIGTERM, signal.SIGHUP, signal.SIGINT)}
    with tio.atomic_directory(tmp_path / "a") as folder:
        assert signal.getsignal(signal.SIGTERM) is not before[signal.SIGTERM]
        (folder / "provenance.json").write_text("{}")
    with pytest.raises(RuntimeError):
        with tio.atomic_directory(tmp_path / "b"):
            raise RuntimeError("boom")
    assert {s: signal.getsignal(s) for s in before} == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a"]


def test_a_signal_in_process_raises_and_cleans_up(tmp_path):
    # the handler turns SIGTERM into BuildStopped (a KeyboardInterrupt) inside the build
    with pytest.raises(tio.BuildStopped) as stop:
        with tio.atomic_directory(tmp_path / "x") as folder:
            (folder / "part").write_text("half")
            os.kill(os.getpid(), signal.SIGTERM)
            time.sleep(5)                                # never reached: the handler raises first
    assert isinstance(stop.value, KeyboardInterrupt) and stop.value.signum == signal.SIGTERM
    assert list(tmp_path.iterdir()) == []


def _one_core():
    os.sched_setaffinity(0, {min(os.sched_getaffinity(0))})


def test_jobs_are_capped_at_the_usable_cores():
    cores = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count()
    assert sweep.usable_cores() == cores
    assert sweep.resolve_jobs(10**6, 10**6) == cores
    assert sweep.resolve_jobs(0, 10**6) == cores


@pytest.mark.skipif(not hasattr(os, "sched_setaffinity"), reason="needs CPU affinity")
def test_jobs_cap_is_said_in_one_line(tmp_path):
    config = tmp_path / "tiny.json"
    config.write_text(json.dumps({"name": "tiny", "series": {"Z": [1, 2], "size": 0}}))
    # a process restricted to one core (as taskset does): asking for 64 workers gives 1
    run = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", "--jobs", "64",
                          "--config", str(config), "--out", str(tmp_path / "r")],
                         cwd=tmp_path, env=_env(), capture_output=True, text=True,
                         preexec_fn=_one_core, timeout=120)
    assert run.returncode == 0, run.stderr
    assert run.stderr.splitlines() == ["twoel: --jobs 64 capped at 1, the cores this process may use"]
    assert (tmp_path / "r" / "provenance.json").is_file()
    quiet = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", "--jobs", "1",
                            "--config", str(config), "--out", str(tmp_path / "r1")],
                           cwd=tmp_path, env=_env(), capture_output=True, text=True,
                           preexec_fn=_one_core, timeout=120)
    assert quiet.returncode == 0 and quiet.stderr == ""


@pytest.mark.parametrize("section, value", [
    ("series", {"Z": [1, 2], "optimize": "no"}),
    ("convergence", {"Z": 2, "sizes": [0, 1], "optimize": "false"}),
    ("levels", {"Z": 2, "states": ["1^1S"], "optimize": 0}),
])
def test_optimize_must_be_a_boolean(section, value):
    with pytest.raises(InputError, match=rf"{section}\.optimize must be true or false"):
        build.normalize_config({section: value})
    build.normalize_config({section: {**value, "optimize": False}})     # a real boolean is fine


def _no_solving(monkeypatch):
    def refuse(*_args, **_kwargs):
        raise AssertionError("a solve started before the configuration was checked")

    monkeypatch.setattr(sweep, "solve_many", refuse)


@pytest.mark.parametrize("config, match", [
    # hylleraas ω runs 0..16, exponential N 4..3000: the last entry is the typo
    ({"convergence": {"Z": 2, "family": "hylleraas", "sizes": [0, 1, 2, 3, 4, 5, 60]}},
     r"convergence\.sizes\[6\]: 'size'.*got 60"),
    ({"levels": {"Z": 2, "family": "exponential",
                 "states": [{"state": "1^1S", "size": 200}, {"state": "2^1S", "size": 2}]}},
     r"levels\.states\[1\]: 'size'.*got 2"),
    ({"levels": {"Z": 2, "states": ["1^1S", "2^3Q"]}}, r"levels\.states\[1\]"),
    ({"series": {"Z": "1:4", "family": "hylleras"}}, r"series at Z = 1: unknown family"),
    ({"series": {"Z": [1, 2], "parameters": {"alpha": "x"}}}, r"series\.parameters\.alpha"),
])
def test_every_task_is_checked_before_any_solve(tmp_path, monkeypatch, config, match):
    _no_solving(monkeypatch)
    with pytest.raises(InputError, match=match):
        build.build_report({"name": "typo", **config}, tmp_path / "typo")
    assert list(tmp_path.iterdir()) == []


def test_a_late_size_typo_fails_at_once_on_the_command_line(tmp_path):
    config = tmp_path / "typo.json"
    # ω = 12 alone takes many seconds; the typo after it must fail before it is solved
    config.write_text(json.dumps({"name": "typo", "convergence": {"Z": 2, "sizes": [10, 11, 12, 130]}}))
    started = time.monotonic()
    run = subprocess.run([sys.executable, "-m", "twoel", "report", "--quiet", "--config", str(config),
                          "--out", str(tmp_path / "r")], cwd=tmp_path, env=_env(),
                         capture_output=True, text=True, timeout=120)
    assert run.returncode == 2
    assert run.stderr.count("\n") == 1 and "convergence.sizes[3]" in run.stderr
    assert "Traceback" not in run.stderr
    assert time.monotonic() - started < 15
    assert not (tmp_path / "r").exists()


def test_levels_that_are_not_bound_say_so_in_the_tables_and_index(tmp_path):
    # Below the critical charge Zc = 0.911 028 2 (Estienne, Busuttil, Moini, Drake, Phys. Rev. Lett.
    # 112, 173001 (2014)) a two-electron ion has no bound state: every variational energy at
    # Z = 0.5 lies above -Z²/2 = -0.125 Eh.  H- (Z = 1 > Zc) is bound.
    out = tmp_path / "weak"
    build.build_report({"name": "weak", "series": {"Z": [0.5, 1], "size": 1},
                        "levels": {"Z": 0.5, "family": "hylleraas",
                                   "states": [{"state": "1^1S", "size": 2}]}}, out)
    series = (out / "tables" / "series.md").read_text(encoding="utf-8").splitlines()
    assert series[0].rstrip(" |").endswith("bound")
    rows = {line.split("|")[1].strip(): line for line in series[2:4]}
    assert rows["0.5"].rstrip(" |").endswith("not bound")
    assert rows["1"].rstrip(" |").endswith("yes")
    levels = (out / "tables" / "levels.md").read_text(encoding="utf-8").splitlines()
    assert levels[2].rstrip(" |").endswith("not bound")
    tex = (out / "tables" / "levels.tex").read_text(encoding="utf-8")
    assert "& not bound \\\\" in tex
    index = (out / "index.md").read_text(encoding="utf-8")
    assert index.count("is not bound in this basis") == 2        # Z = 0.5 at sizes 1 and 2
    assert "Z=0.5 1^1S (size 2) is not bound" in index and "H- 1^1S (size 1) is not bound" not in index
    # the machine-readable tables keep their boolean column
    assert (out / "tables" / "levels.csv").read_text(encoding="utf-8").splitlines()[1].count(",False,") == 1


def test_bound_levels_keep_their_tables_unchanged(tmp_path):
    out = tmp_path / "he"
    build.build_report({"name": "he", "series": {"Z": [2], "size": 1}}, out)
    header = (out / "tables" / "series.md").read_text(encoding="utf-8").splitlines()[0]
    assert "bound" not in header
    assert "not bound" not in (out / "index.md").read_text(encoding="utf-8")
