"""The beam file format as pydantic models; the JSON Schema for editors follows from them."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Annotated, Any, Literal

from pydantic import (
    BaseModel,
    ConfigDict,
    Field,
    StrictBool,
    StringConstraints,
    WithJsonSchema,
)

from clausewise.units import AREA, BARS_EXPECTED, LENGTH, MOMENT, STRESS


@dataclass(frozen=True)
class _Expect:
    """What a field expects, in words, for error messages (kept beside the field's type)."""

    text: str


_NUMBER_FIRST = r"^\s*[+-]?\.?\d"
QUANTITY_LENGTH = 100  # characters of one quantity's text; more is not a quantity
SHORT_TEXT = 200  # characters of a title, a name, an id
LONG_TEXT = 5_000  # characters of the project notes
PATH_TEXT = 1_000  # characters of a file path

KN_M = 1e6  # N·mm per kN·m


@dataclass(frozen=True)
class Plausible:
    """The range a building beam's quantity plausibly lies in, in internal units (mm, mm²,
    MPa, N·mm): beyond it the value is a slip of the unit or of the keyboard, and is
    refused. The editions check their own, narrower scope."""

    low: float
    high: float
    unit: str  # the internal unit, for the schema

    def schema(self) -> dict[str, Any]:
        scale = KN_M if self.unit == "kN m" else 1.0
        return {"x-plausible-range": {"minimum": self.low / scale, "maximum": self.high / scale,
                                      "unit": self.unit}}


# Common practice for building beams (no standard sets these): wide enough for transfer
# girders and band beams, narrow enough to catch "300 ly" or a depth of 1e308 mm.
PLAUSIBLE: dict[str, Plausible] = {
    "web_width": Plausible(50.0, 4_000.0, "mm"),
    "overall_depth": Plausible(100.0, 5_000.0, "mm"),
    "slab_thickness": Plausible(40.0, 2_000.0, "mm"),
    "effective_flange_width": Plausible(50.0, 20_000.0, "mm"),
    "span": Plausible(500.0, 60_000.0, "mm"),
    "clear distance": Plausible(10.0, 60_000.0, "mm"),
    "steel depth": Plausible(10.0, 5_000.0, "mm"),
    "steel area": Plausible(10.0, 500_000.0, "mm²"),
    "concrete_strength": Plausible(5.0, 150.0, "MPa"),
    "yield_strength": Plausible(150.0, 1_000.0, "MPa"),
    "steel_modulus": Plausible(100_000.0, 300_000.0, "MPa"),
    "moment": Plausible(0.0, 100_000.0 * KN_M, "kN m"),
    "cover": Plausible(5.0, 200.0, "mm"),
    "stirrup_diameter": Plausible(4.0, 40.0, "mm"),
    "aggregate_size": Plausible(4.0, 100.0, "mm"),
}


def _quantity_schema(examples: list[str]) -> WithJsonSchema:
    return WithJsonSchema({
        "anyOf": [{"type": "string", "pattern": _NUMBER_FIRST, "maxLength": QUANTITY_LENGTH},
                  {"type": "number"}],
        "examples": examples,
    })


def _range(name: str) -> dict[str, Any]:
    return PLAUSIBLE[name].schema()


# strict: text or a number (an integer is taken as a float), no bool
RawQuantity = Annotated[str, StringConstraints(max_length=QUANTITY_LENGTH)] | float
# pydantic names union members in error locations
_UNION_TAGS = frozenset({"str", "constrained-str", "float"})
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
BarText = Annotated[str, StringConstraints(max_length=QUANTITY_LENGTH),
                    WithJsonSchema({"type": "string", "pattern": _NUMBER_FIRST,
                                    "maxLength": QUANTITY_LENGTH,
                                    "examples": ["4 x 25 mm", "3 #8", "2 N20 + 2 N16"]}),
                    _Expect(f"{BARS_EXPECTED}, at most {QUANTITY_LENGTH} characters")]
Text = Annotated[str, StringConstraints(max_length=SHORT_TEXT),
                 _Expect(f"text in quotes, at most {SHORT_TEXT} characters")]
BAR_SIZE_EXPECTED = ("a bar size of one catalogue: metric '20 mm' (a plain number in an SI "
                     "file: mm), US '#8', CSA '25M' or Australian 'N20'")
BarSizeName = Annotated[Annotated[str, StringConstraints(max_length=QUANTITY_LENGTH)] | float,
                        WithJsonSchema({"anyOf": [{"type": "string"}, {"type": "number"}],
                                        "maxLength": QUANTITY_LENGTH,
                                        "examples": ["20 mm", 20, "#8", "25M", "N20"]}),
                        _Expect(BAR_SIZE_EXPECTED)]
LongText = Annotated[str, StringConstraints(max_length=LONG_TEXT),
                     _Expect(f"text in quotes, at most {LONG_TEXT} characters")]
PathText = Annotated[str, StringConstraints(max_length=PATH_TEXT),
                     _Expect(f"a file path in quotes, at most {PATH_TEXT} characters")]
Id = Annotated[str, StringConstraints(strip_whitespace=True, min_length=1, max_length=SHORT_TEXT,
                                      strict=True, pattern=r"^[^\x00-\x1f\x7f]+$"),
               _Expect(f"a text id such as 'B1', unique in the file, at most {SHORT_TEXT} "
                       "characters, without control characters (a carriage return or tab "
                       "would show as another id and break the rows of a CSV file)")]
_OPERATOR = r"(~=|===|==|!=|<=|>=|<|>)"
_VERSION = r"[^\s,<>=!~]+"
EditionId = Annotated[str, StringConstraints(strip_whitespace=True, strict=True,
                                             max_length=SHORT_TEXT,
                                             pattern=r"^[^\s<>=!~,]+$"),
                      _Expect("an edition id such as 'aci318-19'")]
Requirement = Annotated[str, StringConstraints(
    strip_whitespace=True, strict=True, max_length=SHORT_TEXT,
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
        default=None, description="the steel area, where bars are not given",
        json_schema_extra=_range("steel area"))
    depth: Length | None = Field(
        default=None, description="depth of the layer's centroid from the compression face "
        "(the top in sagging, the soffit in hogging)", json_schema_extra=_range("steel depth"))
    centroid_from_face: Length | None = Field(
        default=None, description="distance from the face the layer lies near (the tension "
        "face for tension steel, the compression face for compression steel) to its centroid",
        json_schema_extra=_range("steel depth"))


class FloorModel(_Model):
    """Where the beam sits in the floor, as the effective-width rules need it."""

    model_config = ConfigDict(title="floor")

    span: Length = Field(description="span, centre to centre of supports",
                         json_schema_extra=_range("span"))
    continuity: Literal["simple", "end", "interior", "cantilever"] = Field(
        default="simple", description="simple span, end or interior span of a continuous "
        "beam, or cantilever")
    clear_span: Length | None = Field(
        default=None, description="clear span between support faces",
        json_schema_extra=_range("span"))
    clear_left: Length | None = Field(
        default=None, description="clear distance from this web to the next web on the left; "
        "leave out for a free edge", json_schema_extra=_range("clear distance"))
    clear_right: Length | None = Field(
        default=None, description="clear distance to the next web on the right; leave out "
        "for a free edge", json_schema_extra=_range("clear distance"))
    zero_moment_length: Length | None = Field(
        default=None, description="distance between points of zero moment, where known",
        json_schema_extra=_range("span"))
    adjacent_span: Length | None = Field(
        default=None, description="for a section over a support: the span on the other side",
        json_schema_extra=_range("span"))


class MomentsModel(_Model):
    """Moments in the beam's bending sense (positive): service dead and live, or factored."""

    model_config = ConfigDict(title="moments")

    dead: Moment | None = Field(default=None, description="service dead-load moment",
                                json_schema_extra=_range("moment"))
    live: Moment | None = Field(default=None, description="service live-load moment",
                                json_schema_extra=_range("moment"))
    factored: Moment | None = Field(
        default=None, description="a factored design moment, instead of the service moments",
        json_schema_extra=_range("moment"))


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
    web_width: Length = Field(description="web width bw", json_schema_extra=_range("web_width"))
    overall_depth: Length = Field(description="overall depth h of the section",
                                  json_schema_extra=_range("overall_depth"))
    slab_thickness: Length | None = Field(
        default=None, description="flange (slab) thickness hf",
        json_schema_extra=_range("slab_thickness"))
    effective_flange_width: Length | None = Field(
        default=None, description="an effective flange width the engineer gives (from the "
        "floor's analysis, say): an upper limit, never wider than the edition's own rules "
        "allow (the smallest of it and the clause limits governs); the actual flange width "
        "of a beam marked isolated", json_schema_extra=_range("effective_flange_width"))
    floor: FloorModel | None = Field(default=None, description="the floor layout")
    concrete_strength: Stress = Field(description="specified concrete strength",
                                      json_schema_extra=_range("concrete_strength"))
    strength_basis: Literal["cylinder", "cube"] = Field(
        default="cylinder", description="whether the concrete strength is a cylinder or a "
        "cube strength")
    yield_strength: Stress = Field(description="specified yield strength of the reinforcement",
                                   json_schema_extra=_range("yield_strength"))
    steel_modulus: Stress | None = Field(
        default=None, description="modulus of the reinforcement; leave out for the edition's "
        "value", json_schema_extra=_range("steel_modulus"))
    steel_kind: Literal["hot-rolled", "cold-worked", "mild"] | None = Field(
        default=None, description="how the bars are made; leave out for the edition's "
        "usual assumption")
    ductility_class: Literal["A", "B", "C", "N", "L"] = Field(
        default="N", description="ductility class of the bars (A, B, C; or N, L)")
    tension: Annotated[list[LayerModel], _Expect(
        "a list of one or more layers, e.g. [{ bars = '4 x 25 mm', depth = '540 mm' }]")] = \
        Field(default_factory=list, description="tension reinforcement, one table per "
              "layer; leave out only for design, which chooses the bars")
    compression: Annotated[list[LayerModel], _Expect(
        "a list of layers, e.g. [{ bars = '2 x 16 mm', depth = '50 mm' }]")] = Field(
        default_factory=list, description="compression reinforcement, one table per layer")
    statically_determinate: StrictBool | None = Field(
        default=None, description="true for a statically determinate beam; by default true "
        "for a simple span, a cantilever, or a beam given without a floor")
    isolated: StrictBool = Field(
        default=False, description="true for a T whose flange is not part of a slab (an "
        "isolated T, with the limits some editions set on it)")
    moments: MomentsModel | None = Field(
        default=None, description="the actions; leave out for the capacity only")
    cover: Length | None = Field(
        default=None, json_schema_extra=_range("cover"),
        description="clear cover to the stirrups (links); leave out for the "
        "edition's default")
    stirrup_diameter: Length | None = Field(
        default=None, json_schema_extra=_range("stirrup_diameter"),
        description="diameter of the stirrups (links); default 10 mm (#3 in "
        "US units)")
    aggregate_size: Length | None = Field(
        default=None, json_schema_extra=_range("aggregate_size"),
        description="nominal maximum size of the coarse aggregate; default "
        "20 mm (3/4 in in US units)")
    bar_sizes: list[BarSizeName] = Field(
        default_factory=list, description="for design: the bar sizes allowed, e.g. ['16 mm', "
        "'20 mm', '25 mm'] or ['#6', '#8']; empty: the whole catalogue of the beam's units")


class ProjectModel(_Model):
    """Who and what the calculation is for."""

    model_config = ConfigDict(title="project")

    name: Text = ""
    building: Text = ""
    town: Text = ""
    engineer: Text = ""
    notes: LongText = ""
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
    annexes: list[PathText] = Field(
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

