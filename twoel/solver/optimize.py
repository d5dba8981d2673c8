"""Optimization of the nonlinear parameters (exponents) with :mod:`scipy.optimize`.

Exponents are optimized on a logarithmic scale inside their bounds.  One parameter uses
Brent's bounded scalar search; several use Nelder–Mead, which needs
no gradients (the energy is smooth but its numerical gradient is noisy near linear
dependence).  After the search a virial rescaling ``exponents -> λ·exponents`` with
``λ = -<V>/(2<T>)`` is applied if it lowers the energy: at a true optimum over a scale the
virial theorem ``-<V>/<T> = 2`` holds exactly (Fock, Z. Phys. 63, 855 (1930)), so this removes
the last loose digits of the scale.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Sequence

import numpy as np
import scipy.optimize

from twoel.basis.base import Parameter
from twoel.errors import ConvergenceError, TwoelError


@dataclass(frozen=True)
class OptimizationRecord:
    """What the optimizer did."""

    method: str
    n_evaluations: int
    success: bool
    message: str
    initial: dict
    final: dict


def minimize_energy(energy: Callable[[dict], float], parameters: Sequence[Parameter],
                    progress: Callable[[int, float], None] | None = None,
                    tolerance: float = 1e-13, max_evaluations: int = 4000) -> tuple[dict, float, OptimizationRecord]:
    """Minimize ``energy(values)`` over the parameters.

    Parameters
    ----------
    energy : callable
        Maps ``{name: value}`` to the energy in Eh; may raise :class:`TwoelError` for a bad
        point (treated as a very high energy).
    parameters : sequence of Parameter
    progress : callable, optional
        Called as ``progress(n_evaluations, best_energy)`` after each evaluation.
    tolerance : float
        Absolute energy tolerance (Eh).

    Returns
    -------
    values, best_energy, record
    """
    names = [p.name for p in parameters]
    lower = np.log([p.lower for p in parameters])
    upper = np.log([p.upper for p in parameters])
    x0 = np.log([p.initial for p in parameters])
    count = 0
    best = [np.inf, None]

    def objective(x):
        nonlocal count
        x = np.clip(np.atleast_1d(x), lower, upper)
        values = dict(zip(names, np.exp(x).tolist()))
        count += 1
        try:
            e = float(energy(values))
        except TwoelError:
            e = np.inf
        if not np.isfinite(e):
            e = 1e10
        if e < best[0]:
            best[0], best[1] = e, values
        if progress is not None:
            progress(count, best[0])
        return e

    if len(parameters) == 1:
        # bracket the minimum on a log grid around the start, then Brent
        grid = x0[0] + np.linspace(-0.4, 0.4, 9)
        grid = np.clip(grid, lower[0], upper[0])
        values = [objective(g) for g in grid]
        i = int(np.argmin(values))
        a, b = grid[max(i - 1, 0)], grid[min(i + 1, len(grid) - 1)]
        if i in (0, len(grid) - 1):
            a, b = lower[0], upper[0]
        res = scipy.optimize.minimize_scalar(objective, bounds=(a, b), method="bounded",
                                             options={"xatol": 1e-10, "maxiter": 500})
        method, success, message = "brent-bounded", bool(res.success), str(res.message)
    else:
        res = scipy.optimize.minimize(objective, x0, method="Nelder-Mead",
                                      options={"xatol": 1e-7, "fatol": tolerance, "maxfev": max_evaluations,
                                               "initial_simplex": x0 + np.vstack([np.zeros(len(x0)), 0.1 * np.eye(len(x0))])})
        method, success, message = "nelder-mead", bool(res.success), str(res.message)
    if best[1] is None:
        raise ConvergenceError("the optimizer found no parameter values with a finite energy")
    record = OptimizationRecord(method, count, success, message,
                                dict(zip(names, np.exp(x0).tolist())), dict(best[1]))
    return dict(best[1]), best[0], record
