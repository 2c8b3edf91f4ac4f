"""Beam schedules: the TOML input file, its checks, and its mapping to :class:`Beam`.

A schedule file has an optional ``[project]`` table (name, building, town,
engineer, notes, ``units = "SI"`` or ``"US"``), an optional ``[run]`` table
(``editions``, ``form``, ``situation``, ``require`` with version specifiers such
as ``"aci318-19>=0.1"``, ``annexes`` as paths relative to the file) and one
``[[beam]]`` table per beam. Quantities are strings with units ("650 mm",
"5000 psi", "180 kN m") or plain numbers in the unit system's defaults.

Conventions a user must know (also in ``fixtures/demo/README.md``):

- ``bending = "hogging"`` means compression at the soffit. Every layer ``depth``
  is measured from the compression face: from the top in sagging, from the
  soffit in hogging. ``centroid_from_face`` is the other way of placing a layer:
  the distance from the face the layer lies near (the tension face for tension
  steel, the compression face for compression steel) to the layer's centroid.
- ``shape = "inverted T"`` has its flange at the soffit. In sagging the flange
  is in tension: that is the geometry of a T in hogging, so it maps to
  ``Shape.TEE`` with ``Bending.HOGGING`` (flange on the tension side); an
  inverted T in hogging has its flange in compression and maps to a T in sagging.
- ``statically_determinate`` defaults to true for a simple span or a cantilever.

Whole-file problems raise :class:`InputError`; a bad beam becomes an
:class:`InputProblem` and the other beams still load.
"""

from __future__ import annotations

import difflib
import gc
import re
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from datetime import date, datetime, time
from pathlib import Path
from typing import Annotated, Any, Literal, get_args, get_origin

from pydantic import (
    BaseModel,
    ConfigDict,
    Field,
    StrictBool,
    StringConstraints,
    ValidationError,
    WithJsonSchema,
)

from clausewise.core.errors import ClausewiseError
from clausewise.provisions.beam import (
    Actions,
    Beam,
    Bending,
    Continuity,
    FloorLayout,
    Layer,
    Shape,
    StrengthBasis,
    UnitSystem,
)
from clausewise.provisions.units import (
    AREA,
    BARS_EXPECTED,
    LENGTH,
    MOMENT,
    STRESS,
    Kind,
    QuantityError,
    read_bars,
    read_quantity,
    unit_info,
)

# --- results -------------------------------------------------------------------------


class InputError(ClausewiseError, ValueError):
    """A problem with the whole file: missing, not TOML, no beams, bad project or run table."""

    def __init__(self, message: str, problems: tuple[InputProblem, ...] = ()) -> None:
        super().__init__(message)
        self.problems = problems


@dataclass(frozen=True)
class InputProblem:
    """One bad value: where it is, what was written and what was expected.

    ``value`` is the text as written, "" when the field is missing. ``index`` is the
    beam's place in the file (from 1), for a beam without a usable id.
    """

    file: str
    beam: str | None
    field: str
    value: str
    expected: str
    index: int | None = None

    @property
    def message(self) -> str:
        where = [self.file]
        if self.beam is not None:
            where.append(f"beam {self.beam}")
        elif self.index is not None:
            where.append(f"beam number {self.index} (no usable id)")
        if self.field:
            where.append(f"field {self.field}")
        value = self.value if len(self.value) <= 80 else self.value[:77] + "..."
        got = f"got {value!r}" if value else "missing"
        return f"{', '.join(where)}: {got}, expected {self.expected}"


@dataclass(frozen=True)
class BeamEntry:
    """A loaded beam in internal units, and its inputs as the user wrote them."""

    beam: Beam
    shown: dict[str, str]


@dataclass(frozen=True)
class ProjectInfo:
    """The file's project table and run options; ``annexes`` resolved against the file."""

    name: str
    building: str
    town: str
    engineer: str
    notes: str
    unit_system: UnitSystem
    editions: tuple[str, ...]
    required: tuple[str, ...]
    annexes: tuple[Path, ...]
    form: str
    situation: str


@dataclass(frozen=True)
class Schedule:
    """Everything one file holds: the beams that loaded and the problems of those that did not."""

    source: Path
    project: ProjectInfo
    entries: tuple[BeamEntry, ...]
    problems: tuple[InputProblem, ...]


# --- the file format as pydantic models ------------------------------------------------


@dataclass(frozen=True)
class _Expect:
    """What a field expects, in words, for error messages (kept beside the field's type)."""

    text: str


_NUMBER_FIRST = r"^\s*[+-]?\.?\d"


