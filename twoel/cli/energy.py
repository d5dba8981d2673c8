"""``twoel energy``: the variational energy of one state of one ion."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import (add_basis_arguments, add_charge_argument, add_full_argument, basis_keywords,
                              energy_line, energy_record, print_json)

NAME = "energy"
HELP = "variational energy and ionization energy of one state of one ion"


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    add_charge_argument(p)
    add_basis_arguments(p)
    p.add_argument("--precision", choices=("float64", "extended"), default="float64",
                   help="float64 (default; the exponential family adds a cheap mixed-precision "
                        "refinement) or extended (exponential family: arbitrary precision)")
    p.add_argument("--digits", type=int, default=None,
                   help="with --precision extended: significant digits aimed at (default 20)")
    p.add_argument("--json", action="store_true",
                   help="print one JSON object (compact; add --full for the basis and provenance)")
    add_full_argument(p)
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def summary_text(result) -> str:
    lines = [f"{result.ion} {result.state}  (Z = {result.Z:g}, family {result.family}"
             f"{'' if result.size is None else f', size {result.size}'}, {result.n_terms} functions, "
             f"{result.precision})"]
    if result.bound:
        lines.append(f"energy: {result.energy_hartree_text or format(result.energy_hartree, '.15g')} Eh"
                     + (f" ± {result.error_bar_hartree:.1e}" if result.error_bar_hartree else ""))
        lines.append(energy_line("ionization energy", result.ionization_energy_hartree))
    else:
        lines.append(f"not bound: {result.message}")
    lines.append(f"threshold (one-electron ion): {result.threshold_hartree!r} Eh")
    if result.reference is not None:
        ref = result.reference
        lines.append(f"reference: {ref.value_text} Eh  [{ref.source}; {ref.note}]")
        lines.append(f"difference: {result.difference_hartree:+.3e} Eh  "
                     f"({result.agreeing_digits} agreeing digits)")
    else:
        lines.append("reference: none tabulated")
    if result.parameters:
        lines.append("parameters: " + ", ".join(f"{k} = {v:.10g}" for k, v in result.parameters.items()))
    lines.append(f"virial ratio -V/T: {result.virial_ratio:.12f}   overlap condition number: "
                 f"{result.condition_number:.2e}   dropped directions: {result.n_dropped}")
    for text in result.notes:
        lines.append(f"note: {text}")
    for text in result.warnings:
        lines.append(f"warning: {text}")
    lines.append(f"time: {result.elapsed_seconds:.2f} s   twoel {result.provenance.get('version')}")
    return "\n".join(lines) + "\n"


def run(args: argparse.Namespace) -> int:
    from twoel import solve
    from twoel.cli.progress import optimizer_progress, stage_reporter

    with optimizer_progress(enabled=not args.quiet and not args.json) as progress:
        result = solve(args.Z, progress=progress, precision=args.precision, digits=args.digits,
                       on_stage=stage_reporter(enabled=not args.quiet), **basis_keywords(args))
    if args.json:
        print_json(energy_record(result, full=args.full))
    else:
        sys.stdout.write(summary_text(result))
    return 0
