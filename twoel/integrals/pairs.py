r"""The one evaluator of correlated pair integrals and operator matrices (any L <= 3).

Every matrix of the package between correlated primitives
``χ = r1^i r2^j r12^k e^{-α r1 - β r2 - γ r12}`` (S, :class:`twoel.basis.correlated.CorrelatedBasis`)
or ``(ε·r1)^l (ε·r2)^(L-l) χ`` (:class:`twoel.basis.angular.AngularBasis`, ``P`` the ``L = 1``
case :class:`twoel.basis.p_basis.PBasis`) is a sum of integrals

.. math:: I(a, b, c; \alpha, \beta, \gamma) = \int\!\!\int r_1^a r_2^b r_{12}^c
          e^{-\alpha r_1 - \beta r_2 - \gamma r_{12}}\, d^3r_1\, d^3r_2

over the summed bra + ket exponents; only the zero-power Hamiltonian has a separate closed-form
path (:mod:`twoel.integrals.zero_power`).  Every ``I`` comes from the one series of
:mod:`twoel.integrals.series`, used in two ways:

tables
    bases with few distinct exponent sums (Hylleraas-type) take whole tables of powers
    (:func:`twoel.integrals.series.integral_table`, :func:`inverse_square_table`);
pair series
    bases with many distinct exponent sums (exponential-type) evaluate one power triple for all
    pairs at once (:class:`PairIntegrals`).

One index may be ``-2`` (``⟨1/r1²⟩``, ``(E - V)²`` and the global-operator δ forms), through
``K(p, q) = ∫_0^∞ (A+t)^{-p} (C+t)^{-q} dt`` (:func:`k_integral`).  The
integral is symmetric under simultaneous permutation of ``(r1, r2, r12)`` and ``(α, β, γ)``,
which reduces ``b = -2`` and ``c = -2`` to ``a = -2``.

Operators are lists of *pieces* ``(integrand, weight)``:

``integrand``  ``"unit"`` (multiplicative: the bare weight), ``"kinetic"`` (``½(∇1χ·∇1χ' +
               ∇2χ·∇2χ')``), ``"grad11"`` (``∇1χ·∇1χ'``), ``"grad22"``, ``"grad12"``
               (``(∇1χ·∇2χ' + ∇2χ·∇1χ')/2``), ``"laplacian"`` (``χ (-½∇²) χ'``, for checks),
               ``"lap1lap2"`` (``(∇1²χ ∇2²χ' + ∇2²χ ∇1²χ')/2``, for ``⟨p1² p2²⟩``);
``weight``     monomials ``[(coefficient, (da, db, dc)), ...]`` meaning
               ``Σ coefficient · r1^da r2^db r12^dc`` multiplying the integrand.

A bare monomial list ``[(coefficient, (da, db, dc)), ...]`` means ``[("unit", list)]`` and the
string ``"kinetic"`` means ``[("kinetic", [(1.0, (0, 0, 0))])]``.  The integrands are the SymPy
derivations of :mod:`twoel.integrals.symbolic` and :mod:`twoel.integrals.symbolic_states`
(generated ``generated/kinetic_terms.py`` and ``generated/state_terms.py``).  Basis functions are
``(1 ± P12)`` applied to the primitives (times the contraction, if any); as in
:mod:`twoel.basis.correlated` the common factor 2 of ``<(1±P)χ|O|(1±P)χ'> = 2(<χ|O|χ'> ± <χ|O|Pχ'>)``
is dropped.  A basis of ``L >= 1`` carries the channel ``l`` of every primitive
(``electron1_l``); each pair takes the term list of its bra and ket channels (the exchanged ket
has ``L - l``), selected by masks when a block holds several channel pairs.
"""

from __future__ import annotations

from collections import defaultdict

import numpy as np

from twoel.errors import InputError
from twoel.integrals.generated import state_terms as T
from twoel.integrals.generated.kinetic_terms import kinetic_terms
from twoel.integrals.series import (MAX_POWER, InverseSquareSeries, KValues, MasterSeries,
                                    check_exponents, integral_table)
