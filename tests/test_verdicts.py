"""One path for verdicts: the status type, the governing check and status of one beam or a
batch, and a beam's kind and numbers found from its dataclass fields.

The numbers are hand arithmetic: a utilisation is value/limit for an upper bound and
limit/value for a lower bound (common practice).
"""

from __future__ import annotations

from dataclasses import fields, is_dataclass, replace

import numpy as np
import pytest

from clausewise.provisions import Actions, Check, Clause, FloorLayout, Layer, Sense, Status
from clausewise.provisions.batch import kind_of, stack_beams
from clausewise.provisions.beam import number_fields
from clausewise.provisions.verdicts import governing, status

HERE = Clause("T.1", "a check for the test", "test")


def _numbers(beam):
    return [value for _, value in number_fields(beam)]


def checks(values, limits):
    return [Check(f"check {i}", v, lim, Sense.AT_MOST, HERE)
            for i, (v, lim) in enumerate(zip(values, limits, strict=True))]


def test_status_values_are_the_texts_results_carry():
    assert [s.value for s in Status] == ["pass", "fail", "outside scope", "no equilibrium",
                                         "capacity only", "error"]
    assert Status.PASS == "pass" and str(Status.CAPACITY_ONLY) == "capacity only"
    assert {s for s in Status if s.failed} == {Status.FAIL, Status.OUT_OF_SCOPE,
                                               Status.NO_EQUILIBRIUM}


def test_governing_check_of_one_beam_and_of_a_batch_agree():
    # utilisations 50/100 = 0.5, 90/100 = 0.9, 30/40 = 0.75 -> the second governs
    single = checks([50.0, 90.0, 30.0], [100.0, 100.0, 40.0])
    assert governing(single) == (1, pytest.approx(0.9))
    # a batch of three beams: the governing check differs by beam
    batch = checks([np.array([50.0, 99.0, 10.0]), np.array([90.0, 20.0, 10.0]),
                    np.array([30.0, 30.0, 39.0])], [100.0, 100.0, 40.0])
    worst, utilisation = governing(batch, 3)
    assert worst.tolist() == [1, 0, 2]
    assert utilisation == pytest.approx([0.9, 0.99, 0.975])
    assert governing([]) == (None, None)


def test_status_order_of_precedence():
    ok, bad = checks([1.0], [2.0]), checks([3.0], [2.0])
    assert status(in_scope=True, equilibrium=True, checks=ok, has_demand=True) is Status.PASS
    assert status(in_scope=True, equilibrium=True, checks=ok,
                  has_demand=False) is Status.CAPACITY_ONLY
    assert status(in_scope=True, equilibrium=True, checks=bad, has_demand=False) is Status.FAIL
    assert status(in_scope=True, equilibrium=False, checks=bad,
                  has_demand=True) is Status.NO_EQUILIBRIUM
    assert status(in_scope=False, equilibrium=False, checks=bad,
                  has_demand=True) is Status.OUT_OF_SCOPE


def test_status_over_a_batch():
    mixed = checks([np.array([1.0, 3.0, 1.0, 1.0])], [2.0])
    verdicts = status(in_scope=np.array([True, True, True, False]),
                      equilibrium=np.array([True, True, False, True]), checks=mixed,
                      has_demand=False)
    assert verdicts.tolist() == [Status.CAPACITY_ONLY, Status.FAIL, Status.NO_EQUILIBRIUM,
                                 Status.OUT_OF_SCOPE]


# --- a beam's kind and numbers, from its fields -----------------------------------------------

def _numeric_paths(obj, prefix=""):
    """(path, value) of every numeric field, walked by hand over the dataclass fields."""
    for f in fields(obj):
        value = getattr(obj, f.name)
        if is_dataclass(value):
            yield from _numeric_paths(value, f"{prefix}{f.name}.")
        elif isinstance(value, tuple):
            for i, part in enumerate(value):
                yield from _numeric_paths(part, f"{prefix}{f.name}[{i}].")
        elif isinstance(value, float):
            yield f"{prefix}{f.name}", value


def test_every_number_of_a_beam_is_found(floor_tee):
    beam = floor_tee(compression=(Layer(400.0, 50.0),), flange_width=1800.0,
                     steel_modulus=200_000.0, actions=Actions(dead=1e8, live=5e7),
                     layout=FloorLayout(8000.0, clear_span=7600.0, clear_left=2700.0,
                                        clear_right=2700.0, zero_moment_length=5600.0,
                                        adjacent_span=7000.0))
    walked = [value for _, value in _numeric_paths(beam)]
    # 7 of the beam, 2 x 2 of its layers, 6 of its floor, 2 of its actions
    assert len(walked) == 19 and sorted(_numbers(beam)) == sorted(walked)


def test_kind_ignores_numbers_and_names_but_not_what_is_given(floor_tee):
    beam = floor_tee(actions=Actions(dead=1e8))
    assert kind_of(replace(beam, id="other", title="x", web_width=350.0, depth=700.0)) == \
        kind_of(beam)
    assert kind_of(replace(beam, actions=Actions(dead=1e8, live=1e7))) != kind_of(beam)
    assert kind_of(replace(beam, flange_width=1500.0)) != kind_of(beam)
    assert kind_of(replace(beam, layout=None)) != kind_of(beam)
    assert kind_of(replace(beam, compression=(Layer(400.0, 50.0),))) != kind_of(beam)
    assert kind_of(replace(beam, isolated=True)) != kind_of(beam)


def test_a_stacked_batch_reports_its_size(floor_tee):
    beams = [floor_tee(web_width=w, actions=Actions(dead=d)) for w, d in
             [(300.0, 1e8), (320.0, 2e8), (340.0, 3e8)]]
    batch = stack_beams(beams)
    assert batch.is_batch and batch.size == 3
    assert batch.actions.dead.tolist() == [1e8, 2e8, 3e8]
