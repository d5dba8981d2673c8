"""Speed-up of a parallel sweep over Z (twoel.sweep.solve_many) on this machine's cores.

Runs the same isoelectronic sweep serially and with N worker processes, checks the energies are
bit-for-bit identical, and prints wall times and the ratio.  Workers always run with one BLAS
thread; the serial run is measured both with this process's BLAS threads as they are (what a
plain serial ``twoel`` run gets) and in a child process with one BLAS thread (like with like).
Usage::

    python3 benchmarks/bench_parallel.py [--Z 1:8] [--size 5] [--jobs 2] [--repeat 2]
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
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
    parser.add_argument("--child", action="store_true", help=argparse.SUPPRESS)
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

    if args.child:
        t, results = best(1)
        print(json.dumps({"seconds": t, "energies": [r.energy_hartree.hex() for r in results]}))
        return 0
    load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    serial_t, serial = best(1)
    env = {**os.environ, "OPENBLAS_NUM_THREADS": "1", "OMP_NUM_THREADS": "1", "MKL_NUM_THREADS": "1"}
    child = subprocess.run([sys.executable, __file__, "--child", "--Z", args.Z, "--size", str(args.size),
                            "--repeat", str(args.repeat)], env=env, capture_output=True, text=True, check=True)
    one = json.loads(child.stdout.strip().splitlines()[-1])
    parallel_t, parallel = best(args.jobs)
    same = all(a.energy_hartree.hex() == b.energy_hartree.hex() == c
               for a, b, c in zip(serial, parallel, one["energies"]))
    print(f"sweep: {len(tasks)} ions (Z = {args.Z}), hylleraas size {args.size}, "
          f"{os.cpu_count()} cores, load average {load:.1f} at start, best of {args.repeat}")
    print(f"serial, default BLAS threads : {serial_t:8.2f} s")
    print(f"serial, 1 BLAS thread        : {one['seconds']:8.2f} s")
    print(f"parallel, {args.jobs} jobs              : {parallel_t:8.2f} s")
    print(f"speed-up vs serial 1 thread  : {one['seconds'] / parallel_t:8.2f} x")
    print(f"speed-up vs serial default   : {serial_t / parallel_t:8.2f} x")
    print(f"identical numbers (all three): {'yes' if same else 'NO'}")
    return 0 if same else 1


if __name__ == "__main__":
    sys.exit(main())
