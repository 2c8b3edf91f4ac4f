"""Figures: the drawn geometry against hand values, and files that parse as SVG and PNG.

Hand values: ACI 318-19 rectangular block (from memory: 22.2.2.4.1 block 0.85 f'c over
a = β1 c, 6.3.2.1 overhang limits); IS 456:2000 38.1 and Annex G-1.1 printed resultants
0.36 fck b xu at 0.42 xu on the cube strength (from memory), drawn as the parabola-rectangle
shaped to them (peak 0.36/(1 - k/3) fck with k² - 2.32k + 0.96 = 0, by hand), fck = 37 MPa
for a C30/37 concrete (EN 1992-1-1 Table 3.1, from memory).
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

import numpy as np
import pytest
from matplotlib.patches import Rectangle

from clausewise import figures as figs
from clausewise.beamfile import parse_schedule
from clausewise.provisions import CAUTION, default_registry
from clausewise.results import run

SCHEDULE = """
[[beam]]
id = "K-1"
shape = "T"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "120 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
tension = [{ area = "2000 mm2", depth = "540 mm" }]
floor = { span = "6000 mm", clear_left = "2500 mm", clear_right = "2500 mm" }
moments = { dead = "150 kN m", live = "100 kN m" }

[[beam]]
id = "K-2"
shape = "T"
units = "US"
bending = "hogging"
web_width = "12 in"
overall_depth = "24 in"
slab_thickness = "5 in"
concrete_strength = "4000 psi"
yield_strength = "60000 psi"
tension = [{ area = "2.37 in2", depth = "21.5 in" }]
floor = { span = "240 in", continuity = "interior", clear_left = "96 in", clear_right = "96 in" }
moments = { factored = "120 kip ft" }

