r"""Exponential bases for P states (L = 1, odd parity): ``n¹P`` and ``n³P``.

Functions ``z1 e^{-α_i r1 - β_i r2 - γ_i r12} ± (1 <-> 2)`` (the M = 0 component; see
:class:`twoel.basis.p_basis.PBasis`), exponents from quasi-random boxes
(:mod:`twoel.basis.excited_boxes`; ``α`` belongs to the ``p`` electron, ``β`` to the ``1s``
one).  Interface used by the ``exponential`` family::

    parameters(ion, state, size, options) -> list[Parameter]
    build(ion, state, size, values, options) -> PBasis

The ``n``-th P root of a symmetry block is ``state.root = n - 2``.
"""

from __future__ import annotations

from twoel.errors import UnsupportedError
from twoel.basis.p_basis import PBasis
from twoel.system import Ion, State
from twoel.basis.base import Parameter
from twoel.basis.exponential_excited import build_from_stored, origin, stored_parameters  # noqa: F401


def _check(state: State) -> None:
    if state.L != 1:
        raise UnsupportedError(f"exponential_p builds P states (L = 1) only, not {state.label}")


def parameters(ion: Ion, state: State, size, options) -> list[Parameter]:
    """Box bounds (bohr⁻¹) as nonlinear parameters, starting at the stored values."""
    _check(state)
    return stored_parameters(ion, state)


def build(ion: Ion, state: State, size, values, options) -> PBasis:
    _check(state)
    return build_from_stored(ion, state, size, values)