#: bases with more distinct exponent sums per pair block get blocks sized by TABLE_ENTRIES
TABLE_ROWS = 16
#: table entries (float64) per pair block for bases with powers and many distinct exponents
TABLE_ENTRIES = 4_000_000
#: primitive pairs per block (bounds the memory of the pair arrays)
PAIR_BLOCK = 60_000
UNIT = [(1.0, (0, 0, 0))]
INTEGRANDS = ("unit", "kinetic", "grad11", "grad22", "grad12", "laplacian", "lap1lap2")


def k_integral(A, C, p: int, q: int) -> np.ndarray:
    """``K(p, q) = ∫_0^∞ (A+t)^{-p} (C+t)^{-q} dt`` for ``p, q >= 0``, ``p + q >= 2`` (see :class:`twoel.integrals.series.KValues`).

    Parameters
    ----------
    A, C : array_like
        Positive exponent sums (bohr⁻¹), same shape.
    p, q : int

    Returns
    -------
    ndarray of the shape of ``A``, in bohr^(p+q-1).
    """
    A, C = np.broadcast_arrays(np.asarray(A, dtype=float), np.asarray(C, dtype=float))
    if np.any(A <= 0) or np.any(C <= 0):
        raise InputError("K(p, q) needs positive A and C")
    return KValues(A, C).value(p, q).reshape(A.shape)


class PairIntegrals:
    """Integrals ``I(a, b, c)`` for a fixed set of exponent triples (one per pair), pair series.

    Parameters
    ----------
    alpha, beta, gamma : ndarray
        Summed bra + ket exponents (bohr⁻¹), any common shape.
    """

    def __init__(self, alpha, beta, gamma):
        alpha, beta, gamma = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (alpha, beta, gamma)))
        A, B, C = alpha + beta, beta + gamma, gamma + alpha
        check_exponents(A, B, C)
        self.shape = A.shape
        self.A, self.B, self.C = (x.reshape(-1) for x in (A, B, C))
        self._series = MasterSeries(self.A, self.B, self.C)
        self._inverse_square: dict = {}
        self._cache: dict = {}

    def __call__(self, a: int, b: int, c: int) -> np.ndarray:
        """``I(a, b, c)`` for every exponent triple; at most one index may be -2."""
        key = (a, b, c)
        if key not in self._cache:
            self._cache[key] = self._compute(a, b, c).reshape(self.shape)
        return self._cache[key]

    def _compute(self, a: int, b: int, c: int) -> np.ndarray:
        if min(a, b, c) < -2 or sum(x == -2 for x in (a, b, c)) > 1:
            raise InputError(f"integral I({a},{b},{c}) diverges")
        if a == -2:
            return self._minus_two(b, c, "A", "B", "C")
        if b == -2:  # r1 <-> r2: (A, B, C) -> (A, C, B)
            return self._minus_two(a, c, "A", "C", "B")
        if c == -2:  # r1 <-> r12: (A, B, C) -> (B, A, C)
            return self._minus_two(b, a, "B", "A", "C")
        return self._series.integral(a, b, c)

    def _minus_two(self, b: int, c: int, first: str, free: str, third: str) -> np.ndarray:
        """``I(-2, b, c)`` with the -2 index on the coordinate whose exponents enter ``first``
        and ``third`` (the ``A`` and ``C`` of the formula) and ``free`` the remaining sum."""
        key = (first, free, third)
        if key not in self._inverse_square:
            self._inverse_square[key] = InverseSquareSeries(*(getattr(self, x) for x in key))
        return self._inverse_square[key].integral(b, c)


def inverse_square_table(alpha, beta, gamma, max_power: int) -> np.ndarray:
    """``I(-2, b, c; α, β, γ)`` for ``-1 <= b, c <= max_power`` (see :class:`twoel.integrals.series.InverseSquareSeries`).

    Parameters
    ----------
    alpha, beta, gamma : array_like, shape (E,)
        Exponents (bohr⁻¹); ``α + β > 0``, ``α + γ > 0``, ``β + γ > 0``.
    max_power : int

    Returns
    -------
    ndarray, shape (E, L, L), ``L = max_power + 2``
        ``table[e, b + 1, c + 1]`` in bohr^(b+c+4).
    """
    alpha, beta, gamma = (np.atleast_1d(np.asarray(x, dtype=float)) for x in (alpha, beta, gamma))
    A, B, C = alpha + beta, beta + gamma, gamma + alpha
    check_exponents(A, B, C)
    return InverseSquareSeries(A, B, C).table(max_power)


