"""The engineer's report and the plain-data results.

Reports are rendered to text with rich's recording console and read for their
words, not their colours. Hand values: ACI 318-19 rectangular block (from memory:
22.2.2.4.1, Table 22.2.2.4.3, Table 21.2.2, 6.3.2.1, 5.3.1); unit factors from the
definitions of the inch (25.4 mm) and the pound-force (4.4482216152605 N).
"""

from __future__ import annotations

import re
import tomllib

import jsonschema
import pytest
from rich.console import Console

from clausewise.beamfile import parse_schedule
from clausewise.provisions import CAUTION, MPA_PER_PSI, UnitSystem, default_registry
from clausewise.report import (
    check_report,
    comparison_report,
    editions_report,
    explain_report,
)
from clausewise.results import (
    Outcome,
    Units,
    csv_row,
    document,
    number,
    record,
    results_schema,
    run,
    to_json,
    to_toml,
)

SCHEDULE = """
[project]
name = "Ferrow Lane depot"
town = "Saltmere"
engineer = "A. Quennell"

[[beam]]
id = "G-1"
title = "mezzanine edge"
shape = "T"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "120 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
tension = [{ area = "2000 mm2", depth = "540 mm" }]
floor = { span = "6000 mm", clear_left = "2500 mm", clear_right = "2500 mm" }
moments = { dead = "150 kN m", live = "100 kN m" }

[[beam]]
id = "G-2"
shape = "T"
units = "US"
bending = "hogging"
web_width = "12 in"
overall_depth = "24 in"
slab_thickness = "5 in"
concrete_strength = "4000 psi"
yield_strength = "60000 psi"
tension = [{ area = "2.37 in2", depth = "21.5 in" }]
floor = { span = "240 in", continuity = "interior", clear_left = "96 in", clear_right = "96 in" }
moments = { factored = "120 kip ft" }

[[beam]]
id = "G-3"
shape = "rectangular"
web_width = "300 mm"
overall_depth = "500 mm"
concrete_strength = "30 MPa"
yield_strength = "four hundred"
tension = [{ area = "1500 mm2", depth = "450 mm" }]
"""

KIPFT_IN_NMM = 4448.2216152605 * 304.8  # exact by definition


@pytest.fixture(scope="module")
def schedule():
    return parse_schedule(SCHEDULE, "depot.toml")


@pytest.fixture(scope="module")
def outcomes(schedule):
    registry = default_registry()
    editions = [registry.edition(i) for i in ("aci318-19", "en1992-1-1:2004")]
    return list(run(schedule, editions, None, "persistent"))


def render(renderable, width: int = 110) -> str:
    console = Console(record=True, width=width, file=open("/dev/null", "w"))  # noqa: SIM115
    console.print(renderable)
    return console.export_text()


def words(report: str) -> str:
    """A report's words, without the box lines around them."""
    return " ".join(re.sub("[\u2500-\u257f]", " ", report).split())


def only(outcomes, beam: str, edition: str) -> Outcome:
    return next(o for o in outcomes if o.entry.beam.id == beam and o.edition == edition)


# --- numbers and units -----------------------------------------------------------------------

@pytest.mark.parametrize("value, text", [
    (401.3223, "401.3"), (1800.0, "1800"), (29007.5, "29 008"), (0.0709786, "0.07098"),
    (0.9, "0.9"), (0.0, "0"), (-365.217, "-365.2"), (float("nan"), "—"),
    (float("inf"), "∞"), (2.0e-16, "0.0000000000000002"),
])
def test_number_keeps_four_significant_figures(value, text):
    assert number(value) == text


def test_us_units_follow_the_definitions_of_inch_and_pound():
    us = Units(UnitSystem.US)
    assert us.moment(KIPFT_IN_NMM) == "1 kip·ft"
    assert us.length(25.4) == "1 in"
    assert us.value(645.16, "mm²") == "1 in²"
    assert us.value(4000 * MPA_PER_PSI, "MPa") == "4000 psi"
    assert us.value(29_000_000 * MPA_PER_PSI, "MPa") == "29 000 ksi"  # Es, 29 000 ksi
    assert Units(UnitSystem.SI).moment(401.3e6) == "401.3 kN·m"
    assert Units(UnitSystem.SI).value(840_000, "N") == "840 kN"


# --- the check report -------------------------------------------------------------------------

