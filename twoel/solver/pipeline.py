"""Orchestration: ``solve(Z, state, family, size)`` -> :class:`EnergyResult` (no I/O here).

The steps are: validate the ion, state and family; pick starting nonlinear parameters; optimize
them (if the family asks for it and the user did not give fixed values); build the matrices;
solve the generalized eigenproblem; compute diagnostics (virial ratio, conditioning); attach the
published reference and the provenance.
"""

from __future__ import annotations

import time
import warnings
from dataclasses import replace
from typing import Callable

import numpy as np

from twoel import constants
from twoel._version import __version__
from twoel.basis import get_family
from twoel.basis.base import TrialFamily
from twoel.solver.eigen import DEFAULT_DROP_THRESHOLD, EigenSolution, solve_generalized
from twoel.errors import AccuracyWarning, InputError, ResourceError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.solver.optimize import minimize_energy
from twoel.solver.refine import (check_precision, extended_refine, mixed_refine, starting_condition_digits,
                        truncate_text)
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


def solve(Z, state: str | State = "1^1S", family: str | TrialFamily = "hylleraas",
          size: int | None = None, *, parameters: dict | None = None, optimize: bool | None = None,
          options: dict | None = None, precision: str = "float64",
          drop_threshold: float = DEFAULT_DROP_THRESHOLD,
          progress: Callable[[int, float], None] | None = None, digits: int | None = None,
          error_bar: bool | None = None,
          on_stage: Callable[[str], None] | None = None) -> EnergyResult:
    """Variational energy of one state of a two-electron ion.

    Parameters
    ----------
    Z : float or str
        Nuclear charge (``2``, ``"2"``, ``"He"``); any ``Z > 0``.
    state : str or State
        Term symbol, e.g. ``"1^1S"`` (default), ``"2^3S"``.
    family : str
        Trial-function family (see :func:`twoel.basis.family_names`).
    size : int, optional
        The family's size parameter (``ω`` for ``hylleraas``); ignored by families without one.
    parameters : dict, optional
        Nonlinear parameters (bohr⁻¹).  Given values are used as they are unless ``optimize=True``.
    optimize : bool, optional
        Optimize the nonlinear parameters (default: the family's choice, and only when no
        ``parameters`` are given).
    options : dict, optional
        Family-specific options (e.g. ``{"exponents": 2}`` for ``hylleraas``).
    precision : str
        ``"float64"`` (default) or ``"extended"`` (zero-power exponential bases only: exact
        fixed-point matrices and arb inverse iteration, :mod:`twoel.solver.refine`).  For the
        exponential family ``"float64"`` includes a cheap mixed-precision refinement
        (double-double matrices, one 128-bit inverse-iteration step).
    drop_threshold : float
        Relative overlap eigenvalue below which basis directions are dropped.
    progress : callable, optional
        ``progress(n_evaluations, best_energy)`` during optimization.
    digits : int, optional
        Significant digits aimed at by ``precision="extended"`` (default 20).
    error_bar : bool, optional
        Estimate the basis-truncation error from two smaller nested bases (``N/2``, ``N/√2``;
        :mod:`twoel.analysis.convergence`) and fill ``error_bar_hartree``.  Default: on for the
        exponential family, off otherwise.
    on_stage : callable, optional
        ``on_stage(text)`` is called as each long step begins (float64 solve, refinements, the
        smaller bases of the error bar), so a caller can show where a minutes-long run is.

    Returns
    -------
    EnergyResult
    """
    started = time.perf_counter()
    ion = Z if isinstance(Z, Ion) else Ion.parse(Z)
    state = State.parse(state)
    fam = get_family(family)
    digit_target = check_precision(precision, digits)
    size = fam.resolve_size(size)
    if precision == "extended" and size is not None and size > MAX_EXTENDED_SIZE:
        raise ResourceError(f"extended precision is limited to {MAX_EXTENDED_SIZE} terms "
                            f"(got {size}); use a smaller size or the default precision")
    options = fam.check_options(options)
    fam.check_state(state)
    params = fam.parameters(ion, state, size, options)
    names = [p.name for p in params]
    if parameters is not None:
        unknown = sorted(set(parameters) - set(names))
        if unknown:
            raise InputError(f"unknown parameter(s) {', '.join(unknown)} for family {fam.name!r} "
                             f"(parameters: {', '.join(names) or 'none'})")
        for name, value in parameters.items():
            if not np.isfinite(value) or value <= 0:
                raise InputError(f"parameter {name!r} must be a positive exponent (bohr⁻¹), got {value!r}")
        params = [replace(p, initial=float(parameters.get(p.name, p.initial))) for p in params]
    do_optimize = (fam.optimize_by_default and parameters is None) if optimize is None else bool(optimize)
    values = {p.name: p.initial for p in params}
    record = None
    if do_optimize and params:
        # families with many terms (exponential) tune their parameters on a smaller basis
        tune_size = fam.optimization_size(ion, state, size) if hasattr(fam, "optimization_size") else size

        def energy(v):
            _b, _m, eig = _evaluate(fam, ion, state, tune_size, v, options, drop_threshold)
            return eig.values[state.root]

        values, _best, opt = minimize_energy(energy, params, progress=progress)
        record = {"method": opt.method, "n_evaluations": opt.n_evaluations, "success": opt.success,
                  "message": opt.message, "initial": opt.initial, "size": tune_size}
    stage = on_stage or (lambda _text: None)
    stage(f"float64 build and solve ({fam.name}" + (f", size {size})" if size is not None else ")"))
    basis, matrices, eig = _evaluate(fam, ion, state, size, values, options, drop_threshold)
    energy_value = float(eig.values[state.root])
    kinetic, potential = _expectations(matrices, eig, state.root, ion.Z)
    if do_optimize and params and all(p.kind == "exponent" for p in params) and kinetic > 0:
        scale = -potential / (2.0 * kinetic)
        scaled = {k: v * scale for k, v in values.items()}
        try:
            b2, m2, e2 = _evaluate(fam, ion, state, size, scaled, options, drop_threshold)
        except Exception:  # a rescaled point that fails is simply not taken
            e2 = None
        # accept unless it raises the energy beyond rounding: the optimum obeys the virial theorem
        if e2 is not None and e2.values[state.root] <= energy_value + 1e-14 * abs(energy_value):
            basis, matrices, eig, values = b2, m2, e2, scaled
            energy_value = float(eig.values[state.root])
            kinetic, potential = _expectations(matrices, eig, state.root, ion.Z)
            record["virial_rescale"] = scale
    refined = None
    high = _zero_power(basis) and getattr(fam, "name", "") == "exponential"
    if precision == "extended" and not high:
        raise UnsupportedError("precision='extended' needs the exponential family (S states)")
    bar = None
    kept_start = None
    if high:
        refined = _refine(basis, ion, state, eig, precision, digit_target, stage=stage)
        energy_value = refined.energy_hartree
        if record is not None:
            # the optimizer minimized the float64 energy, blind below ~1e-10 Eh: if the starting
            # (stored) edges give the lower refined energy, the variational principle prefers them
            start_values = {p.name: p.initial for p in params}
            stage(f"comparing with the starting box edges, N = {size}")
            b0, m0, e0 = _evaluate(fam, ion, state, size, start_values, options, drop_threshold)
            r0 = _refine(b0, ion, state, e0, precision, digit_target)
            if r0.energy_hartree < refined.energy_hartree:
                kept_start = (refined.energy_hartree, r0.energy_hartree)
                basis, matrices, eig, values, refined = b0, m0, e0, start_values, r0
                energy_value = refined.energy_hartree
                kinetic, potential = _expectations(matrices, eig, state.root, ion.Z)
                record["kept_start"] = True
        if error_bar is None or error_bar:
            bar = _error_bar(fam, ion, state, size, values, options, drop_threshold, precision,
                             digit_target, refined, stage)
    warn_list, notes = [], []
    if ion.note:
        notes.append(ion.note)
    if kept_start is not None:
        warn_list.append(f"--optimize found box edges whose refined energy ({kept_start[0]!r} Eh) is "
                         f"above that of the starting edges ({kept_start[1]!r} Eh): the optimizer "
                         "minimizes the float64 energy, which cannot see below ~1e-10 Eh; the "
                         "starting edges are kept")
    if eig.condition_number > ILL_CONDITIONED and refined is None:
        text = (f"overlap condition number {eig.condition_number:.1e} (diagonally scaled): the basis "
                "is nearly linearly dependent and the last float64 digits of the energy may be noise")
        warn_list.append(text)
        warnings.warn(text, AccuracyWarning, stacklevel=2)
    if refined is not None:
        notes.append(f"energy refined beyond float64: {refined.method} ({refined.working_bits} bits); "
                     f"arithmetic error <= {refined.numerical_error_hartree:.1e} Eh; the virial ratio, "
                     "condition number and dropped directions describe the float64 starting solve")
    if eig.n_dropped and refined is None:
        notes.append(f"{eig.n_dropped} near-dependent basis directions dropped "
                     f"(canonical orthogonalization, threshold {eig.drop_threshold:g})")
    if record is not None and not record["success"]:
        warn_list.append(f"optimizer reported: {record['message']}")
    bound = energy_value < ion.threshold_hartree
    if bound:
        status, message = "ok", "bound"
    else:
        status = "not bound"
        message = (f"variational energy {energy_value:.10f} Eh is not below the one-electron "
                   f"threshold {ion.threshold_hartree:.10f} Eh: the state is not bound in this basis")
    reference = lookup(ion.Z, state) if not ion.is_model else None
    provenance = {
        "package": "twoel", "version": __version__, "method": "Rayleigh-Ritz variational",
        "family": fam.name, "size": size, "options": _jsonable(options), "state": state.label,
        "Z": ion.Z, "parameters": dict(values), "precision": precision,
        "drop_threshold": drop_threshold, "optimized": bool(do_optimize and params),
        "basis": basis.describe(), "constants": constants.CODATA_EDITION,
        "numpy": np.__version__,
    }
    energy_text = None
    if refined is not None:
        provenance["refinement"] = refined.to_dict()
        provenance["energy_full_text"] = refined.text
        provenance["numerical_error_hartree"] = refined.numerical_error_hartree
        if hasattr(fam, "provenance"):
            provenance["boxes"] = fam.provenance(ion, state)
            origin = provenance["boxes"].get("origin")
            if origin not in (None, "stored") and not do_optimize:
                notes.append(f"exponent boxes: {origin} (no optimized set stored for {ion.label} "
                             f"{state.label}); --optimize may improve the energy")
        if bar is not None:
            provenance["error_bar"] = bar
            error_value = bar["error_bar_hartree"]
            energy_text = truncate_text(refined.text, error_value)
        else:
            error_value = None
            energy_text = truncate_text(refined.text, refined.numerical_error_hartree)
        if bar is not None and not bar["reliable"]:
            warn_list.append(f"error bar may be unreliable: {bar['note']}")
    else:
        error_value = None
    return EnergyResult(
        Z=ion.Z, ion=ion.label, state=state.label, family=fam.name, size=size, n_terms=basis.size,
        energy_hartree=energy_value, bound=bool(bound), threshold_hartree=ion.threshold_hartree,
        parameters=dict(values), roots_hartree=tuple(float(x) for x in eig.values[:6]),
        kinetic_hartree=kinetic, potential_hartree=potential,
        virial_ratio=-potential / kinetic if kinetic else float("nan"),
        condition_number=eig.condition_number, n_dropped=eig.n_dropped, precision=precision,
        status=status, message=message, reference=reference, optimizer=record,
        warnings=tuple(warn_list), notes=tuple(notes),
        energy_hartree_text=energy_text, error_bar_hartree=error_value,
        elapsed_seconds=time.perf_counter() - started, provenance=provenance,
        wavefunction=Wavefunction(
            basis, eig.vectors[:, state.root].copy(),
            None if refined is None else np.asarray(refined.vector, dtype=float).copy(),
            None if refined is None else refined.energy_hartree),
    )


