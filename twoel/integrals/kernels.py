"""Former home of the float64 integral tables; the series now lives in :mod:`twoel.integrals.series`.

Kept so that ``from twoel.integrals.kernels import integral_table`` (documented in earlier
releases) goes on working.
"""

from twoel.integrals.series import MAX_POWER, integral, integral_table

__all__ = ["MAX_POWER", "integral", "integral_table"]
