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


# --- zero-power (purely exponential) primitives -------------------------------------------------
#: symbols of the inverse sums a = 1/A, b = 1/B, c = 1/C with A = α+β, B = β+γ, C = γ+α
INV_A, INV_B, INV_C = sp.symbols("a b c", positive=True)

#: single integrals with a closed form in the generated zero-power module (Hamiltonian pieces
#: and the simple moments ⟨r⟩, ⟨r²⟩ used for expectation values)
ZERO_POWER_MONOMIALS = ((0, 0, 0), (-1, 0, 0), (0, -1, 0), (0, 0, -1), (1, 0, 0), (0, 1, 0),
                        (0, 0, 1), (2, 0, 0), (0, 2, 0), (0, 0, 2))


@lru_cache(maxsize=None)
def inverse_sum_form(a: int, b: int, c: int) -> sp.Expr:
    """``I(a, b, c) / (16π²)`` as a polynomial in ``1/A, 1/B, 1/C`` (integer coefficients).

    Derived from :func:`closed_form` by substituting ``α = (A + C - B)/2``, ``β = (A + B - C)/2``,
    ``γ = (B + C - A)/2`` and then ``A = 1/a`` etc.; the result is checked to be a polynomial.
    """
    A, B, C = sp.symbols("A B C", positive=True)
    expr = closed_form(a, b, c) / (16 * sp.pi**2)
    expr = expr.subs({alpha: (A + C - B) / 2, beta: (A + B - C) / 2, gamma: (B + C - A) / 2},
                     simultaneous=True)
    expr = sp.expand(sp.simplify(expr.subs({A: 1 / INV_A, B: 1 / INV_B, C: 1 / INV_C},
                                           simultaneous=True)))
    poly = sp.Poly(expr, INV_A, INV_B, INV_C)  # raises if not a polynomial
    if not all(coef.is_integer for coef in poly.coeffs()):
        raise ArithmeticError(f"I{(a, b, c)} is not an integer polynomial in 1/A, 1/B, 1/C")
    return poly.as_expr()


def zero_power_forms() -> dict[str, sp.Expr]:
    """The combinations a zero-power basis uses, each divided by 16π².

    ``overlap = I(0,0,0)``, ``nuclear = I(-1,0,0) + I(0,-1,0)``, ``repulsion = I(0,0,-1)``,
    ``kinetic_1 = I(-1,0,1) + I(1,0,-1) - I(-1,2,-1)`` and
    ``kinetic_2 = I(0,-1,1) + I(0,1,-1) - I(2,-1,-1)``; with all powers zero the kinetic element
    of :func:`kinetic_terms` is
    ``½(α1α2 + β1β2 + 2γ1γ2)·overlap + ¼(α1γ2 + α2γ1)·kinetic_1 + ¼(β1γ2 + β2γ1)·kinetic_2``.
    """
    f = inverse_sum_form
    return {
        "overlap": f(0, 0, 0),
        "nuclear": sp.expand(f(-1, 0, 0) + f(0, -1, 0)),
        "repulsion": f(0, 0, -1),
        "kinetic_1": sp.expand(f(-1, 0, 1) + f(1, 0, -1) - f(-1, 2, -1)),
        "kinetic_2": sp.expand(f(0, -1, 1) + f(0, 1, -1) - f(2, -1, -1)),
    }


def _product_code(expr: sp.Expr) -> str:
    """Python text of ``expr`` using only ``+``, ``-``, ``*`` and integers (no powers, no floats)."""
    if expr.is_Symbol:
        return expr.name
    if expr.is_Integer:
        return str(int(expr))
    if expr.is_Pow:
        base, exponent = expr.args
        if not (exponent.is_Integer and exponent > 0):
            raise ArithmeticError(f"unexpected power {expr}")
        return "*".join([_wrap(base)] * int(exponent))
    if expr.is_Mul:
        return "*".join(_wrap(arg) for arg in sorted(expr.args, key=sp.default_sort_key))
    if expr.is_Add:
        return _sum_code(expr, _product_code)
    raise ArithmeticError(f"cannot render {expr!r}")  # pragma: no cover - derivation guard


def _sum_code(expr: sp.Expr, render) -> str:
    """Render the terms of a sum in canonical order, folding leading minus signs into ``-``."""
    text = ""
    for arg in sorted(expr.args, key=sp.default_sort_key):
        piece = render(arg)
        if piece.startswith("-"):
            text += (" - " + piece[1:]) if text else piece
        else:
            text += (" + " + piece) if text else piece
    return text


