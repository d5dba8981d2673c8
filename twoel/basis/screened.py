"""1s² product with a variational effective charge ``exp(-ζ r1 - ζ r2)``.

The energy ``E(ζ) = ζ² - 2Zζ + 5ζ/8`` is minimal at ``ζ = Z - 5/16`` with ``E = -(Z - 5/16)²``
(Kellner, Z. Phys. 44, 91 (1927); any quantum-mechanics text).  ζ is optimized numerically like
every other nonlinear parameter, so this family also tests the optimizer against a closed form.
"""

from __future__ import annotations

from twoel.basis.correlated import CorrelatedBasis
from twoel.system import Ion, State
from twoel.basis.base import Parameter, TrialFamily


class ScreenedFamily(TrialFamily):
    name = "screened"
    summary = "1s² product with variational effective charge (optimum Z - 5/16)"
    only_states = ("1^1S",)

    def parameters(self, ion: Ion, state: State, size, options) -> list[Parameter]:
        return [Parameter("zeta", max(ion.Z - 0.3, 0.1), 1e-3, 10 * ion.Z + 10)]

    def build(self, ion: Ion, state: State, size, values, options) -> CorrelatedBasis:
        zeta = values["zeta"]
        return CorrelatedBasis([[0, 0, 0]], [[zeta, zeta, 0.0]], sign=1, labels=("1s²(ζ)",))


FAMILY = ScreenedFamily()
