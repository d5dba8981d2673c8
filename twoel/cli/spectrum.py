"""``twoel spectrum``: corrected ionization energy of one state, itemized, against measured data."""

from __future__ import annotations

import argparse
import sys

from .common import charge, print_json, positive_int

NAME = "spectrum"
HELP = "ionization energy with finite-mass, α² and α³ corrections, compared with measured data"

_LABELS = {
    "nonrelativistic": "nonrelativistic (infinite mass)",
    "finite_mass": "finite mass (reduced mass + mass polarization)",
    "alpha2": "α² relativistic (Breit–Pauli / Dirac)",
    "alpha3": "α³ QED (Araki–Sucher / Lamb shift)",
    "alpha4_radiative": "α⁴ one-loop radiative (partial)",
}


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(NAME, help=HELP, description=HELP)
    p.add_argument("--Z", type=charge, required=True, help="nuclear charge or element symbol (an element)")
    p.add_argument("--state", default="1^1S", help="1^1S (default), 2^1S or 2^3S")
    mass = p.add_mutually_exclusive_group()
    mass.add_argument("--isotope", type=positive_int, default=None,
                      help="mass number of the nucleus (default: most abundant isotope)")
    mass.add_argument("--nuclear-mass", type=float, default=None,
                      help="explicit nuclear mass (unit from --mass-unit)")
    p.add_argument("--mass-unit", choices=("u", "me"), default="u",
                   help="unit of --nuclear-mass: u (default) or electron masses")
    p.add_argument("--quality", choices=("fast", "default"), default="default",
                   help="size of the preset correlated basis")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def summary_text(d: dict) -> str:
    from ..units import convert_energy

    lines = [f"{d['ion']} {d['state']}  (Z = {d['Z']:g}, isotope {d['isotope']}, "
             f"M = {d['nuclear_mass_me']:.7f} m_e)",
             f"{'contribution':<50} {'cm-1':>18} {'eV':>16}"]
    for key, value in d["contributions_cm1"].items():
        lines.append(f"{_LABELS.get(key, key):<50} {value:>18.6f} {d['contributions_ev'][key]:>16.9f}")
    lines.append(f"{'ionization energy (total)':<50} {d['ionization_energy_cm1']:>18.6f} "
                 f"{d['ionization_energy_ev']:>16.9f}")
    if d["reference_cm1"] is not None:
        lines.append(f"{'reference':<50} {d['reference_cm1']:>18.6f} "
                     f"{convert_energy(d['reference_cm1'], 'cm-1', 'ev'):>16.9f}")
        lines.append(f"  source: {d['reference_source']}")
        lines.append(f"{'residual (total - reference)':<50} {d['residual_cm1']:>18.6f}")
        lines.append(f"{'residual, nonrelativistic infinite mass':<50} {d['residual_nonrelativistic_cm1']:>18.6f}")
    else:
        lines.append("reference: none tabulated")
    if d["nist_cm1"] is not None and d["nist_cm1"] != d["reference_cm1"]:
        lines.append(f"{'NIST ASD (via mendeleev)':<50} {d['nist_cm1']:>18.6f}   residual "
                     f"{d['residual_nist_cm1']:+.4f}")
    lines.append(f"Bethe logarithm ln(k0/R_inf) = {d['bethe_log']['value']:.9f}  [{d['bethe_log']['source']}]")
    for text in d["cautions"]:
        lines.append(f"caution: {text}")
    for text in d["notes"]:
        lines.append(f"note: {text}")
    lines.append(f"time: {d['provenance']['elapsed_seconds']:.1f} s   twoel {d['provenance']['version']}")
    return "\n".join(lines) + "\n"


def run(args: argparse.Namespace) -> int:
    from ..corrections.spectrum import compute_spectrum

    result = compute_spectrum(args.Z, args.state, isotope=args.isotope,
                              nuclear_mass_value=args.nuclear_mass, mass_unit=args.mass_unit,
                              quality=args.quality)
    d = result.to_dict()
    if args.json:
        print_json(d)
    else:
        sys.stdout.write(summary_text(d))
    return 0
