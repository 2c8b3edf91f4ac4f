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

    @property
    def label(self) -> str:
        dead = f"{self.dead:g}D" if self.dead else ""
        live = f"{self.live:g}L" if self.live else ""
        return " + ".join(p for p in (dead, live) if p) or "0"


def factored_moment(beam: Beam, combinations: Sequence[Combination], given: Clause, *,
                    name: str = "factored moment", symbol: str = "M_Ed") -> Envelope | None:
    """The largest combination of the beam's service moments (N·mm); a single "as given"
    candidate when the engineer gave the factored moment; ``None`` without actions."""
    actions = beam.actions
    if actions.factored is not None:
        return Envelope.largest(name, symbol, [Candidate("as given", actions.factored, given)],
                                "N·mm")
    if actions.dead is None:
        return None
    dead = np.asarray(actions.dead, float)
    live = np.asarray(actions.live if actions.live is not None else 0.0, float)
    return Envelope.largest(name, symbol, [
        Candidate(c.label, _out(c.dead * dead + c.live * live), c.clause) for c in combinations
    ], "N·mm")


def _out(value: Any) -> Any:
    return value if np.ndim(value) else float(value)