class ExponentTables:
    """Whole integral tables over the distinct exponent sums of a set of pairs.

    Used when the powers differ between pairs (Hylleraas-type bases, few distinct sums).
    ``rows`` are the distinct summed exponent triples and ``index[n]`` the row of pair ``n``.
    The tables (powers >= -1 from :func:`twoel.integrals.series.integral_table`, one power -2
    from :func:`inverse_square_table` in each of the three positions) are built lazily and
    grown when a larger power is needed.
    """

    def __init__(self, rows: np.ndarray, index: np.ndarray):
        self.rows, self.index = rows, index
        self.table = None
        self.max_power = -1
        self.square: dict = {}

    def reserve(self, max_power: int) -> None:
        """Build the regular table up to ``max_power`` now (avoids regrowing it term by term)."""
        if self.table is None or max_power > self.max_power:
            self.max_power = max_power
            self.table = integral_table(self.rows[:, 0], self.rows[:, 1], self.rows[:, 2], max_power)

    def _regular(self, a, b, c, index) -> np.ndarray:
        need = int(max(a.max(), b.max(), c.max()))
        if self.table is None or need > self.max_power:
            self.reserve(max(need, min(self.max_power + 4, MAX_POWER)))
        return self.table[index, a + 1, b + 1, c + 1]

    def _square_table(self, position: int, need: int) -> np.ndarray:
        table, size = self.square.get(position, (None, -1))
        if table is None or need > size:
            size = max(need, min(2 * size, MAX_POWER), 4)
            a, b, g = self.rows[:, 0], self.rows[:, 1], self.rows[:, 2]
            # I(a, -2, c) = I(-2, a, c; β, α, γ), I(a, b, -2) = I(-2, b, a; γ, β, α)
            args = ((a, b, g), (b, a, g), (g, b, a))[position]
            table = inverse_square_table(*args, size)
            self.square[position] = (table, size)
        return table

    def values(self, a: np.ndarray, b: np.ndarray, c: np.ndarray, index: np.ndarray) -> np.ndarray:
        """``I(a[n], b[n], c[n])`` of the exponent row ``index[n]`` (at most one power -2 each)."""
        low = np.minimum(np.minimum(a, b), c)
        if low.size and low.min() >= -1:
            return self._regular(a, b, c, index)
        out = np.empty(a.shape)
        regular = low >= -1
        if np.any(regular):
            out[regular] = self._regular(a[regular], b[regular], c[regular], index[regular])
        # one -2 at position 0, 1 or 2; the other two powers index the table (in the order above)
        for position, (square, i, j) in enumerate(((a, b, c), (b, a, c), (c, b, a))):
            sel = square == -2
            if np.any(sel):
                table = self._square_table(position, int(max(i[sel].max(), j[sel].max())))
                out[sel] = table[index[sel], i[sel] + 1, j[sel] + 1]
        return out


def evaluate_terms(integrals: PairIntegrals, terms, base_powers, tables: ExponentTables | None = None) -> np.ndarray:
    """``Σ coefficient · I(base + shift)`` over generated ``((p, q, s), coefficient)`` terms.

    Parameters
    ----------
    integrals : PairIntegrals
        Integrals for the summed exponents of every pair (used when all pairs share the powers).
    terms : list
        ``[((p, q, s), coefficient), ...]``; coefficients are scalars or arrays of the pair shape.
    base_powers : tuple of three ndarrays of int
        Summed bra + ket powers of ``(r1, r2, r12)`` per pair.
    tables : ExponentTables
        Whole tables for the same pairs; needed when the powers differ between pairs.

    Terms whose coefficient vanishes for a pair are skipped there, so singular monomials of a
    generated integrand cost nothing (and raise nothing) when their prefactor is zero.
    """
    shape = integrals.shape
    total = np.zeros(shape)
    pa, pb, pc = (np.broadcast_to(np.asarray(x), shape) for x in base_powers)
    uniform = all(np.all(x == x.flat[0]) for x in (pa, pb, pc))
    if not uniform and tables is None:
        raise ValueError("pairs with different powers need ExponentTables")  # pragma: no cover - guard
    flat_total = total.reshape(-1)
    for (p, q, s), coefficient in terms:
        coefficient = np.broadcast_to(np.asarray(coefficient, dtype=float), shape)
        if not np.any(coefficient):
            continue
        if uniform:
            a, b, c = int(pa.flat[0]) + p, int(pb.flat[0]) + q, int(pc.flat[0]) + s
            total += coefficient * integrals(a, b, c)
            continue
        flat_coef = coefficient.reshape(-1)
        sel = np.nonzero(flat_coef)[0]
        a, b, c = ((x.reshape(-1)[sel] + d) for x, d in ((pa, p), (pb, q), (pc, s)))
        if np.any(np.minimum(np.minimum(a, b), c) < -2) or np.any(((a == -2) + (b == -2) + (c == -2)) > 1):
            raise InputError("a generated term needs a divergent integral I(a, b, c) for this basis "
                             "(a power below -2, or two powers of -2)")
        flat_total[sel] += flat_coef[sel] * tables.values(a, b, c, tables.index[sel])
    return total


