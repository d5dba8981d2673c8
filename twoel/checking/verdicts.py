r"""Verdicts on energies printed by other quantum-chemistry programs (pure core).

For one energy of a two-electron ion (``Z``, state, value, unit) :func:`check_energy` reports

* the error against the exact nonrelativistic, infinite-mass energy
  (``data/reference_energies.csv``): ``error = E − E_exact`` (positive for a variational
  upper bound) and the number of agreeing significant digits;
* the error against the Hartree–Fock limit (``data/hartree_fock_limits.csv``):
  ``E − E_HF`` (negative when some correlation energy is recovered);
* the percentage of the correlation energy recovered,
  ``100 (E_HF − E)/(E_HF − E_exact)`` (ground states only);
* flags with plain explanations (:data:`FLAG_CODES`).

Plausibility of the unit: the energy, converted to hartree with the stated unit, should lie
within ``0.7 ≤ E/E_ref ≤ 1.1`` of the exact energy (or, without a tabulated value, of the
screened estimate ``−(Z − 5/16)²``; common practice bound, generous enough for minimal-basis
and first-order energies).  If it does not, every other unit of :mod:`twoel.units` is tried;
one that lands inside the window is suggested.  The unit factors differ by at least a factor
2 (hartree/rydberg), so at most one unit can fit.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from typing import ClassVar

from twoel.checking.rows import EnergyRow, read_unit
from twoel.scf.correlation import exact_reference, hartree_fock_reference
from twoel.errors import InputError
from twoel.results import Result, agreeing_digits
from twoel.system import Ion, State
from twoel.units import ENERGY_UNITS, UNIT_LABELS, convert_energy, to_hartree

#: plausible window for ``E / E_reference`` of a total energy
PLAUSIBLE_RATIO = (0.7, 1.1)

FLAG_CODES = {
    "below_exact": "below the exact nonrelativistic energy",
    "above_hartree_fock": "above the Hartree-Fock limit",
    "unit_probably_wrong": "unit probably wrong",
    "implausible": "not a plausible energy of this ion in any unit",
    "not_bound": "ion not bound",
    "no_reference": "no exact energy tabulated",
    "no_hartree_fock_limit": "no Hartree-Fock limit tabulated",
}


@dataclass(frozen=True)
class Flag:
    """A verdict code and its plain-words explanation."""

    code: str
    explanation: str

    def to_dict(self) -> dict:
        return {"code": self.code, "explanation": self.explanation}


@dataclass(frozen=True, repr=False)
class CheckResult(Result):
    """Verdict on one energy printed by another program (energies in hartree, Eh).

    Attributes
    ----------
    Z : float
        Nuclear charge.
    ion, state, label : str
        Ion label (``He``, ``Li+``), term symbol and the free-text method/basis label.
    energy_input : float
        The energy as given, in ``unit`` (JSON key ``energy``).
    unit : str
        Canonical unit name of ``energy_input`` (:func:`twoel.units.canonical_unit`).
    energy_hartree : float
        ``energy_input`` converted to Eh with ``unit``.
    exact_hartree, hartree_fock_hartree : float or None
        Tabulated exact nonrelativistic energy and Hartree–Fock limit (Eh).
    difference_hartree : float or None
        ``E - E_exact`` (Eh), positive for a variational upper bound; ``error_hartree`` is its
        old name, kept as an alias in ``to_dict()`` and as an attribute.
    error_vs_hartree_fock_hartree : float or None
        ``E - E_HF`` (Eh), negative when some correlation energy is recovered.
    correlation_hartree : float or None
        The full correlation energy ``E_exact - E_HF`` (Eh).
    correlation_recovered_percent : float or None
        ``100 (E_HF - E)/(E_HF - E_exact)`` (%).
    agreeing_digits : int or None
        Leading significant digits shared with ``E_exact``.
    threshold_hartree : float
        ``-Z²/2`` (Eh), the one-electron ion plus a free electron.
    flags : tuple of Flag
        Verdicts with plain explanations (:data:`FLAG_CODES`).
    """

    #: old name -> current name (both in ``to_dict()``)
    ALIASES: ClassVar[dict[str, str]] = {"error_hartree": "difference_hartree"}
    SUMMARY: ClassVar[tuple[str, ...]] = ("ion", "state", "energy_hartree", "difference_hartree")

    Z: float
    ion: str
    state: str
    label: str
    energy_input: float
    unit: str
    energy_hartree: float
    exact_hartree: float | None
    hartree_fock_hartree: float | None
    difference_hartree: float | None
    error_vs_hartree_fock_hartree: float | None
    correlation_hartree: float | None
    correlation_recovered_percent: float | None
    agreeing_digits: int | None
    threshold_hartree: float
    flags: tuple = ()
    suggested_unit: str | None = None
    exact_source: str | None = None
    hartree_fock_source: str | None = None
    row: int | None = None
    energy_text: str = ""
    extra: dict = field(default_factory=dict)

    @property
    def error_hartree(self) -> float | None:
        """Old name of :attr:`difference_hartree` (``E - E_exact``, Eh)."""
        return self.difference_hartree

    @property
    def flag_codes(self) -> tuple[str, ...]:
        return tuple(f.code for f in self.flags)

    def to_dict(self) -> dict:
        """JSON-ready dictionary (one record of ``twoel check --json``)."""
        return self._with_aliases({
            "row": self.row, "label": self.label, "Z": self.Z, "ion": self.ion,
            "state": self.state, "energy": self.energy_input,
            "energy_text": self.energy_text, "unit": self.unit,
            "energy_hartree": self.energy_hartree, "exact_hartree": self.exact_hartree,
            "hartree_fock_hartree": self.hartree_fock_hartree,
            "difference_hartree": self.difference_hartree,
            "error_vs_hartree_fock_hartree": self.error_vs_hartree_fock_hartree,
            "correlation_hartree": self.correlation_hartree,
            "correlation_recovered_percent": self.correlation_recovered_percent,
            "agreeing_digits": self.agreeing_digits, "threshold_hartree": self.threshold_hartree,
            "flags": list(self.flag_codes),
            "flag_explanations": [f.explanation for f in self.flags],
            "suggested_unit": self.suggested_unit,
            "exact_source": self.exact_source, "hartree_fock_source": self.hartree_fock_source,
            "extra": dict(self.extra),
        })


def _printed_half_unit(text: str, unit: str) -> float:
    """Half a unit of the last printed decimal of ``text`` (in hartree); 0 if unknown."""
    match = re.fullmatch(r"\s*[+\-\u2212]?\d*\.(\d+)\s*", text or "")
    if not match:
        return 0.0
    return abs(to_hartree(0.5 * 10.0 ** (-len(match.group(1))), unit))


def _fits(value_hartree: float, reference: float) -> bool:
    if reference >= 0:
        return False
    ratio = value_hartree / reference
    return PLAUSIBLE_RATIO[0] <= ratio <= PLAUSIBLE_RATIO[1]


def _yardstick(ion: Ion, exact) -> tuple[float, str]:
    """The energy (Eh) the unit is judged against, and its name in messages."""
    if exact is not None:
        return exact.value, "the exact energy"
    return -(max(ion.Z - 5.0 / 16.0, 0.1 * ion.Z)) ** 2, "the screened estimate -(Z-5/16)²"


def _unit_verdict(energy: float, unit: str, e_h: float, ion: Ion, st: State, exact):
    """Whether ``unit`` makes the energy plausible; if not, a unit that does (or why none does).

    Returns ``(unit_ok, suggested_unit, flags)``.
    """
    yardstick, yard_name = _yardstick(ion, exact)
    if _fits(e_h, yardstick):
        return True, None, []
    fitting = [u for u in ENERGY_UNITS if u != unit and _fits(to_hartree(energy, u), yardstick)]
    if fitting:
        suggested = fitting[0]
        as_suggested = to_hartree(energy, suggested)
        return False, suggested, [Flag(
            "unit_probably_wrong",
            f"read as {UNIT_LABELS[unit]} the value is {e_h:.6g} Eh, far from "
            f"{yard_name} of {ion.label} ({yardstick:.6f} Eh); read as "
            f"{UNIT_LABELS[suggested]} it would be {as_suggested:.10g} Eh, so the "
            f"unit is probably {UNIT_LABELS[suggested]}, not {UNIT_LABELS[unit]}. "
            "The other checks below use the unit as given.")]
    hint = ""
    if energy > 0 and any(_fits(to_hartree(-energy, u), yardstick) for u in ENERGY_UNITS):
        hint = " A total energy of a bound atom is negative: was the minus sign lost?"
    return False, None, [Flag(
        "implausible",
        f"{energy:.6g} {UNIT_LABELS[unit]} = {e_h:.6g} Eh is not a plausible "
        f"total energy of {ion.label} {st.label} in any known unit "
        f"({yard_name} is {yardstick:.6f} Eh): check Z, the state, the unit, "
        f"and that this is a total (not an ionization or orbital) energy.{hint}")]


def _exact_verdict(e_h: float, exact, unit_ok: bool, rounding: float, ion: Ion, st: State):
    """``E - E_exact``, agreeing digits and the below-exact / no-reference flags.

    Returns ``(difference_hartree, digits, flags)``.
    """
    if exact is None:
        return None, None, [Flag(
            "no_reference",
            f"no exact nonrelativistic energy is tabulated for {ion.label} {st.label}"
            " (twoel ships Z = 1..10 ground states and some He excited states): "
            "only the unit and binding checks were done")]
    error = e_h - exact.value
    digits = agreeing_digits(e_h, exact.value)
    tolerance = max(exact.uncertainty or 0.0, 2e-15 * abs(exact.value))
    if not (unit_ok and error < -tolerance):
        return error, digits, []
    note = (f" The shortfall is within the rounding of the printed digits (±{rounding:.1e} Eh)."
            if -error <= rounding else "")
    return error, digits, [Flag(
        "below_exact",
        f"{-error:.3e} Eh below the exact nonrelativistic energy "
        f"{exact.value_text} Eh ({exact.source}). A variational calculation "
        "cannot go below it: the method is not variational (e.g. perturbation "
        "theory or coupled cluster), or the value includes relativistic, QED "
        "or finite-nuclear-mass effects, or Z, the state or the unit is wrong." + note)]


def _hartree_fock_verdict(e_h: float, hf, exact, unit_ok: bool, rounding: float, ion: Ion, st: State):
    """``E - E_HF``, the correlation energy and the percentage recovered, with their flags.

    Returns ``(error_vs_hartree_fock_hartree, correlation_hartree, percent, flags)``.
    """
    if hf is None:
        if st.label == "1^1S":
            text = (f"no Hartree-Fock limit is tabulated for {ion.label}: no correlation "
                    "percentage")
        else:
            text = (f"{st.label} is not the 1s² ground state: the Hartree-Fock limit and the "
                    "correlation percentage are given for ground states only")
        return None, None, None, [Flag("no_hartree_fock_limit", text)]
    error_hf = e_h - hf.value
    corr = percent = None
    if exact is not None:
        corr = exact.value - hf.value
        percent = 100.0 * (hf.value - e_h) / (hf.value - exact.value)
    tolerance = max(hf.uncertainty or 0.0, 2e-15 * abs(hf.value))
    if not (unit_ok and error_hf > tolerance):
        return error_hf, corr, percent, []
    note = (f" The excess is within the rounding of the printed digits (±{rounding:.1e} Eh)."
            if error_hf <= rounding else "")
    return error_hf, corr, percent, [Flag(
        "above_hartree_fock",
        f"{error_hf:.3e} Eh above the Hartree-Fock limit {hf.value_text} Eh "
        f"({hf.source}): worse than Hartree-Fock, so no correlation energy is "
        "recovered; check the basis set (too small?), the method, the state "
        "and Z." + note)]


def _binding_flags(e_h: float, unit_ok: bool, ion: Ion) -> list[Flag]:
    """The not-bound flag when the energy is not below ``-Z²/2``."""
    threshold = ion.threshold_hartree
    if not (unit_ok and e_h >= threshold):
        return []
    return [Flag("not_bound",
                 f"{e_h:.10g} Eh is not below {threshold:g} Eh (= -Z²/2, the one-electron "
                 f"ion plus a free electron): this calculation does not bind {ion.label}"
                 + (" (restricted Hartree-Fock gives E = -0.48793 Eh for H⁻, unbound; "
                    "correlation binds it: exact -0.52775 Eh)" if ion.Z == 1 else ""))]


def check_energy(Z, energy: float, unit: str = "hartree", state: str = "1^1S", label: str = "",
                 energy_text: str = "", row: int | None = None, extra: dict | None = None) -> CheckResult:
    """Judge one total energy of a two-electron ion (see the module docstring).

    Parameters
    ----------
    Z : float or str
        Nuclear charge or element symbol.
    energy : float
        The total energy as printed, in ``unit``.
    unit : str
        ``"hartree"``, ``"eV"``, ``"kcal/mol"``, ``"kJ/mol"``, ``"cm-1"``, ``"mhartree"`` ...
    state : str
        Term symbol (default ``1^1S``).
    label : str
        Free text naming the method and basis.
    energy_text : str
        The energy as written (used to tell rounding of the printed digits from real errors).
    row : int, optional
        The input row it came from.
    extra : dict, optional
        Other columns of that row, kept unchanged.

    Returns
    -------
    CheckResult
    """
    ion = Ion.parse(Z)
    st = State.parse(state)
    unit = read_unit(unit)
    if isinstance(energy, bool) or not isinstance(energy, (int, float)) or not math.isfinite(energy):
        raise InputError(f"'energy' must be a finite number, got {energy!r}")
    e_h = float(to_hartree(energy, unit))
    exact = None if ion.is_model else exact_reference(ion.Z, st.label)
    hf = None if (ion.is_model or st.label != "1^1S") else hartree_fock_reference(ion.Z)
    rounding = _printed_half_unit(energy_text, unit)

    unit_ok, suggested, unit_flags = _unit_verdict(energy, unit, e_h, ion, st, exact)
    # the value as given is judged unless another unit explains it (then the flags would pile up
    # on a misread number); an implausible value in every unit is still below exact or unbound
    judged = unit_ok or suggested is None
    error, digits, exact_flags = _exact_verdict(e_h, exact, judged, rounding, ion, st)
    error_hf, corr, percent, hf_flags = _hartree_fock_verdict(e_h, hf, exact, judged, rounding, ion, st)
    flags = unit_flags + exact_flags + hf_flags + _binding_flags(e_h, judged, ion)

    return CheckResult(
        Z=ion.Z, ion=ion.label, state=st.label, label=label, energy_input=float(energy),
        unit=unit, energy_hartree=e_h, exact_hartree=None if exact is None else exact.value,
        hartree_fock_hartree=None if hf is None else hf.value, difference_hartree=error,
        error_vs_hartree_fock_hartree=error_hf, correlation_hartree=corr,
        correlation_recovered_percent=percent, agreeing_digits=digits,
        threshold_hartree=ion.threshold_hartree, flags=tuple(flags), suggested_unit=suggested,
        exact_source=None if exact is None else exact.source,
        hartree_fock_source=None if hf is None else hf.source, row=row,
        energy_text=energy_text or repr(float(energy)), extra=dict(extra or {}))


def check_rows(rows) -> list[CheckResult]:
    """Check every :class:`~twoel.checking.rows.EnergyRow` (one result per row, in order)."""
    results = []
    for r in rows:
        if not isinstance(r, EnergyRow):
            raise InputError(f"check_rows expects EnergyRow objects, got {type(r).__name__}")
        results.append(check_energy(r.Z, r.energy, r.unit, r.state, r.label, r.energy_text,
                                    r.row, r.extra))
    return results


def results_frame(results):
    """A :class:`pandas.DataFrame` with one row per checked energy (flags joined by ``;``)."""
    import pandas as pd

    records = []
    for r in results:
        d = r.to_dict()
        records.append({
            "row": d["row"], "label": d["label"], "Z": d["Z"], "ion": d["ion"], "state": d["state"],
            "energy": d["energy_text"], "unit": UNIT_LABELS[d["unit"]],
            "energy_hartree": d["energy_hartree"], "error_hartree": d["error_hartree"],
            "error_vs_hartree_fock_hartree": d["error_vs_hartree_fock_hartree"],
            "correlation_recovered_percent": d["correlation_recovered_percent"],
            "agreeing_digits": d["agreeing_digits"], "flags": ";".join(d["flags"]),
        })
    return pd.DataFrame(records)


def convert_suggestion(result: CheckResult) -> float | None:
    """The energy re-read in the suggested unit (Eh), or ``None`` when no unit was suggested."""
    if result.suggested_unit is None:
        return None
    return float(convert_energy(result.energy_input, result.suggested_unit, "hartree"))
