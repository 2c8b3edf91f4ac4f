"""The conformance kit over every installed edition, and the kit against broken editions.

The first test is what an edition author runs on their own edition. The rest build
editions that each break one property on purpose and show that the kit reports it,
so no property is a check that cannot fail.
"""

import os
import subprocess
import sys
from functools import cache
from pathlib import Path

import numpy as np
import pytest

import clausewise
from clausewise.provisions import (
    Candidate,
    Check,
    Clause,
    EditionInfo,
    ElasticPlastic,
    Envelope,
    Factor,
    MaterialModel,
    Parameter,
    Regime,
    Registry,
    Resistance,
    Sense,
    hookimpl,
)
from clausewise.provisions.testing import (
    PROPERTIES,
    Sample,
    assert_conforms,
    base_unchanged,
    batch_matches_single,
    capacity_grows_with_steel,
    check_edition,
    clauses_complete,
    effective_width_within_flange,
    hook_contract,
    parameters_declared,
    resistance_factor_in_range,
    scope_refuses_extrapolation,
    unit_system_neutral,
)

ROOT = Path(__file__).resolve().parents[1]
EDITIONS = {e.id: e for e in clausewise.editions()}

# Findings reported to the edition owners, as (edition, property): reason; strict, so a fix
# turns these into failures that ask for the mark to be removed.
KNOWN: dict[tuple[str, str], str] = {}


@cache
def sample(edition_id):
    return Sample(EDITIONS[edition_id])


def _cases():
    for edition_id in sorted(EDITIONS):
        for prop in PROPERTIES:
            reason = KNOWN.get((edition_id, prop.__name__))
            marks = [pytest.mark.xfail(reason=reason, strict=True)] if reason else []
            yield pytest.param(edition_id, prop, marks=marks,
                               id=f"{edition_id}-{prop.__name__}")


@pytest.mark.parametrize(("edition_id", "prop"), list(_cases()))
def test_installed_edition_conforms(edition_id, prop):
    findings = prop(sample(edition_id))
    assert not findings, "\n".join(map(str, findings))


# --- the kit catches each kind of fault -------------------------------------------------

def layered(plugin, base="aci318-19"):
    """A fresh registry with ``base`` (and its own bases) and ``plugin`` over it."""
    if base not in EDITIONS:
        pytest.skip(f"edition {base} is not installed")
    registry = Registry(only=frozenset({base}))
    registry.load_entry_points()
    record = registry.register(plugin)
    assert record.ok, record.error
    return registry.edition(record.info.id)


def faulty(name, forms=("SI", "inch-pound"), extends="aci318-19"):
    info = EditionInfo(f"faulty-{name}", f"an edition that breaks {name}", 2025,
                       extends=extends, forms=forms)
    return info, info.clause("F1", "deliberate fault")


class GreedyFactor:
    info, clause = faulty("factor")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def resistance_factor(self):
        return Resistance(Factor("φ", 1.2, self.clause), Regime("greedy", self.clause),
                          self.clause)


def test_kit_catches_a_member_factor_above_one():
    findings = resistance_factor_in_range(Sample(layered(GreedyFactor())))
    assert findings and all("φ = 1.2" in f.message for f in findings)


class WholeSlab:
    """Takes the full clear distance on each side, twice what the slab can give."""

    info, clause = faulty("width")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def effective_flange_width(self, beam):
        sides = [s for s in (beam.layout.clear_left, beam.layout.clear_right) if s is not None]
        return Envelope.smallest("effective flange width", "b_eff", [
            Candidate("bw + clear distances", beam.web_width + sum(sides), self.clause)], "mm")


def test_kit_catches_a_flange_wider_than_the_slab():
    findings = effective_width_within_flange(Sample(layered(WholeSlab())))
    # interior T: 300 + 2 x 2700 = 5700 mm against 300 + 2700 = 3000 mm available
    assert any("b_eff = 5700 mm" in f.message and "3000 mm" in f.message for f in findings)
    assert not any("rectangle" in f.beam for f in findings)


class Boundless:
    info, clause = faulty("scope")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def applicability(self):
        return [Check("anything goes", 1.0, 1.0, Sense.AT_MOST, self.clause)]


def test_kit_catches_extrapolation_outside_the_scope():
    findings = scope_refuses_extrapolation(Sample(layered(Boundless())))
    assert len(findings) == 3
    assert {m for f in findings for m in ("5 MPa", "200 MPa", "2000 MPa")
            if f"= {m}" in f.message} == {"5 MPa", "200 MPa", "2000 MPa"}


