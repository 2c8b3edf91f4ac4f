"""Detailing: whether bars given by count and size fit the web, and their spacing.

Each edition answers the ``detailing_limits`` topic with its least clear
distances between bars (in a layer and between layers), the largest bar spacing
it allows for crack control where it gives a simple rule, and the cover it
names. This module turns those limits into checks on the beam's own layers, the
same call on one beam (floats) and a batch (arrays).

Bars sit side by side inside the stirrups (links): the outer bars touch the
stirrup legs, so a layer of n bars needs the width

    2 (cover + stirrup) + Σ db + (n − 1) s_min  ≤  bw     (common practice)

A layer given only as an area has no bars to place: it is not checked, and the
assessment says so.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from clausewise.provisions.beam import Beam, Context, Layer, UnitSystem
from clausewise.provisions.vocabulary import Check, Envelope, Factor, Sense, per_beam, shown

if TYPE_CHECKING:
    from clausewise.provisions.answers import Parameters
    from clausewise.provisions.registry import Edition

MM_PER_IN = 25.4
# Stated defaults where the beam file gives none (common practice, not any edition's rule):
DEFAULT_STIRRUP = {UnitSystem.SI: 10.0, UnitSystem.US: 0.375 * MM_PER_IN}  # 10 mm; #3
DEFAULT_AGGREGATE = {UnitSystem.SI: 20.0, UnitSystem.US: 0.75 * MM_PER_IN}  # 20 mm; 3/4 in


@dataclass(frozen=True)
class DetailingLimits:
    """An edition's bar-detailing limits for bars of one diameter (mm).

    ``clear_in_layer`` and ``clear_between_layers``: least clear distances, as
    ``Envelope.largest`` of the rule's terms. ``max_spacing``: the largest
    centre-to-centre spacing of the bars nearest the tension face for crack
    control, ``None`` where the edition has no simple rule (``crack_note`` says
    why). ``cover``: the cover to the stirrups the edition names, used when the
    beam gives none.
    """

    clear_in_layer: Envelope
    clear_between_layers: Envelope
    max_spacing: Envelope | None
    cover: Factor
    crack_note: str = ""


def senseless(limits: DetailingLimits) -> str:
    """What makes an edition's limits nonsense (a clear distance not positive, a negative
    cover, a value that is not a number), or "" when they make sense. A crack-control
    spacing need only be a number: with a deep cover a rule may leave no spacing at all."""
    values = [("least clear spacing", limits.clear_in_layer.value, 0.0),
              ("least clear distance between layers", limits.clear_between_layers.value, 0.0),
              ("default cover", limits.cover.value, -1e-9)]
    if limits.max_spacing is not None:
        values.append(("crack-control spacing", limits.max_spacing.value, -np.inf))
    for what, value, least in values:
        array = np.asarray(value, float)
        if not np.all(np.isfinite(array)) or np.any(array <= least):
            return f"a {what} of {shown(value, 'g')} mm"
    return ""


def stirrup_diameter(beam: Beam) -> Any:
    """The beam's stirrup (link) diameter, else the stated default (10 mm; #3 in US units)."""
    given = beam.stirrup_diameter
    return DEFAULT_STIRRUP[beam.unit_system] if given is None else given


def aggregate_size(beam: Beam) -> Any:
    """The beam's nominal maximum aggregate size, else the stated default (20 mm; 3/4 in)."""
    given = beam.aggregate_size
    return DEFAULT_AGGREGATE[beam.unit_system] if given is None else given


def cover(beam: Beam, limits: DetailingLimits) -> Any:
    """Cover to the stirrups: the beam's, else the edition's default."""
    return limits.cover.value if beam.cover is None else beam.cover


def width_needed(count: Any, bars_width: Any, clear: Any, cover_to_stirrup: Any,
                 stirrup: Any) -> Any:
    """Web width that n bars need side by side (common practice, see the module text)."""
    n = np.asarray(count, float)
    return per_beam(2 * (np.asarray(cover_to_stirrup, float) + stirrup)
                + np.asarray(bars_width, float) + (n - 1) * np.asarray(clear, float))


