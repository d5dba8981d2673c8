r"""SymPy derivations of the gradient and angular integrands of correlated bases of any L.

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

General natural-parity L (what is generated; the z-form functions above stay as the
independent check of its L = 1 case)
    Primitives ``χ = (ε·r1)^l1 (ε·r2)^l2 g`` with ``l1 + l2 = L`` and the complex null vector
    ``ε = (x̂ + iŷ)/√2`` (``ε·ε = 0``, ``ε*·ε = 1``): ``(ε·r)^l ∝ r^l Y_ll(r̂)``, so χ is the
    ``M = L`` member of the stretched (unique) coupling ``[Y_l1 ⊗ Y_l2]^L``; scalar operators
    have the same matrix elements in every ``M``.  Every integrand is a sum of scalar functions
    times ``∏_{i≤K} (ε*·u_i) ∏_{j≤K} (ε·v_j)``, ``u, v ∈ span{r1, r2}``.  ``ε^{⊗K}`` is a unit
    vector of the rank-``K`` symmetric traceless (irreducible) space, so by Schur's lemma its
    average over orientations is ``⟨U|Π_K|V⟩/(2K+1)`` (:func:`orientation_average`,
    :func:`traceless_form`: the polarization of ``K!/(2K-1)!! |u|^K |v|^K P_K(û·v̂)``), a
    polynomial in the scalar products.  ``K = L`` for products of the angular factors, ``K = L-1``
    where a bra gradient ``ε*`` meets a ket gradient ``ε`` (``∇n (ε·r_n)^l = l (ε·r_n)^(l-1) ε``);
    ``(ε·r)^l`` is harmonic, so ``∇n² χ = (ε-product) ∇n² g + 2 l_n (ε·r_n)^(l_n-1) (ε·∇n g)``.
    ``K = 1`` is the ``u·v/3`` above and ``K = 0`` the S case, so the L = 0, 1 lists are the S
    and P lists term for term.

:func:`generated_source` renders all term lists as Python; ``generated/state_terms.py`` is its
output.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from twoel.integrals.symbolic import (BRA, INV_A, INV_B, INV_C, KET, _fixed_code, _product_code, dot,
                                      inverse_sum_form, monomial_terms, primitive_derivatives, r1,
                                      r2, r12, s_gradient_product, term_function_lines)

__all__ = ["BRA", "KET", "P_PAIRS", "r1", "r2", "r12", "s_gradient_product", "p_gradient_product",
           "p_angular", "s_laplacian", "p_laplacian", "s_laplacian_product", "p_laplacian_product",
           "term_lists", "generated_source", "zero_power_angular_pieces", "zero_power_angular_source"]

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


# --- general natural-parity L: stretched components (ε·r1)^l1 (ε·r2)^l2, ε = (x̂ + iŷ)/√2 -----
#: largest total angular momentum whose term lists are generated
MAX_L = 3
#: integrands generated for every L (the Laplacian forms only check the gradient forms; the
#: ``lap1lap2`` product, used by ⟨p1² p2²⟩ of S and P states, is generated for L <= 1)
ANGULAR_INTEGRANDS = ("angular", "grad11", "grad22", "grad12", "laplacian", "lap1lap2")
LAP_PRODUCT_MAX_L = 1
_E1, _E2 = (sp.Integer(1), sp.Integer(0)), (sp.Integer(0), sp.Integer(1))


def legendre_coefficients(K: int) -> list[sp.Rational]:
    """``p_m`` with ``P_K(x) = Σ_m p_m x^(K-2m)`` (Legendre polynomial, exact)."""
    x = sp.Symbol("x")
    poly = sp.Poly(sp.legendre(K, x), x)
    return [poly.coeff_monomial(x ** (K - 2 * m)) for m in range(K // 2 + 1)]


@lru_cache(maxsize=None)
def traceless_form(K: int) -> tuple:
    r"""The bilinear form ``⟨u_1⊗…⊗u_K | Π_K | v_1⊗…⊗v_K⟩`` as a polynomial in scalar products.

    ``Π_K`` projects onto symmetric traceless rank-``K`` tensors.  Its diagonal value is
    ``F(u, v) = ⟨u^{⊗K}|Π_K|v^{⊗K}⟩ = K!/(2K-1)!! |u|^K |v|^K P_K(û·v̂)``; the multilinear form
    is its polarization: the coefficient of ``s_1…s_K t_1…t_K`` in
    ``F(Σ s_i u_i, Σ t_j v_j)`` divided by ``(K!)²``.

    Returns
    -------
    (expr, G, A, B)
        ``expr`` in the symbols ``G[i][j] = u_i·v_j``, ``A[i][k] = u_i·u_k`` and
        ``B[j][l] = v_j·v_l`` (``i < k``, ``j < l``; diagonal products do not occur).
    """
    s = sp.symbols(f"s0:{K}")
    t = sp.symbols(f"t0:{K}")
    G = [[sp.Symbol(f"G{i}_{j}") for j in range(K)] for i in range(K)]
    A = [[sp.Symbol(f"A{min(i, k)}_{max(i, k)}") for k in range(K)] for i in range(K)]
    B = [[sp.Symbol(f"B{min(i, k)}_{max(i, k)}") for k in range(K)] for i in range(K)]
    uv = sum(s[i] * t[j] * G[i][j] for i in range(K) for j in range(K))
    uu = sum(s[i] * s[k] * A[i][k] for i in range(K) for k in range(K))
    vv = sum(t[i] * t[k] * B[i][k] for i in range(K) for k in range(K))
    scale = sp.factorial(K) / sp.factorial2(2 * K - 1)
    F = scale * sum(p * uv ** (K - 2 * m) * (uu * vv) ** m
                    for m, p in enumerate(legendre_coefficients(K)))
    poly = sp.Poly(sp.expand(F), *s, *t)
    expr = poly.coeff_monomial(sp.Mul(*s, *t)) / sp.factorial(K) ** 2
    return sp.expand(expr), G, A, B


def orientation_average(us, vs) -> sp.Expr:
    r"""Average over orientations of ``∏_i (ε*·u_i) ∏_j (ε·v_j)`` (``K`` factors each).

    ``ε^{⊗K}`` spans the rank-``K`` symmetric traceless (irreducible) space with norm 1, so by
    Schur's lemma the average is ``⟨U|Π_K|V⟩ / (2K + 1)`` (:func:`traceless_form`); vectors are
    coefficient pairs on ``(r1, r2)`` (:func:`twoel.integrals.symbolic.dot`).  ``K = 1`` gives
    the ``u·v/3`` of the P terms, ``K = 0`` gives 1.
    """
    K = len(us)
    if len(vs) != K:
        raise ValueError("bra and ket need the same number of ε factors")
    if K == 0:
        return sp.Integer(1)
    expr, G, A, B = traceless_form(K)
    values = {}
    for i in range(K):
        for j in range(K):
            values[G[i][j]] = dot(us[i], vs[j])
            if i < j:
                values[A[i][j]] = dot(us[i], us[j])
                values[B[i][j]] = dot(vs[i], vs[j])
    return expr.xreplace(values) / (2 * K + 1)


def _factors(l1: int, l2: int) -> list:
    return [_E1] * l1 + [_E2] * l2


def _gradient_pieces(symbols, l1: int, l2: int, n: int) -> list:
    """``∇n χ / g`` of ``χ = (ε·r1)^l1 (ε·r2)^l2 g`` as ``[(coefficient, factors, direction)]``.

    ``factors`` lists the vectors ``f`` of the product ``∏ (ε·f)``; ``direction`` is ``None``
    for the constant vector ``ε`` (from ``∇n (ε·r_n)^l = l (ε·r_n)^(l-1) ε``) or a vector of
    ``span{r1, r2}``.
    """
    grad, _ = primitive_derivatives(symbols)
    pieces = [(sp.Integer(1), _factors(l1, l2), grad[n])]
    ln = l1 if n == 1 else l2
    if ln:
        reduced = _factors(l1 - 1, l2) if n == 1 else _factors(l1, l2 - 1)
        pieces.append((sp.Integer(ln), reduced, None))
    return pieces


def _laplacian_pieces(symbols, l1: int, l2: int, n: int) -> list:
    """``∇n² χ / g`` as ``[(coefficient, factors)]`` (``(ε·r)^l`` is harmonic since ε·ε = 0)."""
    grad, lap = primitive_derivatives(symbols)
    pieces = [(lap[n], _factors(l1, l2))]
    ln = l1 if n == 1 else l2
    if ln:
        reduced = _factors(l1 - 1, l2) if n == 1 else _factors(l1, l2 - 1)
        pieces.append((2 * ln, reduced + [grad[n]]))
    return pieces


def _gradient_dot(bra_pieces, ket_pieces) -> sp.Expr:
    """Orientation average of ``(∇χ_bra)* · ∇χ_ket / (g_bra g_ket)`` from gradient pieces."""
    total = sp.Integer(0)
    for ca, fa, da in bra_pieces:
        for cb, fb, db in ket_pieces:
            if da is None and db is None:  # ε*·ε = 1
                total += ca * cb * orientation_average(fa, fb)
            elif da is None:  # ε*·db joins the bra product
                total += ca * cb * orientation_average(fa + [db], fb)
            elif db is None:
                total += ca * cb * orientation_average(fa, fb + [da])
            else:
                total += ca * cb * dot(da, db) * orientation_average(fa, fb)
    return total


def angular_integrand(L: int, la: int, lb: int, integrand: str) -> sp.Expr:
    """Orientation-averaged integrand of a bra ``(ε·r1)^la (ε·r2)^(L-la) g_bra`` (complex
    conjugated) and a ket ``(ε·r1)^lb (ε·r2)^(L-lb) g_ket``, divided by ``g_bra g_ket``.

    ``integrand`` is one of :data:`ANGULAR_INTEGRANDS`: ``angular`` (the factor of any
    multiplicative operator), ``grad11``, ``grad22``, ``grad12`` (symmetrized
    ``(∇1·∇2 + ∇2·∇1)/2``), ``laplacian`` (``χ (-½∇²) χ'``) and ``lap1lap2`` (symmetrized
    ``∇1²χ* ∇2²χ'``).
    """
    bra, ket = (la, L - la), (lb, L - lb)
    if integrand == "angular":
        return orientation_average(_factors(*bra), _factors(*ket))
    if integrand in ("grad11", "grad22"):
        n = int(integrand[-1])
        return _gradient_dot(_gradient_pieces(BRA, *bra, n), _gradient_pieces(KET, *ket, n))
    if integrand == "grad12":
        return (_gradient_dot(_gradient_pieces(BRA, *bra, 1), _gradient_pieces(KET, *ket, 2))
                + _gradient_dot(_gradient_pieces(BRA, *bra, 2), _gradient_pieces(KET, *ket, 1))) / 2
    if integrand == "laplacian":
        fa = _factors(*bra)
        return -sum(c * orientation_average(fa, f) for n in (1, 2)
                    for c, f in _laplacian_pieces(KET, *ket, n)) / 2
    if integrand == "lap1lap2":
        def one(n, m):
            return sum(ca * cb * orientation_average(fa, fb)
                       for ca, fa in _laplacian_pieces(BRA, *bra, n)
                       for cb, fb in _laplacian_pieces(KET, *ket, m))
        return (one(1, 2) + one(2, 1)) / 2
    raise ValueError(f"unknown integrand {integrand!r}")


def angular_term_name(L: int, la: int, lb: int, integrand: str) -> str:
    """Name of a generated term list: ``l<L>_<la><lb>_<integrand>``."""
    return f"l{L}_{la}{lb}_{integrand}"


def angular_integrands(L: int) -> tuple[str, ...]:
    """The integrands generated for total angular momentum ``L``."""
    return ANGULAR_INTEGRANDS if L <= LAP_PRODUCT_MAX_L else ANGULAR_INTEGRANDS[:-1]


#: older names of the L = 0 and L = 1 lists (the S and P cases of the general derivation)
ALIASES = {**{f"s_{name}": angular_term_name(0, 0, 0, name) for name in ANGULAR_INTEGRANDS[1:]},
           **{f"p_{pair}_{name}": angular_term_name(1, 1, lb, name)
              for pair, lb in (("same", 1), ("cross", 0)) for name in ANGULAR_INTEGRANDS}}


@lru_cache(maxsize=None)
def term_lists() -> dict[str, tuple]:
    """All generated integrands as ``name -> ((shift, coefficient), ...)``.

    Names ``l<L>_<la><lb>_<integrand>`` (:func:`angular_term_name`) for ``L = 0 .. MAX_L``,
    bra ``(ε·r1)^la (ε·r2)^(L-la)``, ket ``(ε·r1)^lb (ε·r2)^(L-lb)``, and the integrands of
    :func:`angular_integrands`.  The S lists are ``L = 0``; the P lists of the ``z1`` basis
    (``p_same_*``: bra and ket ``z1``; ``p_cross_*``: ket ``z2``) are ``L = 1`` with
    ``la = 1`` and ``lb = 1`` or ``0`` (:data:`ALIASES`): scalar operators have the same
    matrix elements in every ``M`` component.
    """
    out = {}
    for L in range(MAX_L + 1):
        for la in range(L + 1):
            for lb in range(L + 1):
                for integrand in angular_integrands(L):
                    out[angular_term_name(L, la, lb, integrand)] = monomial_terms(
                        angular_integrand(L, la, lb, integrand), lift=4 + L)
    return out


def generated_source() -> str:
    """Python source of ``twoel/integrals/generated/state_terms.py`` (deterministic)."""
    lines = [
        '"""Gradient and angular integrand terms of correlated bases of total angular momentum L.',
        "",
        "Generated by twoel.integrals.symbolic_states.generated_source; do not edit: regenerate",
        "with ``python -m twoel.integrals.generate``.  ``l<L>_<la><lb>_<integrand>`` belongs to the",
        "bra ``(ε*·r1)^la (ε*·r2)^(L-la) g_bra`` and the ket ``(ε·r1)^lb (ε·r2)^(L-lb) g_ket``",
        "(ε = (x̂ + iŷ)/√2), averaged over orientations.  Each function takes the bra powers and",
        "exponents ``(i1, j1, k1, a1, b1, g1)`` and the ket ones (arrays allowed) and returns",
        "``[((p, q, s), coefficient), ...]``: the integrand divided by ``g_bra g_ket`` is",
        "``Σ coefficient · r1^p r2^q r12^s``.",
        '"""',
        "",
        "#: largest total angular momentum generated",
        f"MAX_L = {MAX_L}",
        "",
    ]
    for name, terms in term_lists().items():
        lines += [""] + term_function_lines(name, terms)
    lines.append("")
    lines.append("TERMS = {" + ", ".join(f"{n!r}: {n}" for n in term_lists()) + "}")
    lines.append("#: older names: the S lists (L = 0) and the P lists of the z1 basis (L = 1)")
    lines.append("TERMS.update({" + ", ".join(f"{a!r}: {n}" for a, n in ALIASES.items()) + "})")
    lines.append("")
    return "\n".join(lines)