def _quantity_schema(examples: list[str]) -> WithJsonSchema:
    return WithJsonSchema({
        "anyOf": [{"type": "string", "pattern": _NUMBER_FIRST}, {"type": "number"}],
        "examples": examples,
    })


RawQuantity = str | float  # strict: text or a number (an integer is taken as a float), no bool
_UNION_TAGS = frozenset({"str", "float"})  # pydantic names union members in error locations
Length = Annotated[RawQuantity,
                   _quantity_schema(["300 mm", "12 in", "8.4 m"]),
                   _Expect(LENGTH.expected)]
Area = Annotated[RawQuantity,
                 _quantity_schema(["1500 mm2", "2.4 in^2"]), _Expect(AREA.expected)]
Stress = Annotated[RawQuantity,
                   _quantity_schema(["30 MPa", "5000 psi", "500 MPa", "60 ksi"]),
                   _Expect(STRESS.expected)]
Moment = Annotated[RawQuantity,
                   _quantity_schema(["180 kN m", "130 kip ft"]),
                   _Expect(MOMENT.expected)]
BarText = Annotated[str,
                    WithJsonSchema({"type": "string", "pattern": _NUMBER_FIRST,
                                    "examples": ["4 x 25 mm", "3 #8", "2 N20 + 2 N16"]}),
                    _Expect(BARS_EXPECTED)]
Text = Annotated[str, _Expect("text in quotes")]
Id = Annotated[str, StringConstraints(strip_whitespace=True, min_length=1, strict=True),
               _Expect("a text id such as 'B1', unique in the file")]
_OPERATOR = r"(~=|===|==|!=|<=|>=|<|>)"
_VERSION = r"[^\s,<>=!~]+"
EditionId = Annotated[str, StringConstraints(strip_whitespace=True, strict=True,
                                             pattern=r"^[^\s<>=!~,]+$"),
                      _Expect("an edition id such as 'aci318-19'")]
Requirement = Annotated[str, StringConstraints(
    strip_whitespace=True, strict=True,
    pattern=rf"^[^\s<>=!~,]+\s*({_OPERATOR}\s*{_VERSION}(\s*,\s*{_OPERATOR}\s*{_VERSION})*)?$"),
    _Expect("an edition id with an optional version specifier, e.g. 'aci318-19>=0.1'")]


class _Model(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True)


class LayerModel(_Model):
    """One layer of bars: bars or area, and depth or centroid_from_face."""

    model_config = ConfigDict(title="layer", json_schema_extra={"allOf": [
        {"oneOf": [{"required": ["bars"]}, {"required": ["area"]}]},
        {"oneOf": [{"required": ["depth"]}, {"required": ["centroid_from_face"]}]},
    ]})

    bars: BarText | None = Field(
        default=None, description="the bars, e.g. '4 x 25 mm' or '3 #8'")
    area: Area | None = Field(
        default=None, description="the steel area, where bars are not given")
    depth: Length | None = Field(
        default=None, description="depth of the layer's centroid from the compression face "
        "(the top in sagging, the soffit in hogging)")
    centroid_from_face: Length | None = Field(
        default=None, description="distance from the face the layer lies near (the tension "
        "face for tension steel, the compression face for compression steel) to its centroid")


class FloorModel(_Model):
    """Where the beam sits in the floor, as the effective-width rules need it."""

    model_config = ConfigDict(title="floor")

    span: Length = Field(description="span, centre to centre of supports")
    continuity: Literal["simple", "end", "interior", "cantilever"] = Field(
        default="simple", description="simple span, end or interior span of a continuous "
        "beam, or cantilever")
    clear_span: Length | None = Field(
        default=None, description="clear span between support faces")
    clear_left: Length | None = Field(
        default=None, description="clear distance from this web to the next web on the left; "
        "leave out for a free edge")
    clear_right: Length | None = Field(
        default=None, description="clear distance to the next web on the right; leave out "
        "for a free edge")
    zero_moment_length: Length | None = Field(
        default=None, description="distance between points of zero moment, where known")
    adjacent_span: Length | None = Field(
        default=None, description="for a section over a support: the span on the other side")


class MomentsModel(_Model):
    """Moments in the beam's bending sense (positive): service dead and live, or factored."""

    model_config = ConfigDict(title="moments")

    dead: Moment | None = Field(default=None, description="service dead-load moment")
    live: Moment | None = Field(default=None, description="service live-load moment")
    factored: Moment | None = Field(
        default=None, description="a factored design moment, instead of the service moments")


