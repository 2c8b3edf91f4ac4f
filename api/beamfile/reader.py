"""Reading one validated beam into a :class:`Beam` in N, mm and MPa, collecting every bad
value rather than the first."""

from __future__ import annotations

from functools import cache, lru_cache
from typing import Any

from clausewise.beamfile.errors import _text
from clausewise.beamfile.models import (
    BAR_SIZE_EXPECTED,
    PLAUSIBLE,
    BeamModel,
    LayerModel,
    Plausible,
)
from clausewise.provisions import (
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
from clausewise.provisions.bars import catalogue_of
from clausewise.units import (
    AREA,
    BARS_EXPECTED,
    LENGTH,
    MOMENT,
    STRESS,
    Bars,
    Kind,
    QuantityError,
    _names_unit,
    read_bars,
    read_quantity,
    unit_info,
)

_KINDS = {"mm": LENGTH, "mm²": AREA, "MPa": STRESS, "kN m": MOMENT}
MOST_STEEL = 0.15  # of the concrete section: beyond any standard's limit, a slip of the unit

_SHAPES = {"T": Shape.TEE, "L": Shape.ELL, "rectangular": Shape.RECTANGLE,
           "inverted T": Shape.TEE}
# enum members by value: a dict lookup is far cheaper than calling the enum per beam
_BENDINGS = {b.value: b for b in Bending}
_BASES = {b.value: b for b in StrengthBasis}
_CONTINUITIES = {c.value: c for c in Continuity}
_SYSTEMS = {u.value: u for u in UnitSystem}
_US = UnitSystem.US  # looking a member up on its enum class is slow in a hot loop
_SHAPE_TEXT = {(shape, bending): f"{shape}, {bending}" for shape in _SHAPES
               for bending in ("sagging", "hogging")} | {
    ("inverted T", "sagging"): "inverted T, sagging (flange in tension, at the soffit)",
    ("inverted T", "hogging"): "inverted T, hogging (flange in compression, at the soffit)",
    ("T", "hogging"): "T, hogging (slab in tension)",
    ("L", "hogging"): "L, hogging (slab in tension)",
}


@lru_cache(maxsize=256)
def _layer_field(group: str, number: int) -> str:
    """"tension[1]": a layer's field, made once however many beams have the layer."""
    return f"{group}[{number}]"


@lru_cache(maxsize=1024)
def _part(field: str, name: str) -> str:
    """"tension[1].depth": a part of a layer's field, made once."""
    return f"{field}.{name}"


@cache
def _bounds(key: str) -> Plausible | None:
    """The plausible range of a PLAUSIBLE key or of a field named by its last part
    ("floor.span"), kept: a file names the same few fields again and again."""
    return PLAUSIBLE.get(key.rpartition(".")[2])


class _BeamReader:
    """Reads one validated beam model, collecting every bad value rather than the first."""

    def __init__(self, model: BeamModel, system: UnitSystem, design: bool = False) -> None:
        self.model = model
        self.system = system
        self.design = design  # a design file may leave out the bars
        self.problems: list[tuple[str, str, str]] = []
        self.shown: dict[str, str] = {}
        self.bar_groups: list[tuple[float, ...] | None] = []  # bar diameters per layer
        self.defaulted: list[str] = []  # fields whose plain number took the default unit
        self.geometry: tuple[tuple[float, str] | None, ...] = (None, None, None)  # bw, hf, bf
        self._bars: dict[str, Bars] = {}  # layers given by notation, by field
        self._texts: dict[str, list[str]] = {}  # shown text of each layer, by group

    def problem(self, field: str, value: str, expected: str) -> None:
        self.problems.append((field, value, expected))

    def quantity(self, value: Any, field: str, kind: Kind, label: str = "",
                 sign: str = "positive", plausible: str = "") -> tuple[float, str] | None:
        """The reading of one quantity; with ``plausible`` (a key of PLAUSIBLE, default the
        field's name) a value beyond that range is a problem too."""
        if value is None:
            return None
        try:
            reading = read_quantity(value, kind, self.system, sign)
        except QuantityError as exc:
            self.problem(field, exc.value, exc.expected)
            return None
        if not (isinstance(value, str) and _names_unit(value)):  # a plain number, or "300"
            self.defaulted.append(field)
        if label:
            self.shown[label] = reading[1]
        key = plausible or field
        bounds = _bounds(key)
        if bounds is not None and not bounds.low <= reading[0] <= bounds.high:
            self.within(reading, field, bounds)
            return None
        return reading

    def in_user_units(self, value: float, kind: Kind) -> str:
        spelling, label = kind.default(self.system)
        return f"{_short(value / unit_info(spelling).factor)} {label}"

    def within(self, reading: tuple[float, str], field: str, bounds: Plausible) -> bool:
        """True when the reading lies in the plausible range; else a problem that states
        the range in the beam's units (and in SI for US units)."""
        if bounds.low <= reading[0] <= bounds.high:
            return True
        kind = _KINDS[bounds.unit]
        what = field.rpartition(".")[2].replace("_", " ")
        text = f"{what} from {self.in_user_units(bounds.low, kind)} to " \
            f"{self.in_user_units(bounds.high, kind)}"
        if self.system is UnitSystem.US:
            si = _KINDS[bounds.unit].defaults[0]
            factor = unit_info(si[0]).factor
            text += f" ({_short(bounds.low / factor)} to {_short(bounds.high / factor)} {si[1]})"
        self.problem(field, reading[1], f"{text}, the plausible range for a building beam; "
                     "is the unit right?")
        return False

    # --- parts --------------------------------------------------------------------------
    def layers(self, name: str, models: list[LayerModel], h: tuple[float, str] | None,
               tension: bool) -> list[Layer]:
        """Each layer with its depth from the compression face (and its bars, where given
        by notation); the shown text goes to ``self.shown``."""
        read: list[Layer] = []
        texts: list[str] = []
        symbol = "d" if tension else "d'"
        face = "tension" if tension else "compression"
        for i, layer in enumerate(models, 1):
            field = _layer_field(name, i)
            area = self._layer_area(layer, field)
            depth = self._layer_depth(layer, field, h, tension, symbol, face)
            if area is not None and depth is not None and h is not None and self._placed(
                    field, layer, depth, h, tension):
                bars = self._bars.pop(field, None)
                read.append(Layer(area[0], depth[0]) if bars is None else Layer(
                    area[0], depth[0], bars.count, bars.largest_diameter, bars.side_by_side))
                texts.append(f"{area[1]} {depth[1]}")
                self.bar_groups.append(None if bars is None else bars.diameters)
        self._texts[name] = texts
        if texts:
            self.shown[f"{name} steel"] = "; ".join(texts)
        return read

    def _placed(self, field: str, layer: LayerModel, depth: tuple[float, str],
                h: tuple[float, str], tension: bool) -> bool:
        """Whether a layer can be built where it is given: its bars inside the section and
        side by side within the width at their depth, tension steel beyond mid-depth."""
        d, text = depth
        which = "depth" if layer.depth is not None else "centroid_from_face"
        bars = self._bars.get(field)  # read by _layer_area when given by notation
        ok = True
        if tension and d < h[0] / 2:
            given = _text(getattr(layer, which))
            face = "soffit" if self.model.bending == "hogging" else "top"
            self.problem(f"{field}.{which}", given, f"tension steel beyond mid-depth "
                         f"(h/2 = {self.in_user_units(h[0] / 2, LENGTH)}) from the compression "
                         f"face: in {self.model.bending} the compression face is the {face}, "
                         f"so this layer ({text}) would lie in the compression zone; is the "
                         "bending sense or the depth right?")
            ok = False
        if bars is None:
            return ok
        radius = bars.largest_diameter / 2
        if d + radius > h[0] or d - radius < 0:
            given = _text(getattr(layer, which))
            edge = d + radius if d + radius > h[0] else d - radius
            self.problem(f"{field}.{which}", given, f"a depth that keeps the bars inside the "
                         f"section: {bars.text} {text} reach "
                         f"{self.in_user_units(edge, LENGTH)} from the compression face, "
                         f"beyond the overall depth {h[1]}" if edge > 0 else
                         f"a depth that keeps the bars inside the section: {bars.text} {text} "
                         "stick out of the compression face")
            ok = False
        width = self.width_at(d, h[0])
        if width is not None and bars.side_by_side > width[0]:
            self.problem(f"{field}.bars", bars.text, f"bars that fit the width at their depth: "
                         f"side by side and touching they need "
                         f"{self.in_user_units(bars.side_by_side, LENGTH)}, more than the "
                         f"{width[1]}")
            ok = False
        return ok

    def width_at(self, depth: float, h: float) -> tuple[float, str] | None:
        """The section's width at a depth from the compression face, and its name; None in a
        flange whose width is left to the rules."""
        bw, hf, bf = self.geometry
        if bw is None:
            return None
        m = self.model
        if m.shape != "rectangular" and hf is not None:
            at_compression_face = (m.shape == "inverted T") == (m.bending == "hogging")
            in_flange = depth <= hf[0] if at_compression_face else depth >= h - hf[0]
            if in_flange:
                return None if bf is None else (bf[0], f"flange width ({bf[1]})")
        return bw[0], f"web width ({bw[1]})"

    def _layer_area(self, layer: LayerModel, field: str) -> tuple[float, str] | None:
        """(area, shown text); bars given by notation are kept for the layer."""
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
            self._bars[field] = bars
            return bars.area, bars.text
        return self.quantity(layer.area, _part(field, "area"), AREA, plausible="steel area")

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
        reading = self.quantity(given, _part(field, which), LENGTH, plausible="steel depth")
        if reading is None or h is None:
            return None
        value, text = reading
        if value >= h[0]:
            self.problem(_part(field, which), text, f"a distance less than the overall depth "
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
        clear = q(floor.clear_span, "floor.clear_span", LENGTH, "clear span ln",
                  plausible="span")
        left = q(floor.clear_left, "floor.clear_left", LENGTH, "clear distance to next web, left",
                 plausible="clear distance")
        right = q(floor.clear_right, "floor.clear_right", LENGTH,
                  "clear distance to next web, right", plausible="clear distance")
        zero = q(floor.zero_moment_length, "floor.zero_moment_length", LENGTH,
                 "distance between points of zero moment", plausible="span")
        adjacent = q(floor.adjacent_span, "floor.adjacent_span", LENGTH, "adjacent span",
                     plausible="span")
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
        dead = q(moments.dead, "moments.dead", MOMENT, "dead-load moment", "non-negative",
                 "moment")
        live = q(moments.live, "moments.live", MOMENT, "live-load moment", "non-negative",
                 "moment")
        factored = q(moments.factored, "moments.factored", MOMENT, "factored moment",
                     "non-negative", "moment")
        problem = Actions.omission_problem(moments.dead, moments.live, moments.factored)
        if problem is not None:  # the rule of Actions, reported against the file's field
            field, why = problem
            self.problem(f"moments.{field}", _text(moments.factored) if field == "factored"
                         else "", why if field == "factored" else f"{MOMENT.expected}: {why}")
            return Actions()
        if (dead is None and moments.dead is not None) or (
                live is None and moments.live is not None) or (
                factored is None and moments.factored is not None):
            return Actions()  # a moment that could not be read is reported already
        return Actions(_v(dead), _v(live), _v(factored))

    # --- the whole beam -------------------------------------------------------------------
    def read(self) -> Beam | None:
        m = self.model
        q = self.quantity
        flanged = m.shape != "rectangular"
        self.shown["units"] = "US customary" if self.system is _US else "SI"
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
        self._flange(flanged, bw, h, hf, bf)
        self.geometry = (bw, hf, bf)
        layout = self.floor()
        if flanged and bf is None and m.effective_flange_width is None and m.floor is None:
            self.problem("floor", "", "a floor table with at least the span (or an "
                         "effective_flange_width): a flanged beam needs one for its "
                         "effective flange width")
        if not m.tension and not self.design:
            self.problem("tension", "", "a list of one or more layers, e.g. [{ bars = "
                         "'4 x 25 mm', depth = '540 mm' }] (only design may leave them out)")
        tension = self.layers("tension", m.tension, h, tension=True)
        compression = self.layers("compression", m.compression, h, tension=False)
        self._compression_inside(tension, compression)
        self._steel_held(tension, compression, bw, h, hf, bf)
        if not m.tension:
            self.shown["tension steel"] = "to be designed"
        cover = q(m.cover, "cover", LENGTH, "cover to stirrups")
        stirrup = q(m.stirrup_diameter, "stirrup_diameter", LENGTH, "stirrup diameter")
        aggregate = q(m.aggregate_size, "aggregate_size", LENGTH, "aggregate size")
        self._room_inside_cover(cover, stirrup, bw, h)
        actions = self.actions()
        determinate = m.statically_determinate
        if determinate is None:
            # without a floor the continuity is unknown: take the side on which minimum
            # steel is larger (ACI 9.6.1.2 widens bw for a determinate beam's tension flange)
            determinate = m.floor is None or m.floor.continuity in ("simple", "cantilever")
            self.shown["statically determinate"] = (
                f"{'yes' if determinate else 'no'} (from the continuity)" if m.floor is not None
                else "yes (assumed, the safe side for minimum steel: no floor given; set "
                "statically_determinate to say)")
        else:
            self.shown["statically determinate"] = "yes" if determinate else "no"
        if m.isolated:
            self.shown["isolated T"] = "yes: the flange is not part of a slab"
        bar_sizes = self.bar_sizes()
        if self.problems or bw is None or h is None or fc is None or fy is None:
            return None
        return Beam(
            id=m.id, shape=_SHAPES[m.shape], bending=_BENDINGS[m.bending],
            flange_at_soffit=m.shape == "inverted T",
            web_width=bw[0], depth=h[0], concrete_strength=fc[0], yield_strength=fy[0],
            tension=tuple(tension), compression=tuple(compression),
            flange_thickness=_v(hf), flange_width=_v(bf), layout=layout,
            strength_basis=_BASES[m.strength_basis], steel_modulus=_v(es),
            steel_kind=m.steel_kind or "unstated", ductility_class=m.ductility_class,
            actions=actions,
            unit_system=self.system, statically_determinate=determinate,
            isolated=m.isolated, title=m.title,
            cover=_v(cover), stirrup_diameter=_v(stirrup), aggregate_size=_v(aggregate),
            bar_sizes=bar_sizes,
        )

    def _room_inside_cover(self, cover: tuple[float, str] | None,
                           stirrup: tuple[float, str] | None, bw: tuple[float, str] | None,
                           h: tuple[float, str] | None) -> None:
        """Cover and stirrups on both faces leave room for bars across the web and the
        depth; else no bar could be placed and the beam cannot be built."""
        if cover is None or bw is None or h is None:
            return
        link = stirrup[0] if stirrup is not None else 0.0
        inside = 2 * (cover[0] + link)
        for size, what in ((bw, "web width"), (h, "overall depth")):
            if inside >= size[0]:
                self.problem("cover", cover[1], f"a cover that leaves room for bars: on both "
                             f"faces, cover and stirrups take "
                             f"{self.in_user_units(inside, LENGTH)}, the whole {what} "
                             f"({size[1]})")
                return

    def bar_sizes(self) -> tuple[str, ...]:
        """The sizes design may use, as catalogue names ("20 mm" for a plain 20 in an SI
        file); names that are no bar size, or sizes from two catalogues, are problems."""
        names: list[str] = []
        for i, given in enumerate(self.model.bar_sizes, 1):
            if isinstance(given, str):
                names.append(given)
            elif self.system is UnitSystem.SI:
                names.append(f"{given:g} mm")
            else:
                self.problem(f"bar_sizes[{i}]", _text(given), f"{BAR_SIZE_EXPECTED}: in US "
                             "units give the designation in quotes ('#8')")
        unknown = [(i, n) for i, n in enumerate(names, 1) if catalogue_of((n,)) is None]
        for i, name in unknown:
            self.problem(f"bar_sizes[{i}]", name, BAR_SIZE_EXPECTED)
        if names and not unknown and catalogue_of(tuple(names)) is None:
            self.problem("bar_sizes", ", ".join(names), f"sizes from one catalogue, not mixed "
                         f"({BAR_SIZE_EXPECTED})")
        return tuple(names)

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

    def _steel_held(self, tension: list[Layer], compression: list[Layer],
                    bw: tuple[float, str] | None, h: tuple[float, str] | None,
                    hf: tuple[float, str] | None, bf: tuple[float, str] | None) -> None:
        """Steel the section can hold: all of it within MOST_STEEL of the concrete (the
        web, and the flange where its width is given). A layer given as an area is not
        placed bar by bar, so this keeps an area the concrete could never hold from
        passing."""
        m = self.model
        if bw is None or h is None or not (tension or compression) or (
                len(tension), len(compression)) != (len(m.tension), len(m.compression)):
            return  # a layer that could not be read is reported already
        concrete = bw[0] * h[0]
        if bf is not None and hf is not None:
            concrete += (bf[0] - bw[0]) * hf[0]
        total = sum(layer.area for layer in (*tension, *compression))
        if total <= MOST_STEEL * concrete:
            return
        group, number, _ = max(((g, i, layer) for g, layers in (("tension", tension),
                                                                ("compression", compression))
                                for i, layer in enumerate(layers, 1)),
                               key=lambda item: item[2].area)
        self.problem(f"{group}[{number}]", self._texts[group][number - 1],
                     f"steel the section can hold: {self.in_user_units(total, AREA)} in all "
                     f"is more than {MOST_STEEL:.0%} of the concrete section "
                     f"({self.in_user_units(concrete, AREA)}); is the area or its unit right?")

    def _compression_inside(self, tension: list[Layer], compression: list[Layer]) -> None:
        if not tension or not compression:
            return
        d = sum(t.area * t.depth for t in tension) / sum(t.area for t in tension)
        for i, layer in enumerate(compression, 1):
            if layer.depth >= d:
                self.problem(f"compression[{i}]", self._texts["compression"][i - 1],
                             "compression steel nearer the "
                             "compression face than the tension steel (effective depth d = "
                             f"{self.in_user_units(d, LENGTH)})")


def _short(value: float) -> str:
    """Three significant figures, long numbers grouped by spaces: 21 800, 0.305, 1000."""
    text = f"{float(f'{value:.3g}'):,.10g}" if abs(value) >= 10_000 else f"{value:.4g}"
    return text.replace(",", " ")


def _v(reading: tuple[float, str] | None) -> float | None:
    return None if reading is None else reading[0]