# --- zero-power (purely exponential) primitives of L >= 1 -----------------------------------------
#: exponent symbols of a pair (bra α, β, γ, then ket)
PAIR_EXPONENTS = BRA[3:] + KET[3:]
#: weights of the multiplicative Hamiltonian operators (nuclear: unit charge)
_MULTIPLICATIVE = {"overlap": ((0, 0, 0),), "nuclear": ((-1, 0, 0), (0, -1, 0)), "repulsion": ((0, 0, -1),)}


def _zero_power_sum(terms, shifts=((0, 0, 0),)) -> sp.Expr:
    """``Σ coefficient · I(shift + d) / (16π²)`` of a term list at zero powers, in ``1/A, 1/B, 1/C``."""
    zero = {symbol: 0 for symbol in BRA[:3] + KET[:3]}
    total = sp.Integer(0)
    for shift, coefficient in terms:
        coefficient = sp.expand(coefficient.subs(zero))
        if coefficient == 0:
            continue
        for d in shifts:
            total += coefficient * inverse_sum_form(*(x + y for x, y in zip(shift, d)))
    return sp.expand(total)


@lru_cache(maxsize=None)
def zero_power_angular_pieces(L: int, la: int, lb: int):
    r"""The Hamiltonian of zero-power primitives of total ``L`` as integer polynomials.

    For the bra channel ``la`` and ket channel ``lb`` (the ``l`` of electron 1) and all powers
    zero, every matrix element over 16π² is a polynomial in ``a, b, c = 1/A, 1/B, 1/C``
    (:func:`twoel.integrals.symbolic.inverse_sum_form` of each generated term) whose
    coefficients depend on the exponents only through the kinetic prefactors:

    .. math:: D·O = \mathrm{piece}_O(a, b, c) \quad (O = \text{overlap, nuclear, repulsion}),
              \qquad D·T = \sum_m e_m \, \mathrm{piece}_m(a, b, c),

    with ``e_m`` monomials in the pair exponents ``(α1, β1, γ1, α2, β2, γ2)`` and one integer
    ``D``, so that every piece has integer coefficients.

    Returns
    -------
    (D, pieces, monomials)
        ``D`` int; ``pieces`` the list of SymPy polynomials (overlap, nuclear, repulsion, then
        one per kinetic monomial); ``monomials`` the exponent tuples of the ``e_m`` (degree ≤ 2).
    """
    lists = term_lists()
    forms = {name: _zero_power_sum(lists[angular_term_name(L, la, lb, "angular")], shifts)
             for name, shifts in _MULTIPLICATIVE.items()}
    kinetic = sp.expand((_zero_power_sum(lists[angular_term_name(L, la, lb, "grad11")])
                         + _zero_power_sum(lists[angular_term_name(L, la, lb, "grad22")])) / 2)
    split = sp.Poly(kinetic, *PAIR_EXPONENTS).terms()
    monomials = [tuple(int(x) for x in monomial) for monomial, _c in split]
    pieces = [forms["overlap"], forms["nuclear"], forms["repulsion"]] + [c for _m, c in split]
    denominator = 1
    for piece in pieces:
        for coefficient in sp.Poly(piece, INV_A, INV_B, INV_C).coeffs():
            denominator = sp.ilcm(denominator, sp.fraction(sp.Rational(coefficient))[1])
    pieces = [sp.expand(piece * denominator) for piece in pieces]
    return int(denominator), pieces, monomials