class BeamModel(_Model):
    """One beam of the schedule."""

    model_config = ConfigDict(title="beam")

    id: Id = Field(description="the beam's mark, unique in the file")
    title: Text = Field(default="", description="a short description")
    units: Literal["SI", "US"] | None = Field(
        default=None, description="unit system for this beam's plain numbers, overriding "
        "the project's")
    shape: Literal["T", "L", "rectangular", "inverted T"] = Field(
        description="T (slab both sides), L (edge beam), rectangular, or inverted T "
        "(flange at the soffit)")
    bending: Literal["sagging", "hogging"] = Field(
        default="sagging", description="sagging: compression at the top; hogging: at the "
        "soffit")
    web_width: Length = Field(description="web width bw")
    overall_depth: Length = Field(description="overall depth h of the section")
    slab_thickness: Length | None = Field(
        default=None, description="flange (slab) thickness hf")
    effective_flange_width: Length | None = Field(
        default=None, description="an effective flange width given outright, instead of the "
        "rules")
    floor: FloorModel | None = Field(default=None, description="the floor layout")
    concrete_strength: Stress = Field(description="specified concrete strength")
    strength_basis: Literal["cylinder", "cube"] = Field(
        default="cylinder", description="whether the concrete strength is a cylinder or a "
        "cube strength")
    yield_strength: Stress = Field(description="specified yield strength of the reinforcement")
    steel_modulus: Stress | None = Field(
        default=None, description="modulus of the reinforcement; leave out for the edition's "
        "value")
    steel_kind: Literal["hot-rolled", "cold-worked", "mild"] | None = Field(
        default=None, description="how the bars are made; leave out for the edition's "
        "usual assumption")
    ductility_class: Literal["A", "B", "C", "N", "L"] = Field(
        default="N", description="ductility class of the bars (A, B, C; or N, L)")
    tension: Annotated[list[LayerModel], Field(min_length=1), _Expect(
        "a list of one or more layers, e.g. [{ bars = '4 x 25 mm', depth = '540 mm' }]")] = \
        Field(description="tension reinforcement, one table per layer")
    compression: Annotated[list[LayerModel], _Expect(
        "a list of layers, e.g. [{ bars = '2 x 16 mm', depth = '50 mm' }]")] = Field(
        default_factory=list, description="compression reinforcement, one table per layer")
    statically_determinate: StrictBool | None = Field(
        default=None, description="true for a statically determinate beam; by default true "
        "for a simple span or a cantilever")
    isolated: StrictBool = Field(
        default=False, description="true for a T whose flange is not part of a slab (an "
        "isolated T, with the limits some editions set on it)")
    moments: MomentsModel | None = Field(
        default=None, description="the actions; leave out for the capacity only")


class ProjectModel(_Model):
    """Who and what the calculation is for."""

    model_config = ConfigDict(title="project")

    name: Text = ""
    building: Text = ""
    town: Text = ""
    engineer: Text = ""
    notes: Text = ""
    units: Literal["SI", "US"] = Field(
        default="SI", description="unit system for plain numbers: SI (mm, MPa, kN m) or US "
        "(in, psi, kip ft)")


class RunModel(_Model):
    """Options of the run."""

    model_config = ConfigDict(title="run")

    editions: list[EditionId] = Field(
        default_factory=list, description="editions to check against; empty: all")
    form: Literal["auto", "SI", "inch-pound"] = Field(
        default="auto", description="published form of an edition; auto follows the beam's "
        "units")
    situation: Literal["persistent", "accidental"] = Field(
        default="persistent", description="design situation for partial factors")
    require: list[Requirement] = Field(
        default_factory=list, description="editions that must be installed, with version "
        "specifiers")
    annexes: list[Text] = Field(
        default_factory=list, description="annex parameter files, relative to this file")


class HeaderModel(_Model):
    """The file without its beams."""

    project: ProjectModel = Field(default_factory=lambda: ProjectModel())
    run: RunModel = Field(default_factory=lambda: RunModel())


class ScheduleModel(HeaderModel):
    """A clausewise beam schedule: project, run options and one table per beam."""

    model_config = ConfigDict(title="clausewise beam schedule")

    beam: Annotated[list[BeamModel], Field(min_length=1)] = Field(
        description="one [[beam]] table per beam")


# --- field expectations, derived once from the models ------------------------------------


def _submodel(annotation: Any) -> type[BaseModel] | None:
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    for arg in get_args(annotation):
        found = _submodel(arg)
        if found is not None:
            return found
    return None


def _expectation(annotation: Any, metadata: list[Any]) -> str:
    for item in metadata:
        if isinstance(item, _Expect):
            return item.text
    if get_origin(annotation) is Annotated:
        return _expectation(get_args(annotation)[0], list(annotation.__metadata__))
    if get_origin(annotation) is Literal:
        return "one of " + ", ".join(repr(choice) for choice in get_args(annotation))
    if annotation is bool:
        return "true or false"
    model = _submodel(annotation)
    if model is not None:
        return f"a table of {model.model_config.get('title', 'fields')} fields"
    for arg in get_args(annotation):  # X | None
        if arg is not type(None):
            return _expectation(arg, [])
    return "a valid value"


