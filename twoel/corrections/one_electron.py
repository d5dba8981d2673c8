r"""The one-electron ion (the ionization threshold) with the same corrections as the atom.

Energies in hartree (Eh) of the hydrogen-like 1s ion of charge ``Z`` and reduced mass ``μ``
(in electron masses):

* nonrelativistic: ``-μ Z²/2``;
* relativistic (all orders in Zα): the Dirac energy ``μ c² [√(1 - (Zα)²) - 1]``, minus the
  nonrelativistic part; the recoil beyond reduced-mass scaling, of order ``(Zα)⁴ m/M``, is
  neglected;
* leading QED (α(Zα)⁴) 1s Lamb shift, the standard formula (e.g. M. I. Eides, H. Grotch,
  V. A. Shelyuto, Phys. Rep. 342, 63 (2001))

  .. math:: ΔE = \frac{4 α^3 Z^4}{3 π} \Big(\frac{μ}{m}\Big)^3
               \Big[\ln\frac{1}{α^2} - \ln\frac{k_0}{R_\infty} + \frac{19}{30}\Big]\ \mathrm{E_h}

  with the 1s Bethe logarithm ``ln(k0/(Z² R∞)) = 2.984 128 556`` (``ln(k0/R∞)`` grows by
  ``2 ln Z``); ``19/30 = 5/6 - 1/5`` includes the Uehling vacuum polarization;
* the next (α(Zα)⁵) term ``α⁴ Z⁵ (427/96 - 2 ln 2) (μ/m)³`` Eh, the hydrogenic form of the
  two-electron ``π Z² α⁴ (427/96 - 2 ln 2) ⟨Σ δ³(r_i)⟩`` (K. Pachucki, Phys. Rev. A 74, 062510
  (2006)), applied to both sides so that the ionization energy stays consistent.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

from twoel import constants
from twoel.corrections.qed import alpha4_radiative_factor, bethe_log_hydrogenic_1s, one_electron_qed_factor
from twoel.properties.operators import hydrogenic_delta_1s
from twoel.results import Result


_PIECES = ("nonrelativistic_infinite_mass", "finite_mass", "relativistic", "qed_alpha3", "qed_alpha4")


@dataclass(frozen=True, repr=False)
class OneElectronIon(Result):
    """Energy pieces of the 1s ion (Eh).

    Attributes
    ----------
    Z : float
    reduced_mass_me : float
        ``μ/m_e``.
    nonrelativistic_infinite_mass_hartree, finite_mass_hartree, relativistic_hartree,
    qed_alpha3_hartree, qed_alpha4_hartree : float
        ``-Z²/2``, its reduced-mass change, Dirac minus nonrelativistic, the α(Zα)⁴ and
        α(Zα)⁵ terms (Eh).
    bethe_log : float
        ``ln(k0/R∞)`` of the 1s state (dimensionless).
    total_hartree : float
        Sum of the pieces (property).

    The names without ``_hartree`` / ``_me`` are the older ones (aliases, in ``to_dict()`` too).
    """

    ALIASES: ClassVar[dict] = {**{p: f"{p}_hartree" for p in _PIECES}, "reduced_mass": "reduced_mass_me",
                               "total": "total_hartree"}
    SUMMARY: ClassVar[tuple] = ("Z", "total_hartree")
    DERIVED: ClassVar[tuple] = ("total_hartree",)

    Z: float
    reduced_mass_me: float
    nonrelativistic_infinite_mass_hartree: float
    finite_mass_hartree: float
    relativistic_hartree: float
    qed_alpha3_hartree: float
    qed_alpha4_hartree: float
    bethe_log: float

    @property
    def total_hartree(self) -> float:
        return sum(getattr(self, f"{p}_hartree") for p in _PIECES)


def dirac_1s(Z: float, reduced_mass: float = 1.0) -> float:
    """Dirac 1s energy without the rest mass, ``μ c² [√(1-(Zα)²) - 1]`` (Eh)."""
    alpha = constants.FINE_STRUCTURE.value
    za = Z * alpha
    if za >= 1:
        raise ValueError("Zα >= 1: no Dirac 1s point-nucleus solution")
    # √(1-x)-1 written without cancellation
    x = za * za
    return reduced_mass * (-x / (1.0 + math.sqrt(1.0 - x))) / (alpha * alpha)


def lamb_shift_1s(Z: float, reduced_mass: float = 1.0) -> float:
    """Leading α(Zα)⁴ Lamb shift of the 1s level (Eh), incl. vacuum polarization."""
    # ⟨δ³(r)⟩ of 1s in reduced units, the same operator as the atom's
    return one_electron_qed_factor(Z, bethe_log_hydrogenic_1s(Z)) * hydrogenic_delta_1s(Z, reduced_mass)


def one_electron_ion(Z: float, reduced_mass: float = 1.0) -> OneElectronIon:
    """All energy pieces of the hydrogen-like 1s ion (Eh)."""
    nonrel = -0.5 * Z * Z
    return OneElectronIon(
        Z=float(Z), reduced_mass_me=reduced_mass, nonrelativistic_infinite_mass_hartree=nonrel,
        finite_mass_hartree=nonrel * (reduced_mass - 1.0),
        relativistic_hartree=dirac_1s(Z, reduced_mass) - nonrel * reduced_mass,
        qed_alpha3_hartree=lamb_shift_1s(Z, reduced_mass),
        qed_alpha4_hartree=alpha4_radiative_factor(Z) * hydrogenic_delta_1s(Z, reduced_mass),
        bethe_log=bethe_log_hydrogenic_1s(Z))
