"""``twoel spectrum``: corrected ionization energy of one state, itemized, against measured data."""

from __future__ import annotations

import argparse
import sys

from twoel.cli.common import charge, print_json, positive_int

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
    p.add_argument("--state", default="1^1S",
                   help="1^1S (default), 2^1S or 2^3S; 2^3P gives the fine-structure intervals")
    mass = p.add_mutually_exclusive_group()
    mass.add_argument("--isotope", type=positive_int, default=None,
                      help="mass number of the nucleus (default: most abundant isotope)")
    mass.add_argument("--nuclear-mass", type=float, default=None,
                      help="explicit nuclear mass (unit from --mass-unit)")
    p.add_argument("--mass-unit", choices=("u", "me"), default=None,
                   help="unit of --nuclear-mass: u (default) or electron masses; only with --nuclear-mass")
    p.add_argument("--quality", choices=("fast", "default"), default="default",
                   help="size of the preset correlated basis")
    p.add_argument("--family", default=None,
                   help="solve with this trial family (twoel.solve) instead of the preset basis; "
                        "it must give a correlated S basis")
    p.add_argument("--size", type=positive_int, default=None, help="the family's size parameter")
    p.add_argument("--details", action="store_true", help="also list the α², α³ and mass pieces of the atom")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def _details(d: dict) -> list[str]:
    from twoel.units import hartree_to

    atom = d["atom"]
    fm = atom["finite_mass"]
    lines = ["atom pieces (cm-1, energies of the two-electron state):",
             f"  reduced-mass shift {hartree_to(fm['reduced_mass_shift'], 'cm-1'):+.6f}, mass polarization "
             f"first order {hartree_to(fm['mass_polarization_first_order'], 'cm-1'):+.6f}, exact - first order "
             f"{hartree_to(fm['second_order'], 'cm-1'):+.3e}"]
    bp = atom["breit_pauli_hartree"]
    for key in ("mass_velocity", "darwin_one_electron", "darwin_two_electron", "spin_spin_contact",
                "orbit_orbit", "total", "total_direct"):
        lines.append(f"  α² {key:<28} {hartree_to(bp[key], 'cm-1'):+.6f}")
    qed = atom["qed_hartree"]
    for key in ("one_electron", "two_electron", "araki_sucher", "alpha3", "alpha4_radiative"):
        lines.append(f"  QED {key:<27} {hartree_to(qed[key], 'cm-1'):+.6f}")
    ops = atom["operators"]
    lines.append(f"  ⟨δ(r1)⟩ direct {ops['delta_r1_direct']:.10f} regularized {ops['delta_r1_regularized']:.10f};"
                 f" ⟨δ(r12)⟩ direct {ops['delta_r12_direct']:.10f} regularized {ops['delta_r12_regularized']:.10f}")
    return lines


def _reference_label(match) -> str:
    if not match:
        return "reference"
    head = f"reference ({match['isotope']} {match['state']} J={match['J']}"
    if match["conversion"]:
        return head + f", converted to {match['conversion']['to']})"
    return head + ")"


def _digits(u) -> str:
    """The uncertainty of a ``+.4f`` residual in its last digits (``±`` form if wider)."""
    return "?" if u is None else f"±{u:.2g}"


