"""Figures for reports (matplotlib, no display needed).

Every function takes plain arrays (Hartree atomic units) and returns a
:class:`matplotlib.figure.Figure` built without :mod:`matplotlib.pyplot`, so no GUI backend is
ever touched and no global figure state is kept: rendering goes through the Agg (PNG) and SVG
canvases only.  :func:`save_figure` writes PNG and SVG atomically (:mod:`twoel.io`).

Axes carry their units: energies in hartree (Eh) or millihartree (mEh), lengths in bohr (a0),
densities in bohr⁻¹.
"""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np

from twoel.errors import InputError

FIGURE_FORMATS = ("png", "svg")
#: fixed SVG hash salt and no dates, so repeated builds give the same SVG text
_SVG_METADATA = {"Date": None}


def _figure(width: float = 6.4, height: float = 4.2):
    import matplotlib

    matplotlib.rcParams["svg.hashsalt"] = "twoel"
    from matplotlib.figure import Figure

    fig = Figure(figsize=(width, height), dpi=100, layout="constrained")
    return fig


def _arrays(*pairs):
    out = []
    n = None
    for name, values in pairs:
        a = np.asarray(values, dtype=float)
        if a.ndim != 1:
            raise InputError(f"{name} must be a one-dimensional array, got shape {a.shape}")
        if n is None:
            n = a.size
        elif a.size != n:
            raise InputError(f"{name} has {a.size} entries, expected {n}")
        out.append(a)
    if not n:
        raise InputError("nothing to plot: the arrays are empty")
    return out


def _optional(name: str, values):
    """``values`` as a one-dimensional float array, or ``None`` when not given."""
    return None if values is None else _arrays((name, values))[0]


def _finish(ax, xlabel: str, ylabel: str, title: str, legend: bool = True, grid_axis: str = "both"):
    """Label both axes, draw a light grid, add the legend (when asked) and the title."""
    ax.set_xlabel(xlabel)
    ax.set_ylabel(ylabel)
    ax.grid(True, axis=grid_axis, alpha=0.3)
    if legend:
        ax.legend(fontsize="small")
    ax.set_title(title)


def _log_abs(values):
    v = np.abs(np.asarray(values, dtype=float))
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(v > 0, np.log10(v), np.nan)
    return out


def convergence_figure(size, energy_hartree, reference_hartree: float | None = None,
                       extrapolated_hartree: float | None = None, error_bar_hartree=None,
                       size_label: str = "basis size N (number of terms)", title: str | None = None):
    """log₁₀|ΔE| of successive increments, of the error against a reference, and of the
    distance to an extrapolated limit, against basis size.

    Parameters
    ----------
    size : array_like
        Basis sizes (number of terms, or the family's size parameter).
    energy_hartree : array_like
        Variational energies (Eh), same length.
    reference_hartree, extrapolated_hartree : float, optional
        A published value and an estimated limit (Eh).
    error_bar_hartree : array_like, optional
        Error bars (Eh) to draw as a band (log₁₀ of the bar).
    """
    n, e = _arrays(("size", size), ("energy_hartree", energy_hartree))
    fig = _figure()
    ax = fig.add_subplot()
    if e.size > 1:
        ax.plot(n[1:], _log_abs(np.diff(e)), "o-", label=r"increment $|E_k - E_{k-1}|$")
    if reference_hartree is not None:
        ax.plot(n, _log_abs(e - reference_hartree), "s-", label=r"$|E - E_\mathrm{ref}|$")
    if extrapolated_hartree is not None and np.isfinite(extrapolated_hartree):
        ax.plot(n, _log_abs(e - extrapolated_hartree), "^--", label=r"$|E - E_\mathrm{extrap}|$")
    bar = _optional("error_bar_hartree", error_bar_hartree)
    if bar is not None:
        ax.plot(n, _log_abs(bar), ":", color="grey", label="error bar")
    _finish(ax, size_label, r"$\log_{10}$ |energy difference / $E_\mathrm{h}$|",
            title or "Convergence with basis size")
    return fig


def residual_figure(Z, residual_hartree, label: str = r"$E - E_\mathrm{ref}$", title: str | None = None):
    """log₁₀ of |E − E_ref| (Eh) across an isoelectronic sequence, against Z."""
    z, r = _arrays(("Z", Z), ("residual_hartree", residual_hartree))
    fig = _figure()
    ax = fig.add_subplot()
    ax.plot(z, _log_abs(r), "o-", label=label)
    negative = r < 0
    if negative.any():
        ax.plot(z[negative], _log_abs(r[negative]), "rx", label="below reference (not an upper bound!)")
    _finish(ax, "nuclear charge Z", r"$\log_{10}$ |$E - E_\mathrm{ref}$| / $E_\mathrm{h}$",
            title or "Residuals against published energies")
    return fig


def correlation_figure(Z, energy_hartree, hartree_fock_hartree, reference_hartree=None,
                       title: str | None = None):
    """Correlation energy ``E − E_HF`` (mEh) against Z; with ``reference_hartree`` also the
    full correlation energy ``E_ref − E_HF`` of the published energies."""
    z, e, hf = _arrays(("Z", Z), ("energy_hartree", energy_hartree),
                       ("hartree_fock_hartree", hartree_fock_hartree))
    fig = _figure()
    ax = fig.add_subplot()
    ax.plot(z, 1e3 * (e - hf), "o-", label=r"computed $E - E_\mathrm{HF}$")
    ref = _optional("reference_hartree", reference_hartree)
    if ref is not None:
        ax.plot(z, 1e3 * (ref - hf), "s--", label=r"published $E_\mathrm{ref} - E_\mathrm{HF}$")
    _finish(ax, "nuclear charge Z", r"correlation energy $E - E_\mathrm{HF}$ / m$E_\mathrm{h}$",
            title or "Correlation energy along the sequence", legend=ref is not None)
    return fig


