r"""Exponentially correlated basis ``Σ c_i (1 ± P12) exp(-α_i r1 - β_i r2 - γ_i r12)``.

The exponents are not optimized one by one.  Following Korobov, Phys. Rev. A 61, 064503 (2000)
(see also Frolov & Smith, J. Phys. B 28, L449 (1995)), they are spread deterministically over a
few boxes ``[A1, A2] × [B1, B2] × [G1, G2]`` by the quasi-random sequence

.. math:: \alpha_i = A_1 + (A_2 - A_1)\,\langle\!\langle \tfrac12 i(i+1)\sqrt{p_\alpha} \rangle\!\rangle

(``⟨⟨x⟩⟩`` the fractional part, ``p = 2, 3, 5`` for ``α, β, γ``), so that only the box edges
(six numbers per box) are nonlinear parameters.  They are optimized on a small basis and reused
for larger ones; optimized edges for standard cases are shipped in ``data/exponential_boxes*.json``
(:mod:`twoel.basis.exponential_boxes`), so a calculation needs no optimization run.

``size`` is the number ``N`` of exponential terms.  Every power of the primitives is zero, so the
matrices come from the closed-form fast path :mod:`twoel.integrals.zero_power`.

Triplets: ``(1 - P12) exp(-α r1 - β r2 - γ r12)`` vanishes for ``α = β``; nearly equal ``α, β``
give functions of tiny norm whose normalized form is a derivative-like combination that ruins
the conditioning ("collapse").  For triplets each term is ordered ``α > β`` and a quasi-random
point with ``α - β < 0.05 (α + β)`` is skipped (the sequence moves on to the next index).

P states (``L = 1``, odd parity, ``n¹P`` and ``n³P``): functions
``z1 e^{-α_i r1 - β_i r2 - γ_i r12} ± (1 <-> 2)`` (:class:`twoel.basis.p_basis.PBasis`, ``α`` of
the ``p`` electron) with exponents from the same boxes and sequence, no triplet guard.  Excited
S states are the ``n``-th root of the S block (Hylleraas–Undheim–MacDonald), the ``n``-th P
root is ``state.root = n - 2``.  ``L = 2, 3`` (D, F; ``n^(2S+1)L`` is root ``n - L - 1``):
functions ``(ε·r1)^l1 (ε·r2)^(L-l1) e^{-α_i r1 - β_i r2 - γ_i r12} ± (1 <-> 2)``
(:class:`twoel.basis.angular.AngularBasis`), ``l1`` given per box (default ``L``).  The boxes of every state come from
:func:`twoel.basis.exponential_boxes.box_set_for` (one loader, one fallback rule).
"""

from __future__ import annotations

from dataclasses import replace
from functools import lru_cache
from math import isqrt

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.system import Ion, State
from twoel.basis.base import Parameter, Support, TrialFamily
from twoel.basis import exponential_boxes as stored
from twoel.basis.p_basis import PBasis
from twoel.basis.angular import MAX_L, AngularBasis

#: primes whose square roots drive the quasi-random sequences of α, β, γ (Korobov 2000)
PRIMES = (2, 3, 5)
#: triplet guard: smallest accepted (α - β) / (α + β)
TRIPLET_SEPARATION = 0.05
#: bits of the integer square roots (exact, platform-independent sequences)
_SQRT_BITS = 64


