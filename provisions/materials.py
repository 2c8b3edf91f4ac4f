"""Shared material conversions, with no standard's knowledge of their own.

A beam's concrete is specified once, as cylinder or as cube strength. An edition that
works on the other basis converts with what it supplies itself: a table of strength
classes (cylinder, cube) where it has one, read linearly within it, and beyond it (or
without one) its parameter ``cylinder_cube_ratio``. Each converted value names the
supplier's clause, so an audit never cites a standard the edition is not.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from clausewise.provisions.answers import Parameters
from clausewise.provisions.beam import Beam, StrengthBasis
from clausewise.provisions.vocabulary import Clause, Factor, Parameter, per_beam, shown

MPA_PER_PSI = 0.006894757293168361  # 1 psi in MPa (exact by definition of the pound-force)
MM_PER_IN = 25.4
RATIO = "cylinder_cube_ratio"


@dataclass(frozen=True)
class ClassTable:
    """Strength classes as (cylinder, cube) pairs in MPa, ascending, with the clause of the
    edition that supplies them and the table's name for the basis line."""

    pairs: tuple[tuple[float, float], ...]
    clause: Clause
    name: str


def ratio_parameter(clause: Clause, value: float = 0.8) -> Parameter:
    """The parameter every edition that may convert declares: cylinder over cube strength.
    ``clause`` is the edition's own, saying whether the ratio is its text or common
    practice."""
    return Parameter(RATIO, value, clause, "cylinder over cube strength, for a beam given "
                     "on the other basis (outside the class table, if any)", (0.7, 0.9))


def _convert(value: Any, to_cube: bool, params: Parameters, table: ClassTable | None
             ) -> tuple[Any, Clause, str]:
    ratio = params[RATIO]
    x = np.asarray(value, float)
    scaled = x / float(ratio.value) if to_cube else x * float(ratio.value)
    by_ratio = params.cite(RATIO)
    if table is None:
        return per_beam(scaled), ratio.clause, by_ratio
    cyl = np.array([c for c, _ in table.pairs], float)
    cube = np.array([k for _, k in table.pairs], float)
    xs, ys = (cyl, cube) if to_cube else (cube, cyl)
    in_table = (x >= xs[0]) & (x <= xs[-1])
    converted = np.where(in_table, np.interp(x, xs, ys), scaled)
    classes = f"class pairs of {table.name}"
    if np.ndim(converted):
        return converted, table.clause, f"{classes} within the table, else {by_ratio}"
    if in_table:
        return float(converted), table.clause, f"interpolated between the {classes}"
    return float(converted), ratio.clause, f"{by_ratio} (outside {table.name})"


def _strength(beam: Beam, wanted: StrengthBasis, symbol: str, params: Parameters,
              table: ClassTable | None) -> Factor:
    name = wanted.value
    if beam.strength_basis is wanted:
        return Factor(symbol, beam.concrete_strength, Clause("input", f"specified {name} "
                      "strength", "engineer"), "as specified", "MPa")
    value, clause, basis = _convert(beam.concrete_strength, wanted is StrengthBasis.CUBE,
                                    params, table)
    return Factor(symbol, value, clause, f"from {beam.strength_basis.value} strength "
                  f"{shown(beam.concrete_strength, 'g')} MPa: {basis}", "MPa")


def cylinder_strength(beam: Beam, params: Parameters, table: ClassTable | None = None
                      ) -> Factor:
    """The specified cylinder strength f'c / fck (MPa), converted if given as cube."""
    return _strength(beam, StrengthBasis.CYLINDER, "f'c", params, table)


def cube_strength(beam: Beam, params: Parameters, table: ClassTable | None = None) -> Factor:
    """The characteristic cube strength fck,cube (MPa), converted if given as cylinder."""
    return _strength(beam, StrengthBasis.CUBE, "fck,cube", params, table)
