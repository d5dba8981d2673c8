"""Time the pair evaluator: Hylleraas matrices, the corrections and properties operator sets.

Run: ``python3 benchmarks/bench_pairs.py [--repeat 3] [--compare OTHER_CHECKOUT]``.  Prints the
best-of-``repeat`` seconds of

* ``build_matrices`` of the He 1¹S Hylleraas basis, ω = 8 (95 terms) and ω = 10;
* the corrections operator set (``⟨1/r1²⟩ ... ⟨p1²p2²⟩``, gradient sums over ``r1``, ``r12``) on the
  ω = 8 Hylleraas basis and on the fixed double-sector basis of the spectrum corrections;
* the properties operator set on a 150-term exponential basis and the Hamiltonian of a
  200-term 2³P basis (pair series, many distinct exponents).

With ``--compare DIR`` the same cases are timed with the twoel of another checkout (e.g. a
``main`` worktree) in a subprocess and both columns plus the ratio new/old are printed.  It
reports, it asserts nothing.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import time
import warnings


def _best(fn, repeat: int) -> float:
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def _evaluators():
    """The corrections and properties operator-set evaluators (the one pair evaluator)."""
    from twoel.integrals import pairs
    from twoel.properties import operators as corr

    specs = {n: s for n, s in corr.MULTIPLICATIVE.items() if n not in ("inv_r1", "inv_r12")}
    specs.update(corr.DERIVATIVE)
    return (lambda basis: pairs.operator_matrices(basis, specs)), pairs.operator_matrices


def measure(repeat: int) -> dict:
    warnings.simplefilter("ignore")
    from twoel.basis import get_family
    from twoel.corrections.spectrum import preset_basis
    from twoel.basis.correlated import build_matrices
    from twoel.properties.expectation import _operators
    from twoel.system import GROUND, Ion, State

    ion = Ion(2)
    hylleraas = get_family("hylleraas")
    h8 = hylleraas.build(ion, GROUND, 8, {"alpha": 2.4}, {"exponents": 1})
    h10 = hylleraas.build(ion, GROUND, 10, {"alpha": 2.4}, {"exponents": 1})
    preset = preset_basis(2, State.parse("1^1S"), "default")
    exponential = get_family("exponential")
    e150 = exponential.build(ion, GROUND, 150, {}, {})
    p200 = exponential.build(ion, State.parse("2^3P"), 200, {}, {})
    corrections, properties = _evaluators()
    ops = _operators(2.0, 1.0)
    cases = {
        f"build_matrices hylleraas ω=8 ({h8.size})": lambda: build_matrices(h8),
        f"build_matrices hylleraas ω=10 ({h10.size})": lambda: build_matrices(h10),
        f"corrections set hylleraas ω=8 ({h8.size})": lambda: corrections(h8),
        f"corrections set preset 1^1S ({preset.n_primitives})": lambda: corrections(preset),
        f"properties set exponential ({e150.size})": lambda: properties(e150, ops),
        f"hamiltonian 2^3P exponential ({p200.size})": lambda: p200.matrices(),
    }
    return {name: _best(fn, repeat) for name, fn in cases.items()}


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--compare", help="root of another checkout to time the same cases with")
    parser.add_argument("--json", action="store_true", help=argparse.SUPPRESS)
    args = parser.parse_args()
    new = measure(args.repeat)
    if args.json:
        print(json.dumps(new))
        return
    old = None
    if args.compare:
        env = dict(os.environ, PYTHONPATH=os.path.abspath(args.compare))
        out = subprocess.run([sys.executable, os.path.abspath(__file__), "--json", "--repeat", str(args.repeat)],
                             cwd=args.compare, env=env, capture_output=True, text=True, check=True)
        old = json.loads(out.stdout.strip().splitlines()[-1])
    print(f"best of {args.repeat}; seconds" + (f" (old = {args.compare})" if old else ""))
    width = max(len(name) for name in new)
    header = f"{'case':<{width}} {'new/s':>8}" + (f" {'old/s':>8} {'new/old':>8}" if old else "")
    print(header)
    for name, t in new.items():
        line = f"{name:<{width}} {t:>8.3f}"
        if old and name in old:
            line += f" {old[name]:>8.3f} {t / old[name]:>8.2f}"
        print(line)


if __name__ == "__main__":
    main()
