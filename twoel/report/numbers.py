"""Pure number formatting for tables: digit grouping and the parenthesis (concise) notation.

``format_uncertain(-2.903724377034119, 2e-12)`` gives ``"-2.903724377034(2)"``: the value is
rounded to the last digit of the uncertainty, whose digits are written in parentheses and count
in units of that last digit (BIPM, *Guide to the expression of uncertainty in measurement*,
JCGM 100:2008, §7.2.2).  ``group_digits("-2.903724377034(2)")`` gives
``"-2.903 724 377 034(2)"``: digits after the decimal point in groups of three counted from the
point, and before it only when there are more than four (ISO 80000-1:2009, §7.3.1; BIPM SI
Brochure, 9th ed. (2019), §5.4.4).

All arithmetic is decimal (:mod:`decimal`): a value given as text keeps every digit (reference
values carry more digits than a float64), a float is taken at its shortest round-trip ``repr``.
No function here does I/O or knows about tables.
"""

from __future__ import annotations

import math
from decimal import ROUND_HALF_EVEN, ROUND_HALF_UP, Decimal, InvalidOperation, localcontext

from twoel.errors import InputError

#: thin-space separators used by the renderers
LATEX_THIN_SPACE = r"\,"
NARROW_NBSP = "\u202f"


def to_decimal(value) -> Decimal:
    """A finite :class:`~decimal.Decimal` from a float (its ``repr``), int, str or Decimal."""
    if isinstance(value, Decimal):
        result = value
    elif isinstance(value, bool):
        raise InputError(f"expected a number, got {value!r}")
    elif isinstance(value, (int, str)):
        try:
            result = Decimal(str(value).strip().replace("\u2212", "-").replace(" ", "")
                             .replace(NARROW_NBSP, "").replace("\u2009", ""))
        except InvalidOperation:
            raise InputError(f"not a number: {value!r}") from None
    else:
        try:
            result = Decimal(repr(float(value)))
        except (TypeError, ValueError, InvalidOperation):
            raise InputError(f"not a number: {value!r}") from None
    if not result.is_finite():
        raise InputError(f"not a finite number: {value!r}")
    return result


def plain(value: Decimal) -> str:
    """Fixed-point text of a Decimal (never scientific notation)."""
    text = format(value, "f")
    return text[1:] if text.startswith("-") and set(text[1:]) <= set("0.") else text


def round_to_decimals(value, decimals: int) -> str:
    """``value`` rounded half-even to ``decimals`` digits after the point, fixed-point text."""
    d = to_decimal(value)
    with localcontext() as context:
        context.prec = 80
        return plain(d.quantize(Decimal(1).scaleb(-decimals), rounding=ROUND_HALF_EVEN))


def format_uncertain(value, uncertainty=None, *, uncertainty_digits: int = 1,
                     max_decimals: int | None = None) -> str:
    """The concise notation ``value(uncertainty)``, e.g. ``"-2.903724377034(2)"``.

    Parameters
    ----------
    value : float, str or Decimal
        The number (text keeps digits beyond float64).
    uncertainty : float, str, Decimal or None
        Standard uncertainty in the same unit (``None`` or 0: the value is printed as given,
        or rounded to ``max_decimals``).
    uncertainty_digits : int
        Significant digits kept in the uncertainty (1 or 2; rounded half-up, so 0.96 with
        one digit becomes 1 in the next place).
    max_decimals : int, optional
        At most this many digits after the point.  If the uncertainty lies beyond them the
        value is rounded there and printed without parentheses (the rounding then dominates).

    Returns
    -------
    str
        ASCII text, ungrouped; see :func:`group_digits`.
    """
    if uncertainty_digits < 1:
        raise InputError(f"uncertainty_digits must be >= 1, got {uncertainty_digits}")
    with localcontext() as context:   # enough digits for a 1e-33 uncertainty on a 1e6 value
        context.prec = 80
        return _format_uncertain(value, uncertainty, uncertainty_digits, max_decimals)


