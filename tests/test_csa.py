"""CSA A23.3-19 edition against the standard's formulas and hand calculations.

Every value of the standard used below is recalled from memory of CSA A23.3-19.
"""

import math
from dataclasses import replace

import numpy as np
import pytest

from clausewise.plugins.csa_a23_3_19 import alpha1, beta1
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Context,
    Continuity,
    FloorLayout,
    Layer,
    Shape,
    assess,
    default_registry,
    evaluate,
)

ID = "csa-a23.3:19"
PHI_C, PHI_S = 0.65, 0.85  # CSA A23.3-19 8.4.2 and 8.4.3, from memory
EPS_CU, ES = 0.0035, 200_000.0  # CSA A23.3-19 10.1.3 and 8.5.4.1, from memory
FC, FY = 30.0, 400.0
BW, H, HF, D = 300.0, 600.0, 100.0, 540.0


def tee(area=2000.0, clear=1800.0, **changes):
    """A simply supported T beam of an invented office floor in Lakeview."""
    beam = Beam("B-1", Shape.TEE, Bending.SAGGING, BW, H, FC, FY, (Layer(area, D),),
                flange_thickness=HF,
                layout=FloorLayout(8000.0, Continuity.SIMPLE, clear_left=clear,
                                   clear_right=clear),
                actions=Actions(dead=200e6, live=100e6))
    return replace(beam, **changes)


def check(assessment, name):
    (found,) = [c for c in assessment.checks if c.name == name]
    return found


@pytest.mark.parametrize(("fc", "a1", "b1"), [
    (30.0, 0.805, 0.895),  # CSA A23.3-19 10.1.7, from memory
    (60.0, 0.76, 0.82),  # CSA A23.3-19 10.1.7, from memory
    (80.0, 0.73, 0.77),  # CSA A23.3-19 10.1.7, from memory
])
def test_block_factors(fc, a1, b1):
    assert alpha1(fc).value == pytest.approx(a1, abs=1e-12)
    assert beta1(fc).value == pytest.approx(b1, abs=1e-12)


def test_block_factors_never_below_lower_limit():
    # both factors at least 0.67 (CSA A23.3-19 10.1.7, from memory)
    assert alpha1(150.0).value == pytest.approx(0.67)
    assert beta1(150.0).value == pytest.approx(0.67)


def test_block_in_flange_against_hand_calculation():
    area = 2500.0
    r = assess(tee(area), ID)
    # effective width: overhang min(span/5, 12hf, clear/2) = min(1600, 1200, 900) per side
    # (CSA A23.3-19 10.3.3, from memory)
    bf = BW + 2 * 900.0
    assert r.effective_width.value == pytest.approx(bf)
    # α1 φc f'c bf a = φs fy As with the steel yielding (hand calculation)
    a1, b1 = 0.85 - 0.0015 * FC, 0.97 - 0.0025 * FC
    a = PHI_S * FY * area / (a1 * PHI_C * FC * bf)
    c = a / b1
    assert a < HF
    assert EPS_CU * (D - c) / c > FY / ES  # the steel yields
    assert r.response.block_in_flange
    assert r.response.c == pytest.approx(c, rel=1e-9)
    mr = PHI_S * FY * area * (D - a / 2)
    assert r.design_resistance.value == pytest.approx(mr, rel=1e-9)
    assert r.resistance.factor.value == 1.0
    assert r.resistance.regime.name == "material resistance factors"
    # Mf = max(1.4D, 1.25D + 1.5L) (NBC 4.1.3.2, from memory)
    strength = check(r, "flexural strength")
    assert strength.value == pytest.approx(max(1.4 * 200e6, 1.25 * 200e6 + 1.5 * 100e6))
    assert r.demand.governing_candidate.label == "1.25D + 1.5L"
    assert strength.utilisation == pytest.approx(400e6 / mr, rel=1e-9)
    assert r.status == "pass"


def test_block_in_web_against_hand_calculation():
    area = 5000.0
    r = assess(tee(area, clear=600.0), ID)
    bf = BW + 600.0  # half the clear distance, 300 mm, on each side governs
    assert r.effective_width.value == pytest.approx(bf)
    # overhangs: Cf = α1 φc f'c (bf - bw) hf at hf/2; web: α1 φc f'c bw a = φs fy As - Cf
    # (common practice, no source, with CSA A23.3-19 factors)
    a1, b1 = 0.85 - 0.0015 * FC, 0.97 - 0.0025 * FC
    stress = a1 * PHI_C * FC
    cf = stress * (bf - BW) * HF
    tension = PHI_S * FY * area
    a = (tension - cf) / (stress * BW)
    c = a / b1
    assert a > HF
    assert EPS_CU * (D - c) / c > FY / ES
    assert not r.response.block_in_flange
    assert r.response.c == pytest.approx(c, rel=1e-9)
    assert r.response.overhang_force == pytest.approx(cf, rel=1e-9)
    mr = cf * (D - HF / 2) + (tension - cf) * (D - a / 2)
    assert r.design_resistance.value == pytest.approx(mr, rel=1e-9)
    ratio = check(r, "neutral-axis depth ratio")
    assert ratio.value == pytest.approx(c / D, rel=1e-9)


