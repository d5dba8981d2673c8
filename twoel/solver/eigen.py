r"""Generalized symmetric eigenproblem ``H c = E S c`` with conditioning checks.

Steps (each recorded in the returned :class:`EigenSolution`):

1. both matrices must be finite and symmetric (to a relative ``1e-10``); they are symmetrized;
2. diagonal scaling ``S_ii = 1`` removes the trivial part of the ill-conditioning;
3. the scaled overlap is diagonalized; its condition number is recorded and a clearly negative
   eigenvalue (``< -1e-10``) raises :class:`LinearDependenceError`;
4. eigen-directions of ``S`` below ``drop_threshold`` (relative to the largest) are dropped by
   canonical orthogonalization (Löwdin, Adv. Quantum Chem. 5, 185 (1970)); otherwise the
   Cholesky-based ``scipy.linalg.eigh(H, S)`` is used.

By the Hylleraas–Undheim–MacDonald theorem the k-th eigenvalue is an upper bound to the k-th
exact level of the symmetry block.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import scipy.linalg

from twoel.errors import InputError, LinearDependenceError

#: default relative threshold below which overlap eigen-directions are dropped (float64)
DEFAULT_DROP_THRESHOLD = 1e-13


@dataclass(frozen=True)
class EigenSolution:
    """Eigenvalues (ascending), eigenvectors in the original basis, and conditioning record.

    Attributes
    ----------
    values : ndarray, shape (M,)
        Eigenvalues in the units of ``H`` (Eh), ascending.
    vectors : ndarray, shape (N, M)
        Coefficients in the original (unscaled) basis, normalized to ``c^T S c = 1``.
    condition_number : float
        Ratio of largest to smallest eigenvalue of the diagonally scaled overlap.
    n_dropped : int
        Number of overlap directions removed by canonical orthogonalization.
    drop_threshold : float
        The relative threshold that was applied.
    method : str
        ``"cholesky"`` or ``"canonical"``.
    """

    values: np.ndarray
    vectors: np.ndarray
    condition_number: float
    n_dropped: int
    drop_threshold: float
    method: str


def _check(name: str, matrix: np.ndarray) -> np.ndarray:
    matrix = np.asarray(matrix, dtype=float)
    if matrix.ndim != 2 or matrix.shape[0] != matrix.shape[1]:
        raise InputError(f"'{name}' must be a square matrix, got shape {matrix.shape}")
    if not np.all(np.isfinite(matrix)):
        raise InputError(f"'{name}' contains non-finite entries (overflow in the integrals?)")
    scale = np.max(np.abs(matrix)) or 1.0
    asym = np.max(np.abs(matrix - matrix.T)) / scale
    if asym > 1e-10:
        raise InputError(f"'{name}' is not symmetric (relative asymmetry {asym:.1e} > 1e-10)")
    return 0.5 * (matrix + matrix.T)


def canonical_orthogonalizer(overlap, drop_threshold: float = DEFAULT_DROP_THRESHOLD,
                             what: str = "overlap"):
    """Canonical orthogonalization ``X`` with ``X^T S X = 1`` (Löwdin, Adv. Quantum Chem. 5, 185 (1970)).

    The overlap is diagonally scaled (``S_ii = 1``) and diagonalized; directions whose relative
    eigenvalue is below ``drop_threshold`` are removed.

    Parameters
    ----------
    overlap : ndarray, shape (N, N)
        Symmetric overlap with a positive diagonal.
    drop_threshold : float
        Relative eigenvalue of the scaled overlap below which a direction is dropped.
    what : str
        Name of the matrix in error messages.

    Returns
    -------
    X : ndarray, shape (N, M)
        Columns span the kept directions in the original (unscaled) basis.
    n_dropped : int
        ``N - M``.
    condition : float
        Largest over smallest eigenvalue of the scaled overlap (``inf`` if not positive).

    Raises
    ------
    LinearDependenceError
        A clearly negative eigenvalue (``< -1e-10`` relative) or no surviving direction.
    """
    d, s, U = _scaled_eigen(np.asarray(overlap, dtype=float), what)
    keep, n_dropped, condition = _kept(s, drop_threshold)
    X = U[:, keep] / np.sqrt(s[keep])[None, :] * d[:, None]
    return X, n_dropped, condition


def _scaled_eigen(S: np.ndarray, what: str):
    diag = np.diag(S)
    if np.any(diag <= 0):
        raise LinearDependenceError(f"{what} has a non-positive diagonal element: a basis function "
                                    "vanishes identically (e.g. a triplet term with α = β)")
    d = 1.0 / np.sqrt(diag)
    s, U = np.linalg.eigh(S * d[:, None] * d[None, :])
    if s[0] < -1e-10 * s[-1]:
        raise LinearDependenceError(
            f"{what} matrix is not positive definite (smallest relative eigenvalue {s[0] / s[-1]:.2e}); "
            "the integrals lost precision or the basis is linearly dependent")
    return d, s, U


def _kept(s: np.ndarray, drop_threshold: float):
    keep = s > drop_threshold * s[-1]
    if not np.any(keep):
        raise LinearDependenceError("no basis direction survives canonical orthogonalization")
    condition = float(s[-1] / s[0]) if s[0] > 0 else float("inf")
    return keep, int(np.count_nonzero(~keep)), condition


def solve_generalized(hamiltonian, overlap, drop_threshold: float = DEFAULT_DROP_THRESHOLD,
                      force_canonical: bool = False) -> EigenSolution:
    """Solve ``H c = E S c`` for all roots.

    Parameters
    ----------
    hamiltonian, overlap : array_like, shape (N, N)
        Symmetric matrices; ``overlap`` must be positive definite up to rounding.
    drop_threshold : float
        Relative eigenvalue of the scaled overlap below which a direction is dropped.
    force_canonical : bool
        Use canonical orthogonalization even when nothing needs dropping.

    Raises
    ------
    LinearDependenceError
        If the overlap has a clearly negative eigenvalue or no direction survives.
    """
    H = _check("hamiltonian", hamiltonian)
    S = _check("overlap", overlap)
    if H.shape != S.shape:
        raise InputError(f"hamiltonian {H.shape} and overlap {S.shape} differ in shape")
    d, s, U = _scaled_eigen(S, "overlap")
    Ss = S * d[:, None] * d[None, :]
    Hs = H * d[:, None] * d[None, :]
    keep, n_dropped, condition = _kept(s, drop_threshold)
    if n_dropped == 0 and not force_canonical:
        try:
            values, vectors = scipy.linalg.eigh(Hs, Ss)
            return EigenSolution(values, vectors * d[:, None], condition, 0, drop_threshold, "cholesky")
        except np.linalg.LinAlgError:
            pass
    X = U[:, keep] / np.sqrt(s[keep])[None, :]
    Hx = X.T @ Hs @ X
    values, Y = np.linalg.eigh(0.5 * (Hx + Hx.T))
    vectors = (X @ Y) * d[:, None]
    return EigenSolution(values, vectors, condition, n_dropped, drop_threshold, "canonical")
