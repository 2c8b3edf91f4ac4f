"""Quantities with units at the input boundary: "650 mm", "5000 psi", "180 kN m", "3 #8".

Inside, clausewise works in mm, mm², MPa and N·mm. A value from a file is a
number followed by a unit, or a plain number that takes the unit system's
default (SI: mm, mm², MPa, kN·m; US: in, in², psi, kip·ft).

The hot path is lean: each string is split into a number and a unit text here,
and only the unit text goes to pint, through a cache, so pint is touched once
per distinct unit spelling however many values a file holds.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache, lru_cache
from typing import Any

from clausewise.provisions import ClausewiseError
from clausewise.provisions.bars import CANADIAN_SIZES, US_SIZES
from clausewise.provisions.beam import UnitSystem


class QuantityError(ClausewiseError, ValueError):
    """A value that is not a quantity of the kind expected.

    ``expected`` says what was expected and, where it helps, what was wrong
    ("a length (e.g. '300 mm' or '12 in'); that is a stress").
    """

    def __init__(self, value: str, expected: str, detail: str = "") -> None:
        value = shortened(value, ECHOED)
        super().__init__(f"expected {expected}, got {value!r}" + (f": {detail}" if detail else ""))
        self.value = value
        self.expected = f"{expected}; {detail}" if detail else expected


ECHOED = 80
"""Characters of a value as written that an error shows back."""
LONGEST_UNIT = 40
"""Characters after the number beyond which the text is not looked up as a unit."""


def shortened(text: str, limit: int) -> str:
    """``text`` cut to ``limit`` characters, saying how long it was: a hostile file's
    megabyte of text is not echoed."""
    if len(text) <= limit:
        return text
    return f"{text[:limit - 30]}… ({_grouped(len(text))} characters)"


def _grouped(count: int) -> str:
    """A count with its thousands spaced: "2 000 004"."""
    return f"{count:_}".replace("_", " ")


@dataclass(frozen=True, eq=False)  # compared and hashed by identity: cheap cache keys
class Kind:
    """A physical kind of input: its internal unit and the defaults for plain numbers."""

    name: str
    article: str  # "a length"
    internal: str  # pint spelling of the internal unit
    defaults: tuple[tuple[str, str], tuple[str, str]]  # (pint spelling, label) for SI, US
    examples: str

    @property
    def expected(self) -> str:
        return f"{self.article} (e.g. {self.examples})"

    def default(self, system: UnitSystem) -> tuple[str, str]:
        return self.defaults[system is UnitSystem.US]


LENGTH = Kind("length", "a length", "mm", (("mm", "mm"), ("inch", "in")),
              "'300 mm' or '12 in'")
AREA = Kind("area", "an area", "mm**2", (("mm**2", "mm²"), ("inch**2", "in²")),
            "'1500 mm2' or '2.4 in^2'")
STRESS = Kind("stress", "a stress", "MPa", (("MPa", "MPa"), ("psi", "psi")),
              "'30 MPa' or '4000 psi'")
MOMENT = Kind("moment", "a moment", "N*mm", (("kN*m", "kN m"), ("kip*ft", "kip ft")),
              "'180 kN m' or '130 kip ft'")
NUMBER = Kind("number", "a plain number", "", (("", ""), ("", "")), "'1.5'")
KINDS = (LENGTH, AREA, STRESS, MOMENT, NUMBER)

# Kinds a unit may belong to that are never an input here, named for the error message.
_OTHER_KINDS = {"force": "newton", "volume": "mm**3"}


# --- the one place that touches pint -------------------------------------------------

@lru_cache(maxsize=1)
def unit_registry() -> Any:
    """The process-wide pint registry, built on first use. pint keeps its parsed
    definitions in the user's cache folder, which cuts the build from about 0.25 s to
    0.03 s after the first run; where that folder cannot be used, it builds afresh."""
    import pint

    try:
        return pint.UnitRegistry(cache_folder=":auto:")
    except OSError:  # a read-only or missing home: the same registry, built from the text
        return pint.UnitRegistry()


@dataclass(frozen=True)
class UnitInfo:
    """What a unit spelling means: its kind (name) and the factor to the internal unit.

    ``kind`` is "" for a spelling pint does not know; ``note`` then says why.
    """

    kind: str
    factor: float
    note: str = ""


def _pint_unit(text: str) -> UnitInfo:
    """Resolve a normalised unit text with pint (uncached: call :func:`unit_info`)."""
    registry = unit_registry()
    try:
        units = registry.parse_units(text)
        quantity = registry.Quantity(1.0, units)
        dimensions = quantity.dimensionality
        for kind in KINDS:
            if dimensions == registry.Quantity(1.0, kind.internal).dimensionality:
                return UnitInfo(kind.name, float(quantity.to(kind.internal).magnitude))
        for name, example in _OTHER_KINDS.items():
            if dimensions == registry.Quantity(1.0, example).dimensionality:
                return UnitInfo(name, math.nan)
        return UnitInfo("other", math.nan, f"a unit of {dimensions}")
    except Exception as exc:  # pint raises many kinds; any of them means "not a unit"
        return UnitInfo("", math.nan, f"unknown unit ({type(exc).__name__})")


# Glued or ambiguous spellings that pint would misread (kNm is not kN·m to pint, k is the
# Boltzmann constant, kn a knot, lb a pound of mass), mapped to what an engineer means.
_ALIASES = {
    "kNm": "kN*m", "KNm": "kN*m", "knm": "kN*m", "Nmm": "N*mm", "MNm": "MN*m", "Nm": "N*m",
    "kn": "kN", "KN": "kN", "Kn": "kN", "k": "kip", "kips": "kip", "kipft": "kip*ft",
    "kft": "kip*ft", "lb": "lbf", "lbs": "lbf", "mpa": "MPa", "Mpa": "MPa", "MPA": "MPa",
    "gpa": "GPa", "Gpa": "GPa", "GPA": "GPa", "kpa": "kPa", "KPa": "kPa", "Ksi": "ksi",
    "KSI": "ksi", "PSI": "psi", "Psi": "psi",
}
_WORD = re.compile(r"[A-Za-z]+")
_JOINER = re.compile(r"(?<=[A-Za-z])\s*[-.·⋅•]\s*(?=[A-Za-z])")
_EXPONENT = re.compile(r"(?<=[A-Za-z])([23])(?![\d.])")


def normalise_unit(text: str) -> str:
    """Unit text as pint reads it: "kip-ft" -> "kip*ft", "mm2" -> "mm**2", "N/mm²" ..."""
    text = text.strip().rstrip(".").replace("²", "**2").replace("³", "**3").replace("^", "**")
    text = _JOINER.sub("*", text)
    text = _EXPONENT.sub(r"**\1", text)
    return _WORD.sub(lambda m: _ALIASES.get(m.group(), m.group()), text)


@lru_cache(maxsize=1024)
def unit_info(text: str) -> UnitInfo:
    """The meaning of a unit spelling, cached: pint sees each distinct spelling once."""
    return _pint_unit(normalise_unit(text))


# --- quantities --------------------------------------------------------------------------

_GROUPED = r"\d{1,3}(?:[ _\u2009\u202f]\d{3})+"
_SPLIT = re.compile(
    rf"\s*([+-]?(?:(?:{_GROUPED}|\d+)(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)(?![\d])\s*(.*?)\s*$",
    re.DOTALL)
_SEPARATORS = str.maketrans("", "", " _\u2009\u202f")


def _number_text(value: Any) -> str:
    return f"{value:.12g}" if isinstance(value, float) else str(value)


def read_quantity(value: Any, kind: Kind, system: UnitSystem = UnitSystem.SI,
                  sign: str = "positive") -> tuple[float, str]:
    """A value from a file in internal units, and the text to show back to the user.

    ``value`` is a string ("650 mm") or a plain number (taking ``system``'s default
    unit). ``sign`` is "positive", "non-negative" or "any"; a value must be finite.
    """
    us = system is _US  # a bool keys the caches: hashing an enum member is slow
    if type(value) is float:  # the usual plain number of a file, first: the hot path
        factor, suffix = _default_unit(kind, us)
        internal = value * factor
        if sign == "positive" and 0.0 < internal < _INF:
            return internal, f"{value:.12g}{suffix}"
        return _signed(internal, f"{value:.12g}{suffix}", kind, sign)
    if isinstance(value, str):
        return _read_text(str(value), kind, us, sign)
    if not isinstance(value, int | float) or isinstance(value, bool):
        raise QuantityError(str(value), kind.expected)
    try:
        number = float(value)
    except OverflowError:  # an integer beyond any float
        raise QuantityError(str(value), f"a finite {kind.name} (e.g. {kind.examples})"
                            ) from None
    factor, suffix = _default_unit(kind, us)
    return _signed(number * factor, f"{_number_text(value)}{suffix}", kind, sign)


_US = UnitSystem.US  # looking a member up on its enum class is slow in a hot loop
_INF = math.inf
@cache
def _default_unit(kind: Kind, us: bool) -> tuple[float, str]:
    """Factor to the internal unit of the unit a plain number takes (in US units when
    ``us``), and its label as shown after the number (" mm"; "" for a plain number)."""
    spelling, label = kind.defaults[us]
    return (unit_info(spelling).factor if spelling else 1.0), f" {label}".rstrip()


@lru_cache(maxsize=8192)
def _read_text(value: str, kind: Kind, us: bool, sign: str) -> tuple[float, str]:
    """Schedules repeat the same few spellings ("650 mm", "30 MPa"): cache whole readings."""
    match = _SPLIT.match(value)
    if match is None:
        raise QuantityError(value, kind.expected, "a number must come first, then the unit")
    number_text, unit_text = match.groups()
    try:
        number = float(number_text)
    except ValueError:  # digits grouped by spaces: "200 000"
        number = float(number_text.translate(_SEPARATORS))
    if not unit_text:
        factor, suffix = _default_unit(kind, us)
        return _signed(number * factor, f"{number_text}{suffix}", kind, sign)
    shown = " ".join(value.split())
    if len(unit_text) > LONGEST_UNIT:
        raise QuantityError(shown, kind.expected, f"the {_grouped(len(unit_text))} "
                            "characters after the number are not a unit")
    info = unit_info(unit_text)
    if info.kind != kind.name:
        why = _wrong_unit(unit_text, info)
        if "[" in why:  # pint's dimensions ("[substance] / [length] ** 3") say little
            why = f"'{unit_text}' is not a unit of {kind.name}"
        if unit_text.lower() != unit_text and unit_info(unit_text.lower()).kind == kind.name:
            why += f" (units are case-sensitive: did you mean '{unit_text.lower()}'?)"
        raise QuantityError(shown, kind.expected, why)
    return _signed(number * info.factor, shown, kind, sign)


def _signed(internal: float, shown: str, kind: Kind, sign: str) -> tuple[float, str]:
    """The reading, once its sign and finiteness are as ``sign`` asks (NaN fails all)."""
    if sign == "positive":
        ok = 0.0 < internal < math.inf
    elif sign == "non-negative":
        ok = 0.0 <= internal < math.inf
    else:
        ok = math.isfinite(internal)
    if not ok:
        _check_sign(internal, sign, kind, shown)
    return internal, shown


@lru_cache(maxsize=4096)
def _names_unit(value: str) -> bool:
    match = _SPLIT.match(value)
    return match is None or bool(match.group(2))


def has_unit(value: Any) -> bool:
    """Whether a value from a file names its unit ("300 mm"), rather than taking the unit
    system's default (300, "300")."""
    return isinstance(value, str) and _names_unit(value)


