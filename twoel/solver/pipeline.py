"""The front door: ``solve(Z, state, family, size)`` -> :class:`EnergyResult` (no I/O here).

The steps, each a function below: :func:`_validate` (ion, state, family, size, options,
parameters; the family is chosen from its :class:`~twoel.basis.base.Support` declaration when
the default cannot do the state), :func:`_optimize` (if the family asks for it and the user
gave no fixed values) with :func:`_virial_rescale`, :func:`_evaluate` (build the matrices and
solve the generalized eigenproblem), :func:`_refine_step` (beyond float64, where the family
declares the ``"mixed"``/``"extended"`` paths), the error bar
(:func:`twoel.solver.error_bar.nested_error_bar`) and :func:`_assemble` (diagnostics, the
published reference, the provenance).  The solver asks the family what it supports; it never
tests a family's name.
"""

from __future__ import annotations

import time
import warnings
from dataclasses import dataclass, replace
from typing import Callable

import numpy as np

from twoel import constants
from twoel._version import __version__
from twoel.basis import family_for, get_family
from twoel.basis.base import Parameter, TrialFamily
from twoel.solver.eigen import DEFAULT_DROP_THRESHOLD, EigenSolution, solve_generalized
from twoel.errors import AccuracyWarning, InputError, ResourceError, UnsupportedError
from twoel.basis.angular import AngularBasis
from twoel.basis.correlated import CorrelatedBasis
from twoel.integrals import precise
from twoel.basis.exponential_boxes import MIN_CHARGE
from twoel.solver.memory import check_memory
from twoel.solver.optimize import minimize_energy, virial_scale
from twoel.solver.error_bar import digits_error, float64_energy, nested_error_bar, supported_digits
from twoel.solver.refine import (check_precision, extended_refine, mixed_refine,
                                 starting_condition_digits, truncate_text)
from twoel.reference import lookup
from twoel.results import EnergyResult, Wavefunction
from twoel.system import Ion, State

#: condition number of the scaled overlap above which a near-dependence warning is attached
ILL_CONDITIONED = 1e15
#: largest exponential basis solved in extended precision (arb LU is O(N³) at ~200 bits)
MAX_EXTENDED_SIZE = 2500


def _evaluate(family: TrialFamily, ion: Ion, state: State, size, values: dict, options: dict,
              drop_threshold: float):
    basis = family.build(ion, state, size, values, options)
    matrices = basis.matrices()
    H = matrices.hamiltonian(ion.Z)
    eig = solve_generalized(H, matrices.overlap, drop_threshold=drop_threshold)
    if state.root >= eig.values.shape[0]:
        raise UnsupportedError(f"the basis has only {eig.values.shape[0]} independent functions; "
                               f"root {state.root + 1} ({state.label}) needs more (raise the size)")
    return basis, matrices, eig


def _expectations(matrices, eig: EigenSolution, root: int, Z: float) -> tuple[float, float]:
    c = eig.vectors[:, root]
    norm = c @ matrices.overlap @ c
    kinetic = float(c @ matrices.kinetic @ c / norm)
    potential = float(c @ (matrices.repulsion - Z * matrices.nuclear) @ c / norm)
    return kinetic, potential


#: the family used when the caller names none and it can represent the state (as before)
DEFAULT_FAMILY = "hylleraas"


@dataclass(frozen=True)
class _Plan:
    """The validated inputs of one solve."""

    ion: Ion
    state: State
    fam: TrialFamily
    size: int | None
    options: dict
    params: list
    do_optimize: bool
    precision: str
    digits: int | None
    drop_threshold: float

    def evaluate(self, values: dict, size="same"):
        return _evaluate(self.fam, self.ion, self.state, self.size if size == "same" else size,
                         values, self.options, self.drop_threshold)


@dataclass
class _Solved:
    """A float64 solve, and its refinement when there is one."""

    basis: object
    matrices: object
    eig: EigenSolution
    values: dict
    energy: float
    kinetic: float
    potential: float
    refined: object = None