@dataclass(frozen=True)
class _Fields:
    """Expected text per dotted field path, and the field names under each path."""

    expected: dict[str, str]
    names: dict[str, tuple[str, ...]]

    @classmethod
    def of(cls, model: type[BaseModel]) -> _Fields:
        expected: dict[str, str] = {}
        names: dict[str, tuple[str, ...]] = {}

        def walk(current: type[BaseModel], prefix: str) -> None:
            names[prefix] = tuple(current.model_fields)
            for name, info in current.model_fields.items():
                path = f"{prefix}{name}"
                expected[path] = _expectation(info.annotation, list(info.metadata))
                sub = _submodel(info.annotation)
                if sub is not None:
                    walk(sub, path + ".")

        walk(model, "")
        return cls(expected, names)


_BEAM_FIELDS = _Fields.of(BeamModel)
_HEADER_FIELDS = _Fields.of(HeaderModel)
_TOP_LEVEL = ("project", "run", "beam")


def _did_you_mean(word: str, choices: tuple[str, ...] | list[str]) -> str:
    lowered = {c.lower(): c for c in choices}
    close = difflib.get_close_matches(word.lower(), list(lowered), n=1, cutoff=0.6)
    return f" (did you mean {lowered[close[0]]!r}?)" if close else ""


def _text(value: Any) -> str:
    """A value as the user wrote it, for messages."""
    if isinstance(value, str):
        return value
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, datetime | date | time):
        return value.isoformat()
    text = f"{value:.12g}" if isinstance(value, float) else repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


def _field_path(loc: tuple[Any, ...], tagged: bool) -> tuple[str, str]:
    """Displayed field ("tension[1].bars", layers counted from 1) and lookup key;
    ``tagged``: the location ends in the name of a union member, which is dropped."""
    shown, key = "", ""
    for part in loc[:-1] if tagged and loc[-1] in _UNION_TAGS else loc:
        if isinstance(part, int):
            shown += f"[{part + 1}]"
        else:
            shown += f".{part}" if shown else str(part)
            key += f".{part}" if key else str(part)
    return shown, key


def _from_pydantic(error: ValidationError, fields: _Fields) -> list[tuple[str, str, str]]:
    """(field, value, expected) for each distinct field a pydantic error names."""
    found: dict[str, tuple[str, str, str]] = {}
    for item in error.errors(include_url=False):
        kind = item["type"]
        field, key = _field_path(tuple(item["loc"]), tagged=kind != "extra_forbidden")
        if field in found:
            continue
        value = "" if kind == "missing" else _text(item.get("input"))
        if kind == "extra_forbidden":
            parent, _, name = key.rpartition(".")
            known = fields.names.get(parent + "." if parent else "", ())
            hint = _did_you_mean(name, known) or f" (known fields: {', '.join(known)})"
            expected = f"no field of this name here{hint}"
        else:
            expected = fields.expected.get(key, item["msg"])
            if kind == "literal_error" and isinstance(item.get("input"), str):
                choices = re.findall(r"'([^']*)'", expected)
                expected += _did_you_mean(item["input"], choices)
        found[field] = (field, value, expected)
    return list(found.values())


# --- reading one beam ---------------------------------------------------------------------

# Plausible ranges (MPa) that catch a slip of the unit; the editions check their own scope.
CONCRETE_RANGE = (5.0, 150.0)
YIELD_RANGE = (150.0, 1000.0)
MODULUS_RANGE = (100_000.0, 300_000.0)

_SHAPES = {"T": Shape.TEE, "L": Shape.ELL, "rectangular": Shape.RECTANGLE,
           "inverted T": Shape.TEE}
_FLIPPED = {Bending.SAGGING: Bending.HOGGING, Bending.HOGGING: Bending.SAGGING}
# enum members by value: a dict lookup is far cheaper than calling the enum per beam
_BENDINGS = {b.value: b for b in Bending}
_BASES = {b.value: b for b in StrengthBasis}
_CONTINUITIES = {c.value: c for c in Continuity}
_SYSTEMS = {u.value: u for u in UnitSystem}
_SHAPE_TEXT = {(shape, bending): f"{shape}, {bending}" for shape in _SHAPES
               for bending in ("sagging", "hogging")} | {
    ("inverted T", "sagging"): "inverted T, sagging (flange in tension, at the soffit)",
    ("inverted T", "hogging"): "inverted T, hogging (flange in compression, at the soffit)",
    ("T", "hogging"): "T, hogging (slab in tension)",
    ("L", "hogging"): "L, hogging (slab in tension)",
}


