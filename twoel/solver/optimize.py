r"""Optimization of nonlinear parameters (exponents): one Nelder–Mead search with virial rescaling.

:func:`minimize_nonlinear` is the one search of twoel (pure: start values and bounds in, an
:class:`NonlinearOptimum` out; it prints and writes nothing).  Its steps:

1. *screening* (optional): every start is evaluated and the lowest starts the search;
2. the search runs in coordinates ``x`` chosen by the caller (``decode(x)`` gives the parameter
   values, ``encode`` the inverse; typically logarithms of exponents).  Several coordinates use
   Nelder–Mead (Nelder and Mead, Comput. J. 7, 308 (1965); scipy's implementation), which needs
   no gradients (the energy is smooth but its numerical gradient is noisy near linear
   dependence); one coordinate uses Brent's bounded scalar search;
3. *virial rescaling* (optional): with ``λ = -<V>/(2<T>)`` at the best point, the exponent values
   are multiplied by ``λ`` and the rescaled point is kept if it is lower, up to ``virial_steps``
   times.  At a true optimum over a common scale of the exponents the virial theorem
   ``-<V>/<T> = 2`` holds exactly (Fock, Z. Phys. 63, 855 (1930)), so this removes the last loose
   digits of the scale.

The lowest energy over *all* evaluations is returned (not only scipy's final simplex point).
:func:`minimize_energy` is the same search over named :class:`~twoel.basis.base.Parameter`
values (log scale inside their bounds), used by the solve pipeline and the box tuner.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Callable, Sequence

import numpy as np
import scipy.optimize

from twoel.basis.base import Parameter
from twoel.errors import ConvergenceError, TwoelError


def virial_scale(kinetic: float, potential: float) -> float:
    """The exponent scale ``λ = -<V>/(2<T>)`` that satisfies the virial theorem (dimensionless).

    Parameters
    ----------
    kinetic, potential : float
        ``<T>`` and ``<V>`` of the trial function (Eh); ``<T>`` must be positive.
    """
    return -potential / (2.0 * kinetic)


@dataclass(frozen=True)
class NonlinearOptimum:
    """Result of :func:`minimize_nonlinear`.

    Attributes
    ----------
    values : tuple
        Best parameter values found (as passed to ``energy``).
    energy : float
        Energy at ``values`` (Eh).
    info : object
        What ``energy`` returned beside the energy at ``values`` (``None`` if it returned a float).
    n_evaluations : int
        Number of calls of ``energy`` (points outside the bounds in ``"penalty"`` mode are not
        evaluated and not counted).
    method : str
        ``"nelder-mead"`` or ``"brent-bounded"``.
    success : bool
        scipy's convergence flag of the search.
    message : str
        scipy's message.
    initial : tuple
        The start of the search (the lowest screened start).
    virial_steps : int
        Number of accepted virial rescalings.
    """

    values: tuple
    energy: float
    info: Any
    n_evaluations: int
    method: str
    success: bool
    message: str
    initial: tuple
    virial_steps: int = 0


@dataclass
class _Search:
    """The objective of one :func:`minimize_nonlinear` run and the lowest point evaluated so far."""

    energy: Callable[[tuple], Any]
    decode: Callable[[np.ndarray], tuple]
    lo: np.ndarray | None
    hi: np.ndarray | None
    outside: str
    penalty: float
    failure: float
    progress: Callable[[int, float], None] | None
    count: int = 0
    best_energy: float = math.inf
    best_values: Any = None
    best_info: Any = None

    def evaluate(self, values) -> float:
        """``energy(values)`` (Eh), or ``failure`` for a failed point; keeps the lowest."""
        self.count += 1
        try:
            out = self.energy(values)
            e, info = (out if isinstance(out, tuple) else (out, None))
            e = float(e)
        except TwoelError:
            e, info = math.nan, None
        if math.isfinite(e):
            if e < self.best_energy:
                self.best_energy, self.best_values, self.best_info = e, values, info
        else:
            e = self.failure
        if self.progress is not None:
            self.progress(self.count, self.best_energy)
        return e

    def objective(self, x) -> float:
        """The energy at search coordinates ``x`` (bounds applied as ``outside`` says)."""
        x = np.atleast_1d(x)
        if self.lo is not None and self.hi is not None:
            if self.outside == "clip":
                x = np.clip(x, self.lo, self.hi)
            elif not np.all((self.lo < x) & (x < self.hi)):
                return self.penalty
        return self.evaluate(self.decode(x))


def _first_start(search: _Search, starts, screen_starts: bool) -> tuple:
    """The start of the search: the lowest screened start (first of equals) or the first."""
    starts = [tuple(s) for s in starts]
    if not starts:
        raise ValueError("minimize_nonlinear needs at least one start")
    if not screen_starts:
        return starts[0]
    screened = [search.evaluate(s) for s in starts]
    return starts[int(np.argmin(screened))]


def _brent_search(search: _Search, x0: np.ndarray, bounds, grid_offsets, xatol: float,
                  max_iterations: int):
    """Brent's bounded search in one coordinate, narrowed by an optional grid around ``x0``."""
    lo, hi = search.lo, search.hi
    a, b = bounds if bounds is not None else (float(lo[0]), float(hi[0]))
    if grid_offsets is not None:
        grid = x0[0] + np.asarray(grid_offsets, dtype=float)
        if lo is not None and hi is not None:
            grid = np.clip(grid, lo[0], hi[0])
        found = [search.objective(g) for g in grid]
        i = int(np.argmin(found))
        if i not in (0, len(grid) - 1):
            a, b = grid[i - 1], grid[i + 1]
    return scipy.optimize.minimize_scalar(lambda t: search.objective(t), bounds=(a, b),
                                          method="bounded",
                                          options={"xatol": xatol, "maxiter": max_iterations})


