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
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def summary_text(result, values) -> str:
    lines = [f"{result.ion} {result.state}  (Z = {result.Z:g}, family {result.family}, "
             f"{result.n_terms} functions); per electron, atomic units",
             f"energy: {result.energy_hartree!r} Eh"]
    for key, label, unit in _ROWS:
        value = getattr(values, key)
        text = "—" if value is None else f"{value:.12g}"
        lines.append(f"  {label:36s} {text} {unit}".rstrip())
    lines.append("note: direct delta values converge slowly; the regularized (Drachman 1981) ones are "
                 "the better estimates")
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

    if args.hylleraas_preset:
        result, values = _preset_state(args.Z, args.state, args.hylleraas_preset)
    else:
        result = solve_state(args.Z, args.state, size=args.size, family=args.family)
        values = expectation_values(result)
    if args.json:
        record = {"Z": result.Z, "ion": result.ion, "state": result.state, "family": result.family,
                  "size": result.size, "n_terms": result.n_terms,
                  "energy_hartree": result.energy_hartree, "expectation_values": values.to_dict()}
        print_json(record)
    else:
        sys.stdout.write(summary_text(result, values))
    return 0
