"""Sweeps: many independent :func:`twoel.solve` calls, serially or over the machine's cores.

:func:`solve_many` runs a list of keyword sets through :func:`twoel.solve` either in this process
(``jobs=1``) or in a :class:`concurrent.futures.ProcessPoolExecutor` (``jobs > 1``; ``jobs=0``
means one worker per core).  Results come back in the order of the tasks whatever the order in
which workers finish, and every task is the same deterministic computation, so a parallel sweep
gives bit-for-bit the numbers of a serial one.

:func:`series_frame` (one state over a range of Z) and :func:`convergence_frame` (one ion over
basis sizes) turn the results into :class:`pandas.DataFrame` tables, the input of
:mod:`twoel.report.tables` and :mod:`twoel.report.plots`.  No file I/O and no display happen
here: a caller that shows progress passes a callback ``progress(done, total)`` (the command line
passes its progress bar, :func:`twoel.cli.progress.counter`).
"""

from __future__ import annotations

import math
import os
from typing import Callable, Sequence, Union

import numpy as np

from twoel.errors import InputError

#: ``progress(done, total)`` called after each finished task; ``None``/``False``: no callback.
#: ``True`` is still accepted (it used to ask for a bar) and calls nothing: a display is the
#: caller's business.
Progress = Union[Callable[[int, int], None], bool, None]


def _callback(progress: Progress):
    """The callable of ``progress`` (booleans and ``None`` mean: nobody is listening)."""
    return progress if callable(progress) else None


def usable_cores() -> int:
    """Cores this process may run on: :func:`os.sched_getaffinity` where it exists (it honours
    CPU sets and ``taskset``), else :func:`os.cpu_count` (at least 1)."""
    getaffinity = getattr(os, "sched_getaffinity", None)
    if getaffinity is not None:
        try:
            return max(1, len(getaffinity(0)))
        except OSError:
            pass
    return os.cpu_count() or 1


def resolve_jobs(jobs: int | None, n_tasks: int) -> int:
    """Number of worker processes: ``None``/1 -> serial, 0 -> :func:`usable_cores`; any value is
    capped at the usable cores and at the number of tasks (more workers only compete)."""
    if jobs is None:
        return 1
    if isinstance(jobs, bool) or not isinstance(jobs, int) or jobs < 0:
        raise InputError(f"'jobs' must be a non-negative integer (0 = all cores), got {jobs!r}")
    cores = usable_cores()
    if jobs == 0:
        jobs = cores
    return max(1, min(jobs, cores, max(n_tasks, 1)))


def _solve_task(task: dict):
    import warnings

    from twoel.solver.pipeline import solve

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # warnings travel inside the result
        return solve(**task)


def solve_many(tasks: Sequence[dict], jobs: int | None = 1, progress: Progress = None,
               description: str = "solving") -> list:
    """Run ``solve(**task)`` for every task; results in task order.

    Parameters
    ----------
    tasks : sequence of dict
        Keyword arguments of :func:`twoel.solve` (``Z`` included).
    jobs : int or None
        Worker processes (1 or ``None``: serial in this process; 0: one per usable core; at most
        the usable cores, :func:`resolve_jobs`).
    progress : callable, optional
        Called as ``progress(done, total)`` after each finished task (in task order).
    description : str
        Kept for compatibility (the caller's display names the sweep).

    Returns
    -------
    list of EnergyResult

    Notes
    -----
    Workers are forked where the platform allows (else spawned: then a script that calls this
    with ``jobs > 1`` needs the usual ``if __name__ == "__main__":`` guard).  For the small
    matrices of these bases a multi-threaded BLAS is slower, not faster, on a busy machine:
    ``OPENBLAS_NUM_THREADS=1`` in the environment speeds up serial and parallel runs alike.
    """
    tasks = [dict(t) for t in tasks]
    report = _callback(progress)
    return run_tasks(_solve_task, tasks, jobs,
                     None if report is None else (lambda done, total, task: report(done, total)))


def run_tasks(worker: Callable[[dict], object], tasks: Sequence[dict], jobs: int | None,
              report: Callable[[int, int, dict], None] | None = None) -> list:
    """``worker(task)`` for every task, serially or in worker processes; results in task order.

    ``report(done, total, task)`` is called after each finished task, in task order.  Workers
    are forked where the platform allows: forked workers are copies of this process, BLAS
    thread settings included, so each task runs exactly the code path (and gives exactly the
    bits) of a serial run.  Where fork does not exist, spawned workers inherit the environment
    (OPENBLAS_NUM_THREADS and friends).
    """
    workers = resolve_jobs(jobs, len(tasks))
    results = []
    if workers == 1:
        for task in tasks:
            results.append(worker(task))
            if report is not None:
                report(len(results), len(tasks), task)
        return results
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    method = "fork" if "fork" in multiprocessing.get_all_start_methods() else "spawn"
    with ProcessPoolExecutor(max_workers=workers,
                             mp_context=multiprocessing.get_context(method)) as pool:
        for result in pool.map(worker, tasks, chunksize=1):  # yields in submission order
            results.append(result)
            if report is not None:
                report(len(results), len(tasks), tasks[len(results) - 1])
        return results


