"""The schedule file: loading, bad input, unit round trips, the demo and the JSON Schema."""

from __future__ import annotations

import copy
import json
import math
import re
import tomllib
from dataclasses import fields, is_dataclass
from pathlib import Path
from typing import Any

import pytest
import tomli_w
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from clausewise.beamfile import (
    InputError,
    InputProblem,
    Schedule,
    json_schema,
    load_schedule,
    parse_schedule,
)
from clausewise.provisions import Bending, Shape, StrengthBasis, UnitSystem

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"
DELETE = object()

GOOD: dict[str, Any] = {
    "id": "B1",
    "shape": "T",
    "web_width": "350 mm",
    "overall_depth": "650 mm",
    "slab_thickness": "160 mm",
    "concrete_strength": "32 MPa",
    "yield_strength": "500 MPa",
    "tension": [{"bars": "4 x 20 mm", "depth": "595 mm"}],
    "compression": [{"bars": "2 x 16 mm", "depth": "50 mm"}],
    "floor": {"span": "8.4 m", "continuity": "interior", "clear_left": "2.65 m",
              "clear_right": "2.65 m"},
    "moments": {"dead": "122 kN m", "live": "71 kN m"},
}


def document(*beams: dict[str, Any], **tables: Any) -> str:
    return tomli_w.dumps({**tables, "beam": list(beams)})


def patched(changes: dict[str, Any]) -> dict[str, Any]:
    """GOOD with changes at dotted paths ("floor.span", "tension.0.bars"); DELETE removes."""
    beam = copy.deepcopy(GOOD) | {"id": "BAD"}
    for path, value in changes.items():
        *parents, last = path.split(".")
        target: Any = beam
        for part in parents:
            target = target[int(part)] if isinstance(target, list) else target[part]
        key: Any = int(last) if isinstance(target, list) else last
        if value is DELETE:
            del target[key]
        else:
            target[key] = value
    return beam


# (changes to a good beam, field named in the problem, fragments of the message)
BAD_BEAMS: list[tuple[dict[str, Any], str, tuple[str, ...]]] = [
    ({"web_width": "30 MPa"}, "web_width", ("got '30 MPa'", "expected a length", "a stress")),
    ({"web_width": True}, "web_width", ("expected a length",)),
    ({"web_width": math.nan}, "web_width", ("a finite length",)),
    ({"web_width": "2,5 m"}, "web_width", ("a length", "decimal point")),
    ({"web_width": DELETE}, "web_width", ("missing", "a length")),
    ({"overall_depth": "deep"}, "overall_depth", ("a length", "a number must come first")),
    ({"slab_thickness": "700 mm"}, "slab_thickness", ("less than the overall depth (650 mm)",)),
    ({"slab_thickness": DELETE}, "slab_thickness", ("a length", "needs the slab thickness")),
    ({"effective_flange_width": "200 mm"}, "effective_flange_width",
     ("at least the web width (350 mm)",)),
    ({"shape": "rectangular"}, "slab_thickness", ("a rectangular section has no flange",)),
    ({"shape": "rectangle"}, "shape", ("one of 'T', 'L'", "did you mean 'rectangular'")),
    ({"bending": "sag"}, "bending", ("one of 'sagging', 'hogging'",)),
    ({"units": "metric"}, "units", ("one of 'SI', 'US'",)),
    ({"strength_basis": "cubes"}, "strength_basis", ("did you mean 'cube'",)),
    ({"concrete_strength": "30 mm"}, "concrete_strength", ("a stress", "a length")),
    ({"concrete_strength": "3 MPa"}, "concrete_strength",
     ("concrete strength from 5 MPa to 150 MPa",)),
    ({"yield_strength": "500 kN"}, "yield_strength", ("a stress", "a force")),
    ({"yield_strength": 60, "units": "US"}, "yield_strength",
     ("got '60 psi'", "from 21 800 psi to 145 000 psi (150 to 1000 MPa)")),
    ({"steel_modulus": "200 MPa"}, "steel_modulus", ("steel modulus from 100 000 MPa",)),
    ({"web_widht": "350 mm"}, "web_widht", ("did you mean 'web_width'",)),
    ({"tension": []}, "tension", ("one or more layers",)),
    ({"tension": DELETE}, "tension", ("missing", "one or more layers")),
    ({"tension": "4 x 20 mm"}, "tension", ("a list of one or more layers",)),
    ({"tension.0.bars": "4 20 mm"}, "tension[1].bars", ("bars such as",)),
    ({"tension.0.bars": "3 #12"}, "tension[1].bars", ("US sizes are",)),
    ({"tension.0.bars": 4}, "tension[1].bars", ("bars such as",)),
    ({"tension.0.depth": "700 mm"}, "tension[1].depth", ("less than the overall depth",)),
    ({"tension.0.area": "1200 mm2"}, "tension[1].area", ("bars or area, not both",)),
    ({"tension.0.bars": DELETE}, "tension[1]", ("missing", "bars (", "or area")),
    ({"tension.0.depth": DELETE}, "tension[1]", ("depth (from the compression face) or "
                                                 "centroid_from_face",)),
    ({"tension.0.centroid_from_face": "55 mm"}, "tension[1].centroid_from_face",
     ("depth or centroid_from_face, not both",)),
    ({"tension.0.bars": DELETE, "tension.0.area": "1500 mm"}, "tension[1].area",
     ("an area", "a length")),
    ({"tension.0.cover": "40 mm"}, "tension[1].cover", ("known fields: bars, area, depth",)),
    ({"compression.0.depth": "620 mm"}, "compression[1]",
     ("nearer the compression face than the tension steel", "d = 595 mm")),
    ({"floor": "8.4 m"}, "floor", ("a table of floor fields",)),
    ({"floor": DELETE}, "floor", ("at least the span",)),
    ({"floor.span": "-8 m"}, "floor.span", ("a positive length",)),
    ({"floor.span": DELETE}, "floor.span", ("missing", "a length")),
    ({"floor.continuity": "interor"}, "floor.continuity", ("did you mean 'interior'",)),
    ({"floor.clear_span": "9 m"}, "floor.clear_span", ("no longer than the span (8.4 m)",)),
    ({"floor.spam": "1 m"}, "floor.spam", ("no field of this name", "span")),
    ({"shape": "L"}, "floor.clear_right", ("one side only",)),
    ({"moments.factored": "300 kN m"}, "moments.factored", ("not both",)),
    ({"moments.dead": DELETE}, "moments.dead", ("missing", "give the dead moment too")),
    ({"moments.dead": "180 kN"}, "moments.dead", ("a moment", "a force")),
    ({"moments.live": "-5 kN m"}, "moments.live", ("a moment of zero or more",)),
    ({"statically_determinate": "yes"}, "statically_determinate", ("true or false",)),
    ({"title": 5}, "title", ("text in quotes",)),
    ({"units": "US", "compression.0.bars": "2 x 16"}, "compression[1].bars",
     ("between 3 and 60 mm",)),
]


