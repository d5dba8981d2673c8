"""Time the Hylleraas pipeline pieces for ω = 4..10 (He 1¹S) and the Z = 1..10 series.

Run: ``python3 benchmarks/bench_core.py [--omegas 4:10] [--repeat 3]``.  Prints, per ω, the
number of functions, the time of one matrix build, one eigen-solve and a full optimization
(with its number of energy evaluations), the energy error against Schwartz (2006), and the
ratio of build to solve time.  Nothing here is asserted: it reports.
"""

from __future__ import annotations

import argparse
import time
import warnings

import numpy as np

import twoel
from twoel.basis import get_family
from twoel.solver.eigen import solve_generalized
from twoel.system import GROUND, Ion

HE_EXACT = -2.903724377034119598  # Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)


def best_time(fn, repeat):
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t)
    return min(times), out


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--omegas", default="4:10")
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--exponents", type=int, default=1, choices=(1, 2))
    args = parser.parse_args()
    first, last = (int(x) for x in args.omegas.split(":"))
    warnings.simplefilter("ignore")
    family = get_family("hylleraas")
    ion = Ion(2)
    print(f"He 1^1S, hylleraas, {args.exponents} exponent(s); best of {args.repeat}")
    print(f"{'ω':>3} {'N':>5} {'build/s':>9} {'solve/s':>9} {'build:solve':>11} {'optimize/s':>11} {'evals':>6} {'E - E_exact':>12}")
    for omega in range(first, last + 1):
        options = {"exponents": args.exponents}
        values = {"alpha": 2.4} if args.exponents == 1 else {"alpha": 2.1, "beta": 3.0}
        basis = family.build(ion, GROUND, omega, values, options)
        t_build, m = best_time(basis.matrices, args.repeat)
        H = m.hamiltonian(2.0)
        t_solve, _ = best_time(lambda: solve_generalized(H, m.overlap), args.repeat)
        t = time.perf_counter()
        r = twoel.solve(2, family="hylleraas", size=omega, options=options)
        t_opt = time.perf_counter() - t
        print(f"{omega:>3} {basis.size:>5} {t_build:>9.4f} {t_solve:>9.4f} {t_build / t_solve:>11.1f} "
              f"{t_opt:>11.2f} {r.optimizer['n_evaluations']:>6} {r.energy_hartree - HE_EXACT:>12.3e}")
    t = time.perf_counter()
    for Z in range(1, 11):
        twoel.solve(Z, family="hylleraas", size=6)
    print(f"series Z = 1..10, hylleraas ω = 6 (default exponents): {time.perf_counter() - t:.1f} s")


if __name__ == "__main__":
    main()
