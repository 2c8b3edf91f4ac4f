"""Display units: internal N, mm, MPa shown in SI or US customary units."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from clausewise.provisions import MM_PER_IN, MPA_PER_PSI, UnitSystem

N_PER_KIP = 4448.2216152605  # 1000 lbf in N, exact by definition of the pound-force
MM_PER_FT = 12 * MM_PER_IN

# internal unit -> (shown unit, factor) per unit system
_SCALES: dict[UnitSystem, dict[str, tuple[str, float]]] = {
    UnitSystem.SI: {"N·mm": ("kN·m", 1e-6), "N": ("kN", 1e-3), "mm": ("mm", 1.0),
                    "mm²": ("mm²", 1.0), "MPa": ("MPa", 1.0)},
    UnitSystem.US: {"N·mm": ("kip·ft", 1 / (N_PER_KIP * MM_PER_FT)), "N": ("kip", 1 / N_PER_KIP),
                    "mm": ("in", 1 / MM_PER_IN), "mm²": ("in²", 1 / MM_PER_IN**2),
                    "MPa": ("psi", 1 / MPA_PER_PSI)},
}
UNITS = {"moment": "kN·m", "force": "kN", "length": "mm", "area": "mm²", "stress": "MPa"}


def convert(value: Any, unit: str, system: UnitSystem = UnitSystem.SI) -> tuple[float, str]:
    """An internal value (N, mm, MPa, N·mm) in the units shown for a unit system."""
    shown, scale = _SCALES[system].get(unit, (unit, 1.0))
    return float(value) * scale, shown


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

