"""What the topic hooks hand back to the engine, besides the plain vocabulary."""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from dataclasses import dataclass
from typing import Any

from clausewise.core.errors import ClausewiseError
from clausewise.provisions.vocabulary import Clause, Factor, Parameter, Regime


@dataclass(frozen=True)
class Notation:
    """The symbols an edition's own text uses, so a report in that edition reads like it:
    concrete and steel strengths, the neutral-axis depth, the net tensile strain, the
    nominal moment, the design resistance and the design moment."""

    concrete: str = "f'c"
    steel: str = "fy"
    neutral_axis: str = "c"
    strain: str = "εt"
    nominal: str = "Mn"
    resistance: str = "φMn"
    demand: str = "Mu"
    cube: bool = False  # the concrete symbol names a cube strength (converted from cylinder)


@dataclass(frozen=True)
class EditionInfo:
    """Who an edition is. ``extends`` names the edition it layers over; ``forms`` the
    published forms it implements (the first is the default). Left out, ``forms`` is
    the base's for an extending edition and ("SI",) for a base. ``notation`` likewise:
    left out, an extending edition reads in its base's symbols. ``situations``: the
    design situations whose rules differ in this edition (partial factors, combinations);
    left out, the base's, or ("persistent",) for a base whose strength rules are the
    same in every situation."""

    id: str
    title: str
    year: int
    extends: str | None = None
    forms: tuple[str, ...] | None = None
    summary: str = ""
    notation: Notation | None = None
    situations: tuple[str, ...] | None = None

    def clause(self, ref: str, title: str) -> Clause:
        """A clause of this edition (so that every value names its supplier)."""
        return Clause(ref, title, self.id)


@dataclass(frozen=True)
class MaterialModel:
    """A core material law together with the factors that produced it.

    ``law`` is one of the laws re-exported by ``clausewise.provisions``
    (RectangularBlock, ParabolaRectangle, ElasticPlastic, BilinearHardening,
    PiecewiseLinear).
    """

    law: Any
    factors: tuple[Factor, ...]


@dataclass(frozen=True)
class Resistance:
    """The member factor applied to the nominal moment, the regime that set it, and
    the clause that requires design strength at least the factored demand."""

    factor: Factor
    regime: Regime
    requirement: Clause


class ParameterError(ClausewiseError, ValueError):
    """A parameter set to a value its edition does not accept."""


class Parameters(Mapping[str, Parameter]):
    """An edition's named parameters after layering: the topmost edition that sets a
    name wins, and each ``Parameter`` keeps the clause of whoever set it."""

    def __init__(self, parameters: Mapping[str, Parameter]) -> None:
        self._items = dict(parameters)

    def __getitem__(self, name: str) -> Parameter:
        try:
            return self._items[name]
        except KeyError:
            known = ", ".join(sorted(self._items)) or "none"
            raise KeyError(f"no parameter {name!r}; this edition has: {known}") from None

    def __iter__(self) -> Iterator[str]:
        return iter(self._items)

    def __len__(self) -> int:
        return len(self._items)

    def value(self, name: str) -> Any:
        return self[name].value

    def choice(self, name: str) -> str:
        """A word-valued parameter, refused unless it is one of its ``choices``."""
        p = self[name]
        if p.choices is not None and p.value not in p.choices:
            raise ParameterError(f"parameter {name} = {p.value!r} (set by {p.clause.edition}): "
                                 f"expected one of {', '.join(p.choices)}")
        return str(p.value)

    def cite(self, name: str) -> str:
        """``name = value (supplier clause)``, for a Factor's basis line."""
        p = self[name]
        return f"{name} = {p.value:g} [{p.clause.edition} {p.clause.ref}]" if isinstance(
            p.value, float | int) else f"{name} = {p.value} [{p.clause.edition} {p.clause.ref}]"
