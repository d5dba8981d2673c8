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
from .convergence import ConvergenceStudy, run_study
from .errors import (AccuracyWarning, ConvergenceError, InputError, LinearDependenceError,
                     NotBoundError, ResourceError, TwoelError, TwoelWarning, UnsupportedError)
from .pipeline import solve
from .properties import ExpectationValues, expectation_values
from .states import Transition, solve_state, transition
from .results import EnergyResult
from .sweep import solve_many
from .system import Ion, State
from .check_input import read_rows
from .checking import check_energy, check_rows
from .correlation import correlation_energy
from .hartree_fock import hartree_fock_limit
from .split_shell import split_shell_limit
from .corrections.spectrum import compute_fine_structure, compute_spectrum

__all__ = [
    "__version__", "solve", "solve_many", "EnergyResult", "Ion", "State", "family_names", "get_family",
    "TwoelError", "InputError", "UnsupportedError", "LinearDependenceError", "ConvergenceError",
    "NotBoundError", "ResourceError", "TwoelWarning", "AccuracyWarning",
    "solve_state", "transition", "Transition", "expectation_values", "ExpectationValues",
    "hartree_fock_limit", "split_shell_limit", "correlation_energy", "check_energy", "check_rows",
    "read_rows",
    "ConvergenceStudy", "run_study",
    "compute_spectrum", "compute_fine_structure",
]
