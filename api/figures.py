"""Figures (matplotlib, Agg): the section, its strains and its stresses; utilisation per edition.

Drawn in the beam's own units with the slab on top, so a hogging section shows
its compression zone at the soffit, and an L beam's flange on the side its slab
is. The section is drawn to scale where its proportions allow, with every bar of
a layer at its depth, spread across the web. Labels are nudged apart until none
overlaps another. Symbols follow the edition's notation. SVG or PNG by the file's
extension. This module is imported only when figures are asked for.
"""

from __future__ import annotations

import io
import math
from collections.abc import Sequence
from dataclasses import dataclass
from itertools import groupby
from pathlib import Path
from typing import Any

import matplotlib
import numpy as np

matplotlib.use("Agg")
from matplotlib.figure import Figure  # noqa: E402  (after choosing the backend)
from matplotlib.patches import Circle, Rectangle  # noqa: E402
from matplotlib.ticker import MaxNLocator  # noqa: E402

from clausewise.provisions import Notation  # noqa: E402
from clausewise.provisions.beam import Bending, Shape  # noqa: E402
from clausewise.provisions.engine import CAUTION, Assessment  # noqa: E402
from clausewise.results import Outcome, Units, convert, write_atomic  # noqa: E402

FORMATS = ("svg", "png")
CONCRETE, ZONE, STEEL = "#d9d9d9", "#f4a259", "#1d3557"
TENSION, COMPRESSION, STRAIN = "#c1121f", "#2a9d8f", "#bcd4e6"
SMALL = 8

# page geometry of the three-panel figure, inches
HEIGHT, BOTTOM, PANEL_HEIGHT = 5.0, 0.9, 3.3
LEFT, GAP, RIGHT, PANEL_WIDTH = 0.85, 0.4, 0.3, 3.3
SECTION_WIDTH = (1.3, 7.0)  # narrowest and widest section panel before it stops being to scale


def _format(path: Path) -> str:
    kind = path.suffix.lower().lstrip(".")
    if kind not in FORMATS:
        raise ValueError(f"figure file {path.name!r}: expected a name ending in .svg or .png")
    return kind


def save(figure: Figure, path: Path) -> Path:
    """Write a figure as SVG or PNG (by the extension), whole or not at all."""
    buffer = io.BytesIO()
    with matplotlib.rc_context({"svg.fonttype": "none"}):  # text stays text: searchable
        figure.savefig(buffer, format=_format(path), dpi=150)
    write_atomic(path, buffer.getvalue())
    return path


def _caption(figure: Figure, title: str) -> None:
    figure.text(0.01, 1 - 0.12 / figure.get_figheight(), title, fontsize=10, ha="left",
                va="top", wrap=True)  # a narrow (stacked) figure takes it on two lines
    figure.text(0.01, 0.08 / figure.get_figheight(), CAUTION, fontsize=7, color="#555555",
                ha="left", va="bottom")


# --- one beam under one edition -------------------------------------------------------------

@dataclass(frozen=True)
class _Frame:
    """Where things go: heights above the soffit in the beam's units."""

    depth: float  # mm
    sagging: bool
    scale: float  # beam's length unit per mm
    units: Units

    def up(self, depth: Any) -> Any:
        """Height above the soffit of a depth measured from the compression face."""
        depth = np.asarray(depth, float)
        return (self.depth - depth if self.sagging else depth) * self.scale

    def y(self, depth: float) -> float:
        return float(self.up(depth))

    def beyond_face(self) -> dict[str, Any]:
        """Placement of a label just outside the compression face."""
        return {"xytext": (0, 3 if self.sagging else -3), "textcoords": "offset points",
                "ha": "center", "va": "bottom" if self.sagging else "top"}

    def limits(self) -> tuple[float, float]:
        """Height limits with room for the labels at the compression face."""
        low, high = (-0.06, 1.16) if self.sagging else (-0.16, 1.06)
        return low * self.depth * self.scale, high * self.depth * self.scale


