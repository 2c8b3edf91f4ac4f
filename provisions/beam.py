"""The beam as every edition sees it: geometry, floor layout, materials, steel, actions.

Units inside are N, mm and MPa (moments in N·mm). Numeric fields are floats for
one beam or numpy arrays of shape (N,) for a batch of beams of the same kind
(same shape, bending, layer counts); the rules read them the same way.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from dataclasses import dataclass, field, fields, is_dataclass
from enum import StrEnum
from functools import cache, cached_property
from typing import Any, get_args, get_origin, get_type_hints

import numpy as np

from clausewise.core.errors import ClausewiseError
from clausewise.provisions.vocabulary import per_beam

Value = Any  # float, or numpy array over a batch


class BeamDataError(ClausewiseError, ValueError):
    """An edition needs an input this beam does not give; the message names the field of
    the beam file to add."""


class Shape(StrEnum):
    TEE = "T"
    ELL = "L"
    RECTANGLE = "rectangular"


class Bending(StrEnum):
    """The sense of the moment: sagging in a span (compression at the top face), hogging
    over a support or in a cantilever (compression at the soffit)."""

    SAGGING = "sagging"
    HOGGING = "hogging"


class Continuity(StrEnum):
    """Where the span sits in the floor, as the effective-width rules need it."""

    SIMPLE = "simple"  # simply supported, single span
    END = "end"  # end span of a continuous beam
    INTERIOR = "interior"  # interior span of a continuous beam
    CANTILEVER = "cantilever"


class StrengthBasis(StrEnum):
    CYLINDER = "cylinder"
    CUBE = "cube"


class UnitSystem(StrEnum):
    SI = "SI"
    US = "US"  # US customary: inch-pound


@dataclass(frozen=True)
class Layer:
    """Bars at one depth: ``area`` (mm²) at ``depth`` (mm) from the compression face.

    A layer given by bar notation also keeps ``count`` (bars side by side),
    ``diameter`` (the largest bar, mm) and ``bars_width`` (the sum of the bars'
    diameters, mm), which the detailing checks need; a layer given only as an area
    leaves them ``None`` and is not checked for fit or spacing.
    """

    area: Value
    depth: Value
    count: Value | None = None
    diameter: Value | None = None
    bars_width: Value | None = None

    @property
    def has_bars(self) -> bool:
        return self.count is not None and self.diameter is not None


@dataclass(frozen=True)
class FloorLayout:
    """What effective-width rules need from the floor plan (lengths in mm).

    ``clear_left`` / ``clear_right``: clear distance from this web's face to the
    face of the next web on that side; ``None`` where there is no slab on that
    side (an edge beam's free side). ``zero_moment_length``: distance between
    points of zero moment where the engineer knows it. ``adjacent_span``: for a
    section over a support, the span on the other side.
    """

    span: Value
    continuity: Continuity = Continuity.SIMPLE
    clear_span: Value | None = None
    clear_left: Value | None = None
    clear_right: Value | None = None
    zero_moment_length: Value | None = None
    adjacent_span: Value | None = None


@dataclass(frozen=True)
class Actions:
    """Moments in N·mm in the beam's bending sense: service dead and live, or a factored one.

    What may be left out, for every edition alike: everything (the capacity only); the
    live moment (dead load alone); or both service moments when a factored moment is
    given. A live moment without a dead one is refused, so that no edition has to guess
    whether "no dead moment" means zero: give ``dead = 0`` where there is none.
    """

    dead: Value | None = None
    live: Value | None = None
    factored: Value | None = None

    def __post_init__(self) -> None:
        problem = self.omission_problem(self.dead, self.live, self.factored)
        if problem is not None:
            raise BeamDataError(f"moments.{problem[0]}: {problem[1]}")

    @staticmethod
    def omission_problem(dead: Any, live: Any, factored: Any) -> tuple[str, str] | None:
        """The field at fault and why, when a combination of given moments is not allowed
        (``None`` if it is); the beam-file reader reports the same rule against its file."""
        if factored is not None and (dead is not None or live is not None):
            return "factored", "either service moments (dead, live) or a factored moment, " \
                "not both"
        if live is not None and dead is None:
            return "dead", "with a live moment, give the dead moment too (0 if there is none)"
        return None

    @property
    def given(self) -> bool:
        """Whether any action is given (else the assessment is of capacity only)."""
        return self.factored is not None or self.dead is not None


@dataclass(frozen=True)
class Beam:
    """A flanged (or rectangular) beam in internal units, ready for any edition."""

    id: str
    shape: Shape
    bending: Bending
    web_width: Value
    depth: Value
    concrete_strength: Value  # specified (characteristic) strength in MPa, on ``strength_basis``
    yield_strength: Value  # specified yield strength of the reinforcement, MPa
    tension: tuple[Layer, ...]
    compression: tuple[Layer, ...] = ()
    flange_thickness: Value | None = None
    flange_width: Value | None = None  # an effective width the engineer gives outright
    layout: FloorLayout | None = None
    strength_basis: StrengthBasis = StrengthBasis.CYLINDER
    steel_modulus: Value | None = None  # None: the edition's value
    steel_kind: str = "unstated"  # or "hot-rolled", "cold-worked" (IS 456 Fig. 23A), "mild"
    ductility_class: str = "N"
    actions: Actions = field(default_factory=Actions)
    unit_system: UnitSystem = UnitSystem.SI
    statically_determinate: bool = False
    isolated: bool = False  # a T whose flange is not part of a slab
    flange_at_soffit: bool = False  # an inverted T: the flange at the bottom face
    title: str = ""
    # detailing inputs (mm); None: the stated defaults of clausewise.provisions.detailing
    cover: Value | None = None  # clear cover to the stirrups (links)
    stirrup_diameter: Value | None = None
    aggregate_size: Value | None = None  # nominal maximum size of the coarse aggregate
    bar_sizes: tuple[str, ...] = ()  # for design: the sizes allowed; (): the whole catalogue

    @property
    def flanged(self) -> bool:
        return self.shape is not Shape.RECTANGLE

    @property
    def flange_in_compression(self) -> bool:
        """Sagging compresses the top face, hogging the soffit: the flange is in
        compression where it sits on that face."""
        return self.flanged and (self.bending is Bending.SAGGING) != self.flange_at_soffit

    @cached_property
    def size(self) -> int:
        """1 for a single beam, N for a batch (the length of any field given as an array)."""
        sizes = {np.shape(v)[0] for _, v in number_fields(self) if np.ndim(v)}
        if len(sizes) > 1:
            raise ValueError(f"beam {self.id!r}: array fields of different lengths "
                             f"{sorted(sizes)}")
        return sizes.pop() if sizes else 1

    @cached_property
    def is_batch(self) -> bool:
        return any(np.ndim(v) for _, v in number_fields(self))

    @property
    def tension_area(self) -> Value:
        return _sum(layer.area for layer in self.tension)

    @property
    def compression_area(self) -> Value:
        return _sum(layer.area for layer in self.compression) if self.compression else 0.0

    @property
    def effective_depth(self) -> Value:
        """Centroid of the tension reinforcement from the compression face (d)."""
        moment = _sum(layer.area * np.asarray(layer.depth, float) for layer in self.tension)
        return per_beam(moment / np.asarray(self.tension_area, float))

    @property
    def extreme_tension_depth(self) -> Value:
        """Depth of the tension layer farthest from the compression face (dt)."""
        return per_beam(np.maximum.reduce([np.asarray(layer.depth, float)
                                          for layer in self.tension]))

    def slab_sides(self) -> int:
        """How many sides carry a slab overhang: 2 for a T, 1 for an L, 0 for a rectangle."""
        return {Shape.TEE: 2, Shape.ELL: 1, Shape.RECTANGLE: 0}[self.shape]


NAMES = frozenset({"id", "title"})  # a beam's names: nothing a rule may branch on


@cache
def field_roles(cls: type) -> tuple[tuple[str, str], ...]:
    """Each field of a dataclass (but its names) with what it holds, read once from its
    type hints: "number" (float or array), "optional" (a number that may be None),
    "part" (a nested dataclass, maybe None), "group" (a tuple of dataclasses), "word"."""
    hints = get_type_hints(cls)
    roles = []
    for f in fields(cls):
        if f.name in NAMES:
            continue
        hint = hints[f.name]
        inner = [a for a in get_args(hint) if a is not type(None)] or [hint]
        if get_origin(hint) is tuple:  # layers are a group; a tuple of words is a word
            role = "group" if is_dataclass(get_args(hint)[0]) else "word"
        elif hint is Any or inner == [Any]:
            role = "optional" if f.default is None else "number"
        else:
            role = "part" if is_dataclass(inner[0]) else "word"
        roles.append((f.name, role))
    return tuple(roles)


def number_fields(obj: Any, prefix: str = "obj") -> Iterator[tuple[str, Any]]:
    """Every numeric field of a beam, its layers, layout and actions, as (the expression
    that reads it from ``prefix``, its value): found from the dataclass fields, so a new
    field is never forgotten, and in the same order for every beam of one kind."""
    cls: type = type(obj)
    for name, role in field_roles(cls):
        value = getattr(obj, name)
        if value is None or role == "word":
            continue
        if role == "part":
            yield from number_fields(value, f"{prefix}.{name}")
        elif role == "group":
            for j, part in enumerate(value):
                yield from number_fields(part, f"{prefix}.{name}[{j}]")
        else:
            yield f"{prefix}.{name}", value


_KIND_TERMS = {"word": "obj.{0}", "optional": "obj.{0} is None",
               "part": "None if obj.{0} is None else _{0}(obj.{0})",
               "group": "tuple(map(_{0}, obj.{0}))"}


@cache
def _kind_reader(cls: type) -> Callable[[Any], tuple[Any, ...]]:
    """One generated expression per class, as ``dataclasses`` generates ``__eq__``: the
    kind of a beam is read once per beam of a large schedule, so it must be quick. The
    readers of its parts and layers (their classes from the type hints) are called
    directly."""
    hints = get_type_hints(cls)
    parts = {f"_{name}": _kind_reader(_dataclass_of(hints[name]))
             for name, role in field_roles(cls) if role in ("part", "group")}
    terms = [_KIND_TERMS[role].format(name) for name, role in field_roles(cls) if role != "number"]
    reader: Callable[[Any], tuple[Any, ...]] = eval(  # noqa: S307 (our own field names)
        f"lambda obj: ({''.join(t + ', ' for t in terms)})", parts)
    return reader


def _dataclass_of(hint: Any) -> type:
    """The dataclass a part or group field holds: ``FloorLayout | None``, ``tuple[Layer,
    ...]``."""
    return next(a for a in (hint, *get_args(hint)) if isinstance(a, type) and is_dataclass(a))


def kind_of(obj: Any) -> tuple[Any, ...]:
    """Everything about a beam that is not a number (which optional numbers are given,
    how many layers, the words and switches), found from the dataclass fields: beams of
    one kind take the same branches of every rule, so they stack together."""
    cls: type = type(obj)
    return _kind_reader(cls)(obj)


def _sum(values: Any) -> Value:
    total = sum(np.asarray(v, float) for v in values)
    return per_beam(np.asarray(total, float))


@dataclass(frozen=True)
class Context:
    """Choices of the run that are not properties of the beam.

    ``form``: which published form of an edition to use ("SI", "inch-pound"),
    resolved by the engine before any rule runs. ``situation``: design
    situation for partial factors ("persistent" or "accidental").
    """

    form: str = "SI"
    situation: str = "persistent"
