"""Shared pieces of the command line: argument types, option groups, output, errors."""

from __future__ import annotations

import argparse
import math
import re
import sys

from twoel.errors import InputError
from twoel.io import dumps_json  # noqa: F401  (re-exported: the CLI's JSON encoder lives in twoel.io)


#: the longest error message printed (characters); a longer one keeps its start and end
MAX_MESSAGE = 1000


def one_line(message) -> str:
    """``message`` as one line of at most :data:`MAX_MESSAGE` characters (line breaks become
    spaces; the middle of a longer text, e.g. a quoted huge value, is cut)."""
    text = " ".join(str(message).split())
    if len(text) > MAX_MESSAGE:
        text = f"{text[:MAX_MESSAGE - 220]} ... ({len(text)} characters) ... {text[-160:]}"
    return text


#: what argparse reads as a negative number (a value) rather than an option
NEGATIVE_NUMBER = re.compile(r"^-(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$|^-(inf|infinity|nan)$", re.IGNORECASE)


class TwoelArgumentParser(argparse.ArgumentParser):
    """An argument parser whose errors are one line on stderr and exit status 2."""

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        # a negative number in any notation is a value, not an option: ``--energy -1e300``,
        # ``--energy -2.9033D+00``, ``--Z -inf`` (argparse alone knows only -12 and -1.5)
        self._negative_number_matcher = NEGATIVE_NUMBER

    def error(self, message: str):  # noqa: D401 - argparse API
        self.exit(2, f"{self.prog}: error: {one_line(message)} (see '{self.prog} --help')\n")


#: the largest integer any integer option accepts (far beyond any sensible size, count or job number)
MAX_OPTION_INT = 10**9
#: the most entries a size list (``--sizes``) may expand to
MAX_SIZE_COUNT = 1000
#: the largest basis size a size list accepts (twoel's largest bases hold a few thousand functions)
MAX_LIST_SIZE = 100_000
#: the most explicit terms ``--terms`` accepts (the correlated basis holds at most 6000 primitives)
MAX_TERM_COUNT = 6000
#: the largest power in ``--terms``: the family's own rule (:data:`twoel.basis.hylleraas.MAX_TERM_POWER`),
#: repeated here so that the parser checks it without loading the numerical core (a test keeps
#: the two equal)
MAX_TERM_POWER = 60


def _bounded_int(text: str, maximum: int, what: str) -> int:
    """``int(text)`` of a plain digit string, refused (before conversion) when above ``maximum``."""
    text = text.strip()
    if not text.isdigit():
        raise argparse.ArgumentTypeError(f"{what} must be a non-negative integer, got {text[:40]!r}")
    digits = text.lstrip("0") or "0"
    if len(digits) > len(str(maximum)) or int(digits) > maximum:
        shown = digits if len(digits) <= 30 else f"{digits[:12]}... ({len(digits)} digits)"
        raise argparse.ArgumentTypeError(f"{what} must be at most {maximum}, got {shown}")
    return int(digits)


def positive_int(text: str) -> int:
    stripped = text.strip()
    if stripped.startswith("-") and stripped[1:].isdigit():
        raise argparse.ArgumentTypeError(f"must be >= 0, got {stripped[:40]}")
    if not stripped.lstrip("+").isdigit():
        raise argparse.ArgumentTypeError(f"must be an integer, got {text[:40]!r}")
    return _bounded_int(stripped.lstrip("+"), MAX_OPTION_INT, "the value")


def charge(text: str) -> float:
    from twoel.system import parse_charge

    try:
        return parse_charge(text)
    except InputError as exc:
        raise argparse.ArgumentTypeError(str(exc))


#: help of the ``--Z`` option of the commands that take any charge
CHARGE_HELP = "nuclear charge: a number (any Z > 0) or element symbol/name"


def add_charge_argument(parser: argparse.ArgumentParser, required: bool = True) -> None:
    """The ``--Z`` option (a charge or an element; see :func:`charge`)."""
    if required:
        parser.add_argument("--Z", type=charge, required=True, help=CHARGE_HELP)
    else:
        parser.add_argument("--Z", type=charge, default=None, help=CHARGE_HELP)


def parameter_assignment(text: str) -> tuple[str, float]:
    """Parse ``NAME=VALUE`` (a float) without evaluating anything."""
    if "=" not in text:
        raise argparse.ArgumentTypeError(f"expected NAME=VALUE, got {text!r}")
    name, value = text.split("=", 1)
    try:
        number = float(value)
    except ValueError:
        raise argparse.ArgumentTypeError(f"value of {name!r} must be a number, got {value!r}")
    if not math.isfinite(number):
        raise argparse.ArgumentTypeError(f"value of {name!r} must be finite, got {value!r}")
    return name.strip(), number


