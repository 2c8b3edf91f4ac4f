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


def cylinder_strength(beam: Beam) -> Factor:
    """The specified cylinder strength f'c / fck (MPa), converted if given as cube."""
    if beam.strength_basis is StrengthBasis.CYLINDER:
        return Factor("f'c", beam.concrete_strength, Clause("input", "specified cylinder "
                      "strength", "engineer"), "as specified", "MPa")
    value, basis = _convert(beam.concrete_strength, to_cube=False)
    clause = CLASS_TABLE if "Table" in basis else COMMON_PRACTICE
    return Factor("f'c", value, clause, f"from cube strength {_show(beam.concrete_strength)} "
                  f"MPa: {basis}", "MPa")


def cube_strength(beam: Beam) -> Factor:
    """The characteristic cube strength fck,cube (MPa), converted if given as cylinder."""
    if beam.strength_basis is StrengthBasis.CUBE:
        return Factor("fck,cube", beam.concrete_strength, Clause("input", "specified cube "
                      "strength", "engineer"), "as specified", "MPa")
    value, basis = _convert(beam.concrete_strength, to_cube=True)
    clause = CLASS_TABLE if "Table" in basis else COMMON_PRACTICE
    return Factor("fck,cube", value, clause, f"from cylinder strength "
                  f"{_show(beam.concrete_strength)} MPa: {basis}", "MPa")


def _show(value: Any) -> str:
    return f"{value:g}" if np.ndim(value) == 0 else "per beam"
