"""Term diagram figure: levels as horizontal lines in columns by angular momentum and spin.

Plain arrays in (Hartree atomic units), a :class:`matplotlib.figure.Figure` out, built without
:mod:`matplotlib.pyplot` as in :mod:`twoel.report.plots` (write it with
:func:`twoel.report.plots.save_figure` or :func:`twoel.report.plots.figure_bytes`, atomically).
"""

from __future__ import annotations

import numpy as np

from twoel.errors import InputError
from twoel.report.plots import _figure, _finish

_LETTERS = "SPDFGHIK"
#: line colours of singlet and triplet columns
_COLOURS = {1: "tab:blue", 3: "tab:red"}


def series_columns(L, multiplicity) -> list[tuple[int, int]]:
    """The ``(L, multiplicity)`` columns of the diagram, in the order ¹S ³S ¹P ³P ..."""
    return sorted({(int(a), int(b)) for a, b in zip(L, multiplicity)})


def term_diagram_figure(L, multiplicity, n, energy_hartree, threshold_hartree: float | None = None,
                        title: str | None = None, empty_series=()):
    """Energy levels (Eh) as horizontal lines, one column per series ``^{2S+1}L``.

    Parameters
    ----------
    L, multiplicity, n : array_like of int
        Angular momentum, spin multiplicity (1 or 3) and principal quantum number of each level.
    energy_hartree : array_like
        Level energies (Eh); NaN entries (levels not computed) are left out.
    threshold_hartree : float, optional
        The ionization threshold ``−Z²/2`` (Eh), drawn as a dashed line.
    title : str, optional
        Figure title.
    empty_series : iterable of (L, multiplicity)
        Series requested but without a computed level: shown as labelled empty columns.
    """
    L, mult, nn = (np.asarray(x, dtype=int) for x in (L, multiplicity, n))
    e = np.asarray(energy_hartree, dtype=float)
    if not (L.shape == mult.shape == nn.shape == e.shape) or e.ndim != 1:
        raise InputError("L, multiplicity, n and energy_hartree must be one-dimensional and of equal length")
    keep = np.isfinite(e)
    columns = sorted(set(series_columns(L[keep], mult[keep])) | {tuple(map(int, s)) for s in empty_series})
    if not columns:
        raise InputError("nothing to plot: no level has an energy")
    fig = _figure(max(4.0, 1.1 * len(columns) + 1.5), 5.2)
    ax = fig.add_subplot()
    for x, (l_value, m_value) in enumerate(columns):
        chosen = keep & (L == l_value) & (mult == m_value)
        for level_n, value in zip(nn[chosen], e[chosen]):
            ax.hlines(value, x - 0.32, x + 0.32, lw=1.6, color=_COLOURS.get(m_value, "black"))
            ax.annotate(f"{level_n}", (x + 0.34, value), va="center", fontsize="x-small")
        if not chosen.any():
            ax.annotate("not available", (x, 0.5), xycoords=("data", "axes fraction"), rotation=90,
                        ha="center", va="center", fontsize="x-small", color="grey")
    if threshold_hartree is not None:
        ax.axhline(threshold_hartree, ls="--", color="grey", lw=0.8)
        ax.annotate(r"threshold $-Z^2/2$", (len(columns) - 0.5, threshold_hartree), textcoords="offset points",
                    xytext=(0, -9), ha="right", fontsize="x-small", color="grey")
    labels = [rf"${{}}^{{{m}}}\mathrm{{{_LETTERS[l]}}}$" for l, m in columns]
    ax.set_xticks(range(len(columns)), labels)
    ax.set_xlim(-0.6, len(columns) - 0.4)
    _finish(ax, "series (total L and spin multiplicity)", r"energy / $E_\mathrm{h}$",
            title or "Term diagram", legend=False, grid_axis="y")
    return fig
