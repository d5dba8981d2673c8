r"""One-electron radial density and electron-pair (r12) distribution of a computed state.

For a wave function ``Ψ`` of an S basis (:class:`twoel.basis.correlated.CorrelatedBasis`) or a P basis
(:class:`twoel.basis.p_basis.PBasis`) the functions return arrays (pure, no plotting):

.. math::

    D(r) = \frac{\int |\Psi|^2\, \delta(r_1 - r)\, d^3r_1 d^3r_2}{\int |\Psi|^2},\qquad
    P(u) = \frac{\int |\Psi|^2\, \delta(r_{12} - u)\, d^3r_1 d^3r_2}{\int |\Psi|^2},

each normalized to ``∫ D dr = ∫ P du = 1`` (per electron; bohr⁻¹), so ``∫ r D dr = ⟨r1⟩`` and
``∫ u P du = ⟨r12⟩``.  With the Hylleraas volume element ``8π² r1 r2 r12 dr1 dr2 dr12`` (after
the Euler angles; for P states ``|Ψ|²`` is replaced by its rotational average
``(r1² F² + 2 r1·r2 F G + r2² G²)/3`` for ``Ψ = z1 F + z2 G``) the remaining two-dimensional
integrals over the triangle ``|r - r2| <= r12 <= r + r2`` are done by Gauss-Legendre
quadrature, split at the kink ``r2 = r``.  The normalization uses the analytic overlap, so
``∫ D dr = 1`` is a real check of the quadrature (tested).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from twoel.errors import InputError
from twoel.integrals.closed_forms import SIXTEEN_PI_SQUARED
from twoel.integrals.pairs import basis_kind, operator_matrices
from twoel.integrals.hamiltonian import HAMILTONIAN
from twoel.results import EnergyResult, Result, Wavefunction

#: angular factor left after the Euler angles (half the 16π² of the master integral; the other
#: factor 2 is the exchange term counted in the normalization)
EIGHT_PI_SQUARED = SIXTEEN_PI_SQUARED / 2


@dataclass(frozen=True, repr=False)
class Distribution(Result):
    """A distribution on a grid: ``values[i]`` (bohr⁻¹) at ``grid[i]`` (bohr).

    ``to_dict()`` names them with their units: ``grid_bohr``, ``values_per_bohr``.
    """

    SUMMARY: ClassVar[tuple] = ("kind",)

    kind: str
    grid: np.ndarray
    values: np.ndarray

    def to_dict(self) -> dict:
        return {"kind": self.kind, "grid_bohr": self.grid.tolist(), "values_per_bohr": self.values.tolist()}


def _unpack(obj):
    if isinstance(obj, EnergyResult):
        if obj.wavefunction is None:
            raise InputError("this result carries no wave function")
        obj = obj.wavefunction
    if not isinstance(obj, Wavefunction):
        raise InputError(f"expected an EnergyResult or Wavefunction, got {type(obj).__name__}")
    basis = obj.basis
    if not hasattr(basis, "exponents"):
        raise InputError("densities need a correlated basis with exponents")
    c = np.asarray(obj.coefficients, dtype=float)
    d = c if basis.contraction is None else basis.contraction @ c
    S = operator_matrices(basis, {"overlap": HAMILTONIAN["overlap"]})["overlap"]
    return basis, d, 2.0 * float(c @ S @ c)


def _scalar_parts(basis, d, r1, r2, r12):
    """``Σ d_p g_p(r1, r2, r12)`` and the same with the electrons swapped (arrays)."""
    P, E = basis.powers, basis.exponents
    direct = np.zeros(r1.shape)
    swapped = np.zeros(r1.shape)
    flat = [x.reshape(-1) for x in (r1, r2, r12)]
    block = max(1, 2_000_000 // max(1, P.shape[0]))
    out_d, out_s = direct.reshape(-1), swapped.reshape(-1)
    with np.errstate(divide="ignore"):
        for start in range(0, flat[0].shape[0], block):
            a, b, u = (x[start:start + block, None] for x in flat)
            la, lb, lu = np.log(a), np.log(b), np.log(u)
            expo = -E[:, 0] * a - E[:, 1] * b - E[:, 2] * u
            expo_s = -E[:, 0] * b - E[:, 1] * a - E[:, 2] * u
            if np.any(P):
                expo = expo + np.where(P[:, 0] > 0, P[:, 0] * la, 0) + np.where(P[:, 1] > 0, P[:, 1] * lb, 0) \
                    + np.where(P[:, 2] > 0, P[:, 2] * lu, 0)
                expo_s = expo_s + np.where(P[:, 0] > 0, P[:, 0] * lb, 0) + np.where(P[:, 1] > 0, P[:, 1] * la, 0) \
                    + np.where(P[:, 2] > 0, P[:, 2] * lu, 0)
            out_d[start:start + block] = np.exp(expo) @ d
            out_s[start:start + block] = np.exp(expo_s) @ d
    return direct, swapped


def _averaged_square(basis, d, r1, r2, r12):
    F, G = _scalar_parts(basis, d, r1, r2, r12)
    sign = float(basis.sign)
    if basis_kind(basis) == "S":
        return (F + sign * G) ** 2
    G = sign * G
    dot = 0.5 * (r1**2 + r2**2 - r12**2)
    return (r1**2 * F**2 + 2.0 * dot * F * G + r2**2 * G**2) / 3.0


def _scale(basis) -> float:
    """A decay length (bohr) for the outer quadrature: the slowest one-electron exponent."""
    e = basis.exponents
    slowest = float(np.min(np.minimum(e[:, 0], e[:, 1]) + np.minimum(e[:, 2], 0.0)))
    return 1.0 / max(slowest, 1e-3)


def _triangle_integral(fixed, function, length, n_outer=48, n_inner=24):
    """``∫_0^∞ dy y ∫_{|x-y|}^{x+y} dz z f(x, y, z)`` for each ``x`` in ``fixed``."""
    xo, wo = np.polynomial.legendre.leggauss(n_outer)
    xi, wi = np.polynomial.legendre.leggauss(n_inner)
    s, ws = 0.5 * (xo + 1), 0.5 * wo
    t, wt = 0.5 * (xi + 1), 0.5 * wi
    x = fixed[:, None]
    # y in [0, x]  and  y in [x, ∞) with y = x + L s²/(1 - s)² (smooth, dense near the kink)
    y1, wy1 = x * s, x * ws
    y2 = x + length * (s / (1 - s)) ** 2
    wy2 = np.broadcast_to(length * ws * 2 * s / (1 - s) ** 3, y2.shape)
    total = np.zeros(fixed.shape)
    for y, wy in ((y1, wy1), (y2, wy2)):
        lo, hi = np.abs(x - y), x + y
        z = lo[..., None] + (hi - lo)[..., None] * t
        wz = (hi - lo)[..., None] * wt
        xx = np.broadcast_to(x[..., None], z.shape)
        yy = np.broadcast_to(y[..., None], z.shape)
        values = function(xx, yy, z) * z * wz
        total += np.sum(values.sum(axis=-1) * y * wy, axis=-1)
    return total


def _distribution(kind: str, obj, grid, points: int, extent: float) -> Distribution:
    """``D`` (``kind="radial"``, fixed ``r1``) or ``P`` (``kind="pair"``, fixed ``r12``)."""
    basis, d, norm = _unpack(obj)
    length = _scale(basis)
    x = _grid(grid, points, extent * length)
    if kind == "radial":
        def square(fixed, y, z):
            return _averaged_square(basis, d, fixed, y, z)
    else:
        def square(fixed, y, z):
            return _averaged_square(basis, d, z, y, fixed)
    values = EIGHT_PI_SQUARED * x * _triangle_integral(x, square, length) / norm
    return Distribution(kind, x, values)


def radial_density(result_or_wavefunction, grid=None, points: int = 200) -> Distribution:
    """One-electron radial density ``D(r)`` (bohr⁻¹, ``∫ D dr = 1``) on ``grid`` (bohr).

    Parameters
    ----------
    result_or_wavefunction : EnergyResult or Wavefunction
    grid : array_like, optional
        Radii (bohr, > 0).  Default: ``points`` values up to where the density is negligible.
    """
    return _distribution("radial", result_or_wavefunction, grid, points, 12.0)


def pair_distribution(result_or_wavefunction, grid=None, points: int = 200) -> Distribution:
    """Electron-pair distribution ``P(u)`` of ``u = r12`` (bohr⁻¹, ``∫ P du = 1``)."""
    return _distribution("pair", result_or_wavefunction, grid, points, 16.0)


def _grid(grid, points: int, extent: float) -> np.ndarray:
    if grid is None:
        if isinstance(points, bool) or not isinstance(points, int) or points < 2:
            raise InputError(f"'points' must be an integer >= 2, got {points!r}")
        return np.linspace(extent / points, extent, points)
    g = np.asarray(grid, dtype=float).reshape(-1)
    if g.size == 0 or not np.all(np.isfinite(g)) or np.any(g <= 0):
        raise InputError("grid radii must be finite and > 0 (bohr)")
    return g
