"""Parabola-rectangle concrete law: the handbook coefficients and their exact values."""

from fractions import Fraction

import numpy as np
import pytest

from clausewise.core import ElasticPlastic, ParabolaRectangle, Section, SteelLayer, solve

FCD = 20.0  # MPa
LAW = ParabolaRectangle(peak_stress=FCD, strain_at_peak=0.002, ultimate_strain=0.0035, exponent=2)


def exact_coefficients(strain_at_peak, ultimate_strain):
    """Resultant and centroid of the n = 2 parabola-rectangle over a rectangle, by hand.

    With k = eps_c2 / eps_cu the stress is fcd over (1 - k) x and a parabola over k x:
    force / (fcd b x) = (1 - k) + (2/3) k = 1 - k/3;
    moment about the face / (fcd b x^2) = (1 - k)^2 / 2 + (2/3) k (1 - k) + k^2 / 4
    (the parabola's own centroid sits 3/8 of its height from its peak end).
    """
    k = Fraction(strain_at_peak) / Fraction(ultimate_strain)
    alpha = 1 - k / 3
    moment = (1 - k) ** 2 / 2 + Fraction(2, 3) * k * (1 - k) + k * k / 4
    return alpha, moment / alpha


def test_hand_derivation_gives_17_over_21_and_99_over_238():
    alpha, beta = exact_coefficients(Fraction(2, 1000), Fraction(35, 10000))
    assert alpha == Fraction(17, 21)
    assert beta == Fraction(99, 238)


def solved_rectangle(area):
    steel = ElasticPlastic(modulus=200_000.0, yield_stress=435.0)
    return solve(Section.rectangle(300.0, 600.0, [SteelLayer(area, 550.0, steel)]), LAW)


@pytest.mark.parametrize("area", [600.0, 1500.0, 3000.0])
def test_resultant_matches_handbook_coefficients(area):
    r = solved_rectangle(area)
    ratio_force = r.concrete_force / (FCD * 300.0 * r.c)
    ratio_depth = r.concrete_depth / r.c
    # 0.810 fcd b x at 0.416 x (EN 1992-1-1 handbook coefficients, from memory)
    assert round(ratio_force, 3) == 0.810
    assert round(ratio_depth, 3) == 0.416
    # exact closed form derived by hand above
    assert ratio_force == pytest.approx(17 / 21, rel=1e-13)
    assert ratio_depth == pytest.approx(99 / 238, rel=1e-13)


def test_strip_resultants_over_one_strip_give_exact_coefficients():
    c = np.array([50.0, 120.0, 400.0])
    top = np.zeros((1, 3))  # one strip (a row), three sections
    bottom = np.full((1, 3), 1000.0)  # strip deeper than the zone
    force, moment = LAW.strip_resultants(c, top, bottom)
    np.testing.assert_allclose(force[0], 17 / 21 * FCD * c, rtol=1e-14)
    np.testing.assert_allclose(moment[0] / force[0], 99 / 238 * c, rtol=1e-14)


def test_strip_resultants_add_over_split_strips():
    c = np.array([200.0])
    whole = LAW.strip_resultants(c, np.array([[0.0]]), np.array([[500.0]]))
    edges = np.array([[0.0], [37.0], [90.0], [150.0], [500.0]])  # four strips, one section
    parts = LAW.strip_resultants(c, edges[:-1], edges[1:])
    assert parts[0].sum() == pytest.approx(whole[0][0, 0], rel=1e-14)
    assert parts[1].sum() == pytest.approx(whole[1][0, 0], rel=1e-14)


def test_stress_at_follows_parabola_then_plateau():
    c = np.array([100.0])
    depths = np.array([[0.0], [30.0], [50.0], [100.0], [120.0]])  # five depths, one section
    stress = LAW.stress_at(c, depths)[:, 0]
    # strain 0.0035 (c - y) / c; parabola fcd (1 - (1 - eps/0.002)^2) (common practice, no source)
    eps = 0.0035 * (100.0 - depths[:, 0]) / 100.0
    expected = np.where(eps >= 0.002, FCD,
                        FCD * (1 - (1 - np.clip(eps, 0, None) / 0.002) ** 2))
    np.testing.assert_allclose(stress, expected, rtol=1e-14, atol=1e-12)
    assert stress[0] == FCD
    assert stress[-1] == 0.0
    # at y = 50 the strain is 0.00175: fcd (1 - 0.125^2) = 0.984375 fcd
    assert stress[2] == pytest.approx(0.984375 * FCD, rel=1e-14)
