r"""The one definition of ``δ³(r1)``, ``δ³(r12)`` and ``p⁴`` (direct and regularized), and the
operator values behind the finite-mass, α² and α³ corrections.

Convention (every caller, :mod:`twoel.properties.expectation` and :mod:`twoel.corrections`)
    Hartree atomic units; values *per electron* for one-electron operators:
    ``⟨δ³(r1)⟩ = ½⟨δ³(r1) + δ³(r2)⟩`` (bohr⁻³), ``⟨p1⁴⟩ = ½⟨p1⁴ + p2⁴⟩`` (bohr⁻⁴); the pair
    operator ``⟨δ³(r12)⟩`` (bohr⁻³) as it is.  Matrices are the primitive-pair matrices
    ``⟨χ_p|O|(1 ± P12)χ_q⟩`` of :mod:`twoel.integrals.pairs` (the factor 2 of the exchange is
    the same in the overlap, so it cancels in ``c^T O c / c^T S c``).  The Hamiltonian is
    ``H = T + V``, ``V = -Z/r1 - Z/r2 + λ/r12`` (``λ = 1`` for the atom; ``λ = 0`` is the
    hydrogenic model whose exact eigenfunctions check the formulas).

Direct forms
    ``⟨δ³(r1)⟩ = ∫|Ψ(0, r2)|² d³r2 / ⟨Ψ|Ψ⟩`` and ``⟨δ³(r12)⟩ = ∫|Ψ(r, r)|² d³r / ⟨Ψ|Ψ⟩``,
    closed forms per primitive pair (:func:`coalescence_matrices`; one radial integral of
    :func:`twoel.integrals.closed_forms.radial_integral`).  They converge slowly: the basis
    must reproduce the cusps.

Regularized (global-operator) forms, R. J. Drachman, J. Phys. B 14, 2733 (1981)
    From ``∇²(1/r) = -4π δ³(r)``, two integrations by parts and ``(∇1² + ∇2²)Ψ = 2(V - E)Ψ``:

    .. math::

        \langle\delta^3(r_1)\rangle = \frac{1}{\pi}\langle (E - V) f\rangle
            - \frac{1}{2\pi}\langle f\,(|\nabla_1\Psi|^2 + |\nabla_2\Psi|^2)\rangle,
            \quad f = \tfrac12(1/r_1 + 1/r_2),

        \langle\delta^3(r_{12})\rangle = \frac{1}{2\pi}\langle (E - V)/r_{12}\rangle
            - \frac{1}{4\pi}\langle r_{12}^{-1}(|\nabla_1\Psi|^2 + |\nabla_2\Psi|^2)\rangle,

    with ``E`` the energy of the state; exact for an eigenfunction, error second order in the
    wave-function error (:func:`delta_r1_regularized`, :func:`delta_r12_regularized`).

``⟨p1⁴⟩``
    From ``(p1² + p2²)Ψ = 2(E - V)Ψ`` (exact identity): ``⟨p1⁴⟩ = 2⟨(E - V)²⟩ - ⟨p1² p2²⟩``
    with ``⟨p1² p2²⟩ = ∫(∇1²Ψ)(∇2²Ψ)``, free of the δ-like ``|∇1²Ψ|²`` (:func:`p1_fourth`).

The values these formulas need are the expectation values of :data:`MULTIPLICATIVE` and
:data:`DERIVATIVE` (by the pair evaluator), named as in :class:`OperatorValues`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from math import pi
from typing import ClassVar

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis, build_matrices
from twoel.integrals.closed_forms import radial_integral
from twoel.integrals.pairs import UNIT, angular_momentum, contract, operator_matrices
from twoel.results import Result

#: symmetric multiplicative operators as monomials (½ (O(1) + O(2)) for one-electron ones)
MULTIPLICATIVE = {
    "inv_r1": [(0.5, (-1, 0, 0)), (0.5, (0, -1, 0))],
    "inv_r12": [(1.0, (0, 0, -1))],
    "inv_r1_squared": [(0.5, (-2, 0, 0)), (0.5, (0, -2, 0))],
    "inv_r1_r2": [(1.0, (-1, -1, 0))],
    "inv_r1_r12": [(0.5, (-1, 0, -1)), (0.5, (0, -1, -1))],
    "inv_r12_squared": [(1.0, (0, 0, -2))],
}

#: derivative operators as pieces of :mod:`twoel.integrals.pairs` (integrands derived by SymPy
#: in :mod:`twoel.integrals.symbolic_states`): ∇1χ·∇2χ' (p1·p2 up to the sign convention of the
#: caller), ∇1²χ ∇2²χ', and the gradient sum ∇1χ·∇1χ' + ∇2χ·∇2χ' over r1 (symmetrized) and r12
MASS_POLARIZATION = [("grad12", UNIT)]
DERIVATIVE = {
    "p1_dot_p2": MASS_POLARIZATION,
    "p1sq_p2sq": [("lap1lap2", UNIT)],
    "gradsq_over_r1": [(g, MULTIPLICATIVE["inv_r1"]) for g in ("grad11", "grad22")],
    "gradsq_over_r12": [(g, MULTIPLICATIVE["inv_r12"]) for g in ("grad11", "grad22")],
}

#: the values the regularized δ and ⟨p1⁴⟩ need besides ``E``, ``⟨1/r1⟩`` and ``⟨1/r12⟩``
REGULARIZATION = ("inv_r1_squared", "inv_r1_r2", "inv_r1_r12", "inv_r12_squared",
                  "gradsq_over_r1", "gradsq_over_r12")


def delta_r1_regularized(E: float, v, Z: float, repulsion: float = 1.0) -> float:
    """Drachman's ``⟨δ³(r1)⟩`` per electron (bohr⁻³) from the values ``v`` (see the module)."""
    e_minus_v_r1 = E * v["inv_r1"] + Z * v["inv_r1_squared"] + Z * v["inv_r1_r2"] - repulsion * v["inv_r1_r12"]
    return e_minus_v_r1 / pi - v["gradsq_over_r1"] / (2 * pi)


