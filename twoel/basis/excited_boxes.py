"""Old import path of the excited-state boxes (kept working; nothing new belongs here).

The boxes of every state, ground, excited S and P, have one schema, one loader and one
fallback rule in :mod:`twoel.basis.exponential_boxes`; this module only re-exports the names
that older code imports from here.
"""

from __future__ import annotations

from twoel.basis import exponential_boxes as _boxes
from twoel.basis.exponential_boxes import EDGE_FLOOR, EDGE_KEYS, SCHEMA, Box  # noqa: F401
from twoel.system import State

#: the shipped file of excited-state sets (read, like every ``exponential_boxes*.json``, by
#: :func:`twoel.basis.exponential_boxes.stored_sets`)
DATA_FILE = "exponential_boxes_excited.json"


def generic_boxes(ion, state: State) -> list[Box]:
    """The boxes of :func:`twoel.basis.exponential_boxes.generic_boxes`, as a list."""
    return list(_boxes.generic_boxes(ion, state).boxes)
