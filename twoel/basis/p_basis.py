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

from twoel.errors import InputError, ResourceError

#: largest number of primitives accepted
MAX_PRIMITIVES = 6000


@dataclass(frozen=True)
class PBasis:
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
        exponents = np.asarray(self.exponents, dtype=float).reshape(-1, 3)
        if exponents.shape[0] == 0:
            raise InputError("a basis needs at least one function")
        if exponents.shape[0] > MAX_PRIMITIVES:
            raise ResourceError(f"P basis of {exponents.shape[0]} primitives exceeds the limit {MAX_PRIMITIVES}")
        if not np.all(np.isfinite(exponents)):
            raise InputError("basis exponents must be finite")
        powers = np.zeros(exponents.shape, dtype=np.int64) if self.powers is None else \
            np.asarray(self.powers, dtype=np.int64).reshape(-1, 3)
        if powers.shape != exponents.shape:
            raise InputError("basis powers and exponents must have the same shape (P, 3)")
        if np.any(powers < 0):
            raise InputError("basis powers must be >= 0")
        a, b, g = exponents.T
        if np.any(a + b <= 0) or np.any(b + g <= 0) or np.any(a + g <= 0):
            raise InputError("P-basis exponents must give a normalizable function "
                             "(α+β, β+γ and α+γ all > 0)")
        if self.sign not in (1, -1):
            raise InputError(f"exchange sign must be +1 or -1, got {self.sign!r}")
        object.__setattr__(self, "exponents", exponents)
        object.__setattr__(self, "powers", powers)
        if self.contraction is not None:
            contraction = np.asarray(self.contraction, dtype=float)
            if contraction.ndim != 2 or contraction.shape[0] != exponents.shape[0]:
                raise InputError("contraction must have shape (n_primitives, n_functions)")
            object.__setattr__(self, "contraction", contraction)

    @property
    def n_primitives(self) -> int:
        return self.exponents.shape[0]

    @property
    def size(self) -> int:
        return self.n_primitives if self.contraction is None else self.contraction.shape[1]

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
