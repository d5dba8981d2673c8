r"""Expectation values of the operators behind the finite-mass, α² and α³ corrections.

All values are for one normalized, exchange-(anti)symmetric S-state wavefunction
``ψ = Σ c_n φ_n`` in a :class:`twoel.basis.correlated.CorrelatedBasis` (Hartree atomic units), and are
*per electron* where an operator belongs to one electron (``⟨δ³(r1)⟩``, ``⟨1/r1²⟩``, ...).

Two forms are kept for the Dirac deltas:

``direct``
    ``⟨δ³(r1)⟩ = ∫|ψ(0, r2)|² d³r2`` and ``⟨δ³(r12)⟩ = ∫|ψ(r, r)|² d³r`` (closed forms per
    primitive pair); they converge slowly because the basis must reproduce the cusps.
``regularized``
    the global-operator forms (R. J. Drake, Nucl. Instrum. Methods B 31, 7 (1988); J. Hiller,
    J. Sucher, G. Feinberg, Phys. Rev. A 18, 2399 (1978)), derived from
    ``∇²(1/r) = -4π δ³(r)`` and the Schrödinger equation:

    .. math::

        ⟨δ(r_1)⟩ = \frac{1}{\pi}⟨\frac{E-V}{r_1}⟩ - \frac{1}{2\pi}
                   ⟨\frac{|∇_1ψ|^2 + |∇_2ψ|^2}{r_1}⟩,\qquad
        ⟨δ(r_{12})⟩ = \frac{1}{2\pi}⟨\frac{E-V}{r_{12}}⟩ - \frac{1}{4\pi}
                   ⟨\frac{|∇_1ψ|^2 + |∇_2ψ|^2}{r_{12}}⟩

    (exact for an eigenfunction; the error is second order in the wavefunction error).

``⟨p1⁴ + p2⁴⟩`` uses ``4⟨(E - V)²⟩ - 2⟨p1² p2²⟩`` (K. Pachucki, Phys. Rev. A 71, 012503
(2005)), free of the slowly converging ``|∇1²ψ|²``.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass
from math import pi

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis, build_matrices
from twoel.integrals.closed_forms import radial_integral
from twoel.integrals.pairs import UNIT, contract, operator_matrices

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


def _as_basis(wavefunction):
    basis = getattr(wavefunction, "basis", None)
    coefficients = getattr(wavefunction, "coefficients", None)
    if not isinstance(basis, CorrelatedBasis) or coefficients is None:
        raise UnsupportedError("these operator integrals need an S-state correlated basis "
                               "(twoel.basis.correlated.CorrelatedBasis) wavefunction")
    return basis, np.asarray(coefficients, dtype=float)


def _primitive_weights(basis: CorrelatedBasis, coefficients: np.ndarray) -> np.ndarray:
    return coefficients if basis.contraction is None else basis.contraction @ coefficients


def _delta_pairs(basis: CorrelatedBasis, which: str) -> np.ndarray:
    """Primitive matrix ``⟨χ_p|δ|(1 ± P12)χ_q⟩`` of ``½(δ(r1)+δ(r2))`` or ``δ(r12)`` (closed form)."""
    P = basis.n_primitives
    out = np.zeros((P, P))
    bp, be = basis.powers, basis.exponents
    for exchanged, weight in ((False, 1.0), (True, float(basis.sign))):
        kp = bp[:, [1, 0, 2]] if exchanged else bp
        ke = be[:, [1, 0, 2]] if exchanged else be
        tp = bp[:, None, :] + kp[None, :, :]
        te = be[:, None, :] + ke[None, :, :]
        if which == "r12":
            n = tp[..., 0] + tp[..., 1]
            rate = te[..., 0] + te[..., 1]
            mask = tp[..., 2] == 0
            vals = np.zeros((P, P))
            nn = n[mask]
            vals[mask] = radial_integral(nn, rate[mask])
            out += weight * vals
        else:
            # δ(r1): r1 = 0, r12 = r2;  δ(r2): r2 = 0, r12 = r1
            for zero, other in ((0, 1), (1, 0)):
                mask = tp[..., zero] == 0
                n = tp[..., other] + tp[..., 2]
                rate = te[..., other] + te[..., 2]
                vals = np.zeros((P, P))
                nn = n[mask]
                vals[mask] = radial_integral(nn, rate[mask])
                out += 0.5 * weight * vals
    return out


@dataclass(frozen=True)
class OperatorValues:
    """Expectation values (Eh, bohr; per electron for one-electron operators)."""

    energy: float
    Z: float
    kinetic: float
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
    p4_sum: float
    n_functions: int

    def to_dict(self) -> dict:
        return asdict(self)


def operator_values(wavefunction, Z: float, energy: float | None = None,
                    matrices_out: dict | None = None) -> OperatorValues:
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
    """
    basis, c = _as_basis(wavefunction)
    m = build_matrices(basis)
    norm = float(c @ m.overlap @ c)
    if not norm > 0:
        raise InputError("wavefunction has zero norm")

    def ev(matrix):
        return float(c @ matrix @ c) / norm

    kinetic = ev(m.kinetic)
    inv_r1 = 0.5 * ev(m.nuclear)
    inv_r12 = ev(m.repulsion)
    if energy is None:
        energy = kinetic - 2 * Z * inv_r1 + inv_r12
    specs = {name: spec for name, spec in MULTIPLICATIVE.items() if name not in ("inv_r1", "inv_r12")}
    specs.update(DERIVATIVE)
    mats = operator_matrices(basis, specs)
    values = {name: ev(matrix) for name, matrix in mats.items()}
    if matrices_out is not None:
        matrices_out["system"] = m
        matrices_out["p1_dot_p2"] = mats["p1_dot_p2"]
    d1 = ev(contract(_delta_pairs(basis, "r1"), basis.contraction))
    d12 = ev(contract(_delta_pairs(basis, "r12"), basis.contraction))
    E = energy
    # ⟨(E - V)/r1⟩ with V = -Z/r1 - Z/r2 + 1/r12 (per electron, symmetric forms)
    e_minus_v_r1 = E * inv_r1 + Z * values["inv_r1_squared"] + Z * values["inv_r1_r2"] - values["inv_r1_r12"]
    d1_reg = e_minus_v_r1 / pi - values["gradsq_over_r1"] / (2 * pi)
    e_minus_v_r12 = E * inv_r12 + 2 * Z * values["inv_r1_r12"] - values["inv_r12_squared"]
    d12_reg = e_minus_v_r12 / (2 * pi) - values["gradsq_over_r12"] / (4 * pi)
    potential = -2 * Z * inv_r1 + inv_r12
    v_squared = (Z * Z * (2 * values["inv_r1_squared"] + 2 * values["inv_r1_r2"])
                 + values["inv_r12_squared"] - 4 * Z * values["inv_r1_r12"])
    e_minus_v_sq = E * E - 2 * E * potential + v_squared
    p4 = 4 * e_minus_v_sq - 2 * values["p1sq_p2sq"]
    return OperatorValues(
        energy=float(E), Z=float(Z), kinetic=kinetic, inv_r1=inv_r1, inv_r12=inv_r12,
        inv_r1_squared=values["inv_r1_squared"], inv_r1_r2=values["inv_r1_r2"],
        inv_r1_r12=values["inv_r1_r12"], inv_r12_squared=values["inv_r12_squared"],
        p1_dot_p2=values["p1_dot_p2"], p1sq_p2sq=values["p1sq_p2sq"],
        delta_r1_direct=d1, delta_r12_direct=d12, delta_r1_regularized=d1_reg,
        delta_r12_regularized=d12_reg, p4_sum=p4, n_functions=basis.size)
