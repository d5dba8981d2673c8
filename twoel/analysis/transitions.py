"""Excited states: solve any ``n^(2S+1)L`` state (S or P) and transitions between two states.

:func:`solve_state` picks the trial family for a state: the registered ``exponential`` family
when it exists (it delegates P states to :mod:`twoel.basis.exponential_p`), otherwise an
internal adapter over :mod:`twoel.basis.exponential_excited` and
:mod:`twoel.basis.exponential_p` (excited S and P states; the ground state then uses the
``hylleraas`` family).  The ``n``-th root of each symmetry block is an upper bound to the exact
level (Hylleraas-Undheim-MacDonald), and a root that is not below the one-electron threshold
``-Z²/2`` raises :class:`twoel.errors.NotBoundError`.

:func:`transition` returns a :class:`Transition`: ``ΔE = E_upper - E_lower`` in hartree, cm⁻¹,
eV, THz and the vacuum wavelength in nm.  These are nonrelativistic, infinite-nuclear-mass
values: fine structure, relativistic, QED and recoil corrections (~1e-4 relative for He) are
not included, which :attr:`Transition.caution` says in words.
"""

from __future__ import annotations

from dataclasses import dataclass

from twoel.basis import family_names
from twoel.basis.base import Parameter, TrialFamily
from twoel.errors import NotBoundError, UnsupportedError
from twoel.solver.pipeline import solve
from twoel.results import EnergyResult
from twoel.system import Ion, State
from twoel.units import hartree_to, wavelength_vacuum_nm

#: default number of functions for excited S and for P states (stored boxes are tuned for it)
DEFAULT_SIZE = {0: 600, 1: 600}

CAUTION = ("nonrelativistic, infinite-nuclear-mass values: no fine structure, relativistic, QED "
           "or finite-mass corrections (of relative size ~1e-4 for He), so the wavelength is "
           "not a spectroscopic prediction")


class ExcitedExponentialFamily(TrialFamily):
    """Internal adapter (not registered): exponential bases for excited S and for P states."""

    name = "exponential"
    summary = "Σ (1 ± P12) exp(-α_i r1 - β_i r2 - γ_i r12) (S) or z1 exp(...) ± (1<->2) (P), boxes"
    size_meaning = "N, the number of exponential terms"
    default_size = 600
    min_size = 4
    max_size = 3000
    optimize_by_default = False
    supported_L = (0, 1)

    def check_state(self, state: State) -> None:
        super().check_state(state)
        if state.L == 0 and state.n == 1:
            raise UnsupportedError("the excited-state adapter does not build 1^1S; use the "
                                   "'exponential' or 'hylleraas' family")

    def _module(self, state: State):
        if state.L == 1:
            from twoel.basis import exponential_p as module
        else:
            from twoel.basis import exponential_excited as module
        return module

    def parameters(self, ion: Ion, state: State, size, options) -> list[Parameter]:
        return self._module(state).parameters(ion, state, size, options)

    def build(self, ion: Ion, state: State, size, values, options):
        return self._module(state).build(ion, state, size, values, options)


ADAPTER = ExcitedExponentialFamily()


def default_family(state: State):
    """The family used for ``state`` when none is given (see the module docstring)."""
    if "exponential" in family_names():
        return "exponential"
    if state.L == 0 and state.n == 1:
        return "hylleraas"
    return ADAPTER


def recommended_size(Z, state: State) -> int:
    """Basis size for ``state``: the stored set's ``recommended_size`` or :data:`DEFAULT_SIZE`."""
    from twoel.basis.excited_boxes import stored_entry

    entry = stored_entry(Ion.parse(Z).Z, state) if state.n > 1 or state.L > 0 else None
    if entry is not None and entry.extra.get("recommended_size"):
        return int(entry.extra["recommended_size"])
    return DEFAULT_SIZE.get(state.L, 600)


def solve_state(Z, state, size: int | None = None, family=None, require_bound: bool = True,
                **keywords) -> EnergyResult:
    """Variational energy of ``state`` (any S or P term) with a suitable default basis.

    Parameters
    ----------
    Z : float or str
        Nuclear charge.
    state : str or State
        Term symbol (``"2^3S"``, ``"2 1P"``, ``"3³P"``, ...).
    size : int, optional
        Basis size; the default is the stored set's ``recommended_size`` or 600 functions
        (``ω = 8`` for the ground state with the ``hylleraas`` fallback).
    family : str or TrialFamily, optional
        Override the family choice.
    require_bound : bool
        Raise :class:`NotBoundError` if the root is not below ``-Z²/2`` (default).
    """
    state = State.parse(state)
    family = default_family(state) if family is None else family
    if size is None:
        name = family if isinstance(family, str) else family.name
        size = 8 if name == "hylleraas" else recommended_size(Z, state)
    result = solve(Z, state, family=family, size=size, **keywords)
    if require_bound and not result.bound:
        raise NotBoundError(f"{result.ion} {result.state}: {result.message}")
    return result


@dataclass(frozen=True)
class Transition:
    """Energy difference ``upper - lower`` of two computed levels (nonrelativistic)."""

    Z: float
    ion: str
    lower: str
    upper: str
    lower_energy_hartree: float
    upper_energy_hartree: float
    energy_hartree: float
    energy_cm1: float
    energy_ev: float
    energy_thz: float
    wavelength_vacuum_nm: float
    caution: str = CAUTION
    lower_result: EnergyResult | None = None
    upper_result: EnergyResult | None = None

    @property
    def is_emission(self) -> bool:
        """True when ``from`` lies above ``to`` (``energy_hartree`` is then negative)."""
        return self.energy_hartree < 0

    def to_dict(self) -> dict:
        out = {k: getattr(self, k) for k in (
            "Z", "ion", "lower", "upper", "lower_energy_hartree", "upper_energy_hartree",
            "energy_hartree", "energy_cm1", "energy_ev", "energy_thz", "wavelength_vacuum_nm",
            "caution")}
        out["states"] = {r.state: {"energy_hartree": r.energy_hartree, "family": r.family,
                                   "size": r.size, "n_terms": r.n_terms,
                                   "reference": None if r.reference is None else r.reference.to_dict()}
                         for r in (self.lower_result, self.upper_result) if r is not None}
        return out


def transition_between(first: EnergyResult, second: EnergyResult) -> Transition:
    """Transition ``second - first`` (energies in every unit, positive for absorption)."""
    if first.Z != second.Z:
        raise UnsupportedError(f"a transition joins two levels of one ion (Z = {first.Z:g} vs {second.Z:g})")
    delta = second.energy_hartree - first.energy_hartree
    if delta == 0:
        raise UnsupportedError("the two levels have the same energy: no transition")
    return Transition(
        Z=first.Z, ion=first.ion, lower=first.state, upper=second.state,
        lower_energy_hartree=first.energy_hartree, upper_energy_hartree=second.energy_hartree,
        energy_hartree=delta, energy_cm1=hartree_to(delta, "cm-1"), energy_ev=hartree_to(delta, "ev"),
        energy_thz=hartree_to(delta, "thz"), wavelength_vacuum_nm=wavelength_vacuum_nm(delta),
        lower_result=first, upper_result=second)


def transition(Z, from_state, to_state, size: int | None = None, **keywords) -> Transition:
    """Compute both levels and the transition ``to - from`` (see :class:`Transition`)."""
    a, b = State.parse(from_state), State.parse(to_state)
    if a == b:
        raise UnsupportedError(f"'from' and 'to' are the same state {a.label}")
    first = solve_state(Z, a, size=size, **keywords)
    second = solve_state(Z, b, size=size, **keywords)
    return transition_between(first, second)