def test_check_report_shows_inputs_findings_checks_and_what_governs(schedule, outcomes):
    aci = [o for o in outcomes if o.edition == "aci318-19"]
    text = words(render(check_report(schedule, aci), 160))
    assert CAUTION in text
    assert "Ferrow Lane depot" in text and "Saltmere" in text
    assert "G-1 · mezzanine edge · aci318-19 (SI form, persistent)" in text
    assert "web width bw 300 mm" in text  # the input as the engineer wrote it
    # hand: b = 300 + 2 min(8·120, 2500/2, 6000/8) = 1800 mm; a = 2000·420/(0.85·30·1800)
    a = 2000 * 420 / (0.85 * 30 * 1800)
    mrd = 0.9 * 2000 * 420 * (540 - a / 2)
    assert "b_eff = 1800 mm" in text and "ln/8" in text
    assert f"block inside the flange; depth {number(a)} mm" in text
    assert "tension-controlled" in text and "φ = 0.9" in text
    assert f"φMn = {number(mrd / 1e6)} kN·m" in text  # ACI's own symbols
    assert "Mu = 340 kN·m (1.2D + 1.6L governs)" in text and "M_Rd" not in text
    for check in ("flexural strength", "minimum tension reinforcement", "net tensile strain"):
        assert check in text
    assert "9.5.1.1" in text and "9.6.1.2" in text and "9.3.3.1" in text
    assert f"utilisation {340e6 / mrd:.3f}" in text


def test_us_beams_are_reported_in_kip_ft_and_inches(schedule, outcomes):
    text = words(render(check_report(schedule, [only(outcomes, "G-2", "aci318-19")])))
    a_in = 2.37 * 60000 / (0.85 * 4000 * 12)  # block in the 12 in web (hogging)
    mrd = 0.9 * 2.37 * 60000 * (21.5 - a_in / 2) / 12000  # kip·ft
    assert "inch-pound form" in text
    assert f"φMn = {number(mrd)} kip·ft" in text
    assert f"depth {number(a_in)} in" in text and "block inside the web" in text
    assert "kN·m" not in text


def test_refused_beams_and_the_summary_come_before_the_details(schedule, outcomes):
    text = words(render(check_report(schedule, outcomes)))
    assert text.index("input problems") < text.index("summary") < text.index(
        "section and strength") < text.index(CAUTION)
    assert "G-3 yield_strength four hundred" in text


def test_an_outcome_without_assessment_shows_its_error(schedule, outcomes):
    broken = Outcome(outcomes[0].entry, "aci318-19", error="edition 'x' has no form 'Z'")
    text = words(render(check_report(schedule, [broken])))
    assert "not assessed" in text and "has no form 'Z'" in text and CAUTION in text


# --- comparison and audit trail ------------------------------------------------------------------

def test_comparison_puts_editions_in_columns(schedule, outcomes):
    text = render(comparison_report(schedule, outcomes, ["aci318-19", "en1992-1-1:2004"],
                                    details=True), 160)
    header = next(line for line in text.splitlines() if line.startswith("beam "))
    assert header.index("aci318-19") < header.index("en1992-1-1:2004")
    flat = words(text)
    for o in outcomes:
        a = o.assessment
        symbol = o.notation.resistance  # φMn for ACI, M_Rd for EN
        assert f"{symbol} {number(a.design_resistance.value / scale(o))}" in flat
        assert f"{a.governing.utilisation:.2f}" in flat
    assert "specified cylinder strength is taken as f'c of aci318-19; fck of " \
        "en1992-1-1:2004" in flat and CAUTION in flat


def scale(outcome: Outcome) -> float:
    return KIPFT_IN_NMM if outcome.entry.beam.unit_system is UnitSystem.US else 1e6


def test_explain_shows_every_parameter_candidate_and_factor_with_its_supplier(schedule,
                                                                            outcomes):
    o = only(outcomes, "G-1", "aci318-19")
    text = words(render(explain_report(schedule, o), 240))
    a = o.assessment
    for p in a.parameters:
        assert p.name in text
    for c in a.effective_width.candidates:
        assert c.label in text
    assert "▶ bw + ln/8" in text and "+420 mm" in text  # 8hf: 300 + 2·960 = 2220 mm
    assert "β1 0.8357" in text  # 0.85 - 0.05 (30 - 28)/7
    assert "edition stack (base first)" in text and "clausewise" in text
    assert "steel layer" in text and "yes" in text  # the bar yields
    assert "1.4D" in text and "1.2D + 1.6L" in text
    assert CAUTION in text


@pytest.mark.parametrize("edition", ["aci318-19", "en1992-1-1:2004"])
def test_explain_at_80_columns_keeps_every_word_of_the_parameters_whole(schedule, outcomes,
                                                                      edition):
    """Where the parameter table cannot give every column its longest word, each
    parameter becomes a block: no "compressiv / e strength" at 80 columns."""
    o = only(outcomes, "G-1", edition)
    text = words(render(explain_report(schedule, o), 80))
    for p in o.assessment.parameters:
        for word in f"{p.description} {p.clause.title}".split():
            if len(word) <= 20:
                assert word in text, (p.name, word)


def test_explain_numbers_the_notes_of_the_checks(schedule, outcomes):
    o = only(outcomes, "G-1", "en1992-1-1:2004")
    text = words(render(explain_report(schedule, o), 240))
    noted = [c for c in o.assessment.checks if c.note]
    assert noted
    for i, c in enumerate(noted, start=1):
        assert f"[{i}] {c.name}:" in text


