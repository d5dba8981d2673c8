r"""Overlap, kinetic and potential matrices of an explicitly correlated S-state basis.

A :class:`CorrelatedBasis` is a set of primitives

.. math:: \chi_p = r_1^{i_p} r_2^{j_p} r_{12}^{k_p} e^{-\alpha_p r_1 - \beta_p r_2 - \gamma_p r_{12}}

contracted into basis functions ``φ_n = Σ_p C[p, n] (1 ± P12) χ_p`` (``+`` singlet, ``-``
triplet spatial part).  For an exchange-symmetric operator ``O``,
``<(1±P)χ_p|O|(1±P)χ_q> = 2 (<χ_p|O|χ_q> ± <χ_p|O|P χ_q>)``; the common factor 2 is dropped
everywhere, which changes no eigenvalue or expectation value.

All matrices are in Hartree atomic units.  The potential parts are kept separate:
``nuclear`` is ``<1/r1 + 1/r2>`` for unit charge (multiply by ``-Z``) and ``repulsion`` is
``<1/r12>``.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from twoel.errors import InputError, ResourceError
from twoel.integrals import pairs, zero_power

#: largest number of primitives accepted by the generic builder
MAX_PRIMITIVES = 6000


def checked_primitives(powers, exponents, sign, contraction, *, all_pair_sums: bool = False,
                       label: str = "basis"):
    """Validated ``(powers, exponents, contraction)`` arrays of a correlated basis (any L).

    Parameters
    ----------
    powers : array_like of int, shape (P, 3) or None
        ``(i, j, k)`` powers of ``r1, r2, r12``; ``None`` means zeros (pure exponentials).
    exponents : array_like, shape (P, 3)
        ``(α, β, γ)`` in bohr⁻¹.
    sign : int
        Exchange sign, +1 or -1.
    contraction : array_like, shape (P, N), or None
    all_pair_sums : bool
        Require ``α+β``, ``β+γ`` and ``γ+α`` all positive (needed with angular factors);
        otherwise ``α+β > 0`` and a decaying ``r12`` factor.
    label : str
        Name of the basis in messages.

    Raises
    ------
    InputError, ResourceError
        With a one-line message naming the rule that failed.
    """
    exponents = np.asarray(exponents, dtype=float).reshape(-1, 3)
    powers = np.zeros(exponents.shape, dtype=np.int64) if powers is None else \
        np.asarray(powers, dtype=np.int64).reshape(-1, 3)
    if powers.shape != exponents.shape:
        raise InputError("basis powers and exponents must have the same shape (P, 3)")
    if powers.shape[0] == 0:
        raise InputError("a basis needs at least one function")
    if powers.shape[0] > MAX_PRIMITIVES:
        raise ResourceError(f"{label} of {powers.shape[0]} primitives exceeds the limit "
                            f"{MAX_PRIMITIVES} of the generic matrix builder")
    if np.any(powers < 0):
        raise InputError("basis powers must be >= 0")
    if not np.all(np.isfinite(exponents)):
        raise InputError("basis exponents must be finite")
    a, b, g = exponents.T
    if all_pair_sums:
        if np.any(a + b <= 0) or np.any(b + g <= 0) or np.any(a + g <= 0):
            raise InputError(f"{label} exponents must give a normalizable function "
                             "(α+β, β+γ and α+γ all > 0)")
    elif np.any(a + b <= 0) or np.any(g < 0) and np.any(g + exponents[:, :2].min(axis=1) <= 0):
        raise InputError("basis exponents must give a normalizable function "
                         "(α + β > 0 and the r12 factor decaying)")
    if sign not in (1, -1):
        raise InputError(f"exchange sign must be +1 or -1, got {sign!r}")
    if contraction is not None:
        contraction = np.asarray(contraction, dtype=float)
        if contraction.ndim != 2 or contraction.shape[0] != powers.shape[0]:
            raise InputError("contraction must have shape (n_primitives, n_functions)")
    return powers, exponents, contraction


class PrimitiveArrays:
    """What every correlated basis (S, P, ...) shares: validated arrays and its sizes."""

    def _store_checked(self, **options) -> None:
        """Validate the fields with :func:`checked_primitives` and store the arrays."""
        powers, exponents, contraction = checked_primitives(self.powers, self.exponents, self.sign,
                                                            self.contraction, **options)
        object.__setattr__(self, "powers", powers)
        object.__setattr__(self, "exponents", exponents)
        object.__setattr__(self, "contraction", contraction)

    @property
    def n_primitives(self) -> int:
        return self.exponents.shape[0]

    @property
    def size(self) -> int:
        """Number of basis functions (after contraction)."""
        return self.n_primitives if self.contraction is None else self.contraction.shape[1]


@dataclass(frozen=True)
class CorrelatedBasis(PrimitiveArrays):
    """Primitives, contraction and exchange symmetry of an S-state correlated basis.

    Attributes
    ----------
    powers : ndarray of int, shape (P, 3)
        ``(i, j, k)`` powers of ``r1``, ``r2``, ``r12``.
    exponents : ndarray of float, shape (P, 3)
        ``(α, β, γ)`` in bohr⁻¹.
    sign : int
        +1 (spatially symmetric, singlet) or -1 (antisymmetric, triplet).
    contraction : ndarray, shape (P, N), optional
        Linear combinations forming the basis functions; ``None`` means one function per primitive.
    labels : tuple of str
        A short description of each basis function.
    """

    powers: np.ndarray
    exponents: np.ndarray
    sign: int = 1
    contraction: np.ndarray | None = None
    labels: tuple[str, ...] = field(default=())

    def __post_init__(self) -> None:
        self._store_checked()

    def matrices(self) -> "SystemMatrices":
        """Overlap, kinetic, nuclear and repulsion matrices (see :func:`build_matrices`)."""
        return build_matrices(self)

    def describe(self) -> dict:
        """A JSON-ready description of the basis (for provenance)."""
        return {
            "kind": "correlated-S",
            "sign": self.sign,
            "powers": self.powers.tolist(),
            "exponents": self.exponents.tolist(),
            "contraction": None if self.contraction is None else self.contraction.tolist(),
        }


@dataclass(frozen=True)
class SystemMatrices:
    """Matrices of one basis (Hartree atomic units).

    ``hamiltonian(Z) = kinetic - Z * nuclear + repulsion``.
    """

    overlap: np.ndarray
    kinetic: np.ndarray
    nuclear: np.ndarray
    repulsion: np.ndarray

    def hamiltonian(self, Z: float, repulsion_scale: float = 1.0) -> np.ndarray:
        """Hamiltonian matrix for nuclear charge ``Z``; ``repulsion_scale=0`` switches 1/r12 off."""
        return self.kinetic - Z * self.nuclear + repulsion_scale * self.repulsion

    @property
    def size(self) -> int:
        return self.overlap.shape[0]


def primitive_operator_matrices(basis: CorrelatedBasis, operators: dict[str, list]) -> dict[str, np.ndarray]:
    """Primitive-pair matrices ``<χ_p|O|(1 ± P12) χ_q>`` of multiplicative and kinetic operators.

    Parameters
    ----------
    basis : CorrelatedBasis
    operators : dict
        Name to a list of ``(coefficient, (da, db, dc))`` monomials ``coefficient·r1^da r2^db r12^dc``;
        the special value ``"kinetic"`` selects the kinetic-energy operator (any operator form
        of :mod:`twoel.integrals.pairs` is accepted too).

    Returns
    -------
    dict of ndarray, each of shape (P, P)

    Notes
    -----
    Bases whose powers are all zero (exponentially correlated, :mod:`twoel.basis.exponential`)
    take the closed-form fast path :mod:`twoel.integrals.zero_power` when every operator has a
    generated form there; everything else uses the one pair evaluator
    :func:`twoel.integrals.pairs.primitive_matrices`.
    """
    if not np.any(basis.powers) and zero_power.supports(operators):
        return zero_power.primitive_matrices(basis.exponents, basis.sign, operators)
    return pairs.primitive_matrices(basis, operators)


def operator_matrices(basis: CorrelatedBasis, operators: dict[str, list]) -> dict[str, np.ndarray]:
    """Contracted, symmetrized matrices of the given operators (see :func:`primitive_operator_matrices`)."""
    raw = primitive_operator_matrices(basis, operators)
    return {name: pairs.contract(m, basis.contraction) for name, m in raw.items()}


#: monomial forms of the Hamiltonian pieces (exchange symmetry lets r2-terms fold into r1-terms
#: only for expectation values, not matrices, so both electrons are written out)
HAMILTONIAN_OPERATORS = {
    "overlap": [(1.0, (0, 0, 0))],
    "kinetic": "kinetic",
    "nuclear": [(1.0, (-1, 0, 0)), (1.0, (0, -1, 0))],
    "repulsion": [(1.0, (0, 0, -1))],
}


def build_matrices(basis: CorrelatedBasis) -> SystemMatrices:
    """Overlap, kinetic, nuclear-attraction (unit charge) and repulsion matrices of ``basis``."""
    m = operator_matrices(basis, HAMILTONIAN_OPERATORS)
    return SystemMatrices(m["overlap"], m["kinetic"], m["nuclear"], m["repulsion"])

