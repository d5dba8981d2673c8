r"""Named operator sets of correlated bases (S, P, D, F), in the piece form of the pair evaluator.

Operators are lists of ``(integrand, weight)`` pieces (see :mod:`twoel.integrals.pairs`, the one
evaluator of correlated pair integrals, for the integrands and the exchange convention).
:data:`HAMILTONIAN` holds the pieces of the nonrelativistic Hamiltonian; other modules
(:mod:`twoel.properties.expectation`, :mod:`twoel.properties.operators`) define their own sets.
"""

from __future__ import annotations

from twoel.integrals.pairs import UNIT, operator_matrices

#: the Hamiltonian pieces; kinetic = ½(∇1·∇1 + ∇2·∇2), nuclear for unit charge
HAMILTONIAN = {
    "overlap": [("unit", UNIT)],
    "kinetic": [("kinetic", UNIT)],
    "nuclear": [("unit", [(1.0, (-1, 0, 0)), (1.0, (0, -1, 0))])],
    "repulsion": [("unit", [(1.0, (0, 0, -1))])],
}


def hamiltonian_matrices(basis):
    """:class:`twoel.basis.correlated.SystemMatrices` of a correlated basis (any L <= 3) by the
    pair evaluator.

    (For S bases :func:`twoel.basis.correlated.build_matrices` is the same evaluator plus the
    zero-power closed forms.)
    """
    from twoel.basis.correlated import SystemMatrices

    m = operator_matrices(basis, HAMILTONIAN)
    return SystemMatrices(m["overlap"], m["kinetic"], m["nuclear"], m["repulsion"])
