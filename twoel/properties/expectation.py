r"""Expectation values and wavefunction diagnostics of a computed state (pure functions).

``expectation_values(result_or_wavefunction, Z)`` takes an :class:`twoel.EnergyResult` (or its
:class:`twoel.results.Wavefunction`) and returns :class:`ExpectationValues`: radial moments,
δ functions in direct and regularized form, the mass-polarization operator, ``⟨p1⁴⟩``, the
virial ratio and the Kato cusp ratios.  All values are per electron (the states are exchange
(anti)symmetric, so electron 1 and 2 give the same number), in atomic units (bohr, bohr⁻¹,
hartree).

δ functions and ``⟨p1⁴⟩``
    Direct ``⟨δ³(r1)⟩ = ∫|Ψ(0, r2)|² d³r2``, ``⟨δ³(r12)⟩`` and the regularized (global-operator)
    forms of R. J. Drachman, J. Phys. B 14, 2733 (1981), and ``⟨p1⁴⟩ = 2⟨(E - V)²⟩ - ⟨p1² p2²⟩``
    (regularized): all defined once, with their convention, in :mod:`twoel.properties.operators`
    (the corrections use the same definitions).  ``E = ⟨H⟩`` of the wave function and
    ``V = -Z/r1 - Z/r2 + λ/r12``; the regularized error is second order in the wave-function
    error.

Mass polarization
    ``grad1_dot_grad2`` is ``⟨Ψ|∇1·∇2|Ψ⟩ = -⟨p1·p2⟩`` (bohr⁻²).  The first-order
    mass-polarization energy is ``-(μ/M)⟨∇1·∇2⟩`` (Hartree units of the reduced mass).

Cusp ratios (Kato, Commun. Pure Appl. Math. 10, 151 (1957))
    ``cusp_nucleus = ⟨δ³(r1) ∂/∂r1⟩ / ⟨δ³(r1)⟩`` (exact: ``-Z``) and
    ``cusp_electron = ⟨δ³(r12) ∂/∂r12⟩ / ⟨δ³(r12)⟩`` (exact: ``1/2`` for singlets).  Triplet
    wave functions vanish at ``r12 = 0``, so their electron cusp ratio is undefined (``nan``).
    Both derivatives are spherically averaged (for P states the derivative of the ``z`` factor
    averages to zero at the coalescence point, so the same pair formulas apply).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import ClassVar

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.integrals.pairs import angular_momentum, operator_matrices
from twoel.integrals.hamiltonian import HAMILTONIAN
import twoel.properties.operators as op
from twoel.results import EnergyResult, Result, Wavefunction



@dataclass(frozen=True, repr=False)
class ExpectationValues(Result):
    """Expectation values of one normalized state, per electron, atomic units.

    Attributes
    ----------
    r1, r1_squared, inv_r1, inv_r1_squared : float
        ``⟨r1⟩`` (bohr), ``⟨r1²⟩`` (bohr²), ``⟨1/r1⟩`` (bohr⁻¹), ``⟨1/r1²⟩`` (bohr⁻²).
    r12, r12_squared, inv_r12 : float
        ``⟨r12⟩`` (bohr), ``⟨r12²⟩`` (bohr²), ``⟨1/r12⟩`` (bohr⁻¹).
    delta_r1, delta_r12 : float
        Direct ``⟨δ³(r1)⟩`` and ``⟨δ³(r12)⟩`` (bohr⁻³).
    delta_r1_regularized, delta_r12_regularized : float
        Drachman global-operator forms of the same (bohr⁻³); use these.
    grad1_dot_grad2 : float
        ``⟨∇1·∇2⟩`` (bohr⁻²), mass polarization (equals ``-⟨p1·p2⟩``).
    p1_fourth : float or None
        ``⟨∇1⁴⟩ = ⟨p1⁴⟩`` (bohr⁻⁴), regularized form; ``None`` if not available.
    virial_ratio : float
        ``-⟨V⟩/⟨T⟩`` (exact: 2).
    cusp_nucleus, cusp_electron : float
        Kato cusp ratios (exact: ``-Z`` and ``1/2``); ``nan`` when undefined.
    normalization : float
        ``⟨Ψ|Ψ⟩`` of the coefficients as given (1 for a result of :func:`twoel.solve`).
    energy_hartree, kinetic_hartree, potential_hartree : float
        ``⟨H⟩``, ``⟨T⟩``, ``⟨V⟩`` (Eh) of the same wave function.
    """

    Z: float
    state: str | None
    n_terms: int
    energy_hartree: float
    kinetic_hartree: float
    potential_hartree: float
    r1: float
    r1_squared: float
    inv_r1: float
    inv_r1_squared: float
    r12: float
    r12_squared: float
    inv_r12: float
    delta_r1: float
    delta_r12: float
    delta_r1_regularized: float
    delta_r12_regularized: float
    grad1_dot_grad2: float
    p1_fourth: float | None
    virial_ratio: float
    cusp_nucleus: float
    cusp_electron: float
    normalization: float
    notes: tuple = field(default=())

    SUMMARY: ClassVar[tuple] = ("energy_hartree", "delta_r1_regularized", "delta_r12_regularized")

    def to_dict(self) -> dict:
        """All fields (values in atomic units, see ``units``) and ``units``."""
        out = super().to_dict()
        out["units"] = dict(UNITS)
        return out


#: units of the fields (atomic units)
UNITS = {
    "energy_hartree": "Eh", "kinetic_hartree": "Eh", "potential_hartree": "Eh",
    "r1": "bohr", "r1_squared": "bohr^2", "inv_r1": "bohr^-1", "inv_r1_squared": "bohr^-2",
    "r12": "bohr", "r12_squared": "bohr^2", "inv_r12": "bohr^-1",
    "delta_r1": "bohr^-3", "delta_r12": "bohr^-3", "delta_r1_regularized": "bohr^-3",
    "delta_r12_regularized": "bohr^-3", "grad1_dot_grad2": "bohr^-2", "p1_fourth": "bohr^-4",
    "virial_ratio": "1", "cusp_nucleus": "bohr^-1", "cusp_electron": "bohr^-1",
    "normalization": "1",
}


def _half(*monomials):
    return [(0.5, m) for m in monomials]


#: radial moments (per electron) beside the Hamiltonian and the operators of
#: :mod:`twoel.properties.operators`
MOMENTS = {
    "r1": [("unit", _half((1, 0, 0), (0, 1, 0)))],
    "r1_squared": [("unit", _half((2, 0, 0), (0, 2, 0)))],
    "r12": [("unit", [(1.0, (0, 0, 1))])],
    "r12_squared": [("unit", [(1.0, (0, 0, 2))])],
}


def _operators(Z: float = 0.0, lam: float = 1.0) -> dict[str, list]:
    """The operator set of :func:`expectation_values` (the δ/p⁴ pieces do not depend on Z, λ)."""
    ops = dict(HAMILTONIAN)
    ops.update(MOMENTS)
    ops.update({name: [("unit", spec)] for name, spec in op.MULTIPLICATIVE.items()})
    ops.update(op.DERIVATIVE)
    return ops


def _unpack(obj) -> tuple[object, np.ndarray, str | None]:
    if isinstance(obj, EnergyResult):
        if obj.wavefunction is None:
            raise InputError("this result carries no wave function (computed without one)")
        return obj.wavefunction.basis, np.asarray(obj.wavefunction.coefficients, float), obj.state
    if isinstance(obj, Wavefunction):
        return obj.basis, np.asarray(obj.coefficients, float), None
    raise InputError(f"expected an EnergyResult or Wavefunction, got {type(obj).__name__}")


def _primitive_coefficients(basis, coefficients: np.ndarray) -> np.ndarray:
    """Primitive coefficients of a vector (or of the columns of a matrix) of the basis."""
    if coefficients.ndim not in (1, 2) or coefficients.shape[0] != basis.size:
        raise InputError(f"coefficients must be a vector of length {basis.size}")
    return coefficients if basis.contraction is None else basis.contraction @ coefficients


def _refinable(basis, repulsion: float) -> bool:
    return (isinstance(basis, CorrelatedBasis) and basis.contraction is None and repulsion == 1.0
            and not np.any(basis.powers) and basis.size <= 2000)


def _refine(basis, mats, c: np.ndarray, Z: float, kept=None) -> tuple[dict, float, float]:
    """Refined eigenvector and double-double moments.

    ``kept`` is ``(vector, energy)`` of the refinement the solve already made (mixed or
    extended precision, see :class:`twoel.results.Wavefunction`); otherwise the mixed
    double-double / 128-bit step is taken here.
    """
    from twoel.integrals.doubledouble import DD, dd_dot, dd_matvec
    from twoel.integrals.precise import dd_matrices
    from twoel.properties.precise import refined_moments

    if kept is not None:
        vector, energy = np.asarray(kept[0], dtype=float), float(kept[1])
    else:
        from twoel.solver.eigen import solve_generalized
        from twoel.solver.refine import mixed_refine

        S = mats["overlap"]
        H = mats["kinetic"] - Z * mats["nuclear"] + mats["repulsion"]
        eig = solve_generalized(H, S)
        root = int(np.argmax(np.abs(eig.vectors.T @ (S @ c))))
        refined = mixed_refine(basis.exponents, basis.sign, Z, eig, root)
        vector, energy = np.asarray(refined.vector, dtype=float), float(refined.energy_hartree)
    moments = refined_moments(basis, vector)
    dd = dd_matrices(basis.exponents, basis.sign)
    x = DD(vector)

    def quad(matrix):
        value = dd_dot(x, dd_matvec(matrix, x))
        return value

    norm = quad(dd["overlap"]).reciprocal()
    T = quad(dd["kinetic"]) * norm
    V = (quad(dd["repulsion"]) - quad(dd["nuclear"]) * DD(Z)) * norm
    virial = -(V * T.reciprocal())
    return moments, float(virial.hi + virial.lo), energy


def _checked_charge(obj, Z, repulsion) -> float:
    """The nuclear charge (from the result when ``Z`` is omitted), checked with ``repulsion``."""
    if Z is None:
        if not isinstance(obj, EnergyResult):
            raise InputError("'Z' is needed with a bare wave function")
        Z = obj.Z
    if isinstance(Z, bool) or not isinstance(Z, (int, float)) or not math.isfinite(Z) or Z <= 0:
        raise InputError(f"'Z' must be a positive nuclear charge, got {Z!r}")
    if isinstance(repulsion, bool) or not isinstance(repulsion, (int, float)) or not math.isfinite(repulsion):
        raise InputError(f"'repulsion' must be a finite number, got {repulsion!r}")
    return float(Z)


def _correlated_state(obj) -> tuple[object, np.ndarray, str | None]:
    """Basis, coefficients and state label of a correlated S or P state."""
    basis, c, state = _unpack(obj)
    if not hasattr(basis, "exponents") or not hasattr(basis, "powers"):
        raise UnsupportedError(f"expectation values need a correlated basis, not {type(basis).__name__}")
    angular_momentum(basis)  # rejects L beyond the generated term lists before any integral
    return basis, c, state


#: operators evaluated together by the pair evaluator (its temporaries grow with the number of
#: operators of one call; a few at a time keep a default run's memory low)
OPERATOR_GROUP = 2


def _matrices_in_groups(basis, ops: dict) -> dict:
    """:func:`operator_matrices` of ``ops``, :data:`OPERATOR_GROUP` operators per call."""
    names = list(ops)
    mats: dict = {}
    for start in range(0, len(names), OPERATOR_GROUP):
        mats.update(operator_matrices(basis, {k: ops[k] for k in names[start:start + OPERATOR_GROUP]}))
    return mats


#: operators whose matrices are only contracted with the vector (never needed whole): their
#: expectation values are summed over blocks of primitives (bounded memory)
HEAVY = ("inv_r1_squared", "inv_r1_r2", "inv_r1_r12", "inv_r12_squared", "p1_dot_p2",
         "p1sq_p2sq", "gradsq_over_r1", "gradsq_over_r12")
#: primitives in one block-pair evaluation (pairs per call ~ (2 x this)²/2)
BLOCK_PRIMITIVES = 120


def _sub_basis(basis, index: np.ndarray):
    """The primitives ``index`` of an uncontracted basis (any ``L``) as a basis of their own."""
    from twoel.basis.angular import AngularBasis

    if isinstance(basis, AngularBasis):
        return basis.subset(index)
    return CorrelatedBasis(basis.powers[index], basis.exponents[index], sign=basis.sign)


def _quadratic(a: np.ndarray, m: np.ndarray, b: np.ndarray) -> np.ndarray:
    """``a[:, k]^T m b[:, k]`` for every column ``k``."""
    return np.einsum("ik,ik->k", a, m @ b)


def _blocked_values(basis, d: np.ndarray, ops: dict, probe: bool = False) -> dict:
    """``d_k^T M d_k`` (primitive coefficients, one column ``d_k`` each) of each operator, from
    blocks of primitives.

    The primitives are split into groups of :data:`BLOCK_PRIMITIVES`; the basis made of two
    groups gives their diagonal and cross blocks, so memory stays that of a BLOCK_PRIMITIVES-function
    evaluation whatever the size.  ``probe``: evaluate one tiny block only (does the basis
    support the operators?).  Returns arrays over the columns of ``d`` (shape (P, K)).
    """
    P = basis.powers.shape[0]
    if probe:
        operator_matrices(_sub_basis(basis, np.arange(min(P, 2))), ops)
        return {}
    groups = [np.arange(s, min(s + BLOCK_PRIMITIVES, P)) for s in range(0, P, BLOCK_PRIMITIVES)]
    out = {name: np.zeros(d.shape[1]) for name in ops}
    if len(groups) == 1:
        mats = operator_matrices(_sub_basis(basis, groups[0]), ops)
        return {name: _quadratic(d, m, d) for name, m in mats.items()}
    for i in range(len(groups)):
        for j in range(i + 1, len(groups)):
            index = np.concatenate([groups[i], groups[j]])
            mats = operator_matrices(_sub_basis(basis, index), ops)
            n_i = groups[i].shape[0]
            di, dj = d[groups[i]], d[groups[j]]
            for name, m in mats.items():
                total = 2.0 * _quadratic(di, m[:n_i, n_i:], dj)
                if j == i + 1 and i == 0:
                    total += _quadratic(di, m[:n_i, :n_i], di)
                if i == 0 and j >= 1:
                    # the diagonal block of group j is taken from its first pairing (with group 0)
                    total += _quadratic(dj, m[n_i:, n_i:], dj)
                out[name] += total
    return out


def _operator_averages(basis, C: np.ndarray, Z: float, repulsion, notes: list):
    """Operator matrices, the normalized expectation values and norms of the columns of ``C``
    (one coefficient vector each), and whether ``⟨p1⁴⟩`` can be had.

    Returns
    -------
    mats, averages (one dict per column), norms (array), p4_ok
    """
    ops = _operators(Z, float(repulsion))
    extra = {name: ops.pop(name) for name in HEAVY}
    p4_ok = True
    try:
        mats = _matrices_in_groups(basis, ops)
        _blocked_values(basis, np.zeros((basis.powers.shape[0], 1)), {"p1sq_p2sq": extra["p1sq_p2sq"]}, probe=True)
    except InputError:
        extra.pop("p1sq_p2sq")
        mats = _matrices_in_groups(basis, ops)
        p4_ok = False
        notes.append("⟨p1⁴⟩ needs integrals this basis does not support (non-zero powers, or the "
                     "∇1²∇2² integrand, generated for L <= 1 only)")
    values = {name: _quadratic(C, m, C) for name, m in mats.items()}
    heavy = {name: spec for name, spec in extra.items() if name not in mats}
    values.update(_blocked_values(basis, _primitive_coefficients(basis, C), heavy))
    norms = values["overlap"]
    if not np.all(norms > 0):
        raise InputError("the wave function has zero norm")
    averages = [{name: float(value[k] / norms[k]) for name, value in values.items()}
                for k in range(C.shape[1])]
    return mats, averages, norms, p4_ok


def _coalescence(basis, C: np.ndarray, norms: np.ndarray, energies, averages: list, Z: float,
                 repulsion, notes: list) -> list:
    """δ functions, direct and regularized (bohr⁻³), and the Kato cusp ratios (``nan`` if
    undefined), one dict per column of ``C``.

    ``averages`` are the float64 expectation values (before any refinement) and ``energies``
    their energies.
    """
    d = _primitive_coefficients(basis, C)
    matrices = op.coalescence_matrices(basis)
    out = []
    for k, (E, v) in enumerate(zip(energies, averages)):
        co = {name: float(_quadratic(d[:, k:k + 1], m, d[:, k:k + 1])[0]) / norms[k]
              for name, m in matrices.items()}
        delta_r1, delta_r12 = co["delta_r1"], co["delta_r12"]
        cusp_nucleus = co["cusp_r1"] / delta_r1 if delta_r1 > 0 else float("nan")
        if basis.sign > 0 and delta_r12 > 0:
            cusp_electron = co["cusp_r12"] / delta_r12
        else:
            cusp_electron = float("nan")
            if k == 0:
                notes.append("electron-electron cusp undefined: the triplet wave function vanishes at "
                             "r12 = 0, so ⟨δ³(r12)⟩ = 0")
        out.append({"delta_r1": delta_r1, "delta_r12": delta_r12,
                    "delta_r1_regularized": op.delta_r1_regularized(E, v, Z, repulsion),
                    "delta_r12_regularized": op.delta_r12_regularized(E, v, Z, repulsion),
                    "cusp_nucleus": cusp_nucleus, "cusp_electron": cusp_electron})
    return out


def _refined_averages(obj, basis, mats, c: np.ndarray, Z: float, E: float, averages: dict,
                      notes: list) -> float:
    """Replace the radial moments in ``averages`` by their refined double-double values.

    Returns the refined virial ratio.
    """
    wavefunction = obj.wavefunction if isinstance(obj, EnergyResult) else obj
    kept = getattr(wavefunction, "refined_coefficients", None)
    kept = None if kept is None else (kept, wavefunction.refined_energy_hartree)
    moments, virial_ratio, E_refined = _refine(basis, mats, c, Z, kept)
    averages.update(moments)
    notes.append(f"⟨r1⟩, ⟨r1²⟩, ⟨1/r1⟩, ⟨r12⟩, ⟨r12²⟩, ⟨1/r12⟩ and the virial ratio use the refined "
                 f"eigenvector in double-double (refined energy {E_refined!r} Eh; float64 "
                 f"vector {E!r} Eh); the other values use the float64 vector")
    return virial_ratio


def expectation_values(result_or_wavefunction, Z: float | None = None, *,
                       repulsion: float = 1.0, refine: bool | None = None) -> ExpectationValues:
    """Expectation values and diagnostics of a state (see the module docstring).

    Parameters
    ----------
    result_or_wavefunction : EnergyResult or Wavefunction
        The state; its basis must be a correlated S basis or a P basis.
    Z : float, optional
        Nuclear charge; taken from the result when omitted.
    repulsion : float
        Scale ``λ`` of ``1/r12`` in the Hamiltonian ``T - Z/r1 - Z/r2 + λ/r12`` that the
        regularized forms, ``⟨p1⁴⟩`` and the virial ratio assume (1 for the atom; 0 gives the
        hydrogenic model, whose exact eigenfunctions check the formulas).
    refine : bool, optional
        For zero-power exponential S bases: replace the float64 eigenvector by the refined one
        (:func:`twoel.solver.refine.mixed_refine`) and evaluate the radial moments and the virial
        ratio in double-double (:mod:`twoel.properties.precise`).  Default: on for an
        :class:`EnergyResult` of such a basis (the float64 eigenvector of a large basis is
        ~1e-9 Eh off), off for a bare wave function.  The δ, gradient and ``⟨p1⁴⟩`` values stay
        float64 evaluations of the stored vector.

    Returns
    -------
    ExpectationValues
    """
    Z = _checked_charge(result_or_wavefunction, Z, repulsion)
    basis, c, state = _correlated_state(result_or_wavefunction)
    if c.ndim != 1 or c.shape[0] != basis.size:
        raise InputError(f"coefficients must be a vector of length {basis.size}")
    notes = []
    mats, (fields,) = _column_values(basis, c[:, None], Z, repulsion, notes)
    if refine is None:
        refine = isinstance(result_or_wavefunction, EnergyResult) and _refinable(basis, repulsion)
    if refine:
        if not _refinable(basis, repulsion):
            raise UnsupportedError("refinement needs a zero-power, uncontracted S basis and the "
                                   "physical Hamiltonian (repulsion = 1)")
        v = fields.pop("averages")
        fields["virial_ratio"] = _refined_averages(result_or_wavefunction, basis, mats, c, Z,
                                                   fields["energy_hartree"], v, notes)
        fields.update({name: v[key] for name, key in _MOMENT_FIELDS.items()})
    fields.pop("averages", None)
    return ExpectationValues(Z=Z, state=state, n_terms=int(basis.size), notes=tuple(notes), **fields)


#: fields of :class:`ExpectationValues` taken from the operator averages of the same name
_MOMENT_FIELDS = {name: name for name in ("r1", "r1_squared", "inv_r1", "inv_r1_squared", "r12",
                                          "r12_squared", "inv_r12")}


def _column_values(basis, C: np.ndarray, Z: float, repulsion, notes: list):
    """The float64 fields of :class:`ExpectationValues` (plus ``"averages"``) of each column of
    ``C``; returns the light operator matrices and one dict per column."""
    mats, averages, norms, p4_ok = _operator_averages(basis, C, Z, repulsion, notes)
    energies, out = [], []
    for v in averages:
        T, V = v["kinetic"], -Z * v["nuclear"] + repulsion * v["repulsion"]
        energies.append(T + V)
        out.append({"energy_hartree": T + V, "kinetic_hartree": T, "potential_hartree": V,
                    "grad1_dot_grad2": -v["p1_dot_p2"], "virial_ratio": -V / T,
                    "p1_fourth": op.p1_fourth(T + V, v, Z, repulsion) if p4_ok else None,
                    **{name: v[key] for name, key in _MOMENT_FIELDS.items()}})
    for k, co in enumerate(_coalescence(basis, C, norms, energies, averages, Z, repulsion, notes)):
        out[k].update(co, normalization=float(norms[k]), averages=averages[k])
    return mats, out


def expectation_values_of_vectors(basis, vectors, Z: float, *,
                                  repulsion: float = 1.0) -> list[ExpectationValues]:
    """:func:`expectation_values` (float64, no refinement) of several coefficient vectors of one
    basis, the operator matrices evaluated once.

    Parameters
    ----------
    basis : CorrelatedBasis or PBasis
        The basis of every vector.
    vectors : array_like, shape (N, K)
        One coefficient vector per column.
    Z : float
        Nuclear charge.
    repulsion : float
        As in :func:`expectation_values`.
    """
    C = np.asarray(vectors, dtype=float)
    if C.ndim != 2:
        raise InputError("'vectors' must be a matrix with one coefficient vector per column")
    Z = _checked_charge(Wavefunction(basis, C[:, 0]), Z, repulsion)
    basis, _c, _state = _correlated_state(Wavefunction(basis, C[:, 0]))
    notes: list = []
    _mats, columns = _column_values(basis, C, Z, repulsion, notes)
    for fields in columns:
        fields.pop("averages")
    return [ExpectationValues(Z=Z, state=None, n_terms=int(basis.size), notes=tuple(notes), **f)
            for f in columns]