def delta_r12_regularized(E: float, v, Z: float, repulsion: float = 1.0) -> float:
    """Drachman's ``⟨δ³(r12)⟩`` (bohr⁻³) from the values ``v`` (see the module)."""
    e_minus_v_r12 = E * v["inv_r12"] + 2 * Z * v["inv_r1_r12"] - repulsion * v["inv_r12_squared"]
    return e_minus_v_r12 / (2 * pi) - v["gradsq_over_r12"] / (4 * pi)


def p1_fourth(E: float, v, Z: float, repulsion: float = 1.0) -> float:
    """``⟨p1⁴⟩ = 2⟨(E - V)²⟩ - ⟨p1² p2²⟩`` per electron (bohr⁻⁴) from the values ``v``."""
    potential = -2 * Z * v["inv_r1"] + repulsion * v["inv_r12"]
    v_squared = (Z * Z * (2 * v["inv_r1_squared"] + 2 * v["inv_r1_r2"])
                 + repulsion * repulsion * v["inv_r12_squared"] - 4 * Z * repulsion * v["inv_r1_r12"])
    e_minus_v_sq = E * E - 2 * E * potential + v_squared
    return 2 * e_minus_v_sq - v["p1sq_p2sq"]


def hydrogenic_delta_1s(Z: float, reduced_mass: float = 1.0) -> float:
    """``⟨δ³(r)⟩ = Z³/π (μ/m)³`` of the hydrogen-like 1s state (bohr⁻³; exact closed form)."""
    return Z**3 / math.pi * reduced_mass**3


#: (vanishing coordinate, the two others) of δ(r1), δ(r2), δ(r12)
_POINTS = {"r1": (0, (1, 2)), "r2": (1, (0, 2)), "r12": (2, (0, 1))}


def _radial(n: np.ndarray, lam: np.ndarray) -> np.ndarray:
    """:func:`radial_integral` of integer powers ``n``, one call per distinct power."""
    out = np.empty(lam.shape)
    for k in np.unique(n):
        where = n == k
        out[where] = radial_integral(int(k), lam[where])
    return out


