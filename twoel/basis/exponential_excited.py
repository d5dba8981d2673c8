r"""Exponential bases for excited S states (``n >= 2``, singlet and triplet).

Functions ``(1 ± P12) e^{-α_i r1 - β_i r2 - γ_i r12}`` with exponents from quasi-random boxes
(:mod:`twoel.basis.excited_boxes`): one box for the ``1s``-like inner region and boxes at the
length scale of the outer electron, so that the ``n``-th root of the generalized eigenproblem
(Hylleraas-Undheim-MacDonald) describes ``n^(2S+1)S``.  The module exposes the same interface
as :mod:`twoel.basis.exponential_p` so that the ``exponential`` family can delegate to it::

    parameters(ion, state, size, options) -> list[Parameter]
    build(ion, state, size, values, options) -> CorrelatedBasis

The basis is a :class:`twoel.basis.correlated.CorrelatedBasis` with zero powers; its ``matrices()`` are
computed by the pair evaluator :mod:`twoel.integrals.pairs` through
:func:`twoel.integrals.hamiltonian.hamiltonian_matrices`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.system import Ion, State
from twoel.basis import excited_boxes as xb
from twoel.basis.base import Parameter


@dataclass(frozen=True)
class ExponentialSBasis(CorrelatedBasis):
    """A zero-power :class:`CorrelatedBasis` whose matrices use the pair-wise path."""

    def matrices(self):
        from twoel.integrals.hamiltonian import hamiltonian_matrices

        return hamiltonian_matrices(self)

    def describe(self) -> dict:
        out = super().describe()
        out["kind"] = "exponential-S"
        out.pop("powers")
        return out


def _check(state: State) -> None:
    if state.L != 0:
        raise UnsupportedError(f"exponential_excited builds S states only, not {state.label}")


def basis_from_boxes(boxes, state: State, size: int):
    """The S or P exponential basis of ``size`` functions drawn from ``boxes``."""
    exps = xb.box_exponents(boxes, size, state.exchange_sign,
                            guard_triplet=state.L == 0 and state.exchange_sign < 0)
    if state.L == 0:
        return ExponentialSBasis(np.zeros(exps.shape, dtype=int), exps, sign=state.exchange_sign)
    if state.L == 1:
        from twoel.basis.p_basis import PBasis

        return PBasis(exps, sign=state.exchange_sign)
    raise UnsupportedError(f"no exponential basis for L = {state.L} ({state.label})")


def stored_parameters(ion: Ion, state: State) -> list[Parameter]:
    """Box bounds (bohr⁻¹) as nonlinear parameters, starting at the stored values (any L)."""
    boxes, _origin = xb.default_boxes(ion, state)
    return xb.box_parameters(boxes)


def build_from_stored(ion: Ion, state: State, size, values):
    """Basis of ``size`` terms from the stored boxes with ``values`` overriding edges (any L)."""
    size = xb.check_size(size, minimum=state.root + 1)
    template, _origin = xb.default_boxes(ion, state)
    boxes = xb.boxes_from_values(template, values or {})
    return basis_from_boxes(boxes, state, size)


def parameters(ion: Ion, state: State, size, options) -> list[Parameter]:
    """Box bounds (bohr⁻¹) as nonlinear parameters, starting at the stored values."""
    _check(state)
    return stored_parameters(ion, state)


def origin(ion: Ion, state: State) -> str:
    """``"stored"``, ``"scaled"`` (from the helium boxes) or ``"generic"``."""
    return xb.default_boxes(ion, state)[1]


def build(ion: Ion, state: State, size, values, options) -> ExponentialSBasis:
    _check(state)
    return build_from_stored(ion, state, size, values)
