r"""Leading QED (α³, i.e. mα⁵) corrections of two-electron S states, and Bethe logarithms.

The α³ energy (Hartree units) is the Araki–Sucher / Kabir–Salpeter expression (H. Araki, Prog.
Theor. Phys. 17, 619 (1957); J. Sucher, Phys. Rev. 109, 1010 (1958); P. K. Kabir and
E. E. Salpeter, Phys. Rev. 108, 1256 (1957); written as in G. W. F. Drake, Springer Handbook of
Atomic, Molecular and Optical Physics (2006), ch. 11, and K. Pachucki, Phys. Rev. A 74, 062510
(2006)):

.. math::

    E^{(3)} = α^3 \Big\{ \frac{4Z}{3}\Big[\frac{19}{30} + \ln\frac{1}{α^2}
              - \ln\frac{k_0}{R_\infty}\Big] ⟨δ^3(r_1) + δ^3(r_2)⟩
              + \Big(\frac{164}{15} + \frac{14}{3}\ln α\Big) ⟨δ^3(r_{12})⟩
              - \frac{7}{6π} ⟨P(1/r_{12}^3)⟩ \Big\}

with the Bethe logarithm ``ln(k0/R∞)`` and the Araki–Sucher distribution ``P`` (see
:mod:`twoel.corrections.quadrature`).  The anomalous magnetic moment of the electron at this
order is part of the constants (``19/30``, ``164/15``).  Finite mass: ``δ``-type expectation
values scale as ``(μ/m)³``; the α³ recoil (Salpeter) terms, of relative size ``m/M`` of this
correction (< 0.001 cm⁻¹ for He), are neglected.

The partial α⁴ radiative term ``π Z² α⁴ (427/96 - 2 ln 2) ⟨Σ δ³(r_i)⟩`` (the one-loop
α(Zα)⁵ part of Pachucki's mα⁶ energy) is reported separately; the other mα⁶ terms are not
included.

Bethe logarithms: published values for He (``data/bethe_logarithms.csv``); elsewhere the
*hydrogenic-scaling approximation* ``ln(k0/R∞) ≈ ln(k0/R∞)_H(1s) + 2 ln Z`` (the 1s electron
dominates; for He 1¹S it is off by 3e-4, for 2³S by 6e-3).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

from twoel import constants
from twoel.results import Result
from twoel.reference import all_references
from twoel.system import State

BETHE_TABLE = "bethe_logarithms.csv"


def alpha4_radiative_coefficient() -> float:
    """``427/96 - 2 ln 2`` of the one-loop α(Zα)⁵ term."""
    return 427.0 / 96.0 - 2.0 * math.log(2.0)


def one_electron_qed_factor(Z: float, bethe_log: float) -> float:
    """``(4Zα³/3)[19/30 + ln(1/α²) - ln(k0/R∞)]`` (Eh·bohr³): the α³ one-electron energy per unit
    ``⟨Σ_i δ³(r_i)⟩`` (atom and 1s ion alike)."""
    alpha = constants.FINE_STRUCTURE.value
    return (4 * Z * alpha**3 / 3) * (19 / 30 + math.log(1 / alpha**2) - bethe_log)


def alpha4_radiative_factor(Z: float) -> float:
    """``π Z² α⁴ (427/96 - 2 ln 2)`` (Eh·bohr³): the one-loop α(Zα)⁵ energy per unit
    ``⟨Σ_i δ³(r_i)⟩`` (atom and 1s ion alike)."""
    alpha = constants.FINE_STRUCTURE.value
    return alpha**4 * Z * Z * math.pi * alpha4_radiative_coefficient()


def _rows():
    return all_references(BETHE_TABLE)


def bethe_log_hydrogenic_1s(Z: float) -> float:
    """``ln(k0/R∞)`` of the hydrogen-like 1s state (Drake & Swainson 1990 value + 2 ln Z)."""
    (row,) = [r for r in _rows() if r.quantity == "bethe_logarithm_hydrogen"]
    return row.value + 2.0 * math.log(Z)


@dataclass(frozen=True, repr=False)
class BetheLog(Result):
    """A Bethe logarithm ``ln(k0/R∞)`` (dimensionless) with its source.

    ``approximate`` is true for the hydrogenic-scaling approximation (no published value).
    """

    value: float
    source: str
    approximate: bool


def bethe_logarithm(Z: float, state: str | State) -> BetheLog:
    """The Bethe logarithm ``ln(k0/R∞)`` of a two-electron S state.

    Published values are used where ``data/bethe_logarithms.csv`` has them; otherwise the
    hydrogenic-scaling approximation (labelled ``approximate=True``).
    """
    label = State.parse(state).label
    for row in _rows():
        if row.quantity == "bethe_logarithm" and row.Z == float(Z) and row.state == label:
            return BetheLog(row.value, f"{row.source} ({row.note})", False)
    return BetheLog(bethe_log_hydrogenic_1s(Z),
                    "hydrogenic-scaling approximation ln(k0/R_inf)_H(1s) + 2 ln Z "
                    "(Drake & Swainson 1990 hydrogen value); not a published two-electron value",
                    True)


@dataclass(frozen=True, repr=False)
class QEDCorrection(Result):
    """α³ QED pieces of a two-electron state (Eh, finite-mass scaled).

    Attributes
    ----------
    one_electron_hartree, two_electron_hartree, araki_sucher_hartree : float
        The three α³ terms of the module formula (Eh).
    alpha4_radiative_hartree : float
        The partial one-loop α⁴ term (Eh).
    bethe_log : BetheLog
        The Bethe logarithm used.
    alpha3_hartree : float
        Sum of the α³ terms (property).

    The names without ``_hartree`` are the older ones (aliases, in ``to_dict()`` too).
    """

    ALIASES: ClassVar[dict] = {"one_electron": "one_electron_hartree", "two_electron": "two_electron_hartree",
                               "araki_sucher": "araki_sucher_hartree",
                               "alpha4_radiative": "alpha4_radiative_hartree", "alpha3": "alpha3_hartree"}
    SUMMARY: ClassVar[tuple] = ("alpha3_hartree", "alpha4_radiative_hartree")
    DERIVED: ClassVar[tuple] = ("alpha3_hartree",)

    one_electron_hartree: float
    two_electron_hartree: float
    araki_sucher_hartree: float
    alpha4_radiative_hartree: float
    bethe_log: BetheLog

    @property
    def alpha3_hartree(self) -> float:
        return self.one_electron_hartree + self.two_electron_hartree + self.araki_sucher_hartree


def qed_correction(Z: float, state, delta_r1: float, delta_r12: float, araki_sucher: float,
                   reduced_mass: float = 1.0) -> QEDCorrection:
    """α³ QED energy from per-electron ``⟨δ³(r1)⟩``, ``⟨δ³(r12)⟩`` and ``⟨P(1/r12³)⟩`` (a.u.)."""
    alpha = constants.FINE_STRUCTURE.value
    bl = bethe_logarithm(Z, state)
    scale = reduced_mass**3
    # ⟨δ³(r1) + δ³(r2)⟩ = 2⟨δ³(r1)⟩ (per-electron convention of twoel.properties.operators)
    one = one_electron_qed_factor(Z, bl.value) * 2 * delta_r1 * scale
    two = alpha**3 * (164 / 15 + 14 / 3 * math.log(alpha)) * delta_r12 * scale
    # P(1/r³) scales as μ³ (1 + 3 ln μ term from the log); the log part is below 1e-4 relative
    arak = -alpha**3 * 7 / (6 * math.pi) * araki_sucher * scale
    a4 = alpha4_radiative_factor(Z) * 2 * delta_r1 * scale
    return QEDCorrection(one, two, arak, a4, bl)
