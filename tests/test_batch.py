"""The batch path gives the audited path's numbers for every beam and every edition."""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import clausewise
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Continuity,
    FloorLayout,
    Layer,
    Shape,
    assess,
)
from clausewise.provisions.batch import assess_many, kind_of, stack_beams
from clausewise.stream import row_summaries
from clausewise.synthetic import synthetic_beams

EDITIONS = [e.id for e in clausewise.editions()]


def _close(a: float | None, b: float | None) -> bool:
    if a is None or b is None or (isinstance(a, float) and math.isnan(a)):
        return (a is None or math.isnan(a)) and (b is None or math.isnan(b))
    return math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12)


def _same(beam: Beam, edition: str, row: dict, summary: str | None = None) -> None:
    """The row of the batch table is the audited assessment's; ``summary``: the batch
    row's one line, as the command line writes it."""
    audited = assess(beam, edition)
    if summary is not None:
        assert summary == audited.summary()
    assert row["status"] == audited.status, (beam.id, edition, row["message"])
    if audited.design_resistance is not None:
        assert _close(row["design_resistance"], audited.design_resistance.value)
        assert _close(row["nominal_moment"], audited.nominal_moment)
    if audited.demand is not None:
        assert _close(row["demand"], audited.demand.value)
        assert row["governing_candidate"][audited.demand.name] == \
            audited.demand.governing_candidate.label
    governing = audited.governing
    if governing is not None:
        assert row["governing_check"] == governing.name
        assert _close(row["governing_utilisation"], governing.utilisation)
    for check in audited.all_checks:
        assert _close(row["utilisation"].get(check.name), check.utilisation), check.name
    if audited.effective_width is not None:
        assert _close(row["effective_width"], audited.effective_width.value)
        assert row["governing_candidate"][audited.effective_width.name] == \
            audited.effective_width.governing_candidate.label


@pytest.mark.parametrize("edition", EDITIONS)
def test_synthetic_schedule_matches_audited_path(edition: str) -> None:
    beams = synthetic_beams(60, seed=11)
    table = assess_many(beams, [edition])[edition]
    assert table.size == len(beams)
    summaries = row_summaries(table)
    for i, beam in enumerate(beams):
        _same(beam, edition, table.row(i), summaries[i])


@st.composite
def beams(draw: st.DrawFn) -> Beam:
    shape = draw(st.sampled_from(list(Shape)))
    bw = draw(st.floats(200, 450))
    h = draw(st.floats(350, 1000))
    hf = draw(st.floats(80, 0.4 * h)) if shape is not Shape.RECTANGLE else None
    d = h - draw(st.floats(40, 90))
    area = draw(st.floats(0.002, 0.05)) * bw * d
    layout = None
    if shape is not Shape.RECTANGLE:
        layout = FloorLayout(span=draw(st.floats(3000, 12000)),
                             continuity=draw(st.sampled_from(list(Continuity)[:3])),
                             clear_left=draw(st.floats(300, 4000)),
                             clear_right=draw(st.floats(300, 4000)))
    compression = (Layer(draw(st.floats(200, 2000)), 50.0),) if draw(st.booleans()) else ()
    dead = draw(st.floats(1e6, 1e9))
    return Beam(
        id="H", shape=shape, flange_at_soffit=shape is Shape.TEE and draw(st.booleans()),
        bending=draw(st.sampled_from(list(Bending))) if shape is not Shape.RECTANGLE
        else Bending.SAGGING,
        web_width=bw, depth=h, concrete_strength=draw(st.floats(10, 100)),
        yield_strength=draw(st.sampled_from([250.0, 420.0, 500.0, 550.0, 600.0])),
        tension=(Layer(area, d),), compression=compression, flange_thickness=hf,
        layout=layout, actions=Actions(dead=dead, live=draw(st.floats(0, 1e9))))


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(beams(), min_size=1, max_size=6))
def test_random_beams_match_audited_path_under_every_edition(items: list[Beam]) -> None:
    items = [Beam(**{**b.__dict__, "id": f"H{i}"}) for i, b in enumerate(items)]
    tables = assess_many(items, EDITIONS)
    for edition in EDITIONS:
        summaries = row_summaries(tables[edition])
        for i, beam in enumerate(items):
            _same(beam, edition, tables[edition].row(i), summaries[i])


