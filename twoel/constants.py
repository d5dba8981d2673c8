"""Physical constants (CODATA, via :mod:`scipy.constants`) with provenance.

All computation inside twoel is in Hartree atomic units (hbar = m_e = e = 4 pi eps0 = 1).  The
values below are only used at the edges to convert to laboratory units.  They are never retyped:
each one is read from ``scipy.constants.physical_constants`` so that the edition follows SciPy.
"""

from __future__ import annotations

from dataclasses import dataclass

import scipy
import scipy.constants as _sc


@dataclass(frozen=True)
class Constant:
    """A physical constant with unit, standard uncertainty and source."""

    name: str
    value: float
    unit: str
    uncertainty: float
    source: str


def _codata(key: str) -> Constant:
    value, unit, uncertainty = _sc.physical_constants[key]
    return Constant(key, float(value), unit, float(uncertainty), CODATA_EDITION)


def _edition() -> str:
    """Name the newest CODATA edition that scipy ships (its tables are named ``txtYYYY``)."""
    from scipy.constants import _codata as codata_module

    years = [int(name[3:]) for name in dir(codata_module)
             if name.startswith("txt") and name[3:].isdigit()]
    return f"CODATA {max(years)}" if years else f"CODATA (scipy {scipy.__version__})"


CODATA_EDITION = _edition()

#: CODATA keys of every constant used, in the order of the names below (and of ``ALL``)
_KEYS = (
    "Hartree energy in eV", "Hartree energy", "hartree-hertz relationship",
    "hartree-inverse meter relationship", "fine-structure constant", "electron mass in u",
    "proton-electron mass ratio", "electron g factor", "Avogadro constant", "Bohr radius",
    "speed of light in vacuum", "Rydberg constant",
)
#: all constants used, for provenance records
ALL = tuple(_codata(key) for key in _KEYS)
(HARTREE_EV, HARTREE_J, HARTREE_HZ, HARTREE_INVERSE_M, FINE_STRUCTURE, ELECTRON_MASS_U,
 PROTON_ELECTRON_MASS_RATIO, ELECTRON_G_FACTOR, AVOGADRO, BOHR_RADIUS_M, SPEED_OF_LIGHT,
 RYDBERG_INVERSE_M) = ALL


def provenance() -> dict:
    """Return the constants edition and values used, for result metadata."""
    return {"edition": CODATA_EDITION, "scipy": scipy.__version__,
            "values": {c.name: [c.value, c.unit, c.uncertainty] for c in ALL}}
