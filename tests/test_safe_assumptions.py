"""Where the file leaves a fact out, the reader takes the side an engineer would: the
one on which the check is stricter."""

from __future__ import annotations

import pytest

from clausewise.beamfile import parse_schedule
from clausewise.provisions import assess

HOGGING_T = """
[project]
name = "Tessel Row car park, level 1"   # invented
units = "SI"

[[beam]]
id = "H1"
shape = "T"
bending = "hogging"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "150 mm"
effective_flange_width = "1500 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
tension = [{ area = "2000 mm2", depth = "540 mm" }]
moments = { factored = "300 kN m" }
%s
"""


def minimum_steel(text: str) -> float:
    [entry] = parse_schedule(text, "h1.toml").entries
    a = assess(entry.beam, "aci318-19")
    [check] = [c for c in a.checks if c.name == "minimum tension reinforcement"]
    return float(check.limit)


def test_a_beam_without_a_floor_is_taken_as_determinate_for_minimum_steel():
    # ACI 318-19 9.6.1.2 (from memory): As,min = max(0.25 √f'c / fy, 1.4 / fy) bw d, and
    # for a statically determinate beam with its flange in tension bw becomes the lesser
    # of bf and 2 bw: max(0.25·√30, 1.4)/420 = 1.4/420; 2·300 = 600 < 1500 mm, so
    # As,min = 1.4/420 · 600 · 540 = 1080 mm² (540 mm² for a continuous beam). The 4/3
    # waiver of 9.6.1.3 does not bind at 300 kN m.
    assert minimum_steel(HOGGING_T % "") == pytest.approx(1.4 / 420 * 600 * 540, rel=1e-12)
    [entry] = parse_schedule(HOGGING_T % "", "h1.toml").entries
    assert entry.shown["statically determinate"].startswith("yes (assumed")
    assert minimum_steel(HOGGING_T % "statically_determinate = false") == pytest.approx(
        1.4 / 420 * 300 * 540, rel=1e-12)
