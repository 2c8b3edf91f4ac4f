"""The fast paths give the same answers as the slow ones: editions kept by the registry
are rebuilt when a plugin arrives, and the single-beam path agrees with the batch path.

The numbers themselves are checked against the standards in the edition tests; here a
result is compared with the same result reached another way.
"""

from __future__ import annotations

import math
import sys
from collections import Counter

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Check,
    Clause,
    EditionInfo,
    FloorLayout,
    Layer,
    Parameter,
    Registry,
    Sense,
    Shape,
    assess,
    default_registry,
    hookimpl,
)
from clausewise.provisions.batch import (
    RowNames,
    assess_columns,
    assess_many,
    kind_of,
    stack_beams,
)
from clausewise.provisions.engine import NO_EQUILIBRIUM, OUT_OF_SCOPE
from clausewise.provisions.registry import Edition
from clausewise.synthetic import synthetic_beams

ACI = frozenset({"aci318-19", "aci318-14", "aci318-11"})


def aci_registry() -> Registry:
    registry = Registry(only=ACI)
    registry.load_entry_points()
    return registry


def floor_beam() -> Beam:
    return Beam(id="G1", shape=Shape.TEE, bending=Bending.SAGGING, web_width=300.0,
                depth=600.0, concrete_strength=28.0, yield_strength=420.0,
                tension=(Layer(2000.0, 540.0),), flange_thickness=120.0,
                layout=FloorLayout(span=8000.0, clear_span=7700.0, clear_left=2500.0,
                                   clear_right=2500.0),
                actions=Actions(dead=150e6, live=100e6))


def numbers(result) -> list[float]:
    return [result.design_resistance.value, result.effective_width.value,
            result.demand.value, *(c.value for c in result.all_checks),
            *(c.limit for c in result.all_checks)]


class FirmStrainLimit:
    """A firm asks for more ductility than the code (εt at least 0.008)."""

    info = EditionInfo("xx-firm-strain", "firm rule on net tensile strain", 2024,
                       extends="aci318-19")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def edition_parameters(self):
        return [Parameter("min_net_tensile_strain", 0.008,
                          self.info.clause("R-7", "firm's least net tensile strain"))]


