"""``twoel series``: one state across an isoelectronic sequence, as a table."""

from __future__ import annotations

import argparse
import sys

from .common import add_basis_arguments, basis_keywords

NAME = "series"
HELP = "energies, references and ionization energies over a range of Z, as a table"


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    p.add_argument("--Z", required=True, help="charges: '1:10', '1:3:0.5', '1,2,5' or 'He,Li'")
    add_basis_arguments(p)
    p.add_argument("--format", choices=("markdown", "csv", "latex", "json"), default="markdown",
                   help="table format (default markdown)")
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def series_frame(charges, keywords: dict, progress: bool = False):
    """Solve for every charge and collect one row per ion (a :class:`pandas.DataFrame`)."""
    import pandas as pd

    from .. import solve
    from .progress import iterate

    rows = []
    for Z in iterate(charges, "ions", enabled=progress):
        r = solve(Z, **keywords)
        ref = r.reference
        rows.append({
            "Z": r.Z, "ion": r.ion, "state": r.state, "family": r.family, "n_terms": r.n_terms,
            "energy_hartree": r.energy_hartree, "bound": r.bound,
            "reference_hartree": None if ref is None else ref.value,
            "difference_hartree": r.difference_hartree, "agreeing_digits": r.agreeing_digits,
            "ionization_energy_hartree": r.ionization_energy_hartree,
            "ionization_energy_ev": r.ionization_energy("ev"),
            "ionization_energy_cm1": r.ionization_energy("cm-1"),
            "reference_source": None if ref is None else ref.source,
        })
    return pd.DataFrame(rows)


def run(args: argparse.Namespace) -> int:
    from ..report.tables import render
    from ..system import parse_charge_range

    charges = parse_charge_range(args.Z)
    frame = series_frame(charges, basis_keywords(args), progress=not args.quiet)
    caption = f"{args.state} energies (Eh), family {args.family}, size {args.size}"
    sys.stdout.write(render(frame, args.format, caption=caption))
    return 0
