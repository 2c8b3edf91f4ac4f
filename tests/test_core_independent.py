"""The core against an independent calculation: shapely polygons, scipy quadrature and brentq.

Nothing here reuses the core's integration or root finding: the compression zone is a
shapely polygon of the physical section clipped at the zone depth, stresses are written
out again, and force equilibrium is solved with scipy's brentq.
"""

import math
import warnings
from dataclasses import dataclass
from functools import cached_property

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import IntegrationWarning, quad
from scipy.optimize import brentq
from shapely.geometry import LineString, Polygon, box
from shapely.ops import unary_union

from clausewise.core import (
    ElasticPlastic,
    ParabolaRectangle,
    RectangularBlock,
    Section,
    SteelLayer,
    solve,
)

SETTINGS = settings(max_examples=150, deadline=None)


@dataclass(frozen=True)
class Case:
    bf: float
    bw: float
    hf: float
    h: float
    sagging: bool  # flange on the compression side
    ell: bool  # flange to one side only (L beam) instead of both (T beam)
    layers: tuple[tuple[float, float], ...]  # (area, depth from the compression face)
    fy: float
    es: float

    def section(self):
        steel = ElasticPlastic(modulus=self.es, yield_stress=self.fy)
        layers = [SteelLayer(a, y, steel) for a, y in self.layers]
        build = Section.flanged if self.sagging else Section.hogging
        return build(self.bf, self.bw, self.hf, self.h, layers)

    @cached_property
    def polygon(self):
        """The physical section, y upwards from the soffit, flange on top."""
        left = 0.0 if self.ell else -self.bf / 2
        web_left = 0.0 if self.ell else -self.bw / 2
        flange = box(left, self.h - self.hf, left + self.bf, self.h)
        web = box(web_left, 0.0, web_left + self.bw, self.h - self.hf)
        shape = unary_union([flange, web])
        assert isinstance(shape, Polygon)
        return shape

    def zone(self, depth):
        """The polygon clipped to ``depth`` below the compression face."""
        lo, hi = (self.h - depth, self.h) if self.sagging else (0.0, depth)
        return self.polygon.intersection(box(-1e5, lo, 1e5, hi))

    def zone_centroid_depth(self, depth):
        y = self.zone(depth).centroid.y
        return self.h - y if self.sagging else y

    def polygon_width(self, depth):
        y = self.h - depth if self.sagging else depth
        return self.polygon.intersection(LineString([(-1e5, y), (1e5, y)])).length

    def width(self, depth):
        """The same width written directly from the dimensions (fast, for root finding)."""
        if self.sagging:
            return self.bf if depth < self.hf else self.bw
        return self.bw if depth < self.h - self.hf else self.bf

    def width_change(self):
        return self.hf if self.sagging else self.h - self.hf

    def steel_stress(self, strain):
        # elastic-perfectly plastic (common practice, no source)
        return max(-self.fy, min(self.fy, self.es * strain))


@st.composite
def cases(draw):
    h = draw(st.floats(300.0, 1200.0))
    hf = draw(st.floats(0.08, 0.45)) * h
    bw = draw(st.floats(150.0, 600.0))
    bf = bw + draw(st.one_of(st.just(0.0), st.floats(0.0, 2500.0)))
    d = h - draw(st.floats(30.0, 0.15 * h))
    ratio = draw(st.floats(0.0005, 0.08))
    layers = [(ratio * bw * d, d)]
    if draw(st.booleans()):  # a second tension layer above the first
        layers.append((draw(st.floats(0.1, 1.0)) * layers[0][0], d - draw(st.floats(25.0, 80.0))))
    if draw(st.booleans()):  # compression steel
        layers.append((draw(st.floats(0.05, 0.8)) * layers[0][0], draw(st.floats(30.0, 80.0))))
    return Case(bf=bf, bw=bw, hf=hf, h=h, sagging=draw(st.booleans()), ell=draw(st.booleans()),
                layers=tuple(layers), fy=draw(st.floats(250.0, 600.0)),
                es=draw(st.floats(190_000.0, 210_000.0)))


blocks = st.builds(RectangularBlock, stress=st.floats(12.0, 80.0),
                   depth_factor=st.floats(0.6, 1.0), ultimate_strain=st.floats(0.0025, 0.0038))


@st.composite
def parabolas(draw):
    peak = draw(st.floats(0.0017, 0.0026))
    return ParabolaRectangle(peak_stress=draw(st.floats(10.0, 60.0)), strain_at_peak=peak,
                             ultimate_strain=draw(st.floats(max(peak, 0.0026), 0.0035)),
                             exponent=draw(st.one_of(st.just(2.0), st.floats(1.4, 2.0))))


# --- independent stress laws ------------------------------------------------------------


def block_stress(law, c, y):
    return law.stress if y < law.depth_factor * c else 0.0


def parabola_stress(law, c, y):
    # parabola-rectangle (EN 1992-1-1 design diagram, from memory)
    eps = law.ultimate_strain * (c - y) / c
    if eps <= 0:
        return 0.0
    if eps >= law.strain_at_peak:
        return law.peak_stress
    return law.peak_stress * (1.0 - (1.0 - eps / law.strain_at_peak) ** law.exponent)


