r"""Explicitly correlated basis for any total angular momentum ``L`` with natural parity ``(-1)^L``.

Basis functions are the stretched ``M = L`` components

.. math:: \Phi_n = \sum_p C_{pn}\,(1 \pm P_{12})\,(\varepsilon\cdot r_1)^{l_p}
          (\varepsilon\cdot r_2)^{L - l_p}\, g_p(r_1, r_2, r_{12}),
          \qquad \varepsilon = (\hat x + i\hat y)/\sqrt 2,

with ``g_p = r1^i r2^j r12^k exp(-α_p r1 - β_p r2 - γ_p r12)``, ``+`` for singlets and ``-`` for
triplets.  Since ``ε·ε = 0``, ``(ε·r)^l`` is ``r^l Y_ll(r̂)`` up to a constant, so each
primitive is the ``M = L`` member of the stretched coupling ``[Y_l ⊗ Y_{L-l}]^L`` (unique).
Functions with every ``l = 0 .. L`` are complete for natural parity; the exchange image of
``(l, L - l; α, β)`` is ``(L - l, l; β, α)``, so with free ``α, β`` the channels
``l = L, L - 1, ..., ⌈L/2⌉`` suffice (the exponential family uses them so; ``l = L`` puts all
the angular momentum on the electron of ``α``).  Matrix elements are orientation averages
reduced to the integrals ``I(a, b, c)`` of :mod:`twoel.integrals` (derivation in
:mod:`twoel.integrals.symbolic_states`, one term list per channel pair).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from twoel.basis.correlated import PrimitiveArrays
from twoel.errors import InputError

#: largest L with generated term lists (:data:`twoel.integrals.symbolic_states.MAX_L`)
MAX_L = 3


@dataclass(frozen=True)
class AngularBasis(PrimitiveArrays):
    """Primitives ``(ε·r1)^l (ε·r2)^(L-l) g_p`` (exchange-symmetrized with ``sign``).

    Attributes
    ----------
    exponents : ndarray, shape (P, 3)
        ``(α, β, γ)`` in bohr⁻¹.
    sign : int
        +1 (singlet) or -1 (triplet).
    powers : ndarray of int, shape (P, 3), optional
        ``(i, j, k)``; zeros (pure exponentials) by default.
    contraction : ndarray, shape (P, N), optional
    labels : tuple of str
    angular_momentum : int
        Total ``L`` (0 .. :data:`MAX_L`).
    electron1_l : ndarray of int, shape (P,), optional
        ``l`` of electron 1 (the electron of ``α``) per primitive; ``L`` for all by default.
    """

    exponents: np.ndarray
    sign: int = 1
    powers: np.ndarray | None = None
    contraction: np.ndarray | None = None
    labels: tuple[str, ...] = field(default=())
    angular_momentum: int = 2
    electron1_l: np.ndarray | None = None

    def __post_init__(self) -> None:
        L = self.angular_momentum
        if isinstance(L, bool) or not isinstance(L, (int, np.integer)) or not 0 <= L <= MAX_L:
            raise InputError(f"correlated bases are generated for L = 0..{MAX_L}, got L = {L!r}")
        self._store_checked(all_pair_sums=True, label=f"L = {L} basis")
        object.__setattr__(self, "angular_momentum", int(L))
        l1 = np.full(self.n_primitives, L, dtype=np.int64) if self.electron1_l is None else \
            np.asarray(self.electron1_l, dtype=np.int64).reshape(-1)
        if l1.shape != (self.n_primitives,) or np.any(l1 < 0) or np.any(l1 > L):
            raise InputError(f"electron1_l needs one value 0..{L} per primitive")
        object.__setattr__(self, "electron1_l", l1)

    def matrices(self):
        """Overlap, kinetic, nuclear (unit charge) and repulsion matrices (Hartree units)."""
        from twoel.integrals.hamiltonian import hamiltonian_matrices

        return hamiltonian_matrices(self)

    def subset(self, index) -> "AngularBasis":
        """The primitives ``index`` (uncontracted) as a basis of the same kind."""
        return type(self)(self.exponents[index], sign=self.sign, powers=self.powers[index],
                          angular_momentum=self.angular_momentum,
                          electron1_l=self.electron1_l[index])

    def describe(self) -> dict:
        return {
            "kind": f"correlated-L{self.angular_momentum}",
            "form": "(ε·r1)^l (ε·r2)^(L-l) r1^i r2^j r12^k exp(-α r1 - β r2 - γ r12) ± (1 <-> 2)",
            "L": self.angular_momentum,
            "sign": self.sign,
            "electron1_l": self.electron1_l.tolist(),
            "powers": self.powers.tolist(),
            "exponents": self.exponents.tolist(),
            "contraction": None if self.contraction is None else self.contraction.tolist(),
        }
