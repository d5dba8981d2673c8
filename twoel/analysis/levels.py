r"""Term diagrams: every singlet and triplet level up to ``n_max`` and ``L_max``, their quantum
defects, and Ritz fits of each series (Hartree atomic units; no I/O, no display).

For a two-electron ion of charge ``Z`` the outer electron of a singly excited level ``n ^{2S+1}L``
sees, far from the nucleus, the charge ``ζ = Z − 1`` of the one-electron ion, whose ground state
lies at the threshold ``E_th = −Z²/2``.  Writing the level as a hydrogenic one with an effective
principal quantum number ``n*``

.. math:: E = E_\mathrm{th} - \frac{\zeta^2}{2 n^{*2}},\qquad
          n^* = \frac{\zeta}{\sqrt{2 (E_\mathrm{th} - E)}},\qquad \delta = n - n^*

defines the quantum defect ``δ`` (M. J. Seaton, Rep. Prog. Phys. 46, 167 (1983)).  With the
binding energy ``b = E_th − E`` (the ionization energy), ``dn*/db = −n*/(2b)``, so an energy
uncertainty ``σ_E`` gives

.. math:: \sigma_\delta = \frac{n^*}{2 b}\,\sigma_E = \frac{n^{*3}}{\zeta^2}\,\sigma_E .

For ``ζ ≤ 0`` (H⁻, and model charges ``Z ≤ 1``) there is no Coulomb tail, no Rydberg series and
no quantum defect.

Along one series (fixed ``L`` and spin) the defects follow the Ritz expansion

.. math:: \delta(n) = \delta_0 + \frac{\delta_2}{(n-\delta_0)^2} + \frac{\delta_4}{(n-\delta_0)^4} + \dots

(W. Ritz, Phys. Z. 9, 521 (1908); in this form e.g. G. W. F. Drake, Springer Handbook of
Atomic, Molecular and Optical Physics (2006), ch. 11).  :func:`fit_ritz` fits it by weighted
nonlinear least squares (weights ``1/σ_δ²``), with as many terms as the points allow (at most
three, always fewer than the points), and judges the residuals against the propagated bars.

:func:`compute_levels` solves every state through :func:`twoel.solve`; a state the engine
refuses (:class:`~twoel.errors.UnsupportedError`) is kept in the table as *not available in this
version*, so adding a family that covers more states needs no change here.
"""

from __future__ import annotations

import math
import time
import warnings
from dataclasses import dataclass, field
from typing import Callable, Sequence

import numpy as np

from twoel.errors import ConvergenceError, InputError, TwoelError, UnsupportedError
from twoel.results import Result
from twoel.system import Ion, State

#: largest ``n_max`` accepted (bounded before any state list is made; Rydberg levels beyond it
#: need bases far larger than the stored box sets describe)
MAX_N = 12
#: largest ``L_max`` accepted (L = 6 is the letter I; the engine is far from it today)
MAX_L = 6
#: lowest ``n`` taken into a Ritz fit by default: the ground state 1s² is no Rydberg level
#: (both electrons share one shell), so the S fits start at n = 2 (common practice)
DEFAULT_FIT_LOWEST_N = 2
#: fewest levels of a series that are fitted (a fit keeps fewer terms than points)
MIN_FIT_POINTS = 3
#: names of the Ritz coefficients, in order
RITZ_TERMS = ("delta_0", "delta_2", "delta_4")

#: status of a level
COMPUTED, NOT_AVAILABLE, NOT_BOUND, FAILED = "computed", "not available", "not bound", "failed"
#: the words printed for a state the engine refuses
NOT_AVAILABLE_TEXT = "not available in this version"
#: why a charge Z <= 1 has no quantum defects
NO_DEFECT_NOTE = ("ζ = Z − 1 ≤ 0: the outer electron sees no net Coulomb charge of the ion, so there "
                  "is no Rydberg series and no quantum defect")


def _arrays(*values):
    return [np.asarray(v, dtype=float) for v in values]


def effective_n(energy_hartree, threshold_hartree, zeta):
    """``n* = ζ / sqrt(2 (E_th − E))`` (dimensionless); NaN where the level is not bound.

    Parameters
    ----------
    energy_hartree : array_like
        Level energies ``E`` (Eh).
    threshold_hartree : float or array_like
        Ionization threshold ``E_th`` (Eh), ``−Z²/2`` for a two-electron ion.
    zeta : float
        Charge seen by the outer electron, ``Z − 1`` (must be > 0).
    """
    e, th = _arrays(energy_hartree, threshold_hartree)
    if not zeta > 0:
        raise InputError(f"a quantum defect needs a charge ζ = Z − 1 > 0, got ζ = {zeta!r}")
    binding = th - e
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(binding > 0, zeta / np.sqrt(2.0 * np.where(binding > 0, binding, 1.0)), np.nan)


