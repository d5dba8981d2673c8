"""The generator's --check mode: committed generated files against a fresh regeneration.

The committed files are only read; tampering and writing happen in temporary folders."""

from __future__ import annotations

import shutil
import subprocess
import sys

import pytest

from twoel.integrals import generate

CHEAP = ["kinetic_terms", "zero_power_kernels"]


def _copy(names, folder):
    for name in names:
        shutil.copy(generate.GENERATED_FOLDER / f"{name}.py", folder / f"{name}.py")


def _snapshot(folder):
    return {path.name: path.read_bytes() for path in sorted(folder.iterdir())}


def test_check_passes_for_the_cheap_targets(capsys):
    assert generate.main(["--check", *CHEAP]) == 0
    assert "kinetic_terms.py, zero_power_kernels.py" in capsys.readouterr().out


@pytest.mark.slow
def test_check_passes_for_state_terms(capsys):
    assert generate.main(["--check", "state_terms"]) == 0
    assert "state_terms.py" in capsys.readouterr().out


def test_check_fails_on_a_tampered_copy_and_writes_nothing(tmp_path):
    _copy(CHEAP, tmp_path)
    kinetic = tmp_path / "kinetic_terms.py"
    text = kinetic.read_text()
    assert "(1/4)*(2*i1*i2" in text
    kinetic.write_text(text.replace("(1/4)*(2*i1*i2", "(1/4)*(3*i1*i2", 1))
    before = _snapshot(tmp_path)
    run = subprocess.run([sys.executable, "-m", "twoel.integrals.generate", "--check", *CHEAP,
                          "--folder", str(tmp_path)], capture_output=True, text=True, timeout=120)
    assert run.returncode == 1
    assert run.stdout == ""
    lines = run.stderr.strip().splitlines()
    assert len(lines) == 1 and "kinetic_terms.py" in lines[0]
    assert "zero_power_kernels.py" not in lines[0]  # the untouched copy is not reported
    assert _snapshot(tmp_path) == before


def test_a_missing_file_is_stale(tmp_path, capsys):
    _copy(["kinetic_terms"], tmp_path)
    assert generate.main(["--check", *CHEAP, "--folder", str(tmp_path)]) == 1
    message = capsys.readouterr().err
    assert "zero_power_kernels.py" in message and "kinetic_terms.py" not in message
    assert not (tmp_path / "zero_power_kernels.py").exists()


def test_writing_reproduces_the_committed_files(tmp_path):
    assert generate.main(CHEAP + ["--folder", str(tmp_path)]) == 0
    for name in CHEAP:
        committed = (generate.GENERATED_FOLDER / f"{name}.py").read_bytes()
        assert (tmp_path / f"{name}.py").read_bytes() == committed
    assert sorted(path.name for path in tmp_path.iterdir()) == [f"{name}.py" for name in CHEAP]


@pytest.mark.parametrize("argv, needle", [
    (["--check", "no_such_target"], "unknown target 'no_such_target'"),
    (["kinetic_terms", "--folder", "no/such/folder"], "does not exist"),
])
def test_bad_input_is_one_line_and_exit_2(argv, needle, capsys):
    assert generate.main(argv) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and needle in err[0]
