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
3. :func:`primitive_derivatives` gives ``∇n g / g`` and ``∇n² g / g`` of a primitive
   ``g = r1^i r2^j r12^k e^{-α r1 - β r2 - γ r12}`` as vectors ``u0 r1 + u1 r2``:
   ``∇1 g / g = (L1/r1 + L12/r12) r1 - (L12/r12) r2`` and
   ``∇2 g / g = -(L12/r12) r1 + (L2/r2 + L12/r12) r2`` with ``L1 = i/r1 - α``,
   ``L2 = j/r2 - β``, ``L12 = k/r12 - γ``;
   ``∇1² g / g = -i/r1² + 2 L1/r1 - k/r12² + 2 L12/r12 + |∇1 g/g|²`` (and 1 <-> 2).
   Scalar products use ``r1·r2 = (r1² + r2² - r12²)/2`` (:func:`dot`).
4. :func:`kinetic_integrand` is the symmetric kinetic-energy integrand
   ``½(∇1φ·∇1φ' + ∇2φ·∇2φ')`` of two primitives: the one derivation behind
   ``generated/kinetic_terms.py`` (:func:`kinetic_terms`, :func:`kinetic_source`), the kinetic
   pieces of ``generated/zero_power_kernels.py`` (:func:`zero_power_kinetic_pieces`) and, through
   :func:`s_gradient_product`, the S terms of ``generated/state_terms.py``
   (:mod:`twoel.integrals.symbolic_states`).  :func:`monomial_terms` expands any such integrand
   into ``r1^p r2^q r12^s`` times polynomial coefficients; :func:`term_function_lines` renders a
   term list as Python.
5. :func:`inverse_sum_form` and :func:`zero_power_source`: the integrals of purely exponential
   primitives as integer polynomials in ``1/(α+β)``, ``1/(β+γ)``, ``1/(γ+α)``.
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


# --- correlated primitives: gradients and their monomial expansion --------------------------
#: symbols of the bra primitive (index 1) and the ket primitive (index 2): powers, then exponents
BRA = sp.symbols("i1 j1 k1 a1 b1 g1")
KET = sp.symbols("i2 j2 k2 a2 b2 g2")
#: argument list of every generated term function
TERM_ARGUMENTS = ", ".join(str(symbol) for symbol in BRA + KET)


def dot(u, v) -> sp.Expr:
    """``u·v`` for vectors ``u = u0 r1 + u1 r2`` given as coefficient pairs ``(u0, u1)``.

    Uses ``r1·r1 = r1²``, ``r2·r2 = r2²`` and ``r1·r2 = (r1² + r2² - r12²)/2``.
    """
    d12 = (r1**2 + r2**2 - r12**2) / 2
    return u[0] * v[0] * r1**2 + (u[0] * v[1] + u[1] * v[0]) * d12 + u[1] * v[1] * r2**2


@lru_cache(maxsize=None)
def primitive_derivatives(symbols: tuple) -> tuple[dict, dict]:
    """Gradients and Laplacians of ``g = r1^i r2^j r12^k e^{-a r1 - b r2 - g r12}``, divided by ``g``.

    Parameters
    ----------
    symbols : tuple
        ``(i, j, k, a, b, g)``: :data:`BRA` or :data:`KET`.

    Returns
    -------
    (dict, dict)
        ``{1: ∇1 g/g, 2: ∇2 g/g}`` as coefficient pairs on ``(r1, r2)`` (see :func:`dot`), and
        ``{1: ∇1² g/g, 2: ∇2² g/g}`` (units: bohr⁻¹ and bohr⁻² once the symbols have values).
    """
    i, j, k, a, b, g = symbols
    L1, L2, L12 = i / r1 - a, j / r2 - b, k / r12 - g
    grad1 = (L1 / r1 + L12 / r12, -L12 / r12)
    grad2 = (-L12 / r12, L2 / r2 + L12 / r12)
    lap1 = -i / r1**2 + 2 * L1 / r1 - k / r12**2 + 2 * L12 / r12 + dot(grad1, grad1)
    lap2 = -j / r2**2 + 2 * L2 / r2 - k / r12**2 + 2 * L12 / r12 + dot(grad2, grad2)
    return {1: grad1, 2: grad2}, {1: lap1, 2: lap2}


