"""Two-exponent ("open-shell") product ``exp(-a r1 - b r2) ± exp(-b r1 - a r2)``.

The singlet form (Eckart, Phys. Rev. 36, 878 (1930); Chandrasekhar, Astrophys. J. 100, 176
(1944)) is the simplest function that binds H⁻, with ``E ≈ -0.51330`` Eh at ``a ≈ 1.039``,
``b ≈ 0.283``.  With the minus sign it is a crude 1s2s ``2^3S`` function.
"""

from __future__ import annotations

from twoel.errors import UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.system import Ion, State
from twoel.basis.base import Parameter, TrialFamily


class OpenShellFamily(TrialFamily):
    name = "open-shell"
    summary = "two-exponent symmetrized product exp(-a r1 - b r2) ± (1<->2)"

    def check_state(self, state: State) -> None:
        super().check_state(state)
        if state.root != 0:
            raise UnsupportedError("family 'open-shell' has one function per symmetry and gives "
                                   f"only the lowest root, not {state.label}")

    def parameters(self, ion: Ion, state: State, size, options) -> list[Parameter]:
        Z = ion.Z
        if state.is_singlet:
            return [Parameter("a", Z + 0.04, 1e-3, 10 * Z + 10), Parameter("b", max(Z - 0.72, 0.25), 1e-3, 10 * Z + 10)]
        return [Parameter("a", Z, 1e-3, 10 * Z + 10), Parameter("b", max(Z - 1.0, 0.2) / 2, 1e-3, 10 * Z + 10)]

    def build(self, ion: Ion, state: State, size, values, options) -> CorrelatedBasis:
        a, b = values["a"], values["b"]
        return CorrelatedBasis([[0, 0, 0]], [[a, b, 0.0]], sign=state.exchange_sign,
                               labels=("e^(-a r1 - b r2)",))


FAMILY = OpenShellFamily()