def test_the_table_of_bad_inputs_is_long_enough() -> None:
    assert len(BAD_BEAMS) >= 30


@pytest.mark.parametrize(("changes", "field", "fragments"), BAD_BEAMS,
                         ids=[f"{i}-{case[1]}" for i, case in enumerate(BAD_BEAMS)])
def test_a_bad_beam_becomes_a_problem_and_the_good_one_still_loads(
        changes: dict[str, Any], field: str, fragments: tuple[str, ...]) -> None:
    ok = copy.deepcopy(GOOD) | {"id": "OK1"}
    schedule = parse_schedule(document(ok, patched(changes), ok | {"id": "OK2"}), "plan.toml")
    assert [e.beam.id for e in schedule.entries] == ["OK1", "OK2"]
    assert schedule.problems, "the bad beam must be reported"
    assert all(p.beam == "BAD" and p.index == 2 for p in schedule.problems)
    matching = [p for p in schedule.problems if p.field == field]
    assert matching, [p.message for p in schedule.problems]
    message = matching[0].message
    assert message.startswith(f"plan.toml, beam BAD, field {field}: ")
    for fragment in fragments:
        assert fragment in message


@pytest.mark.parametrize(("beam", "fragment"), [
    ({k: v for k, v in GOOD.items() if k != "id"}, "a text id such as 'B1'"),
    (GOOD | {"id": 3}, "a text id such as 'B1'"),
    (GOOD | {"id": "  "}, "a text id such as 'B1'"),
])
def test_a_beam_without_a_usable_id_is_named_by_its_place(beam: dict[str, Any],
                                                          fragment: str) -> None:
    schedule = parse_schedule(document(GOOD | {"id": "A"}, beam), "plan.toml")
    (problem,) = schedule.problems
    assert problem.beam is None and problem.index == 2 and problem.field == "id"
    assert problem.message.startswith("plan.toml, beam number 2 (no usable id), field id: ")
    assert fragment in problem.message
    assert [e.beam.id for e in schedule.entries] == ["A"]


def test_duplicate_ids_keep_the_first() -> None:
    schedule = parse_schedule(document(GOOD, GOOD | {"web_width": "400 mm"}), "plan.toml")
    assert [e.beam.web_width for e in schedule.entries] == [350.0]
    (problem,) = schedule.problems
    assert problem.field == "id" and "beam number 1 has it" in problem.message


