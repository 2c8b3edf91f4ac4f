"""Rectangular stress block over flanged and rectangular sections, against hand formulas."""

import math

import numpy as np
import pytest

from clausewise.core import (
    ElasticPlastic,
    RectangularBlock,
    Section,
    SectionArrays,
    SteelLayer,
    solve,
    solve_arrays,
)

FC = 28.0  # MPa
FY = 420.0  # MPa
ES = 200_000.0  # MPa
BETA1 = 0.85
EPS_CU = 0.003

# 0.85 f'c over beta1 c with the extreme fibre at 0.003 (common practice, no source)
BLOCK = RectangularBlock(stress=0.85 * FC, depth_factor=BETA1, ultimate_strain=EPS_CU)
STEEL = ElasticPlastic(modulus=ES, yield_stress=FY)

BF, BW, HF, H, D = 800.0, 300.0, 100.0, 600.0, 540.0


def tee(area, depth=D):
    return Section.flanged(BF, BW, HF, H, [SteelLayer(area, depth, STEEL)])


def test_block_inside_flange_is_rectangle_of_flange_width():
    area = 1500.0
    r = solve(tee(area), BLOCK)
    # a = As fy / (0.85 f'c bf), Mn = As fy (d - a/2) (common practice, no source)
    a = area * FY / (0.85 * FC * BF)
    assert a < HF
    assert r.block_in_flange
    assert r.block_case == "block inside the flange"
    assert r.zone_depth == pytest.approx(a, rel=1e-12)
    assert r.c == pytest.approx(a / BETA1, rel=1e-12)
    assert r.concrete_force == pytest.approx(area * FY, rel=1e-12)
    assert r.concrete_depth == pytest.approx(a / 2, rel=1e-12)
    assert r.nominal_moment == pytest.approx(area * FY * (D - a / 2), rel=1e-12)
    assert r.layers[0].stress == -FY
    assert r.layers[0].yielded


def test_block_in_web_reproduces_textbook_split():
    area = 5000.0
    r = solve(tee(area), BLOCK)
    # overhang Asf = 0.85 f'c (bf - bw) hf / fy at d - hf/2; web (As - Asf) fy = 0.85 f'c bw a
    # at d - a/2 (common practice, no source)
    asf = 0.85 * FC * (BF - BW) * HF / FY
    a = (area - asf) * FY / (0.85 * FC * BW)
    assert a > HF
    assert not r.block_in_flange
    assert r.block_case == "block enters the web"
    assert r.zone_reaches == "web"
    assert r.overhang_force == pytest.approx(asf * FY, rel=1e-12)
    assert r.overhang_depth == pytest.approx(HF / 2, rel=1e-12)
    assert r.web_force == pytest.approx((area - asf) * FY, rel=1e-12)
    assert r.web_depth == pytest.approx(a / 2, rel=1e-12)
    assert r.zone_depth == pytest.approx(a, rel=1e-12)
    mn = asf * FY * (D - HF / 2) + (area - asf) * FY * (D - a / 2)
    assert r.nominal_moment == pytest.approx(mn, rel=1e-12)
    assert r.layers[0].yielded


def test_overhang_and_web_parts_add_up_to_concrete_force():
    r = solve(tee(5000.0), BLOCK)
    assert r.overhang_force + r.web_force == pytest.approx(r.concrete_force, rel=1e-14)
    moment = r.overhang_force * r.overhang_depth + r.web_force * r.web_depth
    assert moment == pytest.approx(r.concrete_force * r.concrete_depth, rel=1e-13)


def test_moment_continuous_where_block_reaches_flange_bottom():
    # steel area that puts the block bottom exactly at hf (common practice, no source)
    area_at_hf = 0.85 * FC * BF * HF / FY
    below = solve(tee(area_at_hf * (1 - 1e-9)), BLOCK)
    above = solve(tee(area_at_hf * (1 + 1e-9)), BLOCK)
    assert below.block_in_flange
    assert not above.block_in_flange
    limit = area_at_hf * FY * (D - HF / 2)
    assert below.nominal_moment == pytest.approx(limit, rel=1e-8)
    assert above.nominal_moment == pytest.approx(limit, rel=1e-8)
    # the jump vanishes: the difference is only the 2e-9 change of As
    assert abs(above.nominal_moment - below.nominal_moment) < 3e-9 * limit


