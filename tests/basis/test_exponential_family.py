"""Exponential family: generated closed forms, fast builder, quasi-random boxes, stored data."""

import json
import math

import numpy as np
import pytest

import twoel
from twoel.basis import exponential, exponential_boxes, get_family
from twoel.errors import InputError, UnsupportedError
from twoel.integrals import zero_power
from twoel.integrals.kernels import integral
from twoel.integrals.pairs import primitive_matrices
from twoel.basis.correlated import HAMILTONIAN_OPERATORS, CorrelatedBasis, operator_matrices, primitive_operator_matrices
from twoel.system import Ion, State

# C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006)
HE_GROUND = -2.903724377034119598311159
# G. W. F. Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11 (from memory)
HE_2_3S = -2.175229378236791


@pytest.mark.parametrize("shift", [(0, 0, 0), (-1, 0, 0), (0, 0, -1), (1, 0, 0), (0, 0, 2)])
def test_inverse_sum_forms_match_table_kernel(shift):
    # the polynomial in 1/A, 1/B, 1/C against the independent series-based kernel
    from twoel.integrals.generated import zero_power_kernels as _exponential

    al, be, ga = 1.3, 0.7, 0.45
    a, b, c = 1 / (al + be), 1 / (be + ga), 1 / (ga + al)
    value = 16 * math.pi**2 * _exponential.MONOMIALS[shift](a, b, c)
    assert value == pytest.approx(integral(*shift, al, be, ga), rel=1e-14)


def _random_basis(P, sign, seed=3):
    rng = np.random.default_rng(seed)
    E = np.column_stack([rng.uniform(0.2, 3, P), rng.uniform(0.1, 2, P), rng.uniform(0, 1, P)])
    return CorrelatedBasis(np.zeros((P, 3), int), E, sign=sign)


@pytest.mark.parametrize("sign", [1, -1])
def test_fast_path_agrees_with_generic(sign):
    basis = _random_basis(25, sign)
    ops = dict(HAMILTONIAN_OPERATORS)
    ops["r_sum"] = [(1.0, (1, 0, 0)), (1.0, (0, 1, 0))]
    ops["r12_squared"] = [(1.0, (0, 0, 2))]
    fast = primitive_operator_matrices(basis, ops)
    slow = primitive_matrices(basis, ops)
    for name in ops:
        scale = np.max(np.abs(slow[name]))
        assert np.max(np.abs(fast[name] - slow[name])) <= 1e-13 * scale, name


def test_fast_path_declines_unsupported_operators():
    assert zero_power.supports(HAMILTONIAN_OPERATORS)
    assert not zero_power.supports({"r1": [(1.0, (1, 0, 0))]})  # not exchange-symmetric
    assert not zero_power.supports({"r1^3": [(1.0, (3, 0, 0)), (1.0, (0, 3, 0))]})
    basis = _random_basis(6, 1)
    m = operator_matrices(basis, {"r1^3": [(1.0, (3, 0, 0)), (1.0, (0, 3, 0))]})  # generic path
    assert m["r1^3"].shape == (6, 6)


def test_quasi_random_sequence_is_the_published_one():
    # <<i(i+1)/2 sqrt(p)>> for i = 1, 2, 3 and p = 2 (Korobov, Phys. Rev. A 61, 064503 (2000))
    u = exponential.quasi_random(3, 2)
    expected = [(n * math.sqrt(2)) % 1 for n in (1, 3, 6)]
    assert np.allclose(u, expected, atol=1e-12)
    assert np.all((u >= 0) & (u < 1))


def test_box_counts_and_nesting():
    assert sum(exponential.box_counts([0.5, 0.3, 0.2], 101)) == 101
    box_set = exponential_boxes.box_set_for(Ion(2), State.parse("1^1S"))
    small = exponential.box_exponents(box_set.boxes, 60, 1)
    large = exponential.box_exponents(box_set.boxes, 120, 1)
    rows = {tuple(r) for r in large}
    assert all(tuple(r) in rows for r in small)  # nested bases -> monotone energies


