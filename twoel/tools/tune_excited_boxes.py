"""Old name and options of the excited-state box tuner (developer tool; kept working).

**Not part of the runtime package API**: nothing in twoel imports :mod:`twoel.tools`.
The work is done by :mod:`twoel.tools.tune_boxes`; this module maps the old options::

    python -m twoel.tools.tune_excited_boxes --Z 2 --state 2^3S --size 200 --evaluations 400 \\
        [--out best.json] [--write]
    python -m twoel.tools.tune_excited_boxes --merge best1.json best2.json

``--out`` is the checkpoint file (``tune_boxes --checkpoint``), ``--write`` merges the result
into ``data/exponential_boxes_excited.json`` and ``--merge`` merges files into it; the box
fractions are optimized as well (``tune_boxes --shares``), as this tool always did.
"""

from __future__ import annotations

import argparse
import sys

from twoel.tools import tune_boxes


def _data_file() -> str:
    from twoel.basis.excited_boxes import DATA_FILE
    from twoel.reference import data_root

    return str(data_root() / DATA_FILE)


def translate(argv=None) -> list[str]:
    """The :mod:`twoel.tools.tune_boxes` arguments for the old options ``argv``."""
    p = argparse.ArgumentParser(prog="python -m twoel.tools.tune_excited_boxes",
                                description=__doc__.splitlines()[0])
    p.add_argument("--merge", nargs="+", default=None)
    p.add_argument("--out", default=None, help="checkpoint file of the best set so far")
    p.add_argument("--Z")
    p.add_argument("--state")
    p.add_argument("--size", type=int, default=200)
    p.add_argument("--evaluations", type=int, default=300)
    p.add_argument("--write", action="store_true")
    p.add_argument("--from-state", default=None)
    p.add_argument("--start", default=None)
    args = p.parse_args(argv)
    if args.merge:
        return ["--merge", *args.merge, "--out", _data_file()]
    new = ["--Z", str(args.Z), "--state", str(args.state), "--size", str(args.size),
           "--evaluations", str(args.evaluations), "--shares"]
    if args.from_state:
        new += ["--from-state", args.from_state]
    if args.start:
        new += ["--start", args.start]
    if args.out:
        new += ["--checkpoint", args.out]
    if args.write:
        new += ["--out", _data_file()]
    return new


def main(argv=None) -> int:
    return tune_boxes.main(translate(argv))


if __name__ == "__main__":
    sys.exit(main())
