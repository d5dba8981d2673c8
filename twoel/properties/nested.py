r"""Expectation values with uncertainties from a nested-basis sequence.

:func:`properties_with_uncertainties` solves the state in three nested bases, evaluates
:func:`twoel.properties.expectation.expectation_values` in each and gives every value an
uncertainty (:func:`twoel.properties.uncertainty.sequence_bar`) whose arithmetic part is the
change of the value when the float64 solve drops ten times more near-dependent overlap
directions.

Default basis
    For ``1¹S`` (Z >= 1.5) the three-shell two-scale Hylleraas basis :data:`GROUND_SHELLS`
    (tuned for the expectation values: its inner shell carries both electrons near the
    nucleus) solved at the overlap drop threshold :data:`GROUND_DROP_THRESHOLD`; for ``2¹S``,
    ``2³S`` and H⁻ the two-scale basis of the corrections
    (:func:`twoel.corrections.spectrum.preset_basis`, quality ``"default"``).  The nested
    predecessors lower every shell's ``ω`` by 1 and by 2.  For He 1¹S (749 functions) the
    default run gives ``⟨1/r1²⟩``, the regularized δ(r1) and the regularized δ(r12) to better
    than 1e-8 relative (measured against Drake 2006: +4e-10, +7e-10, -6e-9), where the default
    exponential basis (N = 600) is ~1e-6 off: the float64 eigenvector of a large exponential
    basis is limited by the conditioning of its overlap (it reaches the energy only through the
    refined vector, which the δ operators cannot use: they need ``I(-2, b, c)`` integrals that
    exist in float64 only).  The float64 Hylleraas eigenvector is the other limit of these
    values: they move by up to ~3e-9 relative when the drop threshold changes tenfold (the floor
    of the bars).
    With ``size`` or ``family`` given (and for every other state): that family via
    :func:`twoel.analysis.transitions.solve_state`, sizes ``N/2, N/√2, N``.

Triplets
    ``⟨δ³(r12)⟩ = 0`` exactly for a triplet: its spatial function is antisymmetric,
    ``Ψ(r1, r2) = -Ψ(r2, r1)``, so ``Ψ(r, r) = 0``.  Both forms are reported as exactly 0 (the
    regularized formula is exact only for an exact eigenfunction and gives a few 1e-9 otherwise).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from types import SimpleNamespace

import numpy as np

from twoel.properties.expectation import (ExpectationValues, expectation_values,
                                          expectation_values_of_vectors)
from twoel.properties.uncertainty import PropertyBar, check_nonnegative, exact, sequence_bar
from twoel.results import Wavefunction
from twoel.solver.eigen import DEFAULT_DROP_THRESHOLD, solve_generalized
from twoel.solver.error_bar import DROP_SENSITIVITY_FACTOR, error_bar_sizes
from twoel.system import Ion, State

#: values that get an uncertainty (the names of :class:`ExpectationValues`)
UNCERTAIN = ("r1", "r1_squared", "inv_r1", "inv_r1_squared", "r12", "r12_squared", "inv_r12",
             "delta_r1", "delta_r12", "delta_r1_regularized", "delta_r12_regularized",
             "grad1_dot_grad2", "p1_fourth")
#: δ expectations (never negative)
DELTAS = ("delta_r1", "delta_r12", "delta_r1_regularized", "delta_r12_regularized")
#: ω reductions of the nested two-scale bases, largest reduction (smallest basis) first
REDUCTIONS = (2, 1, 0)
TRIPLET_NOTE = ("exact: a triplet spatial function is antisymmetric, Ψ(r1, r2) = -Ψ(r2, r1), "
                "so Ψ(r, r) = 0 and ⟨δ³(r12)⟩ = 0")


@dataclass(frozen=True)
class NestedProperties:
    """Expectation values of the largest basis with their uncertainties.

    Attributes
    ----------
    record : SimpleNamespace
        ``Z``, ``ion``, ``state``, ``family``, ``size``, ``n_terms``, ``energy_hartree``.
    values : ExpectationValues
        The values of the largest basis.
    bars : dict of str to PropertyBar
        One per name of :data:`UNCERTAIN` that has a value.
    sizes : tuple of int
        Numbers of functions of the nested bases.
    """

    record: object
    values: ExpectationValues
    bars: dict
    sizes: tuple
    notes: tuple = field(default=())


#: the three-shell two-scale Hylleraas basis of the default 1¹S run (Z >= 1.5): per shell
#: ``(ω, α/Z, β/Z, γ/Z)`` of ``r1^i r2^j r12^k e^{-α r1 - β r2 - γ r12}``, i + j + k <= ω.
#: Chosen for the expectation values rather than for the energy: the inner shell (α, β ~ 6Z)
#: carries both electrons near the nucleus, which ``⟨1/r1²⟩`` and ``⟨δ³(r1)⟩`` weight, and the
#: middle and inner shells carry the electron-electron coalescence that the regularized
#: ``⟨δ³(r12)⟩`` weights.  Measured for He against Drake 2006 (relative; drop thresholds
#: 1e-14 / 1e-15 / 1e-16): this basis (749 functions) ``⟨1/r1²⟩`` -8e-10 / +4e-10 / +7e-10,
#: ``⟨δ³(r1)⟩`` -6e-10 / +7e-10 / +1.0e-9, ``⟨δ³(r12)⟩`` -9.3e-9 / -6.4e-9 / -5.1e-9, energy
#: 1.5e-12 / 3.8e-13 / 1.3e-13 Eh above the exact value.  The earlier ω = (12, 8, 6) (704
#: functions) gave ``⟨δ³(r12)⟩`` -1.6e-8 / -2.3e-8 / -2.7e-8: a truncation error of the middle
#: and inner shells (at 1e-16, ω + 1 on the middle shell moved it by +1.1e-8, on the inner
#: shell by +1.2e-8, on the outer shell by +1e-9), on top of the float64 scatter of the
#: 1e-14 solves (±1e-8 between neighbouring bases).  The outer shell at ω = 11 instead of 12
#: changes none of the three by more than ~2e-9.  (An r12 exponent e^{+0.15 Z r12} on the
#: middle shell of the earlier basis moved δ(r12) to -2e-9 at 1e-14 but -3e-8 to -7e-8 at the
#: other thresholds: no gain.)
GROUND_SHELLS = ((11, 0.9, 1.1, 0.0), (9, 2.25, 3.0, 0.0), (8, 6.0, 7.0, 0.0))
#: relative overlap drop threshold of the default 1¹S solves: the three-shell basis keeps
#: directions down to 1e-15 (the energy still falls from 1e-14 to 1e-15, and the δ(r12) of
#: the 1e-15 and 1e-16 solves agree to 1.3e-9 relative where 1e-14 is 3e-9 off, measured);
#: the floor is the change at ten times this threshold
GROUND_DROP_THRESHOLD = 1e-15


def _shell_basis(shells, Z: float, sign: int, reduction: int):
    """Complete ``ω - reduction`` shells ``Σ r1^i r2^j r12^k e^{-Z(a r1 + b r2 + g r12)}``
    of ``(ω, a, b, g)`` (CorrelatedBasis)."""
    from twoel.basis.correlated import CorrelatedBasis
    from twoel.basis.hylleraas import omega_terms

    powers, exponents = [], []
    for omega, a, b, g in shells:
        terms = omega_terms(omega - reduction, False, sign)
        powers += terms
        exponents += [(a * Z, b * Z, g * Z)] * len(terms)
    return CorrelatedBasis(np.array(powers), np.array(exponents, dtype=float), sign=sign)


def _ground_shells(Z: float, state: State) -> bool:
    return state.n == 1 and state.L == 0 and Z >= 1.5


def two_scale_basis(Z: float, state: State, reduction: int = 0):
    """The default two-scale Hylleraas basis of a properties run with every shell's ``ω``
    lowered by ``reduction``: :data:`GROUND_SHELLS` for 1¹S (Z >= 1.5), else the preset
    basis of the corrections (:func:`twoel.corrections.spectrum.preset_basis`, ``"default"``)."""
    from twoel.basis.correlated import CorrelatedBasis
    from twoel.basis.hylleraas import omega_terms
    from twoel.corrections.spectrum import preset_basis

    if _ground_shells(Z, state):
        return _shell_basis(GROUND_SHELLS, Z, state.exchange_sign, reduction)
    full = preset_basis(Z, state, "default")
    keep = []
    start = 0
    # the preset is a concatenation of complete ω shells with one exponent pair each
    exps = full.exponents
    while start < exps.shape[0]:
        stop = start
        while stop < exps.shape[0] and np.array_equal(exps[stop], exps[start]):
            stop += 1
        omega = int(full.powers[start:stop].sum(axis=1).max())
        allowed = set(omega_terms(omega - reduction, False, state.exchange_sign))
        keep += [k for k in range(start, stop) if tuple(int(x) for x in full.powers[k]) in allowed]
        start = stop
    keep = np.array(keep)
    return CorrelatedBasis(full.powers[keep], full.exponents[keep], sign=full.sign)


def _values_and_floor(wavefunction, Z: float, hamiltonian, overlap, root: int, refine,
                      threshold: float = DEFAULT_DROP_THRESHOLD):
    """Values of ``wavefunction`` (solved at the drop ``threshold``) and of the vector of a 10x
    drop threshold (the floor)."""
    coarse = solve_generalized(hamiltonian, overlap,
                               drop_threshold=DROP_SENSITIVITY_FACTOR * threshold)
    c = np.asarray(wavefunction.coefficients, float)
    pick = int(np.argmax(np.abs(coarse.vectors.T @ (overlap @ c))))
    if refine:
        values = expectation_values(wavefunction, Z, refine=refine)
        other = expectation_values(Wavefunction(wavefunction.basis, coarse.vectors[:, pick]), Z, refine=False)
    else:  # both vectors from one evaluation of the operator matrices
        values, other = expectation_values_of_vectors(
            wavefunction.basis, np.column_stack([c, coarse.vectors[:, pick]]), Z)
    floors = {}
    energy = float(c @ hamiltonian @ c / (c @ overlap @ c))
    # the energy of a refined (beyond float64) solve does not feel the dropped directions
    floors["energy"] = (abs(float(coarse.values[pick]) - energy) if refine is False else 0.0) + 1e-15 * abs(energy)
    for name in UNCERTAIN:
        a, b = getattr(values, name), getattr(other, name)
        if a is None or b is None:
            continue
        refined = refine and name in ("r1", "r1_squared", "inv_r1", "r12", "r12_squared", "inv_r12")
        floors[name] = 1e-14 * abs(a) if refined else abs(a - b) + 1e-15 * abs(a)
    return values, floors


def _two_scale_sequence(Z: float, state: State):
    out = []
    threshold = GROUND_DROP_THRESHOLD if _ground_shells(Z, state) else DEFAULT_DROP_THRESHOLD
    for reduction in REDUCTIONS:
        basis = two_scale_basis(Z, state, reduction)
        m = basis.matrices()
        H = m.hamiltonian(Z)
        sol = solve_generalized(H, m.overlap, drop_threshold=threshold)
        wf = Wavefunction(basis, sol.vectors[:, state.root])
        values, floors = _values_and_floor(wf, Z, H, m.overlap, state.root, False, threshold)
        out.append((basis.size, float(sol.values[state.root]), values, floors))
    return out


def _family_sequence(Z: float, state: State, size, family):
    from twoel.analysis.transitions import recommended_size, solve_state

    size = size or recommended_size(Z, state, family or "exponential")
    out, main = [], None
    for n in error_bar_sizes(size) + [size]:
        # the sequence itself gives the uncertainties: no solve needs its own nested error bar
        result = solve_state(Z, state.label, size=n, family=family, error_bar=False)
        basis = result.wavefunction.basis
        m = basis.matrices()
        values, floors = _values_and_floor(result.wavefunction, Z, m.hamiltonian(Z), m.overlap,
                                           state.root, None)
        out.append((n, result.energy_hartree, values, floors))
        main = result
    return out, main


def properties_with_uncertainties(Z, state="1^1S", size: int | None = None,
                                  family=None) -> NestedProperties:
    """Expectation values and their uncertainties (see the module text).

    Parameters
    ----------
    Z : float or str
        Nuclear charge.
    state : str or State
        Term symbol.
    size : int, optional
        Basis size of the largest basis (a family's size; selects the family path).
    family : str, optional
        Trial family (selects the family path).
    """
    ion, st = Ion.parse(Z), State.parse(state)
    notes = []
    if size is None and family is None and st.L == 0 and st.n <= 2 and (st.n == 1 or ion.Z >= 1.5):
        seq = _two_scale_sequence(ion.Z, st)
        shells = "3 shells, " if _ground_shells(ion.Z, st) else ""
        record = SimpleNamespace(Z=ion.Z, ion=ion.label, state=st.label, size=None,
                                 family=f"hylleraas two-scale ({shells}nested: ω - 2, ω - 1, ω)",
                                 n_terms=seq[-1][0], energy_hartree=seq[-1][1])
    else:
        seq, main = _family_sequence(ion.Z, st, size, family)
        record = SimpleNamespace(Z=main.Z, ion=main.ion, state=main.state, size=main.size,
                                 family=main.family, n_terms=main.n_terms,
                                 energy_hartree=main.energy_hartree)
    values = seq[-1][2]
    bars: dict = {}
    for name in UNCERTAIN:
        sequence = [getattr(v, name) for _n, _e, v, _f in seq]
        if any(x is None for x in sequence):
            continue
        bar = sequence_bar(sequence, seq[-1][3].get(name, 0.0))
        if name in DELTAS:
            bar = check_nonnegative(bar, name)
        bars[name] = bar
    energies = [e for _n, e, _v, _f in seq]
    bars["energy"] = sequence_bar(energies, seq[-1][3]["energy"])
    if st.exchange_sign < 0:
        bars["delta_r12"] = exact(0.0, TRIPLET_NOTE)
        bars["delta_r12_regularized"] = exact(0.0, TRIPLET_NOTE)
    return NestedProperties(record, values, bars, tuple(n for n, *_ in seq), tuple(notes))
