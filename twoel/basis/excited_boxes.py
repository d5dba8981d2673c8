r"""Quasi-random exponent boxes for excited S and for P states (stored in
``data/exponential_boxes_excited.json``).

An exponential basis ``e^{-α_i r1 - β_i r2 - γ_i r12}`` (S) or ``z1 e^{-α_i r1 - β_i r2 - γ_i r12}``
(P) takes its exponents from a few *boxes* ``[α_lo, α_hi] × [β_lo, β_hi] × [γ_lo, γ_hi]``,
filled by the quasi-random sequence ``x_i = frac(i(i+1)/2 · sqrt(p))`` with ``p = 2, 3, 5``
for ``α, β, γ`` (the construction of Korobov, Phys. Rev. A 61, 064503 (2000), for
exponential bases).  A box also has a ``fraction`` of the ``size`` functions it receives.
The file schema, the edge names ``box<k>_alpha_min`` ... and the exponent generation are
those of the ``exponential`` family's ground-state tables, so either side reads the other's
entries and reproduces the same basis.  Only the box bounds are nonlinear parameters, so a
handful of numbers fixes a basis of any size.

Stored entries (see DEVELOPERS.md, "Excited-state boxes") are keyed by ``Z`` and state label.
For a charge without an entry the helium boxes are rescaled: inner-electron ranges by ``Z/2``,
outer ones by ``(Z - 1)``; the result is marked ``"scaled"`` and is a starting point only.
"""

from __future__ import annotations

import math

import numpy as np

from twoel.errors import InputError, UnsupportedError
from twoel.system import Ion, State
from twoel.basis import exponential_boxes as stored
from twoel.basis.base import Parameter
# one schema, one box type, one edge naming and one loader for every data/exponential_boxes*.json
from twoel.basis.exponential_boxes import EDGE_FLOOR, EDGE_KEYS, SCHEMA, Box  # noqa: F401

DATA_FILE = "exponential_boxes_excited.json"


def box_exponents(boxes: list[Box], size: int, sign: int = 1, guard_triplet: bool = False) -> np.ndarray:
    """Exponents ``(α, β, γ)`` of ``size`` functions drawn from the boxes, shape (size, 3).

    The same quasi-random sequence as the exponential family
    (:func:`twoel.basis.exponential.box_exponents`).  With ``guard_triplet`` (triplet S states,
    where ``(1 - P12)`` annihilates ``α = β``) each point is ordered ``α > β`` and nearly
    symmetric points are skipped; P states need no guard.
    """
    from twoel.basis.exponential import box_exponents as sequence

    if any(b.fraction <= 0 for b in boxes):
        raise InputError("box fractions must be positive")
    return sequence(boxes, size, -1 if guard_triplet else 1)


def stored_entry(Z: float, state: State):
    """The stored :class:`~twoel.basis.exponential_boxes.BoxSet` for ``(Z, state)`` or ``None``.

    Read by the one loader of every ``data/exponential_boxes*.json`` file
    (:func:`twoel.basis.exponential_boxes.stored_sets`), so the excited-state and ground-state
    code paths see the same sets under the same rules.
    """
    return stored.stored_sets().get((float(Z), state.label))


def boxes_from_entry(entry) -> list[Box]:
    """The boxes of a stored set, or of a JSON set entry (a dict with a ``boxes`` list)."""
    if isinstance(entry, dict):
        return stored.parse_boxes(entry.get("boxes", []), "box set")
    return list(entry.boxes)


def default_boxes(ion: Ion, state: State) -> tuple[list[Box], str]:
    """Boxes for ``(ion, state)``: stored, rescaled from helium, or a generic guess."""
    entry = stored_entry(ion.Z, state)
    if entry is not None:
        return boxes_from_entry(entry), "stored"
    helium = stored_entry(2.0, state)
    if helium is not None:
        boxes = []
        for b in boxes_from_entry(helium):
            inner = b.alpha[1] > 1.2 and b.beta[1] > 1.2
            fa = ion.Z / 2 if b.alpha[1] > 1.2 else max(ion.Z - 1.0, 0.05)
            fb = ion.Z / 2 if b.beta[1] > 1.2 else max(ion.Z - 1.0, 0.05)
            fg = ion.Z / 2 if inner else 1.0
            boxes.append(b.scaled(fa, fb, fg))
        return boxes, "scaled"
    return generic_boxes(ion, state), "generic"


def generic_boxes(ion: Ion, state: State) -> list[Box]:
    """A hydrogenic guess: an inner 1s electron ``~Z`` and an outer ``nl`` electron ``~(Z-1)/n``."""
    Z, n = ion.Z, state.n
    outer = max(Z - 1.0, 0.1) / n
    if state.L == 0:
        return [Box(alpha=(0.6 * Z, 2.0 * Z), beta=(0.6 * Z, 2.0 * Z), gamma=(0.0, 0.6), fraction=0.5),
                Box(alpha=(0.8 * Z, 1.3 * Z), beta=(0.3 * outer, 2.0 * outer), gamma=(0.0, 0.3), fraction=0.5)]
    return [Box(alpha=(0.3 * outer, 2.0 * outer), beta=(0.8 * Z, 1.3 * Z), gamma=(0.0, 0.3), fraction=0.5),
            Box(alpha=(0.5 * outer, 3.0 * outer), beta=(0.5 * Z, 2.0 * Z), gamma=(0.0, 0.8), fraction=0.5)]


def box_parameters(boxes: list[Box]) -> list[Parameter]:
    """The box bounds as nonlinear parameters ``box1_alpha_min`` ... (bohr⁻¹).

    Lower ``γ`` bounds may be zero; they are kept at a small positive floor so that the
    log-scale optimizer and the virial rescaling (which multiplies every exponent) apply.
    """
    params = []
    for number, box in enumerate(boxes, start=1):
        for name, value in zip(EDGE_KEYS, box.edges()):
            params.append(Parameter(f"box{number}_{name}", max(float(value), EDGE_FLOOR), EDGE_FLOOR, 1e4))
    return params


def boxes_from_values(template: list[Box], values: dict[str, float]) -> list[Box]:
    """Rebuild boxes from parameter values (missing ones keep the template's)."""
    out = []
    for number, box in enumerate(template, start=1):
        bounds = [float(values.get(f"box{number}_{name}", default))
                  for name, default in zip(EDGE_KEYS, box.edges())]
        for lo, hi, what in ((0, 1, "alpha"), (2, 3, "beta"), (4, 5, "gamma")):
            if not (math.isfinite(bounds[lo]) and math.isfinite(bounds[hi])):
                raise InputError(f"box {number} {what} bounds must be finite")
        out.append(Box.from_edges(bounds, box.fraction, box.from_size))  # orders each [min, max]
    return out


def check_size(size, minimum: int = 2) -> int:
    if size is None:
        raise InputError("the exponential basis needs a size (number of functions)")
    if isinstance(size, bool) or not isinstance(size, int) or size < minimum:
        raise InputError(f"'size' must be an integer >= {minimum}, got {size!r}")
    if size > 3000:
        raise UnsupportedError(f"size {size} is beyond what float64 exponential bases can use (<= 3000)")
    return size
