"""Very small nuclear charges: refused in one line below the documented bound, "not bound" above it.

Two electrons are bound only above the critical charge Z_c ≈ 0.911 (Estienne, Busuttil, Moini
and Drake, Phys. Rev. Lett. 112, 173001 (2014), from memory), so every charge used here lies
well below it and a correct answer is "not bound".
"""

from __future__ import annotations

import time

import pytest

from twoel.basis.exponential_boxes import MIN_CHARGE
from twoel.errors import InputError




@pytest.mark.parametrize("Z, state", [("1e-6", "1^1S"), ("1e-6", "2^3S"), ("1e-6", "2^1P"),
                                      ("0.0009", "1^1S")])
def test_exponential_refuses_charges_below_the_bound(run_cli, Z, state):
    start = time.perf_counter()
    code, out, err = run_cli("energy", "--Z", Z, "--family", "exponential", "--size", "40",
                         "--state", state)
    assert code == 2, err
    assert out == "" and err.startswith("twoel: error: ") and err.count("\n") == 1
    assert "Traceback" not in err and f"Z >= {MIN_CHARGE:g}" in err
    assert time.perf_counter() - start < 2.0  # before any basis is built


def test_api_raises_the_input_error():
    from twoel import solve

    with pytest.raises(InputError, match="exponential family needs Z"):
        solve(1e-6, "1^1S", family="exponential", size=40)


@pytest.mark.parametrize("Z", [MIN_CHARGE, 0.05, 0.3])
def test_exponential_small_charges_are_not_bound(Z):
    from twoel import solve

    result = solve(Z, "1^1S", family="exponential", size=40)
    assert not result.bound
    # the variational energy cannot lie below the exact one, itself >= -Z² (two bare 1s electrons)
    assert result.energy_hartree >= -Z ** 2


def test_an_unbound_hylleraas_search_stops_early():
    """Below the critical charge (~0.911, Estienne et al., Phys. Rev. Lett. 112, 173001 (2014),
    from memory) the energy only creeps towards -Z²/2: the search stops and says so."""
    import warnings

    import twoel

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        r = twoel.solve(0.3, family="hylleraas", size=8)
    assert not r.bound and r.energy_hartree > -0.3**2 / 2
    assert r.optimizer["method"] == "stopped early" and r.optimizer["n_evaluations"] < 400
    assert "does not bind" in r.optimizer["message"]
