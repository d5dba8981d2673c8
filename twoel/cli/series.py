"""``twoel series``: one state across an isoelectronic sequence, as a table."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import add_basis_arguments, basis_keywords, positive_int, resolved_family

NAME = "series"
HELP = "energies, references and ionization energies over a range of Z, as a table"

#: columns shown by default in the human formats (CSV and JSON carry every column)
DEFAULT_COLUMNS = ("Z", "ion", "state", "n_terms", "energy_hartree", "reference_hartree",
                   "reference_uncertainty_hartree", "reference_key", "difference_hartree",
                   "ionization_energy_ev", "ionization_energy_cm1")


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    p.add_argument("--Z", required=True, help="charges: '1:10', '1:3:0.5', '1,2,5' or 'He,Li'")
    add_basis_arguments(p)
    p.add_argument("--format", choices=("markdown", "csv", "latex", "json"), default="markdown",
                   help="table format (default markdown)")
    p.add_argument("--columns", default=None,
                   help="comma-separated columns to show, or 'all' (default: a compact set for "
                        "markdown/latex, every column for csv/json)")
    p.add_argument("--jobs", type=positive_int, default=1,
                   help="worker processes for the sweep (default 1 = serial; 0 = one per core)")
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def series_frame(charges, keywords: dict, progress: bool = False, jobs: int | None = 1):
    """Solve for every charge and collect one row per ion (see :func:`twoel.analysis.sweep.series_frame`).

    ``progress`` shows a bar on an interactive stderr.
    """
    from twoel.analysis.sweep import series_frame as build
    from twoel.cli.progress import counter

    with counter("ions", enabled=progress, unit="ion") as update:
        return build(charges, keywords, progress=update, jobs=jobs)


def run(args: argparse.Namespace) -> int:
    from twoel.report.tables import render, select_columns
    from twoel.system import parse_charge_range

    charges = parse_charge_range(args.Z)
    keywords = basis_keywords(args)
    frame = series_frame(charges, keywords, progress=not args.quiet, jobs=args.jobs)
    if args.columns is not None:
        columns = select_columns(frame, args.columns)
    elif args.format in ("markdown", "latex"):
        columns = [c for c in DEFAULT_COLUMNS if c in frame.columns]
    else:
        columns = None
    caption = f"{args.state} energies (Eh), family {resolved_family(args)}, size {args.size}"
    sys.stdout.write(render(frame, args.format, caption=caption, columns=columns))
    return 0
