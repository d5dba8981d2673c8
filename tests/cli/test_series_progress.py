"""``twoel series`` reports each finished row on stderr, unless --quiet or JSON output.

Check values: one screened 1s² product gives E = -(Z - 5/16)² Eh (closed form).
"""

import json

import pytest

from twoel.cli import main


def test_series_counts_rows_on_stderr(capsys):
    assert main(["series", "--Z", "2:4", "--family", "screened", "--format", "csv"]) == 0
    captured = capsys.readouterr()
    assert captured.err.splitlines() == ["series: row 1/3", "series: row 2/3", "series: row 3/3"]
    assert len(captured.out.strip().splitlines()) == 4  # header and three rows, progress kept out


@pytest.mark.parametrize("extra", [["--quiet"], ["--json"], ["--format", "json"]])
def test_series_progress_off(capsys, extra):
    assert main(["series", "--Z", "2,3", "--family", "screened", *extra]) == 0
    captured = capsys.readouterr()
    assert captured.err == ""
    if extra != ["--quiet"]:
        rows = json.loads(captured.out)
        assert rows[1]["energy_hartree"] == pytest.approx(-(3 - 5 / 16) ** 2, abs=1e-11)