def quantum_defect(n, energy_hartree, threshold_hartree, zeta, energy_uncertainty_hartree=None):
    """Quantum defect ``δ = n − n*`` and its uncertainty propagated from the energy's.

    Parameters
    ----------
    n : array_like of int
        Principal quantum numbers.
    energy_hartree : array_like
        Level energies (Eh).
    threshold_hartree : float or array_like
        Ionization threshold ``E_th`` (Eh).
    zeta : float
        ``Z − 1`` (> 0).
    energy_uncertainty_hartree : array_like, optional
        Uncertainties ``σ_E`` of the energies (Eh); NaN or missing: no ``σ_δ``.

    Returns
    -------
    delta, sigma : numpy.ndarray
        ``δ`` (dimensionless) and ``σ_δ = n*³ σ_E / ζ²`` (NaN without ``σ_E``).
    """
    nn, e = _arrays(n, energy_hartree)
    n_star = effective_n(e, threshold_hartree, zeta)
    delta = nn - n_star
    if energy_uncertainty_hartree is None:
        return delta, np.full_like(delta, np.nan)
    (sigma_e,) = _arrays(energy_uncertainty_hartree)
    return delta, np.abs(sigma_e) * n_star**3 / zeta**2


def rydberg_energy(n, delta, threshold_hartree, zeta):
    """``E = E_th − ζ² / (2 (n − δ)²)`` (Eh): the level of quantum defect ``δ`` (the inverse of
    :func:`quantum_defect`)."""
    nn, d, th = _arrays(n, delta, threshold_hartree)
    return th - zeta**2 / (2.0 * (nn - d) ** 2)


def ritz_defect(n, *coefficients):
    """``δ(n) = δ₀ + δ₂/(n − δ₀)² + δ₄/(n − δ₀)⁴`` for the coefficients given (1 to 3)."""
    (nn,) = _arrays(n)
    d0 = coefficients[0]
    m = 1.0 / (nn - d0) ** 2
    return d0 + sum(c * m ** (k + 1) for k, c in enumerate(coefficients[1:]))


@dataclass(frozen=True, repr=False)
class RitzFit(Result):
    """Ritz fit of the quantum defects of one series (fixed ``L`` and multiplicity).

    ``coefficients`` and ``uncertainties`` are keyed by :data:`RITZ_TERMS` (dimensionless).
    The uncertainties come from the fit covariance; when ``chi2_per_dof`` exceeds 1 they are
    scaled by ``sqrt(chi2_per_dof)`` (Birge ratio), so a truncated expansion does not claim
    the precision of the energies.  ``residuals`` are ``δ_i − δ_fit(n_i)``; ``exceeds_bars``
    says whether any of them is larger than its propagated bar ``σ_i``.  Without bars the fit
    is unweighted, ``chi2`` is ``None`` and the uncertainties come from the scatter.
    """

    L: int
    multiplicity: int
    n: tuple
    defects: tuple
    defect_uncertainties: tuple
    coefficients: dict
    uncertainties: dict
    residuals: tuple
    chi2: float | None
    dof: int
    chi2_per_dof: float | None
    exceeds_bars: bool | None
    weighted: bool
    note: str = ""

    SUMMARY = ("L", "multiplicity", "coefficients")

    @property
    def series(self) -> str:
        """``^1S``-style label of the series."""
        return f"^{self.multiplicity}{'SPDFGHIK'[self.L]}"

    DERIVED = ("series",)


def _ritz_start(n, delta, count: int) -> list[float]:
    return [float(delta[np.argmax(n)])] + [0.0] * (count - 1)