LayerBars = tuple[float, ...] | None
"""Each bar's diameter (mm) of a layer given by bars, in the order given; None for a layer
given as an area."""

ROW_GAP = 0.75  # inches between the rows of a stacked figure: the section's axis label


def beam_figure(assessment: Assessment, notation: Notation | None = None,
                bar_groups: Sequence[LayerBars] = (),
                stacked: bool = False) -> Figure:
    """Three panels at one height scale: the section with its effective flange, the
    compression zone shaded and every bar (``bar_groups``: each bar's diameter per layer,
    tension then compression; a layer given as an area is one marker); the strains; the
    stresses and forces. ``stacked``: the section on a row above the other two, so the
    figure is narrow enough to print on a page at nearly its own size (its text stays
    readable on paper).
    """
    a = assessment
    n = notation or Notation()
    r = a.response
    if r is None or not r.equilibrium:
        raise ValueError(f"beam {a.beam.id!r} under {a.edition_id}: no solved section to draw "
                         f"({a.status})")
    law = a.concrete_law
    arrays = a.section.arrays  # type: ignore[union-attr]
    units = Units(a.beam.unit_system)
    frame = _Frame(float(arrays.edges[0, -1]), a.beam.bending is Bending.SAGGING,
                   convert(1.0, "mm", units.system)[0], units)

    labels = [_layer_label(layer, group, units) for layer, group in
              zip(r.layers, _padded(bar_groups, len(r.layers)), strict=True)]
    y_range = frame.limits()
    x_range, section_width, wanted = _section_extent(a, arrays, labels, y_range)
    # (left, bottom, width) of each panel in inches, and the figure's size
    if stacked:
        pair = 2 * PANEL_WIDTH + GAP
        section_width = min(section_width, pair)
        width = LEFT + pair + RIGHT
        height = HEIGHT + PANEL_HEIGHT + ROW_GAP
        upper = BOTTOM + PANEL_HEIGHT + ROW_GAP
        places = [(LEFT + (pair - section_width) / 2, upper, section_width),
                  (LEFT, BOTTOM, PANEL_WIDTH), (LEFT + PANEL_WIDTH + GAP, BOTTOM, PANEL_WIDTH)]
    else:
        width = LEFT + section_width + 2 * (GAP + PANEL_WIDTH) + RIGHT
        height = HEIGHT
        places = [(LEFT, BOTTOM, section_width),
                  (LEFT + section_width + GAP, BOTTOM, PANEL_WIDTH),
                  (LEFT + section_width + 2 * GAP + PANEL_WIDTH, BOTTOM, PANEL_WIDTH)]
    figure = Figure(figsize=(width, height))
    axes = [figure.add_axes((x / width, y / height, w / width, PANEL_HEIGHT / height))
            for x, y, w in places]
    section_ax, strain_ax, stress_ax = axes

    _draw_section(section_ax, a, arrays, frame, to_scale=abs(wanted - section_width) < 1e-9,
                  bar_groups=bar_groups, labels=labels)
    section_ax.set_xlim(*x_range)
    _draw_strains(strain_ax, a, float(law.ultimate_strain), frame, n)
    _draw_stresses(stress_ax, a, law, frame, n)
    for ax in axes:
        ax.set_ylim(*y_range)
        ax.axhline(frame.y(r.c), color="#555555", lw=0.8, ls="--")
    for ax in (stress_ax,) if stacked else (strain_ax, stress_ax):
        ax.tick_params(labelleft=False)
    for ax in (section_ax, strain_ax) if stacked else (section_ax,):
        ax.set_ylabel(f"height above the soffit ({units.unit('mm')})")
    strain_ax.annotate("neutral axis", (0.02, frame.y(r.c)), xycoords=("axes fraction", "data"),
                       xytext=(0, 3), textcoords="offset points", fontsize=SMALL,
                       color="#555555")
    _caption(figure, f"{a.beam.id} under {a.edition_id} ({a.form} form, {a.situation}): "
             f"{a.summary()}")
    spread_labels(figure)
    return figure


