"""Speed-up of a parallel sweep over Z (twoel.sweep.solve_many) on this machine's cores.

Runs the same isoelectronic sweep serially and with N worker processes, checks the energies are
bit-for-bit identical, and prints wall times and the ratio.  Usage::

    python3 benchmarks/bench_parallel.py [--Z 1:8] [--size 5] [--jobs 2] [--repeat 2]
"""

from __future__ import annotations

import argparse
import os
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from twoel.sweep import solve_many  # noqa: E402
from twoel.system import parse_charge_range  # noqa: E402


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--Z", default="1:8")
    parser.add_argument("--size", type=int, default=5)
    parser.add_argument("--jobs", type=int, default=2)
    parser.add_argument("--repeat", type=int, default=2, help="best of this many runs")
    args = parser.parse_args()
    tasks = [{"Z": z, "size": args.size} for z in parse_charge_range(args.Z)]
    solve_many(tasks[:1], jobs=1)  # warm-up: imports and integral tables

    def best(jobs):
        times, results = [], None
        for _ in range(args.repeat):
            start = time.perf_counter()
            results = solve_many(tasks, jobs=jobs)
            times.append(time.perf_counter() - start)
        return min(times), results

    serial_t, serial = best(1)
    parallel_t, parallel = best(args.jobs)
    same = all(a.energy_hartree.hex() == b.energy_hartree.hex() for a, b in zip(serial, parallel))
    load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    print(f"sweep: {len(tasks)} ions (Z = {args.Z}), hylleraas size {args.size}, "
          f"{os.cpu_count()} cores, load average {load:.1f} at start")
    print(f"serial           : {serial_t:8.2f} s")
    print(f"parallel, {args.jobs} jobs : {parallel_t:8.2f} s")
    print(f"speed-up         : {serial_t / parallel_t:8.2f} x")
    print(f"identical numbers: {'yes' if same else 'NO'}")
    return 0 if same else 1


if __name__ == "__main__":
    sys.exit(main())
