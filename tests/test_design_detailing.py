"""Detailing: bar catalogues, the fit of bars in the web, spacing limits, and the beam-file
fields they need. Checked against hand arithmetic and the editions' rules as recalled
(clauses "from memory"), and trade tables (common practice)."""

from __future__ import annotations

import math
from dataclasses import replace

import pytest

from clausewise.beamfile import parse_schedule
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Context,
    EditionInfo,
    Layer,
    Shape,
    assess,
    hookimpl,
)
from clausewise.provisions.bars import CANADIAN, METRIC, US, restrict
from clausewise.provisions.detailing import bars_that_fit, centre_spacing, width_needed
from clausewise.provisions.registry import PluginError, Registry, default_registry
from clausewise.units import read_bars

BUILT_IN = ("aci318-19", "aci318-14", "aci318-11", "en1992-1-1:2004", "csa-a23.3:19",
            "as3600:2018", "is456:2000")


def rectangle(bars: tuple[Layer, ...], **extra) -> Beam:
    return Beam("D1", Shape.RECTANGLE, Bending.SAGGING, 300.0, 600.0, 30.0, 420.0, bars,
                actions=Actions(factored=150e6), **extra)


def layer(n: int, db: float, depth: float = 540.0) -> Layer:
    return Layer(n * math.pi * db * db / 4, depth, n, db, n * db)


def check(a, name: str):
    found = [c for c in a.checks if c.name == name]
    assert found, f"no check {name!r} in {[c.name for c in a.checks]}"
    return found[0]


# --- catalogues ------------------------------------------------------------------------

def test_catalogue_areas_and_masses_match_trade_tables():
    # common trade tables (common practice): 16 mm bar 201 mm², 1.58 kg/m; #8 0.79 in²;
    # 25M 500 mm²; mass from 7850 kg/m³
    m16 = next(b for b in METRIC if b.diameter == 16)
    assert m16.area == pytest.approx(201.06, abs=0.01)
    assert m16.mass_per_metre == pytest.approx(1.578, abs=0.001)
    n8 = next(b for b in US if b.name == "#8")
    assert n8.area == pytest.approx(0.79 * 645.16)
    assert n8.diameter == pytest.approx(25.4)
    assert next(b for b in CANADIAN if b.name == "25M").area == 500.0
    assert [b.name for b in restrict(METRIC, ("25 mm", "16mm"))] == ["16 mm", "25 mm"]
    with pytest.raises(KeyError, match="not in this catalogue"):
        restrict(METRIC, ("#8",))


def test_bar_notation_reads_the_one_catalogue():
    # ASTM A615 #8: 0.79 in² (from memory); CSA 25M: 500 mm²
    assert read_bars("3 #8").area == pytest.approx(3 * 0.79 * 645.16)
    bars = read_bars("2 25M")
    assert (bars.area, bars.count, bars.largest_diameter) == (1000.0, 2, 25.2)
    mixed = read_bars("2 N20 + 2 N16")
    assert mixed.side_by_side == pytest.approx(72.0)  # hand arithmetic: 2·20 + 2·16


# --- fit, by hand arithmetic ------------------------------------------------------------

def test_fit_matches_hand_arithmetic():
    # n bars fit when 2(cover + stirrup) + n db + (n − 1) s ≤ bw (common practice):
    # bw 300, cover 40, stirrup 10, db 25, s 26.67: 100 + 25n + 26.67(n − 1) ≤ 300 → n ≤ 4
    assert bars_that_fit(300.0, 25.0, 80 / 3, 40.0, 10.0) == 4
    assert width_needed(4, 100.0, 80 / 3, 40.0, 10.0) == pytest.approx(280.0)
    assert width_needed(5, 125.0, 80 / 3, 40.0, 10.0) == pytest.approx(331.667, abs=1e-3)
    # four bars spread between the stirrup corners: (300 − 100 − 25)/3
    assert centre_spacing(4, 25.0, 300.0, 40.0, 10.0) == pytest.approx(175 / 3)
    assert centre_spacing(1, 25.0, 300.0, 40.0, 10.0) == 0.0


