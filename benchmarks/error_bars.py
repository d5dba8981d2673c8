"""Error bars against true errors: does the bar that twoel states cover the error, and how loosely?

Usage::

    OPENBLAS_NUM_THREADS=1 python3 benchmarks/error_bars.py [--quick] [--precision float64|extended|both]

For He, H⁻ and Li⁺ 1¹S and He 2¹S, 2³S, 2¹P and 2³P, at four basis sizes each, the script solves
with the exponential family (through :func:`twoel.solve`) and prints the true error
(against the published value of ``data/reference_energies.csv``, whose source the table names),
the stated error bar, their ratio and the ``reliable`` flag.  Where the true error is below twice the
published value's own uncertainty, the reference cannot judge the bar and the row says so.  A bar is honest when
``1 <= bar / true error <= 30``, or when the result says ``reliable: false``; the last column
says ``ok`` or ``NOT OK``.  States that get no bar in a precision say so.
"""

from __future__ import annotations

import argparse
import sys
import time
import warnings
from pathlib import Path

import mpmath

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))  # use this checkout's twoel
import twoel  # noqa: E402
from twoel.reference import lookup  # noqa: E402

CASES = [  # (Z, state, sizes)
    (2, "1^1S", (200, 400, 800, 1600)),
    (1, "1^1S", (200, 400, 800, 1200)),
    (3, "1^1S", (200, 400, 800, 1200)),
    (2, "2^1S", (200, 400, 600, 800)),
    (2, "2^3S", (200, 400, 600, 800)),
    (2, "2^1P", (300, 600, 1000, 1200)),
    (2, "2^3P", (300, 600, 1000, 1200)),
]
QUICK_SIZES = 2  # --quick: the two smallest sizes of each case
LOWER, UPPER = 1.0, 30.0


def row(Z, state, size, precision) -> dict:
    reference = lookup(Z, state)
    started = time.perf_counter()
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            result = twoel.solve(Z, state, family="exponential", size=size, precision=precision)
        except twoel.TwoelError as error:
            return {"skip": str(error).splitlines()[0]}
    seconds = time.perf_counter() - started
    mpmath.mp.dps = 50
    value = mpmath.mpf(result.energy_full_text)  # the full value, not the printed digits
    true = float(value - mpmath.mpf(reference.value_text))
    bar = result.error_bar_hartree
    reliable = result.reliable is not False
    known = abs(true) > 2.0 * reference.uncertainty  # else the reference cannot judge the bar
    ratio = bar / abs(true) if bar and true and known else None
    honest = (bar is not None and (not known or bar >= abs(true)) and (ratio is None or ratio <= UPPER)) \
        or not reliable
    note = (result.provenance.get("error_bar") or {}).get("note", "")
    return {"true": true, "bar": bar, "ratio": ratio, "reliable": reliable, "honest": honest, "known": known,
            "seconds": seconds, "source": reference.source.split(",")[0], "note": note}


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--quick", action="store_true", help="only the two smallest sizes per case")
    parser.add_argument("--precision", choices=("float64", "extended", "both"), default="both")
    args = parser.parse_args(argv)
    precisions = ("float64", "extended") if args.precision == "both" else (args.precision,)
    print(f"{'Z':>2} {'state':5} {'N':>5} {'precision':9} {'true error':>11} {'bar':>9} "
          f"{'bar/true':>9} {'reliable':8} {'s':>6}  verdict")
    bad = 0
    for Z, state, sizes in CASES:
        for size in (sizes[:QUICK_SIZES] if args.quick else sizes):
            for precision in precisions:
                r = row(Z, state, size, precision)
                if "skip" in r:
                    print(f"{Z:>2} {state:5} {size:>5} {precision:9} {'':>11} {'':>9} {'':>9} "
                          f"{'':8} {'':>6}  no result: {r['skip']}")
                    continue
                bar = "none" if r["bar"] is None else f"{r['bar']:.1e}"
                ratio = "" if r["ratio"] is None else f"{r['ratio']:.1f}"
                verdict = ("ok" if r["honest"] else "NOT OK") + ("" if r["known"] else
                                                                 " (true error below the reference's uncertainty)")
                if not r["reliable"]:
                    verdict += f"; reliable: false because {r['note'] or 'the result says so'}"
                bad += not r["honest"]
                print(f"{Z:>2} {state:5} {size:>5} {precision:9} {r['true']:11.1e} {bar:>9} {ratio:>9} "
                      f"{str(r['reliable']):8} {r['seconds']:6.1f}  {verdict}", flush=True)
    print(f"references: data/reference_energies.csv (sources named there); {bad} rows not honest")
    return 0


if __name__ == "__main__":
    sys.exit(main())
