"""Two-electron systems: the nucleus (:class:`Ion`) and the electronic state (:class:`State`).

Everything is in Hartree atomic units.  An :class:`Ion` is a nucleus of charge ``Z`` (any
``Z > 0``; non-integer values are allowed for model studies such as the critical charge) with
two electrons.  A :class:`State` is a term ``n ^(2S+1) L`` such as ``1^1S`` (the ground state),
``2^3S`` or ``2^1P``.  State names are parsed by a small grammar, never evaluated.
"""

from __future__ import annotations

import math
import numbers
import re
import unicodedata
from dataclasses import dataclass

from twoel.errors import InputError

#: element symbols and names for Z = 1..118
_ELEMENTS = tuple(zip((
    "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn Ga Ge As "
    "Se Br Kr Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd "
    "Tb Dy Ho Er Tm Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn Fr Ra Ac Th Pa U Np Pu Am "
    "Cm Bk Cf Es Fm Md No Lr Rf Db Sg Bh Hs Mt Ds Rg Cn Nh Fl Mc Lv Ts Og "
).split(), (
    "hydrogen helium lithium beryllium boron carbon nitrogen oxygen fluorine neon sodium "
    "magnesium aluminium silicon phosphorus sulfur chlorine argon potassium calcium scandium "
    "titanium vanadium chromium manganese iron cobalt nickel copper zinc gallium germanium "
    "arsenic selenium bromine krypton rubidium strontium yttrium zirconium niobium molybdenum "
    "technetium ruthenium rhodium palladium silver cadmium indium tin antimony tellurium iodine "
    "xenon caesium barium lanthanum cerium praseodymium neodymium promethium samarium europium "
    "gadolinium terbium dysprosium holmium erbium thulium ytterbium lutetium hafnium tantalum "
    "tungsten rhenium osmium iridium platinum gold mercury thallium lead bismuth polonium "
    "astatine radon francium radium actinium thorium protactinium uranium neptunium plutonium "
    "americium curium berkelium californium einsteinium fermium mendelevium nobelium lawrencium "
    "rutherfordium dubnium seaborgium bohrium hassium meitnerium darmstadtium roentgenium "
    "copernicium nihonium flerovium moscovium livermorium tennessine oganesson "
).split()))
_SYMBOL_TO_Z = {sym.lower(): z for z, (sym, _name) in enumerate(_ELEMENTS, start=1)}
_NAME_TO_Z = {name: z for z, (_sym, name) in enumerate(_ELEMENTS, start=1)}

#: largest nuclear charge accepted (beyond it the nonrelativistic model is meaningless)
MAX_Z = 118.0
_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹", "0123456789")
_L_LETTERS = "SPDFGHIK"


def _shown(value) -> str:
    """``repr`` of a value for a message, shortened when it is a huge number."""
    text = repr(value)
    return text if len(text) <= 40 else f"{text[:12]}... ({len(text)} characters)"


def _real_charge(value) -> float:
    """``value`` as a float nuclear charge: any real number type (Python, NumPy, Fraction).

    A number too large for a float is refused here (it would overflow in :func:`float`).
    """
    if isinstance(value, bool) or not isinstance(value, numbers.Real):
        raise InputError(f"'Z' must be a number, got {_shown(value)}")
    if isinstance(value, numbers.Integral) and abs(int(value)) > 10**300:
        rule = f"at most {MAX_Z:g} (heaviest known element)" if value > 0 else "a nuclear charge > 0"
        raise InputError(f"'Z' must be {rule}, got {_shown(value)}")
    try:
        return float(value)
    except (OverflowError, ValueError, TypeError):
        raise InputError(f"'Z' must be a finite nuclear charge > 0, got {_shown(value)}") from None


def _charge_label(charge: float) -> str:
    if charge == 0:
        return ""
    magnitude = "" if abs(charge) == 1 else f"{abs(charge):g}"
    return magnitude + ("+" if charge > 0 else "-")


