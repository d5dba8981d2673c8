"""Convergence of the direct and regularized correction operators with basis size (He 1¹S, 2³S).

Prints, for growing double-sector Hylleraas bases, ⟨δ(r1)⟩ and ⟨δ(r12)⟩ in direct and
regularized (global-operator) form, ⟨p1⁴+p2⁴⟩, the orbit–orbit and Araki–Sucher values, the
finite-mass energy (exact and first order) and the time taken.  Reference values: Drake,
Springer Handbook of AMO Physics (2006), ch. 11 (from memory): ⟨δ(r1)⟩ = 1.810 429 318,
⟨δ(r12)⟩ = 0.106 345 371 for 1¹S.

Run: ``python3 benchmarks/corrections_convergence.py [--state 2^3S]``
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))  # use this checkout's twoel

import numpy as np

from twoel.corrections.finite_mass import finite_mass_energy
from twoel.properties.operators import operator_values
from twoel.corrections.quadrature import quadrature_expectations
from twoel.solver.eigen import solve_generalized
from twoel.basis.correlated import CorrelatedBasis, build_matrices
from twoel.results import Wavefunction
from twoel.system import State


def omega_terms(omega):
    return [(i, j, k) for t in range(omega + 1) for k in range(t + 1) for i in range(t - k + 1)
            for j in [t - k - i]]


def sectors_basis(sectors, sign):
    powers, exps = [], []
    for omega, a, b in sectors:
        t = omega_terms(omega)
        powers += t
        exps += [(a, b, 0.0)] * len(t)
    return CorrelatedBasis(np.array(powers), np.array(exps), sign=sign)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--state", default="1^1S")
    args = parser.parse_args()
    state = State.parse(args.state)
    if state.n == 1:
        ladder = [[(w, 1.8, 2.2), (w - 2, 4.5, 6.0)] for w in (4, 6, 8, 10, 12)]
    else:
        ladder = [[(w, 2.0, 0.6), (w - 3, 2.3, 1.4)] for w in (6, 8, 10, 12)]
    print(f"He {state.label}")
    print(f"{'N':>5} {'E':>20} {'δ1 direct':>14} {'δ1 reg':>14} {'δ12 direct':>14} {'δ12 reg':>14} "
          f"{'p4':>14} {'oo':>14} {'P(1/r³)':>12} {'E_M exact-1st':>14} {'s':>6}")
    for sectors in ladder:
        t0 = time.perf_counter()
        basis = sectors_basis(sectors, state.exchange_sign)
        m = build_matrices(basis)
        eig = solve_generalized(m.hamiltonian(2.0), m.overlap)
        wf = Wavefunction(basis, eig.vectors[:, state.root])
        mats = {}
        v = operator_values(wf, 2.0, float(eig.values[state.root]), matrices_out=mats)
        q = quadrature_expectations(wf, 40, delta_r12=v.delta_r12_direct if state.is_singlet else 0.0)
        fm = finite_mass_energy(basis, 2.0, 7294.2995365, state.root, v.energy, v.p1_dot_p2,
                                system=mats["system"], p12_matrix=mats["p1_dot_p2"])
        print(f"{basis.size:>5} {v.energy:>20.13f} {v.delta_r1_direct:>14.10f} {v.delta_r1_regularized:>14.10f} "
              f"{v.delta_r12_direct:>14.10f} {v.delta_r12_regularized:>14.10f} {v.p4_sum:>14.8f} "
              f"{q['orbit_orbit']:>14.10f} {q['araki_sucher']:>12.8f} {fm.second_order:>14.4e} "
              f"{time.perf_counter() - t0:>6.1f}", flush=True)


if __name__ == "__main__":
    main()
