"""Options that contradict each other are refused in one line (exit 2) before any work."""

from __future__ import annotations

import json
import time

import pytest
from scipy.constants import physical_constants





def refused_naming(code, out, err, *options):
    assert code == 2, err
    assert out == ""
    assert err.startswith("twoel: error: ") and err.count("\n") == 1 and "Traceback" not in err
    for option in options:
        assert option in err, (option, err)


@pytest.mark.parametrize("extra, other", [(["--family", "exponential"], "--family"),
                                          (["--size", "3"], "--size")])
def test_properties_preset_with_family_or_size(run_cli, extra, other):
    start = time.perf_counter()
    code, out, err = run_cli("properties", "--Z", "2", "--hylleraas-preset", "fast", *extra)
    refused_naming(code, out, err, "--hylleraas-preset", other)
    assert time.perf_counter() - start < 2.0  # refused before the preset basis is solved


@pytest.mark.parametrize("fmt", ["markdown", "csv", "latex"])
def test_series_json_with_another_format(run_cli, fmt):
    code, out, err = run_cli("series", "--Z", "1:3", "--family", "screened", "--json", "--format", fmt)
    refused_naming(code, out, err, "--json", "--format")


def test_series_json_agrees_with_format_json(run_cli):
    # the screened 1s² product has the closed form E = -(Z - 5/16)² (Kellner 1927)
    code, out, _ = run_cli("series", "--Z", "2", "--family", "screened", "--json", "--format", "json")
    assert code == 0
    rows = json.loads(out)
    rows = rows["rows"] if isinstance(rows, dict) else rows
    assert rows[0]["energy_hartree"] == pytest.approx(-(2 - 5 / 16) ** 2, abs=1e-8)


@pytest.mark.parametrize("unit", ["u", "me"])
def test_spectrum_mass_unit_without_nuclear_mass(run_cli, unit):
    code, out, err = run_cli("spectrum", "--Z", "2", "--mass-unit", unit)
    refused_naming(code, out, err, "--mass-unit", "--nuclear-mass")
    code, out, err = run_cli("spectrum", "--Z", "2", "--isotope", "4", "--mass-unit", unit)
    refused_naming(code, out, err, "--mass-unit", "--nuclear-mass")


def test_spectrum_mass_unit_with_nuclear_mass_is_the_unit(run_cli):
    # the same alpha-particle mass in u and in electron masses (CODATA) gives the same M / m_e
    alpha_me = physical_constants["alpha particle-electron mass ratio"][0]
    alpha_u = physical_constants["alpha particle mass in u"][0]
    masses = []
    for value, unit in ((alpha_u, "u"), (alpha_me, "me")):
        code, out, err = run_cli("spectrum", "--Z", "2", "--quality", "fast", "--json",
                             "--nuclear-mass", repr(value), "--mass-unit", unit)
        assert code == 0, err
        masses.append(json.loads(out)["nuclear_mass_me"])
    assert masses[0] == pytest.approx(alpha_me, rel=1e-9)
    assert masses[1] == pytest.approx(alpha_me, rel=1e-12)


@pytest.mark.parametrize("family", ["screened", "hydrogenic", "open-shell"])
def test_spectrum_refuses_uncorrelated_families(run_cli, family):
    start = time.perf_counter()
    code, out, err = run_cli("spectrum", "--Z", "2", "--family", family)
    refused_naming(code, out, err, "--family", family, "correlated")
    assert time.perf_counter() - start < 2.0  # before any solve


def test_spectrum_unknown_family_is_one_line(run_cli):
    code, out, err = run_cli("spectrum", "--Z", "2", "--family", "nosuch")
    refused_naming(code, out, err, "nosuch")