def choose_family(state: State, family=None, size: int | None = None, ion: Ion | None = None):
    """The family and size of a solve (the front door's choice).

    ``family`` given: that family, ``size`` as given (``None``: its default size).  ``family``
    ``None``: :data:`DEFAULT_FAMILY` with its default size when it declares itself the default
    for ``state`` (:meth:`~twoel.basis.base.Support.is_default_for`: the ground state), else the most capable family whose declaration covers the state
    (:func:`twoel.basis.family_for`) with the size it gives for the state
    (:meth:`~twoel.basis.base.TrialFamily.size_for`), unless ``size`` is given.
    """
    if family is not None:
        return get_family(family), size
    default = get_family(DEFAULT_FAMILY)
    if default.supports().is_default_for(state):
        return default, size
    fam = family_for(state)
    return fam, fam.size_for(ion or Ion(2), state) if size is None else size


def _validate(Z, state, family, size, parameters, optimize, options, precision, digits,
              drop_threshold) -> _Plan:
    ion = Z if isinstance(Z, Ion) else Ion.parse(Z)
    state = State.parse(state)
    given_size = size
    fam, size = choose_family(state, family, size, ion)
    if not ion.Z >= MIN_CHARGE:  # one small-charge rule for every family (that of the box edges)
        raise InputError(f"the {fam.name} family needs Z >= {MIN_CHARGE:g} (below it the bases' "
                         f"exponents, which scale with Z, reach their floor; no two-electron state "
                         f"is bound below Z_c = {CRITICAL_CHARGE} anyway), got Z = {ion.Z:g}")
    digit_target = check_precision(precision, digits)
    if digits is not None:
        size = _size_for_digits(fam, ion, state, digit_target, given_size, size)
    size = fam.resolve_size(size)
    if precision == "extended" and size is not None and size > MAX_EXTENDED_SIZE:
        raise ResourceError(f"extended precision is limited to {MAX_EXTENDED_SIZE} terms "
                            f"(got {size}); use a smaller size or the default precision")
    options = fam.check_options(options)
    fam.check_state(state)
    if precision == "extended" and "extended" not in fam.precision_paths(state):
        raise UnsupportedError(f"precision='extended' is not available for {state.label} with the "
                               f"{fam.name} family (it needs the exponential family and an S state)")
    params = _starting_parameters(fam, ion, state, size, options, parameters)
    n_functions = fam.build(ion, state, size, {p.name: p.initial for p in params}, options).size
    check_memory(n_functions, precision)      # before any matrix is built
    do_optimize = (fam.optimize_by_default and parameters is None) if optimize is None else bool(optimize)
    return _Plan(ion, state, fam, size, options, params, bool(do_optimize and params), precision,
                 digit_target, drop_threshold)


def _size_for_digits(fam, ion: Ion, state: State, digits: int, given_size, size):
    """The size that reaches ``digits`` by the family's stored convergence (``size`` given: a
    warning before the run when it cannot reach them)."""
    table = fam.convergence(ion, state)
    if not table:
        if given_size is None:
            warnings.warn(f"no convergence data stored for {ion.label} {state.label}: the default size "
                          f"is used and the error bar will say how many of the {digits} digits it reached",
                          AccuracyWarning, stacklevel=4)
        return size
    target = digits_error(ion.threshold_hartree, digits)
    enough = [n for n, error in table if error <= target]
    reached = max(table)  # the largest size measured and its error
    if given_size is None:
        if not enough:
            raise ResourceError(f"{digits} significant digits need more than the largest measured basis: "
                                f"N = {reached[0]} reaches an error of {reached[1]:.0e} Eh (about "
                                f"{supported_digits(ion.threshold_hartree, reached[1])} digits); ask for fewer digits")
        return enough[0]
    below = [error for n, error in table if n <= given_size]
    expected = below[-1] if below else table[0][1]
    if expected > target:
        need = f"N >= {enough[0]}" if enough else f"more than N = {reached[0]}"
        warnings.warn(f"size {given_size} reaches about {supported_digits(ion.threshold_hartree, expected)} digits by the "
                      f"stored convergence of {ion.label} {state.label}; {digits} digits need {need}: "
                      "the basis, not the arithmetic, limits the result", AccuracyWarning, stacklevel=4)
    return size