class _BeamReader:
    """Reads one validated beam model, collecting every bad value rather than the first."""

    def __init__(self, model: BeamModel, system: UnitSystem) -> None:
        self.model = model
        self.system = system
        self.problems: list[tuple[str, str, str]] = []
        self.shown: dict[str, str] = {}

    def problem(self, field: str, value: str, expected: str) -> None:
        self.problems.append((field, value, expected))

    def quantity(self, value: Any, field: str, kind: Kind, label: str = "",
                 sign: str = "positive") -> tuple[float, str] | None:
        if value is None:
            return None
        try:
            number, text = read_quantity(value, kind, self.system, sign)
        except QuantityError as exc:
            self.problem(field, exc.value, exc.expected)
            return None
        if label:
            self.shown[label] = text
        return number, text

    def in_user_units(self, value: float, kind: Kind) -> str:
        spelling, label = kind.default(self.system)
        return f"{_short(value / unit_info(spelling).factor)} {label}"

    def within(self, reading: tuple[float, str] | None, field: str, what: str,
               bounds: tuple[float, float]) -> None:
        if reading is None or bounds[0] <= reading[0] <= bounds[1]:
            return
        low, high = bounds
        text = f"{what} between {_short(low)} and {_short(high)} MPa"
        if self.system is UnitSystem.US:
            low_us, high_us = (_short(b / unit_info("psi").factor) for b in bounds)
            text = f"{what} between {low_us} and {high_us} psi ({_short(low)} to " \
                f"{_short(high)} MPa)"
        self.problem(field, reading[1], f"{text}; is the unit right?")

    # --- parts --------------------------------------------------------------------------
    def layers(self, name: str, models: list[LayerModel], h: tuple[float, str] | None,
               tension: bool) -> list[tuple[float, float, str]]:
        """(area, depth, shown text) per layer; depth from the compression face."""
        read: list[tuple[float, float, str]] = []
        symbol = "d" if tension else "d'"
        face = "tension" if tension else "compression"
        for i, layer in enumerate(models, 1):
            field = f"{name}[{i}]"
            area = self._layer_area(layer, field)
            depth = self._layer_depth(layer, field, h, tension, symbol, face)
            if area is not None and depth is not None:
                read.append((area[0], depth[0], f"{area[1]} {depth[1]}"))
        return read

    def _layer_area(self, layer: LayerModel, field: str) -> tuple[float, str] | None:
        if (layer.bars is None) == (layer.area is None):
            both = layer.bars is not None
            self.problem(f"{field}.area" if both else field, _text(layer.area) if both else "",
                         "bars or area, not both" if both else f"bars ({BARS_EXPECTED}) or "
                         f"area ({AREA.expected})")
            return None
        if layer.bars is not None:
            try:
                bars = read_bars(layer.bars, self.system)
            except QuantityError as exc:
                self.problem(f"{field}.bars", exc.value, exc.expected)
                return None
            return bars.area, bars.text
        return self.quantity(layer.area, f"{field}.area", AREA)

    def _layer_depth(self, layer: LayerModel, field: str, h: tuple[float, str] | None,
                     tension: bool, symbol: str, face: str) -> tuple[float, str] | None:
        if (layer.depth is None) == (layer.centroid_from_face is None):
            both = layer.depth is not None
            self.problem(f"{field}.centroid_from_face" if both else field,
                         _text(layer.centroid_from_face) if both else "",
                         "depth or centroid_from_face, not both" if both else
                         f"depth (from the compression face) or centroid_from_face, each "
                         f"{LENGTH.expected}")
            return None
        given = layer.depth if layer.depth is not None else layer.centroid_from_face
        which = "depth" if layer.depth is not None else "centroid_from_face"
        reading = self.quantity(given, f"{field}.{which}", LENGTH)
        if reading is None or h is None:
            return None
        value, text = reading
        if value >= h[0]:
            self.problem(f"{field}.{which}", text, f"a distance less than the overall depth "
                         f"({h[1]}), so that the layer lies inside the section")
            return None
        if which == "depth":
            return value, f"at {symbol} = {text}"
        depth = h[0] - value if tension else value
        return depth, f"with its centroid {text} from the {face} face"

    def floor(self) -> FloorLayout | None:
        floor = self.model.floor
        if floor is None:
            return None
        q = self.quantity
        span = q(floor.span, "floor.span", LENGTH, "span")
        self.shown["continuity"] = f"{floor.continuity} span" if floor.continuity != \
            "cantilever" else "cantilever"
        clear = q(floor.clear_span, "floor.clear_span", LENGTH, "clear span ln")
        left = q(floor.clear_left, "floor.clear_left", LENGTH, "clear distance to next web, left")
        right = q(floor.clear_right, "floor.clear_right", LENGTH,
                  "clear distance to next web, right")
        zero = q(floor.zero_moment_length, "floor.zero_moment_length", LENGTH,
                 "distance between points of zero moment")
        adjacent = q(floor.adjacent_span, "floor.adjacent_span", LENGTH, "adjacent span")
        if span is not None and clear is not None and clear[0] > span[0]:
            self.problem("floor.clear_span", clear[1], f"a clear span no longer than the span "
                         f"({span[1]})")
        if self.model.shape == "L" and left is not None and right is not None:
            self.problem("floor.clear_right", right[1], "nothing: an L beam has slab on one side "
                         "only, so give clear_left or clear_right, not both")
        if span is None:
            return None
        return FloorLayout(span[0], _CONTINUITIES[floor.continuity], _v(clear), _v(left),
                           _v(right), _v(zero), _v(adjacent))

    def actions(self) -> Actions:
        moments = self.model.moments
        if moments is None:
            return Actions()
        q = self.quantity
        dead = q(moments.dead, "moments.dead", MOMENT, "dead-load moment", "non-negative")
        live = q(moments.live, "moments.live", MOMENT, "live-load moment", "non-negative")
        factored = q(moments.factored, "moments.factored", MOMENT, "factored moment",
                     "non-negative")
        if moments.factored is not None and (moments.dead is not None
                                             or moments.live is not None):
            self.problem("moments.factored", _text(moments.factored), "either service moments "
                         "(dead, live) or a factored moment, not both")
        elif moments.live is not None and moments.dead is None:
            self.problem("moments.dead", "", f"{MOMENT.expected}: with a live moment, give the "
                         "dead moment too ('0 kN m' if there is none)")
        return Actions(_v(dead), _v(live), _v(factored))

    # --- the whole beam -------------------------------------------------------------------
    def read(self) -> Beam | None:
        m = self.model
        q = self.quantity
        flanged = m.shape != "rectangular"
        self.shown["units"] = "US customary" if self.system is UnitSystem.US else "SI"
        self.shown["shape"] = _SHAPE_TEXT[m.shape, m.bending]
        bw = q(m.web_width, "web_width", LENGTH, "web width bw")
        h = q(m.overall_depth, "overall_depth", LENGTH, "overall depth h")
        hf = q(m.slab_thickness, "slab_thickness", LENGTH, "slab thickness hf")
        bf = q(m.effective_flange_width, "effective_flange_width", LENGTH,
               "effective flange width (given)")
        fc_label = "fck,cube" if m.strength_basis == "cube" else "f'c"
        fc = q(m.concrete_strength, "concrete_strength", STRESS, fc_label)
        fy = q(m.yield_strength, "yield_strength", STRESS, "fy")
        es = q(m.steel_modulus, "steel_modulus", STRESS, "Es")
        self.shown["steel"] = f"{m.steel_kind or 'kind not stated'}, ductility class " \
            f"{m.ductility_class}"
        self.within(fc, "concrete_strength", "a concrete strength", CONCRETE_RANGE)
        self.within(fy, "yield_strength", "a yield strength", YIELD_RANGE)
        self.within(es, "steel_modulus", "a steel modulus", MODULUS_RANGE)
        self._flange(flanged, bw, h, hf, bf)
        layout = self.floor()
        if flanged and bf is None and m.effective_flange_width is None and m.floor is None:
            self.problem("floor", "", "a floor table with at least the span (or an "
                         "effective_flange_width): a flanged beam needs one for its "
                         "effective flange width")
        tension = self.layers("tension", m.tension, h, tension=True)
        compression = self.layers("compression", m.compression, h, tension=False)
        self._compression_inside(tension, compression)
        self.shown["tension steel"] = "; ".join(t for _, _, t in tension)
        if compression:
            self.shown["compression steel"] = "; ".join(t for _, _, t in compression)
        actions = self.actions()
        determinate = m.statically_determinate
        if determinate is None:
            determinate = m.floor is not None and m.floor.continuity in ("simple", "cantilever")
            self.shown["statically determinate"] = f"{'yes' if determinate else 'no'} " \
                "(from the continuity)"
        else:
            self.shown["statically determinate"] = "yes" if determinate else "no"
        if m.isolated:
            self.shown["isolated T"] = "yes: the flange is not part of a slab"
        if self.problems or bw is None or h is None or fc is None or fy is None:
            return None
        bending = _BENDINGS[m.bending]
        return Beam(
            id=m.id, shape=_SHAPES[m.shape],
            bending=_FLIPPED[bending] if m.shape == "inverted T" else bending,
            web_width=bw[0], depth=h[0], concrete_strength=fc[0], yield_strength=fy[0],
            tension=tuple(Layer(a, d) for a, d, _ in tension),
            compression=tuple(Layer(a, d) for a, d, _ in compression),
            flange_thickness=_v(hf), flange_width=_v(bf), layout=layout,
            strength_basis=_BASES[m.strength_basis], steel_modulus=_v(es),
            steel_kind=m.steel_kind or "unstated", ductility_class=m.ductility_class,
            actions=actions,
            unit_system=self.system, statically_determinate=determinate,
            isolated=m.isolated, title=m.title,
        )

    def _flange(self, flanged: bool, bw: tuple[float, str] | None, h: tuple[float, str] | None,
                hf: tuple[float, str] | None, bf: tuple[float, str] | None) -> None:
        m = self.model
        if not flanged:
            for field, value in (("slab_thickness", m.slab_thickness),
                                 ("effective_flange_width", m.effective_flange_width)):
                if value is not None:
                    self.problem(field, _text(value), "nothing: a rectangular section has no "
                                 "flange (leave this out, or choose shape 'T' or 'L')")
            return
        if m.slab_thickness is None:
            self.problem("slab_thickness", "", f"{LENGTH.expected}: a {m.shape} beam needs "
                         "the slab thickness")
        if hf is not None and h is not None and hf[0] >= h[0]:
            self.problem("slab_thickness", hf[1], f"a slab thickness less than the overall "
                         f"depth ({h[1]})")
        if bf is not None and bw is not None and bf[0] < bw[0]:
            self.problem("effective_flange_width", bf[1], f"a flange width at least the web "
                         f"width ({bw[1]})")

    def _compression_inside(self, tension: list[tuple[float, float, str]],
                            compression: list[tuple[float, float, str]]) -> None:
        if not tension or not compression:
            return
        d = sum(a * depth for a, depth, _ in tension) / sum(a for a, _, _ in tension)
        for i, (_, depth, text) in enumerate(compression, 1):
            if depth >= d:
                self.problem(f"compression[{i}]", text, "compression steel nearer the "
                             "compression face than the tension steel (effective depth d = "
                             f"{self.in_user_units(d, LENGTH)})")


