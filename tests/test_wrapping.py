"""Editions that wrap a topic of their base: the answer below, changed, with its own clause.

The example firm edition (fixtures/local-editions, Fennick & Lyle, each overhang at most
6 hf over EN 1992-1-1:2004) is loaded here from its source file next to the built-in
EN edition, so these tests need no installed copy. Hand values: EN 1992-1-1:2004
5.3.2.1(3) beff,i = 0.2 bi + 0.1 l0 ≤ 0.2 l0 and ≤ bi, Figure 5.2 l0 = 0.7 l in an
interior span (from memory); each overhang is the least of its own limits (common
practice).
"""

from __future__ import annotations

import importlib.util
import json
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from clausewise.beamfile import parse_schedule
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Check,
    Continuity,
    EditionInfo,
    FloorLayout,
    Layer,
    PluginError,
    Registry,
    Resistance,
    Sense,
    Shape,
    assess,
    evaluate,
    hookimpl,
    per_beam,
)
from clausewise.provisions.batch import assess_many, stack_beams
from clausewise.provisions.beam import Context
from clausewise.provisions.widths import (
    SEPARATE,
    OverhangRule,
    add_overhang_rules,
    overhang_envelope,
)
from clausewise.results import record, run, to_json

ROOT = Path(__file__).resolve().parents[1]
SOURCE = ROOT / "fixtures/local-editions/local_editions/fennick_beams.py"
EN, FIRM = "en1992-1-1:2004", "fennick-beams:2025"


def firm_module():
    spec = importlib.util.spec_from_file_location("fennick_beams_under_test", SOURCE)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def en_registry(*plugins) -> Registry:
    registry = Registry(only=frozenset({EN}), strict=True)
    registry.load_entry_points()
    for plugin in plugins:
        registry.register(plugin)
    return registry


@pytest.fixture(scope="module")
def both() -> Registry:
    return en_registry(firm_module())


def unequal_tee(**changes) -> Beam:
    """bw 300, hf 120, interior span 7.5 m, clear distances 1.0 m and 3.0 m."""
    fields = dict(id="unequal sides", shape=Shape.TEE, bending=Bending.SAGGING,
                  web_width=300.0, depth=600.0, concrete_strength=30.0, yield_strength=500.0,
                  tension=(Layer(1800.0, 540.0),), flange_thickness=120.0,
                  layout=FloorLayout(7500.0, Continuity.INTERIOR, clear_left=1000.0,
                                     clear_right=3000.0),
                  actions=Actions(dead=150e6, live=80e6))
    return Beam(**(fields | changes))


def hand_width(bw, hf, span_fraction, span, clears, house_multiple=None):
    """bw + sum over the sides of the least of that side's limits."""
    l0 = span_fraction * span
    total = bw
    for clear in clears:
        bi = clear / 2
        limits = [0.2 * bi + 0.1 * l0, 0.2 * l0, bi]
        if house_multiple is not None:
            limits.append(house_multiple * hf)
        total += min(limits)
    return total


# --- the house rule on a T with unequal sides --------------------------------------------

def test_house_rule_limits_each_side_by_its_own_least_limit(both):
    beam = unequal_tee()
    firm, base = assess(beam, FIRM, registry=both), assess(beam, EN, registry=both)
    # left: bi = 500 (0.2·500 + 525 = 625, 0.2 l0 = 1050); right: 0.2·1500 + 525 = 825,
    # cut to 6 hf = 720 by the house rule
    assert base.effective_width.value == pytest.approx(hand_width(300, 120, 0.7, 7500,
                                                                  (1000, 3000)))
    assert base.effective_width.value == pytest.approx(1625.0)
    assert firm.effective_width.value == pytest.approx(
        hand_width(300, 120, 0.7, 7500, (1000, 3000), house_multiple=6))
    assert firm.effective_width.value == pytest.approx(1520.0)
    # the shortcut "bw + 12 hf" on the total would give min(1625, 1740) = 1625: wrong
    assert min(base.effective_width.value, 300 + 12 * 120) == pytest.approx(1625.0)


def test_the_audit_cites_each_side_by_the_rule_that_governs_it(both):
    width = assess(unequal_tee(), FIRM, registry=both).effective_width
    left, right = width.overhangs
    assert (left.side, left.width, left.clause.edition, left.clause.ref) == (
        "left", pytest.approx(500.0), EN, "5.3.2.1(3)")
    assert left.rule.label.startswith("bi")
    assert (right.side, right.width, right.clause.edition, right.clause.ref) == (
        "right", pytest.approx(720.0), FIRM, "FL-3")
    governing = width.governing_candidate
    assert governing.label == SEPARATE
    assert FIRM in governing.clause.edition and "FL-3" in governing.clause.ref
    assert "right 720 mm by 6 hf (fennick-beams:2025 FL-3)" in governing.basis
    # the base's own rules are all still candidates, not restated by the firm
    base = assess(unequal_tee(), EN, registry=both).effective_width
    assert [c.label for c in base.candidates if c.label != SEPARATE] == [
        c.label for c in width.candidates
        if c.label != SEPARATE and c.clause.edition == EN]


