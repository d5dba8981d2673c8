r"""Explicitly correlated basis for P states (total L = 1, odd parity): the ``L = 1`` case of
:class:`twoel.basis.angular.AngularBasis`.

Basis functions are

.. math:: \Phi_n = \sum_p C_{pn}\,\big[ z_1\, g_p(r_1, r_2, r_{12}) \pm z_2\, g_p(r_2, r_1, r_{12}) \big],
          \qquad g_p = r_1^{i} r_2^{j} r_{12}^{k} e^{-\alpha_p r_1 - \beta_p r_2 - \gamma_p r_{12}},

``+`` for singlets (spatially symmetric) and ``-`` for triplets (written for ``M = 0``; the
matrices are those of any ``M`` component, e.g. the ``ε·r1`` of the general basis).  Every
natural-parity L = 1 function of two electrons has the form ``r1 f(r1, r2, r12) + r2 f'(...)``,
so with enough exponents this family is complete for ``n¹P`` and ``n³P``.  The matrix elements
reduce, after the rotational average ``(ẑ·u)(ẑ·v) -> u·v/3``, to the integrals ``I(a, b, c)``
of :mod:`twoel.integrals` (derivation in :mod:`twoel.integrals.symbolic_states`).
"""

from __future__ import annotations

from dataclasses import dataclass

from twoel.basis.angular import AngularBasis
from twoel.basis.correlated import MAX_PRIMITIVES, PrimitiveArrays  # noqa: F401 (re-exported)
from twoel.errors import InputError


@dataclass(frozen=True)
class PBasis(AngularBasis):
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

    angular_momentum: int = 1

    def __post_init__(self) -> None:
        if self.angular_momentum != 1 or (self.electron1_l is not None and
                                          any(int(x) != 1 for x in self.electron1_l)):
            raise InputError("a P basis has L = 1 with the angular factor on electron 1")
        super().__post_init__()

    def describe(self) -> dict:
        return {
            "kind": "correlated-P",
            "form": "z1 r1^i r2^j r12^k exp(-α r1 - β r2 - γ r12) ± (1 <-> 2)",
            "sign": self.sign,
            "powers": self.powers.tolist(),
            "exponents": self.exponents.tolist(),
            "contraction": None if self.contraction is None else self.contraction.tolist(),
        }
