"""Physically impossible beams never pass, absurd magnitudes are refused with the field,
value and range, and a few smaller guards of the beam and parameter files (issue 13)."""

from __future__ import annotations

import time
import warnings
from dataclasses import replace
from pathlib import Path

import pytest

from clausewise.annexfile import AnnexError, load_annex
from clausewise.beamfile import json_schema, parse_schedule
from clausewise.beamfile.models import PLAUSIBLE
from clausewise.cli import main
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Continuity,
    FloorLayout,
    Layer,
    Registry,
    Shape,
    assess,
)

RECTANGLE = """
[project]
units = "SI"

[[beam]]
id = "X1"
title = "{title}"
shape = "rectangular"
bending = "{bending}"
web_width = "{bw}"
overall_depth = "{h}"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{{ bars = "{bars}", depth = "{d}" }}]
"""

TEE = """
[project]
units = "SI"

[[beam]]
id = "T1"
shape = "T"
bending = "{bending}"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "120 mm"
effective_flange_width = "{bf}"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{{ bars = "{tension}", depth = "{d}" }}]
compression = [{{ bars = "{compression}", depth = "50 mm" }}]
"""


def rectangle(**changes: str) -> str:
    fields = dict(title="", bending="sagging", bw="300 mm", h="600 mm", bars="4 x 25 mm",
                  d="540 mm") | changes
    return RECTANGLE.format(**fields)


def problems(text: str) -> list[str]:
    return [p.message for p in parse_schedule(text, "plan.toml").problems]


# --- bars that cannot be built -------------------------------------------------------------

def test_the_demo_and_a_plain_beam_load():
    assert problems(rectangle()) == []


def test_bars_whose_edge_lies_beyond_the_overall_depth_are_refused():
    # d + db/2 = 595 + 12.5 = 607.5 mm > h = 600 mm (hand arithmetic)
    found = problems(rectangle(d="595 mm"))
    assert len(found) == 1 and "field tension[1].depth" in found[0]
    assert "607.5 mm" in found[0] and "600 mm" in found[0]
    assert problems(rectangle(d="587.5 mm")) == []  # edge exactly at the soffit


def test_tension_steel_on_the_compression_side_for_the_bending_sense_is_refused():
    # hogging: depth is from the soffit; bottom bars "at 60 mm" are compression-side bars
    found = problems(rectangle(bending="hogging", d="60 mm"))
    assert len(found) == 1 and "field tension[1].depth" in found[0]
    assert "mid-depth" in found[0] and "300 mm" in found[0] and "hogging" in found[0]


@pytest.mark.parametrize(("bars", "bw", "need"), [
    ("12 x 32 mm", "300 mm", "384 mm"),  # 12 x 32 = 384 mm > 300 mm
    ("4 x 25 mm", "60 mm", "100 mm"),  # 4 x 25 = 100 mm > 60 mm
    ("3 #11", "100 mm", "107.4 mm"),  # 3 x 1.41 in x 25.4 = 107.4 mm (ASTM A615, from memory)
    ("4 N20 + 2 N16", "110 mm", "112 mm"),  # 4 x 20 + 2 x 16 = 112 mm
])
def test_bars_wider_than_the_web_side_by_side_are_refused(bars, bw, need):
    found = problems(rectangle(bars=bars, bw=bw))
    assert len(found) == 1 and "field tension[1].bars" in found[0]
    assert need in found[0] and f"web width ({bw})" in found[0]


def test_bars_in_a_flange_are_measured_against_the_flange_they_lie_in():
    # sagging T: the compression bars at 50 mm lie in the 120 mm slab of a 2 m flange
    ok = TEE.format(bending="sagging", bf="2000 mm", tension="4 x 25 mm", d="540 mm",
                    compression="14 x 25 mm")
    assert problems(ok) == []
    # hogging T: the slab is in tension; 14 bars in the slab at d = 560 mm fit a 2 m flange
    slab = TEE.format(bending="hogging", bf="2000 mm", tension="14 x 25 mm", d="560 mm",
                      compression="2 x 16 mm")
    assert problems(slab) == []
    # ... but not a flange of 300 mm (given outright)
    narrow = TEE.format(bending="hogging", bf="300 mm", tension="14 x 25 mm", d="560 mm",
                        compression="2 x 16 mm")
    assert ["flange width (300 mm)" in m for m in problems(narrow)] == [True]


# --- absurd magnitudes ---------------------------------------------------------------------