def s_gradient_product(n: int, m: int) -> sp.Expr:
    """``∇n g_bra · ∇m g_ket / (g_bra g_ket)`` for S (scalar) primitives, ``n, m`` in ``{1, 2}``."""
    return dot(primitive_derivatives(BRA)[0][n], primitive_derivatives(KET)[0][m])


def kinetic_integrand() -> sp.Expr:
    """The symmetric kinetic integrand ``½(∇1g·∇1g' + ∇2g·∇2g') / (g g')`` of two S primitives.

    This is the one derivation of the kinetic energy: :func:`kinetic_terms` expands it, the
    zero-power pieces of :func:`zero_power_forms` are its value at zero powers, and the S state
    terms ``s_grad11``/``s_grad22`` of :mod:`twoel.integrals.symbolic_states` are its two halves.
    """
    return (s_gradient_product(1, 1) + s_gradient_product(2, 2)) / 2


def monomial_terms(expr: sp.Expr, lift: int = 4) -> tuple[tuple[tuple[int, int, int], sp.Expr], ...]:
    """Expand ``expr`` into ``((p, q, s), coefficient)`` with ``expr = Σ coefficient r1^p r2^q r12^s``.

    ``lift`` must be at least the largest inverse power present (SymPy raises otherwise); the
    terms come sorted by shift, each coefficient factored.
    """
    poly = sp.Poly(sp.expand(expr * (r1 * r2 * r12) ** lift), r1, r2, r12)
    return tuple(((p - lift, q - lift, s - lift), sp.factor(coefficient))
                 for (p, q, s), coefficient in sorted(poly.terms()))


def term_function_lines(name: str, terms, doc: str | None = None) -> list[str]:
    """Python lines of ``def name(i1, ..., g2)`` returning the term list ``terms``."""
    lines = [f"def {name}({TERM_ARGUMENTS}):"]
    if doc:
        lines.append(f'    """{doc}"""')
    lines.append("    return [")
    lines += [f"        ({shift!r}, {sp.pycode(coefficient)})," for shift, coefficient in terms]
    return lines + ["    ]", ""]


@lru_cache(maxsize=None)
def kinetic_terms() -> tuple[tuple[tuple[int, int, int], sp.Expr], ...]:
    """:func:`kinetic_integrand` as ``((p, q, s), coefficient)``.

    The integral of the kinetic matrix element is then
    ``Σ coefficient · I(i1+i2+p, j1+j2+q, k1+k2+s; a1+a2, b1+b2, g1+g2)``.
    """
    return monomial_terms(kinetic_integrand())


def kinetic_source() -> str:
    """Python source of ``twoel/integrals/generated/kinetic_terms.py`` (deterministic)."""
    lines = [
        '"""Kinetic-energy integrand terms, generated by twoel.integrals.symbolic.kinetic_source.',
        "",
        "Do not edit: regenerate with ``python -m twoel.integrals.generate``.  Each entry is the",
        "shift ``(p, q, s)`` of the powers of ``(r1, r2, r12)`` and a function of the bra powers",
        "and exponents ``(i1, j1, k1, a1, b1, g1)`` and the ket ones ``(i2, ..., g2)``.",
        '"""',
        "",
        "",
    ]
    lines += term_function_lines("kinetic_terms", kinetic_terms(),
                                 "Return ``[((p, q, s), coefficient), ...]``; arguments may be NumPy arrays.")
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


#: prefactors (bra exponents ``a1, b1, g1``, ket ``a2, b2, g2``) of the zero-power kinetic pieces;
#: :func:`twoel.integrals.zero_power.kinetic_numerator` combines the pieces with four times these
ZERO_POWER_KINETIC_PREFACTORS = {
    "overlap": (BRA[3] * KET[3] + BRA[4] * KET[4] + 2 * BRA[5] * KET[5]) / 2,
    "kinetic_1": (BRA[3] * KET[5] + KET[3] * BRA[5]) / 4,
    "kinetic_2": (BRA[4] * KET[5] + KET[4] * BRA[5]) / 4,
}