def test_a_table_that_is_not_a_beam_is_a_problem() -> None:
    text = 'beam = [1, { id = "B2" }]\n'
    schedule = parse_schedule(text, "plan.toml")
    first, *others = schedule.problems
    assert first.index == 1 and "a table of beam fields" in first.message
    assert others and all(p.index == 2 and p.beam == "B2" for p in others)


def test_problem_message_format() -> None:
    problem = InputProblem("demo.toml", "B3", "web_width", "30 MPa",
                           "a length (e.g. '300 mm' or '12 in')")
    assert problem.message == ("demo.toml, beam B3, field web_width: got '30 MPa', "
                               "expected a length (e.g. '300 mm' or '12 in')")
    long = InputProblem("demo.toml", "B3", "title", "x" * 500, "text")
    assert len(long.message) < 150
    assert long.message.endswith("… (500 characters)', expected text")
    assert long.value == "x" * 50 + "… (500 characters)"  # the table's echo is as short


# --- whole-file problems --------------------------------------------------------------

def write(tmp_path: Path, text: str | bytes, name: str = "plan.toml") -> Path:
    path = tmp_path / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return path


@pytest.mark.parametrize(("text", "fragments"), [
    ("[[beam]]\nid = \n", ("not a valid TOML file", "line 2")),
    ("x = " + "1" * 5000, ("not a valid TOML file",)),  # too long for an integer
    ("x = " + "[" * 3000 + "]" * 3000, ("not a valid TOML file",)),
    ("[project]\nname = 'x'\n", ("no beams", "[[beam]]")),
    ("beam = []\n", ("no beams",)),
    ("beam = 'B1'\n", ("field beam", "[[beam]] tables")),
    (document(GOOD, beams=[GOOD]), ("field beams", "did you mean 'beam'")),
    (document(GOOD, project={"units": "metric"}), ("field project.units", "one of 'SI', 'US'")),
    (document(GOOD, project={"engineer": 7}), ("field project.engineer", "text in quotes")),
    (document(GOOD, project={"town": "X", "city": "Y"}), ("field project.city",)),
    (document(GOOD, run={"form": "imperial"}), ("field run.form", "'inch-pound'")),
    (document(GOOD, run={"situation": "seismic"}), ("field run.situation", "'accidental'")),
    (document(GOOD, run={"require": ["aci318-19 >= "]}),
     ("field run.require[1]", "version specifier")),
    (document(GOOD, run={"editions": ["aci 318"]}), ("field run.editions[1]", "edition id")),
    (document(GOOD, run={"annexes": ["missing.toml"]}),
     ("field run.annexes[1]", "an annex file that exists")),
    (document(GOOD, run="all"), ("field run", "a table of run fields")),
])
def test_whole_file_problems_raise_input_error(tmp_path: Path, text: str,
                                               fragments: tuple[str, ...]) -> None:
    path = write(tmp_path, text)
    with pytest.raises(InputError) as caught:
        load_schedule(path)
    message = str(caught.value)
    assert str(path) in message
    for fragment in fragments:
        assert fragment in message
    assert isinstance(caught.value, ValueError)


def test_unreadable_files_raise_input_error(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="no such file"):
        load_schedule(tmp_path / "absent.toml")
    with pytest.raises(InputError, match="is a folder"):
        load_schedule(tmp_path)
    with pytest.raises(InputError, match="not UTF-8"):
        load_schedule(write(tmp_path, b"\xff\xfe[[beam]]"))


def test_project_and_run_options(tmp_path: Path) -> None:
    (tmp_path / "annex").mkdir()
    (tmp_path / "annex" / "local.toml").write_text("", encoding="utf-8")
    text = document(GOOD, project={"name": "N", "building": "B", "town": "T", "engineer": "E",
                                   "notes": "n", "units": "US"},
                    run={"editions": ["aci318-19", "en1992-1-1:2004"], "form": "SI",
                         "situation": "accidental",
                         "require": ["aci318-19>=0.1", "en1992-1-1:2004 >=0.1, <2"],
                         "annexes": ["annex/local.toml"]})
    schedule = load_schedule(write(tmp_path, "\ufeff" + text))
    info = schedule.project
    assert (info.name, info.building, info.town, info.engineer, info.notes) == \
        ("N", "B", "T", "E", "n")
    assert info.unit_system is UnitSystem.US
    assert info.editions == ("aci318-19", "en1992-1-1:2004")
    assert info.required == ("aci318-19>=0.1", "en1992-1-1:2004 >=0.1, <2")
    assert info.annexes == (tmp_path / "annex" / "local.toml",)
    assert (info.form, info.situation) == ("SI", "accidental")
    assert schedule.source == tmp_path / "plan.toml"