@pytest.mark.parametrize(("change", "field"), [
    ({"h": "1e308 mm"}, "overall_depth"),
    ({"bw": "300 ly"}, "web_width"),
    ({"bw": "1e12 mm"}, "web_width"),
    ({"d": "1e-300 mm"}, "tension[1].depth"),
    ({"d": "5e-324 mm"}, "tension[1].depth"),
    ({"h": "60 m"}, "overall_depth"),
])
def test_absurd_magnitudes_are_refused_naming_field_value_and_range(change, field):
    found = problems(rectangle(**change))
    assert found and f"field {field}:" in found[0], found
    assert "plausible range for a building beam" in found[0]
    assert repr(next(iter(change.values()))) in found[0]


def test_a_given_flange_width_of_100_m_is_refused():
    found = problems(TEE.format(bending="sagging", bf="100 m", tension="4 x 25 mm",
                                d="540 mm", compression="2 x 16 mm"))
    assert found and "effective_flange_width" in found[0] and "20 000 mm" in found[0]


def test_ranges_are_stated_in_the_schema_for_every_checked_quantity():
    defs = json_schema()["$defs"]
    beam, floor, layer = (defs[n]["properties"] for n in ("beam", "floor", "layer"))
    moments = defs["moments"]["properties"]
    stated = {**{f"beam.{k}": v for k, v in beam.items()},
              **{f"floor.{k}": v for k, v in floor.items()},
              **{f"layer.{k}": v for k, v in layer.items()},
              **{f"moments.{k}": v for k, v in moments.items()}}
    for name in ("beam.overall_depth", "beam.web_width", "beam.slab_thickness",
                 "beam.effective_flange_width", "beam.concrete_strength",
                 "beam.yield_strength", "beam.steel_modulus", "floor.span", "floor.clear_left",
                 "layer.depth", "layer.area", "moments.dead", "moments.factored"):
        extent = stated[name]["x-plausible-range"]
        assert extent["minimum"] < extent["maximum"], name
    assert beam["overall_depth"]["x-plausible-range"] == {
        "minimum": PLAUSIBLE["overall_depth"].low, "maximum": PLAUSIBLE["overall_depth"].high,
        "unit": "mm"}


def test_us_units_state_the_range_in_both_systems():
    text = rectangle(h="400 in").replace('units = "SI"', 'units = "US"')
    found = problems(text)
    assert found and "196.9 in" in found[0] and "5000 mm" in found[0]  # 5000 / 25.4


def test_an_extreme_but_plausible_beam_raises_no_numpy_warning():
    schedule = parse_schedule(rectangle(bw="50 mm", h="5000 mm", bars="2 x 16 mm",
                                        d="4900 mm"), "plan.toml")
    assert schedule.entries
    from clausewise.provisions import default_registry

    with warnings.catch_warnings():
        warnings.simplefilter("error")
        for edition in default_registry().editions():
            assess(schedule.entries[0].beam, edition)


# --- smaller ---------------------------------------------------------------------------------

def test_a_10_mb_title_is_refused_quickly():
    start = time.perf_counter()
    found = problems(rectangle(title="x" * 10_000_000))
    assert found and "field title" in found[0] and "at most 200 characters" in found[0]
    assert len(found[0]) < 400 and time.perf_counter() - start < 5.0


def test_a_binary_annex_file_error_names_the_file(tmp_path):
    annex = tmp_path / "annex.toml"
    annex.write_bytes(b"\x89PNG\r\n\x1a\n\x00\xff\xfe binary")
    with pytest.raises(AnnexError) as caught:
        load_annex(annex, Registry())
    assert str(annex) in str(caught.value) and "UTF-8" in str(caught.value)


def test_plain_numbers_without_a_declared_unit_system_warn_once_naming_the_fields():
    text = rectangle().replace('[project]\nunits = "SI"\n', "").replace(
        'web_width = "300 mm"', "web_width = 300")
    text += text.replace('id = "X1"', 'id = "X2"')
    schedule = parse_schedule(text, "plan.toml")
    assert len(schedule.warnings) == 1
    assert "beam X1: web_width" in schedule.warnings[0]
    assert "beam X2: web_width" in schedule.warnings[0]
    assert parse_schedule(rectangle().replace('web_width = "300 mm"', "web_width = 300"),
                          "plan.toml").warnings == ()  # units = "SI" declared


def test_the_command_line_shows_the_units_warning_once(tmp_path, capsys):
    path = tmp_path / "plan.toml"
    path.write_text(rectangle().replace('[project]\nunits = "SI"\n', "").replace(
        'web_width = "300 mm"', "web_width = 300"), encoding="utf-8")
    main(["check", str(path), "--edition", "aci318-19", "--format", "json"])
    err = capsys.readouterr().err
    assert err.count("warning:") == 1 and "web_width" in err