[[beam]]
id = "K-3"
shape = "rectangular"
web_width = "300 mm"
overall_depth = "500 mm"
concrete_strength = "12 MPa"
yield_strength = "420 MPa"
tension = [{ area = "1500 mm2", depth = "450 mm" }]
moments = { factored = "100 kN m" }
"""

ZONE = figs.ZONE


@pytest.fixture(scope="module")
def outcomes():
    schedule = parse_schedule(SCHEDULE, "yard.toml")
    registry = default_registry()
    editions = [registry.edition(i) for i in ("aci318-19", "is456:2000")]
    return {(o.entry.beam.id, o.edition): o for o in run(schedule, editions, None,
                                                            "persistent")}


def drawn(outcome):
    return figs.beam_figure(outcome.assessment)


def rectangles(ax, color=None):
    found = [p for p in ax.patches if isinstance(p, Rectangle)]
    if color is None:
        return found
    return [p for p in found if np.allclose(p.get_facecolor()[:3], _rgb(color))]


def _rgb(hex_color: str) -> tuple[float, ...]:
    return tuple(int(hex_color[i:i + 2], 16) / 255 for i in (1, 3, 5))


def test_sagging_t_section_draws_the_effective_flange_and_the_block(outcomes):
    figure = drawn(outcomes[("K-1", "aci318-19")])
    section, strains, stresses = figure.axes
    flange = max(rectangles(section), key=lambda p: p.get_width())
    assert flange.get_width() == pytest.approx(300 + 2 * 6000 / 8)  # ln/8 governs: 1800 mm
    [zone] = rectangles(section, ZONE)
    a = 2000 * 420 / (0.85 * 30 * 1800)
    assert zone.get_height() == pytest.approx(a)
    assert zone.get_y() + zone.get_height() == pytest.approx(600)  # from the top face
    assert strains.get_ylim() == section.get_ylim() == stresses.get_ylim()


def test_hogging_section_has_its_compression_zone_at_the_soffit_in_inches(outcomes):
    figure = drawn(outcomes[("K-2", "aci318-19")])
    section = figure.axes[0]
    [zone] = rectangles(section, ZONE)
    a_in = 2.37 * 60000 / (0.85 * 4000 * 12)  # the 12 in web is compressed
    assert zone.get_y() == pytest.approx(0, abs=1e-9)
    assert zone.get_height() == pytest.approx(a_in, rel=1e-6)
    assert zone.get_width() == pytest.approx(12)
    assert "(in)" in section.get_ylabel()


def test_stress_panel_shows_the_parabola_rectangle_peak(outcomes):
    figure = drawn(outcomes[("K-1", "is456:2000")])
    stresses = figure.axes[2]
    labels = [t.get_text() for t in stresses.texts]
    k = 1.16 - (1.16**2 - 0.96) ** 0.5
    assert f"{0.36 / (1 - k / 3) * 37:.4g} MPa" in labels


def test_svg_and_png_files_parse(outcomes, tmp_path):
    figure = drawn(outcomes[("K-1", "aci318-19")])
    svg = figs.save(figure, tmp_path / "k1.svg")
    root = ET.parse(svg).getroot()
    assert root.tag.endswith("svg")
    text = " ".join(root.itertext())
    assert CAUTION in text and "effective flange 1800 mm" in text
    png = figs.save(figure, tmp_path / "k1.png").read_bytes()
    assert png[:8] == b"\x89PNG\r\n\x1a\n" and len(png) > 10_000
    with pytest.raises(ValueError, match=".svg or .png"):
        figs.save(figure, tmp_path / "k1.pdf")


def test_utilisation_figure_has_one_bar_per_edition(outcomes, tmp_path):
    group = [outcomes[("K-1", e)] for e in ("aci318-19", "is456:2000")]
    figure = figs.utilisation_figure(group)
    bars = rectangles(figure.axes[0])
    assert [b.get_width() for b in bars] == pytest.approx(
        [o.assessment.governing.utilisation for o in group])
    assert [t.get_text() for t in figure.axes[0].get_yticklabels()] == [
        "aci318-19", "is456:2000"]
    root = ET.parse(figs.save(figure, tmp_path / "k1_editions.svg")).getroot()
    assert root.tag.endswith("svg")


def test_a_beam_outside_scope_has_no_section_to_draw(outcomes):
    outside = outcomes[("K-3", "aci318-19")]  # f'c = 12 MPa < 17 MPa (19.2.1.1)
    assert outside.assessment.status == "outside scope"
    with pytest.raises(ValueError, match="no solved section"):
        drawn(outside)


# --- every bar, the flange on its slab's side, labels apart, refused editions kept ----------

BARS = """
[[beam]]
id = "E-1"
shape = "L"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "150 mm"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{ bars = "5 x 20 mm", depth = "540 mm" }, { bars = "2 x 16 mm", depth = "525 mm" }]
compression = [{ bars = "2 x 12 mm", depth = "50 mm" }]
floor = { span = "6 m", clear_left = "2.4 m" }
moments = { factored = "250 kN m" }