def coalescence_matrices(basis, cusps: bool = True) -> dict[str, np.ndarray]:
    """Primitive matrices of the direct δ and of the cusp numerators, basis of any ``L``.

    Returns ``"delta_r1"`` (``½(δ³(r1) + δ³(r2))``), ``"delta_r12"``, ``"cusp_r1"``
    (``½`` the sum of ``δ³(r_i) ∂/∂r_i``) and ``"cusp_r12"`` (``δ³(r12) ∂/∂r12``), each
    ``⟨χ_p|O|(1 ± P12)χ_q⟩`` of shape (P, P) (the derivative acts on the ket's scalar part and is
    spherically averaged).  At ``r_i = 0`` the remaining integral is one radial closed form in
    the other two coordinates, which coincide there.  ``cusps=False`` leaves out the cusp
    numerators.

    Angular factors of ``L >= 1`` (:class:`twoel.basis.angular.AngularBasis`): a primitive
    ``(ε·r1)^l (ε·r2)^(L-l)`` vanishes at ``r_i = 0`` unless its power on electron ``i`` is
    zero; where bra and ket both survive, and at ``r1 = r2 = r``, the product of the angular
    factors is ``(ε*·r)^L (ε·r)^L``, whose orientation average is ``L!/(2L+1)!! r^{2L}``
    (``1/3`` for P, the ``z1 z1`` average; ``2/15`` for D).  The derivatives of the angular
    factors average to zero at the point.
    """
    L = angular_momentum(basis)
    P, E = basis.powers, basis.exponents
    n_p = P.shape[0]
    l1 = np.zeros(n_p, dtype=np.int64) if L == 0 else np.asarray(basis.electron1_l, dtype=np.int64)
    angular = math.factorial(L) / _double_factorial(2 * L + 1)
    extra = 2 * L
    names = ("delta_r1", "delta_r12") + (("cusp_r1", "cusp_r12") if cusps else ())
    out = {name: np.zeros((n_p, n_p)) for name in names}
    bp, be = P[:, None, :], E[:, None, :]
    bra_powers = (l1[:, None], (L - l1)[:, None])  # angular power on electron 1, 2 (bra)
    for exchanged, weight in ((False, 1.0), (True, float(basis.sign))):
        kp, ke = (P[:, [1, 0, 2]], E[:, [1, 0, 2]]) if exchanged else (P, E)
        ket_l1 = (L - l1) if exchanged else l1
        ket_powers = (ket_l1[None, :], (L - ket_l1)[None, :])
        tp, te = bp + kp[None], be + ke[None]
        for name, (index, rest) in _POINTS.items():
            survives = np.ones((n_p, n_p), dtype=bool) if name == "r12" else \
                (bra_powers[index] == 0) & (ket_powers[index] == 0)
            if not np.any(survives):
                continue
            share = 1.0 if name == "r12" else 0.5
            target = "r12" if name == "r12" else "r1"
            n = tp[..., rest[0]] + tp[..., rest[1]] + extra
            lam = te[..., rest[0]] + te[..., rest[1]]
            mask = (tp[..., index] == 0) & survives
            vals = np.zeros((n_p, n_p))
            vals[mask] = angular * _radial(n[mask], lam[mask])
            out[f"delta_{target}"] += share * weight * vals
            if not cusps:
                continue
            ket_i = np.broadcast_to(kp[None, :, index], mask.shape)
            slope = np.where(ket_i == 0, -np.broadcast_to(ke[None, :, index], mask.shape),
                             np.where(ket_i == 1, 1.0, 0.0))
            ok = (np.broadcast_to(bp[..., index], mask.shape) == 0) & (ket_i <= 1) & survives
            vals = np.zeros((n_p, n_p))
            vals[ok] = slope[ok] * (angular * _radial(n[ok], lam[ok]))
            out[f"cusp_{target}"] += share * weight * vals
    return out


def _double_factorial(n: int) -> int:
    return math.prod(range(n, 0, -2))


@dataclass(frozen=True, repr=False)
class OperatorValues(Result):
    """Expectation values of one normalized S state (per electron for one-electron operators).

    Attributes
    ----------
    energy_hartree : float
        The energy ``E`` used in the regularized forms (Eh).
    kinetic_hartree : float
        ``⟨T⟩`` (Eh).
    inv_r1, inv_r12, inv_r1_squared, inv_r1_r2, inv_r1_r12, inv_r12_squared : float
        ``⟨1/r1⟩``, ``⟨1/r12⟩`` (bohr⁻¹), ``⟨1/r1²⟩``, ``⟨1/(r1 r2)⟩``, ``⟨1/(r1 r12)⟩``,
        ``⟨1/r12²⟩`` (bohr⁻²).
    p1_dot_p2 : float
        ``⟨p1·p2⟩ = -⟨∇1·∇2⟩`` (bohr⁻²).
    p1sq_p2sq : float
        ``⟨p1² p2²⟩`` (bohr⁻⁴).
    delta_r1_direct, delta_r12_direct, delta_r1_regularized, delta_r12_regularized : float
        ``⟨δ³(r1)⟩`` (per electron) and ``⟨δ³(r12)⟩`` (bohr⁻³), direct and Drachman forms.
    p1_fourth : float
        ``⟨p1⁴⟩`` per electron (bohr⁻⁴).
    p4_sum : float
        ``⟨p1⁴ + p2⁴⟩ = 2⟨p1⁴⟩`` (bohr⁻⁴), the Breit–Pauli mass-velocity operator (property).

    Operator values keep the operator's name; ``units`` in ``to_dict()`` gives each unit.  Old
    names ``energy`` and ``kinetic`` stay as attributes and ``to_dict()`` keys.
    """

    #: older names (they stay in ``to_dict()``)
    ALIASES: ClassVar[dict] = {"energy": "energy_hartree", "kinetic": "kinetic_hartree"}
    SUMMARY: ClassVar[tuple] = ("energy_hartree", "delta_r1_regularized", "delta_r12_regularized")
    UNITS: ClassVar[dict] = {
        "energy_hartree": "Eh", "kinetic_hartree": "Eh", "Z": "e", "inv_r1": "bohr^-1",
        "inv_r12": "bohr^-1", "inv_r1_squared": "bohr^-2", "inv_r1_r2": "bohr^-2",
        "inv_r1_r12": "bohr^-2", "inv_r12_squared": "bohr^-2", "p1_dot_p2": "bohr^-2",
        "p1sq_p2sq": "bohr^-4", "delta_r1_direct": "bohr^-3", "delta_r12_direct": "bohr^-3",
        "delta_r1_regularized": "bohr^-3", "delta_r12_regularized": "bohr^-3",
        "p1_fourth": "bohr^-4", "p4_sum": "bohr^-4", "n_functions": "1"}

    energy_hartree: float
    Z: float
    kinetic_hartree: float
    inv_r1: float
    inv_r12: float
    inv_r1_squared: float
    inv_r1_r2: float
    inv_r1_r12: float
    inv_r12_squared: float
    p1_dot_p2: float
    p1sq_p2sq: float
    delta_r1_direct: float
    delta_r12_direct: float
    delta_r1_regularized: float
    delta_r12_regularized: float
    p1_fourth: float
    n_functions: int

    @property
    def p4_sum(self) -> float:
        """``⟨p1⁴ + p2⁴⟩ = 2⟨p1⁴⟩`` (bohr⁻⁴)."""
        return 2 * self.p1_fourth

    DERIVED: ClassVar[tuple] = ("p4_sum",)

    def to_dict(self) -> dict:
        return {**super().to_dict(), "units": dict(self.UNITS)}


