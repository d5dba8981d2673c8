"""twoel: variational energies of two-electron atoms and helium-like ions.

Everything is in Hartree atomic units (Eh, bohr); laboratory units appear only at the edges
(:mod:`twoel.units`).  The front door is :func:`solve`::

    >>> import twoel
    >>> r = twoel.solve(2, "1^1S", family="screened")
    >>> round(r.energy_hartree, 10)
    -2.84765625
"""

from ._version import __version__
from .basis import family_names, get_family
from .errors import (AccuracyWarning, ConvergenceError, InputError, LinearDependenceError,
                     NotBoundError, ResourceError, TwoelError, TwoelWarning, UnsupportedError)
from .pipeline import solve
from .results import EnergyResult
from .system import Ion, State
from .corrections.spectrum import compute_fine_structure, compute_spectrum

__all__ = [
    "__version__", "solve", "EnergyResult", "Ion", "State", "family_names", "get_family",
    "TwoelError", "InputError", "UnsupportedError", "LinearDependenceError", "ConvergenceError",
    "NotBoundError", "ResourceError", "TwoelWarning", "AccuracyWarning",
    "compute_spectrum", "compute_fine_structure",
]
