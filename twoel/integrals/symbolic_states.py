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

Gradients and Laplacians
    Those of the scalar part come from :func:`twoel.integrals.symbolic.primitive_derivatives`
    (the same derivation as the kinetic terms); the angular prefactor adds
    ``∇n (z_e g) = δ_ne ẑ g + z_e ∇n g`` and ``∇n²(z_e g) = z_e ∇n² g + 2 δ_ne ∂g/∂z_n``.
    The Laplacian forms are used only to check the symmetric gradient forms (see the tests).

:func:`generated_source` renders all term lists as Python; ``generated/state_terms.py`` is its
output.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from twoel.integrals.symbolic import (BRA, KET, dot, monomial_terms,
                                      primitive_derivatives, r1, r2, r12, s_gradient_product,
                                      term_function_lines)

__all__ = ["BRA", "KET", "P_PAIRS", "r1", "r2", "r12", "s_gradient_product", "p_gradient_product",
           "p_angular", "s_laplacian", "p_laplacian", "s_laplacian_product", "p_laplacian_product",
           "term_lists", "generated_source"]

#: electron whose z coordinate multiplies the bra and the ket of each P pair type
P_PAIRS = {"same": (1, 1), "cross": (1, 2)}


def _unit(e):
    return (1, 0) if e == 1 else (0, 1)


def p_gradient_product(n: int, m: int, ea: int, eb: int) -> sp.Expr:
    """Rotationally averaged ``∇n(z_ea g_bra) · ∇m(z_eb g_ket) / (g_bra g_ket)``."""
    ga, _ = primitive_derivatives(BRA)
    gb, _ = primitive_derivatives(KET)
    ua, ub = _unit(ea), _unit(eb)
    expr = sp.Integer(1) if (n == ea and m == eb) else sp.Integer(0)
    if n == ea:
        expr += dot(ub, gb[m]) / 3
    if m == eb:
        expr += dot(ua, ga[n]) / 3
    expr += dot(ua, ub) * dot(ga[n], gb[m]) / 3
    return expr


def p_angular(ea: int, eb: int) -> sp.Expr:
    """Rotational average of ``z_ea z_eb``: the factor multiplying any scalar operator."""
    return dot(_unit(ea), _unit(eb)) / 3


def s_laplacian() -> sp.Expr:
    """``g_bra (-½ (∇1² + ∇2²)) g_ket / (g_bra g_ket)`` (Laplacian form, S)."""
    _, lap = primitive_derivatives(KET)
    return -(lap[1] + lap[2]) / 2


def p_laplacian(ea: int, eb: int) -> sp.Expr:
    """Averaged ``z_ea g_bra (-½ ∇²)(z_eb g_ket) / (g_bra g_ket)`` (Laplacian form, P)."""
    grad, lap = primitive_derivatives(KET)
    ua, ub = _unit(ea), _unit(eb)
    value = dot(ua, ub) * (lap[1] + lap[2]) / 3 + 2 * dot(ua, grad[eb]) / 3
    return -value / 2


def s_laplacian_product() -> sp.Expr:
    """Symmetrized ``(∇1² g_bra)(∇2² g_ket) / (g_bra g_ket)`` (for ``⟨p1² p2²⟩``, S)."""
    _, la = primitive_derivatives(BRA)
    _, lb = primitive_derivatives(KET)
    return (la[1] * lb[2] + la[2] * lb[1]) / 2


def p_laplacian_product(ea: int, eb: int) -> sp.Expr:
    """Averaged, symmetrized ``∇1²(z_ea g_bra) ∇2²(z_eb g_ket) / (g_bra g_ket)`` (P)."""
    ga, la = primitive_derivatives(BRA)
    gb, lb = primitive_derivatives(KET)
    ua, ub = _unit(ea), _unit(eb)

    def one(n, m):
        value = dot(ua, ub) * la[n] * lb[m] / 3
        if m == eb:
            value += 2 * dot(ua, gb[m]) * la[n] / 3
        if n == ea:
            value += 2 * dot(ub, ga[n]) * lb[m] / 3
        if n == ea and m == eb:
            value += 4 * dot(ga[n], gb[m]) / 3
        return value

    return (one(1, 2) + one(2, 1)) / 2


@lru_cache(maxsize=None)
def term_lists() -> dict[str, tuple]:
    """All generated integrands as ``name -> ((shift, coefficient), ...)``.

    Names: ``s_grad11``, ``s_grad22``, ``s_grad12`` (symmetrized ``(∇1·∇2 + ∇2·∇1)/2``),
    ``s_laplacian``, ``s_lap1lap2`` (symmetrized ``∇1²χ ∇2²χ'``); ``p_<pair>_angular``, ``p_<pair>_grad11``, ``p_<pair>_grad22``,
    ``p_<pair>_grad12``, ``p_<pair>_laplacian``, ``p_<pair>_lap1lap2`` for ``<pair>`` in ``same`` (bra and ket carry
    ``z1``) and ``cross`` (bra ``z1``, ket ``z2``).
    """
    out = {
        "s_grad11": monomial_terms(s_gradient_product(1, 1)),
        "s_grad22": monomial_terms(s_gradient_product(2, 2)),
        "s_grad12": monomial_terms((s_gradient_product(1, 2) + s_gradient_product(2, 1)) / 2),
        "s_laplacian": monomial_terms(s_laplacian()),
        "s_lap1lap2": monomial_terms(s_laplacian_product()),
    }
    for pair, (ea, eb) in P_PAIRS.items():
        out[f"p_{pair}_angular"] = monomial_terms(p_angular(ea, eb))
        out[f"p_{pair}_grad11"] = monomial_terms(p_gradient_product(1, 1, ea, eb))
        out[f"p_{pair}_grad22"] = monomial_terms(p_gradient_product(2, 2, ea, eb))
        out[f"p_{pair}_grad12"] = monomial_terms(
            (p_gradient_product(1, 2, ea, eb) + p_gradient_product(2, 1, ea, eb)) / 2)
        out[f"p_{pair}_laplacian"] = monomial_terms(p_laplacian(ea, eb))
        out[f"p_{pair}_lap1lap2"] = monomial_terms(p_laplacian_product(ea, eb))
    return out


def generated_source() -> str:
    """Python source of ``twoel/integrals/generated/state_terms.py`` (deterministic)."""
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
    for name, terms in term_lists().items():
        lines += [""] + term_function_lines(name, terms)
    lines.append("")
    lines.append("TERMS = {" + ", ".join(f"{n!r}: {n}" for n in term_lists()) + "}")
    lines.append("")
    return "\n".join(lines)