def _as_basis(wavefunction):
    basis = getattr(wavefunction, "basis", None)
    coefficients = getattr(wavefunction, "coefficients", None)
    if not isinstance(basis, CorrelatedBasis) or coefficients is None:
        raise UnsupportedError("these operator integrals need an S-state correlated basis "
                               "(twoel.basis.correlated.CorrelatedBasis) wavefunction")
    return basis, np.asarray(coefficients, dtype=float)


def operator_values(wavefunction, Z: float, energy: float | None = None,
                    matrices_out: dict | None = None, *, repulsion: float = 1.0) -> OperatorValues:
    """All expectation values used by the corrections, for one wavefunction.

    Parameters
    ----------
    wavefunction : object with ``basis`` (CorrelatedBasis) and ``coefficients``
        E.g. ``EnergyResult.wavefunction``.
    Z : float
        Nuclear charge of the Hamiltonian that produced ``wavefunction``.
    energy : float, optional
        Its eigenvalue (Eh); by default ``⟨H⟩`` is recomputed.
    matrices_out : dict, optional
        If given, receives the basis matrices (``"system"``: SystemMatrices, ``"p1_dot_p2"``)
        for reuse (e.g. by :func:`twoel.corrections.finite_mass.finite_mass_energy`).
    repulsion : float
        ``λ`` of the Hamiltonian ``T + V`` the regularized forms assume (1 for the atom; 0 for
        the hydrogenic model, see the module docstring).
    """
    basis, c = _as_basis(wavefunction)
    m = build_matrices(basis)
    norm = float(c @ m.overlap @ c)
    if not norm > 0:
        raise InputError("wavefunction has zero norm")

    def ev(matrix):
        return float(c @ matrix @ c) / norm

    kinetic = ev(m.kinetic)
    values = {"inv_r1": 0.5 * ev(m.nuclear), "inv_r12": ev(m.repulsion)}
    if energy is None:
        energy = kinetic - 2 * Z * values["inv_r1"] + repulsion * values["inv_r12"]
    specs = {name: spec for name, spec in MULTIPLICATIVE.items() if name not in ("inv_r1", "inv_r12")}
    specs.update(DERIVATIVE)
    mats = operator_matrices(basis, specs)
    values.update({name: ev(matrix) for name, matrix in mats.items()})
    if matrices_out is not None:
        matrices_out["system"] = m
        matrices_out["p1_dot_p2"] = mats["p1_dot_p2"]
    coalescence = coalescence_matrices(basis, cusps=False)
    E = float(energy)
    return OperatorValues(
        energy_hartree=E, Z=float(Z), kinetic_hartree=kinetic,
        **{name: values[name] for name in ("inv_r1", "inv_r12", "inv_r1_squared", "inv_r1_r2",
                                           "inv_r1_r12", "inv_r12_squared", "p1_dot_p2", "p1sq_p2sq")},
        delta_r1_direct=ev(contract(coalescence["delta_r1"], basis.contraction)),
        delta_r12_direct=ev(contract(coalescence["delta_r12"], basis.contraction)),
        delta_r1_regularized=delta_r1_regularized(E, values, Z, repulsion),
        delta_r12_regularized=delta_r12_regularized(E, values, Z, repulsion),
        p1_fourth=p1_fourth(E, values, Z, repulsion), n_functions=basis.size)