def _format_uncertain(value, uncertainty, uncertainty_digits: int, max_decimals: int | None) -> str:
    v = to_decimal(value)
    u = None if uncertainty is None else abs(to_decimal(uncertainty))
    if u is None or u == 0:
        if max_decimals is not None and -v.as_tuple().exponent > max_decimals:
            return round_to_decimals(v, max_decimals)
        return plain(v)
    last = u.adjusted() - (uncertainty_digits - 1)
    uq = u.quantize(Decimal(1).scaleb(last), rounding=ROUND_HALF_UP)
    if uq.adjusted() > u.adjusted():  # 0.96 -> 1.0: the leading digit moved one place up
        last += 1
        uq = u.quantize(Decimal(1).scaleb(last), rounding=ROUND_HALF_UP)
    if max_decimals is not None and -last > max_decimals:
        return round_to_decimals(v, max_decimals)
    vq = v.quantize(Decimal(1).scaleb(last), rounding=ROUND_HALF_EVEN) if last <= 0 else \
        v.quantize(Decimal(1).scaleb(last), rounding=ROUND_HALF_EVEN).quantize(Decimal(1))
    if last <= 0:
        digits = int(uq.scaleb(-last))
        return f"{plain(vq)}({digits})"
    return f"{plain(vq)}({plain(uq.quantize(Decimal(1)))})"


def _group_integer(digits: str, sep: str) -> str:
    if len(digits) <= 4:
        return digits
    head = len(digits) % 3 or 3
    parts = [digits[:head]] + [digits[i:i + 3] for i in range(head, len(digits), 3)]
    return sep.join(parts)


def group_digits(text: str, sep: str = " ") -> str:
    """Insert ``sep`` between groups of three digits of a fixed-point number text.

    After the point, groups are counted from the point (a last group of one or two digits
    stays short: ``3.1415926`` -> ``3.141 592 6``); before it, only numbers of five or more
    digits are grouped.  A parenthesized uncertainty ``(...)`` and an exponent ``e...`` are
    kept as they are.

    >>> group_digits("-2.903724377034(2)")
    '-2.903 724 377 034(2)'
    """
    text = str(text)
    suffix = ""
    for mark in ("(", "e", "E"):
        if mark in text:
            cut = text.index(mark)
            text, suffix = text[:cut], text[cut:] + suffix
            break
    sign = ""
    if text[:1] in "+-\u2212":
        sign, text = text[0], text[1:]
    integer, _, fraction = text.partition(".")
    if not (integer.isdigit() or integer == "") or not (fraction.isdigit() or fraction == ""):
        return sign + text + suffix  # not a plain number: leave it
    out = _group_integer(integer, sep)
    if "." in text:
        out += "." + sep.join(fraction[i:i + 3] for i in range(0, len(fraction), 3))
    return sign + out + suffix


def scientific_parts(value, digits: int = 3) -> tuple[str, int]:
    """Mantissa text (``digits`` significant digits) and exponent: ``1.23e-5 -> ("1.23", -5)``."""
    x = float(value)
    if x == 0 or not math.isfinite(x):
        return (repr(x), 0)
    text = f"{x:.{digits - 1}e}"
    mantissa, exponent = text.split("e")
    return mantissa, int(exponent)


def latex_number(text: str) -> str:
    r"""Math-mode LaTeX of a number text with thin spaces between digit groups.

    ``latex_number("-2.903724377034(2)")`` is ``$-2.903\,724\,377\,034(2)$``.
    """
    return "$" + group_digits(text, LATEX_THIN_SPACE).replace("\u2212", "-") + "$"


def latex_scientific(value, digits: int = 3) -> str:
    """``$1.23\\times 10^{-5}$`` (plain ``$0$`` for zero)."""
    mantissa, exponent = scientific_parts(value, digits)
    if exponent == 0:
        return f"${mantissa}$"
    return f"${mantissa}\\times 10^{{{exponent}}}$"


def text_scientific(value, digits: int = 3) -> str:
    """``1.23e-05`` style text with ``digits`` significant digits."""
    mantissa, exponent = scientific_parts(value, digits)
    return mantissa if exponent == 0 else f"{mantissa}e{exponent:+03d}"
