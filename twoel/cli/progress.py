"""Progress display on stderr for long steps (tqdm when stderr is a terminal)."""

from __future__ import annotations

import contextlib
import sys
import time


@contextlib.contextmanager
def optimizer_progress(enabled: bool = True):
    """Yield a ``progress(n, best_energy)`` callback that updates a tqdm line, or ``None``."""
    if not enabled or not sys.stderr.isatty():
        yield None
        return
    from tqdm import tqdm

    bar = tqdm(desc="optimizing", unit="eval", file=sys.stderr, leave=False)

    def update(n: int, best: float) -> None:
        bar.n = n
        bar.set_postfix_str(f"E = {best:.12f}", refresh=False)
        bar.refresh()

    try:
        yield update
    finally:
        bar.close()


def iterate(items, description: str, enabled: bool = True):
    """Wrap an iterable in a progress bar on an interactive stderr."""
    if not enabled or not sys.stderr.isatty():
        return items
    from tqdm import tqdm

    return tqdm(items, desc=description, file=sys.stderr, leave=False)


def stage_reporter(enabled: bool = True):
    """A ``report(text)`` callback writing ``[elapsed] text`` lines to an interactive stderr, or ``None``."""
    if not enabled or not sys.stderr.isatty():
        return None
    started = time.perf_counter()

    def report(text: str) -> None:
        sys.stderr.write(f"[{time.perf_counter() - started:7.1f} s] {text}\n")
        sys.stderr.flush()

    return report
