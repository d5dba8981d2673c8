"""``twoel check``: judge energies printed by other programs against the exact and HF limits."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import add_output_arguments, charge, dumps_json, write_output

NAME = "check"
HELP = ("judge total energies from other programs: error vs the exact nonrelativistic energy and "
        "the Hartree-Fock limit, percentage of correlation recovered, flags")


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(
        NAME, help=HELP, description=HELP + ". Give one energy (--Z, --energy, --unit) or a CSV/"
        "JSON file of rows with columns Z, state, energy, unit, label.")
    p.add_argument("--Z", type=charge, help="nuclear charge or element symbol (one energy)")
    p.add_argument("--energy", help="the total energy as printed, e.g. -2.9033 or -2.9033D+00")
    p.add_argument("--unit", default=None,
                   help="unit of --energy: hartree, eV, kcal/mol, kJ/mol, cm-1, mhartree, rydberg ...")
    p.add_argument("--state", default="1^1S", help="term symbol (default 1^1S)")
    p.add_argument("--label", default="", help="method/basis description shown in the output")
    p.add_argument("--file", help="CSV or JSON file of rows (Z, state, energy, unit, label)")
    p.add_argument("--format", choices=("table", "csv", "json"), default="table",
                   help="output: a table with explanations (default), CSV or JSON")
    p.add_argument("--json", action="store_true",
                   help="same as --format json (one object for --energy, a list for --file)")
    add_output_arguments(p, what="write to this file instead of stdout (atomically)")
    p.set_defaults(run=run)


#: first characters that make a spreadsheet read a cell as a formula (common practice: OWASP
#: "CSV injection"); such a label is written with a leading apostrophe
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")


def spreadsheet_safe(text) -> str:
    """``text`` with a leading ``'`` when a spreadsheet would read it as a formula."""
    text = "" if text is None else str(text)
    return "'" + text if text.startswith(FORMULA_STARTS) else text


def _table_text(results, header: str | None) -> str:
    from twoel.checking.verdicts import results_frame
    from twoel.report.tables import to_markdown

    frame = results_frame(results)
    formats = {"energy_hartree": ".12f", "error_hartree": "+.6e",
               "error_vs_hartree_fock_hartree": "+.6e", "correlation_recovered_percent": ".3f"}
    lines = [header] if header else []
    lines.append(to_markdown(frame, formats).rstrip("\n"))
    explained = [(r, f) for r in results for f in r.flags]
    if explained:
        lines.append("")
        lines.append("flags:")
        for r, f in explained:
            where = f"row {r.row}" if r.row is not None else "energy"
            label = f" ({r.label})" if r.label and r.label != f"row {r.row}" else ""
            lines.append(f"- {where}{label}: {f.code}: {f.explanation}")
    sources = sorted({s for r in results for s in (r.exact_source, r.hartree_fock_source) if s})
    if sources:
        lines.append("")
        lines.append("references: " + " | ".join(sources))
    lines.append("error = E - E_exact (nonrelativistic, infinite nuclear mass); "
                 "error_vs_hartree_fock = E - E_HF; % recovered = 100 (E_HF - E)/(E_HF - E_exact)")
    return "\n".join(lines) + "\n"


def run(args: argparse.Namespace) -> int:
    from twoel.checking.rows import parse_number, read_rows
    from twoel.checking.verdicts import check_energy, check_rows, results_frame
    from twoel.errors import InputError

    fmt = "json" if args.json else args.format
    single = args.file is None
    header = None
    if single:
        missing = [name for name, value in (("--Z", args.Z), ("--energy", args.energy),
                                            ("--unit", args.unit)) if value is None]
        if missing:
            raise InputError(f"give {', '.join(missing)} (or --file with rows to check)")
        try:
            energy = parse_number(args.energy)
        except ValueError as exc:
            raise InputError(f"--energy: {exc}")
        results = [check_energy(args.Z, energy, args.unit, args.state, args.label,
                                energy_text=args.energy.strip())]
    else:
        if args.Z is not None or args.energy is not None:
            raise InputError("give either --file or --Z/--energy/--unit, not both")
        if args.unit is not None:
            raise InputError("--unit applies to --energy; a file gives the unit in each row")
        rows = read_rows(args.file)
        results = check_rows(rows.rows)
        skipped = []
        if rows.comment_lines:
            skipped.append(f"{rows.comment_lines} comment line(s)")
        if rows.blank_lines:
            skipped.append(f"{rows.blank_lines} blank line(s)")
        header = (f"{rows.source}: {len(results)} row(s) checked"
                  + (f"; skipped {', '.join(skipped)}" if skipped else ""))
    if fmt == "json":
        payload = results[0].to_dict() if single else [r.to_dict() for r in results]
        text = dumps_json(payload) + "\n"
    elif fmt == "csv":
        from twoel.report.tables import to_csv

        frame = results_frame(results)
        frame["label"] = [spreadsheet_safe(label) for label in frame["label"]]
        frame["flag_explanations"] = [" | ".join(f.explanation for f in r.flags) for r in results]
        text = to_csv(frame)
    else:
        text = _table_text(results, header)
    if args.out:
        write_output(args.out, text, overwrite=args.overwrite)
    else:
        sys.stdout.write(text)
    return 0
