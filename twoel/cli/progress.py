"""Progress display on stderr for long steps (tqdm when stderr is a terminal)."""

from __future__ import annotations

import contextlib
import sys
import time


@contextlib.contextmanager
def _bar(enabled: bool, description: str, unit: str):
    """Yield a tqdm bar on an interactive stderr (closed on exit), or ``None``."""
    if not enabled or not sys.stderr.isatty():
        yield None
        return
    from tqdm import tqdm

    bar = tqdm(desc=description, unit=unit, file=sys.stderr, leave=False)
    try:
        yield bar
    finally:
        bar.close()


@contextlib.contextmanager
def optimizer_progress(enabled: bool = True):
    """Yield a ``progress(n, best_energy)`` callback that updates a tqdm line, or ``None``."""
    with _bar(enabled, "optimizing", "eval") as bar:
        if bar is None:
            yield None
            return

        def update(n: int, best: float) -> None:
            bar.n = n
            bar.set_postfix_str(f"E = {best:.12f}", refresh=False)
            bar.refresh()

        yield update


@contextlib.contextmanager
def counter(description: str, enabled: bool = True, unit: str = "it"):
    """Yield a ``progress(done=None, total=None)`` callback that moves a tqdm bar, or ``None``.

    Given ``done`` (and ``total``) the bar is set to them, as the sweeps and convergence studies
    of the core report; called without them it advances by one.
    """
    with _bar(enabled, description, unit) as bar:
        if bar is None:
            yield None
            return

        def update(done: int | None = None, total: int | None = None) -> None:
            if total is not None:
                bar.total = total
            bar.n = bar.n + 1 if done is None else done
            bar.refresh()

        yield update


def stage_reporter(enabled: bool = True):
    """A ``report(text)`` callback writing ``[elapsed] text`` lines to an interactive stderr, or ``None``."""
    if not enabled or not sys.stderr.isatty():
        return None
    started = time.perf_counter()

    def report(text: str) -> None:
        sys.stderr.write(f"[{time.perf_counter() - started:7.1f} s] {text}\n")
        sys.stderr.flush()

    return report