def check_inputs(Z, state, family=None, size=None, parameters=None, optimize=None, options=None,
                 precision: str = "float64", digits=None, drop_threshold: float = DEFAULT_DROP_THRESHOLD) -> None:
    """Run the input checks of :func:`solve` (nothing is solved); raises as :func:`solve` would."""
    _validate(Z, state, family, size, parameters, optimize, options, precision, digits, drop_threshold)


def _starting_parameters(fam, ion, state, size, options, given) -> list[Parameter]:
    params = fam.parameters(ion, state, size, options)
    names = [p.name for p in params]
    if given is None:
        return params
    unknown = sorted(set(given) - set(names))
    if unknown:
        raise InputError(f"unknown parameter(s) {', '.join(unknown)} for family {fam.name!r} "
                         f"(parameters: {', '.join(names) or 'none'})")
    for name, value in given.items():
        if not np.isfinite(value) or value <= 0:
            raise InputError(f"parameter {name!r} must be a positive exponent (bohr⁻¹), got {value!r}")
    return [replace(p, initial=float(given.get(p.name, p.initial))) for p in params]


def _optimize(plan: _Plan, progress) -> tuple[dict, dict | None]:
    """Optimized values and the optimizer record (families tune on their tuning size)."""
    values = {p.name: p.initial for p in plan.params}
    if not plan.do_optimize:
        return values, None
    tune_size = plan.fam.tuning_size(plan.ion, plan.state, plan.size)
    watch = _BindingWatch(plan.ion.threshold_hartree, hopeless=plan.ion.Z < NEVER_BOUND_BELOW)

    def energy(v):
        value = plan.evaluate(v, tune_size)[2].values[plan.state.root]
        watch.see(v, float(value))
        return value

    try:
        values, _best, opt = minimize_energy(energy, plan.params, progress=progress)
    except _StaysUnbound:
        why = "this basis does not bind the state" + (
            f": Z = {plan.ion.Z:g} lies below the critical charge {CRITICAL_CHARGE} under which no "
            "two-electron state is bound" if watch.hopeless else "")
        return dict(watch.best_values), {
            "method": "stopped early", "n_evaluations": watch.count, "success": False,
            "message": (f"stopped after {watch.count} evaluations: the energy stayed above the "
                        f"one-electron threshold {plan.ion.threshold_hartree:g} Eh without approaching it "
                        f"({why})"),
            "initial": {p.name: p.initial for p in plan.params}, "size": tune_size}
    record = {"method": opt.method, "n_evaluations": opt.n_evaluations, "success": opt.success,
              "message": opt.message, "initial": opt.initial, "size": tune_size}
    return values, record


class _StaysUnbound(Exception):
    """Raised inside the optimizer's objective to end a search that cannot bind the state."""


class _BindingWatch:
    """Stops an optimization whose energy stays above the threshold ``-Z²/2``: after
    :data:`UNBOUND_PATIENCE` evaluations, if the best energy is still above it and the last
    :data:`UNBOUND_PATIENCE` evaluations did not close half of its distance to it (a flat
    surface: below the critical charge the energy only creeps towards the threshold).
    ``hopeless`` (a charge below :data:`NEVER_BOUND_BELOW`, where no state can be bound): stop
    after :data:`HOPELESS_EVALUATIONS` evaluations above the threshold."""

    def __init__(self, threshold: float, hopeless: bool = False):
        self.threshold, self.count, self.hopeless = threshold, 0, bool(hopeless)
        self.best, self.best_values, self.history = float("inf"), {}, []

    def see(self, values: dict, energy: float) -> None:
        self.count += 1
        if energy < self.best:
            self.best, self.best_values = energy, dict(values)
        self.history.append(self.best)
        if self.hopeless and self.count >= HOPELESS_EVALUATIONS and not self.best < self.threshold:
            raise _StaysUnbound
        if self.count < 2 * UNBOUND_PATIENCE or self.best < self.threshold:
            return
        earlier = self.history[-UNBOUND_PATIENCE - 1]
        if earlier - self.best < 0.5 * (earlier - self.threshold):
            raise _StaysUnbound


