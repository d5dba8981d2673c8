"""Generalized eigen-solver: conditioning checks, canonical orthogonalization, errors."""

import numpy as np
import pytest

from twoel.solver.eigen import solve_generalized
from twoel.errors import InputError, LinearDependenceError


def _random_problem(n=6, seed=1):
    rng = np.random.default_rng(seed)
    X = rng.normal(size=(n, n))
    S = X @ X.T + n * np.eye(n)
    Hm = rng.normal(size=(n, n))
    return 0.5 * (Hm + Hm.T), S


def test_matches_scipy_on_a_well_conditioned_problem():
    import scipy.linalg

    H, S = _random_problem()
    sol = solve_generalized(H, S)
    assert sol.method == "cholesky" and sol.n_dropped == 0
    assert np.allclose(sol.values, scipy.linalg.eigh(H, S, eigvals_only=True), atol=1e-12)
    c = sol.vectors
    assert np.allclose(c.T @ S @ c, np.eye(len(H)), atol=1e-10)  # S-orthonormal


def test_duplicate_function_is_dropped_and_recorded():
    H, S = _random_problem(5)
    # append an exact copy of basis function 0
    T = np.vstack([np.eye(5), np.eye(5)[:1]]).T
    H2, S2 = T.T @ H @ T, T.T @ S @ T
    sol = solve_generalized(H2, S2)
    assert sol.method == "canonical" and sol.n_dropped == 1
    ref = solve_generalized(H, S).values
    assert np.allclose(sol.values, ref, atol=1e-10)
    assert sol.condition_number > 1e14


def test_rejects_bad_matrices():
    H, S = _random_problem(4)
    bad = H.copy()
    bad[0, 1] += 1.0
    with pytest.raises(InputError, match="symmetric"):
        solve_generalized(bad, S)
    nan = H.copy()
    nan[2, 2] = np.nan
    with pytest.raises(InputError, match="non-finite"):
        solve_generalized(nan, S)
    with pytest.raises(LinearDependenceError):
        solve_generalized(H, -S)
    indefinite = np.diag([1.0, 1.0, 1.0, 1.0])
    indefinite[0, 1] = indefinite[1, 0] = 2.0
    with pytest.raises(LinearDependenceError, match="positive definite"):
        solve_generalized(H, indefinite)
