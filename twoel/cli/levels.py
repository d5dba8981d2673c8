"""``twoel levels``: every singlet and triplet level up to n and L, with quantum defects and Ritz fits."""

from __future__ import annotations

import argparse
import contextlib
import json
import math
import sys

from twoel.cli.common import (add_charge_argument, add_output_arguments, dumps_json, positive_int,
                              write_output)

NAME = "levels"
HELP = "term diagram of one ion: every singlet and triplet level up to --n-max and --L-max, " \
       "ionization energies, quantum defects and Ritz fits of each series"

#: columns of the human tables (the uncertainty columns fold into their values)
TABLE_COLUMNS = ("state", "n_terms", "energy_hartree", "error_bar_hartree", "ionization_energy_hartree",
                 "ionization_energy_cm1", "effective_n", "quantum_defect", "quantum_defect_uncertainty",
                 "reference_hartree", "reference_hartree_text", "reference_key", "difference_hartree")
FORMATS = ("text", "csv", "latex", "json")
FIGURE_SUFFIXES = ("png", "svg")
_SUBSCRIPT = {"delta_0": "δ₀", "delta_2": "δ₂", "delta_4": "δ₄"}
_LATEX_NAME = {"delta_0": r"$\delta_0$", "delta_2": r"$\delta_2$", "delta_4": r"$\delta_4$"}


def _bounded(low: int, high: int, what: str):
    def parse(text: str) -> int:
        value = positive_int(text)
        if not low <= value <= high:
            raise argparse.ArgumentTypeError(f"{what} must be between {low} and {high}, got {value}")
        return value

    return parse


def add_parser(subparsers) -> None:
    from twoel.analysis.levels import DEFAULT_FIT_LOWEST_N, MAX_L, MAX_N

    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    add_charge_argument(p)
    p.add_argument("--n-max", type=_bounded(1, MAX_N, "--n-max"), default=5,
                   help=f"highest principal quantum number, 1..{MAX_N} (default 5)")
    p.add_argument("--L-max", type=_bounded(0, MAX_L, "--L-max"), default=3,
                   help=f"highest total orbital angular momentum, 0..{MAX_L} (default 3 = F)")
    p.add_argument("--family", default=None,
                   help="trial family for every level (default: per level, the most capable "
                        "family that supports it, at the size it gives for the level)")
    p.add_argument("--size", type=positive_int, default=None,
                   help="basis size for every level (default: the family's size for the level)")
    p.add_argument("--precision", choices=("float64", "extended"), default="float64",
                   help="float64 (default) or extended (exponential family, any state)")
    p.add_argument("--fit-lowest-n", type=_bounded(1, MAX_N, "--fit-lowest-n"), default=DEFAULT_FIT_LOWEST_N,
                   help=f"lowest n taken into the Ritz fits (default {DEFAULT_FIT_LOWEST_N}: the "
                        "ground state is no Rydberg level)")
    p.add_argument("--format", choices=FORMATS, default=None, help="output format (default text)")
    p.add_argument("--json", action="store_true", help="same as --format json (no progress lines)")
    add_output_arguments(p, "write the output (in --format) to this file instead of stdout")
    p.add_argument("--figure", metavar="PATH", default=None,
                   help="also write the term diagram to PATH (.png or .svg; --overwrite replaces it)")
    p.add_argument("--jobs", type=positive_int, default=1,
                   help="worker processes (default 1 = serial; 0 = one per core)")
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


@contextlib.contextmanager
def level_progress(enabled: bool = True):
    """Yield ``progress(done, total, state)``: a bar on an interactive stderr, else one line
    ``levels: DONE/TOTAL STATE`` per finished level; ``None`` when disabled."""
    from twoel.cli.progress import counter

    if not enabled:
        yield None
        return
    if sys.stderr.isatty():
        with counter("levels", unit="level") as bar:
            yield (lambda done, total, _state: bar(done, total)) if bar is not None else None
        return

    def update(done: int, total: int, state: str) -> None:
        sys.stderr.write(f"levels: {done}/{total} {state}\n")
        sys.stderr.flush()

    yield update


def _concise(value, uncertainty) -> str:
    from twoel.report.numbers import format_uncertain

    if uncertainty is None or not math.isfinite(uncertainty) or uncertainty <= 0:
        return f"{value:.6g} (uncertainty undetermined)"
    return format_uncertain(value, uncertainty)