def slab_on_left(a: Assessment) -> bool:
    """Whether an L beam's slab (and so its flange) is on the left: only where the floor
    gives a slab on the left and none on the right."""
    layout = a.beam.layout
    return (a.beam.shape is Shape.ELL and layout is not None
            and layout.clear_left is not None and layout.clear_right is None)


def _left_edge(a: Assessment, width: float, web: float) -> float:
    """An L beam's flange runs from the web's face on its slab's side; the rest are
    symmetric about the web's centre line."""
    if a.beam.shape is not Shape.ELL:
        return -width / 2
    return web / 2 - width if slab_on_left(a) else -web / 2


def bar_positions(count: int, diameter: float, web: float, edge: float) -> np.ndarray:
    """Centres across the web (mm from its centre line) of ``count`` bars of ``diameter``,
    evenly spaced with their centres ``edge`` from the side faces (the same cover as at
    the nearer top or bottom face, as is common practice); bars that do not fit are
    drawn touching (a bundle)."""
    if count == 1:
        return np.zeros(1)
    reach = max(web / 2 - edge, (count - 1) * diameter / 2)
    return np.linspace(-reach, reach, count)


def _side_edges(layers: Sequence[Any], bar_groups: Sequence[LayerBars],
                overall: float) -> dict[bool, float]:
    """Distance of the bar centres from the side faces, for the layers near the top
    (True) and near the bottom (False): that of the outermost layer on that side, so
    that inner layers stand in the same vertical lines as the outer one (the stirrup
    holds them all at one cover)."""
    near: dict[bool, float] = {True: math.inf, False: math.inf}
    for i, layer in enumerate(layers):
        if i < len(bar_groups) and bar_groups[i] is not None:
            depth = float(layer.depth)
            top = depth < overall / 2
            near[top] = min(near[top], depth if top else overall - depth)
    return near


def spread_labels(figure: Figure, passes: int = 400) -> None:
    """Nudge the figure's offset labels apart vertically until no two overlap."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.text import Annotation

    renderer = FigureCanvasAgg(figure).get_renderer()
    labels = [t for ax in figure.axes for t in ax.texts
              if isinstance(t, Annotation) and t.get_text() and t.anncoords == "offset points"]
    boxes = [t.get_window_extent(renderer) for t in labels]  # measured once, then moved
    points_per_pixel = 72 / figure.dpi
    for _ in range(passes):
        moved = False
        order = sorted(range(len(labels)), key=lambda k: boxes[k].y0)
        for place, i in enumerate(order):  # from the lowest: only those that start below
            for j in order[place + 1:]:     # its top can overlap it (a pass that misses one
                if boxes[j].y0 > boxes[i].y1:  # as boxes move leaves it to the next)
                    break
                if not boxes[i].overlaps(boxes[j]):
                    continue
                lower, upper = (i, j) if boxes[i].y0 <= boxes[j].y0 else (j, i)
                gap = boxes[lower].y1 - boxes[upper].y0 + 1.0
                for k, sign in ((lower, -1), (upper, 1)):
                    x, y = labels[k].xyann
                    labels[k].xyann = (x, y + sign * gap / 2 * points_per_pixel)
                    boxes[k] = boxes[k].translated(0, sign * gap / 2)
                moved = True
        if not moved:
            return


LABEL_POINTS_PER_CHARACTER = 0.56 * SMALL  # the label font's average width, and a margin
LABEL_OFFSET = 7  # points from the outermost bar to its label


def _section_extent(a: Assessment, arrays: Any, labels: Sequence[str],
                    y_range: tuple[float, float]) -> tuple[tuple[float, float], float, float]:
    """The section panel's x limits (in the beam's units), its width in inches and the
    width it would need to be to scale. The limits leave room right of the web for the
    longest bar label, whatever the panel's scale turns out to be (it depends on the
    limits, so they are found together)."""
    widths = arrays.widths[0]
    web, widest = float(widths.min()), float(widths.max())
    scale = convert(1.0, "mm", a.beam.unit_system)[0]
    margin = 0.06 * widest
    left = min(_left_edge(a, w, web) for w in widths) - margin
    right = max(_left_edge(a, w, web) + w for w in widths) + margin
    room = LABEL_OFFSET + LABEL_POINTS_PER_CHARACTER * max(map(len, labels), default=0)
    height = y_range[1] - y_range[0]
    extent = right
    for _ in range(6):  # converges in two or three: the room is a small share of the panel
        wanted = PANEL_HEIGHT * (extent - left) * scale / height
        section_width = float(np.clip(wanted, *SECTION_WIDTH))
        mm_per_point = (extent - left) / (section_width * 72)
        extent = max(right, web / 2 + room * mm_per_point * 1.15)
    return (left * scale, extent * scale), section_width, wanted


def _padded(groups: Sequence[LayerBars], count: int
            ) -> list[LayerBars]:
    return [groups[i] if i < len(groups) else None for i in range(count)]


def _layer_label(layer: Any, group: LayerBars, units: Units) -> str:
    """"4 × 25 mm (1963 mm²)", or each size of a mixed layer as given: "2 × 25 mm + 2 ×
    20 mm (1610 mm²)"."""
    if group is None:
        return units.value(layer.area, "mm²")
    runs = [(len(list(same)), diameter) for diameter, same in groupby(group)]
    bars = " + ".join(f"{count} × {_bar_name(diameter, units)}" for count, diameter in runs)
    return f"{bars} ({units.value(layer.area, 'mm²')})"


