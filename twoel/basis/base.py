"""What every trial-function family provides, and helpers shared by the correlated families.

A family turns ``(ion, state, size, nonlinear parameters)`` into a basis object that knows its
matrices.  The solver, the optimizer, the corrections and the reports only see this interface,
so a new family touches its own module (and, if needed, its integrals) and the registry list.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass, field
from typing import Any, Mapping, Protocol

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


#: precision paths a family can declare: plain float64 solve, the cheap mixed-precision
#: refinement that ``precision="float64"`` adds (:func:`twoel.solver.refine.mixed_refine`), and
#: ``precision="extended"`` (:func:`twoel.solver.refine.extended_refine`)
PRECISION_PATHS = ("float64", "mixed", "extended")


@dataclass(frozen=True)
class Support:
    """What a family declares it can do; the solver asks this, never the family's name.

    Attributes
    ----------
    L_values : tuple of int
        Total angular momenta the family represents.
    only_states : tuple of str, optional
        If set, the only states (canonical labels) the family describes.
    precision : mapping of int to tuple of str
        Precision paths (:data:`PRECISION_PATHS`) per ``L``; an ``L`` not listed has
        ``("float64",)``.  ``"mixed"`` means the default solve is refined beyond float64.
    error_bar_L : tuple of int
        ``L`` values for which the family gives a basis-truncation error bar (from nested
        smaller bases, :mod:`twoel.solver.error_bar`).
    sizes : mapping of int to int
        Size used per ``L`` when twoel chooses the size for a state (:meth:`TrialFamily.size_for`);
        an ``L`` not listed uses :attr:`TrialFamily.default_size`.
    tuning_size : int, optional
        Basis size on which ``optimize=True`` tunes the parameters (``None``: the solve size).
    tuning_max_size : int, optional
        Largest tuning size.
    default_for : tuple of str, optional
        States (canonical labels) for which the family is twoel's choice when none is given;
        ``None``: every state it covers.  A family with one length scale covers excited S
        states but describes them poorly, so it declares the ground state only.
    """

    L_values: tuple[int, ...] = (0,)
    only_states: tuple[str, ...] | None = None
    precision: Mapping[int, tuple[str, ...]] = field(default_factory=dict)
    error_bar_L: tuple[int, ...] = ()
    sizes: Mapping[int, int] = field(default_factory=dict)
    tuning_size: int | None = None
    tuning_max_size: int | None = None
    default_for: tuple[str, ...] | None = None

    def is_default_for(self, state: State) -> bool:
        """Whether the family is the right default for ``state`` (see :attr:`default_for`)."""
        return self.covers(state) and (self.default_for is None or state.label in self.default_for)

    def covers(self, state: State) -> bool:
        """Whether ``state`` is among the states declared here."""
        return state.L in self.L_values and (self.only_states is None
                                             or state.label in self.only_states)

    def precision_paths(self, state: State) -> tuple[str, ...]:
        return tuple(self.precision.get(state.L, ("float64",)))


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
    #: the declaration the solver reads; ``None`` derives one from ``supported_L``/``only_states``
    support: Support | None = None

    def supports(self) -> Support:
        """The family's :class:`Support` declaration."""
        if self.support is not None:
            return self.support
        return Support(L_values=tuple(self.supported_L), only_states=self.only_states)

    def precision_paths(self, state: State) -> tuple[str, ...]:
        """Precision paths (:data:`PRECISION_PATHS`) the family offers for ``state``."""
        return self.supports().precision_paths(state)

    def tuned_at(self, ion: Ion, state: State) -> int | None:
        """Basis size at which the stored parameters for ``(ion, state)`` were optimized, if
        known (the error bar treats a nested sequence through that size with care)."""
        return None

    def gives_error_bar(self, state: State) -> bool:
        """Whether the family gives a basis-truncation error bar for ``state``."""
        return state.L in self.supports().error_bar_L

    def size_for(self, ion: Ion, state: State) -> int | None:
        """Size used for ``state`` when twoel chooses it (:attr:`Support.sizes`, else the default)."""
        return self.supports().sizes.get(state.L, self.default_size)

    def nested_sizes(self, size: int) -> list[int]:
        """The two smaller sizes whose bases are nested in that of ``size`` (for the error
        bar): ``N/2`` and ``N/√2`` for families whose size counts functions."""
        from twoel.solver.error_bar import error_bar_sizes

        return error_bar_sizes(size)

    def convergence(self, ion: Ion, state: State) -> list[tuple[int, float]]:
        """Stored ``(size, E(size) - E_exact)`` pairs (Eh) measured for ``(ion, state)`` against a
        published value, smallest size first; empty when none are stored."""
        return []

    def tuning_size(self, ion: Ion, state: State, size: int | None) -> int | None:
        """The basis size on which ``optimize=True`` tunes the nonlinear parameters."""
        support = self.supports()
        if size is None or support.tuning_size is None:
            return size
        return min(size, support.tuning_size, support.tuning_max_size or size)

    def provenance(self, ion: Ion, state: State) -> dict | None:
        """Where the family's starting parameters come from (JSON-ready), or ``None``."""
        return None

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
        support = self.supports()
        if state.L not in support.L_values:
            raise UnsupportedError(f"family {self.name!r} represents only "
                                   f"{'/'.join('SPDF'[L] for L in support.L_values)} states, "
                                   f"not {state.label}")
        if support.only_states is not None and state.label not in support.only_states:
            raise UnsupportedError(f"family {self.name!r} describes only {', '.join(support.only_states)}, "
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
