r"""SymPy derivations of the gradient and angular integrands for S and P correlated bases.

Primitives are ``χ = w · g`` with the scalar part

.. math:: g = r_1^{i} r_2^{j} r_{12}^{k} e^{-\alpha r_1 - \beta r_2 - \gamma r_{12}}

and the angular prefactor ``w = 1`` (S states) or ``w = z_e`` (the M = 0 component of a P
state, ``e`` = 1 or 2: the electron carrying the angular momentum).  Every integrand below is
written as a rotationally invariant function of ``(r1, r2, r12)`` divided by ``g_bra g_ket``,
then expanded into monomials ``r1^p r2^q r12^s`` with coefficients polynomial in the powers and
exponents, so that each matrix element is a finite sum of integrals
``I(i1+i2+p, j1+j2+q, k1+k2+s; α1+α2, β1+β2, γ1+γ2)`` of :mod:`twoel.integrals.kernels`.

Angular reduction
    A P integrand is a sum of terms ``(ẑ·u)(ẑ·v) S`` with ``u, v`` linear in the vectors
    ``r1, r2`` and ``S`` rotationally invariant.  Averaging over the orientations of the rigid
    configuration gives ``(u·v) S / 3`` (the rotational average of a product of two vector
    components), with ``r1·r1 = r1²``, ``r2·r2 = r2²`` and ``r1·r2 = (r1² + r2² - r12²)/2``.
    Since the integration over the three Euler angles is the same for every term, the matrix
    elements of the M = 0 functions are exactly these averaged integrands integrated with the
    Hylleraas volume element ``8π² r1 r2 r12 dr1 dr2 dr12``.

Gradients
    ``∇1 g / g = (L1/r1 + L12/r12) r1 - (L12/r12) r2`` and
    ``∇2 g / g = -(L12/r12) r1 + (L2/r2 + L12/r12) r2`` with ``L1 = i/r1 - α``,
    ``L2 = j/r2 - β``, ``L12 = k/r12 - γ``; ``∇n (z_e g) = δ_ne ẑ g + z_e ∇n g``.

Laplacians (used only to check the symmetric gradient forms, see the tests)
    ``∇1² g / g = -i/r1² + 2 L1/r1 - k/r12² + 2 L12/r12 + |∇1 g/g|²`` (and 1 <-> 2), and
    ``∇n²(z_e g) = z_e ∇n² g + 2 δ_ne ∂g/∂z_n``.

:func:`generated_source` renders all term lists as Python; ``_state_terms.py`` is its output.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

r1, r2, r12 = sp.symbols("r1 r2 r12", positive=True)
BRA = sp.symbols("i1 j1 k1 a1 b1 g1")
KET = sp.symbols("i2 j2 k2 a2 b2 g2")

#: electron whose z coordinate multiplies the bra and the ket of each P pair type
P_PAIRS = {"same": (1, 1), "cross": (1, 2)}


def _dot(u, v):
    """``u·v`` for vectors ``u = u0 r1 + u1 r2`` given as coefficient pairs."""
    d12 = (r1**2 + r2**2 - r12**2) / 2
    return u[0] * v[0] * r1**2 + (u[0] * v[1] + u[1] * v[0]) * d12 + u[1] * v[1] * r2**2


def _gradients(symbols):
    i, j, k, a, b, g = symbols
    L1, L2, L12 = i / r1 - a, j / r2 - b, k / r12 - g
    grad1 = (L1 / r1 + L12 / r12, -L12 / r12)
    grad2 = (-L12 / r12, L2 / r2 + L12 / r12)
    lap1 = -i / r1**2 + 2 * L1 / r1 - k / r12**2 + 2 * L12 / r12 + _dot(grad1, grad1)
    lap2 = -j / r2**2 + 2 * L2 / r2 - k / r12**2 + 2 * L12 / r12 + _dot(grad2, grad2)
    return {1: grad1, 2: grad2}, {1: lap1, 2: lap2}


def _unit(e):
    return (1, 0) if e == 1 else (0, 1)


def s_gradient_product(n: int, m: int) -> sp.Expr:
    """``∇n χ_bra · ∇m χ_ket / (g_bra g_ket)`` for S primitives."""
    ga, _ = _gradients(BRA)
    gb, _ = _gradients(KET)
    return _dot(ga[n], gb[m])


def p_gradient_product(n: int, m: int, ea: int, eb: int) -> sp.Expr:
    """Rotationally averaged ``∇n(z_ea g_bra) · ∇m(z_eb g_ket) / (g_bra g_ket)``."""
    ga, _ = _gradients(BRA)
    gb, _ = _gradients(KET)
    ua, ub = _unit(ea), _unit(eb)
    expr = sp.Integer(1) if (n == ea and m == eb) else sp.Integer(0)
    if n == ea:
        expr += _dot(ub, gb[m]) / 3
    if m == eb:
        expr += _dot(ua, ga[n]) / 3
    expr += _dot(ua, ub) * _dot(ga[n], gb[m]) / 3
    return expr


def p_angular(ea: int, eb: int) -> sp.Expr:
    """Rotational average of ``z_ea z_eb``: the factor multiplying any scalar operator."""
    return _dot(_unit(ea), _unit(eb)) / 3


def s_laplacian() -> sp.Expr:
    """``g_bra (-½ (∇1² + ∇2²)) g_ket / (g_bra g_ket)`` (Laplacian form, S)."""
    _, lap = _gradients(KET)
    return -(lap[1] + lap[2]) / 2


def p_laplacian(ea: int, eb: int) -> sp.Expr:
    """Averaged ``z_ea g_bra (-½ ∇²)(z_eb g_ket) / (g_bra g_ket)`` (Laplacian form, P)."""
    grad, lap = _gradients(KET)
    ua, ub = _unit(ea), _unit(eb)
    value = _dot(ua, ub) * (lap[1] + lap[2]) / 3 + 2 * _dot(ua, grad[eb]) / 3
    return -value / 2


def s_laplacian_product() -> sp.Expr:
    """Symmetrized ``(∇1² g_bra)(∇2² g_ket) / (g_bra g_ket)`` (for ``⟨p1² p2²⟩``, S)."""
    _, la = _gradients(BRA)
    _, lb = _gradients(KET)
    return (la[1] * lb[2] + la[2] * lb[1]) / 2


def p_laplacian_product(ea: int, eb: int) -> sp.Expr:
    """Averaged, symmetrized ``∇1²(z_ea g_bra) ∇2²(z_eb g_ket) / (g_bra g_ket)`` (P)."""
    ga, la = _gradients(BRA)
    gb, lb = _gradients(KET)
    ua, ub = _unit(ea), _unit(eb)

    def one(n, m):
        value = _dot(ua, ub) * la[n] * lb[m] / 3
        if m == eb:
            value += 2 * _dot(ua, gb[m]) * la[n] / 3
        if n == ea:
            value += 2 * _dot(ub, ga[n]) * lb[m] / 3
        if n == ea and m == eb:
            value += 4 * _dot(ga[n], gb[m]) / 3
        return value

    return (one(1, 2) + one(2, 1)) / 2


def _monomials(expr: sp.Expr, lift: int = 4) -> tuple:
    poly = sp.Poly(sp.expand(expr * (r1 * r2 * r12) ** lift), r1, r2, r12)
    terms = []
    for (p, q, s), coefficient in sorted(poly.terms()):
        coefficient = sp.factor(coefficient)
        if coefficient != 0:
            terms.append(((p - lift, q - lift, s - lift), coefficient))
    return tuple(terms)


@lru_cache(maxsize=None)
def term_lists() -> dict[str, tuple]:
    """All generated integrands as ``name -> ((shift, coefficient), ...)``.

    Names: ``s_grad11``, ``s_grad22``, ``s_grad12`` (symmetrized ``(∇1·∇2 + ∇2·∇1)/2``),
    ``s_laplacian``, ``s_lap1lap2`` (symmetrized ``∇1²χ ∇2²χ'``); ``p_<pair>_angular``, ``p_<pair>_grad11``, ``p_<pair>_grad22``,
    ``p_<pair>_grad12``, ``p_<pair>_laplacian``, ``p_<pair>_lap1lap2`` for ``<pair>`` in ``same`` (bra and ket carry
    ``z1``) and ``cross`` (bra ``z1``, ket ``z2``).
    """
    out = {
        "s_grad11": _monomials(s_gradient_product(1, 1)),
        "s_grad22": _monomials(s_gradient_product(2, 2)),
        "s_grad12": _monomials((s_gradient_product(1, 2) + s_gradient_product(2, 1)) / 2),
        "s_laplacian": _monomials(s_laplacian()),
        "s_lap1lap2": _monomials(s_laplacian_product()),
    }
    for pair, (ea, eb) in P_PAIRS.items():
        out[f"p_{pair}_angular"] = _monomials(p_angular(ea, eb))
        out[f"p_{pair}_grad11"] = _monomials(p_gradient_product(1, 1, ea, eb))
        out[f"p_{pair}_grad22"] = _monomials(p_gradient_product(2, 2, ea, eb))
        out[f"p_{pair}_grad12"] = _monomials(
            (p_gradient_product(1, 2, ea, eb) + p_gradient_product(2, 1, ea, eb)) / 2)
        out[f"p_{pair}_laplacian"] = _monomials(p_laplacian(ea, eb))
        out[f"p_{pair}_lap1lap2"] = _monomials(p_laplacian_product(ea, eb))
    return out


def generated_source() -> str:
    """Python source of ``twoel/integrals/_state_terms.py`` (deterministic)."""
    lines = [
        '"""Gradient and angular integrand terms for S and P correlated bases.',
        "",
        "Generated by twoel.integrals.symbolic_states.generated_source; do not edit: regenerate",
        "with ``python -m twoel.integrals.generate``.  Each function takes the bra powers and",
        "exponents ``(i1, j1, k1, a1, b1, g1)`` and the ket ones (arrays allowed) and returns",
        "``[((p, q, s), coefficient), ...]``: the integrand divided by ``g_bra g_ket`` is",
        "``Σ coefficient · r1^p r2^q r12^s``.",
        '"""',
        "",
    ]
    args = "i1, j1, k1, a1, b1, g1, i2, j2, k2, a2, b2, g2"
    for name, terms in term_lists().items():
        lines += ["", f"def {name}({args}):", "    return ["]
        for shift, coefficient in terms:
            lines.append(f"        ({shift!r}, {sp.pycode(coefficient)}),")
        lines += ["    ]", ""]
    lines.append("")
    lines.append("TERMS = {" + ", ".join(f"{n!r}: {n}" for n in term_lists()) + "}")
    lines.append("")
    return "\n".join(lines)