def fit_ritz(n, delta, sigma=None, *, L: int = 0, multiplicity: int = 1, terms: int | None = None) -> RitzFit:
    """Weighted nonlinear least-squares fit of the Ritz expansion to the defects of one series.

    Parameters
    ----------
    n : array_like of int
        Principal quantum numbers (at least :data:`MIN_FIT_POINTS` distinct values).
    delta : array_like
        Quantum defects (dimensionless).
    sigma : array_like, optional
        Their uncertainties (weights ``1/σ²``); all positive and finite, else the fit is unweighted.
    L, multiplicity : int
        The series (carried into the result).
    terms : int, optional
        Coefficients fitted (default: as many as the points allow, at most three, fewer than
        the points).

    Returns
    -------
    RitzFit
    """
    from scipy.optimize import curve_fit

    nn, d = _arrays(n, delta)
    if nn.size != d.size or nn.size < MIN_FIT_POINTS or len(set(nn.tolist())) != nn.size:
        raise InputError(f"a Ritz fit needs at least {MIN_FIT_POINTS} levels of distinct n, got {nn.size}")
    count = min(len(RITZ_TERMS), nn.size - 1) if terms is None else int(terms)
    if not 1 <= count <= min(len(RITZ_TERMS), nn.size - 1):
        raise InputError(f"a Ritz fit of {nn.size} points takes 1..{min(3, nn.size - 1)} terms, got {terms!r}")
    s = None if sigma is None else np.abs(np.asarray(sigma, dtype=float))
    weighted = s is not None and s.size == nn.size and bool(np.all(np.isfinite(s) & (s > 0)))
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            values, cov = curve_fit(ritz_defect, nn, d, p0=_ritz_start(nn, d, count),
                                    sigma=s if weighted else None, absolute_sigma=weighted)
        except RuntimeError as exc:  # scipy: the least-squares iteration did not converge
            raise ConvergenceError(f"the Ritz fit of the ^{multiplicity}{'SPDFGHIK'[L]} series did not "
                                   f"converge ({exc})") from None
    residuals = d - ritz_defect(nn, *values)
    dof = nn.size - count
    note = ""
    if weighted:
        chi2 = float(np.sum((residuals / s) ** 2))
        ratio = chi2 / dof
        scale = math.sqrt(ratio) if ratio > 1 else 1.0
        exceeds = bool(np.any(np.abs(residuals) > s))
        if ratio > 1:
            note = (f"χ²/dof = {ratio:.3g} > 1: the truncated expansion does not describe the defects "
                    f"within their bars; coefficient uncertainties scaled by sqrt(χ²/dof) = {scale:.3g}")
    else:
        chi2, ratio, exceeds, scale = None, None, None, 1.0
        note = "unweighted fit (not every level has an uncertainty); uncertainties from the scatter"
    errors = scale * np.sqrt(np.abs(np.diag(cov)))
    return RitzFit(L, multiplicity, tuple(int(x) for x in nn), tuple(float(x) for x in d),
                   tuple(float(x) for x in (s if s is not None else np.full(nn.size, np.nan))),
                   dict(zip(RITZ_TERMS, map(float, values))), dict(zip(RITZ_TERMS, map(float, errors))),
                   tuple(float(x) for x in residuals), chi2, dof, ratio, exceeds, weighted, note)


def level_states(n_max: int, L_max: int) -> list[State]:
    """Every singlet and triplet ``1 ≤ n ≤ n_max``, ``0 ≤ L ≤ min(L_max, n − 1)`` (no 1³S),
    ordered by ``L``, then multiplicity, then ``n``; both bounds are checked first (an ``L`` with
    no ``n > L`` up to ``n_max`` gives no level)."""
    for name, value, low, high in (("n_max", n_max, 1, MAX_N), ("L_max", L_max, 0, MAX_L)):
        if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or not low <= value <= high:
            raise InputError(f"'{name}' must be an integer {low}..{high}, got {value!r}")
    return [State(n, mult, L) for L in range(L_max + 1) for mult in (1, 3)
            for n in range(L + 1, n_max + 1) if not (n == 1 and mult == 3)]


@dataclass(frozen=True, repr=False)
class Level(Result):
    """One level of the term diagram (energies in Eh; the defect is dimensionless).

    ``status`` is :data:`COMPUTED`, :data:`NOT_AVAILABLE` (the engine refuses the state),
    :data:`NOT_BOUND` (the basis puts it above the threshold) or :data:`FAILED` (the solve
    stopped with an error; ``message`` says which).  ``row`` holds the energy-table columns of
    the solve (:func:`twoel.analysis.sweep.result_row`: energy, error bar, reference,
    ionization energies); ``provenance`` the solve's short provenance.
    """

    state: str
    n: int
    L: int
    multiplicity: int
    status: str
    message: str = ""
    energy_hartree: float | None = None
    error_bar_hartree: float | None = None
    ionization_energy_hartree: float | None = None
    ionization_energy_error_bar_hartree: float | None = None
    effective_n: float | None = None
    quantum_defect: float | None = None
    quantum_defect_uncertainty: float | None = None
    reliable: bool | None = None
    row: dict = field(default_factory=dict)
    provenance: dict = field(default_factory=dict)

    SUMMARY = ("state", "status", "energy_hartree")


#: provenance entries a level keeps from its solve
LEVEL_PROVENANCE = ("method", "family", "size", "precision", "version", "constants", "numpy")