def test_triplet_guard_keeps_alpha_and_beta_apart():
    box = exponential_boxes.Box((0.5, 2.5), (0.5, 2.5), (0.0, 1.0), 1.0)
    exps = exponential.box_exponents([box], 200, -1)
    alpha, beta = exps[:, 0], exps[:, 1]
    assert exps.shape == (200, 3)
    assert np.all(alpha - beta >= exponential.TRIPLET_SEPARATION * (alpha + beta) - 1e-15)


def test_family_basis_contract():
    fam = get_family("exponential")
    ion, state = Ion(2), State.parse("2^3S")
    params = fam.parameters(ion, state, 50, {})
    basis = fam.build(ion, state, 50, {p.name: p.initial for p in params}, {})
    assert isinstance(basis, CorrelatedBasis)
    assert basis.sign == -1 and not np.any(basis.powers) and basis.size == 50
    assert fam.supported_L == (0, 1, 2, 3)


def test_family_declares_what_it_supports():
    """The solver reads the declaration: S, P, D and F states refine beyond float64, and G
    states (L = 4, beyond the generated term lists) are refused."""
    fam = get_family("exponential")
    for label in ("1^1S", "2^1P", "3^3D", "4^1F"):
        assert fam.precision_paths(State.parse(label)) == ("float64", "mixed", "extended")
    with pytest.raises(UnsupportedError):
        fam.check_state(State.parse("5^1G"))


@pytest.mark.parametrize("state, exact", [
    # Drake, Springer Handbook of Atomic, Molecular and Optical Physics (2006), ch. 11 (from memory)
    ("2^3P", -2.133164190779283205), ("2^1P", -2.123843086498101359)])
def test_p_state_error_bar_covers_the_published_value(state, exact):
    """A (refined) P solve states a bar from the nested bases that covers the true error
    without being absurdly loose, and prints no digit below it."""
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        r = twoel.solve(2, state, family="exponential", size=150)
    error = r.energy_hartree - exact
    assert 0 < error <= r.error_bar_hartree <= 30 * error
    assert r.reliable is True
    digits = r.energy_hartree_text.split(".")[1]
    assert len(digits) <= -math.floor(math.log10(r.error_bar_hartree))  # no digit below the bar


def test_every_box_file_is_read(tmp_path, monkeypatch):
    base = {"schema": exponential_boxes.SCHEMA, "sets": [
        {"Z": 2, "state": "1^1S", "optimized_size": 10,
         "boxes": [{"fraction": 1.0, "alpha": [1, 2], "beta": [1, 2], "gamma": [0.1, 0.5]}]}]}
    extra = {"schema": exponential_boxes.SCHEMA, "sets": [
        {"Z": 2, "state": "2^1S", "optimized_size": 10,
         "boxes": [{"fraction": 1.0, "alpha": [1, 3], "beta": [0.2, 1], "gamma": [0.1, 0.5]}]}]}
    (tmp_path / "exponential_boxes.json").write_text(json.dumps(base))
    (tmp_path / "exponential_boxes_excited.json").write_text(json.dumps(extra))
    (tmp_path / "reference_energies.csv").write_text("key\n")
    import twoel.reference as reference

    monkeypatch.setattr(reference, "data_root", lambda: tmp_path)
    exponential_boxes.stored_sets.cache_clear()
    try:
        table = exponential_boxes.stored_sets()
        assert set(table) == {(2.0, "1^1S"), (2.0, "2^1S")}
        scaled = exponential_boxes.box_set_for(Ion(4), State.parse("1^1S"))
        assert scaled.boxes[0].alpha == (2.0, 4.0) and "scaled" in scaled.origin
    finally:
        exponential_boxes.stored_sets.cache_clear()


