r"""The one convergence extrapolation: geometric tail of nested bases, and the error bar of a solve.

For nested bases ``N_1 < N_2 < ... < N_K`` the energies ``E_k`` decrease (Rayleigh–Ritz).  With
the steps ``d_k = E_{k-1} - E_k`` and their ratios ``q_k = d_k / d_{k-1}`` a geometric tail
gives the remaining error of the last energy

.. math:: E_K - E_\infty \approx d_K \frac{q}{1-q},

with ``q`` the *largest* of the last two ratios (the slower one, so the tail is not
underestimated), kept between 1/3 and 0.8: quasi-random nested bases converge
sub-geometrically, so an apparently fast ratio is not trusted, and an erratic or near-1 ratio is
capped (and reported as unreliable).  This is the Aitken/Richardson-type estimate customary for
explicitly correlated bases (e.g. Drake, Springer Handbook of Atomic, Molecular and Optical
Physics (2006), ch. 11, where ratios of successive differences are tabulated).

``variational error bar``: ``2·tail + numerical error``; the true ``E_K - E_exact`` is positive
and expected within it.  ``extrapolated value``: ``E_K - d_K q/(1-q)`` with the *measured*
ratio, with the bar ``tail + numerical error`` from the conservative one.

Four nested sizes (:func:`estimate_nested_tail`, used when a family declares three smaller
sizes, as the exponential family does: ``N/2√2``, ``N/2``, ``N/√2``) give two ratios, and the
tail uses the larger *measured* one without the 1/3 floor, with the bar
:data:`NESTED_BAR_FACTOR` ``· tail``: the floor made the bars of fast-converging bases 30-150
times the true error, and a second ratio is a better guard against a step that is fast by
accident.

:func:`nested_error_bar` is the error bar of one solve of size ``N`` from its nested smaller
bases (:func:`error_bar_sizes` or :func:`four_size_error_bar_sizes`);
:mod:`twoel.analysis.convergence` uses :func:`estimate_tail` for a study over many sizes.  Where
the bar is set by an arithmetic error that is a statistical estimate rather than a bound (the
mixed step's matrix rounding, :func:`twoel.solver.refine.matrix_rounding_error`), the bar is
marked ``reliable: false``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable, Sequence

from twoel.errors import InputError
from twoel.solver.eigen import solve_generalized

#: factor by which the drop threshold is raised to measure what the dropped directions cost
DROP_SENSITIVITY_FACTOR = 10.0

#: largest ratio of successive differences trusted for the geometric tail
MAX_RATIO = 0.8
#: smallest ratio used: quasi-random nested bases converge sub-geometrically, so a fast apparent
#: ratio from a few sizes underestimates the tail (measured for He, H⁻, Li⁺ with N ratio √2)
MIN_RATIO = 1.0 / 3.0
#: factor between the tail estimate and the error bar of the variational (upper-bound) value
BAR_FACTOR = 2.0
#: the same for :func:`estimate_nested_tail` (measured ratio, no floor): over the solves of
#: ``benchmarks/error_bars.py`` (He, H⁻, Li⁺ 1¹S, He 2¹S, 2³S, 2¹P, 2³P, four sizes, float64 and
#: extended) the true basis error lies between 0.14 (Li⁺ N = 200) and 2.8 (H⁻ N = 1200,
#: extended) times the measured tail ``d q/(1-q)``; 3.5, near the geometric middle, keeps every
#: bar 1.2-25 times the true error
NESTED_BAR_FACTOR = 3.5
#: :func:`estimate_nested_tail`: a last ratio below SLOWING_FLOOR that rose by a factor ``r`` is
#: raised by ``sqrt(r)`` (to SLOWING_FLOOR when ``r`` > SLOWING_SHARP); ``r`` > SLOWING_JUMP
#: flags the bar (calibrated on He 2¹P, 2³P, 2³S, 5¹P nested sequences of the exponential family)
SLOWING_JUMP = 3.0
SLOWING_SHARP = 4.0
#: smallest rise of the ratio treated as slowing (below it the two ratios agree within noise)
SLOWING_RISE = 1.5
SLOWING_FLOOR = 0.1


@dataclass(frozen=True)
class TailEstimate:
    """Extrapolation of a decreasing energy sequence (Eh)."""

    tail_hartree: float
    ratio: float
    extrapolated_hartree: float
    variational_bar_hartree: float
    extrapolated_bar_hartree: float
    reliable: bool
    note: str = ""


def steps(energies: Sequence, precise: Sequence | None = None) -> list[float]:
    """``d_k = E_{k-1} - E_k`` for ``k = 1 .. K-1`` (Eh).

    With ``precise`` (the same energies as decimal strings or ``mpmath.mpf``) the differences
    are taken at 60 digits (needed beyond ~1e-15 relative).
    """
    if precise is None:
        E = [float(e) for e in energies]
        return [E[k - 1] - E[k] for k in range(1, len(E))]
    import mpmath

    with mpmath.workdps(60):
        values = [mpmath.mpf(str(e)) for e in precise]
        return [float(values[k - 1] - values[k]) for k in range(1, len(values))]


def step_ratios(d: Sequence[float]) -> list:
    """``q_k = d_k / d_{k-1}`` for consecutive steps (``None`` where ``d_{k-1} = 0``)."""
    return [d[k] / d[k - 1] if d[k - 1] else None for k in range(1, len(d))]


def _capped_ratio(ratios: Sequence[float], reliable: bool, note: str) -> tuple[float, bool, str]:
    """The largest measured step ratio, capped at :data:`MAX_RATIO` (and flagged) when it is
    not well below 1 or when no ratio could be measured."""
    q = max(ratios) if ratios else MAX_RATIO
    if not 0 < q < MAX_RATIO:
        if not note:
            note = f"ratio of successive differences {q:.2f} is not well below 1; tail capped"
        reliable = reliable and 0 < q < 1
        q = MAX_RATIO
    return q, reliable, note


def _at_arithmetic_floor(d: float, floor: float, tail: float, note: str) -> tuple[float, str]:
    """A last step within twice the arithmetic error: the tail is at least that error."""
    if d <= 2 * floor:
        note = note or "differences at the level of the arithmetic error: converged to it"
        tail = max(tail, floor)
    return tail, note


def estimate_tail(energies: Sequence[float], numerical_error: float = 0.0,
                  energies_precise: Sequence | None = None) -> TailEstimate:
    """Tail of the sequence (see module text).  Needs at least three energies.

    Parameters
    ----------
    energies : sequence of float
        ``E(N_k)`` for increasing nested sizes (Eh).
    numerical_error : float
        Arithmetic error of the last energy (Eh), added to the bars.
    energies_precise : sequence, optional
        The same energies as higher-precision numbers (``mpmath.mpf`` or decimal strings); the
        differences are then taken from them (needed beyond ~1e-15 relative).
    """
    if len(energies) < 3:
        raise InputError("a convergence estimate needs at least three basis sizes")
    diffs = steps(energies, energies_precise)
    d_last, d_prev = diffs[-1], diffs[-2]
    floor = max(numerical_error, 0.0)
    reliable = True
    note = ""
    if d_last < -2 * floor - 1e-300 or d_prev < -2 * floor - 1e-300:
        reliable = False
        note = "energies do not decrease with N (numerical noise or non-nested bases)"
    ratios = [diffs[k] / diffs[k - 1] for k in range(1, len(diffs)) if diffs[k - 1] > 0]
    tail_ratios = ratios[-2:] if len(ratios) >= 2 else ratios
    q, reliable, note = _capped_ratio(tail_ratios, reliable, note)
    d = max(abs(d_last), 0.0)
    measured_tail = d * q / (1.0 - q) if q > 0 else 0.0  # best guess, for the extrapolation
    q = max(q, MIN_RATIO)
    tail = d * q / (1.0 - q)  # conservative, for the bars
    tail, note = _at_arithmetic_floor(d, floor, tail, note)
    last = float(energies[-1])
    variational_bar = BAR_FACTOR * tail + floor
    extrapolated_bar = tail + floor
    return TailEstimate(tail, q, last - measured_tail, variational_bar, extrapolated_bar, reliable, note)


def estimate_nested_tail(energies: Sequence[float], numerical_error: float = 0.0,
                         energies_precise: Sequence | None = None, min_ratio: float = 0.0) -> TailEstimate:
    r"""Tail of four (or more) nested energies from their *measured* ratio (see module text).

    With the last three steps ``d_1, d_2, d_3`` (sizes ``N/2√2, N/2, N/√2, N``) the ratio is
    ``q = max(d_2/d_1, d_3/d_2)`` as measured, without the floor :data:`MIN_RATIO`: two ratios
    instead of one already catch a step that is fast by accident, and the floor made the bars of
    fast-converging bases 30-150 times the true error.  The tail is ``d_3 q/(1-q)`` and the
    variational bar :data:`NESTED_BAR_FACTOR` times it plus the arithmetic error.  Ratios above
    :data:`MAX_RATIO` or rising energies are capped and flagged as for :func:`estimate_tail`; a
    small last ratio (below :data:`SLOWING_FLOOR`) that rose by ``r = q_2/q_1`` is extrapolated,
    ``q = min(SLOWING_FLOOR, q_2 sqrt(r))`` (``SLOWING_FLOOR`` if ``r >`` :data:`SLOWING_SHARP`),
    and flagged when ``r >`` :data:`SLOWING_JUMP`.

    Parameters
    ----------
    energies : sequence of float
        ``E(N_k)`` for increasing nested sizes (Eh), at least four.
    numerical_error : float
        Arithmetic error of the last two energies (Eh), added to the bars.
    energies_precise : sequence, optional
        The same energies as higher-precision numbers (see :func:`estimate_tail`).
    min_ratio : float
        Smallest ratio used (default none); see :func:`nested_error_bar`.
    """
    if len(energies) < 4:
        raise InputError("a nested-basis tail needs at least four basis sizes")
    diffs = steps(energies, energies_precise)[-3:]
    floor = max(numerical_error, 0.0)
    reliable, note = True, ""
    if min(diffs[1:]) < -2 * floor - 1e-300:
        reliable = False
        note = "energies do not decrease with N (numerical noise or non-nested bases)"
    ratios = [diffs[k] / diffs[k - 1] for k in (1, 2) if diffs[k - 1] > 0]
    q, reliable, note = _capped_ratio(ratios, reliable, note)
    if len(ratios) == 2 and 0 < ratios[0] and ratios[1] > SLOWING_RISE * ratios[0] and q < SLOWING_FLOOR:
        # a fast ratio that rises: the convergence is slowing, so the next ratio is taken to rise
        # by the square root of that factor again, or to SLOWING_FLOOR after a sharp rise (He 5¹P,
        # N = 600: ratios 0.004, 0.026 gave a tail 12 times below the true error; He 2³P, N = 200:
        # 0.004, 0.011 gave 0.75 of it)
        rise = ratios[1] / ratios[0]
        q = SLOWING_FLOOR if rise > SLOWING_SHARP else min(SLOWING_FLOOR, ratios[1] * math.sqrt(rise))
        note = (note + "; " if note else "") + (f"convergence slowing (step ratios {ratios[0]:.3g}, "
                                                f"{ratios[1]:.3g}): next ratio taken as {q:.3g}")
        if rise > SLOWING_JUMP:
            reliable = False
    if q < min_ratio:
        q = min_ratio
        note = (note + "; " if note else "") + f"ratio taken as at least {min_ratio:.3g}"
    d = max(diffs[-1], 0.0)
    tail = d * q / (1.0 - q)
    tail, note = _at_arithmetic_floor(d, floor, tail, note)
    last = float(energies[-1])
    return TailEstimate(tail, q, last - tail, NESTED_BAR_FACTOR * tail + floor,
                        (NESTED_BAR_FACTOR - 1.0) * tail + floor, reliable, note)


@dataclass(frozen=True)
class Float64Energy:
    """A float64 eigenvalue with an a-posteriori estimate of its arithmetic error (Eh).

    In a float64 solve the near-dependent directions of the overlap are dropped (canonical
    orthogonalization), and what they would have added is lost.  Raising the drop threshold by
    :data:`DROP_SENSITIVITY_FACTOR` drops the next layer of directions; the energy rise
    ``E(10 t) - E(t)`` measures what one such layer carries.  Measured for He 2³P with the
    exponential family (thresholds 1e-14 .. 1e-10, N = 300 and 600) the error of ``E(t)``
    against Drake's value is 0.8-1.4 times that rise (each decade of threshold roughly doubles
    the error), so the rise is used as the estimate of the float64 error.
    """

    energy_hartree: float
    numerical_error_hartree: float
    method: str = "float64 (error: rise of the energy when the drop threshold is raised 10x)"

    @property
    def text(self) -> str:
        return repr(self.energy_hartree)


def float64_energy(hamiltonian, overlap, root: int, drop_threshold: float, solution=None) -> Float64Energy:
    """:class:`Float64Energy` of root ``root`` of ``H c = E S c`` (``solution``: the solve at
    ``drop_threshold`` if already done)."""
    if solution is None:
        solution = solve_generalized(hamiltonian, overlap, drop_threshold=drop_threshold)
    energy = float(solution.values[root])
    coarser = solve_generalized(hamiltonian, overlap, drop_threshold=DROP_SENSITIVITY_FACTOR * drop_threshold)
    rise = float(coarser.values[root]) - energy if coarser.values.shape[0] > root else abs(energy)
    rounding = 1e-15 * abs(energy)  # a few ulp of the eigenvalue itself
    return Float64Energy(energy, max(rise, 0.0) + rounding)


def digits_error(energy_scale: float, digits: int) -> float:
    """Largest error (Eh) that leaves ``digits`` significant digits of an energy of magnitude
    ``energy_scale`` correct: half a unit in the last of them."""
    return 0.5 * 10.0 ** (math.floor(math.log10(abs(energy_scale))) - digits + 1)


def supported_digits(energy_scale: float, error: float) -> int:
    """Significant digits of an energy of magnitude ``energy_scale`` that an error (or error
    bar) ``error`` leaves correct (the inverse of :func:`digits_error`)."""
    return max(0, int(math.floor(math.floor(math.log10(abs(energy_scale))) + 1 - math.log10(2.0 * error))))


def error_bar_sizes(size: int) -> list[int]:
    """The two smaller sizes used for the error bar of a single ``size`` (``N/2``, ``N/√2``)."""
    return sorted({max(4, int(round(size / 2))), max(5, int(round(size / math.sqrt(2.0))))} - {size})


def four_size_error_bar_sizes(size: int) -> list[int]:
    """``N/2√2``, ``N/2``, ``N/√2``: three smaller nested sizes, for :func:`estimate_nested_tail`
    (fewer when the basis is too small for three distinct ones)."""
    smallest = max(3, int(round(size / (2.0 * math.sqrt(2.0)))))
    return sorted(n for n in {smallest} | set(error_bar_sizes(size)) if n < size)


def _statistical(energy) -> bool:
    """Whether the arithmetic error of an energy is a statistical estimate (the mixed step's
    measured matrix rounding, :func:`twoel.solver.refine.matrix_rounding_error`), not a bound."""
    return bool(getattr(energy, "arithmetic", None))


def nested_error_bar(refined_at: Callable[[int], object], size: int, refined,
                     sizes: Sequence[int] | None = None, tuned_at: int | None = None) -> dict:
    """Truncation error bar of a solve of ``size`` terms from smaller nested bases.

    With two smaller sizes (default :func:`error_bar_sizes`: ``N/2``, ``N/√2``) the tail is
    :func:`estimate_tail` (ratio at least :data:`MIN_RATIO`, bar x :data:`BAR_FACTOR`); with three
    or more (:func:`four_size_error_bar_sizes`) it is :func:`estimate_nested_tail` (measured
    ratio, bar x :data:`NESTED_BAR_FACTOR`).

    Parameters
    ----------
    refined_at : callable
        ``refined_at(n)`` returns the refined energy (a
        :class:`twoel.solver.refine.RefinedEnergy`) of the nested basis of ``n`` terms.
    size : int
        The size of the solve.
    refined : RefinedEnergy
        Its refined energy.
    sizes : sequence of int, optional
        The smaller nested sizes.
    tuned_at : int, optional
        Size at which the basis parameters were optimized.  If it lies inside the nested range
        (from the smallest size to ``size``), the sequence converges faster up to that size
        than beyond it (He 4³P, boxes tuned at N = 500: step ratios 0.017, 0.003 at
        N = 212..600, bar 0.14 of the true error; He 2¹P solved at its tuning size N = 600: bar
        270 times the error), so the ratio is taken as at least :data:`MIN_RATIO` and the bar
        is flagged unreliable.

    Returns
    -------
    dict
        ``error_bar_hartree``, ``tail_hartree``, ``ratio``, ``sizes``, ``energy_texts``,
        ``extrapolated_hartree`` (Eh), ``reliable``, ``note``, ``method``, ``bar_factor``.
    """
    texts, numerical, statistical = [], [refined.numerical_error_hartree], [_statistical(refined)]
    sizes = error_bar_sizes(size) if sizes is None else sorted(sizes)
    for n in sizes:
        aux = refined_at(n)
        texts.append(aux.text)
        numerical.append(aux.numerical_error_hartree)
        statistical.append(_statistical(aux))
    texts.append(refined.text)
    energies = [float(t) for t in texts]
    # the arithmetic errors of the smaller bases enter only the ratio; those of N/√2 and N
    # enter the last step and the value itself
    floor = max(numerical[0], numerical[-1])
    four = len(sizes) >= 3
    tuned_inside = tuned_at is not None and sizes[0] <= tuned_at <= size
    if four:
        estimate = estimate_nested_tail(energies, floor, texts, MIN_RATIO if tuned_inside else 0.0)
    else:
        estimate = estimate_tail(energies, floor, texts)
    factor = NESTED_BAR_FACTOR if four else BAR_FACTOR
    note, reliable = estimate.note, estimate.reliable
    if tuned_inside and four:
        reliable = False
        note = (note + "; " if note else "") + (f"the basis was tuned at N = {tuned_at}, inside the "
                                                "nested sizes, which then converge unevenly: the "
                                                f"ratio is not taken below {MIN_RATIO:.3g}")
    if floor > 0 and floor >= estimate.tail_hartree:
        note = (note + "; " if note else "") + ("the bar is set by the estimated arithmetic error, "
                                                "not by the basis: a higher precision gives a tighter one")
        if statistical[0] or statistical[-1]:  # the floor comes from N or N/√2
            reliable = False
            note += (" (the double-double rounding is estimated statistically, not bounded: the bar "
                     "can be far wider than the error, or short of it; --precision extended bounds it)")
    names = ("N/2√2, " if four else "") + "N/2, N/√2, N"
    return {"error_bar_hartree": estimate.variational_bar_hartree, "tail_hartree": estimate.tail_hartree,
            "ratio": estimate.ratio, "sizes": sizes + [size], "energy_texts": texts,
            "extrapolated_hartree": estimate.extrapolated_hartree, "reliable": reliable,
            "note": note, "bar_factor": factor,
            "method": f"geometric tail of nested bases {names} (x{factor:g})"}
