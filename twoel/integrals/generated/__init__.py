"""Python source generated from the SymPy derivations; do not edit these files by hand.

``kinetic_terms.py``
    ``kinetic_terms(i1, ..., g2)``: the kinetic integrand ``½(∇1χ·∇1χ' + ∇2χ·∇2χ')`` of two
    correlated primitives as ``[((p, q, s), coefficient), ...]`` (from
    :func:`twoel.integrals.symbolic.kinetic_source`).
``zero_power_kernels.py``
    Closed forms of purely exponential primitive pairs as integer polynomials in
    ``1/(α+β), 1/(β+γ), 1/(γ+α)``, divided by 16π²: ``zero_power_integrals`` (float64 and
    double-double), ``zero_power_integrals_fixed`` (fixed-point integers), the single integrals in
    ``MONOMIALS`` and ``NAMES``/``DEGREES`` (from :func:`twoel.integrals.symbolic.zero_power_source`).
    Its kinetic pieces are the kinetic integrand above at zero powers.
``state_terms.py``
    Gradient, Laplacian and angular integrands of correlated bases of total ``L = 0 .. 3``, one
    function per channel pair ``l<L>_<la><lb>_<integrand>``, collected in ``TERMS`` with the
    older S (``s_*``) and P (``p_same_*``, ``p_cross_*``) names as aliases of the ``L = 0, 1``
    lists (from :func:`twoel.integrals.symbolic_states.generated_source`); the S gradient terms
    are the two halves of the same kinetic derivation.

Regenerate all files with ``python -m twoel.integrals.generate`` or some of them with
``python -m twoel.integrals.generate kinetic_terms zero_power_kernels``.  Check that the files
match their derivation, writing nothing, with ``python -m twoel.integrals.generate --check``
(optionally naming targets): exit 0 if identical, 1 with a line naming the stale files.
Measured on one core: 0.1-0.4 s (``kinetic_terms``), 1-3 s (``zero_power_kernels``) and
50-60 s (``state_terms``).  ``tests/integrals/test_generate.py`` runs the check (the
``state_terms`` target in the slow set).
"""
