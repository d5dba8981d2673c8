"""Shared pieces of the property-based fuzz suite (``hypothesis``).

(A plain module, not a ``conftest.py``: ``tests/conftest.py`` already holds that name.)

Every run happens in-process (the ``run_cli`` fixture of ``tests/conftest.py``) inside a
temporary folder made for the example; a call that gets past every input check and would start
building a basis or an SCF table is stopped there by :func:`stop_before_solving` (so no real
computation starts, whatever the random arguments ask for).  The property of every run:
exit code 0, 1 or 2, no traceback, an error message of one line, nothing written outside the
temporary folder.
"""

from __future__ import annotations

import contextlib
import os
import tempfile
from pathlib import Path

from hypothesis import HealthCheck, settings

ROOT = Path(__file__).resolve().parents[2]

#: the default (fast) run: deterministic, no deadline (the first call imports the core)
FAST = settings(deadline=None, derandomize=True, database=None,
                suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow,
                                       HealthCheck.filter_too_much])


def fast(examples: int):
    return settings(FAST, max_examples=examples)


def slow(examples: int):
    """The longer run (``pytest -m slow``): more examples, still deterministic."""
    return settings(FAST, max_examples=examples)


#: generated inputs run in this session, by test module (printed at the end of the run)
COUNTS: dict[str, int] = {}


def count(kind: str, n: int = 1) -> None:
    COUNTS[kind] = COUNTS.get(kind, 0) + n


class ReachedSolving(BaseException):
    """Raised where a run would start building matrices: the input got past every check.

    A :class:`BaseException`, so no ``except Exception`` of twoel swallows it on the way out.
    """


def _stop(*_args, **_kwargs):
    raise ReachedSolving


@contextlib.contextmanager
def stop_before_solving():
    """Within: building any basis's matrices or an SCF integral table raises :class:`ReachedSolving`."""
    from twoel.basis import angular, correlated
    from twoel.integrals import hamiltonian
    from twoel.scf import hartree_fock, split_shell

    patched = [(correlated.CorrelatedBasis, "matrices"), (angular.AngularBasis, "matrices"),
               (correlated, "primitive_operator_matrices"), (hamiltonian, "hamiltonian_matrices"),
               (hartree_fock, "slater_integrals"), (split_shell, "slater_integrals")]
    saved = [(owner, name, owner.__dict__[name] if isinstance(owner, type) else getattr(owner, name))
             for owner, name in patched]
    try:
        for owner, name in patched:
            setattr(owner, name, _stop)
        yield
    finally:
        for owner, name, old in saved:
            setattr(owner, name, old)


def _listing(folder: Path) -> set[str]:
    try:
        return set(os.listdir(folder))
    except OSError:
        return set()


@contextlib.contextmanager
def sandbox():
    """A fresh temporary folder three levels deep as the current folder (so ``../..`` stays
    inside it); on the way out, checks that nothing was written above the current folder and
    that the repository gained nothing.  (The system temporary root is shared with other
    processes, so it is not compared.)"""
    before_root = _listing(ROOT)
    old = os.getcwd()
    with tempfile.TemporaryDirectory(prefix="twoel-fuzz-") as top:
        work = Path(top) / "a" / "b" / "work"
        work.mkdir(parents=True)
        os.chdir(work)
        try:
            yield work
        finally:
            os.chdir(old)
        outside = sorted(set(os.listdir(top)) - {"a"}) + sorted(set(os.listdir(Path(top) / "a")) - {"b"})
        assert not outside, f"written above the current folder: {outside}"
    new_root = _listing(ROOT) - before_root
    assert not new_root, f"written into the repository: {sorted(new_root)}"


def assert_clean_outcome(code, out: str, err: str, reached: bool = False) -> None:
    """The fuzz property of one run (``reached``: stopped where solving would start)."""
    assert "Traceback" not in err and "Traceback" not in out, err[-2000:]
    if reached:
        return
    assert code in (0, 1, 2, 4), f"exit {code}: {err[-2000:]}"
    if code == 2:
        assert err.count("\n") == 1 and err.endswith("\n"), f"not one line: {err[-2000:]!r}"
        assert len(err) < 1200, f"an error of {len(err)} characters: {err[:300]!r}"
        assert "error" in err, err
        assert "internal error" not in err, err
