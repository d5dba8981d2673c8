"""Integrals over two-electron coordinates.

``symbolic``  SymPy derivations: the master integral, its derivatives, the kinetic-energy terms
              (used to generate and to verify the numeric kernels; never on the hot path).
``series``    the one evaluator of the master-integral series
              ``I(a,b,c; α,β,γ) = ∫∫ r1^a r2^b r12^c exp(-α r1 - β r2 - γ r12) d³r1 d³r2``,
              for any number type of ``numbers`` (float64, double-double, mpmath);
              ``kernels`` re-exports its float64 functions under their earlier names.
``pairs``     the one evaluator of operator matrices over primitive pairs (S and P bases, with
              exchange, one power -2 allowed), used by the core builder, properties, P states
              and corrections; ``zero_power`` is the closed-form fast path of zero-power bases.
``generated``  Python source emitted from the SymPy derivations (do not edit by hand).
"""

from twoel.integrals.series import integral, integral_table

__all__ = ["integral", "integral_table"]
