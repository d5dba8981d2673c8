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
from dataclasses import asdict, dataclass

from twoel import constants
from twoel.corrections.qed import alpha4_radiative_factor, bethe_log_hydrogenic_1s, one_electron_qed_factor
from twoel.properties.operators import hydrogenic_delta_1s


@dataclass(frozen=True)
class OneElectronIon:
    """Energy pieces of the 1s ion (Eh)."""

    Z: float
    reduced_mass: float
    nonrelativistic_infinite_mass: float
    finite_mass: float
    relativistic: float
    qed_alpha3: float
    qed_alpha4: float
    bethe_log: float

    @property
    def total(self) -> float:
        return (self.nonrelativistic_infinite_mass + self.finite_mass + self.relativistic
                + self.qed_alpha3 + self.qed_alpha4)

    def to_dict(self) -> dict:
        d = asdict(self)
        d["total"] = self.total
        return d


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
        Z=float(Z), reduced_mass=reduced_mass, nonrelativistic_infinite_mass=nonrel,
        finite_mass=nonrel * (reduced_mass - 1.0),
        relativistic=dirac_1s(Z, reduced_mass) - nonrel * reduced_mass,
        qed_alpha3=lamb_shift_1s(Z, reduced_mass),
        qed_alpha4=alpha4_radiative_factor(Z) * hydrogenic_delta_1s(Z, reduced_mass),
        bethe_log=bethe_log_hydrogenic_1s(Z))
