"""``twoel hf``: the Hartree–Fock limit of the 1s² ground state, with its basis convergence."""

from __future__ import annotations

import argparse
import math
import sys

from twoel.cli.common import add_charge_argument, energy_line, print_json, size_list

NAME = "hf"
HELP = "restricted Hartree-Fock limit of the 1s² ground state (even-tempered Slater basis)"


def hf_size_list(text: str) -> tuple[int, ...]:
    """``--sizes`` of ``twoel hf``: a size list whose sizes lie in 1..MAX_SIZE of the SCF basis."""
    from twoel.scf.hartree_fock import MAX_SIZE

    return size_list(text, maximum=MAX_SIZE)


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP + ". The energy is converged over "
                              "basis sizes and the convergence table is printed.")
    add_charge_argument(p, required=False)
    p.add_argument("--sizes", type=hf_size_list, default=None,
                   help="basis sizes of the convergence study, e.g. '1,2,4:14:2' (the default)")
    p.add_argument("--split-shell", action="store_true",
                   help="instead: the split-shell variant (different orbitals, singlet-coupled); "
                        "NOT Hartree-Fock, but it binds H⁻ (slower at high Z)")
    p.add_argument("--correlation", action="store_true",
                   help="print the tabulated correlation energies E_exact - E_HF for Z = 1..10 "
                        "(no computation)")
    p.add_argument("--format", choices=("markdown", "csv", "latex", "json"), default="markdown",
                   help="format of the convergence or correlation table (default markdown)")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def _convergence_frame(result, as_text: bool = False):
    """One row per basis size; ``as_text`` pre-formats the cells for the Markdown table."""
    import pandas as pd

    frame = pd.DataFrame([s.to_dict() for s in result.convergence])
    if not as_text:
        return frame
    styles = {"size": "d", "a": ".10g", "b": ".10g", "energy_hartree": "r",
              "orbital_energy_hartree": "r", "change_hartree": "+.2e", "virial_ratio": ".12f",
              "orbital_overlap": ".8f", "evaluations": "d", "condition_number": ".2e"}
    text = {}
    for column in frame.columns:
        style = styles.get(column, "r")
        cells = []
        for value in frame[column].tolist():
            if value is None or (isinstance(value, float) and math.isnan(value)):
                cells.append("—")
            elif style == "r":
                cells.append(repr(float(value)))
            elif style == "d":
                cells.append(str(int(value)))
            else:
                cells.append(format(float(value), style))
        text[column] = cells
    return pd.DataFrame(text)


def summary_text(result, table: str) -> str:
    from twoel.units import hartree_to

    lines = []
    if getattr(result, "is_hartree_fock", True):
        lines.append(f"{result.ion} 1^1S  restricted Hartree-Fock (even-tempered 1s Slater basis; "
                     f"lowest energy at N = {result.size})")
        lines.append(f"energy: {result.energy_hartree!r} Eh"
                     + (f"  (estimated basis error {result.estimated_error_hartree:.1e} Eh)"
                        if result.estimated_error_hartree is not None else ""))
        eps = result.orbital_energy_hartree
        lines.append(f"1s orbital energy: {eps!r} Eh; Koopmans ionization energy "
                     f"{-eps:.10f} Eh = {hartree_to(-eps, 'ev'):.6f} eV")
        if result.reference is not None:
            ref = result.reference
            lines.append(f"tabulated limit: {ref.value_text} Eh  [{ref.source}; {ref.note}]")
            lines.append(f"difference: {result.difference_hartree:+.2e} Eh")
        else:
            lines.append("tabulated limit: none for this Z")
    else:
        lines.append(f"{result.ion} 1^1S  {result.method}")
        lines.append(f"energy: {result.energy_hartree!r} Eh"
                     + (f"  (estimated basis error {result.estimated_error_hartree:.1e} Eh)"
                        if result.estimated_error_hartree is not None else ""))
        lines.append(f"overlap of the two orbitals: {result.orbital_overlap:.6f}")
    lines.append(f"bound: {'yes' if result.bound else 'no'} (threshold -Z²/2 = "
                 f"{result.threshold_hartree:g} Eh)")
    if result.bound:
        lines.append(energy_line("ionization energy from this energy",
                                 result.threshold_hartree - result.energy_hartree))
    lines.append(f"virial ratio -V/T: {result.virial_ratio:.12f}")
    lines.append("convergence with basis size (energies in Eh):")
    lines.append(table.rstrip("\n"))
    for note in result.notes:
        lines.append(f"note: {note}")
    lines.append(f"time: {result.elapsed_seconds:.2f} s   twoel {result.provenance.get('version')}")
    return "\n".join(lines) + "\n"


def run(args: argparse.Namespace) -> int:
    from twoel.errors import InputError
    from twoel.report.tables import render

    if args.correlation:
        from twoel.scf.correlation import correlation_table

        frame = correlation_table()
        if args.json:
            print_json(frame.to_dict(orient="records"))
            return 0
        columns = ["Z", "ion", "exact_hartree", "hartree_fock_hartree", "correlation_hartree",
                   "correlation_mhartree", "correlation_kcal_mol", "correlation_kj_mol",
                   "correlation_cm1", "correlation_ev"]
        compact = frame[columns].copy()
        compact["Z"] = compact["Z"].astype(int)
        if args.format == "markdown":
            compact = compact.astype(object)
            for c in columns[2:]:
                compact[c] = [format(float(v), ".12g") for v in frame[c]]
        sys.stdout.write(render(compact, args.format,
                                caption="Correlation energies E_exact - E_HF, 1s² ground states"))
        if args.format == "markdown":
            sources = sorted(set(frame["exact_source"]) | set(frame["hartree_fock_source"]))
            sys.stdout.write("sources: " + " | ".join(sources) + "\n")
            sys.stdout.write("HF limits for Z = 4..10 are computed by twoel (see data/"
                             "hartree_fock_limits.csv), not published values\n")
        return 0
    if args.Z is None:
        raise InputError("give --Z (or --correlation for the tabulated correlation energies)")
    from twoel.cli.progress import counter

    with counter("basis sizes", enabled=not args.quiet and not args.json, unit="size") as update:
        step = None if update is None else (lambda size: update())
        if args.split_shell:
            from twoel.scf.split_shell import DEFAULT_SPLIT_SIZES, split_shell_limit

            result = split_shell_limit(args.Z, sizes=args.sizes or DEFAULT_SPLIT_SIZES, progress=step)
        else:
            from twoel.scf.hartree_fock import DEFAULT_SIZES, hartree_fock_limit

            result = hartree_fock_limit(args.Z, sizes=args.sizes or DEFAULT_SIZES, progress=step)
    if args.json:
        print_json(result.to_dict())
        return 0
    table = render(_convergence_frame(result, as_text=args.format == "markdown"), args.format)
    sys.stdout.write(summary_text(result, table))
    return 0
