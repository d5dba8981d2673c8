r"""2³P-type (L = 1) states by quadrature Galerkin, and their α² fine structure.

Basis functions (Cartesian components ``a = x, y, z`` of one L = 1 multiplet)

.. math:: Φ^p_a = r_{1a}\, g_p(r_1, r_2, r_{12}) + σ\, r_{2a}\, g_p(r_2, r_1, r_{12}),\qquad
          g_p = r_1^i r_2^j r_{12}^k e^{-α r_1 - β r_2 - γ r_{12}},

``σ = +1`` singlet, ``-1`` triplet (the same form as the P bases of the states work).  Traces over
the multiplet (``Σ_a``) make every integrand a rotational scalar, so the matrices of the overlap,
kinetic energy and potential and all fine-structure traces are integrals over ``r1, r2, r12``
only (:mod:`twoel.corrections.quadrature` coordinates, evaluated in one frame).

The quadrature (perimetric coordinates, smooth at r12 → 0; the nuclear spin–orbit trace on a
grid smooth at r1 → 0) is not exact, so the Galerkin energy is not a strict upper bound: with
32 nodes and ~120 functions it is within 1e-7 Eh of the 2³P energy; the fine-structure traces
converge to ~1e-6 relative (tests check both).

Fine structure (Bethe & Salpeter (1957) §39; anomalous moment ``a_e`` as in G. W. F. Drake,
Springer Handbook of AMO Physics (2006), ch. 11), Hartree units:

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

from dataclasses import asdict, dataclass
from math import pi

import numpy as np

from twoel import constants
from twoel.solver.eigen import solve_generalized
from twoel.errors import InputError
from twoel.corrections.quadrature import _laguerre

_CHUNK = 2048
_LEVI = np.zeros((3, 3, 3))
for _a, _b, _c in ((0, 1, 2), (1, 2, 0), (2, 0, 1)):
    _LEVI[_a, _b, _c] = 1.0
    _LEVI[_a, _c, _b] = -1.0
#: (L_c)_{ab} = -i ε_{cab} in the Cartesian basis of an L = 1 multiplet
_L = -1j * np.transpose(_LEVI, (0, 1, 2))


@dataclass(frozen=True)
class PBasisSpec:
    """Primitives of an L = 1 basis (powers and exponents of ``g``; ``α`` on the electron with ``r_a``)."""

    powers: np.ndarray
    exponents: np.ndarray
    sign: int
    contraction: np.ndarray | None = None

    @property
    def n_primitives(self) -> int:
        return int(np.asarray(self.powers).shape[0])


def _grid(nodes: int, rate_u: float, rate_z: float, pair: str = "xy"):
    """Quadrature points; the pair of perimetric coordinates combined as (u v, u (1-v)) is
    ``xy`` (smooth at r12 → 0) or ``yz`` (smooth at r1 → 0)."""
    t, w = _laguerre(nodes)
    v, wv = np.polynomial.legendre.leggauss(max(8, nodes // 2))
    v, wv = 0.5 * (v + 1.0), 0.5 * wv
    U, V, Zc = np.meshgrid(t / rate_u, v, t / rate_z, indexing="ij")
    W = (w[:, None, None] / rate_u) * wv[None, :, None] * (w[None, None, :] / rate_z) * U
    a, b = (U * V).ravel(), (U * (1.0 - V)).ravel()
    c, W = Zc.ravel(), W.ravel()
    if pair == "xy":
        x, y, z = a, b, c
    else:
        y, z, x = a, b, c
    r1, r2, r12 = 0.5 * (y + z), 0.5 * (x + z), 0.5 * (x + y)
    return r1, r2, r12, W * 2 * pi * pi * r1 * r2 * r12


def _frame(r1, r2, r12):
    """Vectors r1 = r1 ẑ, r2 in the xz plane, shape (n, 3)."""
    cos = np.clip((r1**2 + r2**2 - r12**2) / (2 * r1 * r2), -1.0, 1.0)
    sin = np.sqrt(np.maximum(0.0, 1.0 - cos**2))
    v1 = np.stack([np.zeros_like(r1), np.zeros_like(r1), r1], axis=1)
    v2 = np.stack([r2 * sin, np.zeros_like(r2), r2 * cos], axis=1)
    return v1, v2


def _fields(spec: PBasisSpec, r1, r2, r12, v1, v2):
    """Φ_a (n, P, 3) and ∂_{k e} Φ_a (n, P, 2, 3[e], 3[a]) for every primitive."""
    p = np.asarray(spec.powers, dtype=float)
    e = np.asarray(spec.exponents, dtype=float)
    n12 = (v1 - v2) / r12[:, None]
    u1 = v1 / r1[:, None]
    u2 = v2 / r2[:, None]
    lr1, lr2, lr12 = np.log(r1), np.log(r2), np.log(r12)

    def prim(pp, ee):
        g = np.exp(lr1[:, None] * pp[None, :, 0] + lr2[:, None] * pp[None, :, 1] + lr12[:, None] * pp[None, :, 2]
                   - r1[:, None] * ee[None, :, 0] - r2[:, None] * ee[None, :, 1] - r12[:, None] * ee[None, :, 2])
        A = pp[None, :, 0] / r1[:, None] - ee[None, :, 0]
        B = pp[None, :, 1] / r2[:, None] - ee[None, :, 1]
        C = pp[None, :, 2] / r12[:, None] - ee[None, :, 2]
        grad1 = g[..., None] * (A[..., None] * u1[:, None, :] + C[..., None] * n12[:, None, :])
        grad2 = g[..., None] * (B[..., None] * u2[:, None, :] - C[..., None] * n12[:, None, :])
        return g, grad1, grad2

    g, g1, g2 = prim(p, e)
    h, h1, h2 = prim(p[:, [1, 0, 2]], e[:, [1, 0, 2]])
    s = float(spec.sign)
    phi = v1[:, None, :] * g[..., None] + s * v2[:, None, :] * h[..., None]
    eye = np.eye(3)
    d = np.empty(phi.shape[:2] + (2, 3, 3))
    # ∂_{1e} Φ_a = δ_ae g + r1_a ∂_{1e} g + σ r2_a ∂_{1e} h
    d[:, :, 0] = (eye[None, None] * g[..., None, None] + g1[..., :, None] * v1[:, None, None, :]
                  + s * h1[..., :, None] * v2[:, None, None, :])
    d[:, :, 1] = (g2[..., :, None] * v1[:, None, None, :] + s * eye[None, None] * h[..., None, None]
                  + s * h2[..., :, None] * v2[:, None, None, :])
    return phi, d


def _rates(spec):
    e = np.asarray(spec.exponents, dtype=float)
    s = np.minimum(e[:, 0], e[:, 1])
    return max(float(np.min(s + e[:, 2])), 1e-3), max(float(np.min(e[:, 0] + e[:, 1])), 1e-3)


def p_matrices(spec: PBasisSpec, Z: float, nodes: int = 40):
    """Overlap and Hamiltonian matrices ``Σ_a ⟨Φ^p_a|·|Φ^q_a⟩`` by quadrature."""
    r1, r2, r12, W = _grid(nodes, *_rates(spec))
    P = spec.n_primitives
    S = np.zeros((P, P))
    H = np.zeros((P, P))
    for start in range(0, r1.shape[0], _CHUNK):
        sl = slice(start, start + _CHUNK)
        v1, v2 = _frame(r1[sl], r2[sl], r12[sl])
        phi, d = _fields(spec, r1[sl], r2[sl], r12[sl], v1, v2)
        w = W[sl]
        V = -Z / r1[sl] - Z / r2[sl] + 1.0 / r12[sl]
        fa = np.transpose(phi, (0, 2, 1)).reshape(-1, P)  # (n*3, P)
        wa = np.repeat(w, 3)
        S += fa.T @ (wa[:, None] * fa)
        H += fa.T @ ((wa * np.repeat(V, 3))[:, None] * fa)
        fd = np.transpose(d, (0, 2, 3, 4, 1)).reshape(-1, P)
        wd = np.repeat(w, 18)
        H += 0.5 * fd.T @ (wd[:, None] * fd)
    C = spec.contraction
    if C is not None:
        S, H = C.T @ S @ C, C.T @ H @ C
    return 0.5 * (S + S.T), 0.5 * (H + H.T)


@dataclass(frozen=True)
class FineStructure:
    """³P fine structure (Eh): ``levels`` are the shifts of J = 0, 1, 2; intervals E0-E1, E1-E2."""

    energy: float
    A_nuclear: float
    A_electron: float
    tensor: float
    a_so: float
    b_ss: float
    levels: tuple
    interval_01: float
    interval_12: float

    def to_dict(self) -> dict:
        return asdict(self)


def fine_structure(spec: PBasisSpec, coefficients, Z: float, energy: float, nodes: int = 40,
                   anomalous: bool = True) -> FineStructure:
    """α² fine structure of a ³P state from its wavefunction (primitive basis ``spec``)."""
    if spec.sign != -1:
        raise InputError("fine structure needs a triplet (sign -1) P wavefunction")
    c = np.asarray(coefficients, dtype=float)
    weights = c if spec.contraction is None else spec.contraction @ c
    Lm = _L  # (c, a, b)
    T_L = np.zeros((3, 3, 3, 3), dtype=complex)  # T_ab(L) as 3x3 matrices
    for a in range(3):
        for b in range(3):
            T_L[a, b] = 0.5 * (Lm[a] @ Lm[b] + Lm[b] @ Lm[a]) - (2.0 / 3.0) * np.eye(3) * (a == b)
    sums = {"norm": 0.0, "n": 0.0, "e": 0.0, "q": 0.0, "norm_yz": 0.0}
    for pair in ("xy", "yz"):
        r1, r2, r12, W = _grid(nodes, *_rates(spec), pair=pair)
        for start in range(0, r1.shape[0], _CHUNK):
            sl = slice(start, start + _CHUNK)
            v1, v2 = _frame(r1[sl], r2[sl], r12[sl])
            phi, d = _fields(spec, r1[sl], r2[sl], r12[sl], v1, v2)
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
    return FineStructure(energy=energy, A_nuclear=A_n, A_electron=A_e, tensor=cq, a_so=a_so, b_ss=b_ss,
                         levels=tuple(levels), interval_01=levels[0] - levels[1],
                         interval_12=levels[1] - levels[2])


def omega_spec(sectors, sign: int) -> PBasisSpec:
    """A P basis from sectors ``[(ω, α, β)]``: all ``i + j + k <= ω`` with exponents ``(α, β, 0)``."""
    powers, exps = [], []
    for omega, a, b in sectors:
        for total in range(omega + 1):
            for k in range(total + 1):
                for i in range(total - k + 1):
                    powers.append((i, total - k - i, k))
                    exps.append((a, b, 0.0))
    return PBasisSpec(np.array(powers), np.array(exps), sign)


def solve_p(spec: PBasisSpec, Z: float, root: int = 0, nodes: int = 40,
            drop_threshold: float = 1e-11):
    """Lowest roots of the L = 1 block; returns (energy, coefficients)."""
    S, H = p_matrices(spec, Z, nodes)
    eig = solve_generalized(H, S, drop_threshold=drop_threshold)
    return float(eig.values[root]), eig.vectors[:, root]


#: basis used by :func:`helium_like_3p_fine_structure`: [(ω, α·(Z-1)/1, β·Z/2)]
P_PRESET = [(6, 0.55, 2.0), (4, 1.2, 2.2)]


def helium_like_3p_fine_structure(Z: float, nodes: int = 32) -> FineStructure:
    """2³P_J fine structure of a helium-like ion from the preset 2³P basis (Eh)."""
    sectors = [(w, a * (Z - 1.0), b * Z / 2.0) for w, a, b in P_PRESET]
    if Z < 1.5:
        raise InputError("the 2^3P state needs Z >= 2")
    spec = omega_spec(sectors, -1)
    energy, c = solve_p(spec, Z, 0, nodes)
    return fine_structure(spec, c, Z, energy, nodes)
