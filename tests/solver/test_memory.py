"""The memory estimate refuses, before any matrix is built, a solve larger than the memory at hand."""

from __future__ import annotations

import time

import pytest

from twoel.errors import ResourceError
from twoel.solver import memory


def test_the_estimate_counts_n_squared_entries():
    assert memory.matrix_bytes(1000, 3) == 3 * 1000 * 1000 * 8
    assert memory.solve_bytes(1000) == 1000**2 * memory.FLOAT64_BYTES_PER_ENTRY
    assert memory.solve_bytes(1000, "extended") == 1000**2 * (memory.FLOAT64_BYTES_PER_ENTRY
                                                              + memory.EXTENDED_BYTES_PER_ENTRY)
    assert memory.solve_bytes(2000) == 4 * memory.solve_bytes(1000)


def test_available_memory_is_read_from_meminfo(tmp_path):
    info = tmp_path / "meminfo"
    info.write_text("MemTotal:       24683568 kB\nMemFree:  1 kB\nMemAvailable:   2048 kB\n")
    assert memory.available_bytes(str(info)) == 2048 * 1024
    # no file: the fallback (free physical pages) or None; never an exception
    fallback = memory.available_bytes(str(tmp_path / "missing"))
    assert fallback is None or fallback > 0
    info.write_text("MemAvailable: lots\n")
    junk = memory.available_bytes(str(info))             # unreadable: the fallback as well
    assert (junk is None) == (fallback is None)


def test_unknown_available_memory_skips_the_check(monkeypatch):
    monkeypatch.setattr(memory, "available_bytes", lambda *a: None)
    memory.check_memory(10**6)          # nothing to compare with: no refusal


def _little_memory(monkeypatch, available=50 * 2**20):
    monkeypatch.setattr(memory, "available_bytes", lambda *a: available)

    def never(*_args, **_kwargs):
        raise AssertionError("matrices were built before the memory check")

    from twoel.basis import correlated
    monkeypatch.setattr(correlated, "primitive_operator_matrices", never)


def test_the_command_line_refuses_before_building(run_cli, monkeypatch):
    _little_memory(monkeypatch)
    start = time.perf_counter()
    code, out, err = run_cli("energy", "--Z", "2", "--family", "exponential", "--size", "3000")
    assert code == 2 and out == "" and err.count("\n") == 1, err
    # 3000² entries × 400 bytes = 3.6e9 bytes = 3.4 GiB; 50 MiB available
    assert "3000 basis functions needs about 3.4 GiB" in err and "only 50 MiB is available" in err
    assert time.perf_counter() - start < 3.0


def test_the_api_and_the_report_checks_refuse_too(monkeypatch, tmp_path):
    from twoel import solve
    from twoel.report import build
    from twoel.solver.pipeline import check_inputs

    _little_memory(monkeypatch)
    with pytest.raises(ResourceError, match="extended solve with 2000 basis functions"):
        check_inputs(2, "1^1S", family="exponential", size=2000, precision="extended")
    with pytest.raises(ResourceError, match="available"):
        solve(2, family="exponential", size=1000)
    with pytest.raises(ResourceError, match="available"):
        build.build_report({"name": "big", "levels": {"Z": 2, "family": "exponential",
                                                      "states": [{"state": "1^1S", "size": 3000}]}},
                           tmp_path / "big")
    assert list(tmp_path.iterdir()) == []


def test_small_solves_pass_with_the_real_memory():
    from twoel.solver.pipeline import check_inputs

    check_inputs(2, "1^1S", family="hylleraas", size=4)
    check_inputs(2, "1^1S", family="exponential", size=100, precision="extended")
