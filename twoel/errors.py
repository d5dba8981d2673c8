"""Exception and warning types of twoel.

Every error raised for bad input or a failed calculation derives from :class:`TwoelError`, so
the command line can turn it into a one-line message.  The type says what went wrong:

``InputError``              a value that breaks a stated rule (non-physical Z, unknown unit ...)
``UnsupportedError``        a valid request the chosen method cannot serve (state vs basis)
``LinearDependenceError``   the basis overlap matrix is singular beyond repair
``ConvergenceError``        an optimizer or iterative solver did not converge
``NotBoundError``           the requested root lies at or above the ionization threshold
``ResourceError``           the request would exceed memory or time limits
"""

from __future__ import annotations


class TwoelError(Exception):
    """Base class of all twoel errors."""


class InputError(TwoelError, ValueError):
    """A user-supplied value breaks a rule; the message names argument, rule and value."""


class UnsupportedError(TwoelError):
    """The request is valid but this method or basis cannot represent it."""


class LinearDependenceError(TwoelError, ArithmeticError):
    """The overlap matrix is not positive definite even after canonical orthogonalization."""


class ConvergenceError(TwoelError, ArithmeticError):
    """An optimizer or iterative solver failed to converge."""


class NotBoundError(TwoelError):
    """The computed root is not below the one-electron ionization threshold."""


class ResourceError(TwoelError, MemoryError):
    """The requested calculation would need more memory than is sensible."""


class TwoelWarning(UserWarning):
    """Soft problems: the result is usable but the user should know something."""


class AccuracyWarning(TwoelWarning):
    """A result may be less accurate than its digits suggest (conditioning, approximations)."""