def test_defaults_of_an_empty_project() -> None:
    schedule = parse_schedule(document(GOOD))
    info = schedule.project
    assert info.unit_system is UnitSystem.SI and info.form == "auto"
    assert info.situation == "persistent" and info.editions == () and info.annexes == ()


# --- mapping to the Beam ----------------------------------------------------------------

def beam_of(**changes: Any) -> Any:
    schedule = parse_schedule(document(patched(changes)))
    assert not schedule.problems, [p.message for p in schedule.problems]
    return schedule.entries[0]


def test_a_good_beam_in_internal_units() -> None:
    entry = beam_of()
    beam = entry.beam
    assert (beam.shape, beam.bending) == (Shape.TEE, Bending.SAGGING)
    assert (beam.web_width, beam.depth, beam.flange_thickness) == (350.0, 650.0, 160.0)
    assert (beam.concrete_strength, beam.yield_strength) == (32.0, 500.0)
    assert beam.tension[0].area == pytest.approx(4 * math.pi * 100)  # 4 bars of 20 mm
    assert beam.tension[0].depth == 595.0 and beam.compression[0].depth == 50.0
    assert beam.layout is not None and beam.layout.span == 8400.0
    assert beam.layout.clear_left == beam.layout.clear_right == 2650.0
    assert beam.actions.dead == 122e6 and beam.actions.live == 71e6  # N·mm
    assert beam.statically_determinate is False  # interior span of a continuous beam
    assert entry.shown["web width bw"] == "350 mm"
    assert entry.shown["f'c"] == "32 MPa"
    assert entry.shown["tension steel"] == "4 x 20 mm at d = 595 mm"
    assert entry.shown["compression steel"] == "2 x 16 mm at d' = 50 mm"


def test_hogging_layers_placed_from_their_faces() -> None:
    beam = beam_of(**{"bending": "hogging", "tension.0.depth": DELETE,
                      "tension.0.centroid_from_face": "57.5 mm", "compression.0.depth": DELETE,
                      "compression.0.centroid_from_face": "55 mm"}).beam
    assert beam.bending is Bending.HOGGING and not beam.flange_in_compression
    assert beam.tension[0].depth == 650 - 57.5  # from the soffit, the compression face
    assert beam.compression[0].depth == 55.0


@pytest.mark.parametrize(("bending", "flange_in_compression"), [
    ("sagging", False), ("hogging", True)])
def test_an_inverted_tee_is_a_tee_with_its_flange_at_the_soffit_and_its_own_bending(
        bending: str, flange_in_compression: bool) -> None:
    """The moment keeps its sense (the width rules of a span and of a support differ);
    the flange is at the soffit, so sagging puts it in tension (common practice)."""
    entry = beam_of(shape="inverted T", bending=bending)
    assert (entry.beam.shape, entry.beam.bending) == (Shape.TEE, Bending(bending))
    assert entry.beam.flange_at_soffit
    assert entry.beam.flange_in_compression is flange_in_compression
    assert entry.shown["shape"].startswith(f"inverted T, {bending}")


def test_statically_determinate_follows_continuity_unless_given() -> None:
    assert beam_of(**{"floor.continuity": "simple"}).beam.statically_determinate is True
    assert beam_of(**{"floor.continuity": "cantilever"}).beam.statically_determinate is True
    assert beam_of(**{"floor.continuity": "simple", "statically_determinate": False}
                   ).beam.statically_determinate is False


def test_cube_strength_and_steel_options() -> None:
    entry = beam_of(concrete_strength="40 MPa", strength_basis="cube", steel_kind="cold-worked",
                    ductility_class="B", steel_modulus="200 GPa")
    beam = entry.beam
    assert beam.strength_basis is StrengthBasis.CUBE and beam.concrete_strength == 40.0
    assert (beam.steel_kind, beam.ductility_class, beam.steel_modulus) == \
        ("cold-worked", "B", 200_000.0)
    assert entry.shown["fck,cube"] == "40 MPa"


def test_factored_moment_and_area_layers() -> None:
    beam = beam_of(**{"moments": {"factored": "300 kN m"}, "tension.0.bars": DELETE,
                      "tension.0.area": "1500 mm2"}).beam
    assert beam.actions.factored == 300e6 and beam.actions.dead is None
    assert beam.tension[0].area == 1500.0


# --- the same beam in SI and in US customary units -----------------------------------------

# Exact definitions (NIST SP 811, from memory): 1 in = 25.4 mm, 1 ft = 12 in,
# 1 lbf = 0.45359237 kg x 9.80665 m/s², 1 kip = 1000 lbf.
LBF = 0.45359237 * 9.80665  # N
PSI_MPA = LBF / 25.4**2  # N/mm²
KIP_FT_NMM = 1000 * LBF * 304.8


