"""Integrals over two-electron coordinates.

``symbolic``  SymPy derivations: the master integral, its derivatives, the kinetic-energy terms
              (used to generate and to verify the numeric kernels; never on the hot path).
``kernels``   float64 NumPy kernels: tables of
              ``I(a,b,c; α,β,γ) = ∫∫ r1^a r2^b r12^c exp(-α r1 - β r2 - γ r12) d³r1 d³r2``.
``pairs``     the one evaluator of operator matrices over primitive pairs (S and P bases, with
              exchange, one power -2 allowed), used by the core builder, properties, P states
              and corrections; ``zero_power`` is the closed-form fast path of zero-power bases.
``_kinetic``  generated from ``symbolic.kinetic_terms`` (do not edit by hand).
"""

from twoel.integrals.kernels import integral, integral_table

__all__ = ["integral", "integral_table"]
