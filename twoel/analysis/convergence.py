r"""Convergence of a variational energy with the basis size: a study over nested bases.

:func:`run_study` solves one state for increasing nested sizes and extrapolates with the one
geometric-tail estimate of :mod:`twoel.solver.error_bar` (:func:`estimate_tail`, re-exported
here with its constants), which also gives the error bar of a single solve.  Each row of a
:class:`ConvergenceStudy` has ``step_hartree = E(N_{k-1}) - E(N_k)``.
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
from twoel.solver.pipeline import solve

def differences_and_ratios(energies: Sequence[float]) -> tuple[list, list]:
    """Steps ``d_k = E_{k-1} - E_k`` (``None`` for k = 0) and ``q_k = d_k/d_{k-1}`` (``None`` where undefined)."""
    d = steps(energies)
    return [None] + d, ([None, None] + step_ratios(d))[: len(energies)]


def trusted_digits(value: float, error_bar: float) -> int:
    """Significant digits of ``value`` that an error bar ``error_bar`` leaves certain."""
    if not (math.isfinite(error_bar) and error_bar > 0) or value == 0:
        return 0
    return max(0, int(math.floor(math.log10(abs(value) / error_bar))))


@dataclass(frozen=True, repr=False)
class ConvergenceStudy(Result):
    """Energies of one state for a sequence of basis sizes, with the extrapolation.

    All energies in hartree.  ``differences[k] = E[k-1] - E[k]`` (the steps between nested
    bases, also :attr:`steps`), ``ratios[k] = differences[k] / differences[k-1]`` (``None``
    where undefined).  In :meth:`to_dict` each row carries the step as ``step_hartree``;
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

    def to_dict(self) -> dict:
        return self._with_aliases({
            "Z": self.Z, "ion": self.ion, "state": self.state, "family": self.family,
            "precision": self.precision,
            "rows": [{"size": n, "energy_hartree": e, "energy_hartree_text": t,
                      "numerical_error_hartree": u, "difference_hartree": d, "step_hartree": d,
                      "ratio": q, "seconds": s}
                     for n, e, t, u, d, q, s in zip(self.sizes, self.energies, self.energy_texts,
                                                    self.numerical_errors, self.differences,
                                                    self.ratios, self.seconds)],
            "variational_hartree": self.variational_hartree,
            "variational_error_bar_hartree": self.variational_error_bar_hartree,
            "extrapolated_hartree": self.extrapolated_hartree,
            "extrapolated_error_bar_hartree": self.extrapolated_error_bar_hartree,
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
        results.append((r, time.perf_counter() - started))
        if progress is not None:
            progress(k + 1, len(sizes))
    energies = [r.energy_hartree for r, _t in results]
    texts = [r.provenance.get("energy_full_text") or repr(r.energy_hartree) for r, _t in results]
    numerical = [float(r.provenance.get("numerical_error_hartree") or 0.0) for r, _t in results]
    estimate = estimate_tail(energies, max(numerical[-1], 0.0), texts)
    d = steps(energies, texts)
    diffs, ratios = [None] + d, [None, None] + step_ratios(d)
    last = results[-1][0]
    ref = last.reference
    return ConvergenceStudy(
        Z=last.Z, ion=last.ion, state=last.state, family=last.family, precision=precision,
        sizes=tuple(sizes), energies=tuple(energies), energy_texts=tuple(texts),
        numerical_errors=tuple(numerical), differences=tuple(diffs), ratios=tuple(ratios[: len(sizes)]),
        seconds=tuple(t for _r, t in results),
        extrapolated_hartree=estimate.extrapolated_hartree,
        extrapolated_error_bar_hartree=estimate.extrapolated_bar_hartree,
        variational_hartree=energies[-1], variational_error_bar_hartree=estimate.variational_bar_hartree,
        digits=trusted_digits(energies[-1], estimate.variational_bar_hartree),
        reliable=estimate.reliable, note=estimate.note,
        reference_hartree=None if ref is None else ref.value,
        reference_text=None if ref is None else ref.value_text,
        reference_source=None if ref is None else ref.source,
        provenance={"method": "sequence of nested bases, geometric tail of the differences",
                    "bar_factor": BAR_FACTOR, "max_ratio": MAX_RATIO,
                    "last": {k: last.provenance.get(k) for k in ("version", "family", "precision",
                                                                "refinement", "boxes")}},
    )
