"""Effective flange width from per-side overhang rules, shared by many editions.

Most standards limit each overhang (each side of the web that carries slab)
by several rules and take the smallest, side by side. ``overhang_envelope`` turns
those rules into an :class:`OverhangEnvelope` of total widths: one candidate per rule
applied on every slab side, plus "each side by its own smallest limit" when the sides
differ, so the governing candidate is always the true total
``bw + sum(min(rules) per side)``. The envelope keeps its rules, so a layer above may
add its own (``add_overhang_rules``) and the audit says, per side, which rule governed
and whose clause it is (``OverhangEnvelope.overhangs``).

Why per side: a total-width candidate such as "bw + 12 hf" is wrong when the sides
differ. With clear distances of 1.0 m and 3.0 m the narrow side may be held by half
its clear distance and the wide side by 6 hf; their sum is smaller than either total.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from clausewise.provisions.beam import Beam, Shape
from clausewise.provisions.vocabulary import Bound, Candidate, Clause, Envelope, per_beam

Value = Any
SEPARATE = "bw + overhangs, each side by its own smallest limit"


@dataclass(frozen=True)
class OverhangRule:
    """One limit on an overhang (mm). ``per_side`` gives the limit on each slab side in
    the order of :func:`slab_sides`; ``None`` means the rule does not apply there."""

    label: str
    per_side: tuple[Value | None, ...]
    clause: Clause
    basis: str = ""

    @classmethod
    def on_every_side(cls, beam: Beam, label: str, limit: Value, clause: Clause,
                      basis: str = "") -> OverhangRule:
        """The same limit on every slab side of ``beam`` (e.g. 6 hf)."""
        return cls(label, (limit,) * len(slab_sides(beam)), clause, basis)


@dataclass(frozen=True)
class Overhang:
    """One slab side: its effective overhang (mm) and the rule that set it (an index
    into ``rules``; an int array over a batch)."""

    side: str
    width: Value
    governing: Value
    rules: tuple[OverhangRule, ...]

    @property
    def rule(self) -> OverhangRule:
        """The governing rule of a single beam."""
        return self.rules[int(self.governing)]

    @property
    def clause(self) -> Clause:
        return self.rule.clause


@dataclass(frozen=True)
class OverhangEnvelope(Envelope):
    """An effective-width envelope that remembers the per-side rules it was made from."""

    rules: tuple[OverhangRule, ...] = ()
    extra: tuple[Candidate, ...] = ()
    web_width: Value = 0.0
    sides: tuple[str, ...] = ()

    @property
    def overhangs(self) -> tuple[Overhang, ...]:
        """Each slab side's overhang and the rule that governs it."""
        return overhangs(self.rules, self.sides)


def overhangs(rules: Sequence[OverhangRule], sides: Sequence[str]) -> tuple[Overhang, ...]:
    """Each side's least limit among ``rules`` and which rule set it (sides no rule
    limits are left out)."""
    found = []
    for k, side in enumerate(sides):
        applying = tuple(r for r in rules if r.per_side[k] is not None)
        if not applying:
            continue
        stack = np.array(np.broadcast_arrays(*[np.asarray(r.per_side[k], float)
                                               for r in applying]))
        index = np.argmin(stack, axis=0)
        width = np.take_along_axis(stack, index[None, ...], axis=0)[0]
        found.append(Overhang(side, per_beam(width), index if index.ndim else int(index),
                              applying))
    return tuple(found)