def fit_lines(table) -> list[str]:
    """Plain-text lines of the Ritz fits (coefficients, χ²/dof, the residual verdict)."""
    if table.zeta <= 0:
        return []
    lines = ["Ritz fits δ(n) = δ₀ + δ₂/(n − δ₀)² + δ₄/(n − δ₀)⁴ (weighted least squares, "
             "weights from the propagated bars):"]
    if not table.fits:
        from twoel.analysis.levels import MIN_FIT_POINTS

        return lines + [f"  none: no series has {MIN_FIT_POINTS} computed levels of n >= "
                        f"{table.provenance.get('fit_lowest_n')}"]
    for fit in table.fits:
        coefficients = ", ".join(f"{_SUBSCRIPT[k]} = {_concise(v, fit.uncertainties[k])}"
                                 for k, v in fit.coefficients.items())
        judged = ("unweighted" if fit.chi2 is None else
                  f"χ²/dof = {fit.chi2_per_dof:.3g} (dof {fit.dof}); "
                  + ("residuals EXCEED the bars" if fit.exceeds_bars else "residuals within the bars"))
        lines.append(f"  {fit.series} (n = {', '.join(map(str, fit.n))}): {coefficients}; {judged}")
        residuals = ", ".join(f"{r:+.2e}" for r in fit.residuals)
        lines.append(f"      residuals δ − δ_fit: {residuals}")
        if fit.note:
            lines.append(f"      note: {fit.note}")
    return lines


def _others(table) -> list[str]:
    from twoel.analysis.levels import COMPUTED, NOT_AVAILABLE, NOT_AVAILABLE_TEXT

    lines = []
    missing = [lv.state for lv in table.levels if lv.status == NOT_AVAILABLE]
    if missing:
        lines.append(f"{NOT_AVAILABLE_TEXT}: {', '.join(missing)}")
    for lv in table.levels:
        if lv.status not in (COMPUTED, NOT_AVAILABLE):
            lines.append(f"{lv.state}: {lv.status}: {lv.message}")
    return lines


def _header(table) -> str:
    return (f"{table.ion} levels n <= {table.n_max}, L <= {table.L_max} (Z = {table.Z:g}; threshold "
            f"E_th = -Z²/2 = {table.threshold_hartree:g} Eh; ζ = Z − 1 = {table.zeta:g}); I = E_th − E, "
            f"δ = n − n*, n* = ζ/sqrt(2 I)")


def _computed_frame(table):
    from twoel.analysis.levels import COMPUTED

    frame = table.to_frame()
    frame = frame[frame["status"] == COMPUTED].reset_index(drop=True)
    if len(frame):  # integer columns came back as floats beside the rows without a solve
        frame["n_terms"] = frame["n_terms"].astype(int)
    return frame


def _provenance_line(table) -> str:
    p = table.provenance
    return (f"provenance: {p['method']}; family {p['family']}; size {p['size'] or 'per family'}; "
            f"precision {p['precision']}; twoel {p['version']}, numpy {p['numpy']}, scipy {p['scipy']}; "
            f"{p['constants']}; {table.elapsed_seconds:.1f} s")


def text_output(table) -> str:
    from twoel.report.tables import to_markdown

    frame = _computed_frame(table)
    lines = [_header(table), ""]
    if len(frame):
        columns = [c for c in TABLE_COLUMNS if c in frame.columns]
        lines.append(to_markdown(frame, columns=columns).rstrip("\n"))
    else:
        lines.append("no level computed")
    lines += [""] + _others(table) + list(table.notes) + fit_lines(table) + [_provenance_line(table)]
    return "\n".join(lines) + "\n"


def _latex_fits(table) -> list[str]:
    from twoel.report.numbers import latex_number, latex_scientific
    from twoel.report.tables import latex_text

    if not table.fits:
        return []
    out = [r"\par\medskip", r"\begin{tabular}{llllll}", r"\toprule",
           r"series & $n$ & " + " & ".join(_LATEX_NAME.values()) + r" & $\chi^2/\mathrm{dof}$ \\", r"\midrule"]
    for fit in table.fits:
        cells = [rf"${{}}^{{{fit.multiplicity}}}\mathrm{{{'SPDFGHIK'[fit.L]}}}$", ", ".join(map(str, fit.n))]
        for k in _LATEX_NAME:
            if k in fit.coefficients:
                text = _concise(fit.coefficients[k], fit.uncertainties[k])
                cells.append(latex_number(text) if "(" in text and "undetermined" not in text else latex_text(text))
            else:
                cells.append("---")
        cells.append("---" if fit.chi2_per_dof is None else latex_scientific(fit.chi2_per_dof, 2)
                     + (r"$^{\ast}$" if fit.exceeds_bars else ""))
        out.append(" & ".join(cells) + r" \\")
    out += [r"\bottomrule", r"\end{tabular}"]
    if any(fit.exceeds_bars for fit in table.fits):
        out.append(r"\par\smallskip{\footnotesize $^{\ast}$ residuals exceed the propagated bars}")
    return out


