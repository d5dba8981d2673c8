r"""SymPy derivations behind the numeric kernels (run by the generator and by the tests only).

1. :func:`master_integral` derives

   .. math:: \int\!\!\int \frac{e^{-\alpha r_1-\beta r_2-\gamma r_{12}}}{r_1 r_2 r_{12}}
             d^3r_1 d^3r_2 = \frac{16\pi^2}{(\alpha+\beta)(\beta+\gamma)(\gamma+\alpha)}

   from ``d³r1 d³r2 = 8π² r1 r2 r12 dr1 dr2 dr12`` (after the three Euler angles) and the
   perimetric coordinates ``x = r2 + r12 - r1``, ``y = r1 + r12 - r2``, ``z = r1 + r2 - r12``
   (each in ``[0, ∞)``, Jacobian 1/4); see Pekeris, Phys. Rev. 112, 1649 (1958).
2. :func:`closed_form_polynomial` differentiates it,
   ``I(a,b,c) = (-∂α)^(a+1)(-∂β)^(b+1)(-∂γ)^(c+1) I(-1,-1,-1)``, exactly, as a polynomial in the
   inverse pair sums (a route independent of the numeric kernels' series product); the test
   :func:`test_master_integral_derivation` checks it against direct ``sympy.diff`` too.
3. :func:`kinetic_terms` expands the symmetric kinetic-energy integrand
   ``½(∇1φ·∇1φ' + ∇2φ·∇2φ')`` of two primitives ``r1^i r2^j r12^k e^{-α r1 - β r2 - γ r12}`` into
   monomials ``r1^p r2^q r12^s`` times polynomial coefficients, using
   ``r̂1·r̂12 = (r1² + r12² - r2²)/(2 r1 r12)`` and ``r̂2·r̂21 = (r2² + r12² - r1²)/(2 r2 r12)``.
   :func:`kinetic_source` renders them as Python; ``twoel/integrals/_kinetic.py`` is that output.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

alpha, beta, gamma = sp.symbols("alpha beta gamma", positive=True)
r1, r2, r12 = sp.symbols("r1 r2 r12", positive=True)


@lru_cache(maxsize=None)
def master_integral() -> sp.Expr:
    """Derive ``I(-1,-1,-1; α, β, γ)`` with SymPy (perimetric coordinates)."""
    x, y, z = sp.symbols("x y z", nonnegative=True)
    # integrand r1 r2 r12 * (r1 r2 r12)^-1 exp(...) in perimetric coordinates
    exponent = (alpha * (y + z) + beta * (x + z) + gamma * (x + y)) / 2
    inner = sp.exp(-sp.expand(exponent))
    value = sp.integrate(inner, (x, 0, sp.oo), (y, 0, sp.oo), (z, 0, sp.oo), conds="none")
    return sp.factor(sp.simplify(8 * sp.pi**2 * value / 4))


# inverse pair sums u = 1/(α+β), v = 1/(β+γ), w = 1/(γ+α)
u, v, w = sp.symbols("u v w", positive=True)


@lru_cache(maxsize=None)
def closed_form_polynomial(a: int, b: int, c: int) -> sp.Poly:
    """``I(a, b, c) / π²`` as a polynomial in ``u = 1/(α+β)``, ``v = 1/(β+γ)``, ``w = 1/(γ+α)``.

    The master integral is ``16 u v w``; by the chain rule ``-∂α = u²∂u + w²∂w``,
    ``-∂β = u²∂u + v²∂v`` and ``-∂γ = v²∂v + w²∂w`` act on such polynomials exactly.
    """
    if min(a, b, c) < -1:
        raise ValueError("powers must be >= -1")
    if (a, b, c) == (-1, -1, -1):
        return sp.Poly(16 * u * v * w, u, v, w)
    if a > -1:
        previous, pair = closed_form_polynomial(a - 1, b, c), (u, w)
    elif b > -1:
        previous, pair = closed_form_polynomial(a, b - 1, c), (u, v)
    else:
        previous, pair = closed_form_polynomial(a, b, c - 1), (v, w)
    x, y = pair
    return sp.Poly(x**2, u, v, w) * previous.diff(x) + sp.Poly(y**2, u, v, w) * previous.diff(y)


def closed_form(a: int, b: int, c: int) -> sp.Expr:
    """Closed form of ``I(a, b, c; α, β, γ)`` as an expression in α, β, γ."""
    expr = closed_form_polynomial(a, b, c).as_expr()
    return sp.pi**2 * expr.subs({u: 1 / (alpha + beta), v: 1 / (beta + gamma), w: 1 / (gamma + alpha)})


def exact_value(a: int, b: int, c: int, alpha_value, beta_value, gamma_value) -> sp.Rational:
    """Exact value of the integral divided by π², for rational exponents."""
    A = sp.Rational(alpha_value) + sp.Rational(beta_value)
    B = sp.Rational(beta_value) + sp.Rational(gamma_value)
    C = sp.Rational(gamma_value) + sp.Rational(alpha_value)
    return sp.Rational(closed_form_polynomial(a, b, c).eval({u: 1 / A, v: 1 / B, w: 1 / C}))


# symbols of the bra primitive (index 1) and the ket primitive (index 2)
BRA = sp.symbols("i1 j1 k1 a1 b1 g1")
KET = sp.symbols("i2 j2 k2 a2 b2 g2")


@lru_cache(maxsize=None)
def kinetic_terms() -> tuple[tuple[tuple[int, int, int], sp.Expr], ...]:
    """Kinetic integrand ``½(∇1φ·∇1φ' + ∇2φ·∇2φ') / (φ φ')`` as ``((p, q, s), coefficient)``.

    The integral of the kinetic matrix element is then
    ``Σ coefficient · I(i1+i2+p, j1+j2+q, k1+k2+s; a1+a2, b1+b2, g1+g2)``.
    """
    i1, j1, k1, a1, b1, g1 = BRA
    i2, j2, k2, a2, b2, g2 = KET
    d1 = (i1 / r1 - a1, j1 / r2 - b1, k1 / r12 - g1)  # logarithmic derivatives of the bra
    d2 = (i2 / r1 - a2, j2 / r2 - b2, k2 / r12 - g2)
    cos_1_12 = (r1**2 + r12**2 - r2**2) / (2 * r1 * r12)
    cos_2_21 = (r2**2 + r12**2 - r1**2) / (2 * r2 * r12)
    integrand = sp.Rational(1, 2) * (
        d1[0] * d2[0] + d1[1] * d2[1] + 2 * d1[2] * d2[2]
        + (d1[0] * d2[2] + d1[2] * d2[0]) * cos_1_12
        + (d1[1] * d2[2] + d1[2] * d2[1]) * cos_2_21
    )
    poly = sp.Poly(sp.expand(integrand * r1**3 * r2**3 * r12**3), r1, r2, r12)
    terms = []
    for (p, q, s), coefficient in sorted(poly.terms()):
        terms.append(((p - 3, q - 3, s - 3), sp.factor(coefficient)))
    return tuple(terms)


def kinetic_source() -> str:
    """Python source of ``twoel/integrals/_kinetic.py`` (deterministic)."""
    lines = [
        '"""Kinetic-energy integrand terms, generated by twoel.integrals.symbolic.kinetic_source.',
        "",
        "Do not edit: regenerate with ``python -m twoel.integrals.generate``.  Each entry is the",
        "shift ``(p, q, s)`` of the powers of ``(r1, r2, r12)`` and a function of the bra powers",
        "and exponents ``(i1, j1, k1, a1, b1, g1)`` and the ket ones ``(i2, ..., g2)``.",
        '"""',
        "",
        "",
        "def kinetic_terms(i1, j1, k1, a1, b1, g1, i2, j2, k2, a2, b2, g2):",
        '    """Return ``[((p, q, s), coefficient), ...]``; arguments may be NumPy arrays."""',
        "    return [",
    ]
    for shift, coefficient in kinetic_terms():
        lines.append(f"        ({shift!r}, {sp.pycode(coefficient)}),")
    lines += ["    ]", ""]
    return "\n".join(lines)
