"""Untrusted plugin answers are checked for sense, not only type (issue 13).

The ranges are the trade's: a member factor φ in (0, 1] (ACI 318-19 Table 21.2.2 gives
0.65 to 0.90, from memory), a material partial factor of at least 1 (EN 1992-1-1 Table
2.1N: γc 1.5, γs 1.15, accidental γs 1.0, from memory), stress-block factors in (0, 1]
(ACI 318-19 Table 22.2.2.4.3: β1 0.65 to 0.85, from memory), an ultimate concrete
strain near 0.003 (ACI 318-19 22.2.2.1: 0.003; EN 1992-1-1 Table 3.1: 0.0026 to
0.0035, from memory) and a factored moment not negative in the beam's own sense
(common practice: the file gives moments in the beam's bending sense).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from clausewise import results
from clausewise.beamfile import parse_schedule
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Candidate,
    EditionInfo,
    ElasticPlastic,
    Envelope,
    Factor,
    FloorLayout,
    Layer,
    PluginError,
    RectangularBlock,
    Regime,
    Registry,
    Resistance,
    Shape,
    assess,
    hookimpl,
)
from clausewise.provisions.answer_checks import AnswerError, answer_problems
from clausewise.provisions.answers import MaterialModel
from clausewise.provisions.batch import assess_many
from clausewise.provisions.testing import Sample, answers_make_sense, check_edition

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"
BASE = "aci318-19"


def beam(**changes) -> Beam:
    fields = dict(id="G1", shape=Shape.TEE, bending=Bending.SAGGING, web_width=300.0,
                  depth=600.0, concrete_strength=28.0, yield_strength=420.0,
                  tension=(Layer(2000.0, 540.0),), flange_thickness=120.0,
                  layout=FloorLayout(span=8000.0, clear_span=7700.0, clear_left=2500.0,
                                     clear_right=2500.0),
                  actions=Actions(dead=150e6, live=100e6))
    return Beam(**(fields | changes))


def layered(plugin) -> Registry:
    registry = Registry(only=frozenset({BASE}))
    registry.load_entry_points()
    record = registry.register(plugin)
    assert record.ok, record.error
    return registry


def answering(hook: str, answer):
    """A one-hook edition over ACI 318-19 that answers ``hook`` with ``answer(beam)``."""
    info = EditionInfo(f"odd-{hook.replace('_', '-')}", f"an odd {hook}", 2025, extends=BASE)

    class Plugin:
        @hookimpl
        def edition_info(self):
            return info

    def impl(self, beam):
        return answer(beam, info.clause("X1", "deliberate fault"))

    impl.__name__ = hook
    setattr(Plugin, hook, hookimpl(impl))
    return Plugin()


def phi(value):
    return lambda beam, clause: Resistance(Factor("φ", value, clause), Regime("odd", clause),
                                           clause)


def block(**factors):
    def law(beam, clause):
        stress = 0.85 * beam.concrete_strength
        return MaterialModel(RectangularBlock(stress, factors.get("depth", 0.85),
                                              factors.get("strain", 0.003)),
                             tuple(Factor(s, v, clause) for s, v in factors.get("named", {})
                                   .items()))
    return law


def moment(value):
    return lambda beam, clause: Envelope.largest("factored moment", "M_u", [
        Candidate("odd combination", value, clause)], "N·mm")


def width(value):
    return lambda beam, clause: Envelope.smallest("effective flange width", "b_eff", [
        Candidate("odd width", value, clause)], "mm")


FAULTS = [
    ("resistance_factor", phi(5.0), "φ = 5.0"),
    ("resistance_factor", phi(0.0), "φ = 0.0"),
    ("resistance_factor", phi(None), "φ = None"),
    ("concrete_law", block(named={"γc": 0.5}), "γc = 0.5"),
    ("concrete_law", block(named={"β1": 1.2}), "β1 = 1.2"),
    ("concrete_law", block(named={"α1": -0.85}), "α1 = -0.85"),
    ("concrete_law", block(strain=0.05), "ultimate strain 0.05"),
    ("concrete_law", block(strain=0.0001), "ultimate strain 0.0001"),
    ("concrete_law", lambda beam, clause: MaterialModel("not a law", ()), "law str"),
    ("steel_law", lambda beam, clause: MaterialModel(RectangularBlock(25.0, 0.85, 0.003), ()),
     "law RectangularBlock"),
    # a wrapper that multiplied the strengths: right types, values no material has
    ("steel_law", lambda beam, clause: MaterialModel(
        ElasticPlastic(200_000.0, 5 * beam.yield_strength), ()), "steel yield stress 2100 MPa"),
    ("concrete_law", lambda beam, clause: MaterialModel(
        RectangularBlock(5 * 0.85 * beam.concrete_strength, 0.85, 0.003), ()),
     "concrete stress 119 MPa"),
    ("effective_flange_width", width(-1000.0), "effective width -1000.0"),
    ("effective_flange_width", width(math.inf), "effective width inf"),
    ("effective_flange_width", width(math.nan), "effective width nan"),
    ("design_actions", moment(-250e6), "factored moment -250000000.0"),
    ("design_actions", moment(math.nan), "factored moment nan"),
]


@pytest.mark.parametrize(("hook", "answer", "shown"), FAULTS,
                         ids=[f"{h}-{s}" for h, _, s in FAULTS])
def test_a_senseless_answer_is_an_error_naming_plugin_hook_and_value(hook, answer, shown):
    plugin = answering(hook, answer)
    registry = layered(plugin)
    edition_id = plugin.edition_info().id
    with pytest.raises(AnswerError) as caught:
        assess(beam(), edition_id, registry=registry)
    message = str(caught.value)
    assert f"plugin {edition_id!r}" in message and f"hook {hook}" in message
    assert shown in message
    assert isinstance(caught.value, PluginError)


def test_a_nan_member_factor_for_a_section_in_equilibrium_is_refused():
    # without moments only the detailing checks remain: a NaN M_Rd passed them before
    plugin = answering("resistance_factor", phi(math.nan))
    with pytest.raises(AnswerError, match="φ = nan"):
        assess(beam(actions=Actions()), plugin.edition_info().id, registry=layered(plugin))


def test_the_other_editions_go_on():
    plugin = answering("resistance_factor", phi(5.0))
    registry = layered(plugin)
    schedule = parse_schedule(DEMO.read_text(encoding="utf-8"), str(DEMO))
    editions = [registry.edition(plugin.edition_info().id), registry.edition(BASE)]
    outcomes = list(results.run(schedule, editions, None, "persistent"))
    odd = [o for o in outcomes if o.edition != BASE]
    good = [o for o in outcomes if o.edition == BASE]
    assert odd and all(o.status == "error" and "φ = 5.0" in o.error for o in odd)
    assert good and all(o.status in ("pass", "fail") for o in good)


def test_the_batch_path_records_the_error_per_beam_and_goes_on():
    plugin = answering("design_actions", moment(-1.0))
    registry = layered(plugin)
    odd = plugin.edition_info().id
    tables = assess_many([beam(), beam(id="G2")], [odd, BASE], registry=registry)
    assert set(tables[odd].status.tolist()) == {"error"}
    assert "factored moment -1.0" in tables[odd].message[0]
    assert set(tables[BASE].status.tolist()) <= {"pass", "fail"}


def test_sensible_answers_pass_untouched():
    # a member factor of 1 with partial factors on the materials (EN 1992-1-1 2.4.2.4)
    clause = EditionInfo("x", "x", 2025).clause("1", "x")
    assert not answer_problems("resistance_factor", Resistance(
        Factor("member factor", 1.0, clause), Regime("r", clause), clause))
    # φ per beam over a batch, NaN where a section has no equilibrium
    assert not answer_problems("resistance_factor", Resistance(
        Factor("φ", np.array([0.65, 0.9, np.nan]), clause), Regime("r", clause), clause))
    assert not answer_problems("concrete_law", MaterialModel(
        RectangularBlock(25.5, 0.85, 0.003), (Factor("β1", 0.85, clause),
                                               Factor("γ", 0.826, clause))))
    assert not answer_problems("steel_law", MaterialModel(
        ElasticPlastic(200_000.0, 500.0 / 1.15), (Factor("γs", 1.0, clause),)))
    assert answer_problems("design_actions", moment(0.0)(None, clause)) == []


def test_the_kit_does_not_let_a_law_stronger_than_its_materials_conform():
    plugin = answering("steel_law", lambda beam, clause: MaterialModel(
        ElasticPlastic(200_000.0, 5 * np.asarray(beam.yield_strength)), ()))
    edition = layered(plugin).edition(plugin.edition_info().id)
    findings = answers_make_sense(Sample(edition))
    assert findings and all("steel yield stress" in f.message for f in findings)


def test_the_kit_no_longer_lets_a_negative_factored_moment_conform():
    plugin = answering("design_actions", moment(-250e6))
    registry = layered(plugin)
    edition = registry.edition(plugin.edition_info().id)
    findings = answers_make_sense(Sample(edition))
    assert findings and all("factored moment" in f.message for f in findings)
    assert any(f.property == "answers make sense" for f in check_edition(edition))


def test_every_built_in_edition_answers_sensibly():
    from clausewise.provisions import default_registry

    for edition in default_registry().editions():
        assert answers_make_sense(Sample(edition)) == [], edition.id