def angular_momentum(basis) -> int:
    """Total ``L`` of a correlated basis (0 for a CorrelatedBasis) with generated term lists."""
    L = int(getattr(basis, "angular_momentum", 0))
    if not 0 <= L <= T.MAX_L:
        raise InputError(f"no operator integrals for total angular momentum L = {L}")
    return L


def basis_kind(basis) -> str:
    """``"S"`` for a CorrelatedBasis, ``"P"`` for a PBasis; other ``L`` raise.

    (The operators of :mod:`twoel.properties` are written for S and P bases; the Hamiltonian
    pieces of :func:`primitive_matrices` serve every ``L <= MAX_L``.)
    """
    kind = getattr(basis, "angular_momentum", 0)
    if kind == 0:
        return "S"
    if kind == 1:
        return "P"
    raise InputError(f"no operator integrals for total angular momentum L = {kind}")


def _term_functions(L: int, integrand: str, la: int, lb: int):
    """``[(function or None, factor), ...]`` generating the integrand (``None``: the unit) for
    the bra channel ``la`` and ket channel ``lb`` (``l`` of electron 1)."""
    if integrand == "unit" and L == 0:
        return [(None, 1.0)]
    if integrand == "kinetic":
        if L == 0:
            return [(kinetic_terms, 1.0)]
        return [(T.TERMS[f"l{L}_{la}{lb}_grad11"], 0.5), (T.TERMS[f"l{L}_{la}{lb}_grad22"], 0.5)]
    if integrand not in INTEGRANDS:
        raise InputError(f"unknown integrand {integrand!r}; expected one of {', '.join(INTEGRANDS)}")
    name = "angular" if integrand == "unit" else integrand
    function = T.TERMS.get(f"l{L}_{la}{lb}_{name}")
    if function is None:
        raise InputError(f"no generated {integrand!r} integrand for L = {L}")
    return [(function, 1.0)]


def _convolve(terms, weight, factor: float = 1.0):
    out = []
    for (p, q, s), coefficient in terms:
        for w, (da, db, dc) in weight:
            out.append(((p + da, q + db, s + dc), factor * w * coefficient))
    return out


