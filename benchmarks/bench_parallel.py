"""Speed-up of a parallel sweep over Z (twoel.analysis.sweep.solve_many) on this machine's cores.

Runs the same isoelectronic sweep serially and with N worker processes, checks that the energies
are bit-for-bit identical, and prints wall times and the ratio.  Both runs use one BLAS thread
per process (``OPENBLAS_NUM_THREADS=1`` is set here before numpy is imported, unless the
environment already sets it), so the ratio measures process parallelism alone.  For information
it also times the serial sweep in a child process with the BLAS default (one thread per core),
which for these small matrices is slower on a busy machine.  Usage::

    python3 benchmarks/bench_parallel.py [--Z 1:8] [--size 5] [--jobs 2] [--repeat 2] [--no-default]
"""

from __future__ import annotations

import os

for _name in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_name, "1")

import argparse  # noqa: E402
import json  # noqa: E402
import subprocess  # noqa: E402
import sys  # noqa: E402
import time  # noqa: E402
from pathlib import Path  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from twoel.analysis.sweep import solve_many  # noqa: E402
from twoel.system import parse_charge_range  # noqa: E402


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--Z", default="1:8")
    parser.add_argument("--size", type=int, default=5)
    parser.add_argument("--jobs", type=int, default=2)
    parser.add_argument("--repeat", type=int, default=2, help="best of this many runs")
    parser.add_argument("--no-default", action="store_true", help="skip the default-BLAS-threads run")
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
    parallel_t, parallel = best(args.jobs)
    same = all(a.energy_hartree.hex() == b.energy_hartree.hex() for a, b in zip(serial, parallel))
    print(f"sweep: {len(tasks)} ions (Z = {args.Z}), hylleraas size {args.size}, {os.cpu_count()} cores, "
          f"load average {load:.1f} at start, best of {args.repeat}, "
          f"OPENBLAS_NUM_THREADS={os.environ['OPENBLAS_NUM_THREADS']}")
    print(f"serial                 : {serial_t:8.2f} s")
    print(f"parallel, {args.jobs} jobs        : {parallel_t:8.2f} s")
    print(f"speed-up               : {serial_t / parallel_t:8.2f} x")
    print(f"identical numbers      : {'yes' if same else 'NO'}")
    if not args.no_default:
        env = {k: v for k, v in os.environ.items()
               if k not in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS")}
        child = subprocess.run([sys.executable, __file__, "--child", "--Z", args.Z, "--size", str(args.size),
                                "--repeat", str(args.repeat)], env=env, capture_output=True, text=True,
                               check=True)
        other = json.loads(child.stdout.strip().splitlines()[-1])
        same_default = [a.energy_hartree.hex() for a in serial] == other["energies"]
        print(f"serial, default BLAS   : {other['seconds']:8.2f} s "
              f"(same bits as 1 thread: {'yes' if same_default else 'no'})")
    return 0 if same else 1


if __name__ == "__main__":
    sys.exit(main())