def quasi_random(count: int, prime: int, skip: int = 0) -> np.ndarray:
    """Fractional parts ``⟨⟨i(i+1)/2 · √prime⟩⟩`` for ``i = skip + 1 .. skip + count``.

    Computed in exact integer arithmetic (``√p`` to 64 bits), so the exponents are the same on
    every platform.
    """
    root = isqrt(prime << (2 * _SQRT_BITS))
    mask = (1 << _SQRT_BITS) - 1
    values = np.empty(count)
    for n, i in enumerate(range(skip + 1, skip + count + 1)):
        values[n] = ((i * (i + 1) // 2 * root) & mask) / float(1 << _SQRT_BITS)
    return values


def box_exponents(boxes, size: int, sign: int) -> np.ndarray:
    """Exponents ``(α, β, γ)`` of ``size`` terms spread over ``boxes`` (list of :class:`Box`).

    Box ``k`` receives ``round(fraction_k · size)`` terms (the last box takes the rest).  For
    triplets (``sign = -1``) terms are ordered ``α > β`` and nearly symmetric ones skipped.
    """
    counts = box_counts([b.fraction for b in boxes], size, [b.from_size for b in boxes])
    rows = []
    for box, count in zip(boxes, counts):
        if count == 0:
            continue
        (a1, a2), (b1, b2), (g1, g2) = box.alpha, box.beta, box.gamma
        taken = []
        skip = 0
        while len(taken) < count:
            want = count - len(taken) if sign > 0 else 2 * (count - len(taken)) + 8
            ua, ub, ug = (quasi_random(want, p, skip) for p in PRIMES)
            skip += want
            alpha = a1 + (a2 - a1) * ua
            beta = b1 + (b2 - b1) * ub
            gamma = g1 + (g2 - g1) * ug
            if sign < 0:
                hi, lo = np.maximum(alpha, beta), np.minimum(alpha, beta)
                ok = (hi - lo) >= TRIPLET_SEPARATION * (hi + lo)
                alpha, beta, gamma = hi[ok], lo[ok], gamma[ok]
            taken.extend(zip(alpha.tolist(), beta.tolist(), gamma.tolist()))
            if skip > 200 * count + 1000:
                raise InputError("triplet box has almost no points with α ≠ β; widen or separate "
                                 "the α and β ranges")
        rows.extend(taken[:count])
    return np.array(rows, dtype=float)


def box_counts(fractions, size: int, from_sizes=None) -> list[int]:
    """Split ``size`` terms over boxes (deterministic; nested: no count falls as ``size`` grows).

    Without later boxes (every ``from_size`` 0) the split is in proportion to ``fractions``.
    A later box ``k`` (``from_sizes[k] = s_k > 0``) aims at ``fractions[k]·max(N - s_k, 0)``
    terms and the usual boxes share the rest in proportion to their fractions.  The terms are
    then dealt one at a time, term ``j`` to the box furthest below its aim at ``N = j``, so the
    basis of ``N`` terms is the first ``N`` of every larger one.
    """
    if from_sizes is None or not any(from_sizes):
        fractions = np.asarray(fractions, dtype=float)
        cumulative = np.rint(np.cumsum(fractions) / fractions.sum() * size).astype(int)
        counts = np.diff(np.concatenate([[0], cumulative]))
        return [int(c) for c in counts]
    return list(_dealt_counts(tuple(float(f) for f in fractions),
                              tuple(int(s) for s in from_sizes), int(size)))


@lru_cache(maxsize=64)
def _dealt_counts(fractions: tuple, starts: tuple, size: int) -> tuple:
    later = [k for k, s in enumerate(starts) if s > 0]
    usual = [k for k, s in enumerate(starts) if s == 0]
    usual_total = sum(fractions[k] for k in usual)
    if not usual or sum(fractions[k] for k in later) > 1:
        raise InputError("boxes need one with from_size 0, and later-box fractions summing to <= 1")
    counts = [0] * len(fractions)
    aims = [0.0] * len(fractions)
    for j in range(1, size + 1):
        taken = 0.0
        for k in later:
            aims[k] = fractions[k] * max(j - starts[k], 0)
            taken += aims[k]
        for k in usual:
            aims[k] = (j - taken) * fractions[k] / usual_total
        best = max(range(len(counts)), key=lambda k: (aims[k] - counts[k], -k))
        counts[best] += 1
    return tuple(counts)


def basis_from_boxes(boxes, state: State, size: int):
    """The S (ground or excited), P, D or F exponential basis of ``size`` terms from ``boxes``.

    S: a zero-power :class:`CorrelatedBasis` (closed-form matrices, triplets guarded as in the
    module text).  P: a :class:`PBasis`; D, F: an :class:`AngularBasis` (pair-evaluator
    matrices).
    """
    if state.L == 0:
        exponents = box_exponents(boxes, size, state.exchange_sign)
        return CorrelatedBasis(np.zeros_like(exponents, dtype=int), exponents,
                               sign=state.exchange_sign)
    if state.L == 1:
        return PBasis(box_exponents(boxes, size, 1), sign=state.exchange_sign)
    if 2 <= state.L <= MAX_L:
        return _angular_basis(boxes, state, size)
    raise UnsupportedError(f"no exponential basis for L = {state.L} ({state.label})")


def _angular_basis(boxes, state: State, size: int) -> AngularBasis:
    """``L >= 2``: each box's terms carry ``(ε·r1)^l1 (ε·r2)^(L-l1)`` with the box's ``l1``
    (default ``L``: all of it on the electron of ``α``).  Counts as for S and P
    (:func:`box_counts`); each box draws its own sequence, so bases stay nested.  In a
    channel with ``l1 = L - l1`` the triplet function vanishes at ``α = β``: there the
    triplet guard applies."""
    counts = box_counts([b.fraction for b in boxes], size, [b.from_size for b in boxes])
    rows, channel = [], []
    for box, count in zip(boxes, counts):
        if count == 0:
            continue
        l1 = state.L if box.l1 is None else box.l1
        if not 0 <= l1 <= state.L:
            raise InputError(f"box l1 = {l1} does not fit L = {state.L}")
        guard = state.exchange_sign if 2 * l1 == state.L else 1
        rows.append(box_exponents([replace(box, fraction=1.0, from_size=0)], count, guard))
        channel += [l1] * count
    return AngularBasis(np.concatenate(rows), sign=state.exchange_sign, angular_momentum=state.L,
                        electron1_l=np.array(channel))


class ExponentialFamily(TrialFamily):
    """Exponentially correlated functions with quasi-random exponents in optimized boxes."""

    name = "exponential"
    summary = "Σ (1 ± P12) exp(-α_i r1 - β_i r2 - γ_i r12), quasi-random exponents in boxes (Korobov 2000)"
    size_meaning = "N, the number of exponential terms"
    default_size = 300
    min_size = 4
    max_size = 3000
    optimize_by_default = False
    option_names = ()
    supported_L = (0, 1, 2, 3)
    #: every state (S, P, D, F): float64 with mixed refinement or extended precision, and an
    #: error bar.  Sizes when twoel chooses: 600 (or the stored ``recommended_size``);
    #: ``--optimize`` tunes S boxes at the stored set's size (else 120), at most 400 (the float64
    #: energy it minimizes stops seeing the basis near 1e-10 Eh, and each evaluation is O(N³))
    support = Support(L_values=(0, 1, 2, 3),
                      precision={L: ("float64", "mixed", "extended") for L in (0, 1, 2, 3)},
                      error_bar_L=(0, 1, 2, 3), sizes={0: 600, 1: 600, 2: 600, 3: 600},
                      tuning_size=120,
                      tuning_max_size=400)

    def parameters(self, ion: Ion, state: State, size, options) -> list[Parameter]:
        return stored.box_set_for(ion, state).parameters()

    def build(self, ion: Ion, state: State, size, values, options):
        if size is None or isinstance(size, bool) or not isinstance(size, int) or size < state.root + 1:
            raise InputError(f"the exponential basis needs an integer size >= {state.root + 1}, got {size!r}")
        box_set = stored.box_set_for(ion, state).with_values(values or {})
        return basis_from_boxes(box_set.boxes, state, size)

    def size_for(self, ion: Ion, state: State) -> int | None:
        """The stored set's ``recommended_size``, else 600 functions."""
        return stored.recommended_size(ion, state) or super().size_for(ion, state)

    def tuned_at(self, ion: Ion, state: State) -> int | None:
        """The stored set's ``optimized_size`` when it was tuned on the refined energy
        (``"objective": "mixed"``): such a set is shaped for that size, and a nested sequence
        through it converges faster there than beyond (only the exact ``(Z, state)`` stored)."""
        box_set = stored.box_set_for(ion, state)
        if box_set.origin != "stored" or box_set.extra.get("objective") != "mixed":
            return None
        return box_set.optimized_size

    def tuning_size(self, ion: Ion, state: State, size: int | None) -> int | None:
        """S states: the stored set's ``optimized_size`` (else 120), at most 400; P: ``size``."""
        if state.L != 0 or size is None:
            return size
        target = stored.box_set_for(ion, state).optimized_size or self.support.tuning_size
        return min(size, target, self.support.tuning_max_size)

    def nested_sizes(self, size: int) -> list[int]:
        """``N/2√2``, ``N/2`` and ``N/√2``: the bases of fewer terms are the first terms of the
        larger ones (:func:`box_counts`), and a fourth size lets the error bar use the measured
        ratio of its steps (:func:`twoel.solver.error_bar.estimate_nested_tail`)."""
        from twoel.solver.error_bar import four_size_error_bar_sizes

        return four_size_error_bar_sizes(size)

    def convergence(self, ion: Ion, state: State) -> list[tuple[int, float]]:
        """The stored set's measured ``convergence`` (only for the exact ``(Z, state)`` stored)."""
        box_set = stored.box_set_for(ion, state)
        table = box_set.extra.get("convergence") if box_set.origin == "stored" else None
        return sorted((int(n), float(e)) for n, e in (table or {}).get("error_hartree_by_size", []))

    def provenance(self, ion: Ion, state: State) -> dict:
        """Where the box edges of ``(ion, state)`` come from (JSON-ready)."""
        return stored.box_set_for(ion, state).provenance()


FAMILY = ExponentialFamily()
