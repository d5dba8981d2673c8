"""Old import path of the excited-S exponential builder (kept working; nothing new belongs here).

Ground, excited S and P exponential bases are built by one function,
:func:`twoel.basis.exponential.basis_from_boxes`, of the one ``exponential`` family.
"""

from twoel.basis.exponential import basis_from_boxes  # noqa: F401
