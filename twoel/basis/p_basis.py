r"""Explicitly correlated basis for P states (total L = 1, odd parity, M = 0 component).

Basis functions are

.. math:: \Phi_n = \sum_p C_{pn}\,\big[ z_1\, g_p(r_1, r_2, r_{12}) \pm z_2\, g_p(r_2, r_1, r_{12}) \big],
          \qquad g_p = r_1^{i} r_2^{j} r_{12}^{k} e^{-\alpha_p r_1 - \beta_p r_2 - \gamma_p r_{12}},

``+`` for singlets (spatially symmetric) and ``-`` for triplets.  Every natural-parity L = 1
function of two electrons has the form ``r1 f(r1, r2, r12) + r2 f'(...)``, so with enough
exponents this family is complete for ``n¹P`` and ``n³P``.  The matrix elements reduce, after
the rotational average ``(ẑ·u)(ẑ·v) -> u·v/3``, to the integrals ``I(a, b, c)`` of
:mod:`twoel.integrals` (derivation in :mod:`twoel.integrals.symbolic_states`).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from twoel.basis.correlated import MAX_PRIMITIVES, PrimitiveArrays  # noqa: F401 (MAX_PRIMITIVES re-exported)

#: largest number of primitives accepted


@dataclass(frozen=True)
class PBasis(PrimitiveArrays):
    """Primitives ``z1 g_p`` (exchange-symmetrized with ``sign``) of a P-state basis.

    Attributes
    ----------
    exponents : ndarray, shape (P, 3)
        ``(α, β, γ)`` in bohr⁻¹; ``α`` belongs to the electron carrying ``z``.
    sign : int
        +1 (singlet) or -1 (triplet).
    powers : ndarray of int, shape (P, 3), optional
        ``(i, j, k)``; zeros (pure exponentials) by default.
    contraction : ndarray, shape (P, N), optional
    labels : tuple of str
    """

    exponents: np.ndarray
    sign: int = 1
    powers: np.ndarray | None = None
    contraction: np.ndarray | None = None
    labels: tuple[str, ...] = field(default=())

    angular_momentum = 1

    def __post_init__(self) -> None:
        self._store_checked(all_pair_sums=True, label="P basis")

    def matrices(self):
        """Overlap, kinetic, nuclear (unit charge) and repulsion matrices (Hartree units)."""
        from twoel.integrals.hamiltonian import hamiltonian_matrices

        return hamiltonian_matrices(self)

    def describe(self) -> dict:
        return {
            "kind": "correlated-P",
            "form": "z1 r1^i r2^j r12^k exp(-α r1 - β r2 - γ r12) ± (1 <-> 2)",
            "sign": self.sign,
            "powers": self.powers.tolist(),
            "exponents": self.exponents.tolist(),
            "contraction": None if self.contraction is None else self.contraction.tolist(),
        }
