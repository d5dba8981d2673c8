"""``twoel energy``: the variational energy of one state of one ion."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import (add_basis_arguments, add_charge_argument, add_full_argument, basis_keywords,
                              energy_line, energy_record, print_json)

NAME = "energy"
HELP = "variational energy and ionization energy of one state of one ion"


#: exit code of ``energy`` when the computed root is not below the one-electron threshold
NOT_BOUND_EXIT_CODE = 4


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
                     + (f" ± {result.error_bar_hartree:.1e}" if result.error_bar_hartree else "")
                     + ("  (reliable: false)" if result.reliable is False else ""))
        lines.append(_ionization_line(result))
    else:
        lines.append(f"not bound: {result.message}")
    lines.append(f"threshold (one-electron ion): {result.threshold_hartree:.15g} Eh")
    if result.reference is not None:
        ref = result.reference
        lines.append(f"reference: {ref.value_text} Eh  [{ref.source}; {ref.note}]")
        lines.append(f"difference: {result.difference_hartree:+.3e} Eh  "
                     f"({result.agreeing_digits} agreeing digits)")
    else:
        lines.append("reference: none tabulated")
    if result.parameters:
        lines.append("parameters: " + ", ".join(f"{k} = {v:.10g}" for k, v in result.parameters.items()))
    lines.append(_diagnostics_line(result))
    for text in result.notes:
        lines.append(f"note: {text}")
    for text in result.warnings:
        lines.append(f"warning: {text}")
    lines.append(f"time: {result.elapsed_seconds:.2f} s   twoel {result.provenance.get('version')}")
    return "\n".join(lines) + "\n"


def _ionization_line(result) -> str:
    """The ionization energy in every unit, with its uncertainty when the energy has a bar (only
    the digits the bar supports); without a bar, as computed."""
    bar = result.error_bar_hartree
    if not bar:
        return energy_line("ionization energy", result.ionization_energy_hartree)
    from decimal import Decimal, localcontext

    from twoel.report.numbers import format_uncertain
    from twoel.units import UNIT_LABELS, hartree_to

    full = result.energy_full_text
    with localcontext() as context:
        context.prec = 40
        ie = Decimal(repr(result.threshold_hartree)) - Decimal(full)
        parts = []
        for unit in ("hartree", "ev", "cm-1", "kj/mol", "mhz"):
            factor = Decimal(repr(hartree_to(1.0, unit)))
            parts.append(f"{format_uncertain(ie * factor, Decimal(repr(bar)) * factor)} {UNIT_LABELS[unit]}")
    return "ionization energy: " + " = ".join(parts)


def _diagnostics_line(result) -> str:
    """Virial ratio, conditioning and dropped directions, saying which solve they describe."""
    condition = (f"{result.condition_number:.2e}" if result.condition_number == result.condition_number
                 and result.condition_number != float("inf") else "not finite (near-dependent basis)")
    if "refinement" in result.provenance:
        return (f"virial ratio -V/T (refined vector): {result.virial_ratio:.12f}   float64 start: overlap "
                f"condition number {condition}, dropped directions {result.n_dropped}")
    return (f"virial ratio -V/T: {result.virial_ratio:.12f}   overlap condition number: "
            f"{condition}   dropped directions: {result.n_dropped}")


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
    return 0 if result.bound else NOT_BOUND_EXIT_CODE