def _outside_in(diameters: Sequence[float], xs: np.ndarray) -> list[tuple[float, float]]:
    """Each bar's centre and diameter: the largest bars at the corners (the stirrup's
    bends hold them), smaller ones between."""
    order = sorted(range(len(xs)), key=lambda i: -abs(float(xs[i])))
    placed = sorted(diameters, reverse=True)
    return sorted((float(xs[i]), d) for i, d in zip(order, placed, strict=True))


def _bar_name(diameter: float, units: Units) -> str:
    """A US beam's bars by their designation (#9), as its file gives them; else the
    diameter in the beam's units."""
    from clausewise.provisions.bars import US
    from clausewise.provisions.beam import UnitSystem

    if units.system is UnitSystem.US:
        size = next((b for b in US if abs(b.diameter - diameter) < 1e-6), None)
        if size is not None:
            return size.name
    return units.length(diameter)


def _draw_section(ax: Any, a: Assessment, arrays: Any, frame: _Frame, to_scale: bool,
                  bar_groups: Sequence[LayerBars] = (),
                  labels: Sequence[str] = ()) -> None:
    r = a.response
    assert r is not None
    units, s = frame.units, frame.scale
    edges, widths = arrays.edges[0], arrays.widths[0]
    web = float(widths.min())
    for top, bottom, width, label in zip(edges[:-1], edges[1:], widths, arrays.labels,
                                         strict=True):
        left = _left_edge(a, width, web) * s
        y0, y1 = sorted((frame.y(top), frame.y(bottom)))
        ax.add_patch(Rectangle((left, y0), width * s, y1 - y0, facecolor=CONCRETE,
                               edgecolor="black", lw=1.0))
        zone_bottom = min(bottom, r.zone_depth)
        if zone_bottom > top:
            z0, z1 = sorted((frame.y(top), frame.y(zone_bottom)))
            ax.add_patch(Rectangle((left, z0), width * s, z1 - z0, facecolor=ZONE,
                                   edgecolor="none", alpha=0.85))
        if label == "flange" and a.effective_width is not None:
            ax.annotate(f"effective flange {units.length(width)}", (left + width * s / 2, y1),
                        xytext=(0, 3), textcoords="offset points", ha="center", va="bottom",
                        fontsize=SMALL)
    overall = float(edges[-1])
    side_edge = _side_edges(r.layers, bar_groups, overall)
    for i, layer in enumerate(r.layers):
        group = bar_groups[i] if i < len(bar_groups) else None
        y = frame.y(layer.depth)
        if group is None:  # an area without bars: one marker for the layer
            xs = np.zeros(1)
            ax.plot(xs, [y], "s", color=STEEL, ms=6, gid="steel-layer")
        else:
            diameter = max(group)
            edge = side_edge[float(layer.depth) < overall / 2]
            xs = bar_positions(len(group), diameter, web, max(edge, diameter)) * s
            for x, own in _outside_in(group, xs):
                ax.add_patch(Circle((x, y), own / 2 * s, facecolor=STEEL,
                                    edgecolor="none", gid="bar"))
        label = labels[i] if i < len(labels) else _layer_label(layer, group, units)
        # from the outermost bar's edge, and never inside the web: a large bar or a bar
        # near the face put the label's first character on the bar or the web's edge
        reach = float(xs.max()) + (max(group) / 2 * s if group is not None else 0.0)
        ax.annotate(label, (max(reach, web / 2 * s), y), xytext=(LABEL_OFFSET, 0),
                    textcoords="offset points",
                    va="center", fontsize=SMALL)
    ax.set_title(f"section: {r.block_case}" + ("" if to_scale else " (not to scale)"),
                 fontsize=9)
    ax.set_xlabel(f"width ({units.unit('mm')}); shaded: compression zone", fontsize=SMALL)