def test_where_the_house_rule_governs_no_side_the_base_is_credited(both):
    beam = unequal_tee(layout=FloorLayout(7500.0, Continuity.INTERIOR, clear_left=1000.0,
                                          clear_right=1000.0), flange_thickness=150.0)
    width = assess(beam, FIRM, registry=both).effective_width
    # each side: min(0.2·500 + 525, 1050, 500, 6·150 = 900) = 500 (bi)
    assert width.value == pytest.approx(300 + 2 * 500)
    assert {o.clause.edition for o in width.overhangs} == {EN}
    assert width.governing_candidate.clause.edition == EN


def test_the_base_assessed_alone_is_unchanged_by_the_firm_being_installed(both):
    alone = en_registry()
    beam = unequal_tee()
    with_firm, without = assess(beam, EN, registry=both), assess(beam, EN, registry=alone)
    assert with_firm.effective_width.value == without.effective_width.value == 1625.0
    assert with_firm.design_resistance.value == without.design_resistance.value
    assert all(t.wrapped_by == () for t in with_firm.topics)


def test_an_ell_beam_takes_the_house_rule_on_its_one_slab_side(both):
    beam = unequal_tee(shape=Shape.ELL, layout=FloorLayout(
        7500.0, Continuity.INTERIOR, clear_left=3000.0))
    width = assess(beam, FIRM, registry=both).effective_width
    # one side: min(0.2·1500 + 525, 1050, 1500, 720) = 720
    assert width.value == pytest.approx(300 + 720)
    assert [o.clause.ref for o in width.overhangs] == ["FL-3"]


def test_a_batch_gives_each_beam_its_single_result(both):
    clears = [(1000.0, 3000.0), (3000.0, 1000.0), (1000.0, 1000.0), (4000.0, 4000.0)]
    beams = [unequal_tee(id=f"b{i}", layout=FloorLayout(7500.0, Continuity.INTERIOR,
                                                        clear_left=a, clear_right=b))
             for i, (a, b) in enumerate(clears)]
    edition = both.edition(FIRM)
    ev = evaluate(stack_beams(beams), edition, Context())
    singles = [assess(b, edition).effective_width.value for b in beams]
    assert np.allclose(ev.effective_width.value, singles, rtol=1e-12)
    assert np.allclose(singles, [hand_width(300, 120, 0.7, 7500, c, 6) for c in clears])
    right = ev.effective_width.overhangs[1]  # clear 3000, 1000, 1000, 4000 mm on the right
    assert [right.rules[i].clause.ref for i in right.governing] == [
        "FL-3", "5.3.2.1(3)", "5.3.2.1(3)", "FL-3"]


# --- who answered -------------------------------------------------------------------------

def test_the_assessment_names_who_answered_and_who_wrapped(both):
    a = assess(unequal_tee(), FIRM, registry=both)
    topics = {t.hook: t for t in a.topics}
    assert topics["effective_flange_width"].answered_by == (EN,)
    assert topics["effective_flange_width"].wrapped_by == (FIRM,)
    assert topics["concrete_law"].answered_by == (EN,) and not topics["concrete_law"].wrapped_by
    assert topics["edition_parameters"].answered_by == (EN, FIRM)
    layering = both.edition(FIRM).layering("effective_flange_width")
    assert (layering.answered_by, layering.wrapped_by) == ((EN,), (FIRM,))


SCHEDULE = """
[project]
name = "Ostwick market hall"

[[beam]]
id = "M-4"
shape = "T"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "120 mm"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{ area = "1800 mm2", depth = "540 mm" }]
floor = {span = "7500 mm", continuity = "interior", clear_left = "1000 mm", clear_right = "3000 mm"}
moments = { dead = "150 kN m", live = "80 kN m" }
"""