class PairEngine:
    """Bra/ket pair data of one basis (pairs ``(bra[n], ket[n])``), direct and exchanged ket.

    Pairs that all share the same powers (exponential bases) use the pair series; otherwise
    whole tables over the distinct exponent sums (:class:`ExponentTables`).
    """

    def __init__(self, basis, bra: np.ndarray | None = None, ket: np.ndarray | None = None):
        self.basis = basis
        self.L = angular_momentum(basis)
        self.sign = float(basis.sign)
        l1 = getattr(basis, "electron1_l", None)
        l1 = np.full(basis.powers.shape[0], self.L, dtype=np.int64) if l1 is None else np.asarray(l1)
        powers, exponents = basis.powers, basis.exponents
        P = powers.shape[0]
        if bra is None:  # all pairs, as a (P, P) grid
            bra, ket = (x.reshape(-1) for x in np.meshgrid(np.arange(P), np.arange(P), indexing="ij"))
            self.shape = (P, P)
        else:
            self.shape = bra.shape
        self._sides = []
        for exchanged in (False, True):
            kp, ke = (powers[:, [1, 0, 2]], exponents[:, [1, 0, 2]]) if exchanged else (powers, exponents)
            bp, be = powers[bra], exponents[bra]
            kp2, ke2 = kp[ket], ke[ket]
            args = (bp[:, 0], bp[:, 1], bp[:, 2], be[:, 0], be[:, 1], be[:, 2],
                    kp2[:, 0], kp2[:, 1], kp2[:, 2], ke2[:, 0], ke2[:, 1], ke2[:, 2])
            total_e = be + ke2
            integrals = PairIntegrals(total_e[:, 0], total_e[:, 1], total_e[:, 2])
            base = tuple(bp[:, n] + kp2[:, n] for n in range(3))
            tables = None
            if any(np.any(x != x[0]) for x in base):
                # distinct exponent rows per side (few for Hylleraas bases), then their pair sums
                bra_rows, bra_index = np.unique(exponents, axis=0, return_inverse=True)
                ket_rows, ket_index = np.unique(ke, axis=0, return_inverse=True)
                n_ket = ket_rows.shape[0]
                codes, index = np.unique(bra_index.reshape(-1)[bra] * n_ket + ket_index.reshape(-1)[ket],
                                         return_inverse=True)
                rows = bra_rows[codes // n_ket] + ket_rows[codes % n_ket]
                tables = ExponentTables(rows, index.reshape(-1))
            channels = _channels(l1[bra], (self.L - l1[ket]) if exchanged else l1[ket], self.L)
            self._sides.append((exchanged, args, integrals, base, tables, channels))

    def terms(self, pieces) -> list:
        """The generated ``((p, q, s), coefficient)`` terms of an operator, per side (direct, exchanged)."""
        out = []
        for _exchanged, args, _integrals, _base, _tables, channels in self._sides:
            terms = []
            for (la, lb), mask in channels:
                for integrand, weight in pieces:
                    for function, factor in _term_functions(self.L, integrand, la, lb):
                        generated = [((0, 0, 0), 1.0)] if function is None else function(*args)
                        if mask is not None:
                            generated = [(shift, mask * c) for shift, c in generated]
                        terms.extend(_convolve(generated, weight, factor))
            out.append(terms)
        return out

    def reserve(self, side_terms: list) -> None:
        """Build the tables once for the largest power any of the given term lists needs."""
        for (_exchanged, _args, _integrals, base, tables, _ch), terms_lists in zip(self._sides, zip(*side_terms)):
            shifts = [max(s) for terms in terms_lists for s, _c in terms]
            if tables is None or not shifts:
                continue
            shift = max(shifts)
            tables.reserve(int(max(x.max() for x in base)) + max(shift, 0))

    def evaluate(self, side_terms) -> np.ndarray:
        """``<χ_bra|O|(1 ± P12)χ_ket>`` from the term lists of :meth:`terms`."""
        out = None
        for (_exchanged, _args, integrals, base, tables, _ch), terms in zip(self._sides, side_terms):
            acc = evaluate_terms(integrals, terms, base, tables)
            out = acc if out is None else out + self.sign * acc
        return out.reshape(self.shape)

    def primitive(self, pieces) -> np.ndarray:
        """``<χ_bra|O|(1 ± P12)χ_ket>`` for every pair (shape of the pair list or (P, P))."""
        return self.evaluate(self.terms(pieces))


def _channels(bra_l: np.ndarray, ket_l: np.ndarray, L: int) -> list:
    """``[((la, lb), mask), ...]``: the channel pairs present among the pairs and a 0/1 float
    mask of the pairs in each (``None`` when one pair of channels covers all)."""
    codes = bra_l * (L + 1) + ket_l
    present = np.unique(codes)
    if present.size == 1:
        return [((int(present[0]) // (L + 1), int(present[0]) % (L + 1)), None)]
    return [((int(c) // (L + 1), int(c) % (L + 1)), (codes == c).astype(float)) for c in present]


def _pieces(name: str, spec) -> list:
    """The piece list of one operator specification (see the module docstring)."""
    if isinstance(spec, str):
        if spec != "kinetic":
            raise InputError(f"operator {name!r}: unknown specification {spec!r}")
        return [("kinetic", UNIT)]
    spec = list(spec)
    if not spec:
        raise InputError(f"operator {name!r} is empty")
    if all(isinstance(item[0], str) for item in spec):
        return spec
    return [("unit", spec)]


_SWAP = {"grad11": "grad22", "grad22": "grad11"}


def exchange_symmetrized(pieces) -> list:
    """``½(O + P12 O P12)`` as pieces, merging equal monomials.

    Between exchange-(anti)symmetrized functions ``O`` and its symmetrized form have the same
    matrix, and the symmetrized form lets only the pairs ``p <= q`` be evaluated.  Symmetric
    input comes back unchanged (up to the order of the monomials).
    """
    merged: dict = defaultdict(float)
    order = []
    for integrand, weight in pieces:
        if integrand not in INTEGRANDS:
            raise InputError(f"unknown integrand {integrand!r}; expected one of {', '.join(INTEGRANDS)}")
        for coefficient, (da, db, dc) in weight:
            for key in ((integrand, (da, db, dc)), (_SWAP.get(integrand, integrand), (db, da, dc))):
                if key not in merged:
                    order.append(key)
                merged[key] += 0.5 * float(coefficient)
    grouped: dict = {}
    for integrand, shift in order:
        if merged[(integrand, shift)] != 0.0:
            grouped.setdefault(integrand, []).append((merged[(integrand, shift)], shift))
    return list(grouped.items())


def primitive_matrices(basis, operators: dict) -> dict[str, np.ndarray]:
    """Primitive-pair matrices ``<χ_p|O|(1 ± P12) χ_q>`` of an S or P basis.

    Parameters
    ----------
    basis : CorrelatedBasis or PBasis
    operators : dict
        Name to a piece list, a monomial list or ``"kinetic"`` (see the module docstring).
        Each operator is replaced by its exchange-symmetrized form (same matrices between the
        basis functions), so only the pairs ``p <= q`` are evaluated.

    Returns
    -------
    dict of ndarray, each of shape (P, P), symmetric
    """
    pieces = {name: exchange_symmetrized(_pieces(name, spec)) for name, spec in operators.items()}
    P = basis.powers.shape[0]
    raw = {name: np.zeros((P, P)) for name in pieces}
    bra, ket = np.triu_indices(P)
    for start, stop in _pair_blocks(basis, pieces, bra.shape[0]):
        b, k = bra[start:stop], ket[start:stop]
        engine = PairEngine(basis, b, k)
        terms = {name: engine.terms(piece_list) for name, piece_list in pieces.items()}
        engine.reserve(list(terms.values()))
        for name, side_terms in terms.items():
            values = engine.evaluate(side_terms)
            raw[name][b, k] = values
            raw[name][k, b] = values
    return raw


def _pair_blocks(basis, pieces: dict, n_pairs: int):
    """Ranges of the upper-triangle pair list evaluated together.

    Bases with powers and many distinct exponents get blocks small enough that their integral
    tables (one ``L³`` block per distinct exponent sum) stay below ~32 MB.
    """
    block = PAIR_BLOCK
    if np.any(basis.powers) and np.unique(basis.exponents, axis=0).shape[0] ** 2 > TABLE_ROWS:
        weight_shift = max([max(d) for p in pieces.values() for _i, w in p for _c, d in w], default=0)
        L = 2 * int(basis.powers.max()) + max(weight_shift, 0) + 5 + 2
        block = int(min(PAIR_BLOCK, max(256, TABLE_ENTRIES // L**3)))
    return [(start, min(start + block, n_pairs)) for start in range(0, n_pairs, block)]


def contract(matrix: np.ndarray, contraction: np.ndarray | None) -> np.ndarray:
    """Contract a primitive matrix with the basis contraction and symmetrize it."""
    out = matrix if contraction is None else contraction.T @ matrix @ contraction
    return 0.5 * (out + out.T)


def operator_matrices(basis, operators: dict) -> dict[str, np.ndarray]:
    """Contracted, symmetrized matrices ``<φ_m|O|φ_n>`` (see :func:`primitive_matrices`)."""
    return {name: contract(m, basis.contraction) for name, m in primitive_matrices(basis, operators).items()}