def term_list(text: str) -> list[tuple[int, int, int]]:
    """Parse ``"0,0,0;0,0,1;0,2,0"`` into integer triples (no evaluation).

    At most :data:`MAX_TERM_COUNT` terms, each power at most :data:`MAX_TERM_POWER`; both are
    checked before any number is converted.
    """
    chunks = [chunk.strip() for chunk in text.split(";") if chunk.strip()]
    if len(chunks) > MAX_TERM_COUNT:
        raise argparse.ArgumentTypeError(f"at most {MAX_TERM_COUNT} terms, got {len(chunks)}")
    terms = []
    for chunk in chunks:
        parts = [p.strip() for p in chunk.split(",")]
        if len(parts) != 3 or not all(p.isdigit() for p in parts):
            raise argparse.ArgumentTypeError(f"each term must be three non-negative integers "
                                             f"'i,j,k', got {chunk[:60]!r}")
        terms.append(tuple(_bounded_int(p, MAX_TERM_POWER, f"each power of term {chunk[:60]!r}")
                           for p in parts))
    if not terms:
        raise argparse.ArgumentTypeError("the term list is empty")
    return terms


class FamilyHelp(str):
    """Help text of ``--family`` that lists the registered families only when help is printed.

    argparse expands every help string with ``%`` when (and only when) it prints help, so the
    family registry (which imports the numerical core) is not loaded while the parser is built.
    """

    def __new__(cls, template: str = "trial-function family: {names} (default: hylleraas for the "
                                     "ground state, otherwise the most capable family that supports "
                                     "the state)"):
        text = super().__new__(cls, template)
        text.template = template
        return text

    def __mod__(self, params):
        from twoel.basis import family_names

        return self.template.format(names=", ".join(family_names())) % params


def add_basis_arguments(parser: argparse.ArgumentParser, default_size: int | None = None) -> None:
    """Options that choose the trial family and its basis (shared by several commands)."""
    group = parser.add_argument_group("basis")
    group.add_argument("--state", default="1^1S",
                       help="term symbol: 1^1S (default), 2^3S, '2 3S', 2³S ...")
    group.add_argument("--family", default=None,
                       help=FamilyHelp())
    group.add_argument("--size", type=positive_int, default=default_size,
                       help="the family's size parameter (ω for hylleraas); ignored by families without one")
    group.add_argument("--param", action="append", type=parameter_assignment, default=[],
                       metavar="NAME=VALUE", help="fix a nonlinear parameter (bohr⁻¹); repeatable")
    opt = group.add_mutually_exclusive_group()
    opt.add_argument("--optimize", dest="optimize", action="store_true", default=None,
                     help="optimize the nonlinear parameters (the default when none is fixed)")
    opt.add_argument("--no-optimize", dest="optimize", action="store_false",
                     help="use the starting (or given) parameters as they are")
    group.add_argument("--exponents", type=int, choices=(1, 2), default=None,
                       help="hylleraas: one exponent (α = β) or two")
    group.add_argument("--terms", type=term_list, default=None,
                       help="hylleraas: explicit powers 'i,j,k;i,j,k;...' instead of all up to ω")
    group.add_argument("--coordinates", choices=("r", "stu"), default=None,
                       help="hylleraas: powers of (r1, r2, r12) [default] or of (s, t, u)")


def resolved_family(args: argparse.Namespace) -> str:
    """The family named by ``--family``; without it the front door's choice for the state
    (:func:`twoel.solver.pipeline.choose_family`: hylleraas for the ground state, otherwise the
    most capable family that declares the state)."""
    if args.family is not None:
        return args.family
    from twoel.solver.pipeline import choose_family
    from twoel.system import State

    return choose_family(State.parse(args.state))[0].name


def basis_keywords(args: argparse.Namespace) -> dict:
    """Turn the parsed basis options into keyword arguments of :func:`twoel.solve`."""
    options = {}
    for name in ("exponents", "terms", "coordinates"):
        value = getattr(args, name, None)
        if value is not None:
            options[name] = value
    return {
        "state": args.state,
        "family": resolved_family(args),
        "size": args.size,
        "parameters": dict(args.param) if args.param else None,
        "optimize": args.optimize,
        "options": options or None,
    }


def print_json(obj) -> None:
    sys.stdout.write(dumps_json(obj) + "\n")


#: provenance entries kept in a compact JSON record (``--full`` prints the whole provenance)
PROVENANCE_SUMMARY = ("package", "version", "method", "family", "size", "state", "Z", "precision",
                      "constants")
#: the ``record`` entry of a compact JSON record
COMPACT_NOTE = "compact: pass --full for the whole record (basis, parameters, full provenance)"