[[beam]]
id = "E-2"
shape = "L"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "150 mm"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{ bars = "3 x 25 mm", depth = "540 mm" }]
floor = { span = "6 m", clear_right = "2.4 m" }
moments = { factored = "250 kN m" }
"""


@pytest.fixture(scope="module")
def bar_outcomes():
    schedule = parse_schedule(BARS, "edge.toml")
    edition = default_registry().edition("aci318-19")
    return {o.entry.beam.id: o for o in run(schedule, [edition], None, "persistent")}


def bar_figure(outcome):
    return figs.beam_figure(outcome.assessment, outcome.notation, outcome.entry.bar_groups)


def test_every_bar_is_drawn_at_its_depth_inside_the_web(bar_outcomes):
    from matplotlib.patches import Circle

    section = bar_figure(bar_outcomes["E-1"]).axes[0]
    bars = [p for p in section.patches if isinstance(p, Circle)]
    assert len(bars) == 5 + 2 + 2  # the true count of every layer
    heights = sorted({round(b.center[1], 6) for b in bars})
    assert heights == [600 - 540, 600 - 525, 600 - 50]  # sagging: height = h - depth
    for b in bars:  # every bar inside the web (x from the web's centre line, mm)
        assert abs(b.center[0]) + b.radius <= 150 + 1e-9
    bottom = sorted(b.center[0] for b in bars if round(b.center[1]) == 60)
    assert len(bottom) == 5 and np.allclose(np.diff(bottom), np.diff(bottom)[0])  # even
    radii = {round(b.radius, 6) for b in bars}
    assert radii == {10.0, 8.0, 6.0}  # to scale: half of 20, 16 and 12 mm


def test_inner_layers_stand_in_the_outer_layer_s_vertical_lines(bar_outcomes):
    """Stirrups hold every layer at one side cover, so the corner bars of the inner
    layer stand over those of the outer one: centres 150 - 60 = 90 mm from the web's
    centre line, 60 mm being the outer layer's distance from the soffit (600 - 540)."""
    from matplotlib.patches import Circle

    section = bar_figure(bar_outcomes["E-1"]).axes[0]
    bars = [p for p in section.patches if isinstance(p, Circle)]
    for height in (600 - 540, 600 - 525):  # the 5 x 20 mm and the 2 x 16 mm layers
        xs = [b.center[0] for b in bars if round(b.center[1]) == height]
        assert min(xs) == pytest.approx(-90) and max(xs) == pytest.approx(90), height


def test_bar_labels_stay_inside_the_section_panel(bar_outcomes, outcomes):
    """A label that ran past the panel would be hidden under the strain panel."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    drawn = [bar_figure(o) for o in bar_outcomes.values()] + [
        figs.beam_figure(o.assessment, o.notation, o.entry.bar_groups)
        for o in outcomes.values() if o.assessment is not None and o.assessment.response is not None
        and o.assessment.response.equilibrium]
    assert len(drawn) > 2
    for figure in drawn:
        renderer = FigureCanvasAgg(figure).get_renderer()
        section = figure.axes[0]
        panel = section.get_window_extent(renderer)
        for text in section.texts:
            box = text.get_window_extent(renderer)
            assert panel.x0 <= box.x0 and box.x1 <= panel.x1, text.get_text()


def test_an_l_beam_s_flange_is_drawn_on_its_slab_s_side(bar_outcomes):
    for beam, left in (("E-1", True), ("E-2", False)):
        section = bar_figure(bar_outcomes[beam]).axes[0]
        flange = max(rectangles(section), key=lambda p: p.get_width())
        web = min(rectangles(section), key=lambda p: p.get_width())
        assert web.get_width() == pytest.approx(300)
        if left:  # the slab is on the left: the flange ends at the web's right face
            assert flange.get_x() + flange.get_width() == pytest.approx(150)
            assert flange.get_x() < -150
        else:
            assert flange.get_x() == pytest.approx(-150)
            assert flange.get_x() + flange.get_width() > 150


def test_no_two_labels_overlap(bar_outcomes, outcomes):
    """E-1's two tension layers are 15 mm apart: their labels (and strains) would
    overlap where they were drawn; spread_labels moves them apart."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    figures = [bar_figure(o) for o in bar_outcomes.values()]
    figures += [drawn(outcomes[("K-1", "aci318-19")]), drawn(outcomes[("K-2", "aci318-19")])]
    for figure in figures:
        renderer = FigureCanvasAgg(figure).get_renderer()
        boxes = [t.get_window_extent(renderer) for ax in figure.axes for t in ax.texts
                 if t.get_text()]
        assert len(boxes) >= 6
        for i, a in enumerate(boxes):
            for b in boxes[i + 1:]:
                assert not a.overlaps(b), (a, b)


