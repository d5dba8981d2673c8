"""Unscreened hydrogenic 1s² product ``exp(-Z r1 - Z r2)``.

Its energy is the first-order perturbation result ``E = -Z² + 5Z/8`` (Eh): the zeroth-order
``-Z²`` plus ``<1/r12> = 5Z/8`` (e.g. Bethe & Salpeter, Quantum Mechanics of One- and
Two-Electron Atoms, 1957, §32).  No nonlinear parameter.
"""

from __future__ import annotations

from twoel.basis.correlated import CorrelatedBasis
from twoel.system import Ion, State
from twoel.basis.base import Parameter, TrialFamily


class HydrogenicFamily(TrialFamily):
    name = "hydrogenic"
    summary = "unscreened 1s² product exp(-Z r1 - Z r2); first-order energy -Z² + 5Z/8"
    optimize_by_default = False
    only_states = ("1^1S",)

    def parameters(self, ion: Ion, state: State, size, options) -> list[Parameter]:
        return []

    def build(self, ion: Ion, state: State, size, values, options) -> CorrelatedBasis:
        return CorrelatedBasis([[0, 0, 0]], [[ion.Z, ion.Z, 0.0]], sign=1, labels=("1s²(Z)",))


FAMILY = HydrogenicFamily()