def _reference_columns(result) -> dict:
    ref = result.reference
    return {
        "reference_hartree": None if ref is None else ref.value,
        "reference_hartree_text": None if ref is None else ref.value_text,
        "reference_uncertainty_hartree": None if ref is None else ref.uncertainty,
        "reference_key": None if ref is None else ref.key,
        "reference_source": None if ref is None else ref.source,
        "difference_hartree": result.difference_hartree,
        "agreeing_digits": result.agreeing_digits,
    }


def result_row(result) -> dict:
    """One table row (plain values) of an :class:`~twoel.results.EnergyResult`."""
    row = {"Z": result.Z, "ion": result.ion, "state": result.state, "family": result.family,
           "size": result.size, "n_terms": result.n_terms, "energy_hartree": result.energy_hartree,
           "error_bar_hartree": result.error_bar_hartree, "bound": result.bound}
    row.update(_reference_columns(result))
    row.update({
        "ionization_energy_hartree": result.ionization_energy_hartree,
        "ionization_energy_ev": result.ionization_energy("ev"),
        "ionization_energy_cm1": result.ionization_energy("cm-1"),
        "virial_ratio": result.virial_ratio,
    })
    return row


def series_tasks(charges, keywords: dict) -> list[dict]:
    return [{"Z": Z, **keywords} for Z in charges]


def series_frame(charges, keywords: dict, progress: Progress = None, jobs: int | None = 1,
                 results: list | None = None):
    """Solve for every charge and collect one row per ion (a :class:`pandas.DataFrame`).

    ``results`` (already computed, in charge order) skips the solving.
    """
    import pandas as pd

    if results is None:
        results = solve_many(series_tasks(charges, keywords), jobs=jobs, progress=progress,
                             description="ions")
    return pd.DataFrame([result_row(r) for r in results])


def geometric_extrapolation(energies) -> np.ndarray:
    """Aitken Δ² estimate of the basis-set limit from each run of three successive energies.

    For ``E_k = E_∞ + c q^k`` the estimate ``E_k - (E_k - E_{k-1})² / (E_k - 2E_{k-1} + E_{k-2})``
    is exact (A. C. Aitken, Proc. R. Soc. Edinb. 46, 289 (1926)).  Entries without two
    predecessors, or whose increments do not shrink (ratio not in (0, 1)), are NaN.
    """
    e = np.asarray(energies, dtype=float)
    out = np.full(e.shape, np.nan)
    for k in range(2, e.size):
        d1, d2 = e[k - 1] - e[k - 2], e[k] - e[k - 1]
        if d1 == 0 or d2 == 0:
            continue
        q = d2 / d1
        if not 0 < q < 1:
            continue
        out[k] = e[k] + d2 * q / (1 - q)
    return out


def convergence_tasks(Z, sizes, keywords: dict) -> list[dict]:
    sizes = list(sizes)
    if not sizes:
        raise InputError("the list of basis sizes is empty")
    return [{"Z": Z, **{**keywords, "size": int(s)}} for s in sizes]


def convergence_frame(Z, sizes, keywords: dict, progress: Progress = None, jobs: int | None = 1,
                      results: list | None = None):
    """Energies of one ion over growing basis sizes, with increments and a limit estimate.

    Columns: ``size, n_terms, energy_hartree, increment_hartree`` (``E(size) - E(previous)``),
    ``extrapolated_hartree`` (:func:`geometric_extrapolation`), the reference columns and
    ``difference_hartree``.  The last extrapolated value is the estimate of the limit;
    ``extrapolation_error_hartree`` is ``E - E_extrap(last)`` for every row.
    """
    import pandas as pd

    if results is None:
        results = solve_many(convergence_tasks(Z, sizes, keywords), jobs=jobs, progress=progress,
                             description="basis sizes")
    rows = []
    previous = None
    for r in results:
        row = {"Z": r.Z, "ion": r.ion, "state": r.state, "family": r.family, "size": r.size,
               "n_terms": r.n_terms, "energy_hartree": r.energy_hartree,
               "error_bar_hartree": r.error_bar_hartree,
               "increment_hartree": None if previous is None else r.energy_hartree - previous}
        row.update(_reference_columns(r))
        rows.append(row)
        previous = r.energy_hartree
    frame = pd.DataFrame(rows)
    extrapolated = geometric_extrapolation(frame["energy_hartree"].to_numpy())
    frame["extrapolated_hartree"] = extrapolated
    finite = extrapolated[np.isfinite(extrapolated)]
    limit = finite[-1] if finite.size else math.nan
    frame["extrapolation_error_hartree"] = frame["energy_hartree"] - limit
    return frame