def us_and_si(mm: dict[str, float], psi: dict[str, float], kipft: dict[str, float]
              ) -> tuple[dict[str, Any], dict[str, Any]]:
    """One beam written twice: in inches/psi/kip ft and in mm/MPa/kN m (exact values)."""
    us = {"id": "US", "units": "US", "shape": "T", "floor": {"continuity": "end"},
          "tension": [{"bars": "4 #8"}], "moments": {}}
    si = {"id": "SI", "units": "SI", "shape": "T", "floor": {"continuity": "end"},
          "tension": [{"bars": "4 #8"}], "moments": {}}

    def put(target: dict[str, Any], key: str, value: str) -> None:
        if key.startswith("floor."):
            target["floor"][key[6:]] = value
        elif key == "depth":
            target["tension"][0]["depth"] = value
        elif key in ("dead", "live"):
            target["moments"][key] = value
        else:
            target[key] = value

    for key, inches in mm.items():
        put(us, key, f"{inches!r} in")
        put(si, key, f"{inches * 25.4!r} mm")
    for key, value in psi.items():
        put(us, key, f"{value!r} psi")
        put(si, key, f"{value * PSI_MPA!r} MPa")
    for key, value in kipft.items():
        put(us, key, f"{value!r} kip ft")
        put(si, key, f"{value * KIP_FT_NMM / 1e6!r} kN m")
    return us, si


def assert_same(a: Any, b: Any, path: str = "beam") -> None:
    if is_dataclass(a):
        for f in fields(a):
            if f.name not in ("id", "unit_system"):
                assert_same(getattr(a, f.name), getattr(b, f.name), f"{path}.{f.name}")
    elif isinstance(a, tuple):
        assert len(a) == len(b), path
        for i, (x, y) in enumerate(zip(a, b, strict=True)):
            assert_same(x, y, f"{path}[{i}]")
    elif isinstance(a, float):
        assert math.isclose(a, b, rel_tol=1e-9), (path, a, b)
    else:
        assert a == b, (path, a, b)


def test_the_same_beam_in_si_and_us_units_is_the_same_beam() -> None:
    us, si = us_and_si(
        mm={"web_width": 12, "overall_depth": 24, "slab_thickness": 5, "depth": 21.5,
            "floor.span": 28 * 12, "floor.clear_left": 66, "floor.clear_right": 66},
        psi={"concrete_strength": 4000, "yield_strength": 60_000},
        kipft={"dead": 100, "live": 60.5})
    schedule = parse_schedule(document(us, si))
    assert not schedule.problems, [p.message for p in schedule.problems]
    beam_us, beam_si = (e.beam for e in schedule.entries)
    assert (beam_us.unit_system, beam_si.unit_system) == (UnitSystem.US, UnitSystem.SI)
    assert_same(beam_us, beam_si)
    # NIST SP 811 rounded values, from memory: 12 in = 304.8 mm, 4000 psi = 27.579 MPa,
    # 100 kip ft = 135.58 kN m
    assert beam_us.web_width == pytest.approx(304.8, rel=1e-12)
    assert beam_us.concrete_strength == pytest.approx(27.579, rel=2e-5)
    assert beam_us.actions.dead == pytest.approx(135.58e6, rel=2e-5)
    assert schedule.entries[0].shown["f'c"] == "4000 psi"


def test_plain_numbers_follow_the_file_default_and_the_beam_override() -> None:
    plain = {"id": "P", "shape": "T", "web_width": 12, "overall_depth": 24,
             "slab_thickness": 5, "concrete_strength": 4000, "yield_strength": 60_000,
             "tension": [{"bars": "4 #8", "depth": 21.5}], "floor": {"span": 336},
             "moments": {"dead": 100}}
    written = plain | {"id": "W", "web_width": "12 in", "overall_depth": "2 ft",
                       "slab_thickness": "5 in", "concrete_strength": "4 ksi",
                       "yield_strength": "60 ksi", "tension": [{"bars": "4 #8",
                                                                "depth": "21.5 in"}],
                       "floor": {"span": "28 ft"}, "moments": {"dead": "100 kip-ft"}}
    by_file = parse_schedule(document(plain, written, project={"units": "US"}))
    by_beam = parse_schedule(document(plain | {"units": "US"}, written))
    for schedule in (by_file, by_beam):
        assert not schedule.problems, [p.message for p in schedule.problems]
        assert_same(schedule.entries[0].beam, schedule.entries[1].beam)
    assert by_file.entries[0].shown["web width bw"] == "12 in"


# --- the demo ---------------------------------------------------------------------------

@pytest.fixture(scope="module")
def demo() -> Schedule:
    return load_schedule(DEMO)


