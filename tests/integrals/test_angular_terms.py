"""General-L term lists: the orientation average ⟨U|Π_K|V⟩/(2K+1) against quadrature over
rotations, the generated integrands against finite differences averaged over orientations, and
the L = 0, 1 lists against the S and z1-form P derivations."""

from __future__ import annotations

import numpy as np
from finite_differences import grad as _grad, lap as _lap
import pytest
import sympy as sp

from twoel.integrals import symbolic_states as S
from twoel.integrals.generated.state_terms import TERMS
from twoel.integrals.symbolic import monomial_terms

EPS = np.array([1.0, 1j, 0.0]) / np.sqrt(2.0)


def _rotations(points: int = 8):
    """Product quadrature over SO(3) (Euler z-y-z; exact for polynomials of degree < points in
    the rotation matrix entries): rotation matrices and weights summing to 1."""
    angles = 2 * np.pi * np.arange(points) / points
    x, w = np.polynomial.legendre.leggauss(points)
    out = []
    for a in angles:
        for cb, wb in zip(x, w):
            for c in angles:
                sb = np.sqrt(1 - cb**2)
                rz = lambda t: np.array([[np.cos(t), -np.sin(t), 0], [np.sin(t), np.cos(t), 0], [0, 0, 1]])  # noqa: E731
                ry = np.array([[cb, 0, sb], [0, 1, 0], [-sb, 0, cb]])
                out.append((rz(a) @ ry @ rz(c), wb / 2 / points**2))
    return out


@pytest.mark.parametrize("K", [1, 2, 3])
def test_orientation_average_is_the_traceless_projection(K):
    """avg_R ∏(ε*·R u_i) ∏(ε·R v_j) equals ⟨U|Π_K|V⟩/(2K+1) from the scalar products."""
    rng = np.random.default_rng(K)
    us, vs = rng.normal(size=(K, 3)), rng.normal(size=(K, 3))
    quadrature = 0.0
    for R, weight in _rotations():
        quadrature += weight * np.prod(np.conj(EPS) @ (R @ us.T)) * np.prod(EPS @ (R @ vs.T))
    expr, G, A, B = S.traceless_form(K)
    values = {G[i][j]: us[i] @ vs[j] for i in range(K) for j in range(K)}
    values.update({A[i][j]: us[i] @ us[j] for i in range(K) for j in range(K) if i < j})
    values.update({B[i][j]: vs[i] @ vs[j] for i in range(K) for j in range(K) if i < j})
    formula = float(expr.xreplace(values)) / (2 * K + 1)
    assert abs(quadrature.imag) < 1e-14
    assert quadrature.real == pytest.approx(formula, rel=1e-12, abs=1e-14)


def test_traceless_form_low_ranks():
    """K = 1: u·v; K = 2: sym(u1⊗u2)·sym(v1⊗v2) - (u1·u2)(v1·v2)/3 (exact)."""
    expr, G, A, B = S.traceless_form(1)
    assert expr == G[0][0]
    expr, G, A, B = S.traceless_form(2)
    expected = (G[0][0] * G[1][1] + G[0][1] * G[1][0]) / 2 - A[0][1] * B[0][1] / 3
    assert sp.expand(expr - expected) == 0


# --- generated integrands against finite differences averaged over orientations ----------------


def _primitive(params, l1, l2, eps):
    i, j, k, a, b, g = params

    def f(x):
        r1, r2 = np.linalg.norm(x[:3]), np.linalg.norm(x[3:])
        r12 = np.linalg.norm(x[:3] - x[3:])
        scalar = r1**i * r2**j * r12**k * np.exp(-a * r1 - b * r2 - g * r12)
        return (eps @ x[:3]) ** l1 * (eps @ x[3:]) ** l2 * scalar
    return f