class LateBase:
    """A base that arrives after the edition that extends it."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-late-base", "late base", 2024, extends="aci318-19")


class OverLateBase:
    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-over-late", "over the late base", 2024, extends="xx-late-base")


def test_an_edition_is_built_once_per_id():
    registry = aci_registry()
    assert registry.edition("aci318-19") is registry.edition("aci318-19")
    assert registry.edition("aci318-14") is not registry.edition("aci318-19")


def test_registering_a_plugin_rebuilds_the_editions():
    registry = aci_registry()
    before = registry.edition("aci318-19")
    registry.register(FirmStrainLimit())
    after = registry.edition("aci318-19")
    assert after is not before and after == before  # same layers, a fresh stack
    firm = registry.edition("xx-firm-strain")
    assert [r.info.id for r in firm.layers] == ["aci318-19", "xx-firm-strain"]
    (strain,) = [c for c in assess(floor_beam(), "xx-firm-strain", registry=registry).checks
                 if c.name == "net tensile strain"]
    assert strain.limit == 0.008  # the firm's value, not the code's 0.004 (ACI 318-19 9.3.3.1)


def test_a_missing_base_is_found_once_registered():
    registry = aci_registry()
    registry.register(OverLateBase())
    with pytest.raises(LookupError, match="xx-late-base"):
        registry.edition("xx-over-late")
    registry.register(LateBase())
    stack = [r.info.id for r in registry.edition("xx-over-late").layers]
    assert stack == ["aci318-19", "xx-late-base", "xx-over-late"]


@pytest.mark.parametrize("edition_id", sorted(ACI))
def test_a_kept_edition_gives_the_results_of_a_fresh_one(edition_id):
    registry = aci_registry()
    kept = registry.edition(edition_id)
    first = assess(floor_beam(), edition_id, registry=registry)
    again = assess(floor_beam(), edition_id, registry=registry)
    fresh = assess(floor_beam(), Edition(kept.layers))
    assert numbers(first) == numbers(again) == numbers(fresh)
    assert first.topics == again.topics == fresh.topics
    assert first.parameters == fresh.parameters


# --- the single-beam path and the batch path agree -----------------------------------------

BUILT_IN = sorted(r.info.id for r in default_registry().records
                  if r.ok and r.info and r.distribution == "clausewise")


def _close(one: float, many: float, rel: float = 1e-12) -> bool:
    if math.isnan(one) or math.isnan(many):
        return math.isnan(one) and math.isnan(many)
    return one == many or abs(one - many) <= rel * max(abs(one), abs(many))


def _nan(value) -> float:
    return math.nan if value is None else float(value)


def test_every_built_in_edition_is_compared():
    # the seven editions shipped with the package, common practice of this project
    assert len(BUILT_IN) == 7 and "aci318-19" in BUILT_IN and "en1992-1-1:2004" in BUILT_IN


@pytest.mark.parametrize("edition_id", BUILT_IN)
@settings(max_examples=4, deadline=None)
@given(seed=st.integers(0, 2**31 - 1))
def test_single_beam_equals_batch_to_1e_12(edition_id, seed):
    """Each beam assessed alone (floats) gives its row of the batch (arrays) to 1e-12:
    the same rules, the same solver, only the shape of the numbers differs."""
    beams = synthetic_beams(24, seed)
    (table,) = assess_many(beams, [edition_id]).values()
    for i, beam in enumerate(beams):
        one = assess(beam, edition_id)
        assert table.status[i] == one.status, beam.id
        if one.status in (OUT_OF_SCOPE, NO_EQUILIBRIUM):
            continue
        pairs = {
            "design resistance": (one.design_resistance.value, table.design_resistance[i]),
            "member factor": (one.resistance.factor.value, table.resistance_factor[i]),
            "demand": (_nan(one.demand and one.demand.value), table.demand[i]),
            "neutral axis": (one.response.c, table.neutral_axis[i]),
            "net tensile strain": (one.response.net_tensile_strain,
                                   table.net_tensile_strain[i]),
            "effective width": (_nan(one.effective_width and one.effective_width.value),
                                table.effective_width[i]),
        }
        pairs |= {f"utilisation of {c.name}": (c.utilisation, table.utilisation[c.name][i])
                  for c in one.all_checks}
        for what, (single, batch) in pairs.items():
            assert _close(float(single), float(batch)), (beam.id, what, single, batch)
        assert table.governing_check[i] == one.governing.name, beam.id


# --- chunks, stacking and row names change nothing ----------------------------------------

def _columns_of(table) -> dict[str, list]:
    return {"status": [str(s) for s in table.status], "mrd": table.design_resistance.tolist(),
            "c": table.neutral_axis.tolist(), "check": table.governing_check.tolist(),
            "u": table.governing_utilisation.tolist(), "names": list(table.beam_ids)}


@pytest.mark.parametrize("edition_id", ["aci318-19", "en1992-1-1:2004"])
def test_assess_columns_in_chunks_equals_one_call(edition_id):
    """A design search run 7 rows at a time gives exactly the rows of one call."""
    schedule = synthetic_beams(400, seed=11)
    common = Counter(map(kind_of, schedule)).most_common(1)[0][0]
    beams = [b for b in schedule if kind_of(b) == common]
    batch = stack_beams(beams)
    whole = assess_columns(batch, [edition_id], chunk=10_000)[edition_id]
    pieces = assess_columns(batch, [edition_id], chunk=7)[edition_id]
    assert len(beams) > 14
    assert _columns_of(pieces) == _columns_of(whole)


def test_stacked_beam_holds_each_beams_numbers_in_its_row():
    """Stacking reads every number of every beam into its own row (checked against the
    beams themselves, field by field)."""
    beams = synthetic_beams(300, seed=5)
    group = [b for b in beams if kind_of(b) == kind_of(beams[1])]
    batch = stack_beams(group)
    for i, beam in enumerate(group):
        assert batch.web_width[i] == beam.web_width
        assert batch.concrete_strength[i] == beam.concrete_strength
        for stacked, layer in zip(batch.tension, beam.tension, strict=True):
            assert (stacked.area[i], stacked.depth[i]) == (layer.area, layer.depth)
        assert batch.layout.span[i] == beam.layout.span
        assert batch.actions.dead[i] == beam.actions.dead
    assert batch.shape is group[0].shape and batch.layout.continuity is \
        group[0].layout.continuity


def test_row_names_are_made_when_read():
    names = RowNames("cand", 5)
    assert list(names) == [f"cand[{i}]" for i in range(5)]
    assert names[-1] == "cand[4]" and list(names[2:4]) == ["cand[2]", "cand[3]"]
    assert names[1:][0] == "cand[1]" and len(names[3:]) == 2
    with pytest.raises(IndexError):
        names[5]


@pytest.mark.parametrize("sense", list(Sense))
def test_utilisation_of_an_array_equals_that_of_each_beam(sense):
    """Every pair of awkward values (zero, negative, NaN, infinite limits and values):
    the array rule gives, element by element, what the one-beam rule gives."""
    awkward = [-1.0, 0.0, 0.5, 1.0, 2.0, math.nan, math.inf, -math.inf]
    pairs = [(v, lim) for v in awkward for lim in awkward]
    check = Check("x", np.array([p[0] for p in pairs]), np.array([p[1] for p in pairs]), sense,
                  Clause("test", "1"))
    for (value, limit), batch in zip(pairs, check.utilisation, strict=True):
        one = Check("x", value, limit, sense, Clause("test", "1")).utilisation
        assert one == batch or (math.isnan(one) and math.isnan(batch)), (value, limit)


def test_the_synthetic_schedule_runs_in_groups_without_falling_back(monkeypatch):
    """A group that raises is retried beam by beam (right, but slow): every group of the
    mixed schedule must go through whole under every built-in edition."""
    import clausewise.provisions.batch as batch

    def fallback(*args, **kwargs):
        raise AssertionError("a group fell back to single beams")

    monkeypatch.setattr(batch, "_single_table", fallback)
    tables = assess_many(synthetic_beams(600, seed=13), BUILT_IN)
    assert len(tables) == len(BUILT_IN)
    assert all(t.size == 600 for t in tables.values())


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="glibc's allocator")
def test_the_allocator_keeps_freed_memory_unless_the_user_set_it(monkeypatch):
    """On Linux with glibc the batch path asks the allocator to keep freed blocks for
    reuse (mallopt, glibc's documented interface); a threshold the user set in the
    environment is left as it is."""
    import ctypes.util

    from clausewise.provisions.batch import keep_freed_memory

    if ctypes.util.find_library("c") is None or "musl" in (ctypes.util.find_library("c") or ""):
        pytest.skip("not glibc")
    assert keep_freed_memory.__wrapped__() is True
    monkeypatch.setenv("MALLOC_TRIM_THRESHOLD_", "131072")
    assert keep_freed_memory.__wrapped__() is False
