r"""Uncertainty budget of a corrected ionization energy (cm⁻¹ in the output, Eh inside).

The standard uncertainty of ``I`` combines in quadrature (each piece in Eh)

* ``nonrelativistic``: the basis error of the infinite-mass energy, estimated as the change of
  the eigenvalue when every exponent block of the basis loses its two highest ``i+j+k`` shells
  (nested sub-basis; conservative: it is the error of the smaller basis);
* ``alpha2``: ``|E⁽²⁾(regularized δ) - E⁽²⁾(direct δ)|``, the disagreement of the two exact forms
  of the Breit–Pauli energy in this basis;
* ``alpha3``: the same for the α³ and partial α⁴ QED energies, plus the Bethe logarithm: for the
  hydrogenic-scaling approximation an error ``δ = 3 |ln k0(He, published) - ln k0(He, scaling)|``
  of the same state (``3 × 2.6e-4`` for 1¹S) times ``(4Zα³/3)⟨Σ δ³(r_i)⟩``;
* ``quadrature``: the largest relative error of the quadrature ``⟨1/r12⟩`` and ``⟨p1·p2⟩``
  against their closed forms, times ``|orbit–orbit| + |Araki–Sucher|`` (the quadrature terms);
* ``omitted``: the terms not computed (mα⁶ beyond the one-loop radiative part, α³ recoil,
  nuclear size), estimated as

  .. math:: u_\mathrm{omitted} = C\,α^4 Z^6\ \mathrm{E_h},\qquad C = 0.2 .

  The atom has first-order Breit–Pauli only while the ion's Dirac energy is complete, so the
  leading omitted term is the ``-α⁴Z⁶/16`` of each 1s electron beyond first order: ``-α⁴Z⁶/8``
  for the ground state at large ``Z``.  ``C`` is calibrated on the NIST ASD residuals of
  Z = 2..10 (``data/nist_ionization_energies.csv``; measured |residual| / α⁴Z⁶ from 0.03 (Li⁺)
  to 0.15 (Ne⁸⁺), default preset basis), rounded up.  It is applied to every state (for 2S
  states, whose outer-electron terms are smaller, it is an overestimate).

Comparing with a reference adds the reference's uncertainty and that of an isotope conversion.
"""

from __future__ import annotations

import math

import numpy as np

from twoel import constants
from twoel.solver.eigen import solve_generalized

#: ``C`` of the omitted-term estimate ``C α⁴ Z⁶`` Eh (see the module text)
OMITTED_COEFFICIENT = 0.2
#: safety factor on the He deviation of the hydrogenic-scaling Bethe logarithm
BETHE_LOG_SAFETY = 3.0
#: the budget in one line (JSON ``uncertainty_model``)
MODEL_TEXT = ("root-sum-square of: nonrelativistic basis error (nested sub-basis with the two top shells "
              "of each exponent block dropped), finite mass (same relative error), alpha2 and alpha3 "
              "(regularized minus direct delta forms; Bethe-logarithm error for the hydrogenic scaling), "
              "quadrature (closed-form checks), omitted terms 0.2 alpha^4 Z^6 Eh; residuals add the "
              "reference (and isotope conversion) uncertainty")


def omitted_terms_hartree(Z: float) -> float:
    """Estimated size of the omitted terms, ``C α⁴ Z⁶`` (Eh)."""
    return OMITTED_COEFFICIENT * constants.FINE_STRUCTURE.value ** 4 * float(Z) ** 6


def combined(*pieces) -> float:
    """Root-sum-square of the pieces that are not ``None``."""
    return math.sqrt(sum(p * p for p in pieces if p is not None))


def nested_subset(basis) -> np.ndarray | None:
    """Indices of the functions kept when each exponent block drops its two top ``i+j+k`` shells.

    ``None`` when that keeps nothing or everything (no nested estimate for this basis), or for a
    contracted basis.
    """
    if getattr(basis, "contraction", None) is not None:
        return None
    order = np.asarray(basis.powers).sum(axis=1)
    keep = np.zeros(order.shape[0], dtype=bool)
    exps = np.asarray(basis.exponents)
    for block in np.unique(exps, axis=0):
        rows = np.all(exps == block, axis=1)
        keep |= rows & (order <= order[rows].max() - 2)
    if not keep.any() or keep.all():
        return None
    return np.flatnonzero(keep)


def nonrelativistic_uncertainty(system, basis, Z: float, root: int, energy: float) -> float | None:
    """``|E(nested sub-basis) - E(basis)|`` of root ``root`` (Eh), or ``None`` (no nested subset)."""
    keep = nested_subset(basis)
    if keep is None:
        return None
    ix = np.ix_(keep, keep)
    values = solve_generalized(system.hamiltonian(Z)[ix], system.overlap[ix]).values
    if root >= values.shape[0]:
        return None
    return abs(float(values[root]) - energy)


def bethe_log_error(state_label: str, approximate: bool, rows) -> float:
    """Uncertainty of the Bethe logarithm used (dimensionless).

    Published values: the table uncertainty.  The hydrogenic-scaling approximation:
    ``BETHE_LOG_SAFETY × |published - scaling|`` for He in the same state (``rows``: the
    Bethe-logarithm table), else ``BETHE_LOG_SAFETY ×`` the largest He deviation.
    """
    hydrogen = [r.value for r in rows if r.quantity == "bethe_logarithm_hydrogen"][0]
    he = {r.state: abs(r.value - (hydrogen + 2 * math.log(2.0)))
          for r in rows if r.quantity == "bethe_logarithm" and r.Z == 2.0}
    if not approximate:
        return 0.0
    return BETHE_LOG_SAFETY * he.get(state_label, max(he.values()))


def concise(value: float, uncertainty: float | None, digits: int = 2) -> str:
    """``value(uncertainty)`` with ``digits`` significant digits of the uncertainty.

    >>> concise(198310.661045, 0.0080)
    '198310.6610(80)'
    >>> concise(9644748.7, 124.0)
    '9644750(120)'
    """
    if uncertainty is None or not uncertainty > 0 or not math.isfinite(uncertainty):
        return f"{value:.6f}"
    exponent = math.floor(math.log10(uncertainty)) - (digits - 1)
    scale = 10.0 ** exponent
    u = round(uncertainty / scale)
    if u >= 10 ** digits:  # rounding crossed a decade
        exponent += 1
        scale *= 10.0
        u = round(uncertainty / scale)
    if exponent >= 0:
        return f"{round(value / scale) * scale:.0f}({u * int(scale)})"
    return f"{value:.{-exponent}f}({u})"