def _integrand(name, bra, ket, x):
    if name == "angular":
        return np.conj(bra(x)) * ket(x)
    if name in ("grad11", "grad22"):
        n = int(name[-1])
        return np.conj(_grad(bra, x, n)) @ _grad(ket, x, n)
    if name == "grad12":
        return (np.conj(_grad(bra, x, 1)) @ _grad(ket, x, 2) + np.conj(_grad(bra, x, 2)) @ _grad(ket, x, 1)) / 2
    if name == "laplacian":
        return -np.conj(bra(x)) * (_lap(ket, x, 1) + _lap(ket, x, 2)) / 2
    raise ValueError(name)


@pytest.mark.parametrize("L, la, lb, name", [
    (2, 2, 2, "grad11"), (2, 2, 1, "grad12"), (2, 1, 0, "grad22"), (2, 2, 0, "angular"),
    (2, 1, 1, "laplacian"), (3, 3, 2, "grad11"), (3, 2, 1, "grad12")])
def test_generated_terms_are_orientation_averages(L, la, lb, name):
    rng = np.random.default_rng(L * 100 + la * 10 + lb)
    bra_p = [*map(float, rng.integers(0, 2, 3)), *rng.uniform(0.2, 1.5, 3)]
    ket_p = [*map(float, rng.integers(0, 2, 3)), *rng.uniform(0.2, 1.5, 3)]
    x = rng.uniform(-1.2, 1.2, 6)
    average = 0.0
    for R, weight in _rotations(2 * L + 1):
        eps = EPS @ R  # ε rotated: (ε·R^T r) for the rotated frame
        bra = _primitive(bra_p, la, L - la, eps)
        ket = _primitive(ket_p, lb, L - lb, eps)
        average += weight * _integrand(name, bra, ket, x)
    r1, r2, r12 = np.linalg.norm(x[:3]), np.linalg.norm(x[3:]), np.linalg.norm(x[:3] - x[3:])
    scale = _primitive(bra_p, 0, 0, EPS)(x) * _primitive(ket_p, 0, 0, EPS)(x)
    values = [c * r1**p * r2**q * r12**s for (p, q, s), c in TERMS[f"l{L}_{la}{lb}_{name}"](*bra_p, *ket_p)]
    size = sum(abs(v) for v in values)
    assert abs(average.imag) < 1e-8 * size * abs(scale)
    assert sum(values) == pytest.approx(average.real / scale, abs=1e-7 * size)


@pytest.mark.parametrize("generated, derivation", [
    ("l1_10_angular", lambda: S.p_angular(1, 2)),
    ("l1_11_grad22", lambda: S.p_gradient_product(2, 2, 1, 1)),
    ("l0_00_grad12", lambda: (S.s_gradient_product(1, 2) + S.s_gradient_product(2, 1)) / 2),
])
def test_l0_l1_lists_are_the_s_and_z1_p_derivations(generated, derivation):
    """The general derivation at L = 0, 1 gives term for term the S lists and the P lists of the
    real z1 form (rotational average (ẑ·u)(ẑ·v) -> u·v/3)."""
    L, la, lb, name = int(generated[1]), int(generated[3]), int(generated[4]), generated[6:]
    assert monomial_terms(S.angular_integrand(L, la, lb, name), lift=4 + L) == \
        monomial_terms(derivation(), lift=4 + L)


@pytest.mark.slow
@pytest.mark.parametrize("name", S.ANGULAR_INTEGRANDS)
def test_all_p_lists_are_the_z1_derivation(name):
    old = {"angular": lambda ea, eb: S.p_angular(ea, eb),
           "grad11": lambda ea, eb: S.p_gradient_product(1, 1, ea, eb),
           "grad22": lambda ea, eb: S.p_gradient_product(2, 2, ea, eb),
           "grad12": lambda ea, eb: (S.p_gradient_product(1, 2, ea, eb) + S.p_gradient_product(2, 1, ea, eb)) / 2,
           "laplacian": S.p_laplacian, "lap1lap2": S.p_laplacian_product}[name]
    for lb, eb in ((1, 1), (0, 2)):
        assert monomial_terms(S.angular_integrand(1, 1, lb, name), lift=5) == \
            monomial_terms(old(1, eb), lift=5)