def summary_text(d: dict, details: bool = False) -> str:
    from twoel.units import convert_energy

    lines = [f"{d['ion']} {d['state']}  (Z = {d['Z']:g}, isotope {d['isotope']}, "
             f"M = {d['nuclear_mass_me']:.7f} m_e)",
             f"{'contribution':<50} {'cm-1':>18} {'eV':>16}"]
    for key, value in d["contributions_cm1"].items():
        lines.append(f"{_LABELS.get(key, key):<50} {value:>18.6f} {d['contributions_ev'][key]:>16.9f}")
    lines.append(f"{'ionization energy (total)':<50} {d['ionization_energy_cm1']:>18.6f} "
                 f"{d['ionization_energy_ev']:>16.9f}")
    if d.get("ionization_energy_uncertainty_cm1") is not None:
        lines.append(f"{'ionization energy with uncertainty (cm-1)':<50} {d['ionization_energy_concise_cm1']:>18}")
    match = d.get("reference_match")
    if d["reference_cm1"] is not None:
        lines.append(f"{_reference_label(match):<50} {d['reference_cm1']:>18.6f} "
                     f"{convert_energy(d['reference_cm1'], 'cm-1', 'ev'):>16.9f}")
        lines.append(f"  source: {d['reference_source']}")
        if match and match["conversion"]:
            c = match["conversion"]
            lines.append(f"  converted from {c['from_isotope']} ({match['raw_value_cm1']:.6f} cm-1): {c['model']}; "
                         f"shift {c['shift_cm1']:+.4f} cm-1, conversion uncertainty {c['uncertainty_cm1']:.1e} cm-1")
        lines.append(f"{'residual (total - reference)':<50} {d['residual_cm1']:>18.6f}")
        if d.get("residual_concise_cm1"):
            lines.append(f"{'residual with combined uncertainty (cm-1)':<50} {d['residual_concise_cm1']:>18}")
        lines.append(f"{'residual, nonrelativistic infinite mass':<50} {d['residual_nonrelativistic_cm1']:>18.6f}")
    elif match is not None:
        lines.append(f"reference: not compared: {match['reason']} ({match['source']})")
    else:
        lines.append("reference: none tabulated")
    if d["nist_cm1"] is not None and d["nist_cm1"] != d["reference_cm1"]:
        lines.append(f"{'NIST ASD (data/nist_ionization_energies.csv)':<50} {d['nist_cm1']:>18.6f}   residual "
                     f"{d['residual_nist_cm1']:+.4f} {_digits(d['residual_nist_uncertainty_cm1'])}")
    if details:
        lines += _details(d)
    lines.append(f"Bethe logarithm ln(k0/R_inf) = {d['bethe_log']['value']:.9f}  [{d['bethe_log']['source']}]")
    for text in d["cautions"]:
        lines.append(f"caution: {text}")
    for text in d["notes"]:
        lines.append(f"note: {text}")
    lines.append(f"time: {d['provenance']['elapsed_seconds']:.1f} s   twoel {d['provenance']['version']}")
    return "\n".join(lines) + "\n"


def fine_structure_text(d: dict) -> str:
    lines = [f"{d['ion']} {d['state']} fine structure (Z = {d['Z']:g}); nonrelativistic energy "
             f"{d['energy_nonrelativistic_hartree']:.10f} Eh"]
    for key, label in (("interval_01", "J=0 - J=1"), ("interval_12", "J=1 - J=2")):
        e = d["fine_structure"][key]
        text = f"{label}: {e['mhz']:.3f} MHz = {e['cm1']:.6f} cm-1"
        if e["measured_mhz"] is not None:
            text += f"   measured {e['measured_mhz']:.3f} MHz ({e['source']}), residual {100 * e['relative_residual']:+.3f} %"
        lines.append(text)
    lines += [f"caution: {t}" for t in d["cautions"]] + [f"note: {t}" for t in d["notes"]]
    return "\n".join(lines) + "\n"


def _check_family(name: str, state) -> None:
    """Refuse, before any work, a ``--family`` that cannot give the corrections of ``state``.

    The corrections need a correlated wavefunction whose basis converges with its size (the
    family declares a basis-truncation error bar for ``state``); one-function products such as
    ``screened`` give delta functions and mass polarization far off.
    """
    from twoel.basis import family_names, get_family
    from twoel.errors import UnsupportedError

    family = get_family(name)
    if family.size_meaning is None or not family.gives_error_bar(state):
        able = [f for f in family_names() if get_family(f).size_meaning is not None
                and get_family(f).gives_error_bar(state)]
        raise UnsupportedError(f"spectrum --family {family.name}: the corrections need a correlated "
                               f"basis that converges with its size (use {', '.join(able)}, or no "
                               f"--family for the preset basis)")


def run(args: argparse.Namespace) -> int:
    from twoel.corrections.spectrum import compute_spectrum

    from twoel.errors import InputError
    from twoel.system import State

    if args.mass_unit is not None and args.nuclear_mass is None:
        raise InputError(f"--mass-unit {args.mass_unit} needs --nuclear-mass: it is the unit of that "
                         f"mass only (the isotope mass is always in u)")
    mass_unit = args.mass_unit or "u"
    st = State.parse(args.state)
    if args.family is not None:
        _check_family(args.family, st)
    if st.L == 1:
        from twoel.corrections.spectrum import compute_fine_structure

        d = compute_fine_structure(args.Z, st)
        if args.json:
            print_json(d)
        else:
            sys.stdout.write(fine_structure_text(d))
        return 0
    wavefunction = None
    if args.family is not None:
        from twoel import solve

        solved = solve(args.Z, args.state, family=args.family, size=args.size)
        if not solved.bound:
            from twoel.errors import NotBoundError

            raise NotBoundError(solved.message)
        wavefunction = solved.wavefunction
    result = compute_spectrum(args.Z, args.state, isotope=args.isotope,
                              nuclear_mass_value=args.nuclear_mass, mass_unit=mass_unit,
                              quality=args.quality, wavefunction=wavefunction)
    d = result.to_dict()
    if args.json:
        print_json(d)
    else:
        sys.stdout.write(summary_text(d, args.details))
    return 0