def _short(value: float) -> str:
    """Three significant figures, long numbers grouped by spaces: 21 800, 0.305, 1000."""
    text = f"{float(f'{value:.3g}'):,.10g}" if abs(value) >= 10_000 else f"{value:.4g}"
    return text.replace(",", " ")


def _v(reading: tuple[float, str] | None) -> float | None:
    return None if reading is None else reading[0]


# --- the file -------------------------------------------------------------------------------


def _toml_loads(text: str, source: str) -> dict[str, Any]:
    """Parse TOML with the compiled ``rtoml`` (a large schedule parses about five times
    faster than with the standard library), falling back to ``tomllib``."""
    try:
        import rtoml as toml
    except ImportError:
        import tomllib as toml  # type: ignore[no-redef]
    try:
        return toml.loads(text.removeprefix("\ufeff"))
    except ValueError as exc:  # a parse error, or a number out of range
        raise InputError(f"{source}: not a valid TOML file: {exc}") from exc
    except RecursionError as exc:
        raise InputError(f"{source}: not a valid TOML file: nested too deeply") from exc


def _header(data: dict[str, Any], source: str, base: Path) -> ProjectInfo:
    unknown = [k for k in data if k not in _TOP_LEVEL]
    problems = [InputProblem(source, None, key, _text(data[key]), "no top-level table or key "
                             f"of this name{_did_you_mean(key, _TOP_LEVEL) or ''} (the file "
                             "holds [project], [run] and [[beam]] tables)") for key in unknown]
    header: HeaderModel | None = None
    try:
        header = HeaderModel.model_validate({k: data[k] for k in ("project", "run") if k in data})
    except ValidationError as exc:
        problems += [InputProblem(source, None, f, v, e)
                     for f, v, e in _from_pydantic(exc, _HEADER_FIELDS)]
    annexes: list[Path] = []
    if header is not None:
        for i, annex in enumerate(header.run.annexes, 1):
            path = base / annex
            if not path.is_file():
                problems.append(InputProblem(source, None, f"run.annexes[{i}]", annex,
                                             f"an annex file that exists (looked for {path})"))
            annexes.append(path)
    if problems or header is None:
        raise InputError("\n".join(p.message for p in problems), tuple(problems))
    p, run = header.project, header.run
    return ProjectInfo(p.name, p.building, p.town, p.engineer, p.notes, UnitSystem(p.units),
                       tuple(run.editions), tuple(run.require), tuple(annexes), run.form,
                       run.situation)