def test_neutral_axis_limit_for_400_mpa():
    r = assess(tee(), ID)
    limit = check(r, "neutral-axis depth ratio").limit
    # c/d ≤ 700/(700 + fy) (CSA A23.3-19 10.5.2, from memory) = 0.636 for fy = 400 MPa
    assert limit == pytest.approx(0.636, abs=5e-4)
    # it is the balanced ratio εcu/(εcu + fy/Es) (common practice, no source)
    assert limit == pytest.approx(EPS_CU / (EPS_CU + FY / ES), rel=1e-12)


def test_over_reinforced_beam_fails_neutral_axis_limit():
    r = assess(tee(6000.0, flange_width=400.0, layout=None, actions=Actions()), ID)
    ratio = check(r, "neutral-axis depth ratio")
    assert ratio.value == pytest.approx(r.response.c / D, rel=1e-12)
    assert ratio.value > 700 / (700 + FY)
    assert not ratio.passed
    assert r.status == "fail"
    assert r.governing is ratio


def test_minimum_steel_uses_overall_depth():
    r = assess(tee(), ID)
    minimum = check(r, "minimum tension reinforcement")
    # 0.2√f'c/fy·bt·h with bt = bw, flange in compression (CSA A23.3-19 10.5.1.2, from memory)
    expected = 0.2 * math.sqrt(FC) / FY * BW * H
    assert minimum.limit == pytest.approx(expected, rel=1e-12)
    assert minimum.limit != pytest.approx(0.2 * math.sqrt(FC) / FY * BW * D, rel=1e-3)
    assert minimum.passed
    small = check(assess(tee(400.0), ID), "minimum tension reinforcement")
    assert not small.passed  # 400 mm² < 492.95 mm²


@pytest.mark.parametrize(("shape", "cap"), [(Shape.TEE, 2.5), (Shape.ELL, 1.5)])
def test_minimum_steel_with_flange_in_tension_uses_flange_width_up_to_a_multiple_of_bw(
        shape, cap):
    layout = FloorLayout(8000.0, Continuity.SIMPLE, clear_left=1800.0,
                         clear_right=1800.0 if shape is Shape.TEE else None)
    r = assess(tee(bending=Bending.HOGGING, shape=shape, layout=layout), ID)
    bf = r.effective_width.value
    # bt = width of the tension zone, the effective flange, but for flanges in tension no
    # more than 2.5bw with flanges on both sides of the web, 1.5bw with a flange on one
    # side (CSA A23.3-19 10.5.1.2, from memory)
    assert bf > cap * BW
    expected = 0.2 * math.sqrt(FC) / FY * cap * BW * H
    assert check(r, "minimum tension reinforcement").limit == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(("shape", "layout", "hf", "label", "width"), [
    # overhang limits: T 10.3.3, L 10.3.4 (CSA A23.3-19, from memory)
    (Shape.TEE, FloorLayout(4000.0, Continuity.SIMPLE, clear_left=3000.0, clear_right=3000.0),
     100.0, "bw + span/5 (simply supported) on each side", 300 + 2 * 800),
    (Shape.TEE, FloorLayout(8000.0, Continuity.INTERIOR, clear_left=3000.0,
                            clear_right=3000.0),
     100.0, "bw + span/10 (continuous) on each side", 300 + 2 * 800),
    (Shape.TEE, FloorLayout(12000.0, Continuity.SIMPLE, clear_left=3000.0, clear_right=3000.0),
     80.0, "bw + 12hf on each side", 300 + 2 * 960),
    (Shape.TEE, FloorLayout(8000.0, Continuity.SIMPLE, clear_left=1000.0, clear_right=1000.0),
     100.0, "bw + half the clear distance to the next web on each side", 300 + 2 * 500),
    (Shape.TEE, FloorLayout(8000.0, Continuity.SIMPLE, clear_left=1000.0, clear_right=4000.0),
     100.0, "bw + overhangs, each side by its own smallest limit", 300 + 500 + 1200),
    (Shape.ELL, FloorLayout(6000.0, Continuity.END, clear_left=3000.0),
     100.0, "bw + span/12 on the slab side", 300 + 500),
    (Shape.ELL, FloorLayout(12000.0, Continuity.END, clear_left=3000.0),
     60.0, "bw + 6hf on the slab side", 300 + 360),
    (Shape.ELL, FloorLayout(12000.0, Continuity.END, clear_left=600.0),
     100.0, "bw + half the clear distance to the next web on the slab side", 300 + 300),
])
def test_effective_width_governing_candidate(shape, layout, hf, label, width):
    r = assess(tee(shape=shape, layout=layout, flange_thickness=hf), ID)
    envelope = r.effective_width
    assert envelope.governing_candidate.label == label
    assert envelope.value == pytest.approx(width)