def level_from_result(state: State, result, zeta: float) -> Level:
    """The :class:`Level` of a finished solve (``result``: an :class:`~twoel.results.EnergyResult`)."""
    from twoel.analysis.sweep import result_row

    row = result_row(result)
    provenance = {k: result.provenance[k] for k in LEVEL_PROVENANCE if k in result.provenance}
    provenance["n_terms"] = result.n_terms
    bar = result.provenance.get("error_bar")
    if isinstance(bar, dict):
        provenance["error_bar"] = {k: bar[k] for k in ("method", "sizes", "ratio", "reliable") if k in bar}
    common = dict(state=state.label, n=state.n, L=state.L, multiplicity=state.multiplicity,
                  energy_hartree=result.energy_hartree, error_bar_hartree=result.error_bar_hartree,
                  reliable=result.reliable, row=row, provenance=provenance)
    if not result.bound:
        return Level(status=NOT_BOUND, message=result.message or "not bound in this basis", **common)
    defect = n_star = sigma = None
    if zeta > 0:
        bar = np.nan if result.error_bar_hartree is None else result.error_bar_hartree
        d, s = quantum_defect([state.n], [result.energy_hartree], result.threshold_hartree, zeta, [bar])
        n_star, defect = float(state.n - d[0]), float(d[0])
        sigma = None if not np.isfinite(s[0]) else float(s[0])
    return Level(status=COMPUTED, ionization_energy_hartree=result.ionization_energy_hartree,
                 ionization_energy_error_bar_hartree=result.ionization_energy_error_bar_hartree,
                 effective_n=n_star, quantum_defect=defect, quantum_defect_uncertainty=sigma, **common)


@dataclass(frozen=True, repr=False)
class LevelTable(Result):
    """The term diagram of one ion: levels, Ritz fits of the series, notes and provenance.

    ``threshold_hartree`` is ``E_th = −Z²/2`` (Eh), ``zeta`` the charge ``Z − 1`` seen by the
    outer electron; ``fits`` has one :class:`RitzFit` per series with enough computed levels.
    """

    Z: float
    ion: str
    n_max: int
    L_max: int
    threshold_hartree: float
    zeta: float
    levels: tuple
    fits: tuple
    notes: tuple = ()
    provenance: dict = field(default_factory=dict)
    elapsed_seconds: float = 0.0

    SUMMARY = ("ion", "n_max", "L_max")

    def computed(self) -> list[Level]:
        return [lv for lv in self.levels if lv.status == COMPUTED]

    def to_frame(self):
        """One row per level: the solve's energy columns plus the level's own columns."""
        import pandas as pd

        rows = []
        for lv in self.levels:
            row = {"Z": self.Z, "ion": self.ion, "state": lv.state, "n": lv.n, "L": lv.L,
                   "multiplicity": lv.multiplicity, "status": lv.status}
            row.update({k: v for k, v in lv.row.items() if k not in row})
            row.update({"effective_n": lv.effective_n, "quantum_defect": lv.quantum_defect,
                        "quantum_defect_uncertainty": lv.quantum_defect_uncertainty,
                        "reliable": lv.reliable, "message": lv.message})
            rows.append(row)
        return pd.DataFrame(rows)


def series_fits(levels: Sequence[Level], lowest_n: int = DEFAULT_FIT_LOWEST_N) -> tuple[list[RitzFit], list[str]]:
    """One :func:`fit_ritz` per series (``L``, multiplicity) with at least :data:`MIN_FIT_POINTS`
    computed levels of ``n >= lowest_n`` that have a quantum defect; and a note for each series
    whose fit did not converge."""
    fits, notes = [], []
    keys = sorted({(lv.L, lv.multiplicity) for lv in levels})
    for L, mult in keys:
        chosen = [lv for lv in levels if (lv.L, lv.multiplicity) == (L, mult) and lv.status == COMPUTED
                  and lv.quantum_defect is not None and lv.n >= lowest_n]
        if len(chosen) < MIN_FIT_POINTS:
            continue
        sigma = [np.nan if lv.quantum_defect_uncertainty is None else lv.quantum_defect_uncertainty
                 for lv in chosen]
        try:
            fits.append(fit_ritz([lv.n for lv in chosen], [lv.quantum_defect for lv in chosen], sigma,
                                 L=L, multiplicity=mult))
        except ConvergenceError as exc:
            notes.append(str(exc))
    return fits, notes


