"""Energy-unit conversions at the edges (CODATA via :mod:`twoel.constants`).

Internally every energy is in hartree (Eh).  ``convert_energy(value, "hartree", "cm-1")`` and
friends are the only place where laboratory units appear.  Unit names are matched
case-insensitively against the aliases below; an unknown name raises :class:`InputError`.
"""

from __future__ import annotations

from functools import lru_cache

from twoel.errors import InputError

#: units whose size in hartree is exact (no measured constant involved)
_EXACT_HARTREE_PER_UNIT = {"hartree": 1.0, "mhartree": 1e-3, "rydberg": 0.5}


@lru_cache(maxsize=None)
def _codata_hartree_per_unit() -> dict[str, float]:
    """Energy of one laboratory unit in hartree, from CODATA (loaded on first use only)."""
    from twoel import constants as C

    return {
        "ev": 1.0 / C.HARTREE_EV.value,
        "cm-1": 1.0 / (C.HARTREE_INVERSE_M.value / 100.0),
        "mhz": 1e6 / C.HARTREE_HZ.value,
        "thz": 1e12 / C.HARTREE_HZ.value,
        "kj/mol": 1e3 / (C.HARTREE_J.value * C.AVOGADRO.value),
        "kcal/mol": 4.184e3 / (C.HARTREE_J.value * C.AVOGADRO.value),
    }


_ALIASES = {
    "eh": "hartree", "ha": "hartree", "au": "hartree", "a.u.": "hartree", "hartrees": "hartree",
    "meh": "mhartree", "millihartree": "mhartree",
    "electronvolt": "ev",
    "cm^-1": "cm-1", "cm1": "cm-1", "1/cm": "cm-1", "wavenumber": "cm-1", "kayser": "cm-1",
    "kj mol-1": "kj/mol", "kjmol": "kj/mol", "kj_mol": "kj/mol",
    "kcal mol-1": "kcal/mol", "kcalmol": "kcal/mol", "kcal_mol": "kcal/mol",
    "ry": "rydberg",
}

#: canonical unit names, in display order
ENERGY_UNITS = ("hartree", "mhartree", "ev", "cm-1", "mhz", "thz", "kj/mol", "kcal/mol", "rydberg")

#: how units are printed
UNIT_LABELS = {"hartree": "Eh", "mhartree": "mEh", "ev": "eV", "cm-1": "cm⁻¹", "mhz": "MHz",
               "thz": "THz", "kj/mol": "kJ/mol", "kcal/mol": "kcal/mol", "rydberg": "Ry"}


def canonical_unit(name: str) -> str:
    """Return the canonical spelling of an energy unit or raise :class:`InputError`."""
    if not isinstance(name, str):
        raise InputError(f"unit must be a string, got {name!r}")
    key = name.strip().lower()
    key = _ALIASES.get(key, key)
    if key not in ENERGY_UNITS:
        raise InputError(f"unknown energy unit {name!r}; known units: {', '.join(ENERGY_UNITS)}")
    return key


def hartree_per(unit: str) -> float:
    """Energy of one ``unit`` in hartree (exact, or from CODATA via :mod:`twoel.constants`)."""
    key = canonical_unit(unit)
    if key in _EXACT_HARTREE_PER_UNIT:
        return _EXACT_HARTREE_PER_UNIT[key]
    return _codata_hartree_per_unit()[key]


def convert_energy(value, from_unit: str, to_unit: str):
    """Convert an energy (scalar or array) between units.

    Parameters
    ----------
    value : float or array_like
        Energy in ``from_unit``.
    from_unit, to_unit : str
        Unit names, e.g. ``"hartree"``, ``"eV"``, ``"cm-1"``, ``"MHz"``, ``"kJ/mol"``.
    """
    factor = hartree_per(from_unit) / hartree_per(to_unit)
    if isinstance(value, (int, float)):
        return float(value) * factor
    import numpy as np

    if np.ndim(value) == 0:
        return float(value) * factor
    return np.asarray(value, dtype=float) * factor


def hartree_to(value, unit: str):
    """Convert an energy from hartree to ``unit``."""
    return convert_energy(value, "hartree", unit)


def to_hartree(value, unit: str):
    """Convert an energy from ``unit`` to hartree."""
    return convert_energy(value, unit, "hartree")


def all_units(value_hartree: float) -> dict[str, float]:
    """An energy in every known unit, keyed by canonical unit name."""
    return {u: hartree_to(value_hartree, u) for u in ENERGY_UNITS}


def wavelength_vacuum_nm(energy_hartree: float) -> float:
    """Vacuum wavelength (nm) of a photon with the given energy (Eh); ``inf`` for zero energy."""
    from twoel import constants as C

    wavenumber_per_m = abs(energy_hartree) * C.HARTREE_INVERSE_M.value
    return float("inf") if wavenumber_per_m == 0 else 1e9 / wavenumber_per_m