def test_beams_of_one_kind_stack_into_arrays() -> None:
    group = [b for b in synthetic_beams(40, seed=2) if kind_of(b) == kind_of(
        synthetic_beams(40, seed=2)[0])]
    batch = stack_beams(group)
    assert batch.is_batch and batch.size == len(group)
    np.testing.assert_array_equal(batch.web_width, [b.web_width for b in group])
    np.testing.assert_array_equal(batch.tension[0].area, [b.tension[0].area for b in group])


def test_a_bad_beam_is_reported_and_the_others_go_on() -> None:
    good = synthetic_beams(5, seed=4)
    bad = Beam(**{**good[0].__dict__, "id": "BAD", "tension": (Layer(1000.0, 5000.0),)})
    edition = EDITIONS[0]
    table = assess_many([*good, bad], [edition])[edition]
    assert table.status[-1] == "error"
    assert "depth" in table.message[-1]
    assert all(s != "error" for s in table.status[:-1])


@pytest.mark.parametrize("edition", EDITIONS)
def test_column_input_gives_the_same_table_as_beam_objects(edition: str) -> None:
    beams = [b for b in synthetic_beams(80, seed=9) if kind_of(b) == kind_of(
        synthetic_beams(80, seed=9)[0])]
    from clausewise.provisions.batch import assess_columns

    by_columns = assess_columns(stack_beams(beams), [edition], ids=[b.id for b in beams])
    by_objects = assess_many(beams, [edition])
    a, b = by_columns[edition], by_objects[edition]
    np.testing.assert_array_equal(a.status, b.status)
    np.testing.assert_allclose(a.design_resistance, b.design_resistance, rtol=1e-12)
    np.testing.assert_array_equal(a.governing_check, b.governing_check)


def test_small_groups_solved_together_or_each_alone_give_one_table(monkeypatch) -> None:
    """The sections of an edition's small groups are solved in one call; where that call
    fails, each group is solved on its own: the same table either way, and a degenerate
    beam among them still fails alone."""
    import clausewise.provisions.batch as batch
    from clausewise.core import SectionError

    beams = synthetic_beams(400, seed=3)
    beams[17] = replace(beams[17], tension=(replace(beams[17].tension[0], area=0.0),
                                            *beams[17].tension[1:]))
    editions = ("aci318-19", "en1992-1-1:2004")
    together = assess_many(beams, editions)

    def refused(requests):
        raise SectionError("not side by side")

    monkeypatch.setattr(batch, "solve_together", refused)
    alone = assess_many(beams, editions)
    for edition in editions:
        for i in range(len(beams)):
            assert together[edition].row(i) == alone[edition].row(i)
        assert together[edition].row(17)["status"] != "pass"
        assert sum(s == "pass" for s in together[edition].status) > 200


def test_small_chunks_solved_in_runs_of_a_chunk_give_the_same_rows() -> None:
    """With chunks of 50 beams, the small groups are solved together in runs of at most
    50 beams: every row as one chunk per group gives it, in the order of the groups."""
    from clausewise.provisions.batch import iter_assess_many

    beams = synthetic_beams(300, seed=9)
    whole = assess_many(beams, ["is456:2000"])["is456:2000"]
    parts = list(iter_assess_many(beams, ["is456:2000"], chunk=50))
    assert all(table.size <= 50 for _, table in parts)
    for index, table in parts:
        for i, row in zip(index.tolist(), range(table.size), strict=True):
            assert table.row(row) == whole.row(i)