def _solve_level(task: dict):
    """Worker: ``solve(**task)``, or the refused/failed state as ``(status, message)``.

    A state whose inputs :func:`twoel.solver.pipeline.check_inputs` refuses as unsupported (no
    family represents it, or not at this precision) is *not available*; a solve that stops with
    an error later (too few functions for the root, no convergence...) has *failed*.  Bad input
    (:class:`~twoel.errors.InputError`) is raised: it is the same for every state.
    """
    from twoel.basis import family_for
    from twoel.solver.pipeline import check_inputs, solve

    task = dict(task)
    state = State.parse(task["state"])
    if task.get("family") is None:
        try:  # the most capable family that declares the state, at the size it gives for it
            fam = family_for(state)
            task["family"] = fam.name
            if task.get("size") is None:
                task["size"] = fam.size_for(Ion(task["Z"]), state)
        except UnsupportedError:
            pass  # solve itself says whether another route exists
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # warnings travel inside the result
        try:
            check_inputs(**task)
        except UnsupportedError as exc:
            return (NOT_AVAILABLE, f"{NOT_AVAILABLE_TEXT} ({exc})")
        try:
            return solve(**task)
        except InputError:
            raise
        except TwoelError as exc:
            return (FAILED, f"{type(exc).__name__}: {exc}")


def _run_tasks(tasks: list[dict], jobs: int | None, progress) -> list:
    from twoel.analysis.sweep import run_tasks

    report = None if progress is None else (lambda done, total, task: progress(done, total, task["state"]))
    return run_tasks(_solve_level, tasks, jobs, report)


def compute_levels(Z, n_max: int = 5, L_max: int = 3, *, family: str | None = None,
                   size: int | None = None, precision: str = "float64",
                   fit_lowest_n: int = DEFAULT_FIT_LOWEST_N, jobs: int | None = 1,
                   progress: Callable[[int, int, str], None] | None = None) -> LevelTable:
    """Solve every level of :func:`level_states` and fit the quantum defects of each series.

    Parameters
    ----------
    Z : float or str
        Nuclear charge (any ``Z > 0``; element symbols accepted).
    n_max, L_max : int
        Highest principal quantum number (1..:data:`MAX_N`) and angular momentum (0..:data:`MAX_L`).
    family : str, optional
        Trial family for every state (default: per state, the most capable family that declares
        it, :func:`twoel.basis.family_for`, at the size it gives for the state).
    size : int, optional
        Basis size for every state (default: the family's size for the state).
    precision : str
        ``"float64"`` or ``"extended"`` (as :func:`twoel.solve`).
    fit_lowest_n : int
        Lowest ``n`` of the levels taken into the Ritz fits.
    jobs : int, optional
        Worker processes (1: serial; 0: one per core).
    progress : callable, optional
        ``progress(done, total, state_label)`` after each finished state.

    Returns
    -------
    LevelTable
    """
    from twoel import constants
    from twoel._version import __version__

    started = time.perf_counter()
    ion = Ion.parse(Z) if not isinstance(Z, Ion) else Z
    states = level_states(n_max, L_max)
    if isinstance(fit_lowest_n, bool) or not isinstance(fit_lowest_n, int) or not 1 <= fit_lowest_n <= MAX_N:
        raise InputError(f"'fit_lowest_n' must be an integer 1..{MAX_N}, got {fit_lowest_n!r}")
    zeta = ion.Z - 1.0
    tasks = [{"Z": ion.Z, "state": s.label, "family": family, "size": size, "precision": precision}
             for s in states]
    outcomes = _run_tasks(tasks, jobs, progress)
    levels = []
    for state, outcome in zip(states, outcomes):
        if isinstance(outcome, tuple):
            levels.append(Level(state.label, state.n, state.L, state.multiplicity, outcome[0], outcome[1]))
        else:
            levels.append(level_from_result(state, outcome, zeta))
    fits, notes = series_fits(levels, fit_lowest_n) if zeta > 0 else ([], [NO_DEFECT_NOTE])
    provenance = {"package": "twoel", "version": __version__, "method": "Rayleigh-Ritz variational, "
                  "one solve per level; quantum defects from E_th = -Z²/2 and ζ = Z - 1; Ritz fits by "
                  "weighted nonlinear least squares (scipy.optimize.curve_fit)",
                  "family": family or "per state (most capable family that declares it)",
                  "size": size, "precision": precision, "fit_lowest_n": fit_lowest_n,
                  "constants": constants.CODATA_EDITION, "numpy": np.__version__,
                  "scipy": _scipy_version()}
    return LevelTable(ion.Z, ion.label, n_max, L_max, ion.threshold_hartree, zeta, tuple(levels),
                      tuple(fits), tuple(notes), provenance, time.perf_counter() - started)


def _scipy_version() -> str:
    import scipy

    return scipy.__version__