def _simplex_search(search: _Search, x0: np.ndarray, step, xatol: float, fatol: float,
                    max_evaluations: int, adaptive: bool):
    """scipy's Nelder–Mead from ``x0`` (initial simplex of edge ``step`` unless ``None``)."""
    options = {"xatol": xatol, "fatol": fatol, "maxfev": max_evaluations}
    if adaptive:
        options["adaptive"] = True
    if step is not None:
        options["initial_simplex"] = np.array([x0, *(x0 + step * e for e in np.eye(x0.size))])
    return scipy.optimize.minimize(search.objective, x0, method="Nelder-Mead", options=options)


def _virial_rescale(search: _Search, n_values: int, virial, scaled, steps: int,
                    tolerance: float) -> int:
    """Rescale the best point's ``scaled`` values by ``virial(info)`` while it lowers the energy.

    Returns the number of accepted rescalings.
    """
    mask = np.ones(n_values, dtype=bool) if scaled is None else np.asarray(scaled, dtype=bool)
    accepted = 0
    for _ in range(steps):
        if search.best_values is None:
            break
        lam = virial(search.best_info)
        if not math.isfinite(lam) or abs(lam - 1.0) < tolerance:
            break
        before = search.best_energy
        search.evaluate(tuple(v * lam if m else v for v, m in zip(search.best_values, mask)))
        if search.best_energy >= before:
            break
        accepted += 1
    return accepted