def bars_that_fit(width: Any, diameter: Any, clear: Any, cover_to_stirrup: Any,
                  stirrup: Any) -> Any:
    """The most bars of one diameter that fit side by side in ``width``."""
    inside = np.asarray(width, float) - 2 * (np.asarray(cover_to_stirrup, float) + stirrup)
    n = np.floor((inside + np.asarray(clear, float)) / (np.asarray(diameter, float) + clear)
                 + 1e-9)
    return per_beam(np.maximum(n, 0))


def centre_spacing(count: Any, diameter: Any, web_width: Any, cover_to_stirrup: Any,
                   stirrup: Any) -> Any:
    """Centre-to-centre spacing of n bars spread across the web between the stirrup
    corners (0 for a single bar: there is no spacing between bars)."""
    n = np.asarray(count, float)
    span = np.asarray(web_width, float) - 2 * (np.asarray(cover_to_stirrup, float) + stirrup) \
        - np.asarray(diameter, float)
    with np.errstate(divide="ignore", invalid="ignore"):
        s = np.where(n > 1, span / np.where(n > 1, n - 1, 1), 0.0)
    return per_beam(s)


def detailing_checks(beam: Beam, edition: Edition, params: Parameters,
                     context: Context) -> tuple[list[Check], list[str]]:
    """The fit and spacing checks of the beam's layers given by bars, and remarks on what
    was not checked and why."""
    checks: list[Check] = []
    remarks: list[str] = []
    groups = (("tension", beam.tension), ("compression", beam.compression))
    unplaced = [f"{name} layer {i}" for name, layers in groups
                for i, layer in enumerate(layers, 1) if not layer.has_bars]
    if unplaced:
        remarks.append("detailing not checked for " + ", ".join(unplaced)
                       + ": given as an area, not as bars")
    placed = [(name, i, layer) for name, layers in groups
              for i, layer in enumerate(layers, 1) if layer.has_bars]
    if not placed:
        return checks, remarks
    stirrup = stirrup_diameter(beam)
    asked: dict[Any, DetailingLimits | None] = {}

    def limits_for(diameter: Any) -> DetailingLimits | None:
        """The edition's limits, asked once per bar size (per array over a batch)."""
        key = float(diameter) if np.ndim(diameter) == 0 else id(diameter)
        if key not in asked:
            asked[key] = edition.detailing_limits(beam, diameter, params, context)
        return asked[key]

    for name, i, layer in placed:
        limits = limits_for(layer.diameter)
        if limits is None:
            remarks.append(f"edition {edition.id} gives no detailing limits: bars not "
                           "checked for fit or spacing")
            return checks, remarks
        c = cover(beam, limits)
        clear = limits.clear_in_layer
        bars_width = layer.bars_width if layer.bars_width is not None else \
            per_beam(np.asarray(layer.count, float) * np.asarray(layer.diameter, float))
        needed = width_needed(layer.count, bars_width, clear.value, c, stirrup)
        checks.append(Check(
            f"bars fit the web: {name} layer {i}", needed, beam.web_width, Sense.AT_MOST,
            clear.candidates[0].clause, "width", "mm",
            f"needed 2(cover + stirrup) + Σdb + (n − 1)·s, clear spacing s = largest of "
            f"{', '.join(cand.label for cand in clear.candidates)}; cover "
            f"{_length(beam, c)}, stirrup {_length(beam, stirrup)}, "
            f"{shown(layer.count, 'g')} bars"))
        if beam.cover is not None:
            checks.append(_clear_of_cover(beam, name, i, layer, stirrup, limits))
    checks += _between_layers(beam, limits_for)
    checks += _crack_spacing(beam, limits_for, stirrup, remarks)
    return checks, remarks


