"""Shared material conversions that several editions need, with their basis."""

from __future__ import annotations

from typing import Any

import numpy as np

from clausewise.provisions.beam import Beam, StrengthBasis
from clausewise.provisions.vocabulary import Clause, Factor

MPA_PER_PSI = 0.006894757293168361  # 1 psi in MPa (exact by definition of the pound-force)
MM_PER_IN = 25.4

# EN 1992-1-1:2004 Table 3.1 strength classes, fck (cylinder) / fck,cube (MPa), from memory
STRENGTH_CLASSES = (
    (12, 15), (16, 20), (20, 25), (25, 30), (30, 37), (35, 45), (40, 50), (45, 55),
    (50, 60), (55, 67), (60, 75), (70, 85), (80, 95), (90, 105),
)
CLASS_TABLE = Clause("Table 3.1", "strength classes: cylinder and cube pairs", "en1992-1-1:2004")
COMMON_RATIO = 0.8  # cylinder/cube, common practice, no source
COMMON_PRACTICE = Clause("-", "cylinder about 0.8 of cube strength", "common practice")


def _convert(value: Any, to_cube: bool) -> tuple[Any, str]:
    cyl = np.array([c for c, _ in STRENGTH_CLASSES], float)
    cube = np.array([k for _, k in STRENGTH_CLASSES], float)
    x = np.asarray(value, float)
    xs, ys = (cyl, cube) if to_cube else (cube, cyl)
    in_table = (x >= xs[0]) & (x <= xs[-1])
    ratio = 1 / COMMON_RATIO if to_cube else COMMON_RATIO
    converted = np.where(in_table, np.interp(x, xs, ys), x * ratio)
    if np.ndim(converted):
        basis = "Table 3.1 class pairs within the table, else the ratio 0.8"
        return converted, basis
    if in_table:
        return float(converted), "interpolated between Table 3.1 class pairs"
    return float(converted), "ratio 0.8, common practice (outside Table 3.1)"


def _strength(beam: Beam, wanted: StrengthBasis, symbol: str) -> Factor:
    name = wanted.value
    if beam.strength_basis is wanted:
        return Factor(symbol, beam.concrete_strength, Clause("input", f"specified {name} "
                      "strength", "engineer"), "as specified", "MPa")
    value, basis = _convert(beam.concrete_strength, to_cube=wanted is StrengthBasis.CUBE)
    clause = CLASS_TABLE if "Table" in basis else COMMON_PRACTICE
    return Factor(symbol, value, clause, f"from {beam.strength_basis.value} strength "
                  f"{_show(beam.concrete_strength)} MPa: {basis}", "MPa")


def cylinder_strength(beam: Beam) -> Factor:
    """The specified cylinder strength f'c / fck (MPa), converted if given as cube."""
    return _strength(beam, StrengthBasis.CYLINDER, "f'c")


def cube_strength(beam: Beam) -> Factor:
    """The characteristic cube strength fck,cube (MPa), converted if given as cylinder."""
    return _strength(beam, StrengthBasis.CUBE, "fck,cube")


def _show(value: Any) -> str:
    return f"{value:g}" if np.ndim(value) == 0 else "per beam"
