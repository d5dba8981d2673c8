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


def pair_sums(bra: np.ndarray, ket: np.ndarray):
    """Summed exponents ``(α, β, γ)`` of all pairs, each of shape ``(P, Q)``."""
    return tuple(bra[:, k][:, None] + ket[:, k][None, :] for k in range(3))


def _inverse_sums(alpha, beta, gamma):
    return 1.0 / (alpha + beta), 1.0 / (beta + gamma), 1.0 / (gamma + alpha)


def kinetic_from_pieces(bra, ket, overlap, kinetic_1, kinetic_2):
    """Kinetic matrix ½(∇1·∇1 + ∇2·∇2) from the generated pieces (all divided by 16π²).

    ``T = ½(α1α2 + β1β2 + 2γ1γ2)·I000 + ¼(α1γ2 + α2γ1)·K1 + ¼(β1γ2 + β2γ1)·K2`` (see
    :func:`twoel.integrals.symbolic.zero_power_forms`).
    """
    a1, b1, g1 = (bra[:, k][:, None] for k in range(3))
    a2, b2, g2 = (ket[:, k][None, :] for k in range(3))
    return (0.5 * (a1 * a2 + b1 * b2 + 2.0 * g1 * g2) * overlap
            + 0.25 * (a1 * g2 + a2 * g1) * kinetic_1 + 0.25 * (b1 * g2 + b2 * g1) * kinetic_2)


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
    al, be, ga = pair_sums(bra, ket)
    a, b, c = _inverse_sums(al, be, ga)
    pieces = None
    out = {}
    for name, spec in operators.items():
        if spec == "kinetic" or spec in _SHARED:
            if pieces is None:
                pieces = _exponential.zero_power_integrals(a, b, c)
            if spec == "kinetic":
                ov, _nu, _re, k1, k2 = pieces
                out[name] = kinetic_from_pieces(bra, ket, ov, k1, k2)
            else:
                out[name] = pieces[_SHARED[spec]]
        else:
            value = 0.0
            for coefficient, shift in spec:
                value = value + coefficient * _exponential.MONOMIALS[shift](a, b, c)
            out[name] = np.broadcast_to(value, al.shape)
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