def _clear_of_cover(beam: Beam, name: str, i: int, layer: Layer, stirrup: Any,
                    limits: DetailingLimits) -> Check:
    """A layer's centroid at least cover + stirrup + db/2 from its own face, where the
    engineer gave the cover: bars placed inside the cover the file states cannot be built
    as drawn (a depth that assumes less cover is a slip of one input or the other)."""
    depth = np.asarray(layer.depth, float)
    from_face = np.asarray(beam.depth, float) - depth if name == "tension" else depth
    needed = np.asarray(beam.cover, float) + np.asarray(stirrup, float) \
        + 0.5 * np.asarray(layer.diameter, float)
    return Check(f"bars clear of the cover: {name} layer {i}", per_beam(from_face),
                 per_beam(needed), Sense.AT_LEAST, limits.cover.clause, "", "mm",
                 "distance from the layer's centroid to its face, at least cover + stirrup "
                 f"+ db/2 (cover {_length(beam, beam.cover)} as given, stirrup "
                 f"{_length(beam, stirrup)})")


def _length(beam: Beam, value: Any) -> str:
    """A length of a note in the beam's own units, as its file gave them."""
    if beam.unit_system is UnitSystem.US:
        return f"{shown(np.asarray(value, float) / MM_PER_IN, 'g')} in"
    return f"{shown(value, 'g')} mm"


def _between_layers(beam: Beam, limits_for: Any) -> list[Check]:
    checks = []
    layers = [layer for layer in beam.tension if layer.has_bars]
    for upper, lower in zip(layers, layers[1:], strict=False):
        same = upper.diameter is lower.diameter or (
            np.ndim(np.asarray(upper.diameter, float)) == 0
            and upper.diameter == lower.diameter)
        larger = upper.diameter if same else per_beam(np.maximum(
            np.asarray(upper.diameter, float), np.asarray(lower.diameter, float)))
        limits = limits_for(larger)
        if limits is None:
            continue
        gap = np.abs(np.asarray(lower.depth, float) - np.asarray(upper.depth, float)) \
            - (np.asarray(upper.diameter, float) + np.asarray(lower.diameter, float)) / 2
        between = limits.clear_between_layers
        checks.append(Check(
            "clear distance between tension layers", per_beam(gap), between.value,
            Sense.AT_LEAST, between.candidates[0].clause, "s_v", "mm",
            "at least the largest of " + ", ".join(cand.label for cand in between.candidates)))
    return checks


def _crack_spacing(beam: Beam, limits_for: Any, stirrup: Any,
                   remarks: list[str]) -> list[Check]:
    """Spacing of the bars of the layer nearest the tension face within the crack-control
    limit (checked when every tension layer is given by bars)."""
    if not beam.tension or not all(layer.has_bars for layer in beam.tension):
        return []
    if len(beam.tension) == 1:
        count, diameter = beam.tension[0].count, beam.tension[0].diameter
    else:
        count, diameter = _deepest(beam.tension)
    limits = limits_for(diameter)
    if limits is None:
        return []
    if limits.max_spacing is None:
        if limits.crack_note:
            remarks.append(f"crack-control spacing not checked: {limits.crack_note}")
        return []
    c = cover(beam, limits)
    s = centre_spacing(count, diameter, beam.web_width, c, stirrup)
    limit = limits.max_spacing
    return [Check("bar spacing for crack control", s, limit.value, Sense.AT_MOST,
                  limit.candidates[0].clause, "s", "mm",
                  "centre-to-centre spacing of the bars nearest the tension face, spread "
                  "between the stirrup corners (0 for one bar); limit the least of "
                  + ", ".join(cand.label for cand in limit.candidates))]


def _deepest(layers: tuple[Layer, ...]) -> tuple[Any, Any]:
    """Count and diameter of the layer farthest from the compression face, beam by beam."""
    depth, count, diameter = (np.array(np.broadcast_arrays(
        *[np.asarray(getattr(layer, name), float) for layer in layers]))
        for name in ("depth", "count", "diameter"))
    pick = np.argmax(depth, axis=0)[None, ...]
    return (per_beam(np.take_along_axis(count, pick, axis=0)[0]),
            per_beam(np.take_along_axis(diameter, pick, axis=0)[0]))
