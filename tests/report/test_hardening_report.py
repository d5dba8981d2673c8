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


@pytest.mark.parametrize("signum", [signal.SIGTERM, signal.SIGHUP])
def test_a_signal_during_the_build_removes_the_hidden_folder(tmp_path, signum):
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
