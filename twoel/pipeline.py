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

from . import constants
from ._version import __version__
from .basis import get_family
from .basis.base import TrialFamily
from .eigen import DEFAULT_DROP_THRESHOLD, EigenSolution, solve_generalized
from .errors import AccuracyWarning, InputError, UnsupportedError
from .optimize import minimize_energy
from .reference import lookup
from .results import EnergyResult, Wavefunction
from .system import Ion, State

#: condition number of the scaled overlap above which a near-dependence warning is attached
ILL_CONDITIONED = 1e15


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
          progress: Callable[[int, float], None] | None = None) -> EnergyResult:
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
        ``"float64"``.
    drop_threshold : float
        Relative overlap eigenvalue below which basis directions are dropped.
    progress : callable, optional
        ``progress(n_evaluations, best_energy)`` during optimization.

    Returns
    -------
    EnergyResult
    """
    started = time.perf_counter()
    ion = Z if isinstance(Z, Ion) else Ion.parse(Z)
    state = State.parse(state)
    fam = get_family(family)
    if precision != "float64":
        raise InputError(f"unknown precision {precision!r}; available: float64")
    size = fam.resolve_size(size)
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
        def energy(v):
            _b, _m, eig = _evaluate(fam, ion, state, size, v, options, drop_threshold)
            return eig.values[state.root]

        values, _best, opt = minimize_energy(energy, params, progress=progress)
        record = {"method": opt.method, "n_evaluations": opt.n_evaluations, "success": opt.success,
                  "message": opt.message, "initial": opt.initial}
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
        if e2 is not None and e2.values[state.root] <= energy_value:
            basis, matrices, eig, values = b2, m2, e2, scaled
            energy_value = float(eig.values[state.root])
            kinetic, potential = _expectations(matrices, eig, state.root, ion.Z)
            record["virial_rescale"] = scale
    warn_list, notes = [], []
    if ion.note:
        notes.append(ion.note)
    if eig.condition_number > ILL_CONDITIONED:
        text = (f"overlap condition number {eig.condition_number:.1e} (diagonally scaled): the basis "
                "is nearly linearly dependent and the last float64 digits of the energy may be noise")
        warn_list.append(text)
        warnings.warn(text, AccuracyWarning, stacklevel=2)
    if eig.n_dropped:
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
    return EnergyResult(
        Z=ion.Z, ion=ion.label, state=state.label, family=fam.name, size=size, n_terms=basis.size,
        energy_hartree=energy_value, bound=bool(bound), threshold_hartree=ion.threshold_hartree,
        parameters=dict(values), roots_hartree=tuple(float(x) for x in eig.values[:6]),
        kinetic_hartree=kinetic, potential_hartree=potential,
        virial_ratio=-potential / kinetic if kinetic else float("nan"),
        condition_number=eig.condition_number, n_dropped=eig.n_dropped, precision=precision,
        status=status, message=message, reference=reference, optimizer=record,
        warnings=tuple(warn_list), notes=tuple(notes),
        elapsed_seconds=time.perf_counter() - started, provenance=provenance,
        wavefunction=Wavefunction(basis, eig.vectors[:, state.root].copy()),
    )


def _jsonable(options: dict) -> dict:
    out = {}
    for key, value in options.items():
        if isinstance(value, (list, tuple)):
            out[key] = [list(v) if isinstance(v, (list, tuple)) else v for v in value]
        else:
            out[key] = value
    return out
