"""Write ``data/nist_ionization_energies.csv`` from the NIST ASD data in ``mendeleev`` (developer tool).

**Not part of the runtime package API**: nothing in twoel imports :mod:`twoel.tools`; twoel reads
the shipped CSV at run time and needs no ``mendeleev``.  This module is run by a developer, once,
to re-make the table (``mendeleev`` installed)::

    python -m twoel.tools.make_nist_table --out data/nist_ionization_energies.csv

For Z = 2..10 it reads the ionization energy of the He-like ion (``ion_charge = Z - 2``, ground
level ``1s2 1S0`` -> ``1s 2S1/2``) from the ``ionizationenergies`` table of ``mendeleev`` (parsed
by its authors from the NIST ASD ionization-energy page, A. Kramida, Yu. Ralchenko, J. Reader and
NIST ASD Team, NIST Atomic Spectra Database, https://physics.nist.gov/asd), with its uncertainty,
the ASD bibliography code and the theoretical/measured flag.  The eV values are converted to cm⁻¹
with ``hc/e`` (exact in the SI since 2019, so the CODATA edition does not matter); the eV text is
kept in ``value_ev``.

ASD ionization energies are given for the most abundant isotope (common practice of the ASD;
the ``mendeleev`` record does not carry the isotope), so each row names that isotope
(:func:`twoel.corrections.masses.most_abundant_isotope`) and its nuclear mass in m_e.
"""

from __future__ import annotations

import argparse
import csv
import io

from scipy import constants as sc

#: ASD bibliography codes seen in the table, and what they are known to be (from memory)
CODE_NOTES = {
    "L17714": "value equals the measurement of D. Z. Kandula et al., Phys. Rev. A 84, 062512 (2011) "
              "(identification from memory)",
    "L10054": "theoretical; identified from memory as G. W. F. Drake, Can. J. Phys. 66, 586 (1988) "
              "(unverified)",
    "L21139": "theoretical; source not identified here (look the code up in the ASD bibliography)",
}

COLUMNS = ("key", "Z", "state", "J", "quantity", "value", "unit", "uncertainty", "method", "source",
           "note", "isotope", "nuclear_mass_me", "level", "ion_level", "value_ev", "uncertainty_ev",
           "asd_reference")


def _row(record, mendeleev_version: str) -> dict:
    from twoel.corrections.masses import most_abundant_isotope, nuclear_mass

    Z = int(record.atomic_number)
    ev_per_cm1 = sc.h * sc.c * 100.0 / sc.e
    A = most_abundant_isotope(Z)
    mass = nuclear_mass(Z, isotope=A)
    code = (record.references or "").strip()
    kind = "theoretical" if record.is_theoretical else (
        "semi-empirical" if record.is_semi_empirical else "measured (evaluated)")
    return {
        "key": "nist_asd", "Z": Z, "state": "1^1S", "J": 0, "quantity": "ionization_energy",
        "value": repr(record.ionization_energy / ev_per_cm1), "unit": "cm-1",
        "uncertainty": f"{record.uncertainty / ev_per_cm1:.2g}",
        "method": f"NIST ASD ionization energy ({kind})",
        "source": ("A. Kramida, Yu. Ralchenko, J. Reader and NIST ASD Team, NIST Atomic Spectra "
                   f"Database, ionization energies (via mendeleev {mendeleev_version}); ASD reference {code}"),
        "note": f"{record.species_name}; isotope {A} (ASD gives the most abundant one, common practice); "
                f"{CODE_NOTES.get(code, 'source not identified here')}",
        "isotope": A, "nuclear_mass_me": f"{mass.nuclear_mass_me:.7f}",
        "level": f"{record.ground_configuration} {record.ground_level}",
        "ion_level": (record.ionized_level or "").replace("<", "").replace(">", ""),
        "value_ev": repr(float(record.ionization_energy)), "uncertainty_ev": repr(float(record.uncertainty)),
        "asd_reference": code,
    }


def table_text() -> str:
    """The CSV text for Z = 2..10 (needs ``mendeleev``)."""
    import mendeleev
    from mendeleev.db import get_session
    from mendeleev.models import IonizationEnergy

    session = get_session()
    out = io.StringIO()
    writer = csv.DictWriter(out, fieldnames=COLUMNS, lineterminator="\n")
    writer.writeheader()
    for Z in range(2, 11):
        record = session.query(IonizationEnergy).filter_by(atomic_number=Z, ion_charge=Z - 2).one()
        if record.ground_level != "1S0" or record.isoelectonic_sequence != "He":
            raise ValueError(f"Z={Z}: unexpected record {record.species_name} {record.ground_level}")
        writer.writerow(_row(record, mendeleev.__version__))
    return out.getvalue()


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description="write the NIST ASD He-like ionization-energy table")
    parser.add_argument("--out", default=None, help="CSV file to write (default: print)")
    args = parser.parse_args(argv)
    text = table_text()
    if args.out is None:
        print(text, end="")
    else:
        from twoel.io import atomic_write_text

        atomic_write_text(args.out, text)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