def _beam_id(raw: Any) -> str | None:
    if isinstance(raw, dict) and isinstance(raw.get("id"), str) and raw["id"].strip():
        return str(raw["id"].strip())
    return None


def _schedule(data: dict[str, Any], source: str, base: Path) -> Schedule:
    project = _header(data, source, base)
    beams = data.get("beam")
    if not beams:
        raise InputError(f"{source}: no beams; add at least one [[beam]] table")
    if not isinstance(beams, list):
        raise InputError(f"{source}, field beam: got {_text(beams)!r}, expected [[beam]] "
                         "tables, one per beam")
    entries: list[BeamEntry] = []
    problems: list[InputProblem] = []
    first_seen: dict[str, int] = {}
    for index, raw in enumerate(beams, 1):
        beam_id = _beam_id(raw)

        def report(found: list[tuple[str, str, str]], beam_id: str | None = beam_id,
                   index: int = index) -> None:
            problems.extend(InputProblem(source, beam_id, f, v, e, index) for f, v, e in found)

        if not isinstance(raw, dict):
            report([("beam", _text(raw), "a table of beam fields ([[beam]])")])
            continue
        try:
            model = BeamModel.model_validate(raw)
        except ValidationError as exc:
            report(_from_pydantic(exc, _BEAM_FIELDS))
            continue
        if model.id in first_seen:
            report([("id", model.id, f"an id not used by another beam (beam number "
                     f"{first_seen[model.id]} has it)")])
            continue
        first_seen[model.id] = index
        system = _SYSTEMS[model.units] if model.units else project.unit_system
        reader = _BeamReader(model, system)
        beam = reader.read()
        if beam is None:
            report(reader.problems)
        else:
            entries.append(BeamEntry(beam, reader.shown))
    return Schedule(Path(source), project, tuple(entries), tuple(problems))


