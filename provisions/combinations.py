"""Factored moment from service moments: the load-combination envelope every edition needs.

One rule for every edition: a factored moment the engineer gives is taken as given; else
the largest of the edition's combinations of the dead and live moments (a live moment
left out counts as zero, a dead one may not be left out: see ``Actions``); with no
actions at all there is no demand and the assessment is of capacity only.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from clausewise.provisions.answers import Parameters
from clausewise.provisions.beam import Beam
from clausewise.provisions.vocabulary import Candidate, Clause, Envelope, per_beam


@dataclass(frozen=True)
class Combination:
    """``dead`` × D + ``live`` × L, with the clause that sets it. ``name`` replaces the
    label made from the factors where the edition writes it otherwise ("1.5(D + L)")."""

    dead: float
    live: float
    clause: Clause
    name: str = ""

    def label(self, symbols: tuple[str, str] = ("D", "L")) -> str:
        if self.name:
            return self.name
        parts = [f"{factor:g}{symbol}" for factor, symbol in zip(
            (self.dead, self.live), symbols, strict=True) if factor]
        return " + ".join(parts) or "0"


def dead_alone_and_with_live(params: Parameters) -> list[Combination]:
    """The two combinations most loading standards give for flexure, dead load alone and
    dead with live load, from an edition's parameters ``dead_only_factor``,
    ``dead_factor`` and ``live_factor`` (each combination cites its factor's clause)."""
    return [Combination(params.value("dead_only_factor"), 0.0, params["dead_only_factor"].clause),
            Combination(params.value("dead_factor"), params.value("live_factor"),
                        params["dead_factor"].clause)]


def factored_moment(beam: Beam, combinations: Sequence[Combination], given: Clause, *,
                    name: str = "factored moment", symbol: str = "M_Ed",
                    symbols: tuple[str, str] = ("D", "L")) -> Envelope | None:
    """The largest combination of the beam's service moments (N·mm); a single "as given"
    candidate when the engineer gave the factored moment; ``None`` without actions.
    ``symbols`` name the dead and live actions as the edition writes them (D/L, G/Q)."""
    actions = beam.actions
    if actions.factored is not None:
        return Envelope.largest(name, symbol, [Candidate("as given", actions.factored, given)],
                                "N·mm")
    if not actions.given:
        return None
    dead, live = (v if type(v) is float else np.asarray(v, float)  # one beam: plain floats
                  for v in (actions.dead, 0.0 if actions.live is None else actions.live))
    candidates = [Candidate(c.label(symbols), per_beam(c.dead * dead + c.live * live),
                            c.clause) for c in combinations]
    return Envelope.largest(name, symbol, candidates, "N·mm")