def test_moment_non_decreasing_in_steel_area_while_steel_yields():
    areas = np.linspace(200.0, 7000.0, 300)
    responses = [solve(tee(float(a)), BLOCK) for a in areas]
    assert all(r.layers[0].yielded for r in responses)
    assert any(r.block_in_flange for r in responses)
    assert any(not r.block_in_flange for r in responses)
    moments = np.array([r.nominal_moment for r in responses])
    assert np.all(np.diff(moments) > 0)


def test_over_reinforced_steel_stays_elastic():
    area = 16_000.0
    r = solve(tee(area), BLOCK)
    layer = r.layers[0]
    assert not layer.yielded
    # strain by compatibility, eps_s = 0.003 (d - c) / c (common practice, no source)
    assert -layer.strain == pytest.approx(EPS_CU * (D - r.c) / r.c, rel=1e-12)
    assert layer.stress == pytest.approx(ES * layer.strain, rel=1e-12)
    assert abs(layer.stress) < FY
    # hand solve: 0.85 f'c [(bf - bw) hf + bw beta1 c] = As Es 0.003 (d - c) / c, i.e.
    # A c^2 + B c + C = 0 with the block in the web (common practice, no source)
    qa = 0.85 * FC * BW * BETA1
    qb = 0.85 * FC * (BF - BW) * HF + area * ES * EPS_CU
    qc = -area * ES * EPS_CU * D
    c = (-qb + math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa)
    assert BETA1 * c > HF
    assert r.c == pytest.approx(c, rel=1e-10)
    a = BETA1 * c
    mn = 0.85 * FC * ((BF - BW) * HF * (D - HF / 2) + BW * a * (D - a / 2))
    assert r.nominal_moment == pytest.approx(mn, rel=1e-10)


def test_hogging_tee_with_zone_in_web_equals_web_rectangle():
    layers = [SteelLayer(1800.0, D, STEEL)]
    hog = solve(Section.hogging(BF, BW, HF, H, layers), BLOCK)
    rect = solve(Section.rectangle(BW, H, layers), BLOCK)
    assert hog.zone_depth < H - HF
    assert hog.zone_reaches == "web"
    assert not hog.block_in_flange
    assert hog.c == pytest.approx(rect.c, rel=1e-12)
    assert hog.nominal_moment == pytest.approx(rect.nominal_moment, rel=1e-12)
    assert hog.concrete_force == pytest.approx(rect.concrete_force, rel=1e-12)
    assert hog.overhang_force == 0.0
    # hand check of the rectangle: a = As fy / (0.85 f'c bw) (common practice, no source)
    a = 1800.0 * FY / (0.85 * FC * BW)
    assert hog.nominal_moment == pytest.approx(1800.0 * FY * (D - a / 2), rel=1e-12)


def test_compression_steel_below_yield_matches_hand_strain_compatibility():
    b, h, d, d_top = 300.0, 600.0, 540.0, 70.0
    area, area_top = 3000.0, 1200.0
    section = Section.rectangle(b, h, [SteelLayer(area_top, d_top, STEEL),
                                       SteelLayer(area, d, STEEL)])
    r = solve(section, BLOCK)
    # hand strain compatibility, tension steel yielded, compression steel elastic, displaced
    # concrete netted out: 0.85 f'c b beta1 c + (Es 0.003 (c - d')/c - 0.85 f'c) As' = As fy
    # gives A c^2 + B c + C = 0 (common practice, no source)
    qa = 0.85 * FC * b * BETA1
    qb = ES * EPS_CU * area_top - 0.85 * FC * area_top - area * FY
    qc = -ES * EPS_CU * area_top * d_top
    c = (-qb + math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa)
    assert c == pytest.approx(149.30404, rel=1e-7)  # worked by hand to 8 figures
    eps_top = EPS_CU * (c - d_top) / c
    assert eps_top < FY / ES
    assert r.c == pytest.approx(c, rel=1e-10)
    top, bottom = r.layers
    assert not top.yielded
    assert bottom.yielded
    assert top.strain == pytest.approx(eps_top, rel=1e-10)
    assert top.stress == pytest.approx(ES * eps_top, rel=1e-10)
    assert top.displaced_concrete_stress == pytest.approx(0.85 * FC, rel=1e-14)
    assert top.force == pytest.approx((ES * eps_top - 0.85 * FC) * area_top, rel=1e-10)
    a = BETA1 * c
    mn = 0.85 * FC * b * a * (d - a / 2) + (ES * eps_top - 0.85 * FC) * area_top * (d - d_top)
    assert r.nominal_moment == pytest.approx(mn, rel=1e-10)


