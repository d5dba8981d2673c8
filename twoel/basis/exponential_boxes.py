"""Box edges of the exponential family: the one schema, loader and fallback rule.

Every file ``data/exponential_boxes*.json`` is read by one loader (:func:`stored_sets`; schema
described in DEVELOPERS.md)::

    {"schema": "twoel-exponential-boxes/1",
     "sets": [{"Z": 2, "state": "1^1S",
               "boxes": [{"fraction": 0.4, "alpha": [lo, hi], "beta": [lo, hi],
                          "gamma": [lo, hi]}, ...],
               "optimized_size": 150, "energy_hartree": -2.9037..., "method": "...",
               "date": "YYYY-MM-DD", "recommended_size": 600}, ...]}

Ground, excited S and P states share the schema, the box type and the edge names
``box<k>_alpha_min`` ... (``α`` of a P state belongs to the ``p`` electron).  When two files
give the same ``(Z, state)``, the set optimized on the larger basis wins (ties: the first file
in name order).

Fallback rule for a ``(Z, state)`` without a stored set (:func:`box_set_for`), the same for
every state:

1. the stored set of the same state at the nearest stored ``Z`` (ties: the smaller ``Z``),
   with every edge scaled by ``Z / Z_stored`` (exponents of hydrogen-like orbitals scale with
   Z); origin ``"scaled from Z = ..."``;
2. else the hydrogenic guess :func:`generic_boxes` (origin ``"generic"``).

The provenance of a solve records which applied.  Writing box files is a developer task
(:mod:`twoel.tools.tune_boxes`); nothing here writes.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field, replace
from functools import lru_cache

from twoel.errors import InputError
from twoel.system import Ion, State
from twoel.basis.base import Parameter

SCHEMA = "twoel-exponential-boxes/1"
FILE_PREFIX = "exponential_boxes"
EDGE_KEYS = ("alpha_min", "alpha_max", "beta_min", "beta_max", "gamma_min", "gamma_max")
#: floor of every box edge (bohr⁻¹): edges are optimized on a log scale and must stay > 0
EDGE_FLOOR = 1e-4
#: smallest nuclear charge the boxes serve: every edge scales with Z (fallback rule), and below
#: ``10 * EDGE_FLOOR`` the scaled edges run into the floor, the quasi-random exponents pile up
#: and the overlap matrix turns singular (measured: N = 40, 1^1S, singular at Z = 3e-5).
#: :func:`box_set_for` refuses smaller Z before any work.
MIN_CHARGE = 10 * EDGE_FLOOR


@dataclass(frozen=True)
class Box:
    """One box ``[α_min, α_max] × [β_min, β_max] × [γ_min, γ_max]`` (bohr⁻¹) and its share.

    ``from_size = 0`` (the usual box): the box takes ``fraction`` (normalized over the other
    such boxes) of the terms not taken by later boxes.  ``from_size = s > 0`` (a *later* box):
    it takes ``fraction`` of the terms beyond the first ``s``, so bases of ``N <= s`` terms do
    not see it (:func:`twoel.basis.exponential.box_counts`).  Large bases need exponent regions
    that would only dilute small ones.
    """

    alpha: tuple[float, float]
    beta: tuple[float, float]
    gamma: tuple[float, float]
    fraction: float
    from_size: int = 0
    #: states with L >= 2: ``l`` of the electron of ``α`` in this box's terms (``None``: ``L``)
    l1: int | None = None

    def edges(self) -> tuple[float, ...]:
        return (*self.alpha, *self.beta, *self.gamma)

    def to_dict(self) -> dict:
        out = {"fraction": self.fraction, "alpha": list(self.alpha), "beta": list(self.beta),
               "gamma": list(self.gamma)}
        if self.from_size:
            out["from_size"] = self.from_size
        if self.l1 is not None:
            out["l1"] = self.l1
        return out

    def scaled(self, alpha: float, beta: float, gamma: float) -> "Box":
        """The box with its α, β, γ edges multiplied by the given factors (same share)."""
        return replace(self, alpha=(self.alpha[0] * alpha, self.alpha[1] * alpha),
                       beta=(self.beta[0] * beta, self.beta[1] * beta),
                       gamma=(self.gamma[0] * gamma, self.gamma[1] * gamma))

    @classmethod
    def from_edges(cls, edges, fraction: float, from_size: int = 0, l1: int | None = None) -> "Box":
        e = [float(x) for x in edges]
        pairs = [tuple(sorted(e[k:k + 2])) for k in (0, 2, 4)]
        return cls(pairs[0], pairs[1], pairs[2], float(fraction), int(from_size),
                   None if l1 is None else int(l1))


@dataclass(frozen=True)
class BoxSet:
    """The boxes of one ``(Z, state)`` with where they came from."""

    Z: float
    state: str
    boxes: tuple[Box, ...]
    optimized_size: int | None = None
    energy_hartree: float | None = None
    method: str = ""
    date: str = ""
    origin: str = "stored"
    source_file: str = ""
    extra: dict = field(default_factory=dict, compare=False)

    def parameters(self) -> list[Parameter]:
        params = []
        for k, box in enumerate(self.boxes, start=1):
            for key, value in zip(EDGE_KEYS, box.edges()):
                params.append(Parameter(f"box{k}_{key}", max(value, EDGE_FLOOR), EDGE_FLOOR,
                                        1e4, "exponent"))
        return params

    def with_values(self, values: dict) -> "BoxSet":
        """The same boxes with edges taken from ``values`` (names of :meth:`parameters`)."""
        boxes = []
        for k, box in enumerate(self.boxes, start=1):
            edges = [float(values.get(f"box{k}_{key}", v)) for key, v in zip(EDGE_KEYS, box.edges())]
            boxes.append(Box.from_edges(edges, box.fraction, box.from_size, box.l1))
        return replace(self, boxes=tuple(boxes))

    def provenance(self) -> dict:
        return {"origin": self.origin, "Z": self.Z, "state": self.state,
                "optimized_size": self.optimized_size, "energy_hartree": self.energy_hartree,
                "method": self.method, "date": self.date, "file": self.source_file,
                "boxes": [b.to_dict() for b in self.boxes]}

    def to_dict(self) -> dict:
        out = {"Z": self.Z, "state": self.state, "boxes": [b.to_dict() for b in self.boxes],
               "optimized_size": self.optimized_size, "energy_hartree": self.energy_hartree,
               "method": self.method, "date": self.date}
        out.update(self.extra)
        return out


def parse_boxes(entries, where: str = "boxes") -> list[Box]:
    """Validate a JSON list of boxes (``fraction``, ``alpha``, ``beta``, ``gamma``, optional
    ``from_size``) and return :class:`Box` objects."""
    boxes = []
    for box in entries:
        edges = [*box["alpha"], *box["beta"], *box["gamma"]]
        if len(edges) != 6 or not all(isinstance(x, (int, float)) and not isinstance(x, bool)
                                      for x in edges):
            raise InputError(f"{where}: each box needs alpha, beta, gamma as [min, max]")
        if min(edges) < 0 or not 0 < float(box["fraction"]) <= 1:
            raise InputError(f"{where}: box edges must be >= 0 and 0 < fraction <= 1")
        start = box.get("from_size", 0)
        if isinstance(start, bool) or not isinstance(start, int) or start < 0:
            raise InputError(f"{where}: from_size must be a non-negative integer, got {start!r}")
        l1 = box.get("l1")
        if l1 is not None and (isinstance(l1, bool) or not isinstance(l1, int) or not 0 <= l1 <= 9):
            raise InputError(f"{where}: l1 must be an integer 0..9, got {l1!r}")
        boxes.append(Box.from_edges(edges, box["fraction"], start, l1))
    if not boxes:
        raise InputError(f"{where}: no boxes")
    if all(b.from_size for b in boxes):
        raise InputError(f"{where}: at least one box needs from_size 0")
    if sum(b.fraction for b in boxes if b.from_size) > 1:
        raise InputError(f"{where}: the fractions of the later boxes (from_size > 0) exceed 1")
    return boxes


def parse_box_file(text: str, name: str = "<text>") -> list[BoxSet]:
    """Parse and validate one ``exponential_boxes*.json`` document."""
    try:
        doc = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(f"{name}: not valid JSON ({exc})")
    if not isinstance(doc, dict) or doc.get("schema") != SCHEMA:
        raise InputError(f"{name}: expected schema {SCHEMA!r}")
    sets = []
    for n, entry in enumerate(doc.get("sets", [])):
        where = f"{name} set {n}"
        try:
            Z = float(entry["Z"])
            state = State.parse(entry["state"]).label
            boxes = parse_boxes(entry["boxes"], where)
        except (KeyError, TypeError, ValueError) as exc:
            raise InputError(f"{where}: malformed entry ({exc})")
        known = {"Z", "state", "boxes", "optimized_size", "energy_hartree", "method", "date"}
        sets.append(BoxSet(Z, state, tuple(boxes), entry.get("optimized_size"),
                           entry.get("energy_hartree"), str(entry.get("method", "")),
                           str(entry.get("date", "")), "stored", name,
                           {k: v for k, v in entry.items() if k not in known}))
    return sets


def box_files() -> list[str]:
    from twoel.reference import data_root

    return sorted(p.name for p in data_root().iterdir()
                  if p.name.startswith(FILE_PREFIX) and p.name.endswith(".json"))


@lru_cache(maxsize=None)
def stored_sets() -> dict[tuple[float, str], BoxSet]:
    """All stored box sets by ``(Z, state label)``."""
    from twoel.reference import read_data_text

    table: dict[tuple[float, str], BoxSet] = {}
    for name in box_files():
        for box_set in parse_box_file(read_data_text(name), name):
            key = (box_set.Z, box_set.state)
            old = table.get(key)
            if old is None or (box_set.optimized_size or 0) > (old.optimized_size or 0):
                table[key] = box_set
    return table


def generic_boxes(ion: Ion, state: State) -> BoxSet:
    """The hydrogenic starting guess (no optimization behind it), scaled with ``Z``.

    Ground state: both electrons ``1s``-like, exponents ``~Z``.  Other states: an inner ``1s``
    electron ``~Z`` and an outer ``nl`` electron ``~(Z - 1)/n`` (screened by the inner one); for
    P states ``α`` is the exponent of the ``p`` electron.
    """
    Z = ion.Z
    if state.L == 0 and state.n == 1:
        boxes = (Box((0.3 * Z, 1.3 * Z), (0.3 * Z, 1.3 * Z), (0.05 * Z, 0.6 * Z), 0.5),
                 Box((0.5 * Z, 3.0 * Z), (0.5 * Z, 3.0 * Z), (0.1 * Z, 1.5 * Z), 0.3),
                 Box((1.0 * Z, 10.0 * Z), (0.2 * Z, 4.0 * Z), (0.01 * Z, 2.0 * Z), 0.2))
    elif state.L == 0:
        outer = max(Z - 1.0, 0.2) / state.n
        boxes = (Box((0.7 * Z, 1.5 * Z), (0.3 * outer, 1.5 * outer), (0.01, 0.3 * outer), 0.5),
                 Box((0.5 * Z, 4.0 * Z), (0.1 * outer, 2.0 * outer), (0.02, 1.0 * outer), 0.3),
                 Box((1.0 * Z, 10.0 * Z), (0.3 * outer, 3.0 * Z), (0.01, 2.0 * Z), 0.2))
    elif state.L == 1:
        outer = max(Z - 1.0, 0.1) / state.n
        boxes = (Box((0.3 * outer, 2.0 * outer), (0.8 * Z, 1.3 * Z), (0.0, 0.3), 0.5),
                 Box((0.5 * outer, 3.0 * outer), (0.5 * Z, 2.0 * Z), (0.0, 0.8), 0.5))
    else:
        # the pattern of the He 3^3D set tuned at N = 300, in units of the outer exponent
        # (Z - 1)/n and of Z: the outer electron carrying L (two boxes), one unit of angular
        # momentum on the inner electron (l1 = L - 1, an outer-inner and a symmetric box) and
        # the exchange image with the inner exponent on the α electron (l1 = 0)
        o = max(Z - 1.0, 0.1) / state.n
        boxes = (Box((0.5 * o, 2.4 * o), (0.65 * Z, 1.13 * Z), (0.0, 0.08 * o), 0.27027),
                 Box((0.3 * o, 5.4 * o), (0.7 * Z, 1.3 * Z), (0.0, 1.3 * o), 0.288288),
                 Box((0.3 * o, 5.1 * o), (0.77 * Z, 1.06 * Z), (0.0, 0.8 * o), 0.171171, l1=state.L - 1),
                 Box((0.15 * Z, 1.5 * Z), (0.15 * Z, 1.5 * Z), (0.0, 0.5 * Z), 0.135135,
                     l1=state.L - 1),
                 Box((0.15 * o, 4.6 * o), (0.5 * Z, 2.0 * Z), (0.0, 0.5 * Z), 0.135135, l1=0))
    return BoxSet(Z, state.label, boxes, None, None, "generic guess scaled with Z (not optimized)",
                  "", "generic")


def box_set_for(ion: Ion, state: State) -> BoxSet:
    """The stored set for ``(Z, state)``, else the fallback rule of the module text.

    Raises
    ------
    InputError
        If ``Z < MIN_CHARGE`` (the box edges, in bohr⁻¹, would fall to :data:`EDGE_FLOOR`).
    """
    if not ion.Z >= MIN_CHARGE:
        raise InputError(f"the exponential family needs Z >= {MIN_CHARGE:g} (its box edges scale "
                         f"with Z and stop at {EDGE_FLOOR:g} bohr^-1), got Z = {ion.Z:g}")
    table = stored_sets()
    key = (ion.Z, state.label)
    if key in table:
        return table[key]
    same_state = [s for (z, label), s in table.items() if label == state.label]
    if same_state:
        nearest = min(same_state, key=lambda s: (abs(s.Z - ion.Z), s.Z))
        f = ion.Z / nearest.Z
        boxes = tuple(b.scaled(f, f, f) for b in nearest.boxes)
        return replace(nearest, Z=ion.Z, boxes=boxes, origin=f"scaled from Z = {nearest.Z:g}",
                       energy_hartree=None)
    return generic_boxes(ion, state)


def recommended_size(ion: Ion, state: State) -> int | None:
    """The ``recommended_size`` stored with the set of exactly ``(Z, state)``, if any."""
    entry = stored_sets().get((ion.Z, state.label))
    value = None if entry is None else entry.extra.get("recommended_size")
    return int(value) if value else None
