"""The failures the fuzz suite found (and neighbours of them), kept as plain regression tests."""

from __future__ import annotations

import os

import pytest


def one_line(code, err):
    assert code == 2, err
    assert err.count("\n") == 1 and "Traceback" not in err and len(err) < 1200, err[:300]


@pytest.mark.parametrize("option", [("check", "--file"), ("report", "--config"),
                                    ("report", "--from-provenance")])
def test_a_file_name_too_long_for_the_system_is_one_line(run_cli, tmp_path, monkeypatch, option):
    monkeypatch.chdir(tmp_path)
    code, _, err = run_cli(*option, "1" * 300)          # was: internal error, OSError ENAMETOOLONG
    one_line(code, err)
    assert "File name too long" in err


@pytest.mark.parametrize("option", [("check", "--file"), ("report", "--config"),
                                    ("report", "--from-provenance")])
def test_a_fifo_is_refused_before_it_is_opened(run_cli, tmp_path, option):
    fifo = tmp_path / "pipe.json"
    os.mkfifo(fifo)                                     # opening it would block forever
    code, _, err = run_cli(*option, str(fifo))
    one_line(code, err)
    assert "FIFO" in err


def test_configuration_that_is_not_utf8_or_nested_too_deeply(run_cli, tmp_path):
    latin = tmp_path / "latin.toml"
    latin.write_bytes('name = "M\xf8ller"\n'.encode("latin-1"))
    deep = tmp_path / "deep.toml"
    deep.write_text("series = {Z = " + "[" * 100_000 + "]" * 100_000 + "}\n")
    deep_json = tmp_path / "deep.json"
    deep_json.write_text('{"series": {"Z": ' + "[" * 100_000 + "]" * 100_000 + "}}")
    for path, words in ((latin, "not UTF-8"), (deep, "nested too deeply"), (deep_json, "nested too deeply")):
        code, _, err = run_cli("report", "--config", str(path), "--out", str(tmp_path / "r"))
        one_line(code, err)
        assert words in err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["deep.json", "deep.toml", "latin.toml"]


def test_a_huge_cell_is_not_echoed_whole(run_cli, tmp_path):
    rows = tmp_path / "rows.csv"
    rows.write_text("Z,energy,unit\n2,-2.9," + "x" * 70_000 + "\n")    # was a 70 kB error line
    code, _, err = run_cli("check", "--file", str(rows))
    one_line(code, err)
    assert "unknown energy unit" in err