def add_full_argument(parser: argparse.ArgumentParser) -> None:
    """The ``--full`` option of the commands whose JSON record is compact by default."""
    parser.add_argument("--full", action="store_true",
                        help="with --json: print the whole record (basis, every parameter and "
                             "root, full provenance) instead of the compact one")


def provenance_summary(provenance: dict | None) -> dict:
    """The short provenance of a compact record: method, family/size, precision, versions."""
    provenance = provenance or {}
    return {key: provenance[key] for key in PROVENANCE_SUMMARY if key in provenance}


def energy_record(result, full: bool = False) -> dict:
    """The JSON record of an energy result: compact by default, ``to_dict()`` with ``full``.

    The compact record keeps every entry of :meth:`EnergyResult.to_dict` under its usual name
    (energy with text and error bar, ion, state, family, size, bound, ionization energies,
    reference and difference, parameters, roots, diagnostics, warnings and notes) but only a
    short provenance (:data:`PROVENANCE_SUMMARY`: no basis listing, which is hundreds of lines);
    it adds ``record`` saying that it is compact.
    """
    record = result.to_dict()
    if full:
        return record
    compact = dict(record)
    compact["provenance"] = provenance_summary(record.get("provenance"))
    compact["record"] = COMPACT_NOTE
    return compact


def energy_line(label: str, value_hartree: float | None, units=("hartree", "ev", "cm-1", "kj/mol", "mhz")) -> str:
    from twoel.units import UNIT_LABELS, hartree_to

    if value_hartree is None:
        return f"{label}: —"
    parts = [f"{hartree_to(value_hartree, u):.12g} {UNIT_LABELS[u]}" for u in units]
    return f"{label}: " + " = ".join(parts)


def _size_part(part: str, maximum: int) -> tuple[int, int, int]:
    """``(first, last, step)`` of one item of a size list, bounded before anything is expanded."""
    fields = part.split(":")
    if len(fields) > 3 or not all(f.strip().isdigit() for f in fields):
        raise argparse.ArgumentTypeError(f"sizes must be integers or ranges 'first:last[:step]', "
                                         f"got {part[:60]!r}")
    first = _bounded_int(fields[0], maximum, "each size")
    last = _bounded_int(fields[1], maximum, "each size") if len(fields) > 1 else first
    step = _bounded_int(fields[2], MAX_OPTION_INT, "the step of a range") if len(fields) == 3 else 1
    if len(fields) > 1 and (step < 1 or last < first):
        raise argparse.ArgumentTypeError(f"range {part!r} must increase with a step >= 1")
    return first, last, step


def size_list(text: str, maximum: int = MAX_LIST_SIZE) -> tuple[int, ...]:
    """Parse basis sizes ``"1,2,4:14:2"`` (ranges inclusive) into increasing integers (no evaluation).

    Every size is at most ``maximum`` and the list at most :data:`MAX_SIZE_COUNT` long; both are
    checked on the text, before a range is expanded.
    """
    ranges = [_size_part(part.strip(), maximum) for part in text.split(",") if part.strip()]
    count = sum((last - first) // step + 1 for first, last, step in ranges)
    if count > MAX_SIZE_COUNT:
        raise argparse.ArgumentTypeError(f"at most {MAX_SIZE_COUNT} sizes, got {count} from {text[:60]!r}")
    sizes = [n for first, last, step in ranges for n in range(first, last + 1, step)]
    if not sizes:
        raise argparse.ArgumentTypeError("the list of sizes is empty")
    return tuple(sizes)


def add_output_arguments(parser: argparse.ArgumentParser, what: str, group=None) -> None:
    """The one option pair of every command that writes files: ``--out PATH`` and ``--overwrite``.

    ``--output`` and ``--force`` are documented aliases (older spellings) of the same options.
    ``group`` (e.g. a mutually exclusive group) receives ``--out`` instead of ``parser``.
    """
    (group or parser).add_argument("--out", "--output", dest="out", metavar="PATH",
                                   help=f"{what} (--output is an alias)")
    parser.add_argument("--overwrite", "--force", dest="overwrite", action="store_true",
                        help="allow --out to replace an existing file or folder "
                             "(--force is an alias)")


def write_output(path: str, text: str, overwrite: bool = False) -> None:
    """Write ``text`` to ``path`` atomically (:mod:`twoel.io`); refuse to replace a file unless asked."""
    import os

    from twoel.io import atomic_write_text

    if os.path.exists(path) and not overwrite:
        raise InputError(f"output file {path!r} exists; pass --overwrite (or --force) to replace it")
    if os.path.exists(path) and not os.path.isfile(path):
        raise InputError(f"{path!r} is not a regular file; refusing to write there")
    folder = os.path.dirname(os.path.abspath(path))
    if not os.path.isdir(folder):
        raise InputError(f"output folder {folder!r} does not exist")
    atomic_write_text(path, text)