#: evaluations between the checks of :class:`_BindingWatch`
UNBOUND_PATIENCE = 60
#: the critical nuclear charge of two-electron ions, below which not even 1^1S is bound:
#: Z_c = 0.911 028 2 (Estienne, Busuttil, Moini, Drake, Phys. Rev. Lett. 112, 173001 (2014),
#: from memory)
CRITICAL_CHARGE = 0.9110282
#: below this charge (Z_c less a margin) an optimization that has not bound the state is hopeless
NEVER_BOUND_BELOW = 0.9
#: evaluations an optimization below :data:`NEVER_BOUND_BELOW` gets before it is stopped
HOPELESS_EVALUATIONS = 5


def _solve_at(plan: _Plan, values: dict) -> _Solved:
    basis, matrices, eig = plan.evaluate(values)
    kinetic, potential = _expectations(matrices, eig, plan.state.root, plan.ion.Z)
    return _Solved(basis, matrices, eig, dict(values), float(eig.values[plan.state.root]),
                   kinetic, potential)


def _virial_rescale(plan: _Plan, solved: _Solved, record: dict | None) -> _Solved:
    """Apply ``exponents -> λ·exponents``, ``λ = -<V>/(2<T>)``, after an optimization if it helps."""
    if not plan.do_optimize or not all(p.kind == "exponent" for p in plan.params) \
            or solved.kinetic <= 0:
        return solved
    scale = virial_scale(solved.kinetic, solved.potential)
    try:
        scaled = _solve_at(plan, {k: v * scale for k, v in solved.values.items()})
    except Exception:  # a rescaled point that fails is simply not taken
        return solved
    # accept unless it raises the energy beyond rounding: the optimum obeys the virial theorem
    if scaled.energy <= solved.energy + 1e-14 * abs(solved.energy):
        record["virial_rescale"] = scale
        return scaled
    return solved


def _refine_step(plan: _Plan, solved: _Solved, record: dict | None, stage) -> tuple[_Solved, tuple | None]:
    """Refine beyond float64 where the family declares it; keep the starting edges if lower."""
    if "mixed" not in plan.fam.precision_paths(plan.state) or not _zero_power(solved.basis):
        return solved, None
    solved.refined = _refine(solved.basis, plan.ion, plan.state, solved.eig, plan.precision,
                             plan.digits, stage=stage)
    solved.energy = solved.refined.energy_hartree
    if record is None:
        return solved, None
    # the optimizer minimized the float64 energy, blind below ~1e-10 Eh: if the starting
    # (stored) edges give the lower refined energy, the variational principle prefers them
    stage(f"comparing with the starting box edges, N = {plan.size}")
    start = _solve_at(plan, {p.name: p.initial for p in plan.params})
    start.refined = _refine(start.basis, plan.ion, plan.state, start.eig, plan.precision, plan.digits)
    if start.refined.energy_hartree < solved.refined.energy_hartree:
        kept = (solved.refined.energy_hartree, start.refined.energy_hartree)
        start.energy = start.refined.energy_hartree
        record["kept_start"] = True
        return start, kept
    return solved, None


def _error_bar_step(plan: _Plan, solved: _Solved, error_bar, stage) -> dict | None:
    """Truncation error bar from nested smaller bases, where the family declares one."""
    if not plan.fam.gives_error_bar(plan.state) or (error_bar is not None and not error_bar) \
            or len(plan.fam.nested_sizes(plan.size)) < 2:  # too small a basis for a sequence
        return None
    if solved.refined is None:
        return _float64_error_bar(plan, solved, stage)

    def refined_energy(n: int):
        # the smaller bases only feed differences: the mixed refinement suffices unless its
        # arithmetic bound is coarser than the digit target, then they are refined like size
        stage(f"error bar: smaller basis N = {n}")
        b, _m, e = plan.evaluate(solved.values, n)
        aux = _refine(b, plan.ion, plan.state, e, "float64", None, stage=stage)
        if plan.precision == "extended" and aux.numerical_error_hartree > _target_error(aux, plan.digits):
            aux = _refine(b, plan.ion, plan.state, e, "extended", plan.digits, start=aux, stage=stage)
        return aux

    return nested_error_bar(refined_energy, plan.size, solved.refined, plan.fam.nested_sizes(plan.size),
                            tuned_at=plan.fam.tuned_at(plan.ion, plan.state))