def to_internal(value: Any, kind: Kind, system: UnitSystem = UnitSystem.SI,
                sign: str = "positive") -> float:
    """Like :func:`read_quantity`, without the text to show."""
    return read_quantity(value, kind, system, sign)[0]


def _wrong_unit(unit_text: str, info: UnitInfo) -> str:
    if not info.kind:
        if unit_text[:1] in ",0123456789":
            return "write one number with a decimal point, then the unit"
        return f"'{unit_text}' is not a unit known here"
    article = "an" if info.kind[0] in "aeiou" else "a"
    return f"that is {info.note or f'{article} {info.kind}'}"


def _check_sign(value: float, sign: str, kind: Kind, shown: str) -> None:
    if not math.isfinite(value):
        raise QuantityError(shown, f"a finite {kind.name} (e.g. {kind.examples})")
    if sign == "positive" and value <= 0:
        raise QuantityError(shown, f"a positive {kind.name} (e.g. {kind.examples})")
    if sign == "non-negative" and value < 0:
        raise QuantityError(shown, f"a {kind.name} of zero or more (e.g. {kind.examples})")


# --- bars --------------------------------------------------------------------------------

# Bar sizes come from the one catalogue (clausewise.provisions.bars).
US_BARS = US_SIZES
CANADIAN_BARS = CANADIAN_SIZES
MAX_BARS = 200  # in one group; more is a typing slip
DIAMETER_RANGE = (3.0, 60.0)  # mm: outside this a bar size is a slip of the unit
BARS_EXPECTED = ("bars such as '4 x 25 mm', '3 #8', '2 N20 + 2 N16', '4 T16' or '3 25M' "
                 "(a count, then the bar size)")