def test_an_impossible_beam_is_refused_and_the_others_are_checked(tmp_path, capsys):
    good = rectangle()
    bad = rectangle(d="595 mm").replace('id = "X1"', 'id = "X2"').split("[[beam]]")[1]
    path = Path(tmp_path / "plan.toml")
    path.write_text(good + "[[beam]]" + bad, encoding="utf-8")
    assert main(["check", str(path), "--edition", "aci318-19", "--format", "json"]) == 2
    out = capsys.readouterr().out
    assert '"beam": "X1"' in out and "607.5 mm" in out


def test_a_plugins_division_by_zero_is_no_warning_and_its_answer_is_judged():
    # εty = fy/Es = 500/100 000 = 0.005 equals ACI 318-14's tension-controlled limit
    # (21.2.2, from memory): the transition is empty, and a section with εt above 0.005 is
    # tension-controlled, φ = 0.90 (Table 21.2.2, from memory)
    text = rectangle(bars="2 x 16 mm").replace('yield_strength = "500 MPa"',
                                              'yield_strength = "500 MPa"\n'
                                              'steel_modulus = "100000 MPa"')
    beam = parse_schedule(text, "plan.toml").entries[0].beam
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        a = assess(beam, "aci318-14")
    assert a.response.net_tensile_strain > 0.005
    assert a.resistance.factor.value == pytest.approx(0.90)


def test_steel_given_as_an_area_the_concrete_could_never_hold_is_refused():
    """250 000 mm² of compression steel in a 300 x 600 mm section (180 000 mm² of concrete):
    given as an area it is not placed bar by bar, so the total is bounded (15 % of the
    concrete, beyond any standard's maximum steel: ACI 318 and EN 1992 allow 4 to 8 %,
    from memory)."""
    text = """
[[beam]]
id = "R1"
shape = "rectangular"
web_width = "300 mm"
overall_depth = "600 mm"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{ area = "2000 mm2", depth = "540 mm" }]
compression = [{ area = "%s", depth = "60 mm" }]
moments = { factored = "100 kN m" }
"""
    refused = parse_schedule(text % "250000 mm2", "r.toml")
    assert not refused.entries
    [problem] = refused.problems
    assert problem.field == "compression[1]" and "steel the section can hold" in problem.expected
    assert "180 000 mm²" in problem.expected
    assert parse_schedule(text % "1600 mm2", "r.toml").entries  # a heavy, real beam is read


@pytest.mark.parametrize(("edition", "least"), [
    ("aci318-19", 4.0),  # ACI 318-19 9.9.1.1: deep beam, ln at most 4h (from memory)
    ("aci318-11", 4.0),  # ACI 318-11 10.7.1 (from memory)
    ("en1992-1-1:2004", 3.0),  # EN 1992-1-1 5.3.1(3): span less than 3h (from memory)
    ("is456:2000", 2.0),  # IS 456 29.1: simply supported, span/depth below 2.0 (from memory)
    ("csa-a23.3:19", 2.0),  # CSA A23.3-19 10.7.1: clear span below 2h (from memory)
    ("as3600:2018", 3.0),  # AS 3600-2018 12.1.1: simply supported, below 3 (from memory)
])
def test_a_deep_beam_is_outside_every_edition_s_flexural_scope(edition, least):
    """A 5 m deep beam over an 8 m simple span is no beam for plane sections: outside
    scope, named by its clause; the same section over a span long enough is in scope."""
    beam = Beam("transfer", Shape.RECTANGLE, Bending.SAGGING, 400.0, 5000.0, 32.0, 500.0,
                (Layer(6000.0, 4900.0),), layout=FloorLayout(8000.0, Continuity.SIMPLE),
                actions=Actions(dead=2000e6))
    deep = assess(beam, edition)
    assert deep.status == "outside scope"
    [check] = [c for c in deep.applicability if c.name.startswith("span-to-depth")]
    assert check.value == pytest.approx(8000 / 5000) and check.limit == least
    long_enough = replace(beam, layout=FloorLayout(5000.0 * least * 1.01, Continuity.SIMPLE))
    assert assess(long_enough, edition).status != "outside scope"


