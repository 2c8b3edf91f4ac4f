"""Reinforcing-bar catalogues: the one place that knows bar sizes.

Nominal diameters and areas from the common trade tables (from memory): metric
bars (EN, IS, general SI) with area π d²/4, the Australian N series (diameter in
mm), US inch-pound sizes #3-#18 (ASTM A615) and Canadian 10M-55M (CSA G30.18).
Mass per metre follows from the nominal area and a steel density of 7850 kg/m³
(common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from types import MappingProxyType

STEEL_DENSITY = 7850.0  # kg/m³, common practice
MM2_PER_IN2 = 645.16  # (25.4 mm)², exact
MM_PER_IN = 25.4


@dataclass(frozen=True)
class BarSize:
    """One bar size: its designation as written ("#8", "25M", "N20", "20 mm"), nominal
    diameter (mm) and nominal area (mm²)."""

    name: str
    diameter: float
    area: float

    @property
    def mass_per_metre(self) -> float:
        """kg/m from the nominal area and 7850 kg/m³ (common practice)."""
        return self.area * 1e-6 * STEEL_DENSITY


def _round(d: float) -> BarSize:
    return BarSize(f"{d:g} mm", d, math.pi * d * d / 4)


METRIC = tuple(_round(d) for d in (8, 10, 12, 16, 20, 25, 32, 40))
AUSTRALIAN = tuple(BarSize(f"N{d}", d, math.pi * d * d / 4)
                   for d in (10, 12, 16, 20, 24, 28, 32, 36, 40))
# ASTM A615 inch-pound sizes: nominal diameter (in) and area (in²), from memory
_US = {3: (0.375, 0.11), 4: (0.500, 0.20), 5: (0.625, 0.31), 6: (0.750, 0.44),
       7: (0.875, 0.60), 8: (1.000, 0.79), 9: (1.128, 1.00), 10: (1.270, 1.27),
       11: (1.410, 1.56), 14: (1.693, 2.25), 18: (2.257, 4.00)}
US = tuple(BarSize(f"#{n}", d * MM_PER_IN, a * MM2_PER_IN2) for n, (d, a) in _US.items())
# CSA G30.18 metric designations: nominal diameter (mm) and area (mm²), from memory
_CSA = {10: (11.3, 100.0), 15: (16.0, 200.0), 20: (19.5, 300.0), 25: (25.2, 500.0),
        30: (29.9, 700.0), 35: (35.7, 1000.0), 45: (43.7, 1500.0), 55: (56.4, 2500.0)}
CANADIAN = tuple(BarSize(f"{n}M", d, a) for n, (d, a) in _CSA.items())

CATALOGUES = MappingProxyType({"metric": METRIC, "US": US, "CSA": CANADIAN,
                               "N": AUSTRALIAN})
"""Every catalogue by its notation system; each is ordered by diameter."""

US_SIZES = MappingProxyType({int(b.name[1:]): b for b in US})
CANADIAN_SIZES = MappingProxyType({int(b.name[:-1]): b for b in CANADIAN})


def catalogue(system: str) -> tuple[BarSize, ...]:
    """The bar sizes of a notation system: "metric", "US", "CSA" or "N"."""
    try:
        return CATALOGUES[system]
    except KeyError:
        raise KeyError(f"no bar catalogue {system!r}; there are: "
                       f"{', '.join(CATALOGUES)}") from None


def restrict(sizes: tuple[BarSize, ...], names: tuple[str, ...]) -> tuple[BarSize, ...]:
    """The sizes of a catalogue a file allows, by designation; unknown names are refused."""
    by_name = {" ".join(b.name.split()).lower().replace(" ", ""): b for b in sizes}
    chosen = []
    for name in names:
        key = name.strip().lower().replace(" ", "")
        if key not in by_name:
            raise KeyError(f"bar size {name!r} is not in this catalogue (it has: "
                           f"{', '.join(b.name for b in sizes)})")
        chosen.append(by_name[key])
    return tuple(sorted(set(chosen), key=lambda b: b.diameter))


def catalogue_of(names: tuple[str, ...]) -> tuple[str, tuple[BarSize, ...]] | None:
    """The notation system and sizes of the one catalogue that holds every name, or None
    (a name of no catalogue, or names of two)."""
    for system, sizes in CATALOGUES.items():
        try:
            return system, restrict(sizes, names)
        except KeyError:
            continue
    return None