def _wrap(expr: sp.Expr) -> str:
    text = _product_code(expr)
    return f"({text})" if expr.is_Add else text


def _monomial_name(shift) -> str:
    return "moment_" + "_".join(("m" + str(-x)) if x < 0 else str(x) for x in shift)


def _fixed_code(expr: sp.Expr) -> str:
    """Like :func:`_product_code` but every product of two fixed-point factors is shifted back
    by ``P`` bits (``((x*y) >> P)``), so all values stay at the scale ``2^P``."""
    if expr.is_Symbol:
        return expr.name
    if expr.is_Integer:
        raise ArithmeticError("bare integer in a fixed-point expression")  # pragma: no cover
    if expr.is_Pow:
        base, exponent = expr.args
        return _fixed_product([_fixed_wrap(base)] * int(exponent))
    if expr.is_Mul:
        coefficient, rest = expr.as_coeff_Mul()
        factors = []
        for arg in sorted(sp.Mul.make_args(rest), key=sp.default_sort_key):
            if arg.is_Pow:
                factors.extend([_fixed_wrap(arg.args[0])] * int(arg.args[1]))
            else:
                factors.append(_fixed_wrap(arg))
        text = _fixed_product(factors)
        if coefficient == 1:
            return text
        if coefficient == -1:
            return f"-{text}"
        return f"{int(coefficient)}*{text}"
    if expr.is_Add:
        return _sum_code(expr, _fixed_code)
    raise ArithmeticError(f"cannot render {expr!r}")  # pragma: no cover


def _fixed_wrap(expr: sp.Expr) -> str:
    text = _fixed_code(expr)
    return f"({text})" if expr.is_Add else text


def _fixed_product(factors: list[str]) -> str:
    text = factors[0]
    for factor in factors[1:]:
        text = f"(({text}*{factor}) >> P)"
    return text


def zero_power_source() -> str:
    """Python source of ``twoel/integrals/_exponential.py`` (deterministic)."""
    forms = zero_power_forms()
    names = list(forms)
    replacements, reduced = sp.cse([sp.factor(forms[n]) for n in names],
                                   symbols=sp.numbered_symbols("t"), optimizations="basic")
    lines = [
        '"""Zero-power integrals in 1/A, 1/B, 1/C, generated by twoel.integrals.symbolic.zero_power_source.',
        "",
        "Do not edit: regenerate with ``python -m twoel.integrals.generate``.  With",
        "``A = α+β, B = β+γ, C = γ+α`` of a primitive pair and ``a, b, c = 1/A, 1/B, 1/C``, each value",
        "is the integral (or combination, see ``symbolic.zero_power_forms``) divided by 16π².  Only",
        "``+ - *`` and integer constants appear, so the same code serves float64 arrays, double-double",
        "numbers and exact fixed-point integers.",
        '"""',
        "",
        "#: names of the values returned by :func:`zero_power_integrals`, in order",
        f"NAMES = {tuple(names)!r}",
        "#: total degree of each polynomial in (a, b, c)",
        f"DEGREES = {tuple(int(sp.Poly(forms[n], INV_A, INV_B, INV_C).total_degree()) for n in names)!r}",
        "",
        "",
    ]
    # the same common subexpressions rendered twice: float/double-double code and fixed point
    for gap, header, doc, code in (
            ([], "def zero_power_integrals(a, b, c):",
             "Return ``(overlap, nuclear, repulsion, kinetic_1, kinetic_2)`` divided by 16π².",
             _product_code),
            ([""], "def zero_power_integrals_fixed(a, b, c, P):",
             "As :func:`zero_power_integrals` for integers at scale ``2^P`` (results at ``2^P``).",
             _fixed_code)):
        lines += gap + [header, f'    """{doc}"""']
        lines += [f"    {symbol} = {code(value)}" for symbol, value in replacements]
        lines += ["    return ("] + [f"        {code(expr)}," for expr in reduced] + ["    )", ""]
    for shift in ZERO_POWER_MONOMIALS:
        expr = sp.factor(inverse_sum_form(*shift))
        lines += ["", f"def {_monomial_name(shift)}(a, b, c):",
                  f'    """``I{shift!r} / (16π²)``."""',
                  f"    return {_product_code(expr)}", ""]
    lines += ["", "#: single integrals by power shift ``(p, q, s)`` of ``(r1, r2, r12)``", "MONOMIALS = {"]
    for shift in ZERO_POWER_MONOMIALS:
        lines.append(f"    {shift!r}: {_monomial_name(shift)},")
    lines += ["}", ""]
    return "\n".join(lines)