class Anonymous:
    info, clause = faulty("clause")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def design_actions(self, beam):
        return Envelope.largest("factored moment", "Mu", [
            Candidate("1.5(D + L)", 1.5 * (beam.actions.dead + beam.actions.live),
                      Clause("", "nowhere", ""))], "N·mm")


def test_kit_catches_a_value_without_clause():
    findings = clauses_complete(Sample(layered(Anonymous())))
    assert len(findings) == 1 and "candidate '1.5(D + L)'" in findings[0].message


class ScalarOnly:
    """A rule written for one beam: ``float()`` of a field breaks on a batch."""

    info, clause = faulty("batch")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def additional_checks(self, beam):
        return [Check("web at least 200 mm", float(beam.web_width), 200.0, Sense.AT_LEAST,
                      self.clause)]


def test_kit_catches_a_rule_that_fails_on_arrays():
    s = Sample(layered(ScalarOnly()))
    assert batch_matches_single(s) and capacity_grows_with_steel(s)
    assert all("batch evaluation raised" in f.message for f in batch_matches_single(s))
    assert not resistance_factor_in_range(s)  # single beams are fine


def factored_by_form(scale_in_inch_pound, forms):
    class FormMinded:
        info, clause = faulty(f"units-{scale_in_inch_pound}", forms=forms)

        @hookimpl
        def edition_info(self):
            return self.info

        @hookimpl
        def design_actions(self, beam, context):
            inch_pound = context.form == "inch-pound" or beam.unit_system == "US"
            scale = scale_in_inch_pound if inch_pound else 1.0
            return Envelope.largest("factored moment", "Mu", [
                Candidate("1.4D", scale * 1.4 * beam.actions.dead, self.clause)], "N·mm")

    return FormMinded()


def test_kit_catches_a_one_form_edition_that_reads_the_unit_system():
    findings = unit_system_neutral(Sample(layered(factored_by_form(1.0001, ("SI",)))))
    assert any(f.message.startswith("design moment: ") and "(no change allowed)" in f.message
               for f in findings)


def test_kit_allows_two_forms_to_differ_within_one_percent_only():
    within = Sample(layered(factored_by_form(1.005, ("SI", "inch-pound"))))
    beyond = Sample(layered(factored_by_form(1.03, ("SI", "inch-pound"))))
    assert not unit_system_neutral(within)
    assert any("design moment" in f.message for f in unit_system_neutral(beyond))


class Weakening:
    """A steel whose yield stress falls as bars are added: Mn falls while steel yields."""

    info, clause = faulty("monotone")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def steel_law(self, beam):
        ratio = np.asarray(beam.tension_area) / (np.asarray(beam.web_width) *
                                                 beam.effective_depth)
        fy = np.asarray(beam.yield_strength) * (1 - 20 * ratio)
        return MaterialModel(ElasticPlastic(200_000.0, fy), (Factor("fy", fy, self.clause),))


def test_kit_catches_capacity_falling_with_more_steel():
    findings = capacity_grows_with_steel(Sample(layered(Weakening())))
    assert findings and all("Mn falls" in f.message for f in findings)


class Incomplete:
    """A base edition (no ``extends``) that forgot most topics."""

    info = EditionInfo("faulty-incomplete", "an edition with two topics", 2025)

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def applicability(self, beam):
        return [Check("f'c at least 20 MPa", beam.concrete_strength, 20.0, Sense.AT_LEAST,
                      self.info.clause("1", "scope"))]


def test_kit_catches_a_base_edition_with_missing_topics():
    registry = Registry()
    edition = registry.edition(registry.register(Incomplete()).info.id)
    messages = [f.message for f in hook_contract(Sample(edition))]
    for topic in ("concrete_law", "steel_law", "resistance_factor", "design_actions",
                  "effective_flange_width", "minimum_reinforcement", "ductility_limits"):
        assert any(m.endswith(f"does not answer the topic {topic}") for m in messages)


class Loose:
    """Sets a parameter outside the base's bounds and cites someone else for another."""

    info, clause = faulty("parameters")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def edition_parameters(self):
        return [Parameter("min_net_tensile_strain", 0.05, self.clause, bounds=(0.002, 0.1)),
                Parameter("live_factor", 1.6, Clause("5.3.1", "borrowed", "elsewhere"))]


