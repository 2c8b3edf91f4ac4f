"""Steel laws by hand, and what the solver reports when a law limits the section."""

import numpy as np
import pytest

from clausewise.core import (
    STATUS_TEXT,
    BilinearHardening,
    ElasticPlastic,
    PiecewiseLinear,
    RectangularBlock,
    Section,
    SectionArrays,
    SteelLayer,
    solve,
    solve_arrays,
)

BLOCK = RectangularBlock(stress=0.85 * 30.0, depth_factor=0.8, ultimate_strain=0.003)
CURVE = PiecewiseLinear(points=((0.002, 400.0), (0.01, 450.0), (0.05, 500.0)))


def test_elastic_plastic_stress_is_symmetric_and_capped():
    law = ElasticPlastic(modulus=200_000.0, yield_stress=500.0)
    strains = np.array([-0.01, -0.0025, -0.001, 0.0, 0.001, 0.0025, 0.01])
    expected = np.array([-500.0, -500.0, -200.0, 0.0, 200.0, 500.0, 500.0])
    np.testing.assert_allclose(law.stress(strains), expected, rtol=1e-15)
    assert law.yield_strain == pytest.approx(0.0025, rel=1e-15)


def test_piecewise_linear_interpolates_between_points():
    strains = np.array([0.0, 0.001, 0.002, 0.006, 0.01, 0.03, 0.05, 0.1, -0.006, -0.1])
    # by hand: 400/0.002 on the first leg; 400 + 50 (e - 0.002)/0.008 on the second;
    # 450 + 50 (e - 0.01)/0.04 on the third; flat beyond the last point
    expected = np.array([0.0, 200.0, 400.0, 425.0, 450.0, 475.0, 500.0, 500.0, -425.0, -500.0])
    np.testing.assert_allclose(CURVE.stress(strains), expected, rtol=1e-14, atol=1e-12)
    assert CURVE.yield_strain == 0.05
    assert PiecewiseLinear(CURVE.points, knee_strain=0.002).yield_strain == 0.002


def test_piecewise_linear_with_array_points_interpolates_per_section():
    law = PiecewiseLinear(points=((np.array([0.002, 0.0025]), np.array([400.0, 500.0])),
                                  (np.array([0.01, 0.02]), np.array([450.0, 520.0]))))
    stress = law.stress(np.array([0.006, -0.01125]))
    # row 0: 400 + 50 * 0.5 = 425; row 1: -(500 + 20 * 0.5) = -510
    np.testing.assert_allclose(stress, [425.0, -510.0], rtol=1e-14)


def test_piecewise_linear_layer_takes_interpolated_stress():
    section = Section.rectangle(300.0, 600.0, [SteelLayer(1500.0, 550.0, CURVE)])
    r = solve(section, BLOCK)
    assert r.status == 0
    layer = r.layers[0]
    eps = -layer.strain
    assert 0.01 < eps < 0.05
    assert -layer.stress == pytest.approx(450.0 + 50.0 * (eps - 0.01) / 0.04, rel=1e-12)
    # equilibrium by hand: 0.85 f'c b a = As fs (common practice, no source)
    assert r.zone_depth == pytest.approx(1500.0 * -layer.stress / (0.85 * 30.0 * 300.0),
                                         rel=1e-11)
    assert not layer.yielded  # yield_strain is the last point's strain, 0.05


def test_bilinear_hardening_stress_by_hand():
    law = BilinearHardening(modulus=200_000.0, yield_stress=500.0, hardening_modulus=2000.0,
                            strain_limit=0.0225)
    strains = np.array([0.001, 0.0025, 0.0125, -0.0225])
    # 500 + 2000 (eps - 0.0025) past the yield strain (common practice, no source)
    expected = np.array([200.0, 500.0, 520.0, -540.0])
    np.testing.assert_allclose(law.stress(strains), expected, rtol=1e-14)


def test_hardening_steel_carries_more_than_yield_in_a_normal_section():
    law = BilinearHardening(modulus=200_000.0, yield_stress=500.0, hardening_modulus=2000.0,
                            strain_limit=0.0225)
    r = solve(Section.rectangle(300.0, 600.0, [SteelLayer(2500.0, 550.0, law)]), BLOCK)
    assert r.status == 0
    eps = -r.layers[0].strain
    assert 0.0025 < eps < 0.0225
    assert -r.layers[0].stress == pytest.approx(500.0 + 2000.0 * (eps - 0.0025), rel=1e-12)
    assert r.layers[0].within_strain_limit


def test_strain_limit_reached_first_in_a_very_lightly_reinforced_section():
    law = BilinearHardening(modulus=200_000.0, yield_stress=500.0, hardening_modulus=2000.0,
                            strain_limit=0.0225)
    section = Section.flanged(1500.0, 300.0, 150.0, 700.0, [SteelLayer(150.0, 640.0, law)])
    r = solve(section, BLOCK)
    assert r.status == 2
    assert not r.equilibrium
    assert r.message == STATUS_TEXT[2]
    assert "strain limit" in r.message
    assert not r.layers[0].within_strain_limit
    assert r.net_tensile_strain > 0.0225


def test_elastic_plastic_with_strain_limit_reports_it_too():
    law = ElasticPlastic(modulus=200_000.0, yield_stress=420.0, strain_limit=0.01)
    r = solve(Section.rectangle(300.0, 600.0, [SteelLayer(100.0, 540.0, law)]), BLOCK)
    assert r.status == 2
    assert r.net_tensile_strain > 0.01


def test_steel_that_carries_nothing_has_no_equilibrium():
    dead = PiecewiseLinear(points=((0.002, 0.0),))
    r = solve(Section.rectangle(300.0, 600.0, [SteelLayer(100.0, 540.0, dead)]), BLOCK)
    assert r.status == 1
    assert r.message == STATUS_TEXT[1]
    assert np.isnan(r.c) and np.isnan(r.nominal_moment)


def test_strain_limit_status_per_row_of_a_batch():
    law = BilinearHardening(modulus=200_000.0, yield_stress=500.0, hardening_modulus=0.0,
                            strain_limit=0.02)
    batch = SectionArrays.from_profile(
        thicknesses=[600.0], widths=[300.0], labels=("web",),
        areas=[np.array([100.0, 2000.0])], depths=[np.array([550.0, 550.0])], steel=[law])
    result = solve_arrays(batch, BLOCK)
    assert result.status.tolist() == [2, 0]
    assert result.equilibrium.tolist() == [False, True]
