r"""Correlation energies ``E_corr = E_exact − E_HF`` of the 1s² ground states (pure core).

Löwdin's definition (Adv. Chem. Phys. 2, 207 (1959)): the correlation energy is the exact
nonrelativistic (infinite nuclear mass) energy minus the Hartree–Fock limit.  Both come from the
shipped tables: the exact energies from ``data/reference_energies.csv`` and the HF limits from
``data/hartree_fock_limits.csv`` (published values where known, otherwise values computed and
converged by :mod:`twoel.scf.hartree_fock`, marked so in their ``note``).  For He the two published
limits give ``−2.903724377034 − (−2.861679995612) = −0.042044381422`` Eh.

Laboratory units come from :mod:`twoel.units` (CODATA via scipy).
"""

from __future__ import annotations

from dataclasses import dataclass

from twoel.errors import UnsupportedError
from twoel.reference import NONREL_ENERGY, ReferenceValue, lookup
from twoel.results import Result
from twoel.system import Ion
from twoel.units import hartree_to

#: quantity name of HF limits in the data tables (same as :data:`twoel.scf.hartree_fock.HF_LIMIT`)
HF_LIMIT = "hartree_fock_limit"

#: units in which correlation energies are reported (canonical names of :mod:`twoel.units`)
CORRELATION_UNITS = ("hartree", "mhartree", "kcal/mol", "kj/mol", "cm-1", "ev")


@dataclass(frozen=True, repr=False)
class CorrelationEnergy(Result):
    """``E_corr = E_exact − E_HF`` of one ion (Eh), with both inputs and their sources.

    ``exact`` and ``hartree_fock`` are the tabulated values (Eh) with their sources;
    :meth:`to_dict` gives the correlation energy in every unit of :data:`CORRELATION_UNITS`
    (``correlation_hartree``, ``correlation_mhartree``, ``correlation_kcal_mol``,
    ``correlation_kj_mol``, ``correlation_cm1``, ``correlation_ev``).
    """

    SUMMARY = ("ion", "correlation_hartree")

    Z: float
    ion: str
    exact: ReferenceValue
    hartree_fock: ReferenceValue

    @property
    def exact_hartree(self) -> float:
        return self.exact.value

    @property
    def hartree_fock_hartree(self) -> float:
        return self.hartree_fock.value

    @property
    def correlation_hartree(self) -> float:
        """``E_exact − E_HF`` in Eh (negative)."""
        return self.exact.value - self.hartree_fock.value

    def correlation(self, unit: str = "hartree") -> float:
        """The correlation energy in ``unit`` (``"mhartree"``, ``"kcal/mol"``, ``"cm-1"`` ...)."""
        return hartree_to(self.correlation_hartree, unit)

    def in_units(self) -> dict[str, float]:
        return {u: self.correlation(u) for u in CORRELATION_UNITS}

    def to_dict(self) -> dict:
        values = self.in_units()
        return self._with_aliases({
            "Z": self.Z, "ion": self.ion, "state": "1^1S",
            "exact_hartree": self.exact_hartree, "hartree_fock_hartree": self.hartree_fock_hartree,
            "correlation_hartree": values["hartree"], "correlation_mhartree": values["mhartree"],
            "correlation_kcal_mol": values["kcal/mol"], "correlation_kj_mol": values["kj/mol"],
            "correlation_cm1": values["cm-1"], "correlation_ev": values["ev"],
            "exact_source": self.exact.source, "exact_note": self.exact.note,
            "hartree_fock_source": self.hartree_fock.source,
            "hartree_fock_note": self.hartree_fock.note,
        })


def hartree_fock_reference(Z) -> ReferenceValue | None:
    """The tabulated HF limit of the 1s² ground state of ``Z``, or ``None``."""
    ion = Ion.parse(Z)
    return lookup(ion.Z, "1^1S", HF_LIMIT)


def exact_reference(Z, state: str = "1^1S") -> ReferenceValue | None:
    """The tabulated exact nonrelativistic energy of ``(Z, state)``, or ``None``."""
    ion = Ion.parse(Z)
    return lookup(ion.Z, state, NONREL_ENERGY)


def correlation_energy(Z) -> CorrelationEnergy:
    """Correlation energy of the 1s² ground state of ``Z`` from the shipped tables.

    Raises
    ------
    UnsupportedError
        If the exact energy or the HF limit of this ``Z`` is not tabulated (Z = 1..10 are).
    """
    ion = Ion.parse(Z)
    if ion.is_model:
        raise UnsupportedError(f"no tabulated energies for the model charge Z = {ion.Z:g}; "
                               "correlation energies are tabulated for Z = 1..10")
    exact = exact_reference(ion.Z)
    hf = hartree_fock_reference(ion.Z)
    if exact is None or hf is None:
        missing = "exact energy" if exact is None else "Hartree-Fock limit"
        raise UnsupportedError(f"no tabulated {missing} for Z = {ion.Z:g} ({ion.label}); "
                               "correlation energies are tabulated for Z = 1..10")
    return CorrelationEnergy(ion.Z, ion.label, exact, hf)


def correlation_table(charges=range(1, 11)):
    """Correlation energies of several ions as a :class:`pandas.DataFrame` (one row per Z)."""
    import pandas as pd

    rows = []
    for Z in charges:
        rows.append(correlation_energy(Z).to_dict())
    return pd.DataFrame(rows)
