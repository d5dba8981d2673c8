"""``twoel properties``: expectation values and wavefunction diagnostics of one state."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import add_charge_argument, positive_int, print_json

NAME = "properties"
HELP = "expectation values (<r>, <1/r12>, delta functions, <grad1.grad2>, ...) and cusp/virial diagnostics"

_ROWS = (
    ("r1", "<r1>", "bohr"), ("r1_squared", "<r1^2>", "bohr^2"), ("inv_r1", "<1/r1>", "bohr^-1"),
    ("inv_r1_squared", "<1/r1^2>", "bohr^-2"), ("r12", "<r12>", "bohr"),
    ("r12_squared", "<r12^2>", "bohr^2"), ("inv_r12", "<1/r12>", "bohr^-1"),
    ("delta_r1", "<delta(r1)> direct", "bohr^-3"),
    ("delta_r1_regularized", "<delta(r1)> regularized", "bohr^-3"),
    ("delta_r12", "<delta(r12)> direct", "bohr^-3"),
    ("delta_r12_regularized", "<delta(r12)> regularized", "bohr^-3"),
    ("grad1_dot_grad2", "<grad1.grad2>", "bohr^-2"), ("p1_fourth", "<p1^4>", "bohr^-4"),
    ("virial_ratio", "virial ratio -V/T (exact 2)", ""),
    ("cusp_nucleus", "electron-nucleus cusp (exact -Z)", ""),
    ("cusp_electron", "electron-electron cusp (exact 1/2)", ""),
    ("normalization", "normalization", ""),
)


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    add_charge_argument(p)
    p.add_argument("--state", default="1^1S", help="term symbol: 1^1S (default), 2^3S, 2^1P ...")
    p.add_argument("--family", default=None, help="trial family (default: exponential, else hylleraas)")
    p.add_argument("--size", type=positive_int, default=None, help="basis size")
    p.add_argument("--hylleraas-preset", choices=("fast", "default"), default=None,
                   help="use the fixed two-scale Hylleraas basis of the corrections instead "
                        "(1^1S, 2^1S, 2^3S; its delta functions converge to ~1e-8)")
    p.add_argument("--no-uncertainties", action="store_true",
                   help="one basis only, no uncertainties (the earlier output; faster)")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def _value_text(key, value, bars) -> str:
    """``value(uncertainty)`` with the digits the bar supports; flagged values are not printed."""
    from twoel.report.numbers import format_uncertain, group_digits

    bar = None if bars is None else bars.get(key)
    if value is None:
        return "—"
    if bar is None:
        return f"{value:.12g}"
    if bar.uncertainty == 0:
        return "0 (exact)" if bar.value == 0 else f"{bar.value!r} (exact)"
    if not bar.reliable and "negative" in bar.note:
        return "flagged: negative beyond its uncertainty (not a value)"
    text = group_digits(format_uncertain(bar.value, bar.uncertainty))
    if not bar.reliable:
        return text + " [unreliable]"
    return text + " [not improved by the largest basis]" if bar.worsened else text


def summary_text(result, values, bars=None) -> str:
    lines = [f"{result.ion} {result.state}  (Z = {result.Z:g}, family {result.family}, "
             f"{result.n_terms} functions); per electron, atomic units",
             "energy: " + (_value_text("energy", result.energy_hartree, bars)
                           if bars is not None and "energy" in bars else repr(result.energy_hartree)) + " Eh"]
    for key, label, unit in _ROWS:
        text = _value_text(key, getattr(values, key), bars)
        lines.append(f"  {label:36s} {text} {unit}".rstrip())
    lines.append("note: direct delta values converge slowly; the regularized (Drachman 1981) ones are "
                 "the better estimates")
    if bars is not None:
        lines.append("note: uncertainties from the nested bases (last digits in parentheses); "
                     "[unreliable]: irregular sequence, see the JSON notes")
        for key, bar in bars.items():
            if bar.uncertainty == 0 or not bar.reliable or bar.worsened:
                lines.append(f"note: {key}: {bar.note}")
    for note in values.notes:
        lines.append(f"note: {note}")
    return "\n".join(lines) + "\n"


def _preset_state(Z: float, state_text: str, quality: str):
    """Solve in the preset two-scale Hylleraas basis; returns a result-like record and values."""
    from types import SimpleNamespace

    from twoel.corrections.spectrum import preset_basis
    from twoel.solver.eigen import solve_generalized
    from twoel.properties.expectation import expectation_values
    from twoel.results import Wavefunction
    from twoel.system import Ion, State

    ion, state = Ion(Z), State.parse(state_text)
    basis = preset_basis(ion.Z, state, quality)
    m = basis.matrices()
    sol = solve_generalized(m.hamiltonian(ion.Z), m.overlap)
    energy = float(sol.values[state.root])
    result = SimpleNamespace(Z=ion.Z, ion=ion.label, state=state.label, size=None,
                             family=f"hylleraas two-scale preset ({quality})",
                             n_terms=basis.size, energy_hartree=energy)
    return result, expectation_values(Wavefunction(basis, sol.vectors[:, state.root]), ion.Z)


def run(args: argparse.Namespace) -> int:
    from twoel.properties.expectation import expectation_values
    from twoel.analysis.transitions import solve_state

    bars, sizes = None, None
    if args.hylleraas_preset:
        from twoel.errors import InputError

        for option, value in (("--family", args.family), ("--size", args.size)):
            if value is not None:
                raise InputError(f"--hylleraas-preset and {option} conflict: the preset is its own "
                                 f"fixed basis; give one of them")
        result, values = _preset_state(args.Z, args.state, args.hylleraas_preset)
    elif args.no_uncertainties:
        result = solve_state(args.Z, args.state, size=args.size, family=args.family)
        values = expectation_values(result)
    else:
        from twoel.properties.nested import properties_with_uncertainties

        nested = properties_with_uncertainties(args.Z, args.state, size=args.size, family=args.family)
        result, values, bars, sizes = nested.record, nested.values, nested.bars, nested.sizes
    if args.json:
        record = {"Z": result.Z, "ion": result.ion, "state": result.state, "family": result.family,
                  "size": result.size, "n_terms": result.n_terms,
                  "energy_hartree": result.energy_hartree, "expectation_values": values.to_dict()}
        if bars is not None:
            record["uncertainties"] = {key: bar.to_dict() for key, bar in bars.items()}
            record["nested_sizes"] = list(sizes)
        print_json(record)
    else:
        sys.stdout.write(summary_text(result, values, bars))
    return 0
