"""The generated integrands against Cartesian finite differences (an independent route).

The derivation works in ``(r1, r2, r12)`` with ``r1·r2 = (r1² + r2² - r12²)/2``; here the
primitives are evaluated at points of R⁶ and differentiated numerically with fourth-order central
differences (error ~h⁴ for the first and ~h⁴ + ε/h² for the second derivatives, h = 10⁻³).  P
integrands are averages over orientations of a quadratic form in ẑ, which the average over the
three coordinate axes gives exactly (``⟨n̂ᵀ M n̂⟩ = tr M / 3``).
"""

from __future__ import annotations

import numpy as np
from finite_differences import grad as _grad, lap as _lap
import pytest

from twoel.integrals.generated.kinetic_terms import kinetic_terms
from twoel.integrals.generated.state_terms import TERMS

#: tolerance relative to the size of the generated terms (measured worst: 1.8e-10)
REL = 1e-8


def _distances(x):
    return np.linalg.norm(x[:3]), np.linalg.norm(x[3:]), np.linalg.norm(x[:3] - x[3:])


def _primitive(params, electron=None, axis=None):
    """``x_e[axis] · r1^i r2^j r12^k e^{-a r1 - b r2 - g r12}`` (no prefactor if electron is None)."""
    i, j, k, a, b, g = params

    def f(x):
        r1, r2, r12 = _distances(x)
        value = r1**i * r2**j * r12**k * np.exp(-a * r1 - b * r2 - g * r12)
        return value if electron is None else x[3 * (electron - 1) + axis] * value
    return f




def _integrands(bra, ket, x):
    """Every integrand name of the generated modules (without the S/P prefix), for one pair."""
    sym = lambda u, v: (u + v) / 2  # noqa: E731
    return {
        "grad11": _grad(bra, x, 1) @ _grad(ket, x, 1),
        "grad22": _grad(bra, x, 2) @ _grad(ket, x, 2),
        "grad12": sym(_grad(bra, x, 1) @ _grad(ket, x, 2), _grad(bra, x, 2) @ _grad(ket, x, 1)),
        "laplacian": -bra(x) * (_lap(ket, x, 1) + _lap(ket, x, 2)) / 2,
        "lap1lap2": sym(_lap(bra, x, 1) * _lap(ket, x, 2), _lap(bra, x, 2) * _lap(ket, x, 1)),
        "angular": bra(x) * ket(x),
    }


def _cases(seed, count=3):
    rng = np.random.default_rng(seed)
    for _ in range(count):
        bra = [*map(float, rng.integers(0, 3, 3)), *rng.uniform(0.2, 2.0, 3)]
        ket = [*map(float, rng.integers(0, 3, 3)), *rng.uniform(0.2, 2.0, 3)]
        yield bra, ket, rng.uniform(-1.2, 1.2, 6)


def _generated(terms, x):
    r1, r2, r12 = _distances(x)
    values = [c * r1**p * r2**q * r12**s for (p, q, s), c in terms]
    return sum(values), sum(abs(v) for v in values)


def _assert_close(expected, terms, x, weight):
    value, size = _generated(terms, x)
    assert value == pytest.approx(expected / weight, abs=REL * size)


@pytest.mark.parametrize("case", range(3))
def test_kinetic_terms_are_half_the_gradient_products(case):
    bra, ket, x = list(_cases(11))[case]
    f, g = _primitive(bra), _primitive(ket)
    expected = (_grad(f, x, 1) @ _grad(g, x, 1) + _grad(f, x, 2) @ _grad(g, x, 2)) / 2
    _assert_close(expected, kinetic_terms(*bra, *ket), x, f(x) * g(x))


@pytest.mark.parametrize("name", ["grad11", "grad22", "grad12", "laplacian", "lap1lap2"])
def test_s_state_terms(name):
    for bra, ket, x in _cases(5):
        f, g = _primitive(bra), _primitive(ket)
        _assert_close(_integrands(f, g, x)[name], TERMS[f"s_{name}"](*bra, *ket), x, f(x) * g(x))


@pytest.mark.parametrize("pair, electrons", [("same", (1, 1)), ("cross", (1, 2))])
@pytest.mark.parametrize("name", ["angular", "grad11", "grad22", "grad12", "laplacian", "lap1lap2"])
def test_p_state_terms_are_orientation_averages(pair, electrons, name):
    ea, eb = electrons
    for bra, ket, x in _cases(9, count=2):
        expected = np.mean([_integrands(_primitive(bra, ea, axis), _primitive(ket, eb, axis), x)[name]
                            for axis in range(3)])
        weight = _primitive(bra)(x) * _primitive(ket)(x)
        _assert_close(expected, TERMS[f"p_{pair}_{name}"](*bra, *ket), x, weight)
