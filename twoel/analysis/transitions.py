"""Excited states: solve any ``n^(2S+1)L`` state (S or P) and transitions between two states.

:func:`solve_state` is a documented alias of the front door :func:`twoel.solve` that prefers
the ``exponential`` family (ground, excited S and P states) at the size it gives for the state
(the stored ``recommended_size``, else 600 functions), and by default raises
:class:`twoel.errors.NotBoundError` for a root that is not below the one-electron threshold
``-Z²/2``.  The ``n``-th root of each symmetry block is an upper bound to the exact level
(Hylleraas-Undheim-MacDonald).

:func:`transition` returns a :class:`Transition`: ``ΔE = E_upper - E_lower`` in hartree, cm⁻¹,
eV, THz and the vacuum wavelength in nm.  These are nonrelativistic, infinite-nuclear-mass
values: fine structure, relativistic, QED and recoil corrections (~1e-4 relative for He) are
not included, which :attr:`Transition.caution` says in words.
"""

from __future__ import annotations

from dataclasses import dataclass

from twoel.basis import get_family
from twoel.errors import NotBoundError, UnsupportedError
from twoel.solver.pipeline import solve
from twoel.results import EnergyResult, Result, text_difference
from twoel.system import Ion, State
from twoel.units import hartree_to, wavelength_vacuum_nm

#: the family :func:`solve_state` uses when none is given
STATE_FAMILY = "exponential"

CAUTION = ("nonrelativistic, infinite-nuclear-mass values: no fine structure, relativistic, QED "
           "or finite-mass corrections (of relative size ~1e-4 for He), so the wavelength is "
           "not a spectroscopic prediction")


def recommended_size(Z, state: State, family=STATE_FAMILY) -> int | None:
    """Basis size the family gives for ``state`` (:meth:`~twoel.basis.base.TrialFamily.size_for`)."""
    return get_family(family).size_for(Ion.parse(Z), State.parse(state))


def solve_state(Z, state, size: int | None = None, family=None, require_bound: bool = True,
                **keywords) -> EnergyResult:
    """Alias of :func:`twoel.solve` for any S or P term, with the exponential family by default.

    ``solve_state(Z, state, size, family)`` is ``solve(Z, state, family or "exponential",
    size or that family's size for the state)``, plus the bound check.

    Parameters
    ----------
    Z : float or str
        Nuclear charge.
    state : str or State
        Term symbol (``"2^3S"``, ``"2 1P"``, ``"3³P"``, ...).
    size : int, optional
        Basis size; default: the stored set's ``recommended_size`` or 600 functions (``ω = 8``
        with the ``hylleraas`` family).
    family : str or TrialFamily, optional
        Override the family (default ``"exponential"``).
    require_bound : bool
        Raise :class:`NotBoundError` if the root is not below ``-Z²/2`` (default).
    **keywords
        Passed to :func:`twoel.solve`.
    """
    family = STATE_FAMILY if family is None else family
    if size is None:
        size = recommended_size(Z, state, family)
    result = solve(Z, state, family=family, size=size, **keywords)
    if require_bound and not result.bound:
        raise NotBoundError(f"{result.ion} {result.state}: {result.message}")
    return result


@dataclass(frozen=True, repr=False)
class Transition(Result):
    """Energy difference ``upper - lower`` of two computed levels (nonrelativistic, Eh and lab units)."""

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
    energy_uncertainty_hartree: float | None = None
    reliable: bool | None = None
    lower_result: EnergyResult | None = None
    upper_result: EnergyResult | None = None

    SUMMARY = ("ion", "lower", "upper", "energy_hartree")

    def uncertainty_in(self, unit: str) -> float | None:
        """``energy_uncertainty_hartree`` converted to ``unit`` (``None`` without a bar)."""
        bar = self.energy_uncertainty_hartree
        return None if bar is None else hartree_to(bar, unit)

    @property
    def wavelength_uncertainty_nm(self) -> float | None:
        """``λ σ_E / |ΔE|`` in nm (first order; ``None`` without a bar)."""
        bar = self.energy_uncertainty_hartree
        return None if bar is None else abs(self.wavelength_vacuum_nm) * bar / abs(self.energy_hartree)

    @property
    def is_emission(self) -> bool:
        """True when ``from`` lies above ``to`` (``energy_hartree`` is then negative)."""
        return self.energy_hartree < 0

    def to_dict(self) -> dict:
        out = {k: getattr(self, k) for k in (
            "Z", "ion", "lower", "upper", "lower_energy_hartree", "upper_energy_hartree",
            "energy_hartree", "energy_cm1", "energy_ev", "energy_thz", "wavelength_vacuum_nm",
            "caution", "energy_uncertainty_hartree", "reliable")}
        out["energy_uncertainty_cm1"] = self.uncertainty_in("cm-1")
        out["wavelength_vacuum_uncertainty_nm"] = self.wavelength_uncertainty_nm
        out["states"] = {r.state: {"energy_hartree": r.energy_hartree,
                                   "error_bar_hartree": r.error_bar_hartree, "family": r.family,
                                   "size": r.size, "n_terms": r.n_terms,
                                   "reference": None if r.reference is None else r.reference.to_dict()}
                         for r in (self.lower_result, self.upper_result) if r is not None}
        return self._with_aliases(out)


def transition_between(first: EnergyResult, second: EnergyResult) -> Transition:
    """Transition ``second - first`` (energies in every unit, positive for absorption)."""
    if first.Z != second.Z:
        raise UnsupportedError(f"a transition joins two levels of one ion (Z = {first.Z:g} vs {second.Z:g})")
    delta = text_difference(second.energy_full_text, first.energy_full_text)
    if delta == 0:
        raise UnsupportedError("the two levels have the same energy: no transition")
    return Transition(
        Z=first.Z, ion=first.ion, lower=first.state, upper=second.state,
        lower_energy_hartree=first.energy_hartree, upper_energy_hartree=second.energy_hartree,
        energy_hartree=delta, energy_cm1=hartree_to(delta, "cm-1"), energy_ev=hartree_to(delta, "ev"),
        energy_thz=hartree_to(delta, "thz"), wavelength_vacuum_nm=wavelength_vacuum_nm(delta),
        energy_uncertainty_hartree=transition_uncertainty(first, second),
        reliable=None if first.reliable is None or second.reliable is None
        else bool(first.reliable and second.reliable),
        lower_result=first, upper_result=second)


def transition_uncertainty(first: EnergyResult, second: EnergyResult) -> float | None:
    """Uncertainty of ``E_second - E_first`` in Eh: the sum of the two bars.

    The two truncation errors have the same sign (both energies are upper bounds) but are not
    independent draws, so the bars add linearly rather than in quadrature: the sum covers the
    difference error whenever each bar covers its own level.  ``None`` when either level has
    no bar.
    """
    bars = (first.error_bar_hartree, second.error_bar_hartree)
    if any(b is None or b != b for b in bars):
        return None
    return float(bars[0] + bars[1])


def transition(Z, from_state, to_state, size: int | None = None, **keywords) -> Transition:
    """Compute both levels and the transition ``to - from`` (see :class:`Transition`)."""
    a, b = State.parse(from_state), State.parse(to_state)
    if a == b:
        raise UnsupportedError(f"'from' and 'to' are the same state {a.label}")
    first = solve_state(Z, a, size=size, **keywords)
    second = solve_state(Z, b, size=size, **keywords)
    return transition_between(first, second)
