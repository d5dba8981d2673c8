"""``twoel report``: write a reproducible report folder (tables, figures, index, provenance).

With ``--from-provenance FILE`` the recorded report is re-run and every block of the record is
checked (:mod:`twoel.report.reproduce`).  Exit status: 0 reproduced (within tolerance, or bit
for bit with ``--strict``); 1 not reproduced (the verdict says what differs); 2 bad input
(e.g. a provenance file of the wrong structure, one line on stderr), as for every command.
SIGTERM or SIGHUP while the folder is written removes the unfinished folder (as Ctrl-C does)
and exits with 128 + the signal number.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from twoel.errors import InputError
from twoel.cli.common import add_output_arguments, positive_int

NAME = "report"
HELP = "write a report folder (tables, figures, index page, provenance) from a configuration"
DEFAULT_ROOT = "reports"


def add_parser(subparsers) -> None:
    p = subparsers.add_parser(
        NAME, help=HELP, description=HELP + ". The folder is reports/<name>/ under the current "
        "folder unless --out is given; an existing folder is never replaced without --overwrite.",
        epilog="exit status with --from-provenance: 0 reproduced, 1 not reproduced, 2 bad input.")
    source = p.add_mutually_exclusive_group()
    source.add_argument("--config", metavar="FILE", help="report configuration (JSON or TOML)")
    source.add_argument("--demo", action="store_true",
                        help="the built-in demo: a short isoelectronic study for an invented scenario (well under a minute)")
    source.add_argument("--from-provenance", metavar="FILE", dest="from_provenance",
                        help="re-run the report recorded in a provenance.json and check every number (within its "
             "tolerance; --strict: bit for bit) and every recorded block; exit 1 if not reproduced")
    where = p.add_mutually_exclusive_group()
    where.add_argument("--name", help=f"folder name under ./{DEFAULT_ROOT}/ (default: the configuration's name)")
    add_output_arguments(p, what="the folder to write", group=where)
    p.add_argument("--html", action="store_true", help="also write index.html")
    p.add_argument("--jobs", type=positive_int, default=1,
                   help="worker processes (default 1 = serial; 0 = one per usable core; capped at the "
                        "usable cores); same numbers")
    p.add_argument("--strict", action="store_true",
                   help="with --from-provenance: compare every number bit for bit instead of "
                        "within its own tolerance")
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    p.set_defaults(run=run)


def _target(args, name: str) -> Path:
    if args.out:
        return Path(args.out)
    return Path(DEFAULT_ROOT) / (args.name or name)


def run(args: argparse.Namespace) -> int:
    if args.name is not None and ("/" in args.name or args.name in ("", ".", "..")):
        raise InputError(f"--name must be a plain folder name, got {args.name!r} (use --out for a path)")
    from twoel.analysis.sweep import usable_cores
    from twoel.cli.progress import counter
    from twoel.io import BuildStopped

    cores = usable_cores()
    if args.jobs > cores:
        sys.stderr.write(f"twoel: --jobs {args.jobs} capped at {cores}, the cores this process may use\n")
        args.jobs = cores

    try:
        with counter("report", enabled=not args.quiet, unit="solve") as progress:
            return _run(args, {"overwrite": args.overwrite, "html": args.html, "jobs": args.jobs,
                               "progress": progress})
    except BuildStopped as stop:        # SIGTERM/SIGHUP while the folder was being written
        sys.stderr.write(f"twoel: {stop}; no unfinished folder is left behind\n")
        return 128 + stop.signum


def _run(args: argparse.Namespace, common: dict) -> int:
    from twoel.report.build import (DEMO_CONFIG, build_report, load_config, normalize_config,
                                read_provenance, rebuild_from_provenance)

    if args.from_provenance:
        data = read_provenance(args.from_provenance)
        out = _target(args, data["config"].get("name", "report") + "-rerun")
        result = rebuild_from_provenance(args.from_provenance, out,
                                         mode="strict" if args.strict else "tolerance", **common)
        check = result.reproduction
        sys.stdout.write(f"wrote {result.path}/ ({len(result.files)} files)\n")
        for line in check["verdict"]:
            sys.stdout.write(line + "\n")
        return 0 if check["reproduced"] else 1
    if args.strict:
        raise InputError("--strict applies to --from-provenance")
    if args.demo:
        config = DEMO_CONFIG
    elif args.config:
        config = load_config(args.config)
    else:
        raise InputError("say what to report: --config FILE, --demo or --from-provenance FILE")
    name = normalize_config(config)["name"]
    result = build_report(config, _target(args, name), **common)
    sys.stdout.write(f"wrote {result.path}/ ({len(result.files)} files): open {result.path / 'index.md'}\n")
    return 0