@dataclass(frozen=True)
class Ion:
    """A nucleus of charge ``Z`` (in units of e) with two electrons, infinite mass by default.

    Parameters
    ----------
    Z : float
        Nuclear charge, ``0 < Z <= 118``.  Non-integer values are accepted for model studies;
        :attr:`is_model` tells them apart.
    """

    Z: float

    def __post_init__(self) -> None:
        Z = _real_charge(self.Z)
        if not math.isfinite(Z) or Z <= 0:
            raise InputError(f"'Z' must be a finite nuclear charge > 0, got {_shown(self.Z)}")
        if Z > MAX_Z:
            raise InputError(f"'Z' must be at most {MAX_Z:g} (heaviest known element), got {_shown(self.Z)}")
        object.__setattr__(self, "Z", Z)

    @property
    def is_model(self) -> bool:
        """True for a non-integer Z (no real element)."""
        return not float(self.Z).is_integer()

    @property
    def symbol(self) -> str | None:
        """Element symbol for integer Z, else ``None``."""
        return None if self.is_model else _ELEMENTS[int(self.Z) - 1][0]

    @property
    def element(self) -> str | None:
        """Element name for integer Z, else ``None``."""
        return None if self.is_model else _ELEMENTS[int(self.Z) - 1][1]

    @property
    def label(self) -> str:
        """Ion label such as ``He``, ``H-``, ``Li+``, ``Ne8+`` or ``Z=1.5`` for model charges."""
        if self.is_model:
            return f"Z={self.Z:g}"
        return f"{self.symbol}{_charge_label(self.Z - 2)}"

    @property
    def threshold_hartree(self) -> float:
        """One-electron ionization threshold ``-Z²/2`` (Eh), the energy of the bare 1s ion."""
        return -0.5 * self.Z**2

    @property
    def note(self) -> str | None:
        """A note for model (non-integer) charges, ``None`` otherwise."""
        if self.is_model:
            return f"Z = {self.Z:g} is not an element: a model nuclear charge"
        return None

    @classmethod
    def parse(cls, text: str | float | int) -> "Ion":
        """Build an ion from ``2``, ``"2"``, ``"2.5"``, ``"He"`` or ``"helium"``."""
        return cls(parse_charge(text))


def parse_charge(text) -> float:
    """Parse a nuclear charge from a number, digits, element symbol or element name."""
    if isinstance(text, bool):
        raise InputError(f"'Z' must be a number or element symbol, got {text!r}")
    if isinstance(text, numbers.Real):
        return _real_charge(text)
    if not isinstance(text, str):
        raise InputError(f"'Z' must be a number or element symbol, got {_shown(text)}")
    word = text.strip()
    key = word.lower()
    if key in _SYMBOL_TO_Z:
        return float(_SYMBOL_TO_Z[key])
    if key in _NAME_TO_Z:
        return float(_NAME_TO_Z[key])
    if not re.fullmatch(r"[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?", word):
        raise InputError(f"'Z' must be a number or element symbol, got {_shown(text)}")
    value = float(word)
    if not math.isfinite(value):
        raise InputError(f"'Z' must be a finite nuclear charge > 0, got {_shown(text)}")
    return value


def parse_charge_range(text: str) -> list[float]:
    """Parse ``"1:10"`` (integers 1..10 inclusive), ``"1:3:0.5"``, ``"1,2,5"`` or ``"He,Li"``."""
    if not isinstance(text, str) or not text.strip():
        raise InputError(f"'Z' range must be like '1:10' or '1,2,5', got {text!r}")
    values: list[float] = []
    for part in text.split(","):
        part = part.strip()
        if ":" in part:
            fields = part.split(":")
            if len(fields) not in (2, 3):
                raise InputError(f"'Z' range {part!r} must be 'first:last' or 'first:last:step'")
            first, last = parse_charge(fields[0]), parse_charge(fields[1])
            step = parse_charge(fields[2]) if len(fields) == 3 else 1.0
            if step <= 0 or last < first:
                raise InputError(f"'Z' range {part!r} must increase with a positive step")
            spread = (last - first) / step
            if not math.isfinite(spread) or spread >= 200:
                raise InputError(f"'Z' range {part!r} has more than 200 values; at most 200 allowed")
            count = int(math.floor(spread + 1e-9)) + 1
            if count > 200:
                raise InputError(f"'Z' range {part!r} has {count} values; at most 200 allowed")
            values.extend(round(first + i * step, 12) for i in range(count))
        else:
            values.append(parse_charge(part))
    for z in values:
        Ion(z)  # validate each
    return values