def slab_sides(beam: Beam) -> tuple[Value | None, ...]:
    """Clear distance (mm) to the next web on each side that carries slab.

    A T has two slab sides (left, right), an L one (the side whose clear distance is
    given, or the first). ``None`` for a side whose clear distance is not given: the
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


def side_names(beam: Beam) -> tuple[str, ...]:
    return {Shape.TEE: ("left", "right"), Shape.ELL: ("slab side",)}.get(beam.shape, ())


def half_clear_distance(beam: Beam) -> tuple[Value | None, ...]:
    """Half the clear distance to the next web on each slab side (mm), ``None`` where not
    given: the usual outer limit of an overhang."""
    return tuple(None if s is None else 0.5 * np.asarray(s, float) for s in slab_sides(beam))


def given_width(beam: Beam) -> Candidate | None:
    if beam.flange_width is None:
        return None
    return Candidate("flange width as given", beam.flange_width,
                     Clause("input", "effective flange width given by the engineer", "engineer"))


def overhang_envelope(beam: Beam, rules: Sequence[OverhangRule],
                      extra: Sequence[Candidate] = (), name: str = "effective flange width",
                      symbol: str = "b_eff") -> OverhangEnvelope:
    """Total effective width (mm) as the smallest of the candidates: the width the
    engineer gave, ``extra`` total-width candidates, each rule on every side, and each
    side by its own smallest limit."""
    bw = np.asarray(beam.web_width, float)
    sides = side_names(beam)
    candidates: list[Candidate] = list(extra)
    given = given_width(beam)
    if given is not None:
        candidates.insert(0, given)
    uniform: list[Value] = []
    for rule in rules:
        if len(rule.per_side) != len(sides):
            raise ValueError(f"overhang rule {rule.label!r} gives {len(rule.per_side)} "
                             f"side(s); a {beam.shape.value} beam has {len(sides)}")
        if all(v is not None for v in rule.per_side):
            total = bw + sum(np.asarray(v, float) for v in rule.per_side)
            uniform.append(total)
            where = "each side" if len(sides) == 2 else "the slab side"
            candidates.append(Candidate(f"bw + {rule.label} on {where}", per_beam(total),
                                        rule.clause, rule.basis))
    limited = overhangs(rules, sides)
    if sides and len(limited) == len(sides):
        separate = bw + sum(np.asarray(o.width, float) for o in limited)
        if np.ndim(separate) or not uniform or float(separate) < min(
                float(np.min(v)) for v in uniform) * (1 - 1e-12):
            candidates.append(_separate(limited, separate))
    if not candidates:
        raise ValueError(f"beam {beam.id!r}: no effective-width rule applies; give the flange "
                         "width or the floor layout (span, clear distances)")
    return OverhangEnvelope(name, symbol, Bound.SMALLEST, tuple(candidates), "mm",
                            tuple(rules), tuple(extra), beam.web_width, sides)


def add_overhang_rules(envelope: Envelope, beam: Beam,
                       *rules: OverhangRule) -> OverhangEnvelope:
    """The width answer of the layers below with further per-side rules: each overhang
    is then the least of the base's limits and these, side by side.

    For a wrapper over a base whose width comes from :func:`overhang_envelope`; the base's
    rules are kept as they are, never restated.
    """
    if not isinstance(envelope, OverhangEnvelope):
        raise TypeError(f"the effective width below ({envelope.name!r}) was not built from "
                        "per-side overhang rules (widths.overhang_envelope), so per-side "
                        "rules cannot be added to it; replace the topic instead")
    return overhang_envelope(beam, (*envelope.rules, *rules), envelope.extra, envelope.name,
                             envelope.symbol)


def _separate(overhangs: Sequence[Overhang], total: Value) -> Candidate:
    """The candidate of each side by its own smallest limit, citing the governing rule of
    each side (every rule that governs a side of some beam, for a batch)."""
    single = all(np.ndim(o.governing) == 0 for o in overhangs)
    if single:
        cited = [o.clause for o in overhangs]
        basis = "; ".join(f"{o.side} {float(o.width):.6g} mm by {o.rule.label} "
                          f"({o.clause.edition} {o.clause.ref})" for o in overhangs)
    else:
        cited = [o.rules[i].clause for o in overhangs
                 for i in sorted(set(np.asarray(o.governing).ravel().tolist()))]
        basis = "per beam"
    return Candidate(SEPARATE, per_beam(np.asarray(total, float)), _joined(cited), basis)


def _joined(clauses: Sequence[Clause]) -> Clause:
    unique = list(dict.fromkeys(clauses))
    if len(unique) == 1:
        return unique[0]
    refs = " / ".join(dict.fromkeys(c.ref for c in unique))
    editions = " + ".join(dict.fromkeys(c.edition for c in unique))
    return Clause(refs, "each overhang by its own smallest limit", editions)
