r"""Split-shell (different orbitals, singlet-coupled) variant of Hartree–Fock for 1s² (pure core).

**This is not Hartree–Fock.**  Each electron gets its own orbital and the pair is coupled to a
pure singlet,

.. math::

    \Psi = \mathcal{N}\,[u(1) v(2) + v(1) u(2)]\;\tfrac{1}{\sqrt2}(\alpha\beta - \beta\alpha),

the fully optimized generalization of the two-exponent functions of Eckart (Phys. Rev. 36, 878
(1930)) and Chandrasekhar (Astrophys. J. 100, 176 (1944)); it is the spin-projected
"different orbitals for different spins" function (Löwdin, Phys. Rev. 97, 1509 (1955)).  It
contains in-out (radial) correlation, so its energy lies *below* the Hartree–Fock limit and must
not be used as E_HF in a correlation energy.  Unlike restricted HF it binds H⁻ (already the
two-exponent function gives −0.51330 Eh < −1/2, Chandrasekhar 1944).

Spin-unrestricted HF (one determinant ``|uα vβ|``, not a spin eigenfunction) was also tried
while building this module: for H⁻ it dissociates towards H(1s) + a free electron (energy
tending to −1/2 Eh from above, orbital overlap → 0) and for He it collapses to restricted HF, so
it is not offered.

Both orbitals are expanded in one even-tempered 1s Slater basis (:mod:`twoel.scf.hartree_fock`).
For fixed ``v`` the energy is a ratio of quadratic forms in ``u``,

.. math::

    E = \frac{u^T M(v) u}{u^T N(v) u},\quad
    M = h\,S_{vv} + S\,h_{vv} + (hv)(Sv)^T + (Sv)(hv)^T + J[v] + K[v],\quad
    N = S\,S_{vv} + (Sv)(Sv)^T ,

so the lowest generalized eigenvector is the best ``u``; alternating ``u`` and ``v`` lowers
the energy monotonically until it stops changing.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field

import numpy as np
import scipy.linalg

from twoel._version import __version__
from twoel.errors import ConvergenceError, InputError, LinearDependenceError
from twoel.results import Result
from twoel.scf.hartree_fock import (EVEN_TEMPERED_SEARCH, ConvergenceRow, SLATER_DROP_THRESHOLD, _check_sizes, _next_start,
                                   _seed, even_tempered, slater_integrals)
from twoel.solver.eigen import canonical_orthogonalizer
from twoel.solver.optimize import minimize_nonlinear
from twoel.system import Ion

DEFAULT_SPLIT_SIZES = (4, 6, 8, 10)

#: plain-words warning attached to every split-shell result
NOT_HF_WARNING = ("split-shell (different orbitals, singlet-coupled) energy: NOT Hartree-Fock; it "
                  "includes in-out radial correlation and lies below the HF limit, so do not use it "
                  "as E_HF in a correlation energy")


@dataclass(frozen=True)
class SplitShellSolution:
    """Optimized orbitals ``u`` (inner) and ``v`` (outer) in a fixed basis (Eh)."""

    energy: float
    kinetic: float
    potential: float
    orbital_overlap: float
    inner: np.ndarray
    outer: np.ndarray
    iterations: int
    exponents: np.ndarray | None = None

    @property
    def virial_ratio(self) -> float:
        return -self.potential / self.kinetic


def _project(exponents_new, overlap_new, exponents_old, coefficients_old) -> np.ndarray:
    """Least-squares projection of an orbital onto another normalized 1s Slater basis."""
    zn = np.asarray(exponents_new, dtype=float)[:, None]
    zo = np.asarray(exponents_old, dtype=float)[None, :]
    cross = 8.0 * (zn * zo) ** 1.5 / (zn + zo) ** 3   # <χ_i(ζ)|χ_j(ζ')> for normalized 1s
    return np.linalg.lstsq(overlap_new, cross @ coefficients_old, rcond=None)[0]


def split_shell_energy(Z: float, exponents, tolerance: float = 1e-13,
                       max_iterations: int = 3000, start=None) -> SplitShellSolution:
    """Alternating optimization of the singlet-coupled two-orbital function in one basis.

    ``start = (old_exponents, inner, outer)`` projects orbitals of a nearby basis as the start
    (used while the exponents are optimized); otherwise the bare-nucleus orbitals are used.
    """
    ints = slater_integrals(exponents)
    X, _dropped, _cond = canonical_orthogonalizer(ints.overlap, SLATER_DROP_THRESHOLD,
                                                  what="Slater overlap")
    m = X.shape[1]
    h = X.T @ (ints.kinetic - Z * ints.nuclear) @ X
    t = X.T @ ints.kinetic @ X
    G = np.einsum("klmn,ka,lb,mc,nd->abcd", ints.repulsion, X, X, X, X, optimize=True)
    GJ = G.reshape(m * m, m * m)                              # (kl|mn) -> J
    GK = G.transpose(0, 2, 1, 3).reshape(m * m, m * m)        # (km|ln) -> K
    vectors = np.linalg.eigh(h)[1]
    u = vectors[:, 0]
    v = (vectors[:, 0] + vectors[:, 1]) / math.sqrt(2.0) if m > 1 else vectors[:, 0]
    if start is not None:
        old_exponents, inner, outer = start
        to_orthonormal = X.T @ ints.overlap
        u = to_orthonormal @ _project(ints.exponents, ints.overlap, old_exponents, inner)
        v = to_orthonormal @ _project(ints.exponents, ints.overlap, old_exponents, outer)
    identity = np.eye(m)
    previous = math.inf
    energy = math.inf
    for iteration in range(1, max_iterations + 1):
        for update_inner in (True, False):
            w = v if update_inner else u
            hw = h @ w
            sww, hww = float(w @ w), float(w @ hw)
            P = np.outer(w, w).ravel()
            J = (GJ @ P).reshape(m, m)
            K = (GK @ P).reshape(m, m)
            M = h * sww + identity * hww + np.outer(hw, w) + np.outer(w, hw) + J + K
            N = identity * sww + np.outer(w, w)
            values, vecs = scipy.linalg.eigh(0.5 * (M + M.T), N)
            if update_inner:
                u = vecs[:, 0]
            else:
                v = vecs[:, 0]
            energy = float(values[0])
        if abs(previous - energy) < tolerance:
            break
        previous = energy
    else:
        raise ConvergenceError(f"split-shell orbitals did not converge in {max_iterations} sweeps")
    if energy < -Z * Z:
        raise LinearDependenceError(f"split-shell energy {energy:.6g} Eh lies below the bare-nucleus "
                                    f"bound -Z² = {-Z * Z:g} Eh: the basis is numerically dependent")
    u, v = u / np.linalg.norm(u), v / np.linalg.norm(v)
    overlap = float(u @ v)
    denominator = 1.0 + overlap**2
    kinetic = float(u @ t @ u + v @ t @ v + 2 * overlap * (u @ t @ v)) / denominator
    # inner = the more compact orbital (larger <1/r>)
    nuc = X.T @ ints.nuclear @ X
    if u @ nuc @ u < v @ nuc @ v:
        u, v = v, u
    if overlap < 0:
        v, overlap = -v, -overlap
    return SplitShellSolution(energy, kinetic, energy - kinetic, overlap, X @ u, X @ v, iteration,
                              ints.exponents)


@dataclass(frozen=True, repr=False)
class SplitShellStep(ConvergenceRow):
    """Optimized even-tempered basis of one size and its split-shell energy.

    ``a`` (bohr⁻¹) and ``b`` define ``ζ_k = a b^k``; ``energy_hartree`` in Eh;
    ``change_hartree = E(N_k) - E(N_{k-1})`` (Eh, ``None`` for the first size) is the opposite
    sign of :attr:`step_hartree`; ``orbital_overlap`` is ``<u|v>`` of the normalized orbitals.
    """

    SUMMARY = ("size", "energy_hartree", "change_hartree")

    size: int
    a: float
    b: float
    energy_hartree: float
    change_hartree: float | None
    orbital_overlap: float
    virial_ratio: float
    evaluations: int


@dataclass(frozen=True, repr=False)
class SplitShellResult(Result):
    """Split-shell energy converged over basis sizes, clearly flagged as not Hartree–Fock.

    Energies in Eh; ``estimated_error_hartree`` is the last change between sizes;
    ``orbital_overlap`` is ``<u|v>`` of the final orbitals; ``convergence`` holds one
    :class:`SplitShellStep` per size.  There is no published reference (no
    ``difference_hartree``): the function is not Hartree–Fock.
    """

    SUMMARY = ("ion", "energy_hartree", "size")

    Z: float
    ion: str
    energy_hartree: float
    kinetic_hartree: float
    potential_hartree: float
    virial_ratio: float
    orbital_overlap: float
    estimated_error_hartree: float | None
    convergence: tuple
    bound: bool
    threshold_hartree: float
    notes: tuple = ()
    elapsed_seconds: float = 0.0
    provenance: dict = field(default_factory=dict)
    method: str = "split-shell (different orbitals, singlet-coupled); not Hartree-Fock"
    is_hartree_fock: bool = False

    @property
    def size(self) -> int:
        return self.convergence[-1].size

    def to_dict(self) -> dict:
        """JSON-ready dictionary (the ``twoel hf --split-shell --json`` record)."""
        return self._with_aliases({
            "Z": self.Z, "ion": self.ion, "state": "1^1S", "method": self.method,
            "is_hartree_fock": self.is_hartree_fock, "energy_hartree": self.energy_hartree,
            "orbital_energy_hartree": None,
            "kinetic_hartree": self.kinetic_hartree, "potential_hartree": self.potential_hartree,
            "virial_ratio": self.virial_ratio, "orbital_overlap": self.orbital_overlap,
            "estimated_error_hartree": self.estimated_error_hartree, "size": self.size,
            "bound": self.bound, "threshold_hartree": self.threshold_hartree,
            "convergence": [s.record() for s in self.convergence],
            "notes": list(self.notes), "elapsed_seconds": self.elapsed_seconds,
            "provenance": self.provenance,
        })


def _optimize(Z: float, n: int, starts, max_evaluations: int = 200):
    """Best even-tempered ``(a, b)`` of size ``n``: the lowest start, then Nelder–Mead in
    ``(ln a, ln(b-1))`` (:func:`twoel.solver.optimize.minimize_nonlinear`, no virial step: the
    exponent scale is left to the search)."""
    best = {"energy": math.inf, "sol": None}

    def energy(values):
        previous = best["sol"]
        start = None if previous is None else (previous.exponents, previous.inner, previous.outer)
        sol = split_shell_energy(Z, even_tempered(values[0], values[1], n), start=start)
        if sol.energy < best["energy"]:
            best.update(energy=sol.energy, sol=sol)
        return sol.energy, sol

    try:
        opt = minimize_nonlinear(energy, starts, **EVEN_TEMPERED_SEARCH, step=0.1, xatol=1e-6,
                                 fatol=1e-13, max_evaluations=max_evaluations)
    except ConvergenceError:
        raise ConvergenceError(f"no split-shell solution converged for Z = {Z:g}, size {n}")
    return opt.values[0], opt.values[1], opt.info, opt.n_evaluations


def split_shell_limit(Z, sizes=DEFAULT_SPLIT_SIZES, progress=None) -> SplitShellResult:
    """Split-shell singlet energy of the 1s² ground state over even-tempered basis sizes.

    Parameters
    ----------
    Z : float or str
        Nuclear charge.
    sizes : sequence of int
        Basis sizes (each at least 2), increasing.
    """
    ion = Ion.parse(Z)
    Z = ion.Z
    sizes = _check_sizes(sizes)
    if sizes[0] < 2:
        raise InputError("the split-shell variant needs basis sizes of at least 2")
    started = time.perf_counter()
    steps = []
    sol = None
    previous = None
    for n in sizes:
        if progress is not None:
            progress(n)
        a_hf, b_hf = _seed(Z, n)
        starts = [(a_hf * 0.5, b_hf * 1.1), (a_hf * 0.2, b_hf * 1.25)]
        if previous is not None:
            starts.append(_next_start(*previous))
        a, b, sol, count = _optimize(Z, n, starts)
        change = None if not steps else sol.energy - steps[-1].energy_hartree
        steps.append(SplitShellStep(n, a, b, sol.energy, change, sol.orbital_overlap,
                                    sol.virial_ratio, count))
        previous = (a, b)
    final = steps[-1]
    notes = [NOT_HF_WARNING]
    if final.orbital_overlap > 1 - 1e-6:
        notes.append("the two orbitals coincide: the split-shell solution collapsed to restricted HF")
    bound = final.energy_hartree < ion.threshold_hartree
    provenance = {
        "package": "twoel", "version": __version__,
        "method": "split-shell singlet u(1)v(2)+v(1)u(2), shared even-tempered 1s Slater basis "
                  "optimized per size (Nelder-Mead), alternating generalized eigenproblems",
        "sizes": list(sizes), "precision": "float64",
        "exponents": (final.a * final.b ** np.arange(final.size)).tolist(),
        "inner_coefficients": sol.inner.tolist(), "outer_coefficients": sol.outer.tolist(),
    }
    return SplitShellResult(
        Z=Z, ion=ion.label, energy_hartree=final.energy_hartree, kinetic_hartree=sol.kinetic,
        potential_hartree=sol.potential, virial_ratio=sol.virial_ratio,
        orbital_overlap=sol.orbital_overlap,
        estimated_error_hartree=None if final.change_hartree is None else abs(final.change_hartree),
        convergence=tuple(steps), bound=bool(bound), threshold_hartree=ion.threshold_hartree,
        notes=tuple(notes), elapsed_seconds=time.perf_counter() - started, provenance=provenance)