def test_kit_catches_parameters_out_of_bounds_or_misattributed():
    messages = [f.message for f in parameters_declared(Sample(layered(Loose())))]
    # aci318-19 allows 0.002 to 0.01 for the least net tensile strain (its own bounds)
    assert any("min_net_tensile_strain = 0.05" in m and "0.002 to 0.01" in m for m in messages)
    assert any(m.startswith("live_factor: clause elsewhere") for m in messages)


def test_check_edition_and_assert_conforms_report_findings():
    edition = layered(GreedyFactor())
    findings = check_edition(edition, properties=[resistance_factor_in_range])
    assert findings and findings[0].edition == "faulty-factor"
    with pytest.raises(AssertionError, match="φ = 1.2"):
        assert_conforms(edition, properties=[resistance_factor_in_range])


class Meddler:
    """Wraps the width, and while it runs rewrites a function of its base's module."""

    info, clause = faulty("base", forms=None, extends="en1992-1-1:2004")
    patch = None

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl(wrapper=True)
    def effective_flange_width(self):
        answer = yield
        self.patch()
        return answer


def test_kit_catches_a_layer_that_changes_its_base(monkeypatch):
    import importlib

    base = importlib.import_module("clausewise.plugins.en1992_1_1_2004")  # the test's probe
    meddler = Meddler()
    meddler.patch = lambda: monkeypatch.setattr(base, "zero_moment_distance",
                                                lambda beam, layout: (1000.0, "l0 meddled"))
    edition = layered(meddler, base="en1992-1-1:2004")
    findings = check_edition(edition, properties=[base_unchanged])
    assert findings and all(f.property == "base unchanged" for f in findings)
    assert any("effective width of the base alone" in f.message and "after faulty-base"
               in f.message for f in findings)


def test_kit_finds_a_wrapping_edition_leaves_its_base_alone():
    if "en1992-1-1:2004" not in EDITIONS:
        pytest.skip("edition en1992-1-1:2004 is not installed")
    import importlib.util

    source = ROOT / "fixtures/local-editions/local_editions/fennick_beams.py"
    spec = importlib.util.spec_from_file_location("fennick_beams_kit", source)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    assert check_edition(layered(module, base="en1992-1-1:2004")) == []


# --- the command an author runs ------------------------------------------------------------

def run_kit(*args):
    env = {k: v for k, v in os.environ.items() if not k.startswith("CLAUSEWISE_")}
    return subprocess.run([sys.executable, "-m", "clausewise.conformance", *args],
                          capture_output=True, text=True, env=env, cwd=ROOT, timeout=120)


def test_command_line_checks_a_parameter_file_and_refuses_unknown_ids():
    if "en1992-1-1:2004" not in EDITIONS:
        pytest.skip("edition en1992-1-1:2004 is not installed")
    done = run_kit("--annex", "fixtures/annexes/lornholm-na-2023.toml")
    assert done.returncode == 0, done.stdout + done.stderr
    assert "xl-na:2023: conforms" in done.stdout
    assert "engineer of record" in done.stdout
    unknown = run_kit("aci318-99")
    assert unknown.returncode == 2 and "unknown edition 'aci318-99'" in unknown.stdout


def test_command_line_verbose_prints_every_property_and_its_outcome():
    edition_id = next(iter(sorted(EDITIONS)))
    done = run_kit("--verbose", edition_id)
    assert done.returncode == 0, done.stdout + done.stderr
    for prop in PROPERTIES:
        assert f"ok   {prop.__name__}" in done.stdout
    quiet = run_kit(edition_id)
    assert "ok   hook_contract" not in quiet.stdout and f"{edition_id}: conforms" in quiet.stdout


def test_the_command_shows_a_few_findings_of_a_property_and_counts_the_rest(monkeypatch,
                                                                            capsys):
    """A broken plugin breaks a property on every realistic beam: a few findings stand
    for them, the rest are counted, and --verbose gives every one."""
    from clausewise import conformance
    from clausewise.provisions.testing import Finding

    edition_id = next(iter(sorted(EDITIONS)))
    many = [Finding("answers_make_sense", edition_id, f"φ = 1.2 on beam {i}", f"K{i}")
            for i in range(40)]
    monkeypatch.setattr(conformance, "check_properties",
                        lambda edition: [("answers_make_sense", many)])
    assert conformance.main([edition_id]) == 1
    out = capsys.readouterr().out
    assert f"{edition_id}: 40 finding(s)" in out
    assert out.count("φ = 1.2 on beam") == conformance.SHOWN
    assert f"{40 - conformance.SHOWN} more finding(s) of this property" in out
    conformance.main([edition_id, "--verbose"])
    assert capsys.readouterr().out.count("φ = 1.2 on beam") == 40
