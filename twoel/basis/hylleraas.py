r"""Hylleraas basis ``r1^i r2^j r12^k exp(-α r1 - β r2)``, exchange-(anti)symmetrized.

Terms are selected by the total order ``ω``: all ``(i, j, k)`` with ``i + j + k <= ω``
(Hylleraas, Z. Phys. 54, 347 (1929); the ``ω`` ordering as in Drake, Springer Handbook of
Atomic, Molecular and Optical Physics (2006), ch. 11), or by an explicit term list.

Options
-------
``exponents`` : 1 or 2
    One exponent (``α = β``; then ``(i, j, k)`` and ``(j, i, k)`` give the same symmetrized
    function, so only ``i <= j`` is kept, ``i < j`` for triplets) or two independent exponents.
``terms`` : sequence of 3-tuples
    Explicit powers instead of all terms up to ``ω``.
``coordinates`` : ``"r"`` or ``"stu"``
    With ``"stu"`` the explicit terms are powers ``(l, m, n)`` of ``s = r1 + r2``,
    ``t = r1 - r2``, ``u = r12`` with ``exp(-ζ s)`` (Hylleraas' own form; needs one exponent);
    e.g. ``[(0,0,0), (0,0,1), (0,2,0)]`` is his 3-term function.
"""

from __future__ import annotations

from math import comb

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.system import Ion, State
from twoel.basis.base import Parameter, Support, TrialFamily


def omega_terms(omega: int, one_exponent: bool, sign: int) -> list[tuple[int, int, int]]:
    """All ``(i, j, k)`` with ``i + j + k <= omega`` that give distinct, non-vanishing functions."""
    terms = []
    for total in range(omega + 1):
        for k in range(total + 1):
            for i in range(total - k + 1):
                j = total - k - i
                if one_exponent and (i > j or (sign < 0 and i == j)):
                    continue
                terms.append((i, j, k))
    return terms


#: the largest power of an explicit term: ω ≤ 16 is the family's range, and powers near 100
#: overflow the double-precision factorials of the integrals (common practice: refuse long before)
MAX_TERM_POWER = 60


def _parse_terms(terms) -> list[tuple[int, int, int]]:
    try:
        parsed = [tuple(int(x) for x in term) for term in terms]
    except (TypeError, ValueError, OverflowError):
        raise InputError(f"'terms' must be a list of three non-negative integers each, got {terms!r}")
    for term, original in zip(parsed, terms):
        if len(term) != 3 or min(term) < 0 or any(int(x) != x for x in original):
            raise InputError(f"each term must be three non-negative integers, got {original!r}")
        if max(term) > MAX_TERM_POWER:
            raise InputError(f"each power of a term must be at most {MAX_TERM_POWER} (the integrals "
                             f"overflow double precision near 100), got {str(original)[:80]}")
    if not parsed:
        raise InputError("'terms' must not be empty")
    if len(set(parsed)) != len(parsed):
        raise InputError("'terms' contains a duplicate term")
    return parsed


def stu_contraction(terms, zeta: float, sign: int) -> CorrelatedBasis:
    """Basis of ``s^l t^m u^n exp(-ζ s)`` functions expanded into ``r1, r2, r12`` primitives."""
    primitives: dict[tuple[int, int, int], int] = {}
    columns = []
    for l, m, n in terms:
        if (m % 2 == 1) == (sign > 0):
            kind = "even" if sign > 0 else "odd"
            raise InputError(f"term s^{l} t^{m} u^{n}: the power of t must be {kind} for this spin")
        column: dict[int, float] = {}
        # s^l t^m = sum_{p,q} C(l,p) C(m,q) (-1)^(m-q) r1^(p+q) r2^(l-p+m-q)
        for p in range(l + 1):
            for q in range(m + 1):
                key = (p + q, l - p + m - q, n)
                index = primitives.setdefault(key, len(primitives))
                column[index] = column.get(index, 0.0) + comb(l, p) * comb(m, q) * (-1) ** (m - q)
        columns.append(column)
    contraction = np.zeros((len(primitives), len(columns)))
    for col, column in enumerate(columns):
        for index, value in column.items():
            contraction[index, col] = value
    # (1 ± P12) doubles a function of definite symmetry: halve so the contracted function is itself
    contraction *= 0.5
    powers = np.array(list(primitives), dtype=int)
    exponents = np.tile([zeta, zeta, 0.0], (len(primitives), 1))
    labels = tuple(f"s^{l} t^{m} u^{n}" for l, m, n in terms)
    return CorrelatedBasis(powers, exponents, sign=sign, contraction=contraction, labels=labels)


