"""Ctrl-C (SIGINT), SIGTERM and SIGHUP stop a command within a few seconds, even while the
command is stuck in one long C call (which never lets Python run a signal handler), and leave no
unfinished folder behind.

The stuck call is one LAPACK eigensolution of a 5000 x 5000 matrix (tens of seconds in one C
call that never lets the main thread run a Python signal handler; NumPy releases the GIL for it,
as it does for every BLAS/LAPACK call).  A C routine that keeps the GIL could not be interrupted
this way (no Python code runs at all until it returns).
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]


def _env():
    return {**os.environ, "PYTHONPATH": str(ROOT), "OPENBLAS_NUM_THREADS": "1"}


def _start(script: str, cwd: Path) -> subprocess.Popen:
    return subprocess.Popen([sys.executable, "-c", textwrap.dedent(script)], cwd=cwd, env=_env(),
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)


def _wait_for_line(proc: subprocess.Popen, word: str, limit: float = 60.0) -> None:
    deadline = time.monotonic() + limit
    while True:
        line = proc.stderr.readline()
        assert line, f"the command ended before saying {word!r} (exit {proc.poll()})"
        if word in line:
            return
        assert time.monotonic() < deadline


def _stop(proc: subprocess.Popen, signum: int) -> tuple[int, str, float]:
    sent = time.monotonic()
    proc.send_signal(signum)
    try:
        _out, err = proc.communicate(timeout=15)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
    return proc.returncode, err, time.monotonic() - sent


STUCK_ENERGY = """
    import sys
    from twoel.cli import energy

    def stuck(args):
        import numpy as np

        a = np.random.default_rng(1).random((5000, 5000))
        a = a + a.T
        sys.stderr.write("started\\n")
        sys.stderr.flush()
        np.linalg.eigh(a)
        return 0

    energy.run = stuck
    from twoel.cli import main
    sys.exit(main(["energy", "--Z", "2"]))
"""


@pytest.mark.parametrize("signum, code", [(signal.SIGINT, 130), (signal.SIGTERM, 143)])
def test_a_signal_stops_a_command_stuck_in_one_c_call(tmp_path, signum, code):
    proc = _start(STUCK_ENERGY, tmp_path)
    _wait_for_line(proc, "started")
    time.sleep(0.3)
    returncode, err, took = _stop(proc, signum)
    assert returncode == code, err
    assert took < 5.0
    assert err.splitlines()[-1] in ("twoel: interrupted", f"twoel: stopped by {signal.Signals(signum).name}")
    assert "Traceback" not in err


STUCK_REPORT = """
    import sys
    from twoel.report import build

    def stuck(folder, config, by_section, page):
        import numpy as np

        (folder / "half-written.md").write_text("half")
        a = np.random.default_rng(1).random((5000, 5000))
        a = a + a.T
        sys.stderr.write("writing\\n")
        sys.stderr.flush()
        np.linalg.eigh(a)
        raise SystemExit(0)

    build._write_sections = stuck
    from twoel.cli import main
    sys.exit(main(["report", "--quiet", "--config", "tiny.json", "--out", "reports/tiny"]))
"""


@pytest.mark.parametrize("signum, code", [(signal.SIGINT, 130), (signal.SIGTERM, 143),
                                          (signal.SIGHUP, 129)])
def test_a_signal_while_a_report_is_written_leaves_no_folder(tmp_path, signum, code):
    if signum == signal.SIGHUP and signal.getsignal(signal.SIGHUP) == signal.SIG_IGN:
        pytest.skip("SIGHUP is ignored in this run (started under nohup): the child inherits that")
    (tmp_path / "tiny.json").write_text('{"name": "tiny", "series": {"Z": [2], "size": 0}}')
    proc = _start(STUCK_REPORT, tmp_path)
    _wait_for_line(proc, "writing")
    assert list((tmp_path / "reports").glob(".tiny.building.*"))      # the hidden folder exists
    returncode, err, took = _stop(proc, signum)
    assert returncode == code, err
    assert took < 5.0
    assert err.count("\n") == 1 and "no unfinished folder is left behind" in err, err
    assert list((tmp_path / "reports").iterdir()) == []


def test_the_body_runs_in_a_worker_and_its_result_and_errors_come_back():
    import threading

    from twoel.cli.interrupt import run_interruptible
    from twoel.errors import InputError

    before = {s: signal.getsignal(s) for s in (signal.SIGINT, signal.SIGTERM, signal.SIGHUP)}
    assert run_interruptible(lambda: threading.current_thread().name) == "twoel-command"

    def fails():
        raise InputError("bad value")

    with pytest.raises(InputError, match="bad value"):
        run_interruptible(fails)
    with pytest.raises(SystemExit):
        run_interruptible(lambda: sys.exit(2))
    assert {s: signal.getsignal(s) for s in before} == before        # handlers given back


def test_an_ignored_signal_stays_ignored():
    from twoel.cli.interrupt import _take_over

    old = signal.signal(signal.SIGHUP, signal.SIG_IGN)                # as under nohup
    try:
        previous = _take_over(lambda *_: None)
        assert signal.SIGHUP not in previous
        assert signal.getsignal(signal.SIGHUP) is signal.SIG_IGN
    finally:
        for number, handler in previous.items():
            signal.signal(number, handler)
        signal.signal(signal.SIGHUP, old)


@pytest.mark.slow
def test_ctrl_c_stops_a_long_extended_precision_solve(tmp_path):
    """A real minutes-long solve (N = 1600, arbitrary precision) ends within 5 s of Ctrl-C."""
    proc = subprocess.Popen([sys.executable, "-m", "twoel", "energy", "--Z", "2", "--family",
                             "exponential", "--precision", "extended", "--size", "1600", "--quiet"],
                            cwd=tmp_path, env=_env(), stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                            text=True)
    time.sleep(2.0)
    assert proc.poll() is None
    returncode, err, took = _stop(proc, signal.SIGINT)
    assert returncode == 130 and err.splitlines() == ["twoel: interrupted"], err
    assert took < 5.0
    assert list(tmp_path.iterdir()) == []