def test_the_bar_chart_keeps_an_edition_that_refused_the_beam(outcomes):
    from clausewise.results import Outcome

    assessed = outcomes[("K-1", "aci318-19")]
    refused = Outcome(assessed.entry, "broken-edition:1", error="plugin raised")
    outside = outcomes[("K-3", "aci318-19")]  # outside scope: no verdict to draw
    figure = figs.utilisation_figure([assessed, refused, outside])
    ax = figure.axes[0]
    assert [t.get_text() for t in ax.get_yticklabels()] == [
        "aci318-19", "broken-edition:1", "aci318-19"]
    marked = [p for p in ax.patches if p.get_gid() == "refused"]
    assert len(marked) == 2 and all(p.get_hatch() for p in marked)
    notes = [t.get_text() for t in ax.texts]
    assert any(n.startswith("refused: not assessed") for n in notes)
    assert "refused: outside scope" in notes


INVERTED = """
[[beam]]
id = "K-4"
shape = "inverted T"
bending = "{bending}"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "150 mm"
effective_flange_width = "900 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
tension = [{{ area = "1500 mm2", depth = "540 mm" }}]
moments = {{ factored = "100 kN m" }}
"""


@pytest.mark.parametrize("bending", ["sagging", "hogging"])
def test_an_inverted_tee_is_drawn_with_its_flange_at_the_soffit(bending):
    """The ledge of an inverted T is at the bottom whichever way it bends: in tension in
    sagging (the block in the web at the top), in compression in hogging (the block in
    the flange at the soffit); ACI 318-19 block a = As fy / (0.85 f'c b), from memory."""
    schedule = parse_schedule(INVERTED.format(bending=bending), "ledger.toml")
    [outcome] = run(schedule, [default_registry().edition("aci318-19")], None, "persistent")
    section = drawn(outcome).axes[0]
    flange = max(rectangles(section, figs.CONCRETE), key=lambda p: p.get_width())
    assert flange.get_width() == pytest.approx(900)
    assert flange.get_y() == pytest.approx(0, abs=1e-9)  # on the soffit
    assert flange.get_height() == pytest.approx(150)
    [zone] = rectangles(section, ZONE)
    if bending == "sagging":  # compression at the top, in the 300 mm web
        a = 1500 * 420 / (0.85 * 30 * 300)
        assert zone.get_y() + zone.get_height() == pytest.approx(600)
        assert zone.get_width() == pytest.approx(300)
    else:  # compression at the soffit, in the 900 mm flange
        a = 1500 * 420 / (0.85 * 30 * 900)
        assert zone.get_y() == pytest.approx(0, abs=1e-9)
        assert zone.get_width() == pytest.approx(900)
    assert zone.get_height() == pytest.approx(a)


def test_a_stacked_figure_puts_the_section_above_and_prints_near_its_own_size(outcomes):
    """For paper: 180 mm of text width (A4 and Letter, common practice) holds the stacked
    figure at 86 % or more of its size, so 8 pt labels print at 7 pt or more."""
    figure = figs.beam_figure(outcomes[("K-1", "aci318-19")].assessment, stacked=True)
    width, _ = figure.get_size_inches()
    assert 180 / 25.4 / width >= 0.86
    section, strains, stresses = (ax.get_position() for ax in figure.axes)
    assert section.y0 > strains.y1 and strains.y0 == pytest.approx(stresses.y0)
    assert strains.x1 < stresses.x0
    flange = max(rectangles(figure.axes[0]), key=lambda p: p.get_width())
    assert flange.get_width() == pytest.approx(300 + 2 * 6000 / 8)  # the same section drawn


def _section_of(beam: int, given: str, bars: str):
    """The section panel and its texts for one beam of SCHEDULE with its tension steel
    ``given`` as an area replaced by ``bars``, under ACI 318-19."""
    text = SCHEDULE.split("[[beam]]")[beam].replace(given, bars)
    schedule = parse_schedule("[[beam]]" + text, "bars.toml")
    [outcome] = run(schedule, [default_registry().edition("aci318-19")], None, "persistent")
    panel = figs.beam_figure(outcome.assessment, bar_groups=outcome.entry.bar_groups).axes[0]
    return panel, [t.get_text() for t in panel.texts]


