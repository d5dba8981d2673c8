"""Command-line front end: ``twoel <command> ...``.

Each command lives in its own module with ``NAME``, ``HELP``, ``add_parser(subparsers)`` and a
``run(args) -> int`` set as the parser default.  Errors of the library (:class:`TwoelError`)
become one line on stderr and exit status 2; nothing prints a traceback unless ``--debug``.

Exit status: 0 success; 1 a check that ran and failed (``report --from-provenance``: not
reproduced); 2 bad input or an impossible request; 3 internal error (a bug); 130 interrupted.
"""

from __future__ import annotations

import importlib
import sys
import warnings

from twoel._version import __version__
from twoel.errors import TwoelError
from twoel.cli.common import TwoelArgumentParser, one_line
from twoel.cli.interrupt import run_interruptible

#: modules of twoel.cli that define a command, in help order
COMMAND_MODULES = ("energy", "series", "converge", "transition", "properties", "spectrum", "hf",
                   "check", "report", "levels")


def build_parser() -> TwoelArgumentParser:
    parser = TwoelArgumentParser(
        prog="twoel",
        description="Variational energies of two-electron atoms and helium-like ions "
                    "(Hartree atomic units inside; CODATA conversions at the edges).",
        epilog="exit status: 0 success; 1 a check that failed (report --from-provenance); "
               "2 bad input; 3 internal error; 4 energy: the state is not bound; 130 interrupted")
    parser.add_argument("--version", action="version", version=f"twoel {__version__}")
    parser.add_argument("--debug", action="store_true", help="show tracebacks of internal errors")
    subparsers = parser.add_subparsers(title="commands", metavar="COMMAND", parser_class=TwoelArgumentParser)
    for name in COMMAND_MODULES:
        importlib.import_module(f"{__name__}.{name}").add_parser(subparsers)
    return parser


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if not hasattr(args, "run"):      # one line, as every error (the help is 'twoel --help')
        sys.stderr.write(f"twoel: error: give a command: {', '.join(COMMAND_MODULES)} "
                         "(see 'twoel --help')\n")
        return 2
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # warnings are carried in the results and printed there
            return run_interruptible(lambda: int(args.run(args) or 0))
    except TwoelError as exc:
        sys.stderr.write(f"twoel: error: {one_line(exc)}\n")
        return 2
    except KeyboardInterrupt:
        sys.stderr.write("twoel: interrupted\n")
        return 130
    except BrokenPipeError:
        return 0
    except Exception as exc:  # pragma: no cover - last line of defence
        if args.debug:
            raise
        sys.stderr.write(f"twoel: internal error: {type(exc).__name__}: {one_line(exc)} "
                         "(rerun with --debug for a traceback and please report it)\n")
        return 3


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