def radial_density_figure(r_bohr, density_per_bohr, hartree_fock_per_bohr=None, title: str | None = None):
    """Radial density D(r) = 4πr²ρ(r) (bohr⁻¹, integrating to the electron number) against r."""
    r, d = _arrays(("r_bohr", r_bohr), ("density_per_bohr", density_per_bohr))
    fig = _figure()
    ax = fig.add_subplot()
    ax.plot(r, d, label="correlated")
    hf = _optional("hartree_fock_per_bohr", hartree_fock_per_bohr)
    if hf is not None:
        ax.plot(r, hf, "--", label="Hartree-Fock")
    _finish(ax, r"$r$ / bohr", r"$D(r) = 4\pi r^2 \rho(r)$ / bohr$^{-1}$",
            title or "Radial electron density", legend=hf is not None)
    return fig


def pair_distribution_figure(r12_bohr, pair_per_bohr, hartree_fock_per_bohr=None, title: str | None = None):
    """Interelectronic distribution P(r12) (bohr⁻¹) and, given HF, the Coulomb hole P − P_HF."""
    r, p = _arrays(("r12_bohr", r12_bohr), ("pair_per_bohr", pair_per_bohr))
    fig = _figure(6.4, 5.6 if hartree_fock_per_bohr is not None else 4.2)
    axes = fig.subplots(2 if hartree_fock_per_bohr is not None else 1, 1, sharex=True, squeeze=False)[:, 0]
    axes[0].plot(r, p, label="correlated")
    axes[0].set_ylabel(r"$P(r_{12})$ / bohr$^{-1}$")
    hf = _optional("hartree_fock_per_bohr", hartree_fock_per_bohr)
    if hf is not None:
        axes[0].plot(r, hf, "--", label="Hartree-Fock")
        axes[0].legend(fontsize="small")
        axes[1].plot(r, p - hf)
        axes[1].axhline(0.0, color="grey", lw=0.5)
        axes[1].set_ylabel(r"Coulomb hole $P - P_\mathrm{HF}$ / bohr$^{-1}$")
    for ax in axes:
        ax.grid(True, alpha=0.3)
    axes[-1].set_xlabel(r"$r_{12}$ / bohr")
    axes[0].set_title(title or "Interelectronic distance distribution")
    return fig


def _term_label(label: str) -> str:
    """``2^3S`` -> mathtext ``$2\\,{}^{3}\\mathrm{S}$``; other labels unchanged."""
    import re

    m = re.match(r"^(\d+)\^(\d+)([SPDFGHIK])$", label)
    return rf"${m.group(1)}\,{{}}^{{{m.group(2)}}}\mathrm{{{m.group(3)}}}$" if m else label


def level_diagram_figure(labels, energy_hartree, thresholds_hartree=None, title: str | None = None):
    """Energy-level diagram: one horizontal bar per computed state (Eh), optional thresholds."""
    labels = [str(x) for x in labels]
    (e,) = _arrays(("energy_hartree", energy_hartree))
    if len(labels) != e.size:
        raise InputError(f"{len(labels)} labels for {e.size} energies")
    fig = _figure(5.0, 4.8)
    ax = fig.add_subplot()
    for i, (label, value) in enumerate(zip(labels, e)):
        ax.hlines(value, i - 0.35, i + 0.35, lw=2)
        ax.annotate(f"{value:.6f}", (i, value), textcoords="offset points", xytext=(0, 4),
                    ha="center", fontsize="x-small")
    for name, value in dict(thresholds_hartree or {}).items():
        ax.axhline(value, ls="--", color="grey", lw=0.8)
        ax.annotate(name, (len(labels) - 0.5, value), textcoords="offset points", xytext=(0, 3),
                    ha="right", fontsize="x-small", color="grey")
    ax.set_xticks(range(len(labels)), [_term_label(x) for x in labels])
    ax.set_xlim(-0.6, len(labels) - 0.4)
    _finish(ax, "state", r"energy / $E_\mathrm{h}$", title or "Computed levels", legend=False,
            grid_axis="y")
    return fig


def figure_bytes(fig, fmt: str) -> bytes:
    """The figure rendered as PNG or SVG bytes (no display, no file)."""
    if fmt not in FIGURE_FORMATS:
        raise InputError(f"unknown figure format {fmt!r}; choose one of {', '.join(FIGURE_FORMATS)}")
    buffer = io.BytesIO()
    if fmt == "png":
        fig.savefig(buffer, format="png", dpi=150, metadata={"Software": None})
    else:
        fig.savefig(buffer, format="svg", metadata=_SVG_METADATA)
    return buffer.getvalue()


def save_figure(fig, stem, formats=FIGURE_FORMATS) -> list[Path]:
    """Write ``stem.png`` and ``stem.svg`` (atomically); returns the paths."""
    from twoel.io import atomic_write_bytes

    paths = []
    for fmt in formats:
        path = Path(f"{stem}.{fmt}")
        atomic_write_bytes(path, figure_bytes(fig, fmt))
        paths.append(path)
    return paths


def axis_labels(fig) -> list[tuple[str, str]]:
    """(x label, y label) of every axes of ``fig`` (for checks that axes are labelled)."""
    return [(ax.get_xlabel(), ax.get_ylabel()) for ax in fig.axes]