@dataclass(frozen=True)
class Bars:
    """A group of bars: total area (mm²), the text to show, the largest diameter (mm), and
    the width the bars take side by side, touching (mm: the sum of count times diameter),
    and each bar's diameter in the order given (for drawing)."""

    area: float
    text: str
    largest_diameter: float
    count: int
    side_by_side: float = 0.0
    diameters: tuple[float, ...] = ()


_TERM = re.compile(
    r"\s*(?P<count>\d{1,6})(?:\s*(?P<sep>[x×X*-])\s*|\s+|(?=[#NnTYHRØøφϕ]))(?:"
    r"(?:#|[Nn]o\.?\s*)(?P<us>\d{1,3})"  # 3 #8, 3 No. 8
    r"|(?P<ca>\d{1,3})\s*M"  # 3 25M
    r"|(?:[NTYHR]|[Øøφϕ]\s*)(?P<dia>\d+(?:\.\d+)?)"  # 4 N20, 3 T16, 4 Ø20 (mm)
    r"|(?P<length>[\d.].*?)"  # 4 x 25 mm (after a separator only)
    r")\s*$", re.DOTALL)


@lru_cache(maxsize=4096)
def _bars(text: str, system: UnitSystem) -> Bars:
    total, count, largest, side_by_side = 0.0, 0, 0.0, 0.0
    diameters: list[float] = []
    for term in text.split("+"):
        match = _TERM.match(term)
        if match is None or (match["length"] is not None and match["sep"] is None):
            raise QuantityError(text, BARS_EXPECTED)
        n = int(match["count"])
        if not 1 <= n <= MAX_BARS:
            raise QuantityError(text, BARS_EXPECTED, f"a count from 1 to {MAX_BARS}")
        if match["us"] is not None:
            size = int(match["us"])
            if size not in US_BARS:
                raise QuantityError(text, BARS_EXPECTED, "US sizes are "
                                    + ", ".join(f"#{s}" for s in US_BARS))
            diameter, area = US_BARS[size].diameter, US_BARS[size].area
        elif match["ca"] is not None:
            size = int(match["ca"])
            if size not in CANADIAN_BARS:
                raise QuantityError(text, BARS_EXPECTED, "metric M sizes are "
                                    + ", ".join(f"{s}M" for s in CANADIAN_BARS))
            diameter, area = CANADIAN_BARS[size].diameter, CANADIAN_BARS[size].area
        else:
            if match["dia"] is not None:
                diameter = float(match["dia"])
            else:
                try:
                    diameter = to_internal(match["length"], LENGTH, system)
                except QuantityError as exc:
                    raise QuantityError(text, BARS_EXPECTED, "the bar diameter must be "
                                        f"{LENGTH.expected}") from exc
            low, high = DIAMETER_RANGE
            if not low <= diameter <= high:
                raise QuantityError(text, BARS_EXPECTED, f"a bar diameter between {low:g} and "
                                    f"{high:g} mm (this one is {diameter:.4g} mm)")
            area = math.pi * diameter**2 / 4
        total += n * area
        count += n
        largest = max(largest, diameter)
        side_by_side += n * diameter
        diameters += [diameter] * n
    return Bars(total, " ".join(text.split()), largest, count, side_by_side, tuple(diameters))


def read_bars(value: Any, system: UnitSystem = UnitSystem.SI) -> Bars:
    """Bars in our notation: "4 x 25 mm", "4x25mm", "3 #8", "2 x 20 mm + 2 x 16 mm",
    "4 N20", "3 T16" / "3 Y16" / "4 Ø20" (diameter in mm), "3 25M" (CSA sizes).

    A diameter after "x" without a unit takes ``system``'s length unit.
    """
    if not isinstance(value, str):
        raise QuantityError(str(value), BARS_EXPECTED)
    return _bars(value.strip(), system)