def test_the_demo_loads_without_problems(demo: Schedule) -> None:
    assert demo.problems == ()
    assert len(demo.entries) >= 12
    assert demo.project.town and demo.project.building


def test_the_demo_has_the_variety_it_promises(demo: Schedule) -> None:
    beams = {e.beam.id: e.beam for e in demo.entries}
    kinds = {(b.shape, b.bending) for b in beams.values()}
    assert {(Shape.TEE, Bending.SAGGING), (Shape.TEE, Bending.HOGGING),
            (Shape.ELL, Bending.SAGGING), (Shape.RECTANGLE, Bending.SAGGING)} <= kinds
    shown = {e.beam.id: e.shown for e in demo.entries}
    assert any(s["shape"].startswith("inverted T, sagging") for s in shown.values())
    assert any(s["shape"].startswith("T, hogging") for s in shown.values())
    assert any(b.compression for b in beams.values())
    assert any(b.unit_system is UnitSystem.US for b in beams.values())
    assert any(b.strength_basis is StrengthBasis.CUBE for b in beams.values())
    assert any(b.flange_width is not None for b in beams.values())
    # strengths within the common scope of the built-in editions (f'c 25-40 MPa, fy >= 400)
    for b in beams.values():
        assert 25 <= b.concrete_strength <= 40 and 400 <= b.yield_strength <= 500, b.id


def test_demo_b6_block_enters_the_web_by_hand(demo: Schedule) -> None:
    # ACI 318-19 22.2.2.4.1, from memory: block depth a = As fy / (0.85 f'c b) if the block
    # stayed inside the flange; it enters the web when that exceeds hf.
    b6 = next(e.beam for e in demo.entries if e.beam.id == "B6")
    a = b6.tension_area * b6.yield_strength / (0.85 * b6.concrete_strength * b6.flange_width)
    assert b6.tension_area == pytest.approx(8 * math.pi * 25**2 / 4)
    assert a > b6.flange_thickness


def test_demo_b9_fails_by_hand(demo: Schedule) -> None:
    # ACI 318-19, from memory: L-beam overhang <= 6 hf, <= sw/2, <= ln/12 (Table 6.3.2.1);
    # Mn = As fy (d - a/2), φ = 0.90 when tension-controlled (21.2.2); Mu = 1.2D + 1.6L (5.3.1)
    b9 = next(e.beam for e in demo.entries if e.beam.id == "B9")
    layout = b9.layout
    overhang = min(6 * b9.flange_thickness, layout.clear_left / 2, layout.clear_span / 12)
    b = b9.web_width + overhang
    a = b9.tension_area * b9.yield_strength / (0.85 * b9.concrete_strength * b)
    assert a < b9.flange_thickness  # a rectangle of width b
    phi_mn = 0.9 * b9.tension_area * b9.yield_strength * (b9.effective_depth - a / 2)
    mu = 1.2 * b9.actions.dead + 1.6 * b9.actions.live
    assert mu > 1.5 * phi_mn


# --- JSON Schema ---------------------------------------------------------------------------

def validate(instance: Any, schema: dict[str, Any], root: dict[str, Any], path: str = "$"
             ) -> list[str]:
    """The part of JSON Schema 2020-12 that pydantic writes: enough to check a document."""
    if "$ref" in schema:
        name = schema["$ref"].removeprefix("#/$defs/")
        return validate(instance, root["$defs"][name], root, path)
    errors: list[str] = []
    kinds = {"object": dict, "array": list, "string": str, "boolean": bool, "null": type(None)}
    if "type" in schema:
        kind = schema["type"]
        if kind in ("number", "integer"):
            ok = isinstance(instance, int | float) and not isinstance(instance, bool) and (
                kind == "number" or isinstance(instance, int))
        else:
            ok = isinstance(instance, kinds[kind])
        if not ok:
            return [f"{path}: not {kind}"]
    if "enum" in schema and instance not in schema["enum"]:
        errors.append(f"{path}: not one of {schema['enum']}")
    if "const" in schema and instance != schema["const"]:
        errors.append(f"{path}: not {schema['const']!r}")
    if isinstance(instance, str):
        if "pattern" in schema and not re.search(schema["pattern"], instance):
            errors.append(f"{path}: does not match {schema['pattern']}")
        if len(instance) < schema.get("minLength", 0):
            errors.append(f"{path}: too short")
    if isinstance(instance, list):
        if len(instance) < schema.get("minItems", 0):
            errors.append(f"{path}: too few items")
        for i, item in enumerate(instance):
            errors += validate(item, schema.get("items", {}), root, f"{path}[{i}]")
    if isinstance(instance, dict):
        properties = schema.get("properties", {})
        errors += [f"{path}: {key} required" for key in schema.get("required", ())
                   if key not in instance]
        for key, value in instance.items():
            if key in properties:
                errors += validate(value, properties[key], root, f"{path}.{key}")
            elif schema.get("additionalProperties") is False:
                errors.append(f"{path}: {key} not allowed")
    for sub in schema.get("allOf", ()):
        errors += validate(instance, sub, root, path)
    if "anyOf" in schema and all(validate(instance, s, root, path) for s in schema["anyOf"]):
        errors.append(f"{path}: matches none of anyOf")
    if "oneOf" in schema and sum(not validate(instance, s, root, path)
                                 for s in schema["oneOf"]) != 1:
        errors.append(f"{path}: does not match exactly one of oneOf")
    return errors