def test_bars_that_do_not_fit_fail_a_detailing_check_with_numbers():
    # ACI 318-19 25.2.1 (from memory): clear spacing ≥ max(db, 25 mm, 4/3 aggregate);
    # aggregate 20 mm → 26.67 mm; cover 40 mm (20.5.1.3.1), stirrup 10 mm (stated defaults)
    ok = assess(rectangle((layer(4, 25.0),)), "aci318-19")
    fit = check(ok, "bars fit the web: tension layer 1")
    assert fit.passed and fit.value == pytest.approx(280.0) and fit.limit == 300.0
    crowded = assess(rectangle((layer(5, 25.0),)), "aci318-19")
    fit = check(crowded, "bars fit the web: tension layer 1")
    assert not fit.passed
    assert fit.value == pytest.approx(331.667, abs=1e-3) and fit.limit == 300.0
    assert fit.clause.ref == "25.2.1"
    assert crowded.status == "fail"


def test_given_cover_stirrup_and_aggregate_are_used():
    # cover 25, stirrup 12, aggregate 32 mm → s = max(25, 25, 42.67): 74 + 100 + 3·42.67
    beam = rectangle((layer(4, 25.0),), cover=25.0, stirrup_diameter=12.0, aggregate_size=32.0)
    fit = check(assess(beam, "aci318-19"), "bars fit the web: tension layer 1")
    assert fit.value == pytest.approx(74 + 100 + 3 * 128 / 3)


def test_a_layer_given_as_an_area_is_not_checked_and_says_so():
    a = assess(rectangle((Layer(1500.0, 540.0),)), "aci318-19")
    assert not [c for c in a.checks if c.name.startswith("bars fit")]
    assert any("given as an area" in r for r in a.remarks)


def test_crack_control_spacing_aci_hand_arithmetic():
    # ACI 318-19 24.3.2 (from memory): s ≤ 380(280/fs) − 2.5cc ≤ 300(280/fs), fs = 2/3 fy;
    # fy 420 → fs 280; cc = 40 + 10 = 50 → 255 mm
    spacing = check(assess(rectangle((layer(3, 25.0),)), "aci318-19"),
                    "bar spacing for crack control")
    assert spacing.limit == pytest.approx(255.0)
    assert spacing.value == pytest.approx((300 - 100 - 25) / 2)


def test_crack_control_spacing_csa_hand_arithmetic():
    # CSA A23.3-19 10.6.1 (from memory): z = fs (dc A)^(1/3) ≤ 30 000 N/mm, fs = 0.6 fy,
    # A = 2 dc s → s ≤ z³/(2 fs³ dc²); fy 420 → fs 252; dc = 30 + 10 + 12.5 = 52.5 mm
    spacing = check(assess(rectangle((layer(3, 25.0),)), "csa-a23.3:19"),
                    "bar spacing for crack control")
    assert spacing.limit == pytest.approx(30_000**3 / (2 * 252**3 * 52.5**2))


def test_layers_apart_by_the_edition_clear_distance():
    # IS 456:2000 26.3.2 (from memory): layers ≥ max(15 mm, 2/3 aggregate, bar diameter);
    # two layers of 25 mm bars 40 mm apart centre to centre: gap 15 mm < 25 mm
    beam = rectangle((layer(2, 25.0, 540.0), layer(2, 25.0, 500.0)))
    between = check(assess(beam, "is456:2000"), "clear distance between tension layers")
    assert between.value == pytest.approx(15.0) and between.limit == pytest.approx(25.0)
    assert not between.passed


@pytest.mark.parametrize("edition_id", BUILT_IN)
def test_every_built_in_edition_gives_detailing_limits(edition_id):
    edition = default_registry().edition(edition_id)
    beam = rectangle((layer(3, 16.0),))
    context = Context(form=edition.forms[0])
    limits = edition.detailing_limits(beam, 16.0, edition.parameters(context), context)
    assert limits is not None
    assert limits.clear_in_layer.value >= 16.0  # every edition: at least one bar diameter
    assert all(c.clause.ref and c.clause.edition for c in limits.clear_in_layer.candidates)
    assert 15.0 <= limits.cover.value <= 50.0
    assert limits.max_spacing is not None or limits.crack_note


def test_en_clear_distance_recommended_values():
    # EN 1992-1-1 8.2(2) (from memory): max(k1 φ, dg + k2, 20 mm), k1 = 1, k2 = 5 mm:
    # φ 16, dg 20 → 25 mm
    edition = default_registry().edition("en1992-1-1:2004")
    beam = rectangle((layer(3, 16.0),))
    context = Context()
    limits = edition.detailing_limits(beam, 16.0, edition.parameters(context), context)
    assert limits.clear_in_layer.value == pytest.approx(25.0)
    assert limits.max_spacing is None and "7.3.3" in limits.crack_note