def _float64_error_bar(plan: _Plan, solved: _Solved, stage) -> dict:
    """Error bar of a float64 solve: nested bases, each energy with the measured cost of its
    dropped directions (:class:`twoel.solver.error_bar.Float64Energy`)."""
    root, Z = plan.state.root, plan.ion.Z

    def energy_at(n: int):
        stage(f"error bar: smaller basis N = {n}")
        _b, m, e = plan.evaluate(solved.values, n)
        return float64_energy(m.hamiltonian(Z), m.overlap, root, plan.drop_threshold, e)

    final = float64_energy(solved.matrices.hamiltonian(Z), solved.matrices.overlap, root,
                           plan.drop_threshold, solved.eig)
    bar = nested_error_bar(energy_at, plan.size, final, plan.fam.nested_sizes(plan.size),
                           tuned_at=plan.fam.tuned_at(plan.ion, plan.state))
    bar["method"] = (f"geometric tail of the nested bases {bar['sizes']} (x{bar['bar_factor']:g}); "
                     "float64 energies, each with the rise of the energy when the drop threshold is raised 10x")
    bar["float64_error_hartree"] = final.numerical_error_hartree
    return bar


def solve(Z, state: str | State = "1^1S", family: str | TrialFamily | None = None,
          size: int | None = None, *, parameters: dict | None = None, optimize: bool | None = None,
          options: dict | None = None, precision: str = "float64",
          drop_threshold: float = DEFAULT_DROP_THRESHOLD,
          progress: Callable[[int, float], None] | None = None, digits: int | None = None,
          error_bar: bool | None = None,
          on_stage: Callable[[str], None] | None = None) -> EnergyResult:
    """Variational energy of one state of a two-electron ion (the one front door).

    Parameters
    ----------
    Z : float or str
        Nuclear charge (``2``, ``"2"``, ``"He"``); any ``Z > 0``.
    state : str or State
        Term symbol, e.g. ``"1^1S"`` (default), ``"2^3S"``, ``"2^3P"``.
    family : str or TrialFamily, optional
        Trial-function family (see :func:`twoel.basis.family_names`).  Default: ``hylleraas``
        for the states it represents (every S state), else the family whose declaration covers
        the state (``exponential`` for P states) at the size it gives for the state
        (:func:`choose_family`).
    size : int, optional
        The family's size parameter (``ω`` for ``hylleraas``, ``N`` for ``exponential``);
        ignored by families without one.
    parameters : dict, optional
        Nonlinear parameters (bohr⁻¹).  Given values are used as they are unless ``optimize=True``.
    optimize : bool, optional
        Optimize the nonlinear parameters (default: the family's choice, and only when no
        ``parameters`` are given).
    options : dict, optional
        Family-specific options (e.g. ``{"exponents": 2}`` for ``hylleraas``).
    precision : str
        ``"float64"`` (default) or ``"extended"`` (families that declare the path: exponential
        S states; exact fixed-point matrices and arb inverse iteration,
        :mod:`twoel.solver.refine`).  Where a family declares the ``"mixed"`` path,
        ``"float64"`` includes a cheap mixed-precision refinement (double-double matrices, one
        128-bit inverse-iteration step).
    drop_threshold : float
        Relative overlap eigenvalue below which basis directions are dropped.
    progress : callable, optional
        ``progress(n_evaluations, best_energy)`` during optimization.
    digits : int, optional
        Significant digits aimed at by ``precision="extended"`` (default 20).
    error_bar : bool, optional
        Estimate the basis-truncation error from the family's smaller nested bases
        (exponential: ``N/2√2``, ``N/2``, ``N/√2``; :mod:`twoel.solver.error_bar`) and fill
        ``error_bar_hartree``.  Default: on where the
        family declares an error bar (exponential S states), off otherwise.
    on_stage : callable, optional
        ``on_stage(text)`` is called as each long step begins (float64 solve, refinements, the
        smaller bases of the error bar), so a caller can show where a minutes-long run is.

    Returns
    -------
    EnergyResult
    """
    started = time.perf_counter()
    plan = _validate(Z, state, family, size, parameters, optimize, options, precision, digits,
                     drop_threshold)
    values, record = _optimize(plan, progress)
    stage = on_stage or (lambda _text: None)
    stage(f"float64 build and solve ({plan.fam.name}"
          + (f", size {plan.size})" if plan.size is not None else ")"))
    solved = _virial_rescale(plan, _solve_at(plan, values), record)
    solved, kept_start = _refine_step(plan, solved, record, stage)
    bar = _error_bar_step(plan, solved, error_bar, stage)
    return _assemble(plan, solved, record, kept_start, bar, time.perf_counter() - started)