def _zero_power(basis) -> bool:
    return isinstance(basis, CorrelatedBasis) and basis.contraction is None and not np.any(basis.powers)


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
    mixed = start if start is not None else mixed_refine(basis.exponents, basis.sign, ion.Z, eig,
                                                        state.root)
    if precision != "extended":
        return mixed
    condition_digits = starting_condition_digits(basis.size, eig.condition_number, eig.n_dropped,
                                                 mixed.lost_digits)
    upper = eig.values[state.root + 1] if state.root + 1 < len(eig.values) else np.inf
    stage(f"extended precision, N = {basis.size} ({digits} digits wanted; exact assembly, then arb "
          "inverse iteration)")
    return extended_refine(basis.exponents, basis.sign, ion.Z, mixed.energy_hartree, mixed.vector,
                           digits, float(condition_digits),
                           gap=float(min(upper - mixed.energy_hartree, 1.0)))


def _error_bar(fam, ion, state, size, values, options, drop_threshold, precision, digits, refined,
               stage) -> dict:
    """Truncation error from the nested smaller bases ``N/2`` and ``N/√2`` (see twoel.analysis.convergence)."""
    from twoel.analysis.convergence import error_bar_sizes, estimate_tail

    texts, numerical = [], [refined.numerical_error_hartree]
    sizes = error_bar_sizes(size)
    for n in sizes:
        # the smaller bases only feed differences: the mixed refinement suffices unless its
        # arithmetic bound is coarser than the digit target, then they are refined like size
        stage(f"error bar: smaller basis N = {n}")
        b, _m, e = _evaluate(fam, ion, state, n, values, options, drop_threshold)
        aux = _refine(b, ion, state, e, "float64", None, stage=stage)
        if precision == "extended" and aux.numerical_error_hartree > _target_error(aux, digits):
            aux = _refine(b, ion, state, e, "extended", digits, start=aux, stage=stage)
        texts.append(aux.text)
        numerical.append(aux.numerical_error_hartree)
    texts.append(refined.text)
    energies = [float(t) for t in texts]
    estimate = estimate_tail(energies, max(numerical), texts)
    return {"error_bar_hartree": estimate.variational_bar_hartree, "tail_hartree": estimate.tail_hartree,
            "ratio": estimate.ratio, "sizes": sizes + [size], "energy_texts": texts,
            "extrapolated_hartree": estimate.extrapolated_hartree, "reliable": estimate.reliable,
            "note": estimate.note, "method": "geometric tail of nested bases N/2, N/√2, N (x2)"}


def _jsonable(options: dict) -> dict:
    out = {}
    for key, value in options.items():
        if isinstance(value, (list, tuple)):
            out[key] = [list(v) if isinstance(v, (list, tuple)) else v for v in value]
        else:
            out[key] = value
    return out
