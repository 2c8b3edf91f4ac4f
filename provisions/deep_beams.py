"""Beams too deep for the flexural theory of sections: the scope check each edition
writes with its own span-to-depth limit.

Plane sections and a stress block hold for a slender beam; below an edition's ratio of
span to overall depth (a deep beam) the strains are far from linear and the standards
send the designer to strut-and-tie or other methods. Where the floor layout gives no
span the check is not made (the edition cannot tell).
"""

from __future__ import annotations

import numpy as np

from clausewise.provisions.beam import Beam
from clausewise.provisions.vocabulary import Check, Clause, Sense, per_beam


def span_depth_check(beam: Beam, least: float, clause: Clause, *,
                     clear: bool = True) -> list[Check]:
    """The beam's span over its overall depth at least ``least`` (``clear``: the clear
    span ln where the layout gives it, else the span; otherwise the span itself)."""
    layout = beam.layout
    if layout is None:
        return []
    use_clear = clear and layout.clear_span is not None
    span = layout.clear_span if use_clear else layout.span
    symbol = "ln/h" if use_clear else "l/h"
    ratio = per_beam(np.asarray(span, float) / np.asarray(beam.depth, float))
    what = "clear span" if use_clear else "span"
    return [Check("span-to-depth ratio beyond a deep beam's", ratio, least, Sense.AT_LEAST,
                  clause, symbol, "", f"{what} over overall depth h; below {least:g} a deep "
                  "beam, outside the flexural theory of sections")]