def zero_power_angular_source() -> str:
    """Python source of ``twoel/integrals/generated/angular_zero_power.py`` (deterministic)."""
    lines = [
        '"""Zero-power Hamiltonian pieces of L >= 1 primitives, generated by',
        "twoel.integrals.symbolic_states.zero_power_angular_source.",
        "",
        "Do not edit: regenerate with ``python -m twoel.integrals.generate``.  For the bra channel",
        "``la`` and ket channel ``lb`` (``l`` of electron 1) of total ``L``, ``l<L>_<la><lb>(a, b, c)``",
        "returns the integer polynomials in ``a, b, c = 1/A, 1/B, 1/C`` of",
        "``symbolic_states.zero_power_angular_pieces``: ``D`` times the overlap, nuclear (unit",
        "charge) and repulsion elements over 16π², then the kinetic pieces, ``D·T/(16π²) =",
        "Σ_m e_m piece_m`` with ``e_m`` the exponent monomial ``MONOMIALS[key][m]`` (powers of",
        "``α1, β1, γ1, α2, β2, γ2``) and ``D = DENOMINATORS[key]``.  Only ``+ - *`` and integers",
        "appear, so the code serves float64, double-double and (``_fixed``) fixed-point integers.",
        '"""',
        "",
        "#: largest total angular momentum generated",
        f"MAX_L = {MAX_L}",
        "",
    ]
    keys, table = [], {}
    for L in range(1, MAX_L + 1):
        for la in range(L + 1):
            for lb in range(L + 1):
                denominator, pieces, monomials = zero_power_angular_pieces(L, la, lb)
                key = (L, la, lb)
                keys.append(key)
                table[key] = (denominator, monomials)
                replacements, reduced = sp.cse([sp.factor(p) for p in pieces],
                                               symbols=sp.numbered_symbols("t"), optimizations="basic")
                name = f"l{L}_{la}{lb}"
                for suffix, arguments, code in (("", "a, b, c", _product_code),
                                                ("_fixed", "a, b, c, P", _fixed_code)):
                    lines += ["", f"def {name}{suffix}({arguments}):"]
                    lines += [f"    {symbol} = {code(value)}" for symbol, value in replacements]
                    lines += ["    return ("] + [f"        {code(expr)}," for expr in reduced] + ["    )", ""]
    lines += ["", "#: (L, la, lb) -> D", "DENOMINATORS = {"]
    lines += [f"    {key!r}: {table[key][0]}," for key in keys] + ["}", ""]
    lines += ["#: (L, la, lb) -> exponent monomials of the kinetic pieces", "MONOMIALS = {"]
    lines += [f"    {key!r}: {tuple(table[key][1])!r}," for key in keys] + ["}", ""]
    lines += ["#: (L, la, lb) -> (function, fixed-point function)", "PIECES = {"]
    lines += [f"    {key!r}: (l{key[0]}_{key[1]}{key[2]}, l{key[0]}_{key[1]}{key[2]}_fixed)," for key in keys]
    lines += ["}", ""]
    return "\n".join(lines)
