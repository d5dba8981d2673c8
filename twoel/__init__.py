"""twoel: variational energies of two-electron atoms and helium-like ions.

Everything is in Hartree atomic units (Eh, bohr); laboratory units appear only at the edges
(:mod:`twoel.units`).  The front door is :func:`solve`::

    >>> import twoel
    >>> r = twoel.solve(2, "1^1S", family="screened")
    >>> round(r.energy_hartree, 10)
    -2.84765625

The public API follows one principle: **one function for each task the command line offers,
plus the types those functions take and return, plus the base error**.

==========================  =====================  ==============================================
task (command)              function               returns
==========================  =====================  ==============================================
``twoel energy``            :func:`solve`          :class:`EnergyResult`
``twoel series``            :func:`solve_many`     list of :class:`EnergyResult`
``twoel converge``          :func:`run_study`      ``ConvergenceStudy``
``twoel transition``        :func:`transition`     ``Transition``
``twoel properties``        :func:`expectation_values`  ``ExpectationValues``
``twoel spectrum``          :func:`compute_spectrum`, :func:`compute_fine_structure`
``twoel hf``                :func:`hartree_fock_limit`, :func:`split_shell_limit`,
                            :func:`correlation_energy`
``twoel check``             :func:`check_rows` (rows from :func:`read_rows`)
==========================  =====================  ==============================================

Inputs are :class:`Ion` and :class:`State` (or plain values they parse), and every error that bad
input or an impossible request raises is a :class:`TwoelError`.  Names are imported on first
use, so ``import twoel`` is cheap.  Older top-level names (``solve_state``, the error classes,
``family_names``, ...) still resolve for existing code; new code imports them from their modules
(:mod:`twoel.errors`, :mod:`twoel.basis`, ...).
"""

from __future__ import annotations

import importlib

from twoel._version import __version__

#: public name -> module that defines it (imported on first access)
_PUBLIC = {
    "solve": "twoel.solver.pipeline",
    "solve_many": "twoel.analysis.sweep",
    "run_study": "twoel.analysis.convergence",
    "transition": "twoel.analysis.transitions",
    "expectation_values": "twoel.properties.expectation",
    "compute_spectrum": "twoel.corrections.spectrum",
    "compute_fine_structure": "twoel.corrections.spectrum",
    "hartree_fock_limit": "twoel.scf.hartree_fock",
    "split_shell_limit": "twoel.scf.split_shell",
    "correlation_energy": "twoel.scf.correlation",
    "check_rows": "twoel.checking.verdicts",
    "read_rows": "twoel.checking.rows",
    "Ion": "twoel.system",
    "State": "twoel.system",
    "EnergyResult": "twoel.results",
    "TwoelError": "twoel.errors",
}

#: names kept for existing code (not part of the public API above)
_COMPATIBLE = {
    "solve_state": "twoel.analysis.transitions",
    "Transition": "twoel.analysis.transitions",
    "ExpectationValues": "twoel.properties.expectation",
    "ConvergenceStudy": "twoel.analysis.convergence",
    "check_energy": "twoel.checking.verdicts",
    "family_names": "twoel.basis",
    "get_family": "twoel.basis",
    "InputError": "twoel.errors",
    "UnsupportedError": "twoel.errors",
    "LinearDependenceError": "twoel.errors",
    "ConvergenceError": "twoel.errors",
    "NotBoundError": "twoel.errors",
    "ResourceError": "twoel.errors",
    "TwoelWarning": "twoel.errors",
    "AccuracyWarning": "twoel.errors",
}

__all__ = ["__version__", *_PUBLIC]


def __getattr__(name: str):
    module = _PUBLIC.get(name) or _COMPATIBLE.get(name)
    if module is None:
        raise AttributeError(f"module 'twoel' has no attribute {name!r}")
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(_PUBLIC) | set(_COMPATIBLE))