def _notes_and_warnings(plan: _Plan, solved: _Solved, record, kept_start, bar) -> tuple[list, list]:
    warn_list, notes = [], []
    eig, refined = solved.eig, solved.refined
    if plan.ion.note:
        notes.append(plan.ion.note)
    if kept_start is not None:
        warn_list.append(f"--optimize found box edges whose refined energy ({kept_start[0]!r} Eh) is "
                         f"above that of the starting edges ({kept_start[1]!r} Eh): the optimizer "
                         "minimizes the float64 energy, which cannot see below ~1e-10 Eh; the "
                         "starting edges are kept")
    if eig.condition_number > ILL_CONDITIONED and refined is None:
        text = (f"overlap condition number {eig.condition_number:.1e} (diagonally scaled): the basis "
                "is nearly linearly dependent and the last float64 digits of the energy may be noise")
        warn_list.append(text)
        warnings.warn(text, AccuracyWarning, stacklevel=4)
    if refined is not None:
        notes.append(f"energy refined beyond float64: {refined.method} ({refined.working_bits} bits); "
                     f"arithmetic error <= {refined.numerical_error_hartree:.1e} Eh; the virial ratio "
                     "is that of the refined vector; the condition number and dropped directions "
                     "describe the float64 starting solve")
    if eig.n_dropped and refined is None:
        notes.append(f"{eig.n_dropped} near-dependent basis directions dropped "
                     f"(canonical orthogonalization, threshold {eig.drop_threshold:g})")
    if record is not None and not record["success"]:
        warn_list.append(f"optimizer reported: {record['message']}")
    if refined is not None:
        boxes = plan.fam.provenance(plan.ion, plan.state)
        origin = None if boxes is None else boxes.get("origin")
        if origin not in (None, "stored") and not plan.do_optimize:
            notes.append(f"exponent boxes: {origin} (no optimized set stored for {plan.ion.label} "
                         f"{plan.state.label}); --optimize may improve the energy")
    if bar is not None and not bar["reliable"]:
        warn_list.append(f"error bar may be unreliable (reliable: false): {bar['note']}")
    return warn_list, notes


def _provenance(plan: _Plan, solved: _Solved, bar) -> dict:
    provenance = {
        "package": "twoel", "version": __version__, "method": "Rayleigh-Ritz variational",
        "family": plan.fam.name, "size": plan.size, "options": _jsonable(plan.options),
        "state": plan.state.label, "Z": plan.ion.Z, "parameters": dict(solved.values),
        "precision": plan.precision, "drop_threshold": plan.drop_threshold,
        "optimized": plan.do_optimize, "basis": solved.basis.describe(),
        "constants": constants.CODATA_EDITION, "numpy": np.__version__,
    }
    refined = solved.refined
    if refined is not None:
        provenance["refinement"] = refined.to_dict()
        provenance["energy_full_text"] = refined.text
        provenance["numerical_error_hartree"] = refined.numerical_error_hartree
        boxes = plan.fam.provenance(plan.ion, plan.state)
        if boxes is not None:
            provenance["boxes"] = boxes
    elif bar is not None:
        provenance["energy_full_text"] = repr(solved.energy)
        provenance["numerical_error_hartree"] = bar.get("float64_error_hartree")
    if bar is not None:
        provenance["error_bar"] = bar
    return provenance


