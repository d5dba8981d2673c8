"""``twoel converge``: energies for a sequence of basis sizes, extrapolation and error bar."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import COMPACT_NOTE, add_charge_argument, add_full_argument, print_json

NAME = "converge"
HELP = "convergence of the energy with the basis size: differences, ratios, extrapolation, error bar"


def size_list(text: str) -> list[int]:
    """Parse ``"100,200,400"`` (no evaluation)."""
    parts = [p.strip() for p in text.split(",") if p.strip()]
    if len(parts) < 3 or not all(p.isdigit() for p in parts):
        raise argparse.ArgumentTypeError(f"expected at least three comma-separated sizes, got {text!r}")
    return [int(p) for p in parts]


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    add_charge_argument(p)
    p.add_argument("--state", default="1^1S", help="term symbol (default 1^1S)")
    p.add_argument("--family", default="exponential", help="trial-function family (default exponential)")
    group = p.add_mutually_exclusive_group()
    group.add_argument("--sizes", type=size_list, default=None,
                       help="comma-separated increasing basis sizes, e.g. 100,141,200,283,400")
    group.add_argument("--largest", type=int, default=400,
                       help="largest size; the others follow by factors of √2 (default 400)")
    p.add_argument("--count", type=int, default=5, help="number of sizes with --largest (default 5)")
    p.add_argument("--precision", choices=("float64", "extended"), default="float64",
                   help="arithmetic (see 'twoel energy --help')")
    p.add_argument("--digits", type=int, default=None, help="with --precision extended: digit target")
    p.add_argument("--json", action="store_true",
                   help="print one JSON object (compact; add --full for the full provenance)")
    add_full_argument(p)
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def table_text(study) -> str:
    lines = [f"{study.ion} {study.state}  family {study.family}, {study.precision}",
             f"{'N':>6}  {'E(N) / Eh':<34} {'E(N-1) - E(N)':>13}  {'ratio':>7}  {'time/s':>7}"]
    from twoel.solver.refine import truncate_text

    for n, t, u, d, q, s in zip(study.sizes, study.energy_texts, study.numerical_errors,
                                study.differences, study.ratios, study.seconds):
        t = truncate_text(t, u)  # digits below the arithmetic error are not shown
        dt = "" if d is None else f"{d:.3e}"
        qt = "" if q is None else f"{q:.3f}"
        lines.append(f"{n:>6}  {t:<34} {dt:>13}  {qt:>7}  {s:>7.2f}")
    bar = study.variational_error_bar_hartree
    last = truncate_text(study.energy_texts[-1], bar) if bar else repr(study.variational_hartree)
    lines.append(f"variational (upper bound) E = {last} Eh "
                 f"± {bar:.1e} (estimated truncation + arithmetic)")
    lines.append(f"extrapolated E = {study.extrapolated_hartree!r} Eh ± {study.extrapolated_error_bar_hartree:.1e}")
    lines.append(f"digits stood behind: {study.digits}")
    if study.note:
        lines.append(f"note: {study.note}")
    if not study.reliable:
        lines.append("warning: the sequence is not regular; the error bar may not be trustworthy")
    if study.reference_hartree is not None:
        lines.append(f"reference: {study.reference_text} Eh [{study.reference_source}]  "
                     f"true error of the last energy: {study.true_error_hartree():+.2e} Eh")
    return "\n".join(lines) + "\n"


#: entries of the provenance of the last basis kept in the compact record
LAST_SUMMARY = ("version", "family", "precision", "constants")


def study_record(study, full: bool = False) -> dict:
    """The JSON record of a convergence study: every row and result, and a short provenance
    (the method of the error bar and the version/family/precision of the last basis) unless
    ``full`` asks for all of it (the boxes and refinement of the last basis)."""
    record = study.to_dict()
    if full:
        return record
    provenance = dict(record.get("provenance") or {})
    last = provenance.get("last")
    if isinstance(last, dict):
        provenance["last"] = {key: last[key] for key in LAST_SUMMARY if key in last}
    record["provenance"] = provenance
    record["record"] = COMPACT_NOTE
    return record


def run(args: argparse.Namespace) -> int:
    from twoel.analysis.convergence import default_sizes, run_study
    from twoel.errors import InputError

    if args.sizes is None:
        if args.count < 3:
            raise InputError("'--count' must be at least 3")
        sizes = default_sizes(args.largest, args.count)
    else:
        sizes = args.sizes
    from twoel.cli.progress import counter

    with counter("basis sizes", enabled=not args.quiet and not args.json, unit="size") as progress:
        study = run_study(args.Z, args.state, sizes, family=args.family, precision=args.precision,
                          digits=args.digits, progress=progress)
    if args.json:
        print_json(study_record(study, full=args.full))
    else:
        sys.stdout.write(table_text(study))
    return 0