def check_refs(node: Any, root: dict[str, Any]) -> None:
    if isinstance(node, dict):
        if "$ref" in node:
            assert node["$ref"].removeprefix("#/$defs/") in root["$defs"], node["$ref"]
        for value in node.values():
            check_refs(value, root)
    elif isinstance(node, list):
        for value in node:
            check_refs(value, root)


def test_json_schema_is_a_json_schema() -> None:
    schema = json_schema()
    assert json.loads(json.dumps(schema)) == schema
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    assert schema["type"] == "object" and schema["required"] == ["beam"]
    assert {"project", "run", "beam"} == set(schema["properties"])
    assert {"beam", "layer", "floor", "moments", "project", "run"} == set(schema["$defs"])
    assert "null" not in json.dumps(schema)  # TOML has no null
    beam = schema["$defs"]["beam"]
    assert beam["additionalProperties"] is False
    assert {"id", "shape", "web_width", "overall_depth", "concrete_strength",
            "yield_strength"} <= set(beam["required"])
    assert "tension" not in beam["required"]  # a design file leaves the bars out
    assert all("description" in p for p in beam["properties"].values())
    check_refs(schema, schema)
    try:
        import jsonschema
    except ImportError:
        return
    jsonschema.Draft202012Validator.check_schema(schema)


def test_the_demo_validates_against_the_schema() -> None:
    schema = json_schema()
    data = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    assert validate(data, schema, schema) == []


@pytest.mark.parametrize(("changes", "fragment"), [
    ({"web_widht": "350 mm"}, "web_widht not allowed"),
    ({"shape": "Tee"}, "shape: not one of"),
    ({"web_width": DELETE}, "web_width required"),
    ({"tension.0.area": "1500 mm2"}, "exactly one of oneOf"),
    ({"web_width": "wide"}, "matches none of anyOf"),
])
def test_the_schema_rejects_what_the_loader_rejects(changes: dict[str, Any],
                                                    fragment: str) -> None:
    schema = json_schema()
    errors = validate({"beam": [patched(changes)]}, schema, schema)
    assert any(fragment in e for e in errors), errors
    assert parse_schedule(document(patched(changes))).problems


# --- fuzzing: only InputError ever escapes -------------------------------------------------

FIELD_NAMES = ["id", "shape", "bending", "units", "web_width", "overall_depth",
               "slab_thickness", "effective_flange_width", "concrete_strength",
               "strength_basis", "yield_strength", "steel_modulus", "steel_kind",
               "ductility_class", "tension", "compression", "floor", "moments",
               "statically_determinate", "title", "bars", "area", "depth",
               "centroid_from_face", "span", "continuity", "clear_left", "dead", "live",
               "factored", "project", "run", "beam", "editions", "require", "annexes"]
keys = st.one_of(st.sampled_from(FIELD_NAMES), st.text(min_size=1, max_size=8))
quantity_text = st.one_of(
    st.text(max_size=20),
    st.builds(lambda n, u: f"{n} {u}", st.floats(allow_nan=True, allow_infinity=True),
              st.sampled_from(["mm", "in", "MPa", "psi", "kN m", "kip-ft", "mm2", "#8", "x",
                               "kNm", "ft", "", "m3", "N", "1/mm", "e", "%", "in^2"])),
    st.builds(lambda c, s: f"{c} {s}", st.integers(-3, 10**9),
              st.sampled_from(["#8", "x 25 mm", "N20", "25M", "T16", "x 25", "#99",
                               "x 0.001 in"])),
)
scalars = st.one_of(st.booleans(), st.integers(-10**20, 10**20),
                    st.floats(allow_nan=True, allow_infinity=True), quantity_text,
                    st.sampled_from(["T", "L", "rectangular", "inverted T", "sagging",
                                     "hogging", "SI", "US", "cube", "interior"]),
                    st.dates(), st.datetimes())
values = st.recursive(scalars, lambda inner: st.one_of(
    st.lists(inner, max_size=3), st.dictionaries(keys, inner, max_size=5)), max_leaves=12)