def integrate(f, lo, hi, points):
    inner = sorted(p for p in points if lo < p < hi)
    with warnings.catch_warnings():
        warnings.simplefilter("error", IntegrationWarning)
        value, _ = quad(f, lo, hi, points=inner or None, epsabs=0.0, epsrel=1e-13, limit=200)
    return value


def parabola_resultant(case, law, c, width):
    """Force and first moment about the compression face, by quadrature over depth."""
    start = c * (1.0 - law.strain_at_peak / law.ultimate_strain)
    points = [case.width_change(), start]

    def stress_width(y):
        return parabola_stress(law, c, y) * width(y)

    force = integrate(stress_width, 0.0, c, points)
    moment = integrate(lambda y: stress_width(y) * y, 0.0, c, points)
    return force, moment


# --- independent equilibrium --------------------------------------------------------------


def concrete_resultant(case, law, c):
    if isinstance(law, RectangularBlock):
        a = law.depth_factor * c
        zone = case.zone(a)
        return law.stress * zone.area, law.stress * zone.area * case.zone_centroid_depth(a)
    return parabola_resultant(case, law, c, case.width)


def stress_of(law):
    return block_stress if isinstance(law, RectangularBlock) else parabola_stress


def steel_forces(case, law, c):
    """Net force of each layer (compression positive), displaced concrete included."""
    concrete_stress = stress_of(law)
    forces = []
    for area, y in case.layers:
        strain = law.ultimate_strain * (c - y) / c  # plane sections (common practice, no source)
        forces.append(area * (case.steel_stress(strain) - concrete_stress(law, c, y)))
    return forces


def net_force(case, law, c):
    return concrete_resultant(case, law, c)[0] + sum(steel_forces(case, law, c))


def shallowest_bracket_end(case, law):
    """Upper end of a bracket holding only the shallowest equilibrium.

    Net force rises with c except where the edge of a rectangular block passes a bar:
    that bar then starts to displace concrete and the net force drops by As * stress.
    Where the net force is already positive just before such a drop, a root lies
    below it, and a second one may lie above.
    """
    deepest = max(d for _, d in case.layers)
    end = deepest
    if isinstance(law, RectangularBlock):  # the parabola's stress is continuous in c
        for _, y in case.layers:
            c_edge = y / law.depth_factor * (1 - 1e-12)
            if c_edge < end and net_force(case, law, c_edge) > 0:
                end = c_edge
    return end


def own_solution(case, law):
    deepest = max(y for _, y in case.layers)
    c = brentq(lambda x: net_force(case, law, x), 1e-9 * deepest,
               shallowest_bracket_end(case, law), xtol=1e-13 * deepest, rtol=1e-14,
               maxiter=500)
    _, concrete_moment = concrete_resultant(case, law, c)
    moment = -(concrete_moment + sum(f * y for f, (_, y) in
                                     zip(steel_forces(case, law, c), case.layers, strict=True)))
    return c, moment


# --- tests --------------------------------------------------------------------------------


@SETTINGS
@given(case=cases(), law=blocks)
def test_block_zone_matches_clipped_polygon(case, law):
    r = solve(case.section(), law)
    assert r.status == 0
    a = law.depth_factor * r.c
    assert r.zone_depth == pytest.approx(a, rel=1e-14)
    zone = case.zone(a)
    assert r.concrete_force == pytest.approx(law.stress * zone.area, rel=1e-11)
    assert r.concrete_depth == pytest.approx(case.zone_centroid_depth(a), rel=1e-10)
    if abs(a - case.hf) > 1e-9 * case.hf:  # away from the flange bottom itself
        assert r.block_in_flange == (case.sagging and a < case.hf)


@settings(SETTINGS, max_examples=100)  # quadrature over shapely widths is the slow part
@given(case=cases(), law=parabolas())
def test_parabola_zone_matches_quadrature_over_clipped_polygon(case, law):
    r = solve(case.section(), law)
    assert r.status == 0
    assert r.zone_depth == pytest.approx(r.c, rel=1e-14)
    force, moment = parabola_resultant(case, law, r.c, case.polygon_width)
    assert r.concrete_force == pytest.approx(force, rel=1e-10)
    assert r.concrete_depth == pytest.approx(moment / force, rel=1e-10)
    # the clipped polygon also bounds the zone: the area under full stress is an upper bound
    assert r.concrete_force <= law.peak_stress * case.zone(r.c).area * (1 + 1e-12)


@SETTINGS
@given(case=cases(), law=st.one_of(blocks, parabolas()))
def test_brentq_equilibrium_gives_same_depth_and_moment(case, law):
    # where a bar entering the block makes several equilibria, both pick the shallowest
    r = solve(case.section(), law)
    assert r.status == 0
    c, moment = own_solution(case, law)
    assert r.c == pytest.approx(c, rel=1e-9)
    assert r.nominal_moment == pytest.approx(moment, rel=1e-9)
    assert math.isfinite(r.nominal_moment) and r.nominal_moment > 0