@contextmanager
def _collector_paused() -> Iterator[None]:
    """Loading makes millions of small objects and no reference cycles; left on, the cycle
    collector rescans them again and again (it halves the time of a 100 000-beam file)."""
    enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if enabled:
            gc.enable()


def parse_schedule(text: str, source: str = "<text>") -> Schedule:
    """Read a schedule from TOML text; annex paths are taken relative to ``source``'s folder."""
    with _collector_paused():
        return _schedule(_toml_loads(text, source), source, Path(source).parent)


def load_schedule(path: str | Path) -> Schedule:
    """Read a schedule file. Bad beams become problems; the others load."""
    path = Path(path)
    try:
        raw = path.read_bytes()
    except FileNotFoundError as exc:
        raise InputError(f"{path}: no such file") from exc
    except IsADirectoryError as exc:
        raise InputError(f"{path}: is a folder, not a schedule file") from exc
    except OSError as exc:
        raise InputError(f"{path}: cannot be read ({exc.strerror or exc})") from exc
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputError(f"{path}: not UTF-8 text (bad byte at position {exc.start})") from exc
    return parse_schedule(text, str(path))


def json_schema() -> dict[str, Any]:
    """JSON Schema of the schedule file (draft 2020-12), for editors that check TOML.

    TOML has no null, so the optional fields' null branches are dropped, and the
    definitions are named by their titles ("beam", "layer", ...).
    """
    schema = ScheduleModel.model_json_schema()
    names = {name: d.get("title", name) for name, d in schema.get("$defs", {}).items()}

    def clean(node: Any) -> Any:
        if isinstance(node, list):
            return [clean(item) for item in node]
        if not isinstance(node, dict):
            return node
        out = {key: clean(value) for key, value in node.items()
               if not (key == "default" and value is None)}
        if "$ref" in out:
            out["$ref"] = "#/$defs/" + names[out["$ref"].rsplit("/", 1)[1]]
        if "anyOf" in out:
            options = [option for option in out.pop("anyOf") if option != {"type": "null"}]
            out = {**options[0], **out} if len(options) == 1 else {"anyOf": options, **out}
        return out

    cleaned = clean(schema)
    cleaned["$defs"] = {names[name]: d for name, d in cleaned["$defs"].items()}
    return {"$schema": "https://json-schema.org/draft/2020-12/schema", **cleaned}


__all__ = ["BeamEntry", "InputError", "InputProblem", "ProjectInfo", "Schedule",
           "json_schema", "load_schedule", "parse_schedule"]

