"""Solve-path speed of this checkout against an earlier revision, side by side in one run.

Usage::

    python3 benchmarks/engine_speed.py --before REV [--repeats 3] [--quick]

``REV`` is any git revision (a commit, tag or branch) of this repository.  The script checks it
out into a temporary git worktree, then times the same calls in both trees, interleaved (before,
after, before, after, ...) so that a change in machine load affects both alike.  Each timing is a
fresh Python process that imports twoel from the tree under test and times only the call (import
excluded, and after a small warm-up call of the same kind, so that modules imported on first
use are not charged to the solve); the table shows the median over the repeats, the ratio after/before and whether the
energy text is the same in both trees.

Cases (Hartree atomic units): He 1¹S with the exponential family at N = 300, 800 and 1600 in the
default precision (float64 solve + mixed-precision step + error bar), the Hylleraas family at
ω = 8, and He 2³P at N = 600.  Use ``OPENBLAS_NUM_THREADS=1`` for repeatable figures on a busy
machine.
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

CASES = {
    "He 1^1S exponential N=300": "twoel.solve(2, '1^1S', family='exponential', size=300)",
    "He 1^1S exponential N=800": "twoel.solve(2, '1^1S', family='exponential', size=800)",
    "He 1^1S exponential N=1600": "twoel.solve(2, '1^1S', family='exponential', size=1600)",
    "He 1^1S hylleraas omega=8": "twoel.solve(2, '1^1S', family='hylleraas', size=8)",
    "He 2^3P exponential N=600": "twoel.solve(2, '2^3P', family='exponential', size=600)",
}
QUICK = ("He 1^1S exponential N=300", "He 1^1S hylleraas omega=8", "He 2^3P exponential N=600")

#: a small call of the same kind, run first so that modules imported on first use (a deliberate
#: choice for start-up speed) are not charged to the timed solve
WARMUP = {
    "He 1^1S exponential N=300": "twoel.solve(2, '1^1S', family='exponential', size=40)",
    "He 1^1S exponential N=800": "twoel.solve(2, '1^1S', family='exponential', size=40)",
    "He 1^1S exponential N=1600": "twoel.solve(2, '1^1S', family='exponential', size=40)",
    "He 1^1S hylleraas omega=8": "twoel.solve(2, '1^1S', family='hylleraas', size=3)",
    "He 2^3P exponential N=600": "twoel.solve(2, '2^3P', family='exponential', size=40)",
}

CHILD = """
import json, sys, time, warnings
warnings.simplefilter("ignore")
import twoel
{warmup}
started, cpu = time.perf_counter(), time.process_time()
result = {call}
elapsed, cpu = time.perf_counter() - started, time.process_time() - cpu
text = result.energy_hartree_text or repr(result.energy_hartree)
print(json.dumps({{"seconds": elapsed, "cpu_seconds": cpu, "energy": text, "module": twoel.__file__}}))
"""


def time_case(tree: Path, name: str) -> dict:
    """Run one case in a fresh process that imports twoel from ``tree`` (after its warm-up)."""
    env = dict(os.environ, PYTHONPATH=str(tree))
    code = CHILD.format(call=CASES[name], warmup=WARMUP[name])
    done = subprocess.run([sys.executable, "-c", code], cwd=tree, env=env,
                          capture_output=True, text=True, check=False)
    if done.returncode != 0:
        tail = done.stderr.strip().splitlines()[-1:] or ["no output"]
        raise SystemExit(f"case failed in {tree}: {CASES[name]}: {tail[0]}")
    record = json.loads(done.stdout.strip().splitlines()[-1])
    if not Path(record["module"]).resolve().is_relative_to(tree.resolve()):
        raise SystemExit(f"twoel was imported from {record['module']}, not from {tree}")
    return record


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--before", required=True, help="git revision to compare with")
    parser.add_argument("--repeats", type=int, default=3, help="timings per case and tree (median)")
    parser.add_argument("--quick", action="store_true", help="only the three fast cases")
    args = parser.parse_args(argv)
    if not 1 <= args.repeats <= 20:
        parser.error("--repeats must be between 1 and 20")
    names = QUICK if args.quick else tuple(CASES)
    with tempfile.TemporaryDirectory(prefix="twoel-before-") as tmp:
        before = Path(tmp) / "tree"
        subprocess.run(["git", "-C", str(ROOT), "worktree", "add", "--detach", str(before),
                        args.before], check=True, capture_output=True)
        try:
            rev = subprocess.run(["git", "-C", str(before), "rev-parse", "--short", "HEAD"],
                                 check=True, capture_output=True, text=True).stdout.strip()
            here = subprocess.run(["git", "-C", str(ROOT), "rev-parse", "--short", "HEAD"],
                                  check=True, capture_output=True, text=True).stdout.strip()
            print(f"before: {args.before} ({rev})   after: working tree of {here}   "
                  f"OPENBLAS_NUM_THREADS={os.environ.get('OPENBLAS_NUM_THREADS', 'unset')}")
            print("seconds of CPU time of the call (robust to other load with OPENBLAS_NUM_THREADS=1)")
            print(f"{'case':30s} {'before s':>9s} {'after s':>9s} {'after/before':>12s}  same energy text")
            for name in names:
                times = {"before": [], "after": []}
                texts = {}
                for _ in range(args.repeats):
                    for label, tree in (("before", before), ("after", ROOT)):
                        record = time_case(tree, name)
                        times[label].append(record["cpu_seconds"])
                        texts[label] = record["energy"]
                t0, t1 = statistics.median(times["before"]), statistics.median(times["after"])
                same = "yes" if texts["before"] == texts["after"] else (
                    f"NO: {texts['before']} vs {texts['after']}")
                print(f"{name:30s} {t0:9.2f} {t1:9.2f} {t1 / t0:12.2f}  {same}", flush=True)
        finally:
            subprocess.run(["git", "-C", str(ROOT), "worktree", "remove", "--force", str(before)],
                           check=False, capture_output=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