def _draw_strains(ax: Any, a: Assessment, eps_cu: float, frame: _Frame, n: Notation) -> None:
    r = a.response
    assert r is not None
    depths = np.array([0.0, frame.depth])
    strains = eps_cu * (r.c - depths) / r.c
    ax.fill_betweenx(frame.up(depths), 0, strains, color=STRAIN, alpha=0.7)
    ax.plot(strains, frame.up(depths), color="black", lw=1.0)
    ax.axvline(0, color="black", lw=0.6)
    span = max(abs(strains).max(), eps_cu)
    # beside the strain line's end, clear of the zero line (centred on it, the zero line
    # crossed it): to its right where the panel has room, else ending at it
    ax.annotate(f"εcu = {eps_cu:.4g}", (eps_cu, frame.y(0.0)), fontsize=SMALL,
                **(frame.beyond_face() | {"ha": "left" if eps_cu < 0.5 * span else "right"}))
    for s in r.layers:
        ax.plot([s.strain], [frame.y(s.depth)], "o", color=STEEL, ms=4)
        side = "left" if s.strain < 0 else "right"
        ax.annotate(f"{s.strain:.4g}", (s.strain, frame.y(s.depth)),
                    xytext=(5 if side == "left" else -5, -2), textcoords="offset points",
                    ha=side, va="top", fontsize=SMALL)
    ax.set_xlim(-1.15 * span, 1.15 * span)
    ax.xaxis.set_major_locator(MaxNLocator(5))
    ax.set_title(f"strains: {n.neutral_axis} = {frame.units.length(r.c)}, "
                 f"{n.strain} = {r.net_tensile_strain:.4g}", fontsize=9)
    ax.set_xlabel("strain (shortening positive)", fontsize=SMALL)


