"""Trial-function families behind one registry.

===============  ==============================================================================
``hydrogenic``   unscreened 1s² product, first-order perturbation energy ``-Z² + 5Z/8``
``screened``     1s² product with a variational effective charge (optimum ``Z - 5/16``)
``open-shell``   two-exponent symmetrized product (Eckart 1930; Chandrasekhar 1944)
``hylleraas``    ``r1^i r2^j r12^k exp(-α r1 - β r2)`` with ``i + j + k <= ω`` (Hylleraas 1929)
===============  ==============================================================================

Families are listed by module in :data:`FAMILY_MODULES`; each module defines ``FAMILY``.
"""

from __future__ import annotations

import importlib
from functools import lru_cache

from twoel.errors import InputError
from twoel.basis.base import Basis, Parameter, TrialFamily

#: modules of twoel.basis that define a ``FAMILY`` object, in display order
FAMILY_MODULES = ("hydrogenic", "screened", "open_shell", "hylleraas", "exponential")


@lru_cache(maxsize=None)
def _registry() -> dict[str, TrialFamily]:
    families: dict[str, TrialFamily] = {}
    for module_name in FAMILY_MODULES:
        try:
            module = importlib.import_module(f"{__name__}.{module_name}")
        except ModuleNotFoundError as exc:
            if exc.name == f"{__name__}.{module_name}":
                continue  # family not built yet
            raise
        family = module.FAMILY
        families[family.name] = family
    return families


def family_names() -> list[str]:
    """Names of all registered families."""
    return list(_registry())


def get_family(name: str | TrialFamily) -> TrialFamily:
    """Look a family up by name (``"open_shell"`` and ``"open-shell"`` are the same)."""
    if isinstance(name, TrialFamily):
        return name
    if not isinstance(name, str):
        raise InputError(f"'family' must be a name, got {name!r}")
    key = name.strip().lower().replace("_", "-")
    families = _registry()
    if key not in families:
        raise InputError(f"unknown family {name!r}; known families: {', '.join(families)}")
    return families[key]


__all__ = ["Basis", "Parameter", "TrialFamily", "FAMILY_MODULES", "family_names", "get_family"]
