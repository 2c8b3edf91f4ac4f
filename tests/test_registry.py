"""Registry and engine behaviour: broken plugins, layering, provenance, hook order, switches.

The editions under test are the built-in ACI 318 family plus small plugins written
here; the engineering values behind them are tested in test_aci.py.
"""

from __future__ import annotations

import importlib.metadata
import textwrap
from dataclasses import replace

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Candidate,
    Check,
    EditionError,
    EditionInfo,
    Envelope,
    FloorLayout,
    Layer,
    Parameter,
    PluginError,
    Registry,
    Shape,
    assess,
    default_registry,
    hookimpl,
    hookspecs,
)
from clausewise.provisions import registry as registry_module
from clausewise.provisions.registry import answers_trail

ACI = frozenset({"aci318-19", "aci318-14", "aci318-11"})


def aci_registry(**options) -> Registry:
    registry = Registry(only=ACI, **options)
    registry.load_entry_points()
    return registry


def floor_beam(**changes) -> Beam:
    fields = dict(id="G1", shape=Shape.TEE, bending=Bending.SAGGING, web_width=300.0,
                  depth=600.0, concrete_strength=28.0, yield_strength=420.0,
                  tension=(Layer(2000.0, 540.0),), flange_thickness=120.0,
                  layout=FloorLayout(span=8000.0, clear_span=7700.0, clear_left=2500.0,
                                     clear_right=2500.0),
                  actions=Actions(dead=150e6, live=100e6))
    return Beam(**(fields | changes))


# --- plugins that go wrong -------------------------------------------------------------