def test_deepest_of_several_tension_layers_gives_net_tensile_strain():
    layers = [SteelLayer(1000.0, 500.0, STEEL), SteelLayer(1500.0, 560.0, STEEL),
              SteelLayer(800.0, 450.0, STEEL)]
    r = solve(Section.flanged(BF, BW, HF, H, layers), BLOCK)
    # all three layers yield here, so a = sum(As) fy / (0.85 f'c bf) (common practice, no source)
    total = 3300.0
    a = total * FY / (0.85 * FC * BF)
    assert all(layer.yielded for layer in r.layers)
    assert r.zone_depth == pytest.approx(a, rel=1e-12)
    c = a / BETA1
    assert r.extreme_tension_depth == 560.0
    assert r.net_tensile_strain == pytest.approx(EPS_CU * (560.0 - c) / c, rel=1e-12)
    assert r.net_tensile_strain == pytest.approx(-r.layers[1].strain, rel=1e-15)
    centroid = (1000.0 * 500.0 + 1500.0 * 560.0 + 800.0 * 450.0) / total
    assert r.effective_depth == pytest.approx(centroid, rel=1e-14)
    assert r.c_over_dt == pytest.approx(c / 560.0, rel=1e-12)
    assert r.c_over_d == pytest.approx(c / centroid, rel=1e-12)
    lever = sum(layer.area * FY * (layer.depth - a / 2) for layer in r.layers)
    assert r.nominal_moment == pytest.approx(lever, rel=1e-12)


def test_shallowest_equilibrium_where_block_edge_passes_compression_bar():
    # With the concrete a bar displaces switched on as the block edge passes it, net force
    # steps down there and two equilibria exist for As near 1423 mm^2 in this section; the
    # core returns the shallowest (documented choice). The moment barely notices: the
    # concrete displaced by 1200 mm^2 moves only a little (common practice, no source).
    areas = np.linspace(1300.0, 1600.0, 3001)  # steps of 0.1 mm^2
    batch = SectionArrays.from_profile(
        thicknesses=[H], widths=[BW], labels=("web",), areas=[1200.0, areas],
        depths=[70.0, D], steel=[STEEL, STEEL])
    result = solve_arrays(batch, BLOCK)
    assert np.all(result.status == 0)
    assert result.zone_depth.min() < 70.0 < result.zone_depth.max()  # the edge passes the bar

    def net(c, area):  # own strain compatibility: 0.003 at the top, EPP steel, 0.85f'c block
        a = BETA1 * c
        force = 0.85 * FC * BW * min(a, H)
        for layer_area, depth in ((1200.0, 70.0), (area, D)):
            stress = float(np.clip(200_000.0 * EPS_CU * (c - depth) / c, -FY, FY))
            force += layer_area * (stress - (0.85 * FC if depth < a else 0.0))
        return force

    for area, c in zip(areas[::50], result.c[::50], strict=True):
        assert abs(net(c, area)) < 1e-9 * 0.85 * FC * BW * BETA1 * c + 1e-6
        below = np.linspace(1e-3 * c, c * (1 - 1e-9), 400)
        assert all(net(x, area) < 0 for x in below)  # no shallower root exists
    jumps = np.abs(np.diff(result.nominal_moment)) / result.nominal_moment[1:]
    assert np.max(jumps) < 2e-3
