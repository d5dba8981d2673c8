"""What every trial-function family provides, and helpers shared by the correlated families.

A family turns ``(ion, state, size, nonlinear parameters)`` into a basis object that knows its
matrices.  The solver, the optimizer, the corrections and the reports only see this interface,
so a new family touches its own module (and, if needed, its integrals) and the registry list.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass
from typing import Any, Protocol

from twoel.errors import InputError, UnsupportedError
from twoel.basis.correlated import SystemMatrices
from twoel.system import Ion, State


class Basis(Protocol):
    """A basis that can produce its Hamiltonian matrices."""

    @property
    def size(self) -> int: ...

    def matrices(self) -> SystemMatrices: ...

    def describe(self) -> dict: ...


@dataclass(frozen=True)
class Parameter:
    """One nonlinear parameter of a family.

    ``kind="exponent"`` marks an inverse length (bohr⁻¹): it is optimized on a log scale and
    multiplied by λ in a virial rescaling ``r -> r/λ``.
    """

    name: str
    initial: float
    lower: float = 1e-3
    upper: float = 1e3
    kind: str = "exponent"


class TrialFamily(ABC):
    """Base class of the trial-function families (see :mod:`twoel.basis`)."""

    #: registry name, e.g. ``"hylleraas"``
    name: str = ""
    #: one-line description
    summary: str = ""
    #: what ``size`` means for this family, or ``None`` if it has no size parameter
    size_meaning: str | None = None
    default_size: int | None = None
    min_size: int = 0
    max_size: int | None = None
    #: whether the nonlinear parameters are optimized unless the user says otherwise
    optimize_by_default: bool = True
    #: option names understood by :meth:`build` (anything else raises)
    option_names: tuple[str, ...] = ()
    #: angular momenta the family can represent
    supported_L: tuple[int, ...] = (0,)
    #: if set, the only states (canonical labels) the family describes
    only_states: tuple[str, ...] | None = None

    def resolve_size(self, size: int | None) -> int | None:
        """Validate ``size`` (``None`` selects the default; families without a size ignore it)."""
        if self.size_meaning is None:
            return None
        if size is None:
            return self.default_size
        if isinstance(size, bool) or not isinstance(size, int):
            raise InputError(f"'size' must be an integer ({self.size_meaning}), got {size!r}")
        if size < self.min_size or (self.max_size is not None and size > self.max_size):
            raise InputError(f"'size' for family {self.name!r} ({self.size_meaning}) must be between "
                             f"{self.min_size} and {self.max_size}, got {size}")
        return size

    def check_options(self, options: dict[str, Any] | None) -> dict[str, Any]:
        options = dict(options or {})
        unknown = sorted(set(options) - set(self.option_names))
        if unknown:
            allowed = ", ".join(self.option_names) or "none"
            raise InputError(f"unknown option(s) {', '.join(unknown)} for family {self.name!r} "
                             f"(allowed: {allowed})")
        return options

    def check_state(self, state: State) -> None:
        """Raise :class:`UnsupportedError` if the family cannot represent ``state``."""
        if state.L not in self.supported_L:
            raise UnsupportedError(f"family {self.name!r} represents only "
                                   f"{'/'.join('SPDF'[L] for L in self.supported_L)} states, "
                                   f"not {state.label}")
        if self.only_states is not None and state.label not in self.only_states:
            raise UnsupportedError(f"family {self.name!r} describes only {', '.join(self.only_states)}, "
                                   f"not {state.label}")

    @abstractmethod
    def parameters(self, ion: Ion, state: State, size: int | None, options: dict) -> list[Parameter]:
        """Nonlinear parameters with starting values (may be empty)."""

    @abstractmethod
    def build(self, ion: Ion, state: State, size: int | None, values: dict[str, float],
              options: dict) -> Basis:
        """The basis for the given nonlinear parameter values."""

    def describe(self) -> dict:
        return {"name": self.name, "summary": self.summary, "size_meaning": self.size_meaning,
                "default_size": self.default_size, "max_size": self.max_size,
                "options": list(self.option_names)}
