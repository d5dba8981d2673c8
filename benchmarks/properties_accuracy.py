"""Properties with uncertainties: value, bar, true error against published values, |error|/bar.

He 1¹S at the default basis (nested two-scale Hylleraas) and with the exponential family at
N = 300 and 600; He 2³S ⟨δ³(r12)⟩ (exactly 0).  Published values: G. W. F. Drake, Springer
Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11 (from memory).

Run: OPENBLAS_NUM_THREADS=1 PYTHONPATH=. python benchmarks/properties_accuracy.py
"""

import resource
import time

from twoel.properties.nested import properties_with_uncertainties

PUBLISHED = {"inv_r1_squared": 6.017408867, "delta_r1_regularized": 1.810429318,
             "delta_r1": 1.810429318, "delta_r12_regularized": 0.106345371, "delta_r12": 0.106345371}


def main():
    runs = [("default", {}), ("exponential N=300", {"family": "exponential", "size": 300}),
            ("exponential N=600", {"family": "exponential", "size": 600})]
    print(f"{'basis':20s} {'quantity':22s} {'value':>16s} {'bar':>9s} {'error':>10s} {'|err|/bar':>9s} reliable")
    for label, kw in runs:
        start = time.process_time()
        r = properties_with_uncertainties(2, "1^1S", **kw)
        for name, ref in PUBLISHED.items():
            b = r.bars[name]
            err = b.value - ref
            print(f"{label:20s} {name:22s} {b.value:16.10f} {b.uncertainty:9.1e} {err:10.1e} "
                  f"{abs(err) / b.uncertainty:9.2f} {b.reliable}")
        print(f"{label:20s} sizes {r.sizes}, {time.process_time() - start:.0f} s CPU")
    r = properties_with_uncertainties(2, "2^3S")
    for name in ("delta_r12", "delta_r12_regularized"):
        b = r.bars[name]
        print(f"{'2^3S default':20s} {name:22s} {b.value:16.10f} {b.uncertainty:9.1e} (exact 0) {b.note[:40]}")
    print(f"peak memory {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.0f} MB")


if __name__ == "__main__":
    main()
