"""Closed forms shared by every caller: the angular factor 16π² and one-electron radial integrals.

``SIXTEEN_PI_SQUARED`` is the angular factor of the master integral
``I(a,b,c; α,β,γ) = ∫∫ r1^a r2^b r12^c exp(-α r1 - β r2 - γ r12) d³r1 d³r2`` over all angles
(Hylleraas coordinates; (4π)(2π)·2 = 16π²).  :func:`radial_integral` is the one-electron closed
form ``∫ r^n exp(-λ r) d³r = 4π (n+2)! / λ^(n+3)`` for real ``n > -3``, ``λ > 0`` (with
``Γ(n+3)`` for non-integer ``n``).  Both are exact results (common practice).
"""

from __future__ import annotations

import math

import numpy as np

#: angular factor of the master integral over the six angles of r1, r2 (exact 16π²)
SIXTEEN_PI_SQUARED = 16.0 * math.pi * math.pi
#: solid angle of one electron, 4π
FOUR_PI = 4.0 * math.pi


def radial_integral(n, lam):
    """``∫ r^n exp(-λ r) d³r = 4π Γ(n+3) / λ^(n+3)`` (bohr^(n+3)).

    Parameters
    ----------
    n : int, float or array_like
        Power of ``r`` (> -3).  An ``int`` (or an integer array) uses the exact factorial
        ``(n+2)!``; real powers use ``Γ(n+3)`` through ``gammaln``.
    lam : float or array_like
        Exponent ``λ`` (bohr⁻¹, > 0), broadcast against ``n``.

    Returns
    -------
    float or numpy.ndarray
        The integral; a Python float for scalar arguments.
    """
    if isinstance(n, (int, np.integer)) and not isinstance(n, bool):
        k = int(n)
        value = FOUR_PI * math.factorial(k + 2) / (lam if np.isscalar(lam) else np.asarray(lam, dtype=float)) ** (k + 3)
        return float(value) if np.isscalar(lam) else value
    n_array = np.asarray(n)
    if n_array.dtype.kind in "iu":
        factorials = np.array([math.factorial(int(v) + 2) for v in n_array.ravel()]).reshape(n_array.shape)
        return FOUR_PI * factorials / np.asarray(lam, dtype=float) ** (n_array + 3)
    from scipy.special import gammaln

    n_array = n_array.astype(float)
    lam = np.asarray(lam, dtype=float)
    value = FOUR_PI * np.exp(gammaln(n_array + 3.0) - (n_array + 3.0) * np.log(lam))
    return float(value) if value.ndim == 0 else value
