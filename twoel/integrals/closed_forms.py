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
    n : float or array_like
        Power of ``r`` (> -3).
    lam : float or array_like
        Exponent ``λ`` (bohr⁻¹, > 0).

    Returns
    -------
    float or numpy.ndarray
        The integral; a Python float for scalar arguments.
    """
    if np.isscalar(n) and np.isscalar(lam):
        n, lam = float(n), float(lam)
        if n.is_integer() and 0 <= n + 2 <= 170:  # exact factorial: correctly rounded for small n
            return FOUR_PI * math.factorial(int(n) + 2) / lam ** (int(n) + 3)
        return FOUR_PI * math.exp(math.lgamma(n + 3.0) - (n + 3.0) * math.log(lam))
    from scipy.special import gammaln

    n = np.asarray(n, dtype=float)
    lam = np.asarray(lam, dtype=float)
    return FOUR_PI * np.exp(gammaln(n + 3.0) - (n + 3.0) * np.log(lam))
