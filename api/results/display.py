"""Display units: internal N, mm, MPa shown in SI or US customary units."""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cache
from typing import Any

from clausewise.provisions import Notation, UnitSystem

# internal unit -> shown unit per unit system, as (pint spelling, shown spelling)
_SHOWN: dict[UnitSystem, dict[str, tuple[str, str]]] = {
    UnitSystem.SI: {"N·mm": ("kN*m", "kN·m"), "N": ("kN", "kN"), "mm": ("mm", "mm"),
                    "mm²": ("mm**2", "mm²"), "MPa": ("MPa", "MPa"), "kg/m": ("kg/m", "kg/m")},
    UnitSystem.US: {"N·mm": ("kip*ft", "kip·ft"), "N": ("kip", "kip"), "mm": ("inch", "in"),
                    "mm²": ("inch**2", "in²"), "MPa": ("psi", "psi"), "kg/m": ("lb/ft", "lb/ft")},
}
_INTERNAL = {"N·mm": "N*mm", "N": "N", "mm": "mm", "mm²": "mm**2", "MPa": "MPa",
             "kg/m": "kg/m"}
UNITS = {"moment": "kN·m", "force": "kN", "length": "mm", "area": "mm²", "stress": "MPa"}


@cache
def scale(unit: str, system: UnitSystem) -> tuple[float, str]:
    """The factor from an internal unit to the one shown in ``system``, from pint's
    definitions (the inch, the pound-force), and the shown unit's name."""
    if unit not in _INTERNAL:
        return 1.0, unit
    from clausewise.units import unit_registry

    target, shown = _SHOWN[system][unit]
    ureg = unit_registry()
    return float(ureg.Quantity(1.0, _INTERNAL[unit]).to(target).magnitude), shown


def convert(value: Any, unit: str, system: UnitSystem = UnitSystem.SI) -> tuple[float, str]:
    """An internal value (N, mm, MPa, N·mm) in the units shown for a unit system."""
    factor, shown = scale(unit, system)
    return float(value) * factor, shown


def number(value: Any, digits: int = 4) -> str:
    """``digits`` significant figures, no trailing zeros, thousands grouped from 10 000."""
    v = float(value)
    if not math.isfinite(v):
        return "—" if math.isnan(v) else "∞" if v > 0 else "-∞"
    if v == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(v)))
    if magnitude >= digits - 1:
        return f"{v:,.0f}".replace(",", " ") if abs(v) >= 10_000 else f"{v:.0f}"
    text = f"{v:.{digits - 1 - magnitude}f}"
    return text.rstrip("0").rstrip(".")


def utilisation_text(u: float) -> str:
    """A utilisation to three decimals everywhere it is shown (0.780, 1.000, 0.063), so a
    column of them lines up and a check at its limit reads 1.000, not 1."""
    if not math.isfinite(u):
        return "∞" if u > 0 else "—"
    return f"{u:.3f}"


@dataclass(frozen=True)
class Units:
    """How one beam's quantities are shown to the engineer: in its own unit system,
    with psi turning to ksi from 100 000 psi (moduli)."""

    system: UnitSystem

    def value(self, value: Any, unit: str, digits: int = 4) -> str:
        shown, name = convert(value, unit, self.system)
        if name == "psi" and abs(shown) >= 100_000:
            shown, name = shown / 1000, "ksi"
        text = number(shown, digits)
        return f"{text} {name}" if name and math.isfinite(shown) else text

    def unit(self, unit: str) -> str:
        return convert(1.0, unit, self.system)[1]

    def moment(self, value: Any) -> str:
        return self.value(value, "N·mm")

    def length(self, value: Any) -> str:
        return self.value(value, "mm")



def in_notation(symbol: str, notation: Notation) -> str:
    """The engine's neutral symbol (M_Rd, M_Ed, Mn, c, εt) in the edition's own notation."""
    return {"M_Rd": notation.resistance, "M_Ed": notation.demand, "Mn": notation.nominal,
            "c": notation.neutral_axis, "εt": notation.strain}.get(symbol, symbol)


def input_label(label: str, notation: Notation) -> str:
    """An input's label in the edition's symbols (a cylinder strength keeps its own name
    under an edition that works in cube strength, and the other way round)."""
    if label == "f'c":
        return "cylinder strength f'c" if notation.cube else notation.concrete
    if label == "fck,cube":
        return notation.concrete if notation.cube else "cube strength fck,cube"
    return notation.steel if label == "fy" else label
