r"""Convergence of a variational energy with the basis size: a study over nested bases.

:func:`run_study` solves one state for increasing nested sizes and extrapolates with the one
geometric-tail estimate of :mod:`twoel.solver.error_bar` (:func:`estimate_tail`, re-exported
here with its constants), which also gives the error bar of a single solve.  Each row of a
:class:`ConvergenceStudy` has ``step_hartree = E(N_{k-1}) - E(N_k)``.

Arithmetic error of each size: an energy refined beyond float64 carries the bound of its
refinement; a float64 energy carries the rise of the energy when the drop threshold is raised
10x (:func:`twoel.solver.error_bar.float64_energy`, on the matrices of that size).  Float64
P-state energies stagnate once near-dependent directions are dropped, so the steps alone look
converged; the largest arithmetic error of the sizes that enter the tail (the last three) is
given to :func:`estimate_tail` so the bar covers it.

No error bar (``None``, ``reliable`` false) for a family without a size parameter or whose
energies do not change with the size: its sizes are not a converging sequence.

Binding: an energy at or above the one-electron threshold ``-Z²/2`` is not bound at that size;
no extrapolated value is given when the last energy is not bound, and an extrapolated value
whose bar reaches the threshold is flagged (:attr:`ConvergenceStudy.binding_note`).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field
from typing import Callable, Sequence

from twoel.errors import InputError
from twoel.results import Result
from twoel.solver.error_bar import (BAR_FACTOR, MAX_RATIO, MIN_RATIO, TailEstimate,  # noqa: F401
                                    error_bar_sizes, estimate_tail, step_ratios, steps)
from twoel.solver.error_bar import supported_digits
from twoel.solver.pipeline import solve

#: why a study gets no error bar
NOT_A_SEQUENCE = "no error bar: the family's sizes are not a converging sequence"

def differences_and_ratios(energies: Sequence[float]) -> tuple[list, list]:
    """Steps ``d_k = E_{k-1} - E_k`` (``None`` for k = 0) and ``q_k = d_k/d_{k-1}`` (``None`` where undefined)."""
    d = steps(energies)
    return [None] + d, ([None, None] + step_ratios(d))[: len(energies)]


def trusted_digits(value: float, error_bar: float) -> int:
    """Significant digits of ``value`` that an error bar ``error_bar`` (Eh) supports: those whose
    half unit in the last place is at least the bar (the rule of ``twoel energy --digits``);
    0 without a bar."""
    if error_bar is None or not (math.isfinite(error_bar) and error_bar > 0) or value == 0:
        return 0
    return max(0, supported_digits(value, error_bar))


@dataclass(frozen=True, repr=False)
class ConvergenceStudy(Result):
    """Energies of one state for a sequence of basis sizes, with the extrapolation.

    All energies in hartree.  ``differences[k] = E[k-1] - E[k]`` (the steps between nested
    bases, also :attr:`steps`), ``ratios[k] = differences[k] / differences[k-1]`` (``None``
    where undefined).  ``bound[k]``: ``E[k]`` is below the one-electron threshold
    ``threshold_hartree`` (``-Z²/2``).  ``variational_error_bar_hartree`` (also
    :attr:`error_bar_hartree`) and the extrapolation are ``None`` when the family's sizes are
    not a converging sequence; the extrapolation is ``None`` also when the last energy is not
    bound.  In :meth:`to_dict` each row carries the step as ``step_hartree``;
    ``difference_hartree`` is kept there as its documented alias (old name, same value: it is
    a step, not ``E - E_reference``).
    """

    Z: float
    ion: str
    state: str
    family: str
    precision: str
    sizes: tuple
    energies: tuple
    energy_texts: tuple
    numerical_errors: tuple
    differences: tuple
    ratios: tuple
    seconds: tuple
    extrapolated_hartree: float | None
    extrapolated_error_bar_hartree: float | None
    variational_hartree: float
    variational_error_bar_hartree: float | None
    digits: int
    reliable: bool
    note: str
    threshold_hartree: float | None = None
    bound: tuple = ()
    binding_note: str = ""
    may_be_unbound: bool = False
    reference_hartree: float | None = None
    reference_text: str | None = None
    reference_source: str | None = None
    provenance: dict = field(default_factory=dict)

    SUMMARY = ("ion", "state", "variational_hartree")
    #: per-row alias of :meth:`to_dict`: old name -> current name
    ROW_ALIASES = {"difference_hartree": "step_hartree"}

    @property
    def steps(self) -> tuple:
        """``E(N_{k-1}) - E(N_k)`` (Eh; ``None`` for the first size)."""
        return self.differences

    @property
    def error_bar_hartree(self) -> float | None:
        """Error bar of the last (variational) energy (Eh), ``None`` without one."""
        return self.variational_error_bar_hartree

    def to_dict(self) -> dict:
        return self._with_aliases({
            "Z": self.Z, "ion": self.ion, "state": self.state, "family": self.family,
            "precision": self.precision,
            "rows": [{"size": n, "energy_hartree": e, "energy_hartree_text": t,
                      "numerical_error_hartree": u, "difference_hartree": d, "step_hartree": d,
                      "ratio": q, "seconds": s, "bound": b}
                     for n, e, t, u, d, q, s, b in zip(self.sizes, self.energies, self.energy_texts,
                                                       self.numerical_errors, self.differences,
                                                       self.ratios, self.seconds,
                                                       self.bound or (None,) * len(self.sizes))],
            "variational_hartree": self.variational_hartree,
            "variational_error_bar_hartree": self.variational_error_bar_hartree,
            "extrapolated_hartree": self.extrapolated_hartree,
            "extrapolated_error_bar_hartree": self.extrapolated_error_bar_hartree,
            "error_bar_hartree": self.error_bar_hartree,
            "threshold_hartree": self.threshold_hartree,
            "bound": bool(self.bound[-1]) if self.bound else None,
            "may_be_unbound": self.may_be_unbound, "binding_note": self.binding_note,
            "digits": self.digits, "reliable": self.reliable, "note": self.note,
            "reference_hartree": self.reference_hartree, "reference_text": self.reference_text,
            "reference_source": self.reference_source,
            "true_error_hartree": self.true_error_hartree(),
            "provenance": self.provenance,
        })

    def true_error_hartree(self) -> float | None:
        """Last energy minus the reference (Eh), from their decimal texts (beyond float64)."""
        if self.reference_hartree is None:
            return None
        import mpmath

        reference = self.reference_text or repr(self.reference_hartree)
        try:
            with mpmath.workdps(60):
                return float(mpmath.mpf(self.energy_texts[-1]) - mpmath.mpf(reference))
        except (ValueError, TypeError):
            return self.variational_hartree - self.reference_hartree

    def to_frame(self):
        """A :class:`pandas.DataFrame` with one row per basis size."""
        import pandas as pd

        return pd.DataFrame(self.to_dict()["rows"])


def default_sizes(largest: int, count: int = 5, ratio: float = math.sqrt(2.0)) -> list[int]:
    """``count`` sizes ending at ``largest``, each ``ratio`` times the previous (rounded)."""
    if largest < 8:
        raise InputError("the largest basis size must be at least 8")
    sizes = sorted({max(4, int(round(largest / ratio**k))) for k in range(count)})
    return sizes


def run_study(Z, state="1^1S", sizes: Sequence[int] = (100, 141, 200, 283, 400),
              family="exponential", precision: str = "float64", digits: int | None = None,
              progress: Callable[[int, int], None] | None = None) -> ConvergenceStudy:
    """Solve for every size and extrapolate (see module text).

    Parameters
    ----------
    Z, state, family, precision, digits
        As for :func:`twoel.solve`.
    sizes : sequence of int
        Increasing basis sizes (at least three).
    progress : callable, optional
        ``progress(done, total)`` after each size.
    """
    sizes = [int(n) for n in sizes]
    if len(sizes) < 3:
        raise InputError("'sizes' needs at least three basis sizes")
    if any(b <= a for a, b in zip(sizes, sizes[1:])):
        raise InputError(f"'sizes' must increase strictly, got {sizes}")
    results = []
    for k, n in enumerate(sizes):
        started = time.perf_counter()
        r = solve(Z, state, family, n, precision=precision, digits=digits, error_bar=False)
        error = _arithmetic_error(r)
        results.append((r, time.perf_counter() - started, error))
        if progress is not None:
            progress(k + 1, len(sizes))
    energies = [r.energy_hartree for r, _t, _u in results]
    texts = [r.energy_full_text for r, _t, _u in results]
    numerical = [u for _r, _t, u in results]
    last = results[-1][0]
    refined = last.provenance.get("refinement") is not None
    # refined energies: the last one's bound (as before); float64: every energy entering the tail
    floor = max(numerical[-1], 0.0) if refined else max(numerical[-3:])
    estimate = estimate_tail(energies, floor, texts)
    d = steps(energies, texts)
    diffs, ratios = [None] + d, [None, None] + step_ratios(d)
    threshold = float(last.threshold_hartree)
    bound = tuple(bool(e < threshold) for e in energies)
    sequence = _is_sequence(last.family, d, energies)
    if sequence:
        bar, extrapolated = estimate.variational_bar_hartree, estimate.extrapolated_hartree
        extrapolated_bar, reliable, note = estimate.extrapolated_bar_hartree, estimate.reliable, estimate.note
    else:
        bar = extrapolated = extrapolated_bar = None
        reliable, note = False, NOT_A_SEQUENCE
    binding_note, may_be_unbound = _binding(energies, numerical, bound, sizes, threshold,
                                            extrapolated, extrapolated_bar)
    if not bound[-1]:
        extrapolated = extrapolated_bar = None
    ref = last.reference
    return ConvergenceStudy(
        Z=last.Z, ion=last.ion, state=last.state, family=last.family, precision=precision,
        sizes=tuple(sizes), energies=tuple(energies), energy_texts=tuple(texts),
        numerical_errors=tuple(numerical), differences=tuple(diffs), ratios=tuple(ratios[: len(sizes)]),
        seconds=tuple(t for _r, t, _u in results),
        extrapolated_hartree=extrapolated, extrapolated_error_bar_hartree=extrapolated_bar,
        variational_hartree=energies[-1], variational_error_bar_hartree=bar,
        digits=trusted_digits(energies[-1], bar), reliable=reliable, note=note,
        threshold_hartree=threshold, bound=bound, binding_note=binding_note,
        may_be_unbound=may_be_unbound,
        reference_hartree=None if ref is None else ref.value,
        reference_text=None if ref is None else ref.value_text,
        reference_source=None if ref is None else ref.source,
        provenance={"method": "sequence of nested bases, geometric tail of the differences",
                    "arithmetic_error": "refinement bound" if refined else
                    "float64: rise of the energy when the drop threshold is raised 10x, per size",
                    "bar_factor": BAR_FACTOR, "max_ratio": MAX_RATIO,
                    "last": {k: last.provenance.get(k) for k in ("version", "family", "precision",
                                                                "refinement", "boxes")}},
    )


def _arithmetic_error(result) -> float:
    """Arithmetic error (Eh) of one solve: the refinement's bound when it was refined beyond
    float64, else the float64 estimate of :func:`float64_energy` on the matrices of its size."""
    if result.provenance.get("refinement") is not None:
        return float(result.provenance.get("numerical_error_hartree") or 0.0)
    from twoel.solver.error_bar import float64_energy
    from twoel.system import State

    basis = result.wavefunction.basis
    matrices = basis.matrices()
    threshold = result.provenance.get("drop_threshold")
    estimate = float64_energy(matrices.hamiltonian(result.Z), matrices.overlap,
                              State.parse(result.state).root, threshold)
    return float(estimate.numerical_error_hartree)


def _is_sequence(family: str, d: Sequence[float], energies: Sequence[float]) -> bool:
    """Whether the sizes form a converging sequence: the family has a size parameter and the
    energies change with it (beyond a few ulp)."""
    from twoel.basis import get_family

    if get_family(family).size_meaning is None:
        return False
    scale = max(abs(float(e)) for e in energies)
    return any(abs(x) > 1e-14 * scale for x in d)


def _binding(energies, numerical, bound, sizes, threshold, extrapolated, extrapolated_bar):
    """The binding note and flag of a study (see module text)."""
    if not bound[-1]:
        return (f"not bound: E(N = {sizes[-1]}) is not below the one-electron threshold "
                f"{threshold!r} Eh; no extrapolated energy is given"), True
    if energies[-1] + numerical[-1] >= threshold:
        return (f"E(N = {sizes[-1]}) is below the one-electron threshold by less than its "
                "arithmetic error: the state may be unbound"), True
    if extrapolated is not None and extrapolated_bar is not None \
            and extrapolated + extrapolated_bar >= threshold:
        return ("the bar of the extrapolated energy reaches the one-electron threshold: the "
                f"binding energy is not resolved (the variational E(N = {sizes[-1]}) is below the "
                "threshold, so the state is bound in this model)"), False
    first = next((n for n, b in zip(sizes, bound) if b), None)
    if first != sizes[0]:
        return f"bound from N = {first} on (smaller sizes are not below the threshold)", False
    return "", False