class Misspelt:
    """Names a hook that does not exist."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-misspelt", "misspelt hook", 2024, extends="aci318-19")

    @hookimpl
    def effective_flange_widht(self, beam):
        return None


class Nameless:
    """Cannot say who it is."""

    @hookimpl
    def edition_info(self):
        raise RuntimeError("identity lookup failed")


class Orphan:
    """Extends an edition nobody installed."""

    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-orphan", "orphan", 2024, extends="xx-absent-base")


class RaisingLaw:
    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-raising", "raising concrete law", 2024, extends="aci318-19")

    @hookimpl
    def concrete_law(self, beam):
        raise ValueError("no law for this concrete")


class WrongWidth:
    @hookimpl
    def edition_info(self):
        return EditionInfo("xx-wrong-type", "width as a bare number", 2024,
                           extends="aci318-19")

    @hookimpl
    def effective_flange_width(self, beam):
        return 1000.0


def test_broken_plugins_are_reported_by_name_and_the_others_still_work():
    registry = aci_registry()
    registry.register(Misspelt(), "misspelt")
    registry.register(Nameless(), "nameless")
    broken = {r.name: r.error for r in registry.broken}
    assert set(broken) == {"misspelt", "nameless"}
    assert "effective_flange_widht" in broken["misspelt"]
    assert broken["nameless"] == "RuntimeError: identity lookup failed"
    assert registry.ids() == sorted(ACI)
    for edition_id in ACI:
        result = assess(floor_beam(), edition_id, registry=registry)
        assert result.edition_id == edition_id and result.status == "pass"


@pytest.mark.parametrize(("plugin", "name", "says"), [
    (Misspelt(), "misspelt", "effective_flange_widht"),
    (Nameless(), "nameless", "identity lookup failed"),
])
def test_strict_registry_turns_a_broken_plugin_into_an_error(plugin, name, says):
    registry = aci_registry(strict=True)
    with pytest.raises(PluginError, match=name) as raised:
        registry.register(plugin, name)
    assert says in str(raised.value)


def test_missing_base_is_named():
    registry = aci_registry()
    registry.register(Orphan(), "orphan")
    with pytest.raises(EditionError, match="xx-absent-base"):
        registry.edition("xx-orphan")
    assert "xx-orphan" not in [e.id for e in registry.editions()]


@pytest.mark.parametrize(("plugin", "edition_id", "hook", "says"), [
    (RaisingLaw(), "xx-raising", "concrete_law", "ValueError: no law for this concrete"),
    (WrongWidth(), "xx-wrong-type", "effective_flange_width", "returned float, expected "
                                                              "Envelope"),
])
def test_a_hook_that_fails_during_assessment_names_edition_and_hook(plugin, edition_id, hook,
                                                                    says):
    registry = aci_registry()
    registry.register(plugin)
    with pytest.raises(PluginError) as raised:
        assess(floor_beam(), edition_id, registry=registry)
    message = str(raised.value)
    assert edition_id in message and hook in message and says in message


# --- layering ---------------------------------------------------------------------------

class FirmStrainLimit:
    """A firm asks for more ductility than the code: εt at least 0.005 in beams."""

    info = EditionInfo("xx-firm-strain", "firm rule on net tensile strain", 2024,
                       extends="aci318-19")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def edition_parameters(self):
        return [Parameter("min_net_tensile_strain", 0.005,
                          self.info.clause("R-7", "firm's least net tensile strain"))]


def test_layered_edition_merges_parameters_with_the_top_layer_winning():
    registry = aci_registry()
    registry.register(FirmStrainLimit())
    firm = assess(floor_beam(), "xx-firm-strain", registry=registry)
    base = assess(floor_beam(), "aci318-19", registry=registry)
    assert [layer.id for layer in firm.stack] == ["aci318-19", "xx-firm-strain"]
    suppliers = firm.suppliers()
    assert suppliers.keys() == base.suppliers().keys()
    assert suppliers.pop("min_net_tensile_strain") == "xx-firm-strain"
    assert set(suppliers.values()) == {"aci318-19"}
    (strain,) = [c for c in firm.checks if c.name == "net tensile strain"]
    assert strain.limit == 0.005 and strain.clause.edition == "xx-firm-strain"
    assert strain.clause.ref == "R-7"
    # everything else is the base's answer
    assert firm.design_resistance.value == base.design_resistance.value
    assert firm.resistance.factor.clause.edition == "aci318-19"


class FirmCombination:
    """A firm factors every moment by 1.5(D + L)."""

    info = EditionInfo("xx-firm-demand", "firm load combination", 2024, extends="aci318-19")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def design_actions(self, beam):
        moment = 1.5 * (beam.actions.dead + beam.actions.live)
        return Envelope.largest("factored moment", "Mu", [
            Candidate("1.5(D + L)", moment, self.info.clause("R-2", "firm combination"))],
            "N·mm")


def test_minimum_steel_waiver_uses_the_demand_of_the_layered_edition():
    registry = aci_registry()
    registry.register(FirmCombination())
    beam = Beam("W1", Shape.RECTANGLE, Bending.SAGGING, 300.0, 600.0, 28.0, 420.0,
                (Layer(400.0, 540.0),), actions=Actions(dead=20e6, live=10e6))
    a = assess(beam, "xx-firm-demand", registry=registry)
    assert a.demand.value == pytest.approx(45e6)
    (minimum,) = [c for c in a.checks if c.symbol == "As"]
    # ACI 318-19 9.6.1.3, from memory: waived down to 4/3 of As required for this Mu,
    # estimated As·Mu/(φMn) (below As,min = 1.4/420·300·540 = 540 mm² here)
    waived = 4 / 3 * 400.0 * a.demand.value / a.design_resistance.value
    assert waived < 540.0
    assert minimum.limit == pytest.approx(waived, rel=1e-9)


# --- provenance and the governing check, over random beams --------------------------------

@st.composite
def beams(draw):
    shape = draw(st.sampled_from([Shape.TEE, Shape.ELL, Shape.RECTANGLE]))
    bw = draw(st.floats(200, 500))
    h = draw(st.floats(400, 900))
    hf = draw(st.floats(80, 200))
    d = h - draw(st.floats(40, 90))
    area = draw(st.floats(0.002, 0.06)) * bw * d
    layout = None
    if shape is not Shape.RECTANGLE:
        span = draw(st.floats(3000, 12000))
        layout = FloorLayout(span=span, clear_span=span - bw,
                             clear_left=draw(st.floats(200, 3000)),
                             clear_right=draw(st.floats(200, 3000)))
    return Beam("H1", shape, Bending.SAGGING, bw, h, draw(st.floats(20, 80)),
                draw(st.sampled_from([420.0, 500.0, 413.685])), (Layer(area, d),),
                flange_thickness=hf if layout else None, layout=layout,
                actions=Actions(dead=draw(st.floats(10e6, 500e6)),
                                live=draw(st.floats(0, 400e6))))


REGISTRY = aci_registry()


@settings(max_examples=60, deadline=None)
@given(beam=beams(), edition_id=st.sampled_from(sorted(ACI)))
def test_governing_check_and_provenance(beam, edition_id):
    a = assess(beam, edition_id, registry=REGISTRY)
    pool = a.checks if a.status != "outside scope" else a.applicability
    assert a.governing in pool
    assert all(c.utilisation <= a.governing.utilisation for c in pool)
    assert a.governing.name in a.summary()
    factors = [*a.concrete_factors, *a.steel_factors]
    if a.resistance is not None:
        factors += [a.resistance.factor, a.design_resistance]
    candidates = [*(a.effective_width.candidates if a.effective_width else ()),
                  *(a.demand.candidates if a.demand else ())]
    clauses = [x.clause for x in (*a.all_checks, *factors, *candidates, *a.parameters)]
    clauses += [a.resistance.regime.clause] if a.resistance else []
    assert all(isinstance(c, Check) for c in a.all_checks)
    for clause in clauses:
        assert clause.ref and clause.edition
        # values come from the edition assessed, or are the engineer's own input
        assert clause.edition in (edition_id, "engineer"), clause


# --- the assessment's hook order ----------------------------------------------------------

def test_hook_call_order_of_one_assessment():
    edition = aci_registry().edition("aci318-14")
    with answers_trail() as trail:
        assess(floor_beam(), edition)
    called = list(trail)  # in the order first asked
    assert called == [
        "edition_parameters", "applicability", "effective_flange_width", "concrete_law",
        "steel_law", "resistance_factor", "design_actions", "minimum_reinforcement",
        "ductility_limits", "additional_checks",
    ]
    # detailing is asked only for layers given as bars (count and diameter)
    beam = floor_beam()
    with_bars = replace(beam, tension=(replace(beam.tension[0], count=4, diameter=25.0,
                                               bars_width=100.0),))
    with answers_trail() as trail:
        assess(with_bars, edition)
    assert list(trail) == [*called, "detailing_limits"]
    assert list(trail) == [hook.name for hook in hookspecs.HOOKS][1:]  # the table's order


# --- loading only some editions ---------------------------------------------------------

def test_only_loads_just_the_named_edition():
    registry = Registry(only=frozenset({"aci318-14"}))
    registry.load_entry_points()
    assert [r.name for r in registry.records] == ["aci318-14"]
    assert registry.ids() == ["aci318-14"]


def test_only_loads_the_base_an_edition_extends(tmp_path, monkeypatch):
    (tmp_path / "firm_strain_rules.py").write_text(textwrap.dedent("""
        from clausewise.provisions import EditionInfo, hookimpl

        class FirmRules:
            @hookimpl
            def edition_info(self):
                return EditionInfo("xx-firm", "firm rules", 2024, extends="aci318-19")

        plugin = FirmRules()
    """))
    monkeypatch.syspath_prepend(str(tmp_path))
    real = importlib.metadata.entry_points
    extra = importlib.metadata.EntryPoint("xx-firm", "firm_strain_rules:plugin",
                                          registry_module.GROUP)
    monkeypatch.setattr(importlib.metadata, "entry_points",
                        lambda group: [*real(group=group), extra])
    registry = Registry(only=frozenset({"xx-firm"}))
    registry.load_entry_points()
    assert sorted(r.name for r in registry.records) == ["aci318-19", "xx-firm"]
    assert [layer.info.id for layer in registry.edition("xx-firm").layers] == [
        "aci318-19", "xx-firm"]


def test_environment_switch_limits_the_default_registry(monkeypatch):
    monkeypatch.setattr(registry_module, "_DEFAULT", None)  # restored after the test
    monkeypatch.setenv("CLAUSEWISE_EDITIONS", "aci318-14")
    assert default_registry().ids() == ["aci318-14"]
    with pytest.raises(EditionError, match="aci318-19"):
        assess(floor_beam(), "aci318-19")


def test_a_form_choice_applies_to_editions_that_publish_it():
    from clausewise.provisions.engine import resolve_form

    registry = Registry()
    registry.load_entry_points()
    beam = Beam("F1", Shape.RECTANGLE, Bending.SAGGING, 300.0, 600.0, 30.0, 420.0,
                (Layer(1500.0, 540.0),))
    # ACI 318-19 publishes an inch-pound form; EN 1992-1-1 only SI, so the choice passes it by
    assert resolve_form(registry.edition("aci318-19"), beam, "inch-pound")[0] == "inch-pound"
    form, basis = resolve_form(registry.edition("en1992-1-1:2004"), beam, "inch-pound")
    assert form == "SI" and "only form" in basis


def test_an_unknown_edition_names_every_installed_one_when_only_some_were_loaded():
    """A run that names its editions loads only their plugins; a wrong name must still be
    told what is installed (it read "known: none installed" beside 18 editions)."""
    from clausewise.provisions import EditionError, Registry

    registry = Registry(only=frozenset({"aci318-19"}))
    registry.load_entry_points()
    with pytest.raises(EditionError) as caught:
        registry.edition("aci318-91")
    message = str(caught.value)
    assert "none installed" not in message
    assert "en1992-1-1:2004" in message and "is456:2000" in message