class HylleraasFamily(TrialFamily):
    name = "hylleraas"
    summary = "r1^i r2^j r12^k exp(-α r1 - β r2), i + j + k <= ω, (anti)symmetrized"
    size_meaning = "ω, the largest total power i + j + k"
    default_size = 6
    min_size = 0
    max_size = 16
    option_names = ("exponents", "terms", "coordinates")
    #: S states in float64 with an error bar from the nested ω - 2, ω - 1, ω; ω = 8 when twoel
    #: chooses the size for a state
    support = Support(L_values=(0,), sizes={0: 8}, error_bar_L=(0,), default_for=("1^1S",))

    def nested_sizes(self, size: int) -> list[int]:
        """``ω - 2`` and ``ω - 1``: with the same exponents their terms are subsets of ω's."""
        return [size - 2, size - 1] if size is not None and size >= 2 else []

    def _options(self, ion: Ion, state: State, options: dict) -> tuple[int, str, list | None]:
        coordinates = options.get("coordinates", "r")
        if coordinates not in ("r", "stu"):
            raise InputError(f"'coordinates' must be 'r' or 'stu', got {coordinates!r}")
        default_exponents = 1 if coordinates == "stu" or state.is_singlet and ion.Z >= 2 else 2
        exponents = options.get("exponents", default_exponents)
        if exponents not in (1, 2):
            raise InputError(f"'exponents' must be 1 or 2, got {exponents!r}")
        if coordinates == "stu" and exponents != 1:
            raise InputError("'stu' coordinates use the single exponent exp(-ζ s)")
        terms = options.get("terms")
        if coordinates == "stu" and terms is None:
            raise InputError("'stu' coordinates need an explicit 'terms' list")
        return exponents, coordinates, None if terms is None else _parse_terms(terms)

    def check_state(self, state: State) -> None:
        super().check_state(state)

    def parameters(self, ion: Ion, state: State, size, options) -> list[Parameter]:
        exponents, _coordinates, _terms = self._options(ion, state, options)
        Z = ion.Z
        upper = 20 * Z + 20
        if exponents == 1:
            start = max(Z - 0.3125, 0.3) if state.n == 1 else max(Z - 0.5, 0.3) / 1.5
            return [Parameter("alpha", start, 1e-2, upper)]
        if state.is_singlet and state.n == 1:
            return [Parameter("alpha", Z + 0.1, 1e-2, upper), Parameter("beta", max(Z - 0.6, 0.3), 1e-2, upper)]
        return [Parameter("alpha", Z, 1e-2, upper), Parameter("beta", max(Z - 1.0, 0.25) / state.n, 1e-2, upper)]

    def build(self, ion: Ion, state: State, size, values, options) -> CorrelatedBasis:
        exponents, coordinates, terms = self._options(ion, state, options)
        sign = state.exchange_sign
        alpha = values["alpha"]
        beta = values.get("beta", alpha) if exponents == 2 else alpha
        if coordinates == "stu":
            return stu_contraction(terms, alpha, sign)
        if terms is None:
            terms = omega_terms(size, exponents == 1, sign)
        elif exponents == 1:
            canonical = {(min(i, j), max(i, j), k) for i, j, k in terms}
            if len(canonical) != len(terms):
                raise InputError("with one exponent, terms (i, j, k) and (j, i, k) are the same "
                                 "function; list only one of them")
            if sign < 0 and any(i == j for i, j, _k in terms):
                raise UnsupportedError("a triplet term with i = j vanishes for one exponent")
        if not terms:
            raise UnsupportedError(f"no Hylleraas term of order <= {size} exists for {state.label}")
        powers = np.array(terms, dtype=int)
        exps = np.tile([alpha, beta, 0.0], (len(terms), 1))
        labels = tuple(f"r1^{i} r2^{j} r12^{k}" for i, j, k in terms)
        return CorrelatedBasis(powers, exps, sign=sign, labels=labels)


FAMILY = HylleraasFamily()
