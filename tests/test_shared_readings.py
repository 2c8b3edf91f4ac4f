"""Readings made once and shared (cached unit readings, field names, the plain-number fast
path) still belong to the beam they came from, and take that beam's unit system.

References: 1 in = 25.4 mm exactly (NIST SP 811, B.8); the plausible web width of 50 mm to
4000 mm is the project's own range (clausewise.beamfile.models.PLAUSIBLE, common practice).
"""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

from clausewise.beamfile import loading, parse_schedule

BEAM = """
[[beam]]
id = "{id}"
shape = "rectangular"
{units}web_width = {width}
overall_depth = "600 mm"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{{ bars = "3 x 20 mm", depth = "540 mm" }}]
"""


def beam(id: str, width: str, units: str = "") -> str:
    return BEAM.format(id=id, width=width, units=f'units = "{units}"\n' if units else "")


def test_two_beams_with_the_same_bad_value_each_get_their_own_problem():
    text = '[project]\nunits = "SI"\n' + beam("B1", '"30 m"') + beam("B2", '"30 m"') \
        + beam("B3", '"30 m"', "US")
    problems = parse_schedule(text, "same.toml").problems
    assert [(p.beam, p.index, p.field, p.value) for p in problems] == [
        ("B1", 1, "web_width", "30 m"), ("B2", 2, "web_width", "30 m"),
        ("B3", 3, "web_width", "30 m")]
    si = "web width from 50 mm to 4000 mm, the plausible range for a building beam; " \
        "is the unit right?"
    assert problems[0].expected == problems[1].expected == si
    # the US beam states the range in inches: 50 / 25.4 = 1.969 in, 4000 / 25.4 = 157.5 in
    assert problems[2].expected.startswith("web width from 1.969 in to 157.5 in (50 to 4000 mm)")


@pytest.mark.parametrize("width", ["12", "12.0", '"12"'])
def test_a_plain_number_takes_the_unit_system_of_its_own_beam(width):
    text = '[project]\nunits = "SI"\n' + beam("US1", width, "US") + beam("SI1", width) \
        + beam("US2", width, "US")
    schedule = parse_schedule(text, "plain.toml")
    # 12 in = 12 x 25.4 = 304.8 mm, shown as the user wrote it, in inches
    assert [e.beam.id for e in schedule.entries] == ["US1", "US2"]
    assert [e.beam.web_width for e in schedule.entries] == [pytest.approx(304.8, abs=1e-12)] * 2
    assert [e.shown["web width bw"] for e in schedule.entries] == ["12 in", "12 in"]
    # 12 mm is below the plausible 50 mm: a problem of the SI beam alone
    [problem] = schedule.problems
    assert (problem.beam, problem.field, problem.value) == ("SI1", "web_width", "12 mm")


def test_a_file_that_opens_with_a_beam_table_is_cut_at_every_beam(monkeypatch):
    monkeypatch.setattr(loading, "CHUNK", 2)
    text = "".join(beam(f"B{i}", '"300 mm"') for i in range(5)).lstrip()
    assert text.startswith("[[beam]]")
    head, chunks = loading._beam_chunks(text, "open.toml")  # the first cut at the very start
    assert head == {} and [len(chunk) for chunk in chunks] == [2, 2, 1]
    chunked = parse_schedule(text, "open.toml")
    whole = loading._schedule(tomllib.loads(text), "open.toml", Path("."))  # stdlib, whole
    assert [e.beam.id for e in chunked.entries] == [f"B{i}" for i in range(5)]
    assert chunked == whole
