"""Shared test configuration: no display for plots, warnings of twoel visible but not fatal."""

import os

os.environ.setdefault("MPLBACKEND", "Agg")

import pytest


@pytest.fixture
def run_cli(capsys):
    """``run_cli(*argv)`` runs ``twoel argv...`` in-process: ``(exit code, stdout, stderr)``."""
    from twoel.cli import main

    def run(*argv):
        try:
            code = main(list(argv))
        except SystemExit as exc:
            code = exc.code
        out, err = capsys.readouterr()
        return code, out, err

    return run
