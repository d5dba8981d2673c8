r"""Fast float64 matrices of purely exponential primitives ``exp(-α r1 - β r2 - γ r12)``.

For a primitive pair the integrals are polynomials in ``a = 1/A``, ``b = 1/B``, ``c = 1/C`` with
``A = α+β``, ``B = β+γ``, ``C = γ+α`` of the summed exponents, times 16π² (derived with SymPy in
:mod:`twoel.integrals.symbolic`, emitted into :mod:`twoel.integrals.generated.zero_power_kernels`).  Whole
``P × P`` matrices are evaluated as a handful of NumPy array expressions, which makes the
Hamiltonian of ``N = 1000`` exponential functions a fraction of a second (the generic
table-based path of :mod:`twoel.basis.correlated` would build a full integral table per pair).

The exponentially correlated basis is that of Korobov, Phys. Rev. A 61, 064503 (2000), and
Frolov & Smith, J. Phys. B 28, L449 (1995).
"""

from __future__ import annotations


import numpy as np

from twoel.integrals.closed_forms import SIXTEEN_PI_SQUARED
from twoel.integrals.generated import zero_power_kernels as _exponential



def supports(operators: dict) -> bool:
    """True if every operator is ``"kinetic"`` or an exchange-symmetric sum of monomials that
    have a generated closed form (others go to the generic builder)."""
    for spec in operators.values():
        if spec == "kinetic":
            continue
        try:
            terms = {}
            for coefficient, shift in spec:
                key = tuple(int(x) for x in shift)
                if key not in _exponential.MONOMIALS:
                    return False
                terms[key] = terms.get(key, 0.0) + float(coefficient)
        except (TypeError, ValueError):
            return False
        swapped = {(q, p, s): v for (p, q, s), v in terms.items()}
        if swapped != terms:
            return False
    return True


def columns(bra, ket, convert=np.asarray):
    """``(α1, β1, γ1)`` of the bra rows as columns and ``(α2, β2, γ2)`` of the kets as rows,
    each converted to the number type (identity for float64, :class:`~twoel.integrals.doubledouble.DD`
    for double-double); they broadcast to the ``(P, Q)`` pair grid."""
    return (tuple(convert(bra[:, k][:, None]) for k in range(3)),
            tuple(convert(ket[:, k][None, :]) for k in range(3)))


def exponent_sums(first, second):
    """``A = α+β``, ``B = β+γ``, ``C = γ+α`` of every pair of bra ``first = (α1, β1, γ1)`` and
    ket ``second = (α2, β2, γ2)``, each formed as ``(x1 + x2) + (y1 + y2)`` (exact in
    double-double and in fixed point)."""
    (a1, b1, g1), (a2, b2, g2) = first, second
    al, be, ga = a1 + a2, b1 + b2, g1 + g2
    return al + be, be + ga, ga + al


def kinetic_numerator(first, second, overlap, kinetic_1, kinetic_2):
    """Four times the kinetic matrix ½(∇1·∇1 + ∇2·∇2) from the generated pieces.

    ``4T = 2(α1α2 + β1β2 + 2γ1γ2)·I000 + (α1γ2 + α2γ1)·K1 + (β1γ2 + β2γ1)·K2`` (see
    :func:`twoel.integrals.symbolic.zero_power_forms`) for bra exponents ``first`` and ket
    exponents ``second``.  Only ``+``, ``*`` and integer multiples are used, so the same line
    serves float64, double-double and fixed point; the caller divides by 4 (a multiplication
    by 0.25 or a shift).
    """
    (a1, b1, g1), (a2, b2, g2) = first, second
    c0 = a1 * a2 + b1 * b2 + g1 * g2 * 2
    return c0 * overlap * 2 + (a1 * g2 + a2 * g1) * kinetic_1 + (b1 * g2 + b2 * g1) * kinetic_2


#: rows evaluated together (keeps the temporaries in cache)
ROW_BLOCK = 48

#: operator specifications that the shared (common-subexpression) evaluation covers directly
_SHARED = {
    ((1.0, (0, 0, 0)),): 0,
    ((1.0, (-1, 0, 0)), (1.0, (0, -1, 0))): 1,
    ((1.0, (0, 0, -1)),): 2,
}


def _normalized(spec):
    if spec == "kinetic":
        return "kinetic"
    return tuple((float(coefficient), tuple(int(x) for x in shift)) for coefficient, shift in spec)


def _block_values(bra, ket, operators):
    """Operator values for one block of bra rows against the given ket columns."""
    first, second = columns(bra, ket)
    A, B, C = exponent_sums(first, second)
    a, b, c = 1.0 / A, 1.0 / B, 1.0 / C
    pieces = None
    out = {}
    for name, spec in operators.items():
        if spec == "kinetic" or spec in _SHARED:
            if pieces is None:
                pieces = _exponential.zero_power_integrals(a, b, c)
            if spec == "kinetic":
                ov, _nu, _re, k1, k2 = pieces
                out[name] = 0.25 * kinetic_numerator(first, second, ov, k1, k2)
            else:
                out[name] = pieces[_SHARED[spec]]
        else:
            value = 0.0
            for coefficient, shift in spec:
                value = value + coefficient * _exponential.MONOMIALS[shift](a, b, c)
            out[name] = np.broadcast_to(value, A.shape)
    return out


def primitive_matrices(exponents: np.ndarray, sign: int, operators: dict) -> dict[str, np.ndarray]:
    """``<χ_p|O|(1 ± P12) χ_q>`` for zero-power primitives (see :func:`twoel.basis.correlated.primitive_operator_matrices`).

    Both ``<χ_p|O|χ_q>`` and ``<χ_p|O|P12 χ_q>`` are symmetric in ``p, q`` for an
    exchange-symmetric operator, so only the upper triangle is evaluated, in blocks of rows.

    Parameters
    ----------
    exponents : ndarray, shape (P, 3)
        ``(α, β, γ)`` of each primitive (bohr⁻¹).
    sign : int
        +1 or -1, the exchange sign.
    operators : dict
        As for :func:`twoel.basis.correlated.primitive_operator_matrices`; must satisfy :func:`supports`.
    """
    exponents = np.asarray(exponents, dtype=float)
    operators = {name: _normalized(spec) for name, spec in operators.items()}
    P = exponents.shape[0]
    result = {name: np.zeros((P, P)) for name in operators}
    swapped = exponents[:, [1, 0, 2]]
    for start in range(0, P, ROW_BLOCK):
        stop = min(start + ROW_BLOCK, P)
        bra = exponents[start:stop]
        direct = _block_values(bra, exponents[start:], operators)
        exchange = _block_values(bra, swapped[start:], operators)
        for name in operators:
            result[name][start:stop, start:] = direct[name] + sign * exchange[name]
    for name, upper in result.items():
        # blocks filled the upper triangle (and both halves of the diagonal blocks): mirror it
        full = np.triu(upper)
        full += np.triu(upper, 1).T
        full *= SIXTEEN_PI_SQUARED
        result[name] = full
    return result
