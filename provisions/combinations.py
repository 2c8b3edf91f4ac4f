"""Factored moment from service moments: the load-combination envelope every edition needs."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from clausewise.provisions.beam import Beam
from clausewise.provisions.vocabulary import Candidate, Clause, Envelope


@dataclass(frozen=True)
class Combination:
    """``dead`` × D + ``live`` × L, with the clause that sets it."""

    dead: float
    live: float
    clause: Clause

    def label(self, symbols: tuple[str, str] = ("D", "L")) -> str:
        parts = [f"{factor:g}{symbol}" for factor, symbol in zip(
            (self.dead, self.live), symbols, strict=True) if factor]
        return " + ".join(parts) or "0"


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
    if actions.dead is None:
        return None
    dead = np.asarray(actions.dead, float)
    live = np.asarray(actions.live if actions.live is not None else 0.0, float)
    candidates = [Candidate(c.label(symbols), _out(c.dead * dead + c.live * live), c.clause)
                  for c in combinations]
    return Envelope.largest(name, symbol, candidates, "N·mm")


def _out(value: Any) -> Any:
    return value if np.ndim(value) else float(value)
