r"""The ³P fine structure of L = 1 states, on the same basis and integrals as the energies.

The state is solved in a :class:`twoel.basis.p_basis.PBasis` with the exact pair integrals of
:mod:`twoel.integrals.pairs` (``PBasis.matrices()`` and
:func:`twoel.solver.eigen.solve_generalized`), i.e. the same variational route as the L = 1
energies of :func:`twoel.solve`.  Its functions (Cartesian components ``a = x, y, z`` of one
L = 1 multiplet; the basis stores the ``z`` one)

.. math:: Φ^p_a = r_{1a}\, g_p(r_1, r_2, r_{12}) + σ\, r_{2a}\, g_p(r_2, r_1, r_{12}),\qquad
          g_p = r_1^i r_2^j r_{12}^k e^{-α r_1 - β r_2 - γ r_{12}},

``σ = +1`` singlet, ``-1`` triplet.  Traces over the multiplet (``Σ_a``) make every integrand a
rotational scalar, so the fine-structure traces are integrals over ``r1, r2, r12`` only.

The three fine-structure operators (spin–orbit ``l_i/r_i³``, spin–other-orbit
``(r_ij × p_i)/r_ij³`` and the spin–spin tensor ``(n_a n_b - δ_ab/3)/r12³``) have no piece in
the pair evaluator: written as monomials of ``r1, r2, r12`` they contain individually divergent
``r⁻³`` terms (like the orbit–orbit integrand, :mod:`twoel.corrections.quadrature`).  Their traces
are therefore evaluated by quadrature of the solved wave function on the perimetric grid of
:func:`twoel.corrections.quadrature.perimetric_grid` (``xy`` pair, smooth at r12 → 0; the
nuclear spin–orbit trace on the ``yz`` pair, smooth at r1 → 0); with 32 nodes they converge to
~1e-6 relative (tests check it).

Fine structure (H. A. Bethe and E. E. Salpeter, Quantum Mechanics of One- and Two-Electron
Atoms (1957) §39; anomalous moment ``a_e`` as in G. W. F. Drake, Springer Handbook of Atomic,
Molecular and Optical Physics (2006), ch. 11), Hartree units:

.. math::

    H_{so} = \frac{α^2}{2}\Big[Z(1+2a_e)\sum_i \frac{\mathbf{l}_i·\mathbf{s}_i}{r_i^3}
             - \sum_{i≠j}\frac{(\mathbf{r}_{ij}×\mathbf{p}_i)·((1+2a_e)\mathbf{s}_i
             + 2(1+a_e)\mathbf{s}_j)}{r_{ij}^3}\Big],\quad
    H_{ss} = α^2(1+a_e)^2 \frac{\mathbf{s}_1·\mathbf{s}_2 - 3(\mathbf{s}_1·\hat r_{12})
             (\mathbf{s}_2·\hat r_{12})}{r_{12}^3}.

In a ³L multiplet ``s_i → S/2``; within the L = 1 multiplet the orbital vectors are
``A L`` and the tensor ``(n_a n_b - δ_ab/3)/r12³`` is ``c T_ab(L)``, so
``E_J = A_{so} ⟨L·S⟩_J + B_{ss} [⟨L·S⟩² + ½⟨L·S⟩ - ⅔·2]_J`` with ``⟨L·S⟩ = -2, -1, 1`` for
``J = 0, 1, 2``.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from twoel import constants
from twoel.basis.hylleraas import omega_terms
from twoel.basis.p_basis import PBasis
from twoel.corrections.quadrature import decay_rates, perimetric_grid, primitive_factors
from twoel.errors import InputError
from twoel.results import Result
from twoel.solver.eigen import solve_generalized

_CHUNK = 2048
_LEVI = np.zeros((3, 3, 3))
for _a, _b, _c in ((0, 1, 2), (1, 2, 0), (2, 0, 1)):
    _LEVI[_a, _b, _c] = 1.0
    _LEVI[_a, _c, _b] = -1.0
#: (L_c)_{ab} = -i ε_{cab} in the Cartesian basis of an L = 1 multiplet
_L = -1j * np.transpose(_LEVI, (0, 1, 2))


def frame(r1, r2, r12):
    """Vectors r1 = r1 ẑ, r2 in the xz plane (bohr), shape (n, 3)."""
    cos = np.clip((r1**2 + r2**2 - r12**2) / (2 * r1 * r2), -1.0, 1.0)
    sin = np.sqrt(np.maximum(0.0, 1.0 - cos**2))
    v1 = np.stack([np.zeros_like(r1), np.zeros_like(r1), r1], axis=1)
    v2 = np.stack([r2 * sin, np.zeros_like(r2), r2 * cos], axis=1)
    return v1, v2


def fields(basis: PBasis, r1, r2, r12, v1, v2):
    """Φ_a (n, P, 3) and ∂_{k e} Φ_a (n, P, 2, 3[e], 3[a]) of every primitive at the points."""
    p = np.asarray(basis.powers, dtype=float)
    e = np.asarray(basis.exponents, dtype=float)
    n12 = (v1 - v2) / r12[:, None]
    u1 = v1 / r1[:, None]
    u2 = v2 / r2[:, None]

    def prim(pp, ee):
        g, A, B, C = primitive_factors(pp, ee, r1, r2, r12)
        grad1 = g[..., None] * (A[..., None] * u1[:, None, :] + C[..., None] * n12[:, None, :])
        grad2 = g[..., None] * (B[..., None] * u2[:, None, :] - C[..., None] * n12[:, None, :])
        return g, grad1, grad2

    g, g1, g2 = prim(p, e)
    h, h1, h2 = prim(p[:, [1, 0, 2]], e[:, [1, 0, 2]])
    s = float(basis.sign)
    phi = v1[:, None, :] * g[..., None] + s * v2[:, None, :] * h[..., None]
    eye = np.eye(3)
    d = np.empty(phi.shape[:2] + (2, 3, 3))
    # ∂_{1e} Φ_a = δ_ae g + r1_a ∂_{1e} g + σ r2_a ∂_{1e} h
    d[:, :, 0] = (eye[None, None] * g[..., None, None] + g1[..., :, None] * v1[:, None, None, :]
                  + s * h1[..., :, None] * v2[:, None, None, :])
    d[:, :, 1] = (g2[..., :, None] * v1[:, None, None, :] + s * eye[None, None] * h[..., None, None]
                  + s * h2[..., :, None] * v2[:, None, None, :])
    return phi, d


@dataclass(frozen=True, repr=False)
class FineStructure(Result):
    """³P fine structure of one state.

    Attributes
    ----------
    energy_hartree : float
        Nonrelativistic energy of the state (Eh).
    A_nuclear_au, A_electron_au, tensor_au : float
        Reduced traces of ``Σ_i l_i/r_i³``, ``Σ_{i≠j} (r_ij × p_i)/r_ij³`` and of the tensor
        ``(n_a n_b - δ_ab/3)/r12³`` in the L = 1 multiplet (bohr⁻³).
    spin_orbit_hartree, spin_spin_hartree : float
        ``A_so`` and ``B_ss`` of ``E_J`` (Eh, α² included).
    levels_hartree : tuple of float
        Shifts of J = 0, 1, 2 (Eh).
    interval_01_hartree, interval_12_hartree : float
        ``E(J=0) - E(J=1)`` and ``E(J=1) - E(J=2)`` (Eh).
    """

    ALIASES: ClassVar[dict] = {
        "energy": "energy_hartree", "A_nuclear": "A_nuclear_au", "A_electron": "A_electron_au",
        "tensor": "tensor_au", "a_so": "spin_orbit_hartree", "b_ss": "spin_spin_hartree",
        "levels": "levels_hartree", "interval_01": "interval_01_hartree",
        "interval_12": "interval_12_hartree"}
    SUMMARY: ClassVar[tuple] = ("energy_hartree", "interval_01_hartree", "interval_12_hartree")

    energy_hartree: float
    A_nuclear_au: float
    A_electron_au: float
    tensor_au: float
    spin_orbit_hartree: float
    spin_spin_hartree: float
    levels_hartree: tuple
    interval_01_hartree: float
    interval_12_hartree: float


def fine_structure(basis: PBasis, coefficients, Z: float, energy: float, nodes: int = 40,
                   anomalous: bool = True) -> FineStructure:
    """α² fine structure of a ³P state from its wave function.

    Parameters
    ----------
    basis : PBasis
        Triplet (sign -1) P basis of the state.
    coefficients : array_like
        Its coefficients in ``basis`` (any normalization).
    Z : float
        Nuclear charge.
    energy : float
        Nonrelativistic energy (Eh), reported with the result.
    nodes : int
        Gauss–Laguerre nodes of the trace quadrature.
    anomalous : bool
        Include the electron anomalous magnetic moment (CODATA g factor).
    """
    if basis.sign != -1:
        raise InputError("fine structure needs a triplet (sign -1) P wavefunction")
    c = np.asarray(coefficients, dtype=float)
    weights = c if basis.contraction is None else basis.contraction @ c
    Lm = _L  # (c, a, b)
    T_L = np.zeros((3, 3, 3, 3), dtype=complex)  # T_ab(L) as 3x3 matrices
    for a in range(3):
        for b in range(3):
            T_L[a, b] = 0.5 * (Lm[a] @ Lm[b] + Lm[b] @ Lm[a]) - (2.0 / 3.0) * np.eye(3) * (a == b)
    sums = {"norm": 0.0, "n": 0.0, "e": 0.0, "q": 0.0, "norm_yz": 0.0}
    for pair in ("xy", "yz"):
        r1, r2, r12, W, _u = perimetric_grid(nodes, *decay_rates(basis), pair=pair)
        for start in range(0, r1.shape[0], _CHUNK):
            sl = slice(start, start + _CHUNK)
            v1, v2 = frame(r1[sl], r2[sl], r12[sl])
            phi, d = fields(basis, r1[sl], r2[sl], r12[sl], v1, v2)
            psi = np.einsum("npa,p->na", phi, weights)  # (n, 3)
            dpsi = np.einsum("npkea,p->nkea", d, weights)  # (n, 2, e, a)
            w = W[sl]

            # κ_c Ψ_a = ε_cde X_d ∂_e Ψ_a / |X|³ (l = -i r×∇ without the -i)
            def kappa(X, k):
                inv3 = 1.0 / np.linalg.norm(X, axis=1) ** 3
                return np.einsum("cde,nd,nea->nca", _LEVI, X, dpsi[:, k]) * inv3[:, None, None]

            # Tr(L_c K_c) = Σ (-i ε_cab)(-i)⟨Ψ_b|κ_c Ψ_a⟩ = -Σ ε_cab ⟨Ψ_b|κ_c Ψ_a⟩
            if pair == "yz":
                # nuclear term of electron 1 (smooth grid at r1 → 0), doubled by exchange symmetry
                sums["norm_yz"] += float(np.sum(w * np.einsum("na,na->n", psi, psi)))
                sums["n"] += 2 * float(np.sum(w * -np.einsum("cab,nb,nca->n", _LEVI, psi, kappa(v1, 0))))
                continue
            sums["norm"] += float(np.sum(w * np.einsum("na,na->n", psi, psi)))
            v12 = v1 - v2
            ke = kappa(v12, 0) + kappa(-v12, 1)
            sums["e"] += float(np.sum(w * -np.einsum("cab,nb,nca->n", _LEVI, psi, ke)))
            n12 = v12 / r12[sl][:, None]
            Q = (np.einsum("na,nb->nab", n12, n12) - np.eye(3)[None] / 3.0) / r12[sl][:, None, None] ** 3
            # Σ_ab Tr(T_ab(L) Q_ab) = Σ_ab Σ_de T_ab(L)_{ed} ⟨Ψ_d|Q_ab|Ψ_e⟩
            sums["q"] += float(np.sum(w * np.real(np.einsum("abed,nd,nab,ne->n", T_L, psi, Q, psi))))
    norm = sums["norm"]
    tr_n = sums["n"] * sums["norm"] / sums["norm_yz"]
    tr_e = sums["e"]
    tr_q = sums["q"]
    N = norm / 3.0  # ⟨Ψ_a|Ψ_b⟩ = δ_ab N
    trLL = float(np.real(np.einsum("cab,cba->", Lm, Lm)))  # = 6
    trTT = float(np.real(np.einsum("abde,abed->", T_L, T_L)))
    A_n = tr_n / N / trLL
    A_e = tr_e / N / trLL
    cq = tr_q / N / trTT
    alpha = constants.FINE_STRUCTURE.value
    # electron anomalous moment a_e = |g|/2 - 1 (CODATA g factor)
    a_e = abs(constants.ELECTRON_G_FACTOR.value) / 2 - 1.0 if anomalous else 0.0
    a_so = alpha**2 / 4 * (Z * (1 + 2 * a_e) * A_n - (3 + 4 * a_e) * A_e)
    b_ss = -1.5 * alpha**2 * (1 + a_e) ** 2 * cq
    levels = []
    for X in (-2.0, -1.0, 1.0):
        levels.append(a_so * X + b_ss * (X * X + 0.5 * X - 4.0 / 3.0))
    return FineStructure(energy_hartree=energy, A_nuclear_au=A_n, A_electron_au=A_e, tensor_au=cq,
                         spin_orbit_hartree=a_so, spin_spin_hartree=b_ss, levels_hartree=tuple(levels),
                         interval_01_hartree=levels[0] - levels[1],
                         interval_12_hartree=levels[1] - levels[2])


#: sectors of the preset 2³P basis: [(ω, α/(Z-1), β/(Z/2))]; α belongs to the electron with z
P_PRESET = [(6, 0.55, 2.0), (4, 1.2, 2.2)]


def preset_p_basis(Z: float, sign: int = -1) -> PBasis:
    """Two-scale Hylleraas P basis of the preset (all ``i + j + k <= ω`` of each sector).

    The outer (p) electron carries ``α = a (Z - 1)``, the inner one ``β = b Z / 2``; the terms
    are those of :func:`twoel.basis.hylleraas.omega_terms` with two exponents.
    """
    if Z < 1.5:
        raise InputError("the 2^3P state needs Z >= 2")
    powers, exponents = [], []
    for omega, a, b in P_PRESET:
        terms = omega_terms(omega, False, sign)
        powers += terms
        exponents += [(a * (Z - 1.0), b * Z / 2.0, 0.0)] * len(terms)
    return PBasis(np.array(exponents), sign=sign, powers=np.array(powers))


def solve_p_state(basis: PBasis, Z: float, root: int = 0) -> tuple[float, np.ndarray]:
    """Variational energy (Eh) and coefficients of one root, exact pair integrals."""
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(Z), m.overlap)
    return float(eig.values[root]), eig.vectors[:, root]


def helium_like_3p_fine_structure(Z: float, nodes: int = 32) -> FineStructure:
    """2³P_J fine structure of a helium-like ion from the preset 2³P basis (Eh)."""
    basis = preset_p_basis(Z, -1)
    energy, c = solve_p_state(basis, Z, 0)
    return fine_structure(basis, c, Z, energy, nodes)
