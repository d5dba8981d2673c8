"""``twoel converge``: energies for a sequence of basis sizes, extrapolation and error bar."""

from __future__ import annotations

import argparse
import math
import sys

from twoel.cli.common import (COMPACT_NOTE, MAX_LIST_SIZE, MAX_SIZE_COUNT, _bounded_int, add_charge_argument,
                              add_full_argument, print_json)

NAME = "converge"
HELP = "convergence of the energy with the basis size: differences, ratios, extrapolation, error bar"


def size_list(text: str) -> list[int]:
    """Parse ``"100,200,400"`` (no evaluation)."""
    parts = [p.strip() for p in text.split(",") if p.strip()]
    if len(parts) < 3 or not all(p.isdigit() for p in parts):
        raise argparse.ArgumentTypeError(f"expected at least three comma-separated sizes, got {text[:60]!r}")
    if len(parts) > MAX_SIZE_COUNT:
        raise argparse.ArgumentTypeError(f"at most {MAX_SIZE_COUNT} sizes, got {len(parts)}")
    return [_bounded_int(p, MAX_LIST_SIZE, "each size") for p in parts]


#: the most sizes ``--count`` asks for (each a full solve; beyond a few tens they repeat)
MAX_COUNT = 50


def largest_size(text: str) -> int:
    """``--largest``: a size of at most :data:`twoel.cli.common.MAX_LIST_SIZE` (checked on the text)."""
    return _bounded_int(text, MAX_LIST_SIZE, "--largest")


def size_count(text: str) -> int:
    """``--count``: 3 to :data:`MAX_COUNT` sizes (checked on the text)."""
    count = _bounded_int(text, MAX_COUNT, "--count")
    if count < 3:
        raise argparse.ArgumentTypeError(f"--count must be at least 3, got {count}")
    return count


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    add_charge_argument(p)
    p.add_argument("--state", default="1^1S", help="term symbol (default 1^1S)")
    p.add_argument("--family", default="exponential", help="trial-function family (default exponential)")
    group = p.add_mutually_exclusive_group()
    group.add_argument("--sizes", type=size_list, default=None,
                       help="comma-separated increasing basis sizes, e.g. 100,141,200,283,400")
    group.add_argument("--largest", type=largest_size, default=400,
                       help="largest size; the others follow by factors of √2 (default 400)")
    p.add_argument("--count", type=size_count, default=5,
                   help=f"number of sizes with --largest (default 5, at most {MAX_COUNT})")
    p.add_argument("--precision", choices=("float64", "extended"), default="float64",
                   help="arithmetic (see 'twoel energy --help')")
    p.add_argument("--digits", type=int, default=None, help="with --precision extended: digit target")
    p.add_argument("--json", action="store_true",
                   help="print one JSON object (compact; add --full for the full provenance)")
    add_full_argument(p)
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def scientific_uncertain(value: float, uncertainty: float) -> str:
    """``value(uncertainty)`` in concise form with a power-of-ten factor, e.g. ``8.68(1)e-09``
    (the factor of the larger of the two, so an uncertainty above the value still shows)."""
    from twoel.report.numbers import format_uncertain

    top = max(abs(value), abs(uncertainty))
    if top == 0 or not math.isfinite(top):
        return format_uncertain(value, uncertainty or None)
    exponent = math.floor(math.log10(top))
    scale = 10.0 ** exponent
    return f"{format_uncertain(value / scale, uncertainty / scale)}e{exponent:+03d}"


def _row_texts(study):
    """Concise texts of each row: energy (arithmetic error), step and ratio with their errors."""
    from twoel.report.numbers import format_uncertain

    u = list(study.numerical_errors)
    for k, (n, t, d, q) in enumerate(zip(study.sizes, study.energy_texts, study.differences,
                                         study.ratios)):
        et = format_uncertain(t, u[k] or None)
        dt = qt = ""
        if d is not None:
            du = u[k - 1] + u[k] + 2.0**-52 * abs(d)  # a step is a float64: its last bit too
            dt = scientific_uncertain(d, du)
            prev = study.differences[k - 1]
            if q is not None and prev:
                pu = u[k - 2] + u[k - 1]
                qu = abs(q) * (du / abs(d) + pu / abs(prev)) if d else abs(pu / prev) + du / abs(prev)
                qt = format_uncertain(f"{q:.3f}", max(qu, 0.0005)) if qu < 10 else "undetermined"
        yield n, et, dt, qt


def _true_error_text(study) -> str:
    """Last energy minus the reference, with the last energy's arithmetic error (signed)."""
    error = study.true_error_hartree()
    u = max(study.numerical_errors[-1], 2.0**-52 * abs(error))
    text = scientific_uncertain(error, u)
    return text if text.startswith("-") else "+" + text


def table_text(study) -> str:
    """The text of ``twoel converge``: every number in concise form with its uncertainty."""
    from twoel.report.numbers import format_uncertain

    rows = list(_row_texts(study))
    width = max([len(r[1]) for r in rows] + [10])
    dwidth = max([len(r[2]) for r in rows] + [13])
    qwidth = max([len(r[3]) for r in rows] + [7])
    bound = study.bound or (True,) * len(study.sizes)
    lines = [f"{study.ion} {study.state}  family {study.family}, {study.precision}",
             f"{'N':>6}  {'E(N) / Eh (arithmetic error)':<{width}}  {'E(N-1) - E(N)':>{dwidth}}  "
             f"{'ratio':>{qwidth}}  {'time/s':>7}"]
    for (n, et, dt, qt), s, b in zip(rows, study.seconds, bound):
        mark = "" if b else "  not bound"
        lines.append(f"{n:>6}  {et:<{width}}  {dt:>{dwidth}}  {qt:>{qwidth}}  {s:>7.2f}{mark}")
    bar = study.variational_error_bar_hartree
    if bar is None:
        u = study.numerical_errors[-1]
        lines.append(f"variational (upper bound) E = {format_uncertain(study.energy_texts[-1], u or None)} Eh "
                     "(arithmetic error only)")
        lines.append(f"{study.note}")
    else:
        lines.append(f"variational (upper bound) E = {format_uncertain(study.energy_texts[-1], bar)} Eh "
                     f"(bar ± {bar:.1e}: estimated truncation + arithmetic)")
        if study.extrapolated_hartree is not None:
            lines.append(f"extrapolated E = {format_uncertain(study.extrapolated_hartree, study.extrapolated_error_bar_hartree)} Eh "
                         f"(bar ± {study.extrapolated_error_bar_hartree:.1e})")
        lines.append(f"digits stood behind: {study.digits} (those the bar supports)")
        if study.note:
            lines.append(f"note: {study.note}")
    if study.binding_note:
        lines.append(("warning: " if study.may_be_unbound else "binding: ") + study.binding_note)
    if not study.reliable:
        lines.append("warning: reliable: false (the sequence is not regular); "
                     "the error bar may not be trustworthy" if bar is not None else "reliable: false")
    if study.reference_hartree is not None:
        lines.append(f"reference: {study.reference_text} Eh [{study.reference_source}]  "
                     f"true error of the last energy: {_true_error_text(study)} Eh")
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
