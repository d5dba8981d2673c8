"""Start-up time of the command line: median whole-process wall time of three short commands.

Each command runs as a fresh ``python -m twoel ...`` process (this checkout first on the path),
so the figure includes the interpreter, every import and the work itself.  Usage::

    python3 benchmarks/startup.py [--runs 9]
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent

COMMANDS = (
    ("twoel --help", ["--help"]),
    ("twoel --version", ["--version"]),
    ("twoel check --Z 2 --energy -2.9033 --unit hartree",
     ["check", "--Z", "2", "--energy", "-2.9033", "--unit", "hartree"]),
)


def median_time(arguments: list[str], runs: int) -> float:
    """Median wall time (s) of ``runs`` whole-process runs of ``python -m twoel ARGUMENTS``."""
    environment = dict(os.environ)
    environment["PYTHONPATH"] = os.pathsep.join(filter(None, [str(ROOT), environment.get("PYTHONPATH")]))
    times = []
    for _ in range(runs):
        started = time.perf_counter()
        done = subprocess.run([sys.executable, "-m", "twoel", *arguments], env=environment,
                              stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, check=False)
        times.append(time.perf_counter() - started)
        if done.returncode != 0:
            raise SystemExit(f"'{' '.join(arguments)}' exited with status {done.returncode}")
    return statistics.median(times)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=9, help="runs per command (default 9)")
    args = parser.parse_args()
    print(f"median of {args.runs} whole-process runs")
    for label, arguments in COMMANDS:
        print(f"{median_time(arguments, args.runs):7.3f} s  {label}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