# --- the beam file -------------------------------------------------------------------

FILE = """
[[beam]]
id = "F1"
shape = "rectangular"
web_width = "300 mm"
overall_depth = "600 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
cover = "1.5 in"
stirrup_diameter = "12 mm"
aggregate_size = "25 mm"
{tension}
moments = {{ factored = "150 kN m" }}
"""


def test_beam_file_keeps_bars_and_detailing_inputs():
    schedule = parse_schedule(FILE.format(
        tension='tension = [{ bars = "2 N20 + 2 N16", depth = "540 mm" }]'))
    beam = schedule.entries[0].beam
    (t,) = beam.tension
    assert (t.count, t.diameter, t.bars_width) == (4, 20.0, 72.0)
    assert beam.cover == pytest.approx(38.1) and beam.stirrup_diameter == 12.0
    assert beam.aggregate_size == 25.0


def test_an_area_layer_keeps_no_bars():
    schedule = parse_schedule(FILE.format(
        tension='tension = [{ area = "1500 mm2", depth = "540 mm" }]'))
    assert not schedule.entries[0].beam.tension[0].has_bars


def test_bars_may_be_left_out_only_for_design():
    text = FILE.format(tension="")
    refused = parse_schedule(text)
    assert not refused.entries
    assert refused.problems[0].field == "tension"
    designed = parse_schedule(text, design=True)
    assert designed.entries[0].beam.tension == ()


def test_bad_cover_names_the_field_and_unit():
    schedule = parse_schedule(FILE.format(tension="").replace('"1.5 in"', '"30 MPa"'),
                              design=True)
    assert schedule.problems and schedule.problems[0].field == "cover"
    assert "length" in schedule.problems[0].message


class NegativeCover:
    """An extending edition whose detailing answer makes no sense."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-negative-cover", "nonsense detailing", 2024,
                           extends="aci318-19")

    @hookimpl
    def detailing_limits(self, beam, diameter, params, context):
        base = default_registry().edition("aci318-19")
        limits = base.detailing_limits(beam, diameter, params, context)
        return replace(limits, cover=replace(limits.cover, value=-5.0))


def test_a_senseless_detailing_answer_is_refused_naming_edition_and_hook():
    registry = Registry(only=frozenset({"aci318-19"}))
    registry.load_entry_points()
    assert registry.register(NegativeCover()).ok
    with pytest.raises(PluginError, match="xx-negative-cover.*detailing_limits.*cover"):
        assess(rectangle((layer(3, 20.0),)), registry.edition("xx-negative-cover"))


def test_remarks_reach_the_json_results(tmp_path):
    from clausewise.cli import main

    path = tmp_path / "area.toml"
    path.write_text(FILE.format(tension='tension = [{ area = "1500 mm2", depth = "540 mm" }]'),
                    encoding="utf-8")
    out = tmp_path / "area.json"
    assert main(["check", str(path), "--edition", "aci318-19", "--out", str(out)]) == 0
    import json

    (result,) = json.loads(out.read_text(encoding="utf-8"))["results"]
    assert any("given as an area" in r for r in result["remarks"])


US_BEAM = """
[[beam]]
id = "Q1"
units = "US"
shape = "T"
web_width = "14 in"
overall_depth = "28 in"
slab_thickness = "6 in"
cover = "1.5 in"
stirrup_diameter = "0.5 in"
concrete_strength = "5000 psi"
yield_strength = "60 ksi"
tension = [{ bars = "4 #9", depth = "25.4 in" }]
floor = { span = "30 ft", continuity = "simple" }
moments = { factored = "500 kip ft" }
"""


def test_detailing_notes_of_a_us_beam_give_its_lengths_in_inches():
    beam = parse_schedule(US_BEAM).entries[0].beam
    notes = {c.name: c.note for c in assess(beam, "aci318-19").checks}
    fit = notes["bars fit the web: tension layer 1"]
    assert "cover 1.5 in, stirrup 0.5 in" in fit and " mm" not in fit
    assert "(cover 1.5 in as given, stirrup 0.5 in)" in notes[
        "bars clear of the cover: tension layer 1"]
