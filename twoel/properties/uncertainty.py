r"""Uncertainties of expectation values from a nested-basis sequence (pure functions).

The energy's error bar (:mod:`twoel.solver.error_bar`) uses the values at ``N/2``, ``N/√2`` and
``N``.  An expectation value other than the energy need not converge monotonically (it is not
variational: its error is first order in the wave-function error for the direct forms, and of
either sign), so :func:`sequence_bar` is a documented variant of
:func:`twoel.solver.error_bar.estimate_tail`:

* steps ``d1 = v1 - v0``, ``d2 = v2 - v1`` of the three values ``v0, v1, v2``;
* **regular** sequence (both steps of one sign, ``|d2| < |d1|``): the geometric tail of
  :func:`estimate_tail` on the sequence oriented to decrease, bar ``2·tail + floor``;
* **irregular** sequence (the steps change sign, or the last one is not smaller): bar
  ``max(STEP_FACTOR·|d2|, |d1|) + floor``, and ``reliable`` is false when the last step is
  larger than the one before (the value got worse as the basis grew) or the last value is
  outside the floor of the one before at a sign change that does not shrink;
* ``floor`` is the arithmetic error of the last value: how much it moves when the overlap's
  drop threshold of the float64 solve is raised tenfold (the same measure as
  :class:`twoel.solver.error_bar.Float64Energy`), so a bar never claims digits the float64
  eigenvector does not carry.

A value whose last step is at or below twice the floor is "converged to the arithmetic error": its
bar is ``2·floor + max(|d1|, |d2|)`` (measured for He 1¹S: the float64 error of ``⟨1/r1²⟩`` and
the regularized δ(r1) is up to ~5x the drop-threshold change, so the geometric tail of shrinking
steps would not cover it).

Every bar whose last step is larger than the one before (the value moved more as the basis
grew) is flagged ``worsened``, also when the steps are within the arithmetic error and the bar
stays reliable: such a value did not get better with the largest basis.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from twoel.errors import InputError
from twoel.solver.error_bar import BAR_FACTOR, estimate_tail

#: factor on the last step for an irregular (sign-changing) sequence (common practice)
STEP_FACTOR = 3.0


@dataclass(frozen=True)
class PropertyBar:
    """One expectation value with its uncertainty (same unit as the value).

    Attributes
    ----------
    value : float
        The value of the largest basis.
    uncertainty : float
        Its uncertainty (truncation + arithmetic), ``0`` for an exact value.
    reliable : bool
        False when the sequence is irregular in a way the bar may not cover.
    note : str
        Why it is unreliable, exact, or how it was estimated.
    sequence : tuple of float
        The values of the nested bases, smallest first.
    floor : float
        The arithmetic part of the uncertainty.
    worsened : bool
        The last step of the sequence is larger than the one before (flagged, see the module).
    """

    value: float
    uncertainty: float
    reliable: bool = True
    note: str = ""
    sequence: tuple = field(default=())
    floor: float = 0.0
    worsened: bool = False

    def to_dict(self) -> dict:
        return {"value": self.value, "uncertainty": self.uncertainty, "reliable": self.reliable,
                "note": self.note, "sequence": list(self.sequence), "arithmetic_floor": self.floor,
                "worsened": self.worsened}


def exact(value: float, note: str) -> PropertyBar:
    """A value fixed by symmetry (uncertainty 0)."""
    return PropertyBar(float(value), 0.0, True, note, (), 0.0)


def sequence_bar(values, floor: float = 0.0) -> PropertyBar:
    """Uncertainty of the last of three nested values (see the module text).

    Parameters
    ----------
    values : sequence of float
        ``v(N/2), v(N/√2), v(N)`` (any unit).
    floor : float
        Arithmetic error of the last value (same unit, >= 0).
    """
    v = [float(x) for x in values]
    if len(v) < 3 or not all(math.isfinite(x) for x in v):
        raise InputError("an uncertainty from nested bases needs three finite values")
    floor = max(float(floor), 0.0) if math.isfinite(floor) else abs(v[-1])
    d1, d2 = v[-2] - v[-3], v[-1] - v[-2]
    worsened = abs(d2) > abs(d1)
    regular = d1 * d2 > 0 and abs(d2) < abs(d1)
    sign = -1.0 if d2 > 0 else 1.0  # orient so that the sequence decreases
    if abs(d2) <= 2 * floor:
        note = "steps at the level of the arithmetic error: converged to it"
        # not the tail of the shrinking steps: the floor (one tenfold threshold change) can
        # underestimate the float64 scatter (measured for He 1¹S ⟨1/r1²⟩ in a three-shell
        # basis tried: error 2.5e-9 relative, floor 5e-10, tail 2e-10), so the earlier step
        # stays in the bar
        truncation = max(abs(d1), abs(d2))
        if worsened:
            note += ("; the last step is larger than the one before (the value did not improve "
                     "with the largest basis)")
        return PropertyBar(v[-1], 2 * floor + truncation, True, note, tuple(v), floor, worsened)
    if regular:
        tail = estimate_tail([sign * x for x in v], floor)
        bar = BAR_FACTOR * tail.tail_hartree + floor
        return PropertyBar(v[-1], bar, tail.reliable, tail.note or
                           f"regular sequence, ratio {abs(d2 / d1):.2f}: geometric tail x{BAR_FACTOR:g}",
                           tuple(v), floor)
    bar = max(STEP_FACTOR * abs(d2), abs(d1)) + floor
    grows = abs(d2) > abs(d1) + 2 * floor
    note = ("the value moved more in the last step than in the one before (irregular: bar from "
            "the steps, may not cover)" if grows else
            f"steps change sign: bar {STEP_FACTOR:g} x the last step")
    return PropertyBar(v[-1], bar, not grows, note, tuple(v), floor, worsened)


def check_nonnegative(bar: PropertyBar, name: str) -> PropertyBar:
    """A δ expectation is ``∫|Ψ|²`` over a set: >= 0.  Negative beyond its bar is flagged."""
    if bar.value < 0 and -bar.value > bar.uncertainty:
        note = (f"{name} came out negative ({bar.value:.3e}) beyond its uncertainty "
                f"({bar.uncertainty:.1e}); a δ expectation cannot be negative: not a value")
        return PropertyBar(bar.value, bar.uncertainty, False, note, bar.sequence, bar.floor, bar.worsened)
    return bar