@pytest.mark.parametrize(("continuity", "least", "slender"), [
    (Continuity.CANTILEVER, 1.5, True), (Continuity.SIMPLE, 3.0, False),
    (Continuity.END, 4.0, False), (Continuity.INTERIOR, 4.0, False),
])  # AS 3600-2018 12.1.1 non-flexural members: 1.5, 3 and 4 (from memory)
def test_as3600_deep_beam_limit_follows_the_support(continuity, least, slender):
    """The limit is taken on the clear span where the floor gives it: ln/h = 2.8 is a
    slender cantilever but a deep beam between supports."""
    beam = Beam("transfer", Shape.RECTANGLE, Bending.SAGGING, 400.0, 2000.0, 32.0, 500.0,
                (Layer(4000.0, 1900.0),), actions=Actions(dead=500e6),
                layout=FloorLayout(6000.0, continuity, clear_span=5600.0))
    [check] = [c for c in assess(beam, "as3600:2018").applicability
               if c.name.startswith("span-to-depth")]
    assert check.symbol == "ln/h" and check.value == pytest.approx(5600.0 / 2000.0)
    assert check.limit == least and check.passed is slender


DESIGN_BEAM = """
[project]
name = "Harrowgate stores"
units = "%s"

[[beam]]
id = "Y"
shape = "rectangular"
web_width = "%s"
overall_depth = "600 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
moments = { dead = "100 kN m", live = "50 kN m" }
%s
"""


def _design_problems(extra: str, units: str = "SI", bw: str = "300 mm") -> list:
    return parse_schedule(DESIGN_BEAM % (units, bw, extra), "y.toml", design=True).problems


def test_bar_sizes_are_read_as_the_file_gives_them():
    """A plain number in an SI file is a diameter in mm; names that are no bar size, sizes
    of two catalogues and plain numbers in US units are problems at reading, each naming
    its entry (they were an error row under every edition, and [20] was 'text in
    quotes'); a design file's refused field never adds 'tension (missing)'."""
    read = parse_schedule(DESIGN_BEAM % ("SI", "300 mm", "bar_sizes = [20, 25]"), "y.toml",
                          design=True)
    assert not read.problems and read.entries[0].beam.bar_sizes == ("20 mm", "25 mm")
    unknown = _design_problems('bar_sizes = ["17 mm", "5 kN"]')
    assert [(p.field, p.value) for p in unknown] == [("bar_sizes[1]", "17 mm"),
                                                     ("bar_sizes[2]", "5 kN")]
    assert all("'#8'" in p.expected for p in unknown)
    [mixed] = _design_problems('bar_sizes = ["20 mm", "#8"]')
    assert mixed.field == "bar_sizes" and "one catalogue" in mixed.expected
    [us] = _design_problems("bar_sizes = [8]", units="US", bw="12 in")
    assert us.field == "bar_sizes[1]" and "'#8'" in us.expected
    refused = _design_problems("bar_sizes = [true]")
    assert [p.field for p in refused] == ["bar_sizes[1]"]


def test_a_cover_that_leaves_no_room_for_bars_is_refused():
    """Cover beyond any beam (600 mm), or cover and stirrups that fill the web: no bar
    could be placed, so the beam is refused at the field (it was designed as 'the section
    must grow'). Common practice: 2(cover + stirrup) must be less than bw."""
    [far] = _design_problems('cover = "600 mm"')
    assert far.field == "cover" and "plausible range" in far.expected
    [full] = _design_problems('cover = "120 mm"\nstirrup_diameter = "12 mm"', bw="250 mm")
    assert full.field == "cover" and "264 mm" in full.expected and "web width" in full.expected
    assert not _design_problems('cover = "40 mm"')


def test_bars_inside_the_cover_the_file_states_never_pass():
    """A cover of 40 mm with 10 mm stirrups and 25 mm bars puts the bars' centroid at
    least 40 + 10 + 12.5 = 62.5 mm from the face (common practice, hand arithmetic); a
    depth of 580 mm on a 600 mm beam (20 mm from the soffit) cannot be built as stated
    and is no longer a pass at 8 % more strength than the largest buildable depth."""
    text = rectangle(d="580 mm") + 'cover = "40 mm"\nstirrup_diameter = "10 mm"\n' \
        + 'moments = { factored = "200 kN m" }\n'
    schedule = parse_schedule(text, "plan.toml")
    assert not schedule.problems
    beam = schedule.entries[0].beam
    for edition in ("aci318-19", "en1992-1-1:2004"):
        a = assess(beam, edition)
        check = next(c for c in a.checks if c.name == "bars clear of the cover: tension layer 1")
        assert check.value == pytest.approx(20.0) and check.limit == pytest.approx(62.5)
        assert not check.passed and a.status == "fail"
    buildable = parse_schedule(rectangle(d="537.5 mm") + 'cover = "40 mm"\n'
                               'stirrup_diameter = "10 mm"\n', "plan.toml").entries[0].beam
    assert all(c.passed for c in assess(buildable, "aci318-19").checks
               if c.name.startswith("bars clear of the cover"))
