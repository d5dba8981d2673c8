"""Build time, solve time and error of He 1^1S in the exponential basis, float64 and extended.

Run from the repository root:  ``python3 benchmarks/bench_precision.py [--sizes 200,400,800,1600]
[--skip-extended-above 1600] [--digits 20] [--full-run 2263]``.  Reference: C. Schwartz, Int. J. Mod. Phys. E 15,
877 (2006).  OpenBLAS is limited to one thread (set before NumPy loads): on a shared 2-core
machine its threads fight other processes and make dense eigen-solves ~10x slower.
"""

import os

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

import argparse  # noqa: E402
import sys  # noqa: E402
import time  # noqa: E402
from pathlib import Path  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

import mpmath  # noqa: E402

REFERENCE = "-2.903724377034119598311159245194404"


def error_of(text: str) -> float:
    with mpmath.workdps(50):
        return float(mpmath.mpf(text) - mpmath.mpf(REFERENCE))


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", default="200,400,800,1600")
    parser.add_argument("--digits", type=int, default=20)
    parser.add_argument("--skip-extended-above", type=int, default=1600)
    parser.add_argument("--full-run", type=int, default=0, metavar="N",
                        help="also time the whole extended solve of size N with its error bar "
                             "(2263 gives 18 digits)")
    args = parser.parse_args()
    sizes = [int(x) for x in args.sizes.split(",")]

    import numpy as np

    from twoel.solver import refine as precision
    from twoel.basis import get_family
    from twoel.solver.eigen import solve_generalized
    from twoel.system import Ion, State

    fam = get_family("exponential")
    ion, state = Ion(2), State.parse("1^1S")
    values = {p.name: p.initial for p in fam.parameters(ion, state, None, {})}
    print(f"He 1^1S, exponential family, stored boxes; reference {REFERENCE} (Schwartz 2006)")
    print(f"{'N':>5} {'mode':<9} {'build/s':>8} {'solve/s':>8} {'total/s':>8} {'E - E_ref':>11} "
          f"{'digits':>6} {'bits':>5}")
    for n in sizes:
        t0 = time.perf_counter()
        basis = fam.build(ion, state, n, values, {})
        m = basis.matrices()
        t1 = time.perf_counter()
        eig = solve_generalized(m.hamiltonian(2.0), m.overlap)
        t2 = time.perf_counter()
        e64 = float(eig.values[0])
        err = e64 - float(REFERENCE)
        print(f"{n:>5} {'float64':<9} {t1 - t0:8.3f} {t2 - t1:8.3f} {t2 - t0:8.3f} {err:11.2e} "
              f"{-np.log10(abs(err) / 2.9037):6.1f} {53:>5}")
        mixed = precision.mixed_refine(basis.exponents, 1, 2.0, eig, 0)
        t3 = time.perf_counter()
        err = error_of(mixed.text)
        print(f"{n:>5} {'mixed':<9} {t1 - t0 + mixed.seconds['assembly']:8.3f} "
              f"{t2 - t1 + mixed.seconds['solve']:8.3f} {t3 - t0:8.3f} {err:11.2e} "
              f"{-np.log10(abs(err) / 2.9037):6.1f} {mixed.working_bits:>5}")
        if n > args.skip_extended_above:
            continue
        start = precision.starting_condition_digits(n, eig.condition_number, eig.n_dropped,
                                                    mixed.lost_digits)
        ext = precision.extended_refine(basis.exponents, 1, 2.0, mixed.energy_hartree, mixed.vector,
                                        args.digits, start)
        t4 = time.perf_counter()
        err = error_of(ext.text)
        print(f"{n:>5} {'extended':<9} {t1 - t0 + ext.seconds['assembly']:8.3f} "
              f"{t2 - t1 + mixed.seconds['solve'] + mixed.seconds['assembly'] + ext.seconds['solve']:8.3f} "
              f"{t4 - t0:8.3f} {err:11.2e} {-np.log10(abs(err) / 2.9037):6.1f} {ext.working_bits:>5}",
              flush=True)
    if args.full_run:
        full_run(args.full_run, args.digits)
    return 0


def full_run(size: int, digits: int) -> None:
    """The whole ``twoel energy --precision extended`` of one size: energy and its error bar."""
    import numpy as np

    import twoel
    from twoel.analysis.convergence import trusted_digits

    print(f"\nwhole solve, N = {size}, extended precision, digits = {digits}, with the error bar "
          "(nested N/2, N/√2):")
    t0 = time.perf_counter()
    r = twoel.solve(2, "1^1S", "exponential", size, precision="extended", digits=digits)
    seconds = time.perf_counter() - t0
    err = error_of(r.provenance["energy_full_text"])
    print(f"  {seconds:.0f} s wall; E = {r.energy_hartree_text}; E - E_ref = {err:.2e} "
          f"({-np.log10(abs(err) / 2.9037):.1f} digits); error bar {r.error_bar_hartree:.2e} "
          f"= {r.error_bar_hartree / err:.1f} x the true error; digits claimed "
          f"{trusted_digits(r.energy_hartree, r.error_bar_hartree)}")


if __name__ == "__main__":
    sys.exit(main())
