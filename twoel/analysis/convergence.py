r"""Convergence of a variational energy with the basis size, and an error bar for it.

For a sequence of nested bases ``N_1 < N_2 < ... < N_K`` the energies ``E_k`` decrease
(Rayleigh–Ritz).  With the differences ``d_k = E_{k-1} - E_k`` and their ratios
``q_k = d_k / d_{k-1}`` a geometric tail gives the remaining error of the last energy

.. math:: E_K - E_\infty \approx d_K \frac{q}{1-q},

with ``q`` the *largest* of the last two ratios (the slower one, so the tail is not
underestimated), kept between 1/3 and 0.8: quasi-random nested bases converge
sub-geometrically, so an apparently fast ratio is not trusted, and an erratic or near-1 ratio
is capped (and reported as unreliable).  This is the
Aitken/Richardson-type estimate customary for explicitly correlated bases (e.g. Drake,
Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11, where ratios of
successive differences are tabulated).

Error bars
----------
``variational error bar`` (what ``twoel energy`` reports for ``E_K``):
    ``2·tail + numerical error``; the true ``E_K - E_exact`` is positive and expected within it.
``extrapolated value``:
    ``E_K - d_K q/(1-q)`` with the *measured* ratio, and the bar ``tail + numerical error``
    with the conservative one (the whole correction is the uncertainty).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field
from typing import Callable, Sequence

import numpy as np

from twoel.errors import InputError

#: largest ratio of successive differences trusted for the geometric tail
MAX_RATIO = 0.8
#: smallest ratio used: quasi-random nested bases converge sub-geometrically, so a fast apparent
#: ratio from a few sizes underestimates the tail (measured for He, H⁻, Li⁺ with N ratio √2)
MIN_RATIO = 1.0 / 3.0
#: factor between the tail estimate and the error bar of the variational (upper-bound) value
BAR_FACTOR = 2.0


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


def differences_and_ratios(energies: Sequence[float]) -> tuple[list, list]:
    """``d_k = E_{k-1} - E_k`` (``None`` for k = 0) and ``q_k = d_k/d_{k-1}`` (``None`` where undefined)."""
    E = [float(e) for e in energies]
    diffs: list = [None] + [E[k - 1] - E[k] for k in range(1, len(E))]
    ratios: list = [None, None]
    for k in range(2, len(E)):
        prev = diffs[k - 1]
        ratios.append(diffs[k] / prev if prev not in (None, 0.0) else None)
    return diffs, ratios[: len(E)]


def estimate_tail(energies: Sequence[float], numerical_error: float = 0.0,
                  energies_precise: Sequence[float] | None = None) -> TailEstimate:
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
    if energies_precise is not None:
        import mpmath

        with mpmath.workdps(60):
            values = [mpmath.mpf(str(e)) for e in energies_precise]
            diffs = [float(values[k - 1] - values[k]) for k in range(1, len(values))]
    else:
        diffs = [float(energies[k - 1]) - float(energies[k]) for k in range(1, len(energies))]
    d_last, d_prev = diffs[-1], diffs[-2]
    floor = max(numerical_error, 0.0)
    reliable = True
    note = ""
    if d_last < -2 * floor - 1e-300 or d_prev < -2 * floor - 1e-300:
        reliable = False
        note = "energies do not decrease with N (numerical noise or non-nested bases)"
    ratios = [diffs[k] / diffs[k - 1] for k in range(1, len(diffs)) if diffs[k - 1] > 0]
    tail_ratios = ratios[-2:] if len(ratios) >= 2 else ratios
    q = max(tail_ratios) if tail_ratios else MAX_RATIO
    if not 0 < q < MAX_RATIO:
        if not note:
            note = f"ratio of successive differences {q:.2f} is not well below 1; tail capped"
        reliable = reliable and 0 < q < 1
        q = MAX_RATIO
    d = max(abs(d_last), 0.0)
    measured_tail = d * q / (1.0 - q) if q > 0 else 0.0  # best guess, for the extrapolation
    q = max(q, MIN_RATIO)
    tail = d * q / (1.0 - q)  # conservative, for the bars
    if d <= 2 * floor:
        note = note or "differences at the level of the arithmetic error: converged to it"
        tail = max(tail, floor)
    last = float(energies[-1])
    variational_bar = BAR_FACTOR * tail + floor
    extrapolated_bar = tail + floor
    return TailEstimate(tail, q, last - measured_tail, variational_bar, extrapolated_bar, reliable, note)


def trusted_digits(value: float, error_bar: float) -> int:
    """Significant digits of ``value`` that an error bar ``error_bar`` leaves certain."""
    if not (math.isfinite(error_bar) and error_bar > 0) or value == 0:
        return 0
    return max(0, int(math.floor(math.log10(abs(value) / error_bar))))


@dataclass(frozen=True)
class ConvergenceStudy:
    """Energies of one state for a sequence of basis sizes, with the extrapolation.

    All energies in hartree.  ``differences[k] = E[k-1] - E[k]``, ``ratios[k] =
    differences[k] / differences[k-1]`` (``None`` where undefined).
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

    def to_dict(self) -> dict:
        return {
            "Z": self.Z, "ion": self.ion, "state": self.state, "family": self.family,
            "precision": self.precision,
            "rows": [{"size": n, "energy_hartree": e, "energy_hartree_text": t,
                      "numerical_error_hartree": u, "difference_hartree": d, "ratio": q,
                      "seconds": s}
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
        }

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
    from twoel.solver.pipeline import solve

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
    import mpmath

    with mpmath.workdps(60):
        values = [mpmath.mpf(t) for t in texts]
        diffs = [None] + [float(values[k - 1] - values[k]) for k in range(1, len(values))]
    ratios = [None, None] + [diffs[k] / diffs[k - 1] if diffs[k - 1] else None
                             for k in range(2, len(diffs))]
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


def error_bar_sizes(size: int) -> list[int]:
    """The two smaller sizes used for the error bar of a single ``size`` (``N/2``, ``N/√2``)."""
    return sorted({max(4, int(round(size / 2))), max(5, int(round(size / math.sqrt(2.0))))} - {size})


def finite(x) -> bool:
    return x is not None and bool(np.isfinite(x))