def test_effective_width_lists_every_candidate():
    layout = FloorLayout(8000.0, Continuity.SIMPLE, clear_left=1000.0, clear_right=4000.0)
    envelope = assess(tee(layout=layout), ID).effective_width
    values = {c.label: c.value for c in envelope.candidates}
    assert values["bw + 12hf on each side"] == pytest.approx(300 + 2 * 1200)
    assert values["bw + span/5 (simply supported) on each side"] == pytest.approx(300 + 3200)
    assert all(c.clause.ref == "10.3.3" for c in envelope.candidates)


def test_given_width_governs_when_smaller():
    envelope = assess(tee(flange_width=700.0), ID).effective_width
    assert envelope.governing_candidate.label == "flange width as given"
    assert envelope.value == 700.0


@pytest.mark.parametrize("changes", [
    {"concrete_strength": 15.0},  # f'c ≥ 20 MPa (CSA A23.3-19 8.6.1.1, from memory)
    {"concrete_strength": 90.0},  # f'c ≤ 80 MPa (CSA A23.3-19 8.6.1.1, from memory)
    {"yield_strength": 550.0},  # fy ≤ 500 MPa (CSA A23.3-19 8.5.1, from memory)
])
def test_outside_scope(changes):
    r = assess(tee(**changes), ID)
    assert r.status == "outside scope"
    assert r.response is None


def test_limits_of_scope_are_inside():
    assert assess(tee(concrete_strength=80.0, yield_strength=500.0), ID).status != \
        "outside scope"


def at(value, i):
    """Row i of a batch value (a limit common to the batch may be a plain float)."""
    return np.broadcast_to(np.asarray(value, float), (4,))[i]


def test_batch_equals_single():
    cases = [
        dict(area=2000.0, clear=1800.0, web=300.0, fc=30.0, fy=400.0),
        dict(area=5000.0, clear=600.0, web=300.0, fc=30.0, fy=400.0),
        dict(area=3500.0, clear=2400.0, web=350.0, fc=60.0, fy=500.0),
        dict(area=7000.0, clear=400.0, web=250.0, fc=45.0, fy=450.0),
    ]

    def column(key):
        return np.array([c[key] for c in cases])

    batch = tee(web_width=column("web"), concrete_strength=column("fc"),
                yield_strength=column("fy"), tension=(Layer(column("area"), np.full(4, D)),),
                depth=np.full(4, H), flange_thickness=np.full(4, HF),
                layout=FloorLayout(np.full(4, 8000.0), Continuity.SIMPLE,
                                   clear_left=column("clear"), clear_right=column("clear")),
                actions=Actions(dead=np.full(4, 200e6), live=np.linspace(50e6, 200e6, 4)))
    ev = evaluate(batch, default_registry().edition(ID), Context())
    for i, case in enumerate(cases):
        single = assess(tee(case["area"], case["clear"], web_width=case["web"],
                            concrete_strength=case["fc"], yield_strength=case["fy"],
                            actions=Actions(dead=200e6, live=float(batch.actions.live[i]))), ID)
        assert ev.effective_width.value[i] == pytest.approx(single.effective_width.value,
                                                            rel=1e-9)
        assert ev.response.c[i] == pytest.approx(single.response.c, rel=1e-9)
        assert ev.design_resistance.value[i] == pytest.approx(single.design_resistance.value,
                                                              rel=1e-9)
        assert [c.name for c in ev.checks] == [c.name for c in single.checks]
        for batch_check, one in zip(ev.checks, single.checks, strict=True):
            assert at(batch_check.value, i) == pytest.approx(one.value, rel=1e-9)
            assert at(batch_check.limit, i) == pytest.approx(one.limit, rel=1e-9)
    assert not ev.response.block_in_flange[1]
    assert ev.response.block_in_flange[0]
