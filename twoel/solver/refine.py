r"""Energies of zero-power (exponential) bases beyond float64 accuracy.

Two refinements of a float64 eigenpair ``(E₀, c₀)`` of ``H c = E S c``:

``mixed`` (the default for the exponential family)
    The matrices are rebuilt in double-double (:func:`twoel.integrals.precise.dd_matrices`,
    ~32 digits), handed to python-flint ``arb_mat`` at 128 bits, and one inverse-iteration
    step ``(H - E₀S) y = S c₀`` from the float64 eigenpair is taken (a second one when the
    float64 start is poor), followed by the Rayleigh quotient ``yᵀHy / yᵀSy``.  A float64 solve
    loses about ``ε·cond(S)`` because the matrix elements are rounded and because canonical
    orthogonalization must drop the near-dependent directions (for He at N = 250 the float64
    energy is ~4e-9 Eh too high, the refined one ~8e-12); the Rayleigh quotient of any vector is
    an upper bound of the exact lowest eigenvalue of the basis (Rayleigh–Ritz), so the refined
    energy keeps the variational property.

``extended``
    The matrices are assembled exactly in fixed point and handed to python-flint ``arb_mat``
    at a working precision chosen from the requested digits and the conditioning.  Inverse
    iteration ``(H - σS) y = S x`` (``σ`` from the mixed step) converges in two or three steps;
    each energy is a Rayleigh quotient whose arithmetic error ``arb`` bounds rigorously (the
    radius of the interval).  If that radius is too wide for the requested digits the precision
    is raised and the step repeated ("correct digits ≈ working digits - log10 cond(S)").

The returned numerical error covers the arithmetic (and the unconverged part of the
iteration); the basis-truncation error is estimated separately (:mod:`twoel.analysis.convergence`).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field

import numpy as np

from twoel.results import Result
from twoel.errors import ConvergenceError, InputError
from twoel.integrals import precise
from twoel.integrals.doubledouble import DD

#: precisions understood by :func:`twoel.solve`
PRECISIONS = ("float64", "extended")
#: default number of significant digits aimed at by ``precision="extended"``
DEFAULT_DIGITS = 20
#: largest digit target accepted
MAX_DIGITS = 60
_LOG2_10 = math.log2(10.0)


@dataclass(frozen=True, repr=False)
class RefinedEnergy(Result):
    """An energy beyond float64 with its arithmetic error.

    Attributes
    ----------
    energy_hartree : float
        Nearest float64 value (Eh).
    text : str
        Decimal string with the digits computed (more than float64 can hold), Eh.
    numerical_error_hartree : float
        Estimated bound of the arithmetic/iteration error (Eh), excluding basis truncation.
    method : str
        ``"mixed double-double"`` or ``"arb inverse iteration"``.
    working_bits : int
        Mantissa bits of the arithmetic (106 for double-double).
    history : tuple of float
        The successive Rayleigh-quotient energies minus the last one (Eh).
    seconds : dict
        Wall time of the assembly and of the solve (s).
    lost_digits : float
        Decimal digits the arithmetic lost: ``log10`` of the arb radius of the energy over one
        unit in the last place of the working precision (a measured ``log10 cond``).
    kinetic_hartree : float or None
        ``⟨T⟩`` of the refined vector (Eh).
    arithmetic : dict
        The mixed step's measured matrix-rounding error (:func:`matrix_rounding_error`); empty
        for the extended path (its arb radius is rigorous).
    """

    energy_hartree: float
    text: str
    numerical_error_hartree: float
    method: str
    working_bits: int
    history: tuple = ()
    seconds: dict = field(default_factory=dict)
    vector: object = field(default=None, compare=False, repr=False)
    lost_digits: float = 0.0
    kinetic_hartree: float | None = None
    arithmetic: dict = field(default_factory=dict)

    SUMMARY = ("text", "numerical_error_hartree", "method")

    def to_dict(self) -> dict:
        return {"energy_hartree": self.energy_hartree, "energy_hartree_text": self.text,
                "numerical_error_hartree": self.numerical_error_hartree, "method": self.method,
                "working_bits": self.working_bits, "history": list(self.history),
                "seconds": dict(self.seconds), "lost_digits": self.lost_digits,
                "kinetic_hartree": self.kinetic_hartree, "arithmetic": dict(self.arithmetic)}


def check_precision(precision: str, digits: int | None) -> int | None:
    """Validate ``precision`` and ``digits``; return the digit target (``None`` for float64)."""
    if precision not in PRECISIONS:
        raise InputError(f"unknown precision {precision!r}; available: {', '.join(PRECISIONS)}")
    if precision == "float64":
        if digits is not None:
            raise InputError("'digits' needs precision='extended'")
        return None
    if digits is None:
        return DEFAULT_DIGITS
    if isinstance(digits, bool) or not isinstance(digits, int) or not 4 <= digits <= MAX_DIGITS:
        raise InputError(f"'digits' must be an integer between 4 and {MAX_DIGITS}, got {digits!r}")
    return digits


def _arb_from_dd(matrix: DD):
    from flint import arb_mat

    return arb_mat(matrix.hi.tolist()) + arb_mat(matrix.lo.tolist())


def _inverse_iteration(H, S, sigma: float, start: np.ndarray, target: float, max_steps: int):
    """Inverse iteration with arb matrices at the current precision; Rayleigh quotients."""
    from flint import arb, arb_mat

    N = len(start)
    M = H - S * arb(float(sigma))
    x = arb_mat(N, 1, (start / np.max(np.abs(start))).tolist())
    energies, vector = [], start
    for _step in range(max_steps):
        y = M.solve(S * x, algorithm="approx")
        vector = np.array([float(y[i, 0].mid()) for i in range(N)])
        scale = float(np.max(np.abs(vector)))
        x = arb_mat(N, 1, [arb(y[i, 0].mid()) / scale for i in range(N)])
        xt = x.transpose()
        energies.append((xt * H * x)[0, 0] / (xt * S * x)[0, 0])
        if len(energies) >= 2 and abs(float(energies[-2].mid() - energies[-1].mid())) <= target:
            break
        if max_steps == 1:
            break
    return energies, vector / np.max(np.abs(vector)), x


def _dd_vector(x) -> DD:
    """An arb column vector as a double-double vector (``hi + lo`` of each midpoint)."""
    N = x.nrows()
    hi = np.array([float(x[i, 0].mid()) for i in range(N)])
    lo = np.array([float(x[i, 0].mid() - hi[i]) for i in range(N)])
    return DD(hi, lo)


def _history(energies) -> tuple:
    last = energies[-1]
    return tuple(float(e.mid() - last.mid()) for e in energies)


def mixed_refine(exponents: np.ndarray, sign: int, Z: float, eig, root: int,
                 steps: int = 1, angular: dict | None = None) -> RefinedEnergy:
    """Double-double matrices, then inverse iteration at 128 bits from a float64 eigenpair.

    Parameters
    ----------
    exponents : ndarray, shape (N, 3)
        Exponents of the zero-power primitives (bohr⁻¹).
    sign : int
        Exchange sign.
    Z : float
        Nuclear charge.
    eig : twoel.solver.eigen.EigenSolution
        The float64 solution of the same basis (shift and starting vector).
    root : int
        Index of the wanted root.
    steps : int
        Inverse-iteration steps (default one).  With the shift ``σ = E₀`` (float64) and a start
        of energy error ``Δ ≈ E₀ - E₁``, one step leaves an energy error of order ``Δ³/g²``
        (``g`` the gap to the next root); ``Δ²/g`` is reported as a conservative iteration error.
        Measured second-step changes: 2e-27 Eh (He, N = 250), 1e-24 Eh (H⁻, N = 250), against
        reported bounds ~2e-17 Eh.  When ``Δ²/g`` exceeds ``1e-16 |E|`` (a poor float64 start,
        e.g. H⁻ with its small gap to the continuum) a second step is taken and its measured
        change reported instead.
    angular : dict, optional
        ``L`` and ``electron1_l`` of a basis of ``L >= 1``
        (:func:`twoel.integrals.precise.angular_arguments`); none for S primitives.
    """
    from flint import ctx

    angular = angular or {}
    t0 = time.perf_counter()
    mats = precise.dd_matrices(exponents, sign, **angular)
    H = precise.dd_hamiltonian(mats, Z)
    S = mats["overlap"]
    old = ctx.prec
    try:
        ctx.prec = MIXED_BITS
        Ha, Sa = _arb_from_dd(H), _arb_from_dd(S)
        t1 = time.perf_counter()
        energies, vector, exact = _inverse_iteration(Ha, Sa, float(eig.values[root]), eig.vectors[:, root],
                                              1e-30, steps)
        if steps == 1 and _one_step_error(eig, root, energies[-1]) > 1e-16 * abs(float(energies[-1].mid())):
            # a poor float64 start (e.g. H⁻, small gap): take a second step and measure it
            more, vector, exact = _inverse_iteration(Ha, Sa, float(energies[-1].mid()), vector, 1e-30, 1)
            energies = energies + more
    finally:
        ctx.prec = old
    last = energies[-1]
    # Arithmetic error of the matrices, a posteriori (:func:`matrix_rounding_error`).
    from twoel.integrals.doubledouble import dd_dot, dd_matvec

    exact_vector = _dd_vector(exact)
    norm_dd = dd_dot(exact_vector, dd_matvec(S, exact_vector))
    rounding = matrix_rounding_error(exponents, sign, Z, mats, float(last.mid()), exact_vector,
                                     float(norm_dd.hi + norm_dd.lo), angular=angular)
    floor = rounding["error_hartree"]
    history = _history(energies)
    change = abs(history[-2]) if len(history) >= 2 else _one_step_error(eig, root, last)
    error = max(floor, float(last.rad()), change, 1e-30 * abs(float(last.mid())))
    t2 = time.perf_counter()
    text = _clean_arb_text(last.mid().str(32, radius=False))
    return RefinedEnergy(float(last.mid()), text, error, "double-double matrices + 128-bit inverse iteration",
                         MIXED_BITS, history, {"assembly": t1 - t0, "solve": t2 - t1}, vector=vector,
                         lost_digits=_lost_digits(last, MIXED_BITS),
                         kinetic_hartree=_dd_expectation(mats["kinetic"], S, exact_vector),
                         arithmetic=rounding)


def _dd_expectation(matrix: DD, overlap: DD, x: DD) -> float:
    """``xᵀ M x / xᵀ S x`` contracted in double-double, with the refined vector ``x`` kept to
    double-double (its norm cancels almost completely, so neither float64 matrices nor a
    float64-rounded vector can be used)."""
    from twoel.integrals.doubledouble import dd_dot, dd_matvec

    ratio = dd_dot(x, dd_matvec(matrix, x)) * dd_dot(x, dd_matvec(overlap, x)).reciprocal()
    return float(ratio.hi + ratio.lo)


#: C of the calibrated matrix-rounding law of :func:`matrix_rounding_error` (the deviations of the
#: mixed energy from the extended-precision one: He 1¹S N = 400, 800, 1131)
MATRIX_ERROR_FACTOR = 8.0
#: entries of the matrices recomputed exactly by :func:`matrix_rounding_error`
ROUNDING_SAMPLES = 256
#: standard deviations of the random-rounding model taken as the estimate
ROUNDING_SIGMAS = 3.0


# Validation of :func:`matrix_rounding_error`: deviation of the mixed energy from the
# extended-precision energy of the same basis, against 3σ and the law (Eh; stored boxes):
#     He 1¹S N = 400: 4.0e-20, 3.3e-19, 5.6e-19      N = 800: 4.3e-16, 2.6e-14, 1.2e-14
#     He 1¹S N = 1131: 1.5e-17, 3.0e-17, 2.0e-17     Li⁺ N = 849: 8.3e-18, 5.4e-17, 1.1e-15
#     Li⁺ N = 1200: 1.5e-17, 1.2e-15, 1.2e-14        H⁻ N = 1200: 3.3e-17, 2.2e-15, 3.5e-17
#     He 2¹S N = 800: 5.4e-15, 2.0e-12, 4.0e-14
# With the exact entries of the whole matrix the first-order sum reproduces the deviation at
# He N = 400 (4.008e-20 Eh) but not at N = 800 (-1.0e-14 Eh): there the refined vector itself
# moves with the rounding, which no first-order sum follows; re-solving with independently
# perturbed matrices gave shifts 5-20 times *below* the deviation at N = 1131 (the actual
# rounding errors are correlated), so that was not adopted.


def matrix_rounding_error(exponents: np.ndarray, sign: int, Z: float, mats: dict, energy: float,
                          x: DD, norm: float, samples: int = ROUNDING_SAMPLES, seed: int = 0,
                          angular: dict | None = None) -> dict:
    r"""What the rounding of the double-double matrices does to the refined energy (Eh), measured.

    To first order, errors ``δH, δS`` of the matrix entries move the Rayleigh quotient of the
    refined vector ``x`` by ``δE = xᵀ(δH - E δS)x / xᵀSx``.  The vector has huge coefficients
    of both signs (``xᵀSx`` cancels almost completely), so ``δE`` is far above ``u·|E|``.

    The entry errors are *measured*: ``samples`` entries are recomputed exactly (fixed point at
    200 bits, :func:`twoel.integrals.precise.fixed_point_entries`), drawn with probability
    proportional to their weight ``w_ij = (x_i x_j m_ij)²`` in the sum (``m`` the magnitude of
    the entry's pieces, ``|T| + Z|V_nuc| + |V_ee|`` for ``H`` and ``|S|`` for ``S``), which
    gives the root-mean-square relative errors ``r_H``, ``r_S`` where they matter.  Taken as
    independent, they give the standard deviation

    .. math:: σ = \sqrt{2 \sum_{ij} x_i^2 x_j^2 (r_H^2 m^H_{ij}{}^2 + E^2 r_S^2 m^S_{ij}{}^2)} / |x^T S x|.

    The second estimate is the calibrated law ``C u |E| max|x_i|² / xᵀSx`` (``u = 2^-106``,
    ``C =`` :data:`MATRIX_ERROR_FACTOR`), which sees only the cancellation of the norm.  The
    estimate is the smaller of :data:`ROUNDING_SIGMAS` ``· σ`` and the law: an order of
    magnitude (1-80 times the actual deviation in the validation above), not a bound, so
    a bar it sets is flagged (:func:`twoel.solver.error_bar.nested_error_bar`).

    Parameters
    ----------
    exponents : ndarray, shape (N, 3)
        The basis (bohr⁻¹); ``sign`` its exchange sign, ``Z`` the nuclear charge.
    mats : dict of DD
        The double-double matrices (:func:`twoel.integrals.precise.dd_matrices`).
    energy : float
        The refined energy (Eh).
    x : DD
        The refined vector (any scale).
    norm : float
        ``xᵀSx`` contracted in double-double.
    samples, seed : int
        Entries recomputed exactly, and the seed of their choice.
    angular : dict, optional
        ``L`` and ``electron1_l`` of a basis of ``L >= 1`` (as for :func:`mixed_refine`).

    Returns
    -------
    dict
        ``error_hartree`` (the estimate), ``sigma_hartree``, ``relative_errors`` (``r_H, r_S``),
        ``samples``, ``method``.
    """
    H = precise.dd_hamiltonian(mats, Z)
    S = mats["overlap"]
    m_h = np.abs(mats["kinetic"].hi) + abs(Z) * np.abs(mats["nuclear"].hi) + np.abs(mats["repulsion"].hi)
    m_s = np.abs(S.hi)
    xv = x.hi + x.lo
    x2 = xv * xv
    weight = np.triu((x2[:, None] * x2[None, :]) * (m_h + abs(energy) * m_s) ** 2)
    total = float(weight.sum())
    if not total > 0 or not norm:
        return {"error_hartree": 0.0, "sigma_hartree": 0.0, "law_hartree": 0.0, "relative_errors": [0.0, 0.0],
                "samples": 0, "method": "no weight"}
    rng = np.random.default_rng(seed)
    flat = rng.choice(weight.size, size=samples, p=(weight / total).ravel())
    rows, cols = np.divmod(flat, weight.shape[1])
    e_h, e_s = _entry_errors(exponents, sign, Z, H, S, rows, cols, angular or {})
    r_h = math.sqrt(float(np.mean((e_h / m_h[rows, cols]) ** 2)))
    r_s = math.sqrt(float(np.mean((e_s / np.maximum(m_s[rows, cols], 1e-300)) ** 2)))
    variance = 2.0 * float(x2 @ ((r_h * m_h) ** 2 + (energy * r_s * m_s) ** 2) @ x2)
    sigma = math.sqrt(variance) / abs(norm)
    law = MATRIX_ERROR_FACTOR * 2.0 ** -106 * abs(energy) * float(np.max(x2)) / abs(norm)
    return {"error_hartree": min(ROUNDING_SIGMAS * sigma, law), "sigma_hartree": sigma, "law_hartree": law,
            "relative_errors": [r_h, r_s], "samples": int(samples),
            "method": f"smaller of the random-rounding model of the double-double entries "
                      f"({ROUNDING_SIGMAS:g} sigma; relative errors measured on {samples} entries "
                      f"recomputed exactly) and the calibrated law {MATRIX_ERROR_FACTOR:g} u |E| / xᵀSx"}


def _entry_errors(exponents, sign, Z, H: DD, S: DD, rows, cols, angular: dict):
    """Errors of the double-double ``H`` and ``S`` at the entries ``(rows, cols)`` against the
    exact (fixed-point, 200-bit) ones, times the double-double 16π² (a common factor of ``H``
    and ``S`` leaves every Rayleigh quotient unchanged, so its own rounding is left out)."""
    import mpmath

    from twoel.integrals.numbers import DOUBLE_DOUBLE

    total, P = precise.fixed_point_entries(exponents, sign, 200, rows, cols, **angular)
    factor = DOUBLE_DOUBLE.sixteen_pi_squared()
    e_h, e_s = [], []
    with mpmath.workdps(60):
        scale = (mpmath.mpf(float(factor.hi)) + mpmath.mpf(float(factor.lo))) * mpmath.mpf(2) ** -P
        charge = mpmath.mpf(float(Z))
        for n, (i, j) in enumerate(zip(rows.tolist(), cols.tolist())):
            h = (int(total["kinetic"][n]) - charge * int(total["nuclear"][n]) + int(total["repulsion"][n])) * scale
            o = int(total["overlap"][n]) * scale
            e_h.append(float(mpmath.mpf(H.hi[i, j]) + mpmath.mpf(H.lo[i, j]) - h))
            e_s.append(float(mpmath.mpf(S.hi[i, j]) + mpmath.mpf(S.lo[i, j]) - o))
    return np.array(e_h), np.array(e_s)


def _lost_digits(energy, bits: int) -> float:
    """``log10(radius / ulp)`` of an arb energy computed at ``bits`` (0 when exact)."""
    radius, mid = float(energy.rad()), abs(float(energy.mid()))
    if not (radius > 0 and mid > 0):
        return 0.0
    return max(0.0, math.log10(radius / (mid * 2.0 ** -bits)))


def _one_step_error(eig, root: int, energy) -> float:
    """Conservative error ``Δ²/g`` of one inverse-iteration step from the float64 eigenpair."""
    delta = abs(float(eig.values[root]) - float(energy.mid()))
    upper = eig.values[root + 1] if root + 1 < len(eig.values) else eig.values[root] + 1.0
    gap = max(float(upper) - float(energy.mid()), 1e-3)
    return delta * delta / gap


#: working precision of the mixed refinement (the double-double matrices carry ~106 bits)
MIXED_BITS = 128


def starting_condition_digits(size: int, condition_number: float, n_dropped: int,
                              mixed_lost_digits: float = 0.0) -> float:
    """First guess of ``log10 cond`` for the extended precision of a basis of ``size`` terms.

    The float64 condition number when no direction was dropped; else an empirical growth law
    ``16 + 8 log10(N/100)``.  The 128-bit mixed step measured what its own arithmetic lost (arb
    radius, :attr:`RefinedEnergy.lost_digits`); the exact assembly loses more (He: +1 to +3
    digits at N = 400-800, up to ~+9 at N = 1600), so that measurement counts with a margin of
    10 digits.  Too low a guess is caught by the radius check but costs a second assembly.
    """
    if n_dropped == 0 and math.isfinite(condition_number):
        guess = math.log10(max(condition_number, 1.0))
    else:
        guess = 16.0 + 8.0 * math.log10(max(size, 100) / 100.0)
    return max(guess, mixed_lost_digits + 10.0)


def working_bits(digits: int, condition_digits: float) -> int:
    """Mantissa bits for ``digits`` correct digits with overlap condition ``10^condition_digits``."""
    return int(math.ceil((digits + condition_digits + 8) * _LOG2_10 / 32.0)) * 32


def extended_refine(exponents: np.ndarray, sign: int, Z: float, start_energy: float,
                    start_vector: np.ndarray, digits: int, condition_digits: float = 20.0,
                    max_steps: int = 1, max_bits: int = 2048, gap: float | None = None,
                    angular: dict | None = None) -> RefinedEnergy:
    """Inverse iteration in arb at a working precision chosen for ``digits``.

    Parameters
    ----------
    exponents, sign, Z
        The basis and the nuclear charge.
    start_energy : float
        Shift ``σ`` (Eh), e.g. from :func:`mixed_refine`.
    start_vector : ndarray, shape (N,)
        Starting coefficients.
    digits : int
        Significant digits wanted for the energy of this basis.
    condition_digits : float
        Estimate of ``log10 cond(S)``; raised automatically if the arithmetic proves too coarse
        (the arb radius of the Rayleigh quotient is the rigorous measure of the lost digits).
    max_steps : int
        Inverse-iteration steps.  With one step (default) the iteration error is estimated as
        ``Δ²/g`` from the change ``Δ`` against ``start_energy`` and the gap ``g`` to the next
        root (as in :func:`mixed_refine`); a second step is taken automatically if that
        estimate exceeds the digit target.
    gap : float, optional
        Distance (Eh) to the next root of the same symmetry (default 0.1 Eh, conservative for
        the ground states).
    angular : dict, optional
        ``L`` and ``electron1_l`` of a basis of ``L >= 1`` (as for :func:`mixed_refine`).
    """
    from flint import arb, ctx

    bits = working_bits(digits, condition_digits)
    target = 10.0 ** (-digits - 1) * abs(start_energy)
    old_prec = ctx.prec
    seconds = {"assembly": 0.0, "solve": 0.0}
    try:
        while True:
            ctx.prec = bits
            t0 = time.perf_counter()
            mats = precise.arb_matrices(exponents, sign, bits + 32, **(angular or {}))
            H = mats["kinetic"] - mats["nuclear"] * arb(Z) + mats["repulsion"]
            S = mats["overlap"]
            t1 = time.perf_counter()
            seconds["assembly"] += t1 - t0
            energies, vector, _exact = _inverse_iteration(H, S, start_energy, start_vector, target * 1e-2,
                                                  max_steps)
            g = max(gap if gap is not None else 0.1, 1e-3)
            one_step = (float(energies[-1].mid()) - float(start_energy)) ** 2 / g
            if len(energies) == 1 and one_step > target * 1e-2:
                more, vector, _exact = _inverse_iteration(H, S, float(energies[-1].mid()), vector,
                                                  target * 1e-2, 1)
                energies = energies + more
            seconds["solve"] += time.perf_counter() - t1
            radius = float(energies[-1].rad())
            if radius <= target or bits >= max_bits:
                break
            bits = min(max_bits, bits + int(math.ceil(math.log2(radius / target))) + 64)
        last = energies[-1]
        history = _history(energies)
        change = abs(history[-2]) if len(history) >= 2 else one_step
        error = max(float(last.rad()), change)
        if not math.isfinite(error):
            raise ConvergenceError("extended-precision inverse iteration did not converge")
        text = _clean_arb_text(last.mid().str(max(digits + 8, 24), radius=False))
        return RefinedEnergy(float(last.mid()), text, error, "arb inverse iteration", bits,
                             history, seconds, vector=vector, lost_digits=_lost_digits(last, bits))
    finally:
        ctx.prec = old_prec


def _clean_arb_text(text: str) -> str:
    text = text.strip().strip("[]")
    if "+/-" in text:
        text = text.split("+/-")[0].strip()
    return text


def truncate_text(text: str, error: float) -> str:
    """``text`` (a decimal energy) rounded to the decimal place of ``error`` (Eh).

    The last printed digit is the first decimal place at or above the error bar, so
    ``-2.90372437703411959`` with error ``3e-16`` becomes ``-2.9037243770341196``.
    """
    from decimal import ROUND_HALF_EVEN, Decimal, localcontext

    if not math.isfinite(error) or error <= 0:
        return text
    place = math.floor(math.log10(error))
    with localcontext() as context:
        context.prec = 80
        value = Decimal(text)
        if place <= value.as_tuple().exponent:
            return text  # the error is below the last computed digit: keep them all
        return str(value.quantize(Decimal(1).scaleb(place), rounding=ROUND_HALF_EVEN))