def test_editions_report_lists_ids_years_and_distributions():
    text = words(render(editions_report(default_registry()), 140))
    assert "aci318-19" in text and "2019" in text and "clausewise" in text
    assert CAUTION in text


# --- plain data -------------------------------------------------------------------------------

def test_record_carries_edition_form_stack_status_and_caution(outcomes):
    rec = record(only(outcomes, "G-1", "en1992-1-1:2004"))
    assert rec["edition"] == "en1992-1-1:2004" and rec["form"] == "SI"
    assert rec["stack"][0]["version"] and rec["caution"] == CAUTION
    assert rec["status"] in ("pass", "fail")
    assert rec["governing_check"]["name"] == rec["summary"].split("governed by ")[1].split(
        " (")[0]


def test_toml_leaves_out_absent_values_and_parses(schedule, outcomes):
    broken = Outcome(outcomes[0].entry, "aci318-19", error="no such form")
    doc = document(schedule, [*outcomes, broken])
    assert doc["results"][-1].get("effective_width") is None
    parsed = tomllib.loads(to_toml(doc))
    assert parsed["results"][-1] == {k: v for k, v in doc["results"][-1].items()}
    assert len(parsed["results"]) == len(outcomes) + 1
    g2 = next(r for r in parsed["results"] if r["beam"] == "G-2")
    assert "effective_width" in g2


def test_json_has_no_nan_and_fits_the_schema(schedule, outcomes):
    doc = document(schedule, outcomes)
    jsonschema.validate(doc, results_schema())
    assert "NaN" not in to_json(doc)
    missing = dict(doc)
    del missing["caution"]
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(missing, results_schema())


def test_csv_row_is_flat_and_in_the_units_asked_for(outcomes):
    o = only(outcomes, "G-2", "aci318-19")
    row = csv_row(record(o, units="SI"))
    assert row["M_Rd_kNm"] == pytest.approx(o.assessment.design_resistance.value / 1e6,
                                            rel=2e-6)  # six significant figures
    assert row["resistance_factor"] == 0.9
    assert row["stack"].startswith("aci318-19 ") and row["caution"] == CAUTION
    own = csv_row(record(o))  # the beam's own system: kip·ft and inches
    assert own["M_Rd_kip_ft"] == pytest.approx(
        o.assessment.design_resistance.value / KIPFT_IN_NMM, rel=1e-6)
    assert own["b_eff_in"] is None or own["b_eff_in"] > 0


def test_two_checks_whose_names_give_one_code_get_distinct_codes_in_cells_and_legend():
    """"bars in tension layer 1" and "... layer 2" both shorten to "bit": the comparison
    must not let one code stand for two checks (a checker reads the legend)."""
    from dataclasses import replace

    schedule = parse_schedule(SCHEDULE, "depot.toml")
    registry = default_registry()
    outcomes = [o for o in run(schedule, [registry.edition("aci318-19")], None,
                               "persistent") if o.assessment is not None and o.assessment.checks]
    first, second = outcomes[:2]
    renamed = []
    for outcome, name in ((first, "bars in tension layer 1"), (second, "bars in tension layer 2")):
        a = outcome.assessment
        worst = a.governing
        checks = tuple(replace(c, name=name) if c is worst else c for c in a.checks)
        renamed.append(replace(outcome, assessment=replace(a, checks=checks)))
    text = render(comparison_report(schedule, renamed, ["aci318-19"]), 120)
    assert "bit bars in tension layer 1" in text and "bit2 bars in tension layer 2" in text
    assert re.search(r"\d\.\d\d[✓✗○]bit\b", text) and re.search(r"\d\.\d\d[✓✗○]bit2\b", text)


def test_an_envelope_says_which_way_each_candidate_lies_from_the_governing_one():
    """Where the smallest governs the others lie above it (+); where the largest governs
    (the factored moment) they lie below it (−): 1.4D = 210 sits 146 under 1.2D + 1.6L =
    356 (hand arithmetic), and read "+146" before."""
    from clausewise.provisions import Candidate, Clause, Envelope
    from clausewise.report import envelope_table
    from clausewise.results import Units

    clause = Clause("5.3.1", "load combinations", "aci318-19")
    moment = Envelope.largest("factored moment", "M_Ed", [
        Candidate("1.4D", 210e6, clause), Candidate("1.2D + 1.6L", 356e6, clause)], "N·mm")
    width = Envelope.smallest("effective flange width", "b_eff", [
        Candidate("8hf", 1260.0, clause), Candidate("sw/2", 1100.0, clause)], "mm")
    console = Console(width=120, record=True)
    for envelope in (moment, width):
        console.print(envelope_table(envelope, Units(UnitSystem.SI)))
    text = console.export_text()
    assert "\u2212146" in text and "+146" not in text
    assert "+160" in text
