"""Restricted Hartree-Fock limits for Z = 1..10 with timings (prints a table; not a test).

Run from the checkout root:  python3 benchmarks/hf_limits.py [max_size]
The numbers in data/hartree_fock_limits.csv marked "computed by twoel" come from this script.
"""

import sys
import time

from twoel.scf.hartree_fock import hartree_fock_limit

max_size = int(sys.argv[1]) if len(sys.argv) > 1 else 16
sizes = (1, 2) + tuple(range(4, max_size + 1, 2))
print(f"sizes {sizes}")
print("Z  E_HF (largest basis) / Eh    last change / Eh   eps_1s / Eh          virial-2     seconds")
for Z in range(1, 11):
    started = time.perf_counter()
    r = hartree_fock_limit(Z, sizes=sizes)
    seconds = time.perf_counter() - started
    changes = [s.change_hartree for s in r.convergence[-3:]]
    print(f"{Z:<2d} {r.energy_hartree!r} (N={r.size})  {r.estimated_error_hartree:9.1e}  "
          f"{r.orbital_energy_hartree:.10f}  {r.virial_ratio - 2:+.1e}  {seconds:6.1f}  "
          f"last changes {', '.join(f'{c:+.1e}' for c in changes)}", flush=True)
