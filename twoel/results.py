"""Frozen result objects with their provenance, on one shared base.

:class:`Result` is the base of every result dataclass in twoel.  It gives each result the same
four things: ``to_dict()`` (JSON-ready, every field with its unit in its name), ``to_frame()``
(a one-row :class:`pandas.DataFrame` of the scalar fields), ``provenance`` (how the number was
made) and a short readable ``repr``.  One meaning per field name holds across all results:

``energy_hartree``       a variational energy (Eh)
``difference_hartree``   ``E - E_reference`` (Eh), computed against a published reference
``step_hartree``         ``E(N_{k-1}) - E(N_k)`` between consecutive nested bases (Eh)
``error_bar_hartree``    the uncertainty that twoel states for ``energy_hartree`` (Eh)
``*_cm1``, ``*_ev``, ``*_mhz``, ``*_nm``   the same quantity in that laboratory unit

A result that renames a misleading field keeps the old name as an alias in ``ALIASES`` (old name
-> new name): both appear in ``to_dict()``, and the old name still works as an attribute.

:class:`EnergyResult` is what :func:`twoel.solve` returns: the energy (Eh), whether the state is
bound, the ionization energy, diagnostics of the basis and the optimizer, the published
reference with the difference, and everything needed to reproduce the number
(:attr:`EnergyResult.provenance`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, fields
from typing import Any, ClassVar

import numpy as np

from twoel.reference import ReferenceValue
from twoel.units import ENERGY_UNITS, hartree_to


def _plain(value):
    """A JSON-ready copy of ``value`` (results, dataclasses with ``to_dict``, arrays, tuples)."""
    if hasattr(value, "to_dict") and callable(value.to_dict):
        return value.to_dict()
    if isinstance(value, np.ndarray):
        return value.tolist()
    if isinstance(value, np.generic):
        return value.item()
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    return value


class Result:
    """Shared base of the result dataclasses (``to_dict``, ``to_frame``, ``provenance``, repr).

    A subclass is a frozen dataclass.  By default ``to_dict()`` holds every field that takes part
    in comparison (fields declared with ``compare=False``, such as a wavefunction, are left out),
    plus the aliases of :attr:`ALIASES`; a subclass with a documented JSON layout overrides
    :meth:`to_dict` and calls :meth:`_with_aliases`.  :attr:`SUMMARY` names the fields that the
    ``repr`` shows.
    """

    #: old field name -> current field name; both appear in ``to_dict()``
    ALIASES: ClassVar[dict[str, str]] = {}
    #: fields shown by ``repr`` (default: the first three)
    SUMMARY: ClassVar[tuple[str, ...]] = ()
    #: properties (e.g. totals) added to ``to_dict()`` after the fields
    DERIVED: ClassVar[tuple[str, ...]] = ()

    def to_dict(self) -> dict:
        """JSON-ready dictionary of the result."""
        out = {f.name: _plain(getattr(self, f.name)) for f in fields(self) if f.compare}
        out.update({name: _plain(getattr(self, name)) for name in self.DERIVED})
        return self._with_aliases(out)

    def __getattr__(self, name):
        """Old field names of :attr:`ALIASES` keep working as attributes."""
        target = type(self).ALIASES.get(name)
        if target is None:
            raise AttributeError(f"{type(self).__name__!r} object has no attribute {name!r}")
        return getattr(self, target)

    def _with_aliases(self, out: dict) -> dict:
        for old, new in self.ALIASES.items():
            if new in out and old not in out:
                out[old] = out[new]
        return out

    def to_frame(self):
        """One-row :class:`pandas.DataFrame` of the scalar entries of :meth:`to_dict`."""
        import pandas as pd

        record = {k: v for k, v in self.to_dict().items() if not isinstance(v, (dict, list))}
        return pd.DataFrame([record])

    @property
    def provenance_record(self) -> dict:
        """How the result was made (method, basis, parameters, precision, constants, versions)."""
        value = getattr(self, "provenance", None)
        return dict(value) if isinstance(value, dict) else {}

    def __repr__(self) -> str:
        names = self.SUMMARY or tuple(f.name for f in fields(self))[:3]
        parts = []
        for name in names:
            value = getattr(self, name)
            parts.append(f"{name}={value:.12g}" if isinstance(value, float) else f"{name}={value!r}")
        return f"{type(self).__name__}({', '.join(parts)})"


def agreeing_digits(value: float, reference: float) -> int:
    """Number of leading significant digits in which ``value`` agrees with ``reference``.

    Defined as ``floor(-log10(|value - reference| / |reference|))`` (0 if worse than 100 %),
    capped at 16 for float64 values that agree to the last bit.
    """
    if reference == 0:
        return 0
    diff = abs(value - reference)
    if diff == 0:
        return 16
    return max(0, int(math.floor(-math.log10(diff / abs(reference)))))



def text_difference(minuend: str, subtrahend: str) -> float:
    """``minuend - subtrahend`` of two decimal texts (Eh), taken at 60 digits so that no digit
    is lost to float64 cancellation."""
    from decimal import Decimal, localcontext

    with localcontext() as context:
        context.prec = 60
        return float(Decimal(minuend) - Decimal(subtrahend))

@dataclass(frozen=True)
class Wavefunction:
    """A basis and the linear coefficients of one root (normalized, ``c^T S c = 1``).

    ``refined_coefficients`` and ``refined_energy_hartree`` (Eh) hold the eigenvector and energy
    of the refinement beyond float64 (mixed or extended precision) when the solve made one; the
    coefficients are in the primitive basis, not normalized (their scale is arbitrary).
    """

    basis: Any
    coefficients: np.ndarray
    refined_coefficients: np.ndarray | None = None
    refined_energy_hartree: float | None = None


@dataclass(frozen=True, repr=False)
class EnergyResult(Result):
    """Energy of one state of a two-electron ion, with diagnostics and provenance.

    All energies are in hartree (Eh).  ``energy_hartree`` is the variational (upper-bound)
    energy of the requested root; if it is not below ``threshold_hartree`` (= -Z²/2) the state
    is *not bound* in this basis and ``ionization_energy_hartree`` is ``None``.
    """

    Z: float
    ion: str
    state: str
    family: str
    size: int | None
    n_terms: int
    energy_hartree: float
    bound: bool
    threshold_hartree: float
    parameters: dict
    roots_hartree: tuple
    kinetic_hartree: float
    potential_hartree: float
    virial_ratio: float
    condition_number: float
    n_dropped: int
    precision: str
    status: str
    message: str
    reference: ReferenceValue | None = None
    optimizer: dict | None = None
    warnings: tuple = ()
    notes: tuple = ()
    energy_hartree_text: str | None = None
    error_bar_hartree: float | None = None
    elapsed_seconds: float = 0.0
    provenance: dict = field(default_factory=dict)
    wavefunction: Wavefunction | None = field(default=None, compare=False, repr=False)
    reliable: bool | None = None

    @property
    def ionization_energy_hartree(self) -> float | None:
        """``I = E(one-electron ion) - E = -Z²/2 - E`` (Eh), ``None`` if not bound."""
        if not self.bound:
            return None
        return self.threshold_hartree - self.energy_hartree

    def ionization_energy(self, unit: str = "hartree") -> float | None:
        """Ionization energy in ``unit`` (``"eV"``, ``"cm-1"``, ``"kJ/mol"``, ``"MHz"`` ...)."""
        value = self.ionization_energy_hartree
        return None if value is None else hartree_to(value, unit)

    @property
    def reference_energy_hartree(self) -> float | None:
        return None if self.reference is None else self.reference.value

    @property
    def difference_hartree(self) -> float | None:
        """``E - E_reference`` (Eh); positive for a variational upper bound.  Taken from the
        decimal texts (the full refined value and the published digits), so it is not lost to
        float64 rounding for large ``|E|``."""
        if self.reference is None:
            return None
        return text_difference(self.energy_full_text, self.reference.value_text)

    @property
    def energy_full_text(self) -> str:
        """Every computed digit of the energy (Eh): the refined value's text where there is one,
        else the float64 value; :attr:`energy_hartree_text` is cut to the error bar."""
        full = self.provenance.get("energy_full_text") if isinstance(self.provenance, dict) else None
        return full or repr(self.energy_hartree)

    @property
    def ionization_energy_error_bar_hartree(self) -> float | None:
        """Uncertainty of :attr:`ionization_energy_hartree` (Eh): the energy's error bar (the
        nonrelativistic one-electron threshold ``-Z²/2`` is exact)."""
        return self.error_bar_hartree if self.bound else None

    @property
    def agreeing_digits(self) -> int | None:
        """Significant digits agreeing with the reference, from the full decimal texts (not
        capped by float64: ``floor(-log10(|E - E_ref| / |E_ref|))``)."""
        if self.reference is None:
            return None
        diff = abs(text_difference(self.energy_full_text, self.reference.value_text))
        if diff == 0:
            return agreeing_digits(self.energy_hartree, self.reference.value)
        return max(0, int(math.floor(-math.log10(diff / abs(self.reference.value)))))

    def to_dict(self) -> dict:
        """JSON-ready dictionary (the ``twoel energy --json`` record)."""
        ie = self.ionization_energy_hartree
        return {
            "Z": self.Z,
            "ion": self.ion,
            "state": self.state,
            "family": self.family,
            "size": self.size,
            "n_terms": self.n_terms,
            "energy_hartree": self.energy_hartree,
            "energy_hartree_text": self.energy_hartree_text,
            "error_bar_hartree": self.error_bar_hartree,
            "reliable": self.reliable,
            "bound": self.bound,
            "status": self.status,
            "message": self.message,
            "threshold_hartree": self.threshold_hartree,
            "ionization_energy_hartree": ie,
            "ionization_energy_ev": None if ie is None else hartree_to(ie, "ev"),
            "ionization_energy_cm1": None if ie is None else hartree_to(ie, "cm-1"),
            "ionization_energy_kj_mol": None if ie is None else hartree_to(ie, "kj/mol"),
            "ionization_energy_mhz": None if ie is None else hartree_to(ie, "mhz"),
            "ionization_energy_error_bar_hartree": self.ionization_energy_error_bar_hartree,
            "reference_energy_hartree": self.reference_energy_hartree,
            "reference_energy_text": None if self.reference is None else self.reference.value_text,
            "reference_source": None if self.reference is None else self.reference.source,
            "reference_note": None if self.reference is None else self.reference.note,
            "difference_hartree": self.difference_hartree,
            "agreeing_digits": self.agreeing_digits,
            "parameters": dict(self.parameters),
            "roots_hartree": list(self.roots_hartree),
            "kinetic_hartree": self.kinetic_hartree,
            "potential_hartree": self.potential_hartree,
            "virial_ratio": self.virial_ratio,
            "condition_number": self.condition_number,
            "n_dropped": self.n_dropped,
            "precision": self.precision,
            "optimizer": self.optimizer,
            "warnings": list(self.warnings),
            "notes": list(self.notes),
            "elapsed_seconds": self.elapsed_seconds,
            "provenance": self.provenance,
        }

    def ionization_energies(self) -> dict[str, float] | None:
        """The ionization energy in every known unit, or ``None`` if not bound."""
        ie = self.ionization_energy_hartree
        return None if ie is None else {u: hartree_to(ie, u) for u in ENERGY_UNITS}

    def __repr__(self) -> str:
        status = f"E={self.energy_hartree:.12f} Eh" if self.bound else "not bound"
        return (f"EnergyResult({self.ion} {self.state}, {self.family}"
                f"{'' if self.size is None else f' size={self.size}'}, N={self.n_terms}, {status})")
