"""Effective flange width from per-side overhang rules, shared by many editions.

Most standards limit each overhang (each side of the web that carries slab)
by several rules and take the smallest. ``overhang_envelope`` turns those rules
into an ``Envelope`` of total widths: one candidate per rule applied on every
slab side, plus "sides governed separately" when the sides may differ, so the
governing candidate is always the true total ``bw + sum(min(rules) per side)``.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from clausewise.provisions.beam import Beam, Shape
from clausewise.provisions.vocabulary import Candidate, Clause, Envelope

Value = Any


@dataclass(frozen=True)
class OverhangRule:
    """One limit on an overhang. ``per_side`` gives the limit on each slab side in
    the order of :func:`slab_sides`; ``None`` means the rule does not apply there."""

    label: str
    per_side: tuple[Value | None, ...]
    clause: Clause
    basis: str = ""


def slab_sides(beam: Beam) -> tuple[Value | None, ...]:
    """Clear distance to the next web on each side that carries slab.

    A T has two slab sides, an L one (the side whose clear distance is given, or
    the first). ``None`` for a side whose clear distance is not given: the
    half-clear-distance rule then does not limit that side.
    """
    layout = beam.layout
    left = layout.clear_left if layout else None
    right = layout.clear_right if layout else None
    if beam.shape is Shape.TEE:
        return (left, right)
    if beam.shape is Shape.ELL:
        return (left if left is not None else right,)
    return ()


def half_clear_distance(beam: Beam) -> tuple[Value | None, ...]:
    return tuple(None if s is None else 0.5 * np.asarray(s, float) for s in slab_sides(beam))


def given_width(beam: Beam) -> Candidate | None:
    if beam.flange_width is None:
        return None
    return Candidate("flange width as given", beam.flange_width,
                     Clause("input", "effective flange width given by the engineer", "engineer"))


def overhang_envelope(beam: Beam, rules: Sequence[OverhangRule],
                      extra: Sequence[Candidate] = (), name: str = "effective flange width",
                      symbol: str = "b_eff") -> Envelope:
    """Total effective width (mm) as the smallest of the candidates."""
    bw = np.asarray(beam.web_width, float)
    sides = len(slab_sides(beam))
    candidates: list[Candidate] = list(extra)
    given = given_width(beam)
    if given is not None:
        candidates.insert(0, given)
    per_side_min: list[Value] = [np.inf] * sides
    uniform: list[Value] = []
    for rule in rules:
        values = [np.inf if v is None else np.asarray(v, float) for v in rule.per_side]
        per_side_min = [np.minimum(m, v) for m, v in zip(per_side_min, values, strict=True)]
        if all(v is not None for v in rule.per_side):
            total = bw + sum(values)
            uniform.append(total)
            where = "each side" if sides == 2 else "the slab side"
            candidates.append(Candidate(f"bw + {rule.label} on {where}", _out(total),
                                        rule.clause, rule.basis))
    separate = bw + sum(per_side_min)
    if np.all(np.isfinite(separate)) and (
            np.ndim(separate) or not uniform
            or float(separate) < min(float(np.min(v)) for v in uniform) * (1 - 1e-12)):
        clause = rules[0].clause if rules else Clause("-", "no rule", "")
        candidates.append(Candidate("bw + overhangs, each side by its own smallest limit",
                                    _out(separate), clause))
    if not candidates:
        raise ValueError(f"beam {beam.id!r}: no effective-width rule applies; give the flange "
                         "width or the floor layout (span, clear distances)")
    return Envelope.smallest(name, symbol, candidates, "mm")


def _out(value: Value) -> Value:
    return value if np.ndim(value) else float(value)
