"""``twoel transition``: energy and vacuum wavelength between two computed levels."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import add_charge_argument, positive_int, print_json

NAME = "transition"
HELP = "energy difference (Eh, cm⁻¹, eV, THz) and vacuum wavelength between two states of one ion"


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    add_charge_argument(p)
    p.add_argument("--from", dest="from_state", required=True, help="lower (initial) state, e.g. 2^3S")
    p.add_argument("--to", dest="to_state", required=True, help="upper (final) state, e.g. 2^3P")
    p.add_argument("--family", default=None,
                   help="trial family for both states (default: exponential for excited and P states)")
    p.add_argument("--size", type=positive_int, default=None,
                   help="basis size for both states (default: 600 exponential functions)")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def summary_text(t) -> str:
    from twoel.report.numbers import format_uncertain
    from twoel.units import UNIT_LABELS

    lines = [f"{t.ion} (Z = {t.Z:g})  {t.lower} -> {t.upper}"]
    for label, r in (("from", t.lower_result), ("to", t.upper_result)):
        ref = "" if r.reference is None else f"   (reference {r.reference.value_text}; {r.reference.source})"
        energy = r.energy_hartree_text or repr(r.energy_hartree)
        bar = "" if not r.error_bar_hartree else f" ± {r.error_bar_hartree:.1e}"
        lines.append(f"  {label:4s} {r.state}: {energy} Eh{bar}  [{r.family}, {r.n_terms} functions]{ref}")
    bar = t.energy_uncertainty_hartree
    if bar:
        parts = [f"{format_uncertain(repr(t.energy_hartree), repr(bar))} Eh"]
        parts += [f"{format_uncertain(repr(getattr(t, 'energy_' + key)), repr(t.uncertainty_in(unit)))} "
                  f"{UNIT_LABELS[unit]}" for key, unit in (("cm1", "cm-1"), ("ev", "ev"), ("thz", "thz"))]
        lines.append("energy: " + " = ".join(parts) + ("  (reliable: false)" if t.reliable is False else ""))
        lines.append(f"vacuum wavelength: {format_uncertain(repr(t.wavelength_vacuum_nm), repr(t.wavelength_uncertainty_nm))}"
                     " nm" + ("  (emission: 'from' lies above 'to')" if t.is_emission else ""))
    else:
        lines.append(f"energy: {t.energy_hartree:.12g} Eh = {t.energy_cm1:.8f} cm⁻¹ = {t.energy_ev:.10g} eV "
                     f"= {t.energy_thz:.9g} THz  (no error bar: a level has none, digits as computed)")
        lines.append(f"vacuum wavelength: {t.wavelength_vacuum_nm:.6f} nm"
                     + ("  (emission: 'from' lies above 'to')" if t.is_emission else ""))
    lines.append(f"caution: {t.caution}")
    return "\n".join(lines) + "\n"


def run(args: argparse.Namespace) -> int:
    from twoel.analysis.transitions import transition

    keywords = {} if args.family is None else {"family": args.family}
    t = transition(args.Z, args.from_state, args.to_state, size=args.size, **keywords)
    if args.json:
        print_json(t.to_dict())
    else:
        sys.stdout.write(summary_text(t))
    return 0
