"""twoel: variational energies of two-electron atoms and helium-like ions.

Everything is in Hartree atomic units (Eh, bohr); laboratory units appear only at the edges
(:mod:`twoel.units`).  The front door is :func:`solve`::

    >>> import twoel
    >>> r = twoel.solve(2, "1^1S", family="screened")
    >>> round(r.energy_hartree, 10)
    -2.84765625
"""

from twoel._version import __version__
from twoel.basis import family_names, get_family
from twoel.analysis.convergence import ConvergenceStudy, run_study
from twoel.errors import (AccuracyWarning, ConvergenceError, InputError, LinearDependenceError,
                     NotBoundError, ResourceError, TwoelError, TwoelWarning, UnsupportedError)
from twoel.solver.pipeline import solve
from twoel.properties.expectation import ExpectationValues, expectation_values
from twoel.analysis.transitions import Transition, solve_state, transition
from twoel.results import EnergyResult
from twoel.analysis.sweep import solve_many
from twoel.system import Ion, State
from twoel.checking.rows import read_rows
from twoel.checking.verdicts import check_energy, check_rows
from twoel.scf.correlation import correlation_energy
from twoel.scf.hartree_fock import hartree_fock_limit
from twoel.scf.split_shell import split_shell_limit
from twoel.corrections.spectrum import compute_fine_structure, compute_spectrum

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