@lru_cache(maxsize=None)
def zero_power_kinetic_pieces() -> dict[str, sp.Expr]:
    """:func:`kinetic_terms` at zero powers, split as ``Σ prefactor · piece`` (pieces over 16π²).

    Each term's coefficient at ``i = j = k = 0`` must be ``±`` one of
    :data:`ZERO_POWER_KINETIC_PREFACTORS` (else :class:`ArithmeticError`); the piece of a
    prefactor is the signed sum of :func:`inverse_sum_form` over its shifts.
    """
    zero = {symbol: 0 for symbol in BRA[:3] + KET[:3]}
    pieces = {name: sp.Integer(0) for name in ZERO_POWER_KINETIC_PREFACTORS}
    for shift, coefficient in kinetic_terms():
        coefficient = sp.expand(coefficient.subs(zero))
        if coefficient == 0:
            continue
        for name, prefactor in ZERO_POWER_KINETIC_PREFACTORS.items():
            ratio = sp.cancel(coefficient / prefactor)
            if ratio.is_Number:
                pieces[name] += ratio * inverse_sum_form(*shift)
                break
        else:
            raise ArithmeticError(f"zero-power kinetic coefficient {coefficient} of {shift} has no piece")
    return {name: sp.expand(piece) for name, piece in pieces.items()}


def zero_power_forms() -> dict[str, sp.Expr]:
    """The combinations a zero-power basis uses, each divided by 16π².

    ``overlap = I(0,0,0)``, ``nuclear = I(-1,0,0) + I(0,-1,0)``, ``repulsion = I(0,0,-1)``, and the
    kinetic pieces of :func:`zero_power_kinetic_pieces`, which come out as
    ``kinetic_1 = I(-1,0,1) + I(1,0,-1) - I(-1,2,-1)`` and
    ``kinetic_2 = I(0,-1,1) + I(0,1,-1) - I(2,-1,-1)``: with all powers zero the kinetic element
    is ``½(α1α2 + β1β2 + 2γ1γ2)·overlap + ¼(α1γ2 + α2γ1)·kinetic_1 + ¼(β1γ2 + β2γ1)·kinetic_2``.
    """
    f = inverse_sum_form
    kinetic = zero_power_kinetic_pieces()
    if kinetic["overlap"] != f(0, 0, 0):
        raise ArithmeticError("the zero-power kinetic element is not a multiple of the overlap")
    return {
        "overlap": f(0, 0, 0),
        "nuclear": sp.expand(f(-1, 0, 0) + f(0, -1, 0)),
        "repulsion": f(0, 0, -1),
        "kinetic_1": kinetic["kinetic_1"],
        "kinetic_2": kinetic["kinetic_2"],
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


def _wrap(expr: sp.Expr, render=None) -> str:
    """``render(expr)`` (default :func:`_product_code`), parenthesized if ``expr`` is a sum."""
    text = (render or _product_code)(expr)
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
        return _fixed_product([_wrap(base, _fixed_code)] * int(exponent))
    if expr.is_Mul:
        coefficient, rest = expr.as_coeff_Mul()
        factors = []
        for arg in sorted(sp.Mul.make_args(rest), key=sp.default_sort_key):
            if arg.is_Pow:
                factors.extend([_wrap(arg.args[0], _fixed_code)] * int(arg.args[1]))
            else:
                factors.append(_wrap(arg, _fixed_code))
        text = _fixed_product(factors)
        if coefficient == 1:
            return text
        if coefficient == -1:
            return f"-{text}"
        return f"{int(coefficient)}*{text}"
    if expr.is_Add:
        return _sum_code(expr, _fixed_code)
    raise ArithmeticError(f"cannot render {expr!r}")  # pragma: no cover


def _fixed_product(factors: list[str]) -> str:
    text = factors[0]
    for factor in factors[1:]:
        text = f"(({text}*{factor}) >> P)"
    return text


def zero_power_source() -> str:
    """Python source of ``twoel/integrals/generated/zero_power_kernels.py`` (deterministic)."""
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
