"""``twoel series``: one state across an isoelectronic sequence, as a table."""

from __future__ import annotations

import argparse
import contextlib
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
    p.add_argument("--format", choices=("markdown", "csv", "latex", "json"), default=None,
                   help="table format (default markdown)")
    p.add_argument("--json", action="store_true", help="same as --format json (no progress lines)")
    p.add_argument("--columns", default=None,
                   help="comma-separated columns to show, or 'all' (default: a compact set for "
                        "markdown/latex, every column for csv/json)")
    p.add_argument("--jobs", type=positive_int, default=1,
                   help="worker processes for the sweep (default 1 = serial; 0 = one per core)")
    p.add_argument("--quiet", action="store_true",
                   help="no progress on stderr (also off with --json / --format json)")
    p.set_defaults(run=run)


@contextlib.contextmanager
def row_counter(enabled: bool = True):
    """Yield a ``progress(done, total)`` callback for the rows of a series, or ``None``.

    On an interactive stderr it moves a bar (:func:`twoel.cli.progress.counter`); otherwise it
    writes one line ``series: row DONE/TOTAL`` per finished row, so a long run sent to a file or
    a pipe still shows how far it got.
    """
    from twoel.cli.progress import counter

    if not enabled or sys.stderr.isatty():
        with counter("ions", enabled=enabled, unit="ion") as update:
            yield update
        return

    def update(done: int | None = None, total: int | None = None) -> None:
        sys.stderr.write(f"series: row {done}/{total}\n" if total else f"series: row {done}\n")
        sys.stderr.flush()

    yield update


def series_frame(charges, keywords: dict, progress: bool = False, jobs: int | None = 1):
    """Solve for every charge and collect one row per ion (see :func:`twoel.analysis.sweep.series_frame`).

    ``progress`` reports each finished row on stderr (:func:`row_counter`).
    """
    from twoel.analysis.sweep import series_frame as build
    from twoel.analysis.sweep import series_tasks, solve_many
    from twoel.report.build import with_reliability

    with row_counter(enabled=progress) as update:
        results = solve_many(series_tasks(charges, keywords), jobs=jobs, progress=update,
                             description="ions")
    return with_reliability(build(charges, keywords, results=results), results)


def run(args: argparse.Namespace) -> int:
    from twoel.report.tables import render, select_columns
    from twoel.system import parse_charge_range

    if args.json and args.format not in (None, "json"):
        from twoel.errors import InputError

        raise InputError(f"--json and --format {args.format} conflict: --json means --format json; "
                         f"give one of them")
    if args.json or args.format is None:
        args.format = "json" if args.json else "markdown"
    charges = parse_charge_range(args.Z)
    keywords = basis_keywords(args)
    frame = series_frame(charges, keywords, progress=not (args.quiet or args.format == "json"),
                         jobs=args.jobs)
    if args.columns is not None:
        columns = select_columns(frame, args.columns)
    elif args.format in ("markdown", "latex"):
        columns = [c for c in DEFAULT_COLUMNS if c in frame.columns]
    else:
        columns = None
    caption = f"{args.state} energies (Eh), family {resolved_family(args)}, size {args.size}"
    sys.stdout.write(render(frame, args.format, caption=caption, columns=columns))
    return 0