@dataclass(frozen=True)
class State:
    """A two-electron term ``n ^(2S+1) L`` with parity ``(-1)^L`` (natural parity).

    Parameters
    ----------
    n : int
        Principal quantum number of the outer electron (``n >= 1``; ``n > L``).
    multiplicity : int
        ``2S + 1``: 1 (singlet, para) or 3 (triplet, ortho).
    L : int
        Total orbital angular momentum (0 for S, 1 for P, ...).
    """

    n: int = 1
    multiplicity: int = 1
    L: int = 0

    def __post_init__(self) -> None:
        for name in ("n", "multiplicity", "L"):   # NumPy integers are integers too
            value = getattr(self, name)
            if isinstance(value, numbers.Integral) and not isinstance(value, (bool, int)):
                object.__setattr__(self, name, int(value))
        if not isinstance(self.n, int) or self.n < 1:
            raise InputError(f"state 'n' must be an integer >= 1, got {self.n!r}")
        if self.multiplicity not in (1, 3):
            raise InputError(f"state multiplicity must be 1 (singlet) or 3 (triplet), "
                             f"got {self.multiplicity!r}")
        if not isinstance(self.L, int) or not 0 <= self.L < len(_L_LETTERS):
            raise InputError(f"state 'L' must be an integer 0..{len(_L_LETTERS) - 1}, got {self.L!r}")
        if self.n <= self.L:
            raise InputError(f"state 'n' must be greater than 'L' (n={self.n}, L={self.L})")
        if self.n == 1 and self.multiplicity == 3:
            raise InputError("there is no 1^3S state: the Pauli principle forbids a 1s² triplet")

    @property
    def spin(self) -> float:
        """Total spin S."""
        return (self.multiplicity - 1) / 2

    @property
    def is_singlet(self) -> bool:
        return self.multiplicity == 1

    @property
    def exchange_sign(self) -> int:
        """+1 for spatially symmetric (singlet) states, -1 for antisymmetric (triplet)."""
        return 1 if self.multiplicity == 1 else -1

    @property
    def letter(self) -> str:
        return _L_LETTERS[self.L]

    @property
    def root(self) -> int:
        """Index (0-based) of the root of this symmetry: ``n - L - 1`` (singlet 1S is root 0)."""
        if self.multiplicity == 1:
            return self.n - self.L - 1
        return self.n - self.L - 2 if self.L == 0 else self.n - self.L - 1

    @property
    def label(self) -> str:
        """Canonical ASCII label ``n^(2S+1)L``, e.g. ``2^3S``."""
        return f"{self.n}^{self.multiplicity}{self.letter}"

    @property
    def pretty(self) -> str:
        """Label with a superscript multiplicity, e.g. ``2³S``."""
        sup = {"1": "¹", "3": "³"}[str(self.multiplicity)]
        return f"{self.n}{sup}{self.letter}"

    def __str__(self) -> str:
        return self.label

    @classmethod
    def parse(cls, text: "str | State") -> "State":
        """Parse ``1^1S``, ``2^3S``, ``2 3S``, ``2³S``, ``2_1P`` or ``2^1P``.

        The grammar is ``n [sep] multiplicity L`` with ``sep`` one of ``^``, space, ``_`` or
        nothing when the multiplicity is a superscript.  Letters are case-insensitive.
        """
        if isinstance(text, State):
            return text
        if not isinstance(text, str):
            raise InputError(f"state must be a term symbol such as '1^1S' or '2^3P', got {text!r}")
        word = unicodedata.normalize("NFC", text.strip())
        has_superscript = any(ch in "¹³" for ch in word)
        plain = word.translate(_SUPERSCRIPTS)
        if has_superscript:
            match = re.fullmatch(r"(\d+)\s*([13])\s*([A-Za-z])", plain)
        else:
            match = re.fullmatch(r"(\d+)\s*[\^_ ]\s*([13])\s*([A-Za-z])", plain)
        if not match:
            raise InputError(f"unknown state {text!r}: write a term symbol such as '1^1S', "
                             "'2^3S', '2 3S', '2³S' or '2^1P'")
        n, mult, letter = int(match.group(1)), int(match.group(2)), match.group(3).upper()
        if letter not in _L_LETTERS:
            raise InputError(f"unknown orbital angular momentum letter {letter!r} in state {text!r}")
        return cls(n, mult, _L_LETTERS.index(letter))


GROUND = State(1, 1, 0)
