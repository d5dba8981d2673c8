"""Nuclear masses for the finite-mass corrections, from the ``periodictable`` package.

The atomic mass of an isotope (in u) comes from the maintained ``periodictable`` data (its
tables follow the AME/IUPAC evaluations); the default isotope of an element is its most
abundant one (¹H, ⁴He, ⁷Li, ⁹Be, ¹¹B, ¹²C, ¹⁴N, ¹⁶O, ¹⁹F, ²⁰Ne, ...).  The nuclear mass is the
atomic mass minus ``Z`` electron masses (CODATA, :mod:`twoel.constants`); the electron binding
energy (79 eV for He, i.e. 2e-8 of the atomic mass) is neglected, which changes the nuclear
mass by less than 1e-7 relative and the energies by less than 1e-11 relative.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

from twoel import constants
from twoel.errors import InputError, UnsupportedError
from twoel.results import Result


@dataclass(frozen=True, repr=False)
class NuclearMass(Result):
    """A nuclear mass in electron masses, with its provenance.

    ``atomic_mass_u`` is the tabulated atomic mass (u) it came from (``None`` for an explicit
    mass); ``reduced_mass_me`` (``μ/m_e``, property, also in ``to_dict()``).
    """

    SUMMARY: ClassVar[tuple] = ("Z", "mass_number", "nuclear_mass_me")

    Z: int
    mass_number: int | None
    atomic_mass_u: float | None
    nuclear_mass_me: float
    source: str

    @property
    def ratio(self) -> float:
        """``M / m_e``."""
        return self.nuclear_mass_me

    @property
    def reduced_mass_me(self) -> float:
        """``μ / m_e = M / (M + m_e)``."""
        return self.nuclear_mass_me / (self.nuclear_mass_me + 1.0)

    @property
    def reduced_mass(self) -> float:
        """Alias of :attr:`reduced_mass_me` (older name)."""
        return self.reduced_mass_me

    @property
    def label(self) -> str:
        return f"{self.mass_number}" if self.mass_number else "explicit"

    def to_dict(self) -> dict:
        out = super().to_dict()
        out["reduced_mass_me"] = self.reduced_mass_me
        return out


def _element(Z: int):
    import periodictable

    if not float(Z).is_integer() or not 1 <= Z <= 118:
        raise InputError(f"nuclear masses need an integer Z between 1 and 118, got {Z!r}")
    return periodictable.elements[int(Z)]


def most_abundant_isotope(Z: int) -> int:
    """Mass number of the most abundant isotope of element ``Z`` (``periodictable`` data)."""
    el = _element(Z)
    isotopes = [iso for iso in el if getattr(iso, "abundance", 0) > 0]
    if not isotopes:
        raise UnsupportedError(f"element Z={Z} has no naturally abundant isotope; give --isotope "
                               "or --nuclear-mass")
    return max(isotopes, key=lambda iso: iso.abundance).isotope


def nuclear_mass(Z: int, isotope: int | None = None, mass: float | None = None,
                 mass_unit: str = "u") -> NuclearMass:
    """Nuclear mass of element ``Z`` in electron masses.

    Parameters
    ----------
    Z : int
        Nuclear charge.
    isotope : int, optional
        Mass number; default: the most abundant isotope.
    mass : float, optional
        An explicit mass instead of the tabulated one: the *nuclear* mass in ``mass_unit``.
    mass_unit : {"u", "me"}
        Unit of ``mass``: unified atomic mass units or electron masses.
    """
    me_u = constants.ELECTRON_MASS_U.value
    if mass is not None:
        if isotope is not None:
            raise InputError("give either an isotope or an explicit nuclear mass, not both")
        if not math.isfinite(mass) or mass <= 0:
            raise InputError(f"nuclear mass must be a positive number, got {mass!r}")
        if mass_unit == "u":
            value = mass / me_u
        elif mass_unit == "me":
            value = float(mass)
        else:
            raise InputError(f"nuclear mass unit must be 'u' or 'me', got {mass_unit!r}")
        if value < 100:
            raise InputError(f"nuclear mass {value:g} m_e is below any nucleus (a proton is 1836 m_e)")
        return NuclearMass(int(Z), None, None, value, f"explicit nuclear mass ({mass:g} {mass_unit})")
    el = _element(Z)
    A = most_abundant_isotope(Z) if isotope is None else int(isotope)
    try:
        iso = el[A]
    except (KeyError, IndexError, ValueError):
        raise InputError(f"no isotope {A} of {el.symbol} in the periodictable data")
    atomic = float(iso.mass)
    if not atomic > 0:
        raise InputError(f"no mass tabulated for {A}{el.symbol}")
    nucleus = atomic / me_u - float(Z)
    import periodictable

    source = (f"atomic mass of {A}{el.symbol} {atomic!r} u (periodictable {periodictable.__version__}) "
              f"minus {int(Z)} electron masses ({constants.CODATA_EDITION}); electron binding neglected")
    return NuclearMass(int(Z), A, atomic, nucleus, source)
