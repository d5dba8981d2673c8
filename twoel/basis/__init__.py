"""Trial-function families behind one registry.

===============  ==============================================================================
``hydrogenic``   unscreened 1s² product, first-order perturbation energy ``-Z² + 5Z/8``
``screened``     1s² product with a variational effective charge (optimum ``Z - 5/16``)
``open-shell``   two-exponent symmetrized product (Eckart 1930; Chandrasekhar 1944)
``hylleraas``    ``r1^i r2^j r12^k exp(-α r1 - β r2)`` with ``i + j + k <= ω`` (Hylleraas 1929)
``exponential``  ``(1 ± P12) exp(-α_i r1 - β_i r2 - γ_i r12)`` (S), ``z1 exp(...)`` (P) and
                 ``(ε·r1)^l (ε·r2)^(L-l) exp(...)`` (D, F), quasi-random exponents in boxes
                 (Korobov 2000)
===============  ==============================================================================

Families are listed by module in :data:`FAMILY_MODULES`; each module defines ``FAMILY``, whose
:class:`~twoel.basis.base.Support` declaration says which states, precision paths, error bar
and sizes it offers (:func:`family_for` asks it).
"""

from __future__ import annotations

import importlib
from functools import lru_cache

from twoel.errors import InputError, UnsupportedError
from twoel.basis.base import Basis, Parameter, Support, TrialFamily
from twoel.system import State

#: modules of twoel.basis that define a ``FAMILY`` object, in display order
FAMILY_MODULES = ("hydrogenic", "screened", "open_shell", "hylleraas", "exponential")


@lru_cache(maxsize=None)
def _registry() -> dict[str, TrialFamily]:
    families: dict[str, TrialFamily] = {}
    for module_name in FAMILY_MODULES:
        family = importlib.import_module(f"{__name__}.{module_name}").FAMILY
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


def family_for(state: State) -> TrialFamily:
    """The most capable registered family that covers ``state``, judged on what the families
    declare: first one that states an error bar for the state, then the most precision paths,
    then :data:`FAMILY_MODULES` order (``exponential`` for S, P, D and F states today)."""
    families = _registry()
    covering = [family for family in families.values() if family.supports().covers(state)]
    if not covering:
        raise UnsupportedError(f"no trial family represents {state.label}")
    order = {name: k for k, name in enumerate(families)}
    return min(covering, key=lambda f: (not f.gives_error_bar(state), -len(f.precision_paths(state)),
                                        order[f.name]))


__all__ = ["Basis", "Parameter", "Support", "TrialFamily", "FAMILY_MODULES", "family_for",
           "family_names", "get_family"]
