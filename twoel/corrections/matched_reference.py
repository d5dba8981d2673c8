r"""References matched to what was computed: isotope, state, J and quantity.

Sources: ``data/measured_ionization_energies.csv`` (measured values; the isotope is the mass
number and symbol that opens the ``note``, e.g. ``4He``) and
``data/nist_ionization_energies.csv`` (NIST ASD ground-state ionization energies of He-like
ions Z = 2..10 with their isotope and nuclear mass; made by
:mod:`twoel.tools.make_nist_table`).  Both are ionization energies of the S state with
``J = S`` to the 1s ²S₁/₂ ion ground level, which is what :func:`.compute_spectrum` computes.

A reference for another nucleus (isotope or explicit mass) is converted with the model

.. math:: I' = \frac{μ'}{μ} I - \big(\frac{μ'^2}{M'} - \frac{μ^2}{M}\big)⟨\mathbf p_1·\mathbf p_2⟩\ \mathrm{E_h}

(reduced-mass scaling of the whole energy plus the change of the first-order mass
polarization, with ``⟨p1·p2⟩`` of this calculation), with the uncertainty
``3 |μ'/μ - 1| |I_α| + |E_mp2|``: the mass dependence of the α-order terms ``I_α`` beyond the
scaling (relativistic ∝ μ, QED ∝ μ³) and the second-order mass polarization ``E_mp2``.
A reference whose isotope is not known is not compared.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass
from functools import lru_cache

from twoel.reference import read_data_text
from twoel.units import convert_energy

NIST_TABLE = "nist_ionization_energies.csv"
NIST_SOURCE = "NIST Atomic Spectra Database ionization energy (Kramida et al.), data/" + NIST_TABLE
CONVERSION_MODEL = ("I' = (mu'/mu) I - (mu'^2/M' - mu^2/M) <p1.p2>: reduced-mass scaling plus the "
                    "first-order mass-polarization change, <p1.p2> of this calculation")


@dataclass(frozen=True)
class MatchedReference:
    """A reference ionization energy for the computed nucleus and state (cm⁻¹).

    ``value_cm1`` is ``None`` when not compared (``reason`` says why); ``raw_value_cm1`` and
    ``isotope`` are the tabulated value and its nucleus; ``conversion`` describes the isotope
    conversion (``None`` when the nucleus is the same).
    """

    value_cm1: float | None
    uncertainty_cm1: float | None
    raw_value_cm1: float
    source: str
    key: str
    table: str
    isotope: str
    state: str
    J: int
    quantity: str
    conversion: dict | None
    reason: str | None = None

    def to_dict(self) -> dict:
        return {"value_cm1": self.value_cm1, "uncertainty_cm1": self.uncertainty_cm1,
                "raw_value_cm1": self.raw_value_cm1, "source": self.source, "key": self.key,
                "table": self.table, "isotope": self.isotope, "state": self.state, "J": self.J,
                "quantity": self.quantity, "ion_level": "1s 2S1/2", "compared": self.value_cm1 is not None,
                "conversion": self.conversion, "reason": self.reason}


@lru_cache(maxsize=None)
def nist_rows() -> tuple[dict, ...]:
    """Rows of the shipped NIST ASD table (strings, as in the CSV)."""
    return tuple(csv.DictReader(io.StringIO(read_data_text(NIST_TABLE))))


def nist_row(Z: float) -> dict | None:
    """The NIST ASD row of the He-like ion of charge ``Z`` (or ``None``)."""
    for row in nist_rows():
        if float(row["Z"]) == float(Z):
            return row
    return None


def note_isotope(note: str) -> int | None:
    """Mass number that opens a measured row's note (``"4He 2^3S_1; ..."`` -> 4), else ``None``."""
    found = re.match(r"\s*(\d+)[A-Z][a-z]?\b", note or "")
    return int(found.group(1)) if found else None


def _same_nucleus(mass, ref_mass_me: float, ref_A: int | None) -> bool:
    if mass.mass_number is not None and ref_A is not None:
        return mass.mass_number == ref_A
    return abs(mass.nuclear_mass_me / ref_mass_me - 1.0) < 1e-9


def converted(value_cm1: float, ref_mass_me: float, mass, p1_dot_p2: float, alpha_terms_cm1: float,
              second_order_hartree: float) -> tuple[float, float, float]:
    """``(value', shift, uncertainty)`` in cm⁻¹ of the module's isotope-conversion model."""
    M, Mp = ref_mass_me, mass.nuclear_mass_me
    mu, mup = M / (M + 1.0), Mp / (Mp + 1.0)
    mp_change = -(mup * mup / Mp - mu * mu / M) * p1_dot_p2
    value = (mup / mu) * value_cm1 + convert_energy(mp_change, "hartree", "cm-1")
    uncertainty = 3 * abs(mup / mu - 1.0) * abs(alpha_terms_cm1) + abs(
        convert_energy(second_order_hartree, "hartree", "cm-1"))
    return value, value - value_cm1, uncertainty


def match(raw_cm1: float, raw_unc_cm1: float | None, ref_A: int | None, ref_mass_me: float | None,
          mass, pieces: dict, **record) -> MatchedReference:
    """Match one tabulated value to the computed nucleus ``mass`` (a NuclearMass).

    ``pieces``: ``p1_dot_p2`` (bohr⁻²), ``alpha_terms_cm1`` and ``second_order_hartree`` of the
    calculation, for the conversion.  ``record``: source, key, table, symbol, state, J, quantity.
    """
    symbol = record.pop("symbol")
    label = f"{ref_A}{symbol}" if ref_A is not None else "unknown isotope"
    here = f"{mass.mass_number}{symbol}" if mass.mass_number else f"M = {mass.nuclear_mass_me:.4f} m_e"
    base = dict(raw_value_cm1=raw_cm1, isotope=label, **record)
    if ref_mass_me is None:
        return MatchedReference(None, None, conversion=None, reason=(
            f"the reference's isotope is not stated; not compared with {here}"), **base)
    if _same_nucleus(mass, ref_mass_me, ref_A):
        return MatchedReference(raw_cm1, raw_unc_cm1, conversion=None, **base)
    value, shift, u = converted(raw_cm1, ref_mass_me, mass, **pieces)
    conversion = {"from_isotope": label, "to": here, "model": CONVERSION_MODEL, "shift_cm1": shift,
                  "uncertainty_cm1": u, "reference_nuclear_mass_me": ref_mass_me}
    total_u = None if raw_unc_cm1 is None else (raw_unc_cm1**2 + u * u) ** 0.5
    return MatchedReference(value, total_u, conversion=conversion,
                            reason=f"no {here} reference tabulated; the {label} value is converted", **base)

