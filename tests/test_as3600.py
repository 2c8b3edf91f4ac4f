"""AS 3600-2018 edition against the standard's formulas and hand calculations.

Every value of the standard used below is recalled from memory of AS 3600-2018.
"""

import math
from dataclasses import replace

import numpy as np
import pytest

from clausewise.plugins.as3600_2018 import alpha2, capacity_factor, gamma
from clausewise.provisions import (
    Actions,
    Beam,
    BeamDataError,
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

ID = "as3600:2018"
EPS_CU, ES = 0.003, 200_000.0  # AS 3600-2018 8.1.3 and 3.2.2, from memory
FC, FSY = 32.0, 500.0
BW, H, HF, DO = 300.0, 600.0, 120.0, 540.0


def tee(area=2000.0, **changes):
    """An interior span of an invented car-park deck in Port Ardent."""
    beam = Beam("G-4", Shape.TEE, Bending.SAGGING, BW, H, FC, FSY, (Layer(area, DO),),
                flange_thickness=HF,
                layout=FloorLayout(8000.0, Continuity.INTERIOR, clear_left=3000.0,
                                   clear_right=3000.0),
                actions=Actions(dead=150e6, live=100e6))
    return replace(beam, **changes)


def check(assessment, name):
    (found,) = [c for c in assessment.checks if c.name == name]
    return found


def parameters():
    return default_registry().edition(ID).parameters(Context())


@pytest.mark.parametrize(("fc", "a2", "g"), [
    (32.0, 0.802, 0.89),  # AS 3600-2018 8.1.3, from memory
    (65.0, 0.7525, 0.8075),  # AS 3600-2018 8.1.3, from memory
    (100.0, 0.70, 0.72),  # AS 3600-2018 8.1.3, from memory: 0.85 - 0.15, 0.97 - 0.25
])
def test_block_factors(fc, a2, g):
    assert alpha2(fc).value == pytest.approx(a2, abs=1e-12)
    assert gamma(fc).value == pytest.approx(g, abs=1e-12)


def test_block_factors_never_below_lower_limit():
    # both factors at least 0.67 (AS 3600-2018 8.1.3, from memory)
    assert alpha2(150.0).value == pytest.approx(0.67)
    assert gamma(150.0).value == pytest.approx(0.67)


@pytest.mark.parametrize(("kuo", "phi"), [
    (0.2, 0.85),  # 1.24 - 13(0.2)/12 = 1.0233, capped (AS 3600-2018 Table 2.2.2, from memory)
    (0.36, 0.85),  # 1.24 - 0.39 = 0.85 (AS 3600-2018 Table 2.2.2, from memory)
    (0.5, 1.24 - 13 * 0.5 / 12),  # 0.698 (AS 3600-2018 Table 2.2.2, from memory)
    (0.7, 0.65),  # 0.4817, raised to 0.65 (AS 3600-2018 Table 2.2.2, from memory)
])
def test_capacity_factor_class_n(kuo, phi):
    factor, _ = capacity_factor(kuo, "N", parameters())
    assert factor.value == pytest.approx(phi, abs=1e-12)


def test_capacity_factor_class_l():
    # Class L bars: φ = 0.65 (AS 3600-2018 Table 2.2.2, from memory)
    factor, regime = capacity_factor(0.1, "L", parameters())
    assert factor.value == 0.65
    assert regime.name == "Class L reinforcement"


def test_block_in_flange_against_hand_calculation():
    area = 2000.0
    r = assess(tee(area), ID)
    # bef = bw + 0.2a with a = 0.7 l for an interior span (AS 3600-2018 8.8.2, from memory;
    # 0.7 l common practice)
    bef = BW + 0.2 * 0.7 * 8000.0
    assert r.effective_width.value == pytest.approx(bef)
    # α2 f'c bef γ ku = Ast fsy with the steel yielding (hand calculation)
    a2, g = 0.85 - 0.0015 * FC, 0.97 - 0.0025 * FC
    depth = area * FSY / (a2 * FC * bef)
    ku = depth / g
    assert depth < HF
    assert EPS_CU * (DO - ku) / ku > FSY / ES
    assert r.response.block_in_flange
    assert r.response.c == pytest.approx(ku, rel=1e-9)
    muo = area * FSY * (DO - depth / 2)
    assert r.nominal_moment == pytest.approx(muo, rel=1e-9)
    # kuo small: φ = 0.85 (AS 3600-2018 Table 2.2.2, from memory)
    assert r.resistance.factor.value == pytest.approx(0.85)
    assert r.design_resistance.value == pytest.approx(0.85 * muo, rel=1e-9)
    # M* = max(1.35G, 1.2G + 1.5Q) (AS/NZS 1170.0 4.2.2, from memory)
    strength = check(r, "flexural strength")
    assert strength.value == pytest.approx(max(1.35 * 150e6, 1.2 * 150e6 + 1.5 * 100e6))
    assert r.demand.governing_candidate.label == "1.2G + 1.5Q"
    assert r.status == "pass"


def test_block_in_web_against_hand_calculation():
    area, hf, bef = 5000.0, 100.0, 600.0
    r = assess(tee(area, flange_thickness=hf, flange_width=bef, layout=None,
                   actions=Actions()), ID)
    # overhangs: Cf = α2 f'c (bef - bw) hf at hf/2; web: α2 f'c bw γku = Ast fsy - Cf
    # (common practice, no source, with AS 3600-2018 8.1.3 factors)
    a2, g = 0.85 - 0.0015 * FC, 0.97 - 0.0025 * FC
    cf = a2 * FC * (bef - BW) * hf
    tension = area * FSY
    depth = (tension - cf) / (a2 * FC * BW)
    ku = depth / g
    assert depth > hf
    assert EPS_CU * (DO - ku) / ku > FSY / ES  # the steel still yields
    assert not r.response.block_in_flange
    assert r.response.c == pytest.approx(ku, rel=1e-9)
    muo = cf * (DO - hf / 2) + (tension - cf) * (DO - depth / 2)
    assert r.nominal_moment == pytest.approx(muo, rel=1e-9)
    kuo = ku / DO
    phi = 1.24 - 13 * kuo / 12  # within 0.65..0.85 (AS 3600-2018 Table 2.2.2, from memory)
    assert 0.65 < phi < 0.85
    assert r.resistance.factor.value == pytest.approx(phi, rel=1e-9)
    assert r.design_resistance.value == pytest.approx(phi * muo, rel=1e-9)
    assert r.resistance.regime.name == "φ falls with kuo"


def test_kuo_limit():
    deep = assess(tee(5000.0, flange_thickness=100.0, flange_width=600.0, layout=None,
                      actions=Actions()), ID)
    ratio = check(deep, "neutral-axis depth ratio")
    # kuo ≤ 0.36 (AS 3600-2018 8.1.5, from memory)
    assert ratio.limit == 0.36
    assert ratio.value == pytest.approx(deep.response.c / DO, rel=1e-12)
    assert ratio.value > 0.36
    assert not ratio.passed
    assert deep.status == "fail"
    assert deep.governing is ratio
    shallow = check(assess(tee(), ID), "neutral-axis depth ratio")
    assert shallow.passed


def _gross_tee(bf, bw, hf, h):
    """Area, centroid depth from the flange face and second moment, by the parallel-axis
    theorem (hand calculation)."""
    parts = [(bf * hf, hf / 2, bf * hf**3 / 12), (bw * (h - hf), hf + (h - hf) / 2,
                                                   bw * (h - hf) ** 3 / 12)]
    area = sum(p[0] for p in parts)
    centroid = sum(p[0] * p[1] for p in parts) / area
    second = sum(own + a * (y - centroid) ** 2 for a, y, own in parts)
    return area, centroid, second


def test_minimum_strength_against_gross_tee():
    bef = BW + 0.2 * 0.7 * 8000.0
    _, centroid, second = _gross_tee(bef, BW, HF, H)
    fct = 0.6 * math.sqrt(FC)  # f'ct.f = 0.6√f'c (AS 3600-2018 3.1.1.3, from memory)
    mcr = fct * second / (H - centroid)  # tension face at the soffit in sagging
    r = assess(tee(2000.0), ID)
    minimum = check(r, "minimum strength in bending")
    # Muo ≥ 1.2 Mcr (AS 3600-2018 8.1.6.1, from memory)
    assert minimum.limit == pytest.approx(1.2 * mcr, rel=1e-9)
    assert minimum.value == pytest.approx(r.nominal_moment, rel=1e-12)
    assert minimum.passed
    light = assess(tee(300.0), ID)
    light_check = check(light, "minimum strength in bending")
    assert light_check.value < 1.2 * mcr
    assert not light_check.passed


def test_minimum_strength_with_flange_in_tension():
    bef = 1200.0
    _, centroid, second = _gross_tee(bef, BW, HF, H)
    fct = 0.6 * math.sqrt(FC)
    mcr = fct * second / centroid  # the tension face is the slab face (hand calculation)
    r = assess(tee(2000.0, bending=Bending.HOGGING, flange_width=bef), ID)
    assert check(r, "minimum strength in bending").limit == pytest.approx(1.2 * mcr, rel=1e-9)


@pytest.mark.parametrize(("shape", "layout", "label", "width"), [
    # bef = bw + 0.2a (T), bw + 0.1a (L), overhang ≤ half the clear distance
    # (AS 3600-2018 8.8.2, from memory: a may be taken as 0.7L in continuous beams; a = l
    # of a simple span is common practice)
    (Shape.TEE, FloorLayout(6000.0, Continuity.END, clear_left=3000.0, clear_right=3000.0,
                            zero_moment_length=5000.0),
     "bw + 0.1a (a as given) on each side", 300 + 0.2 * 5000),
    (Shape.TEE, FloorLayout(6000.0, Continuity.SIMPLE, clear_left=3000.0, clear_right=3000.0),
     "bw + 0.1a (a = 1 l, simply supported span: common practice, not AS text) on each side",
     300 + 0.2 * 6000),
    (Shape.TEE, FloorLayout(6000.0, Continuity.END, clear_left=3000.0, clear_right=3000.0),
     "bw + 0.1a (a = 0.7 l, end span: 8.8.2 for continuous beams) on each side",
     300 + 0.2 * 0.7 * 6000),
    (Shape.TEE, FloorLayout(6000.0, Continuity.INTERIOR, clear_left=3000.0,
                            clear_right=3000.0),
     "bw + 0.1a (a = 0.7 l, interior span: 8.8.2 for continuous beams) on each side",
     300 + 0.2 * 0.7 * 6000),
    (Shape.TEE, FloorLayout(6000.0, Continuity.SIMPLE, clear_left=800.0, clear_right=800.0),
     "bw + half the clear distance to the next web on each side", 300 + 800),
    (Shape.TEE, FloorLayout(6000.0, Continuity.SIMPLE, clear_left=600.0, clear_right=4000.0),
     "bw + overhangs, each side by its own smallest limit", 300 + 300 + 600),
    (Shape.ELL, FloorLayout(6000.0, Continuity.INTERIOR, clear_left=3000.0),
     "bw + 0.1a (a = 0.7 l, interior span: 8.8.2 for continuous beams) on the slab side",
     300 + 0.1 * 0.7 * 6000),
    (Shape.ELL, FloorLayout(6000.0, Continuity.SIMPLE, clear_right=500.0),
     "bw + half the clear distance to the next web on the slab side", 300 + 250),
])
def test_effective_width_governing_candidate(shape, layout, label, width):
    envelope = assess(tee(shape=shape, layout=layout), ID).effective_width
    assert envelope.governing_candidate.label == label
    assert envelope.value == pytest.approx(width)
    assert all(c.clause.ref == "8.8.2" for c in envelope.candidates)


def test_effective_width_of_cantilever_needs_zero_moment_length():
    layout = FloorLayout(3000.0, Continuity.CANTILEVER, clear_left=3000.0, clear_right=3000.0)
    with pytest.raises(BeamDataError, match=r"zero_moment_length \(mm\)"):
        assess(tee(layout=layout), ID)
    given = replace(layout, zero_moment_length=2000.0)
    assert assess(tee(layout=given), ID).effective_width.value == pytest.approx(300 + 400)


def test_given_width_governs_when_smaller():
    envelope = assess(tee(flange_width=700.0), ID).effective_width
    assert envelope.governing_candidate.label == "flange width as given"
    assert envelope.value == 700.0


@pytest.mark.parametrize("changes", [
    {"concrete_strength": 15.0},  # f'c ≥ 20 MPa (AS 3600-2018 1.1.2, from memory)
    {"concrete_strength": 110.0},  # f'c ≤ 100 MPa (AS 3600-2018 1.1.2, from memory)
    {"yield_strength": 550.0},  # fsy ≤ 500 MPa (AS 3600-2018 3.2.1, from memory)
])
def test_outside_scope(changes):
    r = assess(tee(**changes), ID)
    assert r.status == "outside scope"
    assert r.response is None


def test_limits_of_scope_are_inside():
    assert assess(tee(concrete_strength=100.0), ID).status != "outside scope"


def at(value, i):
    """Row i of a batch value (a limit common to the batch may be a plain float)."""
    return np.broadcast_to(np.asarray(value, float), (4,))[i]


def test_batch_equals_single():
    cases = [
        dict(area=2000.0, span=8000.0, web=300.0, fc=32.0, fsy=500.0),
        dict(area=9000.0, span=3000.0, web=300.0, fc=32.0, fsy=500.0),
        dict(area=3500.0, span=6000.0, web=350.0, fc=65.0, fsy=500.0),
        dict(area=7000.0, span=2500.0, web=250.0, fc=40.0, fsy=400.0),
    ]

    def column(key):
        return np.array([c[key] for c in cases])

    live = np.linspace(50e6, 200e6, 4)
    batch = tee(web_width=column("web"), concrete_strength=column("fc"),
                yield_strength=column("fsy"), tension=(Layer(column("area"), np.full(4, DO)),),
                depth=np.full(4, H), flange_thickness=np.full(4, HF),
                layout=FloorLayout(column("span"), Continuity.INTERIOR,
                                   clear_left=np.full(4, 3000.0),
                                   clear_right=np.full(4, 3000.0)),
                actions=Actions(dead=np.full(4, 150e6), live=live))
    ev = evaluate(batch, default_registry().edition(ID), Context())
    for i, case in enumerate(cases):
        layout = FloorLayout(case["span"], Continuity.INTERIOR, clear_left=3000.0,
                             clear_right=3000.0)
        single = assess(tee(case["area"], web_width=case["web"], concrete_strength=case["fc"],
                            yield_strength=case["fsy"], layout=layout,
                            actions=Actions(dead=150e6, live=float(live[i]))), ID)
        assert ev.effective_width.value[i] == pytest.approx(single.effective_width.value,
                                                            rel=1e-9)
        assert ev.response.c[i] == pytest.approx(single.response.c, rel=1e-9)
        assert ev.resistance.factor.value[i] == pytest.approx(single.resistance.factor.value,
                                                              rel=1e-9)
        assert ev.resistance.regime.name[i] == single.resistance.regime.name
        assert ev.design_resistance.value[i] == pytest.approx(single.design_resistance.value,
                                                              rel=1e-9)
        assert [c.name for c in ev.checks] == [c.name for c in single.checks]
        for batch_check, one in zip(ev.checks, single.checks, strict=True):
            assert at(batch_check.value, i) == pytest.approx(one.value, rel=1e-9)
            assert at(batch_check.limit, i) == pytest.approx(one.limit, rel=1e-9)
    assert not ev.response.block_in_flange[1]
    assert ev.response.block_in_flange[0]


# --- the contested reading of γ (8.1.3) -------------------------------------------------------

def test_gamma_readings_by_hand():
    # AS 3600-2018 8.1.3, from memory: γ = 0.97 - 0.0025 f'c at least 0.67 (our reading);
    # the other reading also caps it at 0.85, which binds below f'c = 48 MPa
    assert gamma(32.0).value == pytest.approx(0.89, abs=1e-12)
    assert gamma(32.0, "0.67 to 0.85").value == pytest.approx(0.85, abs=1e-12)
    assert gamma(48.0, "0.67 to 0.85").value == pytest.approx(0.85, abs=1e-12)
    assert gamma(65.0, "0.67 to 0.85").value == pytest.approx(0.8075, abs=1e-12)
    assert gamma(150.0, "0.67 to 0.85").value == pytest.approx(0.67, abs=1e-12)


@pytest.mark.parametrize(("reading", "g"), [("at least 0.67", 0.89), ("0.67 to 0.85", 0.85)])
def test_gamma_reading_changes_kuo_and_phi_by_hand(edition_with, reading, g):
    area, b, d = 2750.0, 300.0, 500.0
    beam = Beam("R-7", Shape.RECTANGLE, Bending.SAGGING, b, 560.0, FC, FSY, (Layer(area, d),),
                actions=Actions(dead=200e6, live=120e6))
    a = assess(beam, edition_with(ID, gamma_limits=reading))
    # by hand with AS 3600-2018 8.1.3 and Table 2.2.2 (from memory): the steel yields,
    # depth of the block γ ku d = Ast fsy/(α2 f'c b), ku d = block/γ, Muo = Ast fsy (d - block/2),
    # φ = 1.24 - 13 kuo/12 within 0.65..0.85
    a2 = 0.85 - 0.0015 * FC
    block = area * FSY / (a2 * FC * b)
    c = block / g
    assert EPS_CU * (d - c) / c > FSY / ES
    phi = min(max(1.24 - 13 * (c / d) / 12, 0.65), 0.85)
    assert a.response.c == pytest.approx(c, rel=1e-9)
    assert a.design_resistance.value == pytest.approx(phi * area * FSY * (d - block / 2),
                                                      rel=1e-9)
    assert f"gamma_limits = {reading}" in next(f.basis for f in a.concrete_factors
                                                if f.symbol == "γ")


def test_gamma_reading_is_a_listed_choice():
    p = parameters()["gamma_limits"]
    assert p.value == "at least 0.67" and p.choices == ("at least 0.67", "0.67 to 0.85")
    assert "default" in p.description