def test_a_us_beam_s_bars_are_labelled_by_their_designation():
    """4 #9 bars (ASTM A615 #9: 1.128 in, 1.00 in², from memory) are labelled as the file
    gives them, not by their diameter."""
    _, labels = _section_of(2, 'tension = [{ area = "2.37 in2"', 'tension = [{ bars = "4 #9"')
    assert any(label.startswith("4 × #9 (4 in²)") for label in labels), labels


def test_a_layer_of_two_sizes_is_labelled_and_drawn_as_given():
    """2 x 25 mm + 2 x 20 mm: 2 x 490.9 + 2 x 314.2 = 1610 mm² (hand arithmetic); the label
    names both sizes (it read "4 × 25 mm") and the two larger bars sit at the corners."""
    panel, labels = _section_of(1, 'tension = [{ area = "2000 mm2", depth = "540 mm" }]',
                                'tension = [{ bars = "2 x 20 mm + 2 x 25 mm", depth = "540 mm" }]')
    assert any(label.startswith("2 × 20 mm + 2 × 25 mm (1610 mm²)") for label in labels), labels
    bars = sorted((c for c in panel.patches if c.get_gid() == "bar"),
                  key=lambda c: c.center[0])
    radii = [c.radius / bars[0].radius for c in bars]
    assert radii == pytest.approx([1.0, 0.8, 0.8, 1.0])  # 25 mm outside, 20 mm between


def test_labels_of_forty_close_layers_are_spread_apart_measuring_each_once(monkeypatch):
    """Forty layers 6 mm apart: every label ends clear of every other, and each is
    measured once (moving a label moves its box; measuring again after every move made a
    many-layer sheet take minutes)."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.text import Annotation

    layers = ", ".join(f'{{ bars = "2 x 12 mm", depth = "{540 - 6 * i} mm" }}'
                       for i in range(40))
    text = SCHEDULE.split("[[beam]]")[1].replace(
        'tension = [{ area = "2000 mm2", depth = "540 mm" }]', f"tension = [{layers}]")
    schedule = parse_schedule("[[beam]]" + text, "dense.toml")
    [outcome] = run(schedule, [default_registry().edition("aci318-19")], None, "persistent")
    measured = []
    real = Annotation.get_window_extent

    def counted(self, renderer=None):
        measured.append(self)
        return real(self, renderer)

    monkeypatch.setattr(Annotation, "get_window_extent", counted)
    figure = figs.beam_figure(outcome.assessment, bar_groups=outcome.entry.bar_groups)
    monkeypatch.undo()
    spread = [t for ax in figure.axes for t in ax.texts
              if isinstance(t, Annotation) and t.get_text() and t.anncoords == "offset points"]
    assert len(spread) >= 40 and len(measured) <= 2 * len(spread)
    renderer = FigureCanvasAgg(figure).get_renderer()
    boxes = [t.get_window_extent(renderer) for t in spread]
    for i, a in enumerate(boxes):
        for b in boxes[i + 1:]:
            assert not a.overlaps(b), (a, b)


def test_the_ultimate_strain_label_keeps_clear_of_the_zero_line(outcomes):
    """The εcu label sits beside the strain line's end, not across the zero-strain line
    (it was centred on the end, a few hundredths of the panel from zero), and inside the
    strain panel."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    drawn = [figs.beam_figure(o.assessment, o.notation, o.entry.bar_groups)
             for o in outcomes.values() if o.assessment is not None
             and o.assessment.response is not None and o.assessment.response.equilibrium]
    assert drawn
    for figure in drawn:
        renderer = FigureCanvasAgg(figure).get_renderer()
        strain = figure.axes[1]
        panel = strain.get_window_extent(renderer)
        [label] = [t for t in strain.texts if t.get_text().startswith("εcu")]
        box = label.get_window_extent(renderer)
        zero = strain.transData.transform((0.0, 0.0))[0]
        assert not box.x0 < zero < box.x1, label.get_text()
        assert panel.x0 <= box.x0 and box.x1 <= panel.x1