@pytest.mark.parametrize("text, message", [
    ("{", "not valid JSON"), ('{"schema": "x"}', "schema"),
    (json.dumps({"schema": exponential_boxes.SCHEMA, "sets": [{"Z": 2, "state": "1^1S", "boxes": [
        {"fraction": 2, "alpha": [1, 2], "beta": [1, 2], "gamma": [0, 1]}]}]}), "fraction"),
])
def test_box_file_validation(text, message):
    with pytest.raises(InputError, match=message):
        exponential_boxes.parse_box_file(text)


def test_shipped_sets_cover_the_ground_states():
    table = exponential_boxes.stored_sets()
    for Z in range(1, 11):
        entry = table[(float(Z), "1^1S")]
        assert entry.method and entry.optimized_size
    assert (2.0, "2^3S") in table


def test_energies_decrease_with_size_and_stay_above_the_exact_value():
    energies = [twoel.solve(2, "1^1S", "exponential", n, error_bar=False).energy_hartree
                for n in (40, 60, 90)]
    assert energies[0] > energies[1] > energies[2] > HE_GROUND  # Rayleigh-Ritz upper bounds


def test_helium_ground_state_default_precision():
    """Default size and precision (float64 solve plus the mixed step): 11 digits (measured 9.3e-13)."""
    r = twoel.solve(2, "1^1S", "exponential", error_bar=False)
    assert r.size == 300
    assert HE_GROUND < r.energy_hartree < HE_GROUND + 1e-11
    assert r.energy_hartree_text.startswith("-2.90372437703")


def test_helium_2_3S_lowest_triplet_root():
    r = twoel.solve(2, "2^3S", "exponential", 200, error_bar=False)
    assert HE_2_3S < r.energy_hartree < HE_2_3S + 1e-9


def test_solve_build_of_1000_terms_uses_fast_path():
    fam = get_family("exponential")
    ion, state = Ion(2), State.parse("1^1S")
    basis = fam.build(ion, state, 1000, {p.name: p.initial for p in fam.parameters(ion, state, 1000, {})}, {})
    m = basis.matrices()
    assert m.overlap.shape == (1000, 1000)
    assert np.allclose(m.overlap, m.overlap.T)


def test_later_boxes_keep_bases_nested_and_small_bases_unchanged():
    """A box with ``from_size = s`` gets no terms while N <= s and its share of N - s after;
    counts never fall as N grows, so every basis is the prefix of the larger ones."""
    fractions, starts = [0.5, 0.3, 0.2, 0.16, 0.123], [0, 0, 0, 300, 300]
    previous = [0] * 5
    for n in range(1, 1700, 7):
        counts = exponential.box_counts(fractions, n, starts)
        assert sum(counts) == n and all(c >= p for c, p in zip(counts, previous))
        previous = counts
    assert exponential.box_counts(fractions, 300, starts) == [150, 90, 60, 0, 0]
    assert exponential.box_counts(fractions, 1600, starts)[3:] == [208, 160]  # 0.16·1300, 0.123·1300
    box_set = exponential_boxes.box_set_for(Ion(2), State.parse("1^1S"))
    assert [b.from_size for b in box_set.boxes] == [0, 0, 0, 300, 300]
    three = exponential.box_exponents(box_set.boxes[:3], 300, 1)
    five = exponential.box_exponents(box_set.boxes, 300, 1)
    assert np.array_equal(three, five)
    small = {tuple(r) for r in exponential.box_exponents(box_set.boxes, 500, 1)}
    assert all(tuple(r) in small for r in five)


def test_later_box_file_errors():
    box = {"fraction": 0.5, "alpha": [1, 2], "beta": [1, 2], "gamma": [0, 1]}
    for bad, message in ((dict(box, from_size=-1), "from_size"), (dict(box, from_size=2.5), "from_size")):
        with pytest.raises(InputError, match=message):
            exponential_boxes.parse_boxes([box, bad])
    with pytest.raises(InputError, match="from_size 0"):
        exponential_boxes.parse_boxes([dict(box, from_size=10)])
    with pytest.raises(InputError, match="exceed 1"):
        exponential_boxes.parse_boxes([box, dict(box, fraction=0.7, from_size=10),
                                       dict(box, fraction=0.6, from_size=20)])
