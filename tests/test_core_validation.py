"""Sections and laws that cannot describe a real member are refused with a clear message."""

import math
import re

import numpy as np
import pytest

from clausewise.core import (
    BilinearHardening,
    ElasticPlastic,
    ParabolaRectangle,
    PiecewiseLinear,
    RectangularBlock,
    Section,
    SectionArrays,
    SectionError,
    SteelLayer,
    solve_arrays,
)
from clausewise.core.errors import ClausewiseError

STEEL = ElasticPlastic(200_000.0, 420.0)
LAYERS = [SteelLayer(1500.0, 540.0, STEEL)]
GOOD = {"flange_width": 800.0, "web_width": 300.0, "flange_depth": 100.0, "depth": 600.0}


def flanged(layers=LAYERS, **changes):
    return Section.flanged(**{**GOOD, **changes}, layers=layers)


def raises(*fragments):
    """A SectionError (also a ValueError) whose message contains every fragment."""
    return pytest.raises(SectionError, match="".join(f"(?=.*{re.escape(f)})" for f in fragments))


def test_section_error_is_a_value_error_and_our_root_error():
    assert issubclass(SectionError, ValueError)
    assert issubclass(SectionError, ClausewiseError)
    with pytest.raises(ValueError):
        flanged(flange_depth=600.0)


@pytest.mark.parametrize("hf", [600.0, 750.0])
def test_flange_not_shallower_than_section(hf):
    with raises("flange depth hf", f"{hf:g}", "h = 600"):
        flanged(flange_depth=hf)


def test_web_wider_than_flange():
    with raises("web width bw", "900", "flange width bf", "800"):
        flanged(web_width=900.0)


@pytest.mark.parametrize(("field", "label"), [("flange_width", "flange width bf"),
                                              ("web_width", "web width bw"),
                                              ("flange_depth", "flange depth hf"),
                                              ("depth", "depth h")])
@pytest.mark.parametrize("value", [-50.0, 0.0, math.nan, math.inf])
def test_non_positive_or_non_finite_dimension(field, label, value):
    with raises(label, repr(value)):
        flanged(**{field: value})


def test_layer_below_the_bottom():
    with raises("steel layer 0", "640", "h = 600"):
        flanged(layers=[SteelLayer(1500.0, 640.0, STEEL)])


def test_layer_at_the_bottom_face_is_outside_too():
    with raises("steel layer 1", "600", "h = 600"):
        flanged(layers=[SteelLayer(1500.0, 540.0, STEEL), SteelLayer(500.0, 600.0, STEEL)])


def test_no_layers():
    with raises("at least one steel layer"):
        flanged(layers=[])


@pytest.mark.parametrize("value", [-1500.0, math.nan])
def test_layer_area_must_be_positive(value):
    with raises("steel layer 0 area", repr(value)):
        flanged(layers=[SteelLayer(value, 540.0, STEEL)])


def test_rectangle_width_and_depth_checked():
    with raises("width", "-300"):
        Section.rectangle(-300.0, 600.0, LAYERS)
    with raises("depth h", "nan"):
        Section.rectangle(300.0, math.nan, LAYERS)


def test_numpy_scalars_are_accepted_as_dimensions():
    # dimensions read from numpy arrays are numpy scalars, not Python floats
    section = Section.flanged(np.float32(800.0), np.int64(300), np.float64(100.0),
                              np.int64(600), [SteelLayer(np.float32(1500.0), np.int64(540), STEEL)])
    assert section.depth == 600.0


@pytest.mark.parametrize(("build", "fragments"), [
    (lambda: RectangularBlock(0.85 * 30, 1.2, 0.003), ("depth_factor", "1.2")),
    (lambda: RectangularBlock(-25.5, 0.8, 0.003), ("RectangularBlock.stress", "-25.5")),
    (lambda: ParabolaRectangle(20.0, 0.004, 0.0035), ("strain_at_peak", "ultimate_strain")),
    (lambda: ParabolaRectangle(20.0, 0.002, math.nan), ("ultimate_strain", "nan")),
    (lambda: ElasticPlastic(200_000.0, 0.0), ("ElasticPlastic.yield_stress", "0.0")),
    (lambda: BilinearHardening(200_000.0, 500.0, -10.0, 0.02), ("hardening_modulus",)),
    (lambda: PiecewiseLinear(((0.01, 450.0), (0.002, 400.0))), ("increasing",)),
    (lambda: PiecewiseLinear(()), ("at least one",)),
])
def test_impossible_laws(build, fragments):
    with raises(*fragments):
        build()


def test_batch_row_with_steel_outside_depth_is_named():
    with raises("1 section(s)", "row 2"):
        SectionArrays.from_profile([np.array([100.0, 100.0, 100.0]), 500.0], [800.0, 300.0],
                                   ("flange", "web"), [1500.0], [np.array([540.0, 590.0, 640.0])],
                                   [STEEL])


def test_concrete_law_arrays_longer_than_the_batch_are_refused():
    batch = Section.flanged(**GOOD, layers=LAYERS).to_arrays()
    law = RectangularBlock(np.array([20.0, 25.0, 30.0]), 0.85, 0.003)
    with pytest.raises(SectionError):
        solve_arrays(batch, law)


def test_steel_law_arrays_set_or_refuse_the_batch_size():
    # scalar geometry with a steel law over three sections: either three sections, or refused
    steel = ElasticPlastic(200_000.0, np.array([300.0, 400.0, 500.0]))
    try:
        batch = SectionArrays.from_profile([100.0, 500.0], [800.0, 300.0], ("flange", "web"),
                                           [1500.0], [540.0], [steel])
    except SectionError:
        return
    result = solve_arrays(batch, RectangularBlock(0.85 * 28.0, 0.85, 0.003))
    assert result.size == 3
