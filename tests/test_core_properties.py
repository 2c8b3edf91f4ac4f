"""Solver properties over random sections, and gross and cracked section properties."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from clausewise.core import (
    BilinearHardening,
    ElasticPlastic,
    ParabolaRectangle,
    RectangularBlock,
    Section,
    SteelLayer,
    cracked_properties,
    cracking_moment,
    gross_properties,
    solve,
)

SETTINGS = settings(max_examples=150, deadline=None)


@st.composite
def steel_laws(draw):
    modulus = draw(st.floats(190_000.0, 210_000.0))
    fy = draw(st.floats(250.0, 600.0))
    if draw(st.booleans()):
        return ElasticPlastic(modulus=modulus, yield_stress=fy)
    return BilinearHardening(modulus=modulus, yield_stress=fy,
                             hardening_modulus=draw(st.floats(0.0, 5000.0)),
                             strain_limit=draw(st.floats(0.01, 0.1)))


@st.composite
def sections(draw):
    h = draw(st.floats(250.0, 1500.0))
    hf = draw(st.floats(0.05, 0.5)) * h
    bw = draw(st.floats(120.0, 800.0))
    bf = bw + draw(st.floats(0.0, 3000.0))
    law = draw(steel_laws())
    d = h - draw(st.floats(25.0, 0.2 * h))
    layers = [SteelLayer(draw(st.floats(0.0003, 0.1)) * bw * d, d, law)]
    for _ in range(draw(st.integers(0, 2))):
        layers.append(SteelLayer(draw(st.floats(50.0, 5000.0)),
                                 draw(st.floats(0.05, 0.95)) * h, law))
    build = Section.flanged if draw(st.booleans()) else Section.hogging
    return build(bf, bw, hf, h, layers)


concrete_laws = st.one_of(
    st.builds(RectangularBlock, stress=st.floats(10.0, 90.0), depth_factor=st.floats(0.6, 1.0),
              ultimate_strain=st.floats(0.0025, 0.0038)),
    st.builds(ParabolaRectangle, peak_stress=st.floats(10.0, 60.0),
              strain_at_peak=st.floats(0.0017, 0.0025), ultimate_strain=st.floats(0.0026, 0.0035),
              exponent=st.floats(1.4, 2.0)),
)


@SETTINGS
@given(section=sections(), law=concrete_laws)
def test_equilibrium_residual_below_1e_12(section, law):
    r = solve(section, law)
    assert r.status in (0, 2)  # 2: a bilinear layer may pass its strain limit
    assert r.residual <= 1e-12
    # the residual is the net force over the total force, recomputed from the layers
    net = r.concrete_force + sum(layer.force for layer in r.layers)
    total = r.concrete_force + sum(layer.area * abs(layer.stress) for layer in r.layers)
    assert abs(net) <= 1e-12 * total + 1e-9
    assert 0 < r.c < max(layer.depth for layer in r.layers)


@SETTINGS
@given(section=sections(), law=concrete_laws)
def test_plane_sections_and_laws_give_every_layer(section, law):
    r = solve(section, law)
    eps_cu = law.ultimate_strain
    for spec, layer in zip(section.layers, r.layers, strict=True):
        # linear strain with the extreme fibre at eps_cu (common practice, no source)
        assert layer.strain == pytest.approx(eps_cu * (r.c - spec.depth) / r.c,
                                             rel=1e-12, abs=1e-15)
        expected = float(spec.law.stress(np.array([layer.strain]))[0])
        assert layer.stress == pytest.approx(expected, rel=1e-14, abs=1e-12)
        assert layer.force == pytest.approx(
            spec.area * (layer.stress - layer.displaced_concrete_stress), rel=1e-12, abs=1e-6)


def test_gross_properties_of_tee_by_hand():
    section = Section.flanged(800.0, 300.0, 120.0, 600.0,
                              [SteelLayer(1000.0, 550.0, ElasticPlastic(200_000.0, 420.0))])
    g = gross_properties(section.to_arrays())
    # by hand: flange 800 x 120 = 96 000 at 60, web 300 x 480 = 144 000 at 360
    # (common practice, no source)
    assert g.area[0] == pytest.approx(240_000.0, rel=1e-14)
    assert g.centroid[0] == pytest.approx(240.0, rel=1e-14)
    # parallel axis theorem: 800 120^3/12 + 96 000 180^2 + 300 480^3/12 + 144 000 120^2
    second = 115.2e6 + 3110.4e6 + 2764.8e6 + 2073.6e6
    assert second == pytest.approx(8064e6, rel=1e-14)
    assert g.second_moment[0] == pytest.approx(8064e6, rel=1e-12)
    assert g.modulus_tension_face[0] == pytest.approx(8064e6 / 360.0, rel=1e-12)
    assert g.modulus_compression_face[0] == pytest.approx(8064e6 / 240.0, rel=1e-12)
    # Mcr = fr I / (h - ybar) (common practice, no source)
    fr = 3.5
    mcr = cracking_moment(section.to_arrays(), fr)
    assert mcr[0] == pytest.approx(fr * 8064e6 / 360.0, rel=1e-12)
    assert mcr[0] == pytest.approx(78.4e6, rel=1e-12)


def test_gross_properties_of_hogging_tee_mirror_sagging():
    layers = [SteelLayer(1000.0, 550.0, ElasticPlastic(200_000.0, 420.0))]
    g = gross_properties(Section.hogging(800.0, 300.0, 120.0, 600.0, layers).to_arrays())
    assert g.centroid[0] == pytest.approx(600.0 - 240.0, rel=1e-14)
    assert g.second_moment[0] == pytest.approx(8064e6, rel=1e-12)
    # the tension face is now the flange top, 240 mm from the centroid
    assert g.modulus_tension_face[0] == pytest.approx(8064e6 / 240.0, rel=1e-12)


def textbook_cracked(b, d, area, n):
    # kd = (-n As + sqrt((n As)^2 + 2 b n As d)) / b, Icr = b kd^3 / 3 + n As (d - kd)^2
    # (common practice, no source)
    na = n * area
    kd = (-na + math.sqrt(na * na + 2 * b * na * d)) / b
    return kd, b * kd**3 / 3 + na * (d - kd) ** 2


def test_cracked_rectangle_matches_textbook_quadratic():
    section = Section.rectangle(300.0, 550.0,
                                [SteelLayer(1500.0, 500.0, ElasticPlastic(200_000.0, 420.0))])
    cr = cracked_properties(section.to_arrays(), 8.0)
    kd, icr = textbook_cracked(300.0, 500.0, 1500.0, 8.0)
    assert kd == pytest.approx(163.96, rel=1e-4)  # worked by hand
    assert cr.neutral_axis[0] == pytest.approx(kd, rel=1e-12)
    assert cr.second_moment[0] == pytest.approx(icr, rel=1e-12)


@SETTINGS
@given(b=st.floats(150.0, 2000.0), h=st.floats(200.0, 1500.0), cover=st.floats(0.03, 0.2),
       ratio=st.floats(0.001, 0.06), n=st.floats(5.0, 15.0))
def test_cracked_rectangles_match_textbook_quadratic(b, h, cover, ratio, n):
    d = h * (1 - cover)
    area = ratio * b * d
    section = Section.rectangle(b, h, [SteelLayer(area, d, ElasticPlastic(200_000.0, 420.0))])
    cr = cracked_properties(section.to_arrays(), n)
    kd, icr = textbook_cracked(b, d, area, n)
    assert cr.neutral_axis[0] == pytest.approx(kd, rel=1e-12)
    assert cr.second_moment[0] == pytest.approx(icr, rel=1e-11)


def test_cracked_tee_with_axis_in_web_matches_hand_quadratic():
    bf, bw, hf, d, area, n = 800.0, 300.0, 80.0, 640.0, 6000.0, 8.0
    section = Section.flanged(bf, bw, hf, 700.0,
                              [SteelLayer(area, d, ElasticPlastic(200_000.0, 420.0))])
    cr = cracked_properties(section.to_arrays(), n)
    # first moment about the axis: bf hf (kd - hf/2) + bw (kd - hf)^2 / 2 = n As (d - kd),
    # a quadratic in kd (common practice, no source)
    qa = bw / 2
    qb = bf * hf - bw * hf + n * area
    qc = -bf * hf * hf / 2 + bw * hf * hf / 2 - n * area * d
    kd = (-qb + math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa)
    assert kd > hf
    icr = (bf * hf**3 / 12 + bf * hf * (kd - hf / 2) ** 2 + bw * (kd - hf) ** 3 / 3
           + n * area * (d - kd) ** 2)
    assert cr.neutral_axis[0] == pytest.approx(kd, rel=1e-12)
    assert cr.second_moment[0] == pytest.approx(icr, rel=1e-12)


def test_cracked_doubly_reinforced_counts_compression_bars_as_n_minus_one():
    b, d, d_top, area, area_top, n = 300.0, 540.0, 60.0, 2500.0, 1000.0, 7.0
    steel = ElasticPlastic(200_000.0, 420.0)
    section = Section.rectangle(b, 600.0, [SteelLayer(area_top, d_top, steel),
                                           SteelLayer(area, d, steel)])
    cr = cracked_properties(section.to_arrays(), n)
    # b kd^2 / 2 + (n - 1) As' (kd - d') = n As (d - kd) (common practice, no source)
    qa = b / 2
    qb = (n - 1) * area_top + n * area
    qc = -(n - 1) * area_top * d_top - n * area * d
    kd = (-qb + math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa)
    assert kd > d_top
    icr = b * kd**3 / 3 + (n - 1) * area_top * (kd - d_top) ** 2 + n * area * (d - kd) ** 2
    assert cr.neutral_axis[0] == pytest.approx(kd, rel=1e-12)
    assert cr.second_moment[0] == pytest.approx(icr, rel=1e-12)