def only_input_errors(text: str) -> Schedule | None:
    try:
        schedule = parse_schedule(text, "fuzz.toml")
    except InputError as exc:
        assert str(exc)
        return None
    for problem in schedule.problems:
        assert problem.message.startswith("fuzz.toml")
    return schedule


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.dictionaries(keys, values, max_size=5),
       st.lists(st.dictionaries(keys, values, max_size=8), max_size=3))
def test_fuzzed_documents_raise_nothing_but_input_error(top: dict[str, Any],
                                                        beams: list[dict[str, Any]]) -> None:
    data = top | ({"beam": beams} if beams else {})
    try:
        text = tomli_w.dumps(data)
    except (TypeError, ValueError):
        return  # something TOML cannot hold
    only_input_errors(text)


QUANTITY_FIELDS = ["web_width", "overall_depth", "slab_thickness", "effective_flange_width",
                   "concrete_strength", "yield_strength", "steel_modulus", "tension.0.bars",
                   "tension.0.depth", "compression.0.depth", "floor.span",
                   "floor.clear_left", "moments.dead", "moments.live"]


# fields whose checks a change of another field may break (layers inside the depth, ...)
DEPENDENT = {
    "overall_depth": ("slab_thickness", "tension[1].depth", "compression[1].depth",
                      "compression[1]"),
    "web_width": ("effective_flange_width", "tension[1].bars"),  # bars wider than the web
    "tension.0.depth": ("compression[1]",),
    "tension.0.bars": ("compression[1]",),
    "floor.span": ("floor.clear_span",),
}


@settings(max_examples=300, deadline=None)
@given(st.sampled_from(QUANTITY_FIELDS),
       st.one_of(quantity_text, st.floats(), st.integers(-10**6, 10**6)),
       st.sampled_from(["SI", "US"]))
def test_fuzzed_quantities_load_or_name_their_field(field: str, value: Any,
                                                    units: str) -> None:
    beam = patched({field: value, "units": units})
    schedule = only_input_errors(document(GOOD | {"id": "OK"}, beam))
    assert schedule is not None
    assert [e.beam.id for e in schedule.entries][0] == "OK"
    if len(schedule.entries) == 1:  # the fuzzed beam was refused: for the right reason
        head, _, rest = field.partition(".")
        shown = f"{head}[1].{rest[2:]}" if rest[:1].isdigit() else field
        named = {p.field for p in schedule.problems}
        assert named & {shown, head, f"{head}[1]", *DEPENDENT.get(field, ())}, named
    else:
        for e in schedule.entries:
            assert all(math.isfinite(v) for v in (e.beam.web_width, e.beam.depth))


BEAM_PATHS = [*FIELD_NAMES[:20], "floor.span", "floor.continuity", "floor.clear_left",
              "floor.clear_span", "floor.extra", "tension.0", "tension.0.bars",
              "tension.0.depth", "tension.0.area", "compression.0.centroid_from_face",
              "moments.dead", "moments.factored", "moments"]


def reach(beam: dict[str, Any], path: str, value: Any) -> None:
    """Set a dotted path where it can still be reached (an earlier change may block it)."""
    *parents, last = path.split(".")
    target: Any = beam
    for part in parents:
        if isinstance(target, list) and part.isdigit() and int(part) < len(target):
            target = target[int(part)]
        elif isinstance(target, dict) and part in target:
            target = target[part]
        else:
            return
    if isinstance(target, list) and last.isdigit() and int(last) < len(target):
        target[int(last)] = value
    elif isinstance(target, dict):
        target[last] = value


@settings(max_examples=200, deadline=None)
@given(st.lists(st.tuples(st.sampled_from(BEAM_PATHS), values), max_size=4))
def test_fuzzed_beams_load_or_are_reported(changes: list[tuple[str, Any]]) -> None:
    beam = copy.deepcopy(GOOD) | {"id": "FUZZ"}
    for path, value in changes:
        reach(beam, path, value)
    try:
        text = document(GOOD | {"id": "OK"}, beam)
    except (TypeError, ValueError):
        return  # something TOML cannot hold
    schedule = only_input_errors(text)
    if schedule is None:  # only whole-file problems may end the load: none can arise here
        pytest.fail("a beam's problem stopped the whole file")
    assert schedule.entries[0].beam.id == "OK"
    loaded = len(schedule.entries) == 2
    assert loaded != bool(schedule.problems)
    assert all(p.index == 2 for p in schedule.problems)


def test_a_shortened_echo_keeps_the_text_as_written() -> None:
    long = InputProblem("demo.toml", None, "beam[3].id", "B_12_" + "x" * 200, "text")
    assert long.value.startswith("B_12_x") and long.value.endswith("… (205 characters)")