def _latex_caption(table) -> str:
    from twoel.report.tables import latex_ion

    z = f"{table.Z:g}"
    return (rf"{latex_ion(table.ion)} levels $n \le {table.n_max}$, $L \le {table.L_max}$ ($Z = {z}$): "
            rf"energies $E$, ionization energies $I = E_\mathrm{{th}} - E$ with "
            rf"$E_\mathrm{{th}} = -Z^2/2 = {table.threshold_hartree:g}\,E_\mathrm{{h}}$, and quantum "
            rf"defects $\delta = n - n^*$, $n^* = \zeta/\sqrt{{2I}}$, $\zeta = Z - 1 = {table.zeta:g}$")


def latex_output(table) -> str:
    from twoel.report.tables import to_latex

    frame = _computed_frame(table)
    columns = [c for c in TABLE_COLUMNS if c in frame.columns]
    parts = [r"\begin{table}", r"\centering", rf"\caption{{{_latex_caption(table)}}}", r"\label{tab:levels}"]
    parts.append(to_latex(frame, columns=columns).rstrip("\n") if len(frame) else "% no level computed")
    parts += _latex_fits(table) + [r"\end{table}"]
    parts += ["% " + line for line in _others(table) + list(table.notes)]
    parts.append("% " + _provenance_line(table))
    return "\n".join(parts) + "\n"


def json_record(table) -> dict:
    """One JSON object: header fields, one record per level (with ``*_concise`` texts), the fits,
    the notes and the provenance."""
    from twoel.report.tables import to_json

    rows = json.loads(to_json(table.to_frame()))
    for record, level in zip(rows, table.levels):
        record["ionization_energy_error_bar_hartree"] = level.ionization_energy_error_bar_hartree
        record["provenance"] = level.provenance
    return {"Z": table.Z, "ion": table.ion, "n_max": table.n_max, "L_max": table.L_max,
            "threshold_hartree": table.threshold_hartree, "zeta": table.zeta, "levels": rows,
            "fits": [f.to_dict() for f in table.fits],
            "not_available": [lv.state for lv in table.levels if lv.status == "not available"],
            "notes": list(table.notes), "elapsed_seconds": table.elapsed_seconds,
            "provenance": table.provenance}


def render_levels(table, fmt: str) -> str:
    if fmt == "json":
        return dumps_json(json_record(table)) + "\n"
    if fmt == "csv":
        from twoel.report.tables import to_csv

        return to_csv(table.to_frame())
    if fmt == "latex":
        return latex_output(table)
    return text_output(table)


def figure_output(table):
    from twoel.report.level_diagram import term_diagram_figure

    computed = table.computed()
    empty = {(lv.L, lv.multiplicity) for lv in table.levels} - {(lv.L, lv.multiplicity) for lv in computed}
    return term_diagram_figure([lv.L for lv in computed], [lv.multiplicity for lv in computed],
                               [lv.n for lv in computed], [lv.energy_hartree for lv in computed],
                               table.threshold_hartree, title=f"{table.ion} term diagram (Z = {table.Z:g})",
                               empty_series=sorted(empty))


def _check_paths(args) -> None:
    """Refuse, before anything is computed, outputs that cannot be written."""
    import os

    from twoel.errors import InputError

    for path in (args.out, args.figure):
        if path is not None and os.path.exists(path) and not os.path.isfile(path):
            raise InputError(f"{path!r} is not a regular file; refusing to write there")
        if path is not None and os.path.lexists(path) and not args.overwrite:
            raise InputError(f"output file {path!r} exists; pass --overwrite (or --force) to replace it")
        if path is not None and not os.path.isdir(os.path.dirname(os.path.abspath(path))):
            raise InputError(f"output folder {os.path.dirname(os.path.abspath(path))!r} does not exist")
    if args.figure is not None and args.figure.rsplit(".", 1)[-1].lower() not in FIGURE_SUFFIXES:
        raise InputError(f"--figure must end in .png or .svg, got {args.figure!r}")


def run(args: argparse.Namespace) -> int:
    from twoel.analysis.levels import compute_levels
    from twoel.errors import InputError

    if args.json and args.format not in (None, "json"):
        raise InputError(f"--json and --format {args.format} conflict: --json means --format json; give one")
    fmt = "json" if args.json else (args.format or "text")
    _check_paths(args)
    with level_progress(enabled=not args.quiet and not (fmt == "json" and args.out is None)) as progress:
        table = compute_levels(args.Z, args.n_max, args.L_max, family=args.family, size=args.size,
                               precision=args.precision, fit_lowest_n=args.fit_lowest_n, jobs=args.jobs,
                               progress=progress)
    text = render_levels(table, fmt)
    if args.out is None:
        sys.stdout.write(text)
    else:
        write_output(args.out, text, overwrite=args.overwrite)
    if args.figure is not None:
        from twoel.io import atomic_write_bytes
        from twoel.report.plots import figure_bytes

        atomic_write_bytes(args.figure, figure_bytes(figure_output(table), args.figure.rsplit(".", 1)[-1].lower()),
                           overwrite=args.overwrite)
    return 0
