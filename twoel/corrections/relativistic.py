r"""Relativistic (α², Breit–Pauli) first-order corrections of two-electron S states.

For an S state the first-order Breit–Pauli energy (H. A. Bethe and E. E. Salpeter, Quantum
Mechanics of One- and Two-Electron Atoms (1957), §38–39; G. W. F. Drake, Springer Handbook of
Atomic, Molecular and Optical Physics (2006), ch. 11) is, in hartree,

.. math::

    E^{(2)} = α^2 \Big[ -\frac{1}{8}⟨p_1^4 + p_2^4⟩
              + \frac{Zπ}{2}⟨δ^3(r_1) + δ^3(r_2)⟩
              - π⟨δ^3(r_{12})⟩ - \frac{8π}{3}⟨\mathbf{s}_1·\mathbf{s}_2⟩⟨δ^3(r_{12})⟩
              - \frac{1}{2}⟨\frac{1}{r_{12}}\big(\mathbf{p}_1·\mathbf{p}_2
                 + \hat r_{12}·(\hat r_{12}·\mathbf{p}_1)\mathbf{p}_2\big)⟩ \Big]

(mass-velocity, one-electron Darwin, two-electron Darwin, spin–spin contact, orbit–orbit).
``⟨s1·s2⟩ = -3/4`` for singlets and ``+1/4`` for triplets (where ``⟨δ³(r12)⟩ = 0``).  The
spin–orbit, spin–other-orbit and tensor spin–spin terms vanish for L = 0; the 2³P fine
structure needs P-state wavefunctions (not available for the correlated S bases).

The regularized forms (:mod:`twoel.properties.operators`) are used for the totals; the direct
delta values are reported beside them to show the agreement.  Finite nuclear mass: the whole
correction is scaled by ``μ/m`` like the Dirac energy of the one-electron ion
(:mod:`twoel.corrections.one_electron`); the α²·m/M recoil operators are neglected (a few
1e-3 cm⁻¹ for He).

Validity: first order in α² misses terms of relative size ``(Zα)²`` of this correction; see
:data:`CAUTION_Z_ALPHA`.
"""

from __future__ import annotations

from dataclasses import dataclass
from math import pi
from typing import ClassVar

from twoel import constants
from twoel.errors import UnsupportedError
from twoel.results import Result
from twoel.system import State

#: Zα above which the fine-structure output cautions that first-order Breit–Pauli is
#: inadequate.  (The ionization-energy cautions use the omitted-term estimate ``0.2 α⁴Z⁶`` Eh of
#: :mod:`twoel.corrections.uncertainty` instead, which exceeds 1 cm⁻¹ from Z = 5 on.)
CAUTION_Z_ALPHA = 0.05


_TERMS = ("mass_velocity", "darwin_one_electron", "darwin_two_electron", "spin_spin_contact",
          "orbit_orbit")


@dataclass(frozen=True, repr=False)
class BreitPauli(Result):
    """α² corrections of an S state (Eh, already multiplied by α² and μ/m).

    Attributes
    ----------
    mass_velocity_hartree, darwin_one_electron_hartree, darwin_two_electron_hartree,
    spin_spin_contact_hartree, orbit_orbit_hartree : float
        The terms with the regularized δ and ``⟨p1⁴⟩`` (Eh).
    darwin_one_electron_direct_hartree, darwin_two_electron_direct_hartree : float
        The Darwin terms with the direct δ values (Eh).
    total_hartree, total_direct_hartree : float
        Their sums (properties; the direct total also uses the direct δ(r12) in the contact term).

    The names without ``_hartree`` are the older ones (aliases, in ``to_dict()`` too).
    """

    ALIASES: ClassVar[dict] = {**{t: f"{t}_hartree" for t in _TERMS},
                               "darwin_one_electron_direct": "darwin_one_electron_direct_hartree",
                               "darwin_two_electron_direct": "darwin_two_electron_direct_hartree",
                               "total": "total_hartree", "total_direct": "total_direct_hartree"}
    SUMMARY: ClassVar[tuple] = ("total_hartree", "mass_velocity_hartree", "darwin_one_electron_hartree")
    DERIVED: ClassVar[tuple] = ("total_hartree", "total_direct_hartree")

    mass_velocity_hartree: float
    darwin_one_electron_hartree: float
    darwin_two_electron_hartree: float
    spin_spin_contact_hartree: float
    orbit_orbit_hartree: float
    darwin_one_electron_direct_hartree: float
    darwin_two_electron_direct_hartree: float

    @property
    def total_hartree(self) -> float:
        return sum(getattr(self, f"{t}_hartree") for t in _TERMS)

    @property
    def total_direct_hartree(self) -> float:
        """The same total with the direct (unregularized) delta values."""
        return (self.total_hartree - self.darwin_one_electron_hartree - self.darwin_two_electron_hartree
                - self.spin_spin_contact_hartree + self.darwin_one_electron_direct_hartree
                + self.darwin_two_electron_direct_hartree * (1 + self._contact_ratio))

    @property
    def _contact_ratio(self) -> float:
        two = self.darwin_two_electron_hartree
        return 0.0 if two == 0 else self.spin_spin_contact_hartree / two


def spin_product(state: State) -> float:
    """``⟨s1·s2⟩ = [S(S+1) - 3/2]/2``."""
    S = state.spin
    return 0.5 * (S * (S + 1) - 1.5)


def breit_pauli_s(Z: float, state, values, orbit_orbit: float, reduced_mass: float = 1.0) -> BreitPauli:
    """First-order Breit–Pauli energy of an S state.

    Parameters
    ----------
    Z : float
    state : str or State
    values : OperatorValues
        From :func:`twoel.properties.operators.operator_values` (per electron).
    orbit_orbit : float
        ``⟨(1/r12)(p1·p2 + r̂12·(r̂12·p1)p2)⟩`` (a.u.).
    reduced_mass : float
        ``μ/m``.
    """
    state = State.parse(state)
    if state.L != 0:
        raise UnsupportedError("Breit–Pauli terms are implemented for S states only "
                               "(P-state fine structure needs P wavefunctions)")
    a2 = constants.FINE_STRUCTURE.value ** 2 * reduced_mass
    ss = spin_product(state)
    d12 = values.delta_r12_regularized if state.is_singlet else 0.0
    d12_direct = values.delta_r12_direct if state.is_singlet else 0.0
    return BreitPauli(
        mass_velocity_hartree=-a2 * values.p1_fourth / 4,  # -⅛⟨p1⁴ + p2⁴⟩ = -¼⟨p1⁴⟩ per electron
        darwin_one_electron_hartree=a2 * Z * pi * values.delta_r1_regularized,
        darwin_two_electron_hartree=-a2 * pi * d12,
        spin_spin_contact_hartree=-a2 * 8 * pi / 3 * ss * d12,
        orbit_orbit_hartree=-a2 * orbit_orbit / 2,
        darwin_one_electron_direct_hartree=a2 * Z * pi * values.delta_r1_direct,
        darwin_two_electron_direct_hartree=-a2 * pi * d12_direct)