def test_results_and_explain_show_who_answered_and_the_sides(both):
    from rich.console import Console

    from clausewise.report import beam_panel, explain_report

    schedule = parse_schedule(SCHEDULE, "market.toml")
    (outcome,) = run(schedule, [both.edition(FIRM)], None, "persistent")
    data = json.loads(to_json({"results": [record(outcome)]}))["results"][0]
    width_topic = next(t for t in data["topics"] if t["hook"] == "effective_flange_width")
    assert width_topic == {"hook": "effective_flange_width", "answered_by": [EN],
                           "wrapped_by": [FIRM]}
    sides = {o["side"]: o for o in data["effective_width"]["overhangs"]}
    assert sides["right"]["width"] == pytest.approx(720.0)
    assert sides["right"]["clause"]["edition"] == FIRM
    console = Console(record=True, width=200, file=open("/dev/null", "w"))  # noqa: SIM115
    console.print(explain_report(schedule, outcome))
    text = " ".join(console.export_text().split())
    assert "who answered each topic" in text
    assert f"effective_flange_width {EN} {FIRM}" in text
    assert "right 720 mm 6 hf FL-3" in text
    console.print(beam_panel(outcome))  # the calculation sheet of the beam
    sheet = " ".join(console.export_text().split())
    assert f"{FIRM} wrapped effective_flange_width" in sheet


# --- wrapping other topics, and what goes wrong ------------------------------------------

class TightensSteelCap:
    """Wraps the ductility checks: the maximum steel at most 3 % instead of 4 %."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-cap:2025", "tighter steel cap", 2025, extends=EN)

    @hookimpl(wrapper=True)
    def ductility_limits(self, section):
        checks = yield
        clause = EditionInfo("xx-cap:2025", "", 2025).clause("XC-1", "steel at most 3 %")
        return [replace(c, limit=0.03 * section.area, clause=clause)
                if c.name == "maximum reinforcement" else c for c in checks]


class ScalesFactor:
    """Wraps the member factor: 0.9 on the base's 1.0, its own clause."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-scale:2025", "scaled member factor", 2025, extends="xx-cap:2025")

    @hookimpl(wrapper=True)
    def resistance_factor(self):
        base = yield
        clause = EditionInfo("xx-scale:2025", "", 2025).clause("XS-2", "member factor")
        factor = replace(base.factor, value=0.9 * base.factor.value, clause=clause,
                         basis="0.9 times the base's factor")
        return Resistance(factor, base.regime, base.requirement)


def test_wrappers_tighten_a_check_and_scale_a_factor_over_two_layers():
    registry = en_registry(TightensSteelCap(), ScalesFactor())
    beam = unequal_tee()
    base, top = assess(beam, EN, registry=registry), assess(beam, "xx-scale:2025",
                                                             registry=registry)
    cap = {c.name: c for c in top.checks}["maximum reinforcement"]
    base_cap = {c.name: c for c in base.checks}["maximum reinforcement"]
    # As,max = 0.03 Ac in place of 0.04 Ac (EN 1992-1-1 9.2.1.1(3) recommends 0.04)
    assert cap.limit == pytest.approx(base_cap.limit * 0.03 / 0.04)
    assert cap.clause.ref == "XC-1"
    assert top.design_resistance.value == pytest.approx(0.9 * base.design_resistance.value)
    topics = {t.hook: t for t in top.topics}
    assert topics["ductility_limits"].wrapped_by == ("xx-cap:2025",)
    assert topics["resistance_factor"].wrapped_by == ("xx-scale:2025",)


class ReplacesWidth:
    """Replaces the width topic outright above a layer that wraps it."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-replace:2025", "given width", 2025, extends=FIRM)

    @hookimpl
    def effective_flange_width(self, beam):
        rule = OverhangRule.on_every_side(beam, "400 mm", 400.0,
                                          EditionInfo("xx-replace:2025", "", 2025).clause(
                                              "XR-1", "fixed overhang"))
        return overhang_envelope(beam, [rule])


def test_a_layer_that_replaces_a_topic_replaces_what_was_wrapped_below():
    registry = en_registry(firm_module(), ReplacesWidth())
    a = assess(unequal_tee(), "xx-replace:2025", registry=registry)
    assert a.effective_width.value == pytest.approx(300 + 2 * 400)
    topic = next(t for t in a.topics if t.hook == "effective_flange_width")
    assert (topic.answered_by, topic.wrapped_by) == (("xx-replace:2025",), ())
    layering = registry.edition("xx-replace:2025").layering("effective_flange_width")
    assert (layering.answered_by, layering.wrapped_by) == (("xx-replace:2025",), ())


class TighterStill:
    """A second wrapping layer over the firm: 5 hf per side."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-five:2025", "five hf", 2025, extends=FIRM)

    @hookimpl(wrapper=True)
    def effective_flange_width(self, beam):
        base = yield
        return add_overhang_rules(base, beam, OverhangRule.on_every_side(
            beam, "5 hf", 5 * beam.flange_thickness,
            EditionInfo("xx-five:2025", "", 2025).clause("X5", "five hf")))