def _draw_stresses(ax: Any, a: Assessment, law: Any, frame: _Frame, n: Notation) -> None:
    """Concrete stress over the depth; every resultant force as an arrow to one scale."""
    r = a.response
    assert r is not None
    units = frame.units
    ys = np.sort(np.concatenate([np.linspace(0.0, r.c, 201),
                                 [r.zone_depth * (1 - 1e-9), r.zone_depth * (1 + 1e-9)]]))
    stress = law.stress_at(np.array([r.c]), ys[:, None])[:, 0]  # depths (m, N = 1)
    shown = stress * convert(1.0, "MPa", units.system)[0]
    ax.fill_betweenx(frame.up(ys), 0, shown, color=ZONE, alpha=0.85)
    peak = max(float(shown.max()), 1e-9)
    ax.annotate(units.value(stress.max(), "MPa"), (peak, frame.y(0.0)), fontsize=SMALL,
                **frame.beyond_face())
    forces = [(r.concrete_force, r.concrete_depth, "C")]
    forces += [(s.force, s.depth, "T" if s.force < 0 else "Cs") for s in r.layers]
    biggest = max(abs(f) for f, _, _ in forces) or 1.0
    for force, depth, name in forces:
        tip = 0.9 * peak * force / biggest
        y = frame.y(depth)
        color = COMPRESSION if force > 0 else TENSION
        ax.annotate("", (tip, y), xytext=(0, y),
                    arrowprops={"arrowstyle": "-|>", "color": color, "lw": 1.4})
        label = f"{name} = {units.value(abs(force), 'N')}"
        if name == "Cs":  # beside the axis, clear of the concrete resultant near it
            ax.annotate(label, (0, y), xytext=(-4, 0), textcoords="offset points",
                        ha="right", va="center", fontsize=SMALL, color=color)
        else:
            ax.annotate(label, (tip / 2, y), xytext=(0, 3), textcoords="offset points",
                        ha="center", va="bottom", fontsize=SMALL, color=color)
    ax.axvline(0, color="black", lw=0.6)
    ax.set_xlim(-1.1 * peak, 1.25 * peak)
    ax.set_title(f"stresses and forces: {n.nominal} = {units.moment(r.nominal_moment)}",
                 fontsize=9)
    ax.set_xlabel(f"concrete stress ({units.unit('MPa')}); arrows: forces to one scale",
                  fontsize=SMALL)


# --- editions compared ---------------------------------------------------------------------

def utilisation_figure(outcomes: Sequence[Outcome]) -> Figure:
    """The governing utilisation of one beam under each edition, with what governs; an
    edition that refused the beam (not assessed, outside its scope, no equilibrium)
    keeps its row, hatched and marked with the reason."""
    if not outcomes:
        raise ValueError("no edition to draw")
    beam = outcomes[0].entry.beam
    height = 1.3 + 0.45 * len(outcomes)
    figure = Figure(figsize=(8.5, height))
    ax = figure.add_axes((1.6 / 8.5, 0.75 / height, 6.7 / 8.5, (height - 1.25) / height))
    labels, values, colors, notes, refused = [], [], [], [], []
    for o in outcomes:
        a = o.assessment
        check = a.governing if a is not None else None
        u = float(check.utilisation) if check is not None else 0.0
        gave_verdict = a is not None and a.status in ("pass", "fail")
        labels.append(o.edition)
        values.append(u if np.isfinite(u) and gave_verdict else 0.0)
        refused.append(not gave_verdict)
        colors.append(COMPRESSION if a is not None and a.passed
                      else TENSION if gave_verdict else "#ffffff")
        if a is None:
            notes.append(f"refused: not assessed ({o.error[:60]})")
        elif not gave_verdict:
            notes.append(f"refused: {a.status}")
        else:
            notes.append(f"{u:.3f} {o.status}: {check.name}" if check else o.status)
    positions = np.arange(len(labels))
    bars = ax.barh(positions, values, color=colors, height=0.6, edgecolor="#555555")
    for bar, no in zip(bars, refused, strict=True):
        if no:
            bar.set_hatch("///")
            bar.set_width(0.05)
            bar.set_gid("refused")
    ax.axvline(1.0, color="black", lw=1.0, ls="--")
    for y, value, note in zip(positions, values, notes, strict=True):
        ax.annotate(note, (max(value, 0.05), y), xytext=(4, 0), textcoords="offset points",
                    va="center", fontsize=SMALL,
                    bbox={"facecolor": "white", "edgecolor": "none", "pad": 1})
    ax.set_yticks(positions, labels, fontsize=SMALL)
    ax.invert_yaxis()
    ax.set_xlim(0, max(1.2, max(values)) * 1.7)
    ax.set_xlabel("governing utilisation (1.0 is the limit); hatched: the edition refused "
                  "the beam", fontsize=SMALL)
    _caption(figure, f"{beam.id}: governing utilisation per edition")
    return figure
