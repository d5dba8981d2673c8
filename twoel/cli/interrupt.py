"""Stopping a command promptly on Ctrl-C (SIGINT), SIGTERM or SIGHUP.

Python runs signal handlers in the main thread, and only between bytecodes: a main thread stuck
for minutes in one NumPy/BLAS call or in a long mpmath/flint routine would see Ctrl-C only when
that call returns.  So the command body runs in a worker thread while the main thread waits in
short timeouts (:data:`POLL_SECONDS`).  When a signal arrives the main thread removes the
temporary files and folders being written (:func:`twoel.io.remove_unfinished`), prints one line
and ends the process with :func:`os._exit` (a thread cannot be killed): 130 for SIGINT,
128 + the signal number for SIGTERM and SIGHUP, as documented in :mod:`twoel.cli`.

Only signals whose handler is the default one are taken over (an ignored SIGHUP under
``nohup`` stays ignored); outside the main thread the body simply runs where it is.
"""

from __future__ import annotations

import os
import signal
import sys
import threading
from typing import Callable

#: how often (seconds) the waiting main thread looks for a signal
POLL_SECONDS = 0.05
#: the signals that stop a command, by name
STOP_SIGNALS = ("SIGINT", "SIGTERM", "SIGHUP")


def _take_over(handler) -> dict:
    """Install ``handler`` for every stop signal still at its default; the previous handlers."""
    previous = {}
    for name in STOP_SIGNALS:
        number = getattr(signal, name, None)
        if number is None:
            continue
        current = signal.getsignal(number)
        default = signal.default_int_handler if number == signal.SIGINT else signal.SIG_DFL
        if current is default:
            previous[number] = signal.signal(number, handler)
    return previous


def exit_code(signum: int) -> int:
    """130 for SIGINT (the documented 'interrupted'), otherwise 128 + the signal number."""
    return 130 if signum == signal.SIGINT else 128 + int(signum)


def stop_message(signum: int, removed: int) -> str:
    """The one line printed when a signal stops a command."""
    if signum == signal.SIGINT:
        text = "twoel: interrupted"
    else:
        text = f"twoel: stopped by {signal.Signals(signum).name}"
    return text + ("; no unfinished folder is left behind" if removed else "") + "\n"


def _end_now(signum: int) -> None:
    """Clean up, say so in one line and end the process (never returns)."""
    from twoel.io import remove_unfinished

    removed = remove_unfinished()
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except Exception:       # a closed pipe must not stop the exit
            pass
    try:
        sys.stderr.write(stop_message(signum, len(removed)))
        sys.stderr.flush()
    except Exception:
        pass
    os._exit(exit_code(signum))


def run_interruptible(body: Callable[[], int]) -> int:
    """``body()`` in a worker thread, the main thread waiting for it or for a stop signal.

    Returns what ``body`` returns and re-raises what it raises (any :class:`BaseException`);
    a stop signal ends the process from here (see the module docstring).
    """
    if threading.current_thread() is not threading.main_thread():
        return body()
    outcome: dict = {}
    seen: list[int] = []

    def work():
        try:
            outcome["value"] = body()
        except BaseException as exc:    # carried to the main thread and raised there
            outcome["error"] = exc

    previous = _take_over(lambda signum, _frame: seen.append(signum))
    try:
        worker = threading.Thread(target=work, name="twoel-command", daemon=True)
        worker.start()
        while worker.is_alive():
            worker.join(POLL_SECONDS)
            if seen:
                _end_now(seen[0])
    finally:
        for number, old in previous.items():
            signal.signal(number, old)
    if "error" in outcome:
        error = outcome.pop("error")
        raise error.with_traceback(error.__traceback__)
    return outcome["value"]