def test_wrappers_of_two_layers_nest_the_lowest_first():
    registry = en_registry(firm_module(), TighterStill())
    a = assess(unequal_tee(), "xx-five:2025", registry=registry)
    # left min(625, 1050, 500, 720, 600) = 500; right min(825, 1050, 1500, 720, 600) = 600
    assert a.effective_width.value == pytest.approx(300 + 500 + 600)
    assert [o.clause.ref for o in a.effective_width.overhangs] == ["5.3.2.1(3)", "X5"]
    topic = next(t for t in a.topics if t.hook == "effective_flange_width")
    assert topic.wrapped_by == (FIRM, "xx-five:2025")
    assert "bw + 6 hf on each side" in [c.label for c in a.effective_width.candidates]


class BadWrapper:
    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-bad:2025", "wrapper that loses the answer", 2025, extends=EN)

    @hookimpl(wrapper=True)
    def concrete_law(self):
        yield
        return 0.85


class OldStyle:
    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-old:2025", "old hookwrapper", 2025, extends=EN)

    @hookimpl(hookwrapper=True)
    def concrete_law(self):
        yield


def test_a_wrapper_answering_the_wrong_type_is_named():
    registry = en_registry()
    registry.register(BadWrapper())
    with pytest.raises(PluginError, match="concrete_law of layer 'xx-bad:2025' returned float"):
        assess(unequal_tee(), "xx-bad:2025", registry=registry)


def test_the_old_wrapper_style_is_refused_with_what_to_write():
    registry = Registry(only=frozenset({EN}))
    registry.load_entry_points()
    record_ = registry.register(OldStyle(), "old")
    assert not record_.ok and "wrapper=True" in record_.error


def test_per_side_rules_cannot_be_added_to_a_total_width_answer():
    from clausewise.provisions import Candidate, Envelope
    from clausewise.provisions.vocabulary import Clause

    total = Envelope.smallest("effective flange width", "b_eff",
                              [Candidate("bw + 16 hf", 2200.0, Clause("x", "y", "z"))], "mm")
    with pytest.raises(TypeError, match="not built from per-side overhang rules"):
        add_overhang_rules(total, unequal_tee())


def test_answer_checks_cover_items_of_a_list():
    class ListOfNumbers:
        @hookimpl
        def edition_info(self):
            return EditionInfo("xx-list:2025", "checks as numbers", 2025, extends=EN)

        @hookimpl
        def additional_checks(self):
            return [Check("ok", 1.0, 2.0, "at most", EditionInfo("xx-list:2025", "", 2025)
                          .clause("A", "b")), 3.0]

    registry = en_registry()
    registry.register(ListOfNumbers())
    with pytest.raises(PluginError, match="additional_checks of layer 'xx-list:2025' "
                                          "returned float"):
        assess(unequal_tee(), "xx-list:2025", registry=registry)


class UtilisationCap:
    """An invented firm's rule: design moment at most 0.95 of the design resistance."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-cap:2025", "utilisation cap of an invented firm", 2025,
                           extends=EN)

    @hookimpl
    def additional_checks(self, response, demand, resistance):
        if demand is None:
            return []
        cap = per_beam(0.95 * resistance.factor.value * response.nominal_moment)
        return [Check("utilisation cap", demand.value, cap, Sense.AT_MOST,
                      EditionInfo("xx-cap:2025", "", 2025).clause("F-1", "95 % cap"),
                      "M_Ed", "N·mm")]


@pytest.mark.parametrize("moment", [370e6, 400e6])  # 0.90 and 0.97 of M_Rd = 413.2 kN·m
def test_a_firm_rule_sees_the_demand_and_the_resistance_in_both_paths(moment):
    """The cap sits at 0.95 M_Rd: its utilisation is the strength check's over 0.95
    (by hand), for one beam and a batch alike."""
    registry = en_registry(UtilisationCap())
    beam = unequal_tee(actions=Actions(factored=moment))
    a = assess(beam, "xx-cap:2025", registry=registry)
    strength = next(c for c in a.checks if c.name == "flexural strength")
    cap = next(c for c in a.checks if c.name == "utilisation cap")
    assert cap.utilisation == pytest.approx(strength.utilisation / 0.95, rel=1e-12)
    assert cap.passed is (moment < 390e6) and strength.passed
    table = assess_many([beam, replace(beam, id="twin")], ["xx-cap:2025"],
                        registry=registry)["xx-cap:2025"]
    assert table.row(0)["utilisation"]["utilisation cap"] == pytest.approx(cap.utilisation,
                                                                           rel=1e-12)
    without = assess(replace(beam, actions=Actions()), "xx-cap:2025", registry=registry)
    assert all(c.name != "utilisation cap" for c in without.checks)
