r"""Finite nuclear mass: reduced-mass scaling and mass polarization, first order and exact.

With the nucleus of mass ``M`` (electron masses) and the electron coordinates relative to it,
the Hamiltonian (Hartree units, m_e = 1) is

.. math:: H_M = -\frac{1}{2μ}(∇_1^2 + ∇_2^2) - \frac{1}{M}∇_1·∇_2 + V,\qquad μ = \frac{M}{M+1}.

Scaling ``r = r'/μ`` gives ``H_M = μ [H_∞(r') + (μ/M) p'_1·p'_2]``, so that to first order

.. math:: E_M ≈ μ E_∞ + \frac{μ^2}{M} ⟨\mathbf{p}_1·\mathbf{p}_2⟩_∞ .

:func:`finite_mass_energy` also solves ``H_M`` exactly in the basis with its exponents scaled by
``μ`` (the exact image of the infinite-mass basis), with the matrix of ``p1·p2`` (derived with
SymPy, :mod:`twoel.integrals.symbolic_states`) in the Hamiltonian.  Because every matrix is
homogeneous in the exponents, this equals ``μ`` times the lowest roots of
``H_∞ + (μ/M) P12`` in the unscaled basis, which is how it is computed.  The difference of
the two is the second-order mass-polarization energy (reported).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import ClassVar

import numpy as np

from twoel.solver.eigen import solve_generalized
from twoel.errors import UnsupportedError
from twoel.basis.correlated import CorrelatedBasis, build_matrices
from twoel.integrals.pairs import operator_matrices
from twoel.properties.operators import MASS_POLARIZATION
from twoel.results import Result


@dataclass(frozen=True, repr=False)
class FiniteMassEnergy(Result):
    """Finite-mass energies of one state (Eh).

    Attributes
    ----------
    nuclear_mass_me, reduced_mass_me : float
        ``M/m_e`` and ``μ/m_e``.
    energy_infinite_mass_hartree : float
        Eigenvalue of the infinite-mass Hamiltonian (Eh).
    p1_dot_p2 : float
        ``⟨p1·p2⟩`` of that state (bohr⁻²).
    reduced_mass_shift_hartree, mass_polarization_first_order_hartree : float
        ``(μ - 1) E_∞`` and ``(μ²/M)⟨p1·p2⟩`` (Eh).
    energy_first_order_hartree, energy_exact_hartree : float
        ``E_M`` to first order in ``1/M`` and from the exact finite-mass Hamiltonian (Eh).
    second_order_hartree : float
        ``E_exact - E_first_order`` (property, Eh).

    The names without ``_hartree`` / ``_me`` are the older ones (aliases, in ``to_dict()`` too).
    """

    ALIASES: ClassVar[dict] = {
        "reduced_mass": "reduced_mass_me", "energy_infinite_mass": "energy_infinite_mass_hartree",
        "reduced_mass_shift": "reduced_mass_shift_hartree",
        "mass_polarization_first_order": "mass_polarization_first_order_hartree",
        "energy_first_order": "energy_first_order_hartree", "energy_exact": "energy_exact_hartree",
        "second_order": "second_order_hartree"}
    SUMMARY: ClassVar[tuple] = ("nuclear_mass_me", "energy_exact_hartree", "second_order_hartree")
    DERIVED: ClassVar[tuple] = ("second_order_hartree",)

    nuclear_mass_me: float
    reduced_mass_me: float
    energy_infinite_mass_hartree: float
    p1_dot_p2: float
    reduced_mass_shift_hartree: float
    mass_polarization_first_order_hartree: float
    energy_first_order_hartree: float
    energy_exact_hartree: float
    n_functions: int

    @property
    def second_order_hartree(self) -> float:
        """``E_exact - E_first_order`` (Eh)."""
        return self.energy_exact_hartree - self.energy_first_order_hartree


def scaled_basis(basis: CorrelatedBasis, factor: float) -> CorrelatedBasis:
    """The basis with every exponent multiplied by ``factor``."""
    return replace(basis, exponents=basis.exponents * factor)


def mass_polarization_matrix(basis: CorrelatedBasis) -> np.ndarray:
    """Matrix of ``p1·p2 = -∇1·∇2`` in the (contracted) basis."""
    return operator_matrices(basis, {"p1_dot_p2": MASS_POLARIZATION})["p1_dot_p2"]


def finite_mass_energy(basis: CorrelatedBasis, Z: float, nuclear_mass_me: float, root: int = 0,
                       energy_infinite_mass: float | None = None,
                       p1_dot_p2: float | None = None, system=None,
                       p12_matrix: np.ndarray | None = None) -> FiniteMassEnergy:
    """First-order and exact finite-mass energies of root ``root`` in ``basis``.

    Parameters
    ----------
    basis : CorrelatedBasis
        A basis for the infinite-mass state (its exponents are scaled by μ for the exact solve).
    Z : float
    nuclear_mass_me : float
        ``M / m_e``.
    root : int
        Index of the eigenvalue (0 = lowest of this symmetry).
    energy_infinite_mass, p1_dot_p2 : float, optional
        Infinite-mass eigenvalue and ``⟨p1·p2⟩`` if already known.
    system, p12_matrix : optional
        The basis' SystemMatrices and ``p1·p2`` matrix if already computed.
    """
    if not isinstance(basis, CorrelatedBasis):
        raise UnsupportedError("the exact mass-polarization term is implemented for correlated S bases")
    M = float(nuclear_mass_me)
    if not M > 0:
        raise UnsupportedError("the nuclear mass must be positive")
    mu = M / (M + 1.0)
    m = system if system is not None else build_matrices(basis)
    P = p12_matrix if p12_matrix is not None else mass_polarization_matrix(basis)
    if energy_infinite_mass is None or p1_dot_p2 is None:
        eig = solve_generalized(m.hamiltonian(Z), m.overlap)
        c = eig.vectors[:, root]
        energy_infinite_mass = float(eig.values[root])
        p1_dot_p2 = float(c @ P @ c / (c @ m.overlap @ c))
    eig = solve_generalized(m.hamiltonian(Z) + (mu / M) * P, m.overlap)
    exact = mu * float(eig.values[root])
    first = mu * energy_infinite_mass + mu * mu / M * p1_dot_p2
    return FiniteMassEnergy(
        nuclear_mass_me=M, reduced_mass_me=mu, energy_infinite_mass_hartree=energy_infinite_mass,
        p1_dot_p2=p1_dot_p2, reduced_mass_shift_hartree=(mu - 1.0) * energy_infinite_mass,
        mass_polarization_first_order_hartree=mu * mu / M * p1_dot_p2, energy_first_order_hartree=first,
        energy_exact_hartree=exact, n_functions=basis.size)
