"""Which actions may be left out, and the same treatment of them under every edition.

Load factors (from memory): ACI 318 5.3.1 (318-11: 9.2.1) 1.4D and 1.2D + 1.6L; CSA
A23.3-19 with the national building code 1.4D and 1.25D + 1.5L; AS/NZS 1170.0 4.2.2 1.35G
and 1.2G + 1.5Q; EN 1990 6.10 1.35G + 1.5Q, 6.10a/b with ψ0 = 0.7 (Table A1.1) and
ξ = 0.85 (Table A1.2(B)); IS 456:2000 36.4.1 and Table 18 1.5(D + L).
"""

from __future__ import annotations

import json

import pytest

from clausewise.cli import main
from clausewise.provisions import Actions, BeamDataError, Layer, Status, assess
from clausewise.provisions.batch import assess_many

KNM = 1e6  # N·mm per kN·m

# (dead only, dead with live): the largest factor on D alone, and (D, L) factors together
FACTORS = {
    "aci318-19": (1.4, (1.2, 1.6)), "aci318-14": (1.4, (1.2, 1.6)),
    "aci318-11": (1.4, (1.2, 1.6)), "csa-a23.3:19": (1.4, (1.25, 1.5)),
    "as3600:2018": (1.35, (1.2, 1.5)), "en1992-1-1:2004": (1.35, (1.35, 1.5)),
    "is456:2000": (1.5, (1.5, 1.5)),
}


def test_every_built_in_edition_has_its_load_factors_here(built_in_editions):
    assert set(FACTORS) == set(built_in_editions)


def test_a_live_moment_without_a_dead_one_is_refused_naming_the_field():
    with pytest.raises(BeamDataError, match="moments.dead"):
        Actions(live=90 * KNM)


def test_service_and_factored_moments_together_are_refused():
    with pytest.raises(BeamDataError, match="moments.factored.*not both"):
        Actions(dead=100 * KNM, factored=300 * KNM)


def test_live_only_beam_gets_demand_from_the_live_factor(built_in_edition, floor_tee):
    # the former defect: EN and IS took a missing dead moment as 0, the others gave no demand
    a = assess(floor_tee(actions=Actions(dead=0.0, live=90 * KNM)), built_in_edition)
    _, (_, live) = FACTORS[built_in_edition]
    assert a.demand.value == pytest.approx(live * 90 * KNM, rel=1e-12)


def test_dead_only_beam_gets_the_dead_load_combination(built_in_edition, floor_tee):
    a = assess(floor_tee(actions=Actions(dead=100 * KNM)), built_in_edition)
    dead_only, _ = FACTORS[built_in_edition]
    assert a.demand.value == pytest.approx(dead_only * 100 * KNM, rel=1e-12)
    assert a.status in (Status.PASS, Status.FAIL)


def test_dead_and_live_take_the_larger_combination(built_in_edition, floor_tee):
    a = assess(floor_tee(actions=Actions(dead=100 * KNM, live=60 * KNM)), built_in_edition)
    dead_only, (d, l_) = FACTORS[built_in_edition]
    assert a.demand.value == pytest.approx(max(dead_only * 100, d * 100 + l_ * 60) * KNM,
                                           rel=1e-12)


def test_factored_only_beam_takes_the_moment_as_given(built_in_edition, floor_tee):
    a = assess(floor_tee(actions=Actions(factored=250 * KNM)), built_in_edition)
    assert a.demand.value == 250 * KNM
    assert a.demand.governing_candidate.label == "as given"


def test_beam_without_actions_is_capacity_only_on_both_paths(built_in_edition, floor_tee):
    beam = floor_tee()
    a = assess(beam, built_in_edition)
    assert a.demand is None and a.status is Status.CAPACITY_ONLY and not a.status.failed
    assert a.design_resistance.value > 0 and "capacity only" in a.summary()
    row = assess_many([beam], [built_in_edition])[built_in_edition].row(0)
    assert row["status"] == "capacity only" and row["demand"] is None
    assert row["governing_check"] == a.governing.name


def test_a_failing_check_still_fails_without_actions(built_in_edition, floor_tee):
    # 2 x 10 mm bars are far below every edition's minimum steel
    a = assess(floor_tee(tension=(Layer(area=157.0, depth=540.0),)), built_in_edition)
    assert a.status is Status.FAIL and a.status.failed


def test_en1990_pair_of_expressions(edition_with, floor_tee):
    chosen = edition_with("en1992-1-1:2004", combination_rule="6.10a/b")
    a = assess(floor_tee(actions=Actions(dead=100 * KNM, live=60 * KNM)), chosen)
    # 6.10a: 1.35 x 100 + 0.7 x 1.5 x 60 = 198; 6.10b: 0.85 x 1.35 x 100 + 1.5 x 60 = 204.75
    values = {c.label: c.value / KNM for c in a.demand.candidates}
    assert values == pytest.approx({"1.35G + 0.7×1.5Q (6.10a)": 198.0,
                                    "0.85×1.35G + 1.5Q (6.10b)": 204.75}, rel=1e-12)
    assert a.demand.value == pytest.approx(204.75 * KNM, rel=1e-12)
    # with the dead moment dominant, 6.10a governs: 1.35 x 300 + 1.05 x 20 = 426
    b = assess(floor_tee(actions=Actions(dead=300 * KNM, live=20 * KNM)), chosen)
    assert b.demand.governing_candidate.label.endswith("(6.10a)")
    assert b.demand.value == pytest.approx(426.0 * KNM, rel=1e-12)


# --- the command line: capacity only is not a failure -----------------------------------------

BEAM_FILE = """
[project]
name = "Harrowgate depot, level 1"  # an invented building

[[beam]]
id = "C1"
shape = "T"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "150 mm"
concrete_strength = "32 MPa"
yield_strength = "500 MPa"
tension = [{ bars = "4 x 25 mm", depth = "540 mm" }]
floor = { span = "8 m", continuity = "interior", clear_left = "2.7 m", clear_right = "2.7 m" }
%s
"""


@pytest.mark.parametrize(("moments", "statuses", "exit_status"), [
    ("", {"capacity only"}, 0),
    ('moments = { dead = "100 kN m", live = "60 kN m" }', {"pass"}, 0),
    ('moments = { factored = "900 kN m" }', {"fail"}, 1),
])
def test_exit_status_with_and_without_actions(tmp_path, capsys, moments, statuses,
                                              exit_status):
    path = tmp_path / "depot.toml"
    path.write_text(BEAM_FILE % moments, encoding="utf-8")
    status = main(["check", str(path), "--format", "json", "--edition", "aci318-19",
                   "--edition", "en1992-1-1:2004"])
    results = json.loads(capsys.readouterr().out)["results"]
    assert {r["status"] for r in results} == statuses and status == exit_status