def minimize_nonlinear(energy: Callable[[tuple], Any], starts: Sequence[Sequence[float]], *,
                       encode: Callable[[tuple], Sequence[float]],
                       decode: Callable[[np.ndarray], tuple],
                       lower=None, upper=None, outside: str = "penalty", penalty: float = 1e6,
                       failure: float = 1e6, screen_starts: bool = True,
                       step: float | None = 0.1, xatol: float = 1e-7, fatol: float = 1e-13,
                       max_evaluations: int = 4000, adaptive: bool = False,
                       scalar_bounds: tuple[float, float] | None = None,
                       scalar_grid: Sequence[float] | None = None, scalar_xatol: float = 1e-10,
                       scalar_max_iterations: int = 500,
                       virial: Callable[[Any], float] | None = None, scaled=None,
                       virial_steps: int = 3, virial_tolerance: float = 1e-13,
                       progress: Callable[[int, float], None] | None = None) -> NonlinearOptimum:
    """Minimize ``energy(values)`` by Nelder–Mead (or Brent in one coordinate), then rescale.

    Parameters
    ----------
    energy : callable
        ``energy(values) -> E`` or ``(E, info)`` (Eh).  Raising :class:`TwoelError` or returning a
        non-finite ``E`` marks a failed point (value ``failure`` for the search, never the best).
    starts : sequence of value tuples
        Starting parameter values; with ``screen_starts`` each is evaluated and the lowest (the
        first of equals) starts the search, else only the first is used.
    encode, decode : callable
        Parameter values -> search coordinates and back.
    lower, upper : array_like, optional
        Bounds of the search coordinates.  ``outside="penalty"``: a point not strictly inside
        gets ``penalty`` without evaluation; ``"clip"``: it is clipped and evaluated.
    step : float or None
        Edge of the initial simplex along each coordinate (``None``: scipy's default simplex).
    xatol, fatol, max_evaluations, adaptive
        Nelder–Mead options (``fatol`` in Eh; ``max_evaluations`` counts objective calls).
    scalar_bounds : (float, float), optional
        Bounds of a one-coordinate search (default ``lower``, ``upper``).
    scalar_grid : sequence of float, optional
        Offsets from the start evaluated first in one coordinate; Brent then searches between the
        neighbours of the lowest (the whole bounds if it lies on the edge).
    virial : callable, optional
        ``virial(info) -> λ`` at the best point; enables the rescaling of the values marked by
        ``scaled`` (a boolean mask, default all) by ``λ``.
    virial_steps, virial_tolerance
        At most this many rescalings; stop when ``|λ - 1| < virial_tolerance`` or no gain.
    progress : callable, optional
        ``progress(n_evaluations, best_energy)`` after every evaluation.

    Returns
    -------
    NonlinearOptimum

    Raises
    ------
    ConvergenceError
        If no evaluated point gave a finite energy.
    """
    if outside not in ("penalty", "clip"):
        raise ValueError(f"outside must be 'penalty' or 'clip', got {outside!r}")
    search = _Search(energy, decode, None if lower is None else np.asarray(lower, dtype=float),
                     None if upper is None else np.asarray(upper, dtype=float),
                     outside, penalty, failure, progress)
    start = _first_start(search, starts, screen_starts)
    x0 = np.asarray(encode(start), dtype=float)
    if x0.size == 1:
        res = _brent_search(search, x0, scalar_bounds, scalar_grid, scalar_xatol,
                            scalar_max_iterations)
        method = "brent-bounded"
    else:
        res = _simplex_search(search, x0, step, xatol, fatol, max_evaluations, adaptive)
        method = "nelder-mead"
    accepted = 0
    if virial is not None:
        accepted = _virial_rescale(search, len(start), virial, scaled, virial_steps,
                                   virial_tolerance)
    if search.best_values is None:
        raise ConvergenceError("the optimizer found no parameter values with a finite energy")
    return NonlinearOptimum(tuple(search.best_values), search.best_energy, search.best_info,
                            search.count, method, bool(res.success), str(res.message),
                            tuple(start), accepted)


@dataclass(frozen=True)
class OptimizationRecord:
    """What the optimizer did (``initial`` and ``final`` map parameter names to values)."""

    method: str
    n_evaluations: int
    success: bool
    message: str
    initial: dict
    final: dict


def minimize_energy(energy: Callable[[dict], float], parameters: Sequence[Parameter],
                    progress: Callable[[int, float], None] | None = None,
                    tolerance: float = 1e-13, max_evaluations: int = 4000) -> tuple[dict, float, OptimizationRecord]:
    """Minimize ``energy(values)`` over named parameters on a log scale inside their bounds.

    :func:`minimize_nonlinear` with ``x = ln(value)`` clipped to ``[ln lower, ln upper]``, a
    simplex of edge 0.1 (or, for one parameter, a 9-point grid of ±0.4 then Brent) and no
    virial step (the pipeline rescales after solving at the final size).

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
    max_evaluations : int
        Largest number of Nelder–Mead objective calls.

    Returns
    -------
    values, best_energy, record
    """
    names = [p.name for p in parameters]
    lower = np.log([p.lower for p in parameters])
    upper = np.log([p.upper for p in parameters])
    x0 = np.log([p.initial for p in parameters])

    opt = minimize_nonlinear(lambda values: energy(dict(zip(names, values))), [tuple(np.exp(x0).tolist())],
                             encode=lambda values: x0, decode=lambda x: tuple(np.exp(x).tolist()),
                             lower=lower, upper=upper, outside="clip", failure=1e10,
                             screen_starts=False, step=0.1, xatol=1e-7, fatol=tolerance,
                             max_evaluations=max_evaluations,
                             scalar_grid=np.linspace(-0.4, 0.4, 9), progress=progress)
    best = dict(zip(names, opt.values))
    record = OptimizationRecord(opt.method, opt.n_evaluations, opt.success, opt.message,
                                dict(zip(names, np.exp(x0).tolist())), dict(best))
    return dict(best), opt.energy, record