def _assemble(plan: _Plan, solved: _Solved, record, kept_start, bar, elapsed) -> EnergyResult:
    ion, state, eig, refined = plan.ion, plan.state, solved.eig, solved.refined
    warn_list, notes = _notes_and_warnings(plan, solved, record, kept_start, bar)
    energy_value = solved.energy
    bound = energy_value < ion.threshold_hartree
    if bound:
        status, message = "ok", "bound"
    else:
        status = "not bound"
        message = (f"variational energy {energy_value:.10f} Eh is not below the one-electron "
                   f"threshold {ion.threshold_hartree:.10f} Eh: the state is not bound in this basis")
    energy_text = error_value = None
    if refined is not None:
        error_value = None if bar is None else bar["error_bar_hartree"]
        energy_text = truncate_text(refined.text, refined.numerical_error_hartree
                                    if bar is None else error_value)
    elif bar is not None:
        error_value = bar["error_bar_hartree"]
        energy_text = truncate_text(repr(energy_value), error_value)
    kinetic, potential = solved.kinetic, solved.potential
    refined_kinetic = None if refined is None else getattr(refined, "kinetic_hartree", None)
    if refined_kinetic:  # diagnostics of the final (refined) vector, not of the float64 start
        kinetic, potential = refined_kinetic, refined.energy_hartree - refined_kinetic
    return EnergyResult(
        Z=ion.Z, ion=ion.label, state=state.label, family=plan.fam.name, size=plan.size,
        n_terms=solved.basis.size, energy_hartree=energy_value, bound=bool(bound),
        threshold_hartree=ion.threshold_hartree, parameters=dict(solved.values),
        roots_hartree=tuple(float(x) for x in eig.values[:6]),
        kinetic_hartree=kinetic, potential_hartree=potential,
        virial_ratio=-potential / kinetic if kinetic else float("nan"),
        condition_number=eig.condition_number, n_dropped=eig.n_dropped, precision=plan.precision,
        status=status, message=message,
        reference=lookup(ion.Z, state) if not ion.is_model else None, optimizer=record,
        warnings=tuple(warn_list), notes=tuple(notes),
        energy_hartree_text=energy_text, error_bar_hartree=error_value,
        reliable=None if bar is None else bool(bar["reliable"]),
        elapsed_seconds=elapsed, provenance=_provenance(plan, solved, bar),
        wavefunction=Wavefunction(
            solved.basis, eig.vectors[:, state.root].copy(),
            None if refined is None else np.asarray(refined.vector, dtype=float).copy(),
            None if refined is None else refined.energy_hartree),
    )


def _zero_power(basis) -> bool:
    """Uncontracted pure exponentials (any ``L``): the bases the refinements take."""
    return isinstance(basis, (CorrelatedBasis, AngularBasis)) and basis.contraction is None \
        and not np.any(basis.powers)


def _target_error(refined, digits: int) -> float:
    """Arithmetic error (Eh) small enough for ``digits`` significant digits of ``refined``."""
    return 0.1 * 10.0 ** (-digits) * abs(refined.energy_hartree)


def _refine(basis, ion: Ion, state: State, eig: EigenSolution, precision: str, digits, start=None,
            stage=None):
    """Mixed (default) or extended-precision energy of a zero-power basis.

    ``start`` is a mixed refinement of the same basis already at hand (it is not repeated).
    """
    stage = stage or (lambda _text: None)
    if start is None:
        stage(f"mixed-precision step, N = {basis.size}")
    angular = precise.angular_arguments(basis)
    mixed = start if start is not None else mixed_refine(basis.exponents, basis.sign, ion.Z, eig,
                                                        state.root, angular=angular)
    if precision != "extended":
        return mixed
    condition_digits = starting_condition_digits(basis.size, eig.condition_number, eig.n_dropped,
                                                 mixed.lost_digits)
    upper = eig.values[state.root + 1] if state.root + 1 < len(eig.values) else np.inf
    stage(f"extended precision, N = {basis.size} ({digits} digits wanted; exact assembly, then arb "
          "inverse iteration)")
    extended = extended_refine(basis.exponents, basis.sign, ion.Z, mixed.energy_hartree, mixed.vector,
                               digits, float(condition_digits),
                               gap=float(min(upper - mixed.energy_hartree, 1.0)), angular=angular)
    # ⟨T⟩ of the mixed step's vector (double-double): the same state to far below the virial's digits
    return replace(extended, kinetic_hartree=mixed.kinetic_hartree)


def _jsonable(options: dict) -> dict:
    out = {}
    for key, value in options.items():
        if isinstance(value, (list, tuple)):
            out[key] = [list(v) if isinstance(v, (list, tuple)) else v for v in value]
        else:
            out[key] = value
    return out
