"""The clausewise command end to end: exit status, structured output, files written whole.

Numbers are checked against clausewise.assess and against hand calculations of the
rectangular stress block (ACI 318-19, values from memory: 22.2.2.4.1 block 0.85 f'c,
Table 22.2.2.4.3 β1, Table 21.2.2 φ, 6.3.2.1 overhang limits, 5.3.1 1.2D + 1.6L).
"""

from __future__ import annotations

import csv
import io
import json
import os
import re
import subprocess
import sys
import tomllib
import xml.etree.ElementTree as ET
from pathlib import Path

import jsonschema
import pytest

import clausewise
from clausewise import cli as cli_module
from clausewise.beamfile import load_schedule
from clausewise.cli import main
from clausewise.provisions import CAUTION, Registry, assess
from clausewise.provisions import registry as registry_module
from clausewise.results import results_schema

ROOT = Path(__file__).resolve().parents[1]
DEMO = sorted((ROOT / "fixtures" / "demo").glob("*.toml"))
ANNEX = ROOT / "fixtures" / "annexes" / "lornholm-na-2023.toml"

HEADER = """
[project]
name = "Quillon Street library"
building = "reading room floor"
town = "Marrowby"
engineer = "T. Vessery"

[run]
editions = ["aci318-19"]
"""

# A T-beam whose block stays in the flange: checked by hand below.
RB1 = """
[[beam]]
id = "RB-1"
title = "reading room, grid 3"
shape = "T"
web_width = "300 mm"
overall_depth = "600 mm"
slab_thickness = "120 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
tension = [{ area = "2000 mm2", depth = "540 mm" }]
floor = { span = "6000 mm", clear_left = "2500 mm", clear_right = "2500 mm" }
moments = { dead = "%s", live = "%s" }
"""

# A US customary T-beam over a support (hogging): the block is in the web.
RB2 = """
[[beam]]
id = "RB-2"
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
"""

BAD = """
[[beam]]
id = "RB-9"
shape = "T"
web_width = "300 kg"
overall_depth = "600 mm"
slab_thickness = "120 mm"
concrete_strength = "30 MPa"
yield_strength = "420 MPa"
tension = [{ area = "2000 mm2", depth = "540 mm" }]
"""

PASSING = HEADER + RB1 % ("150 kN m", "100 kN m") + RB2
FAILING = HEADER + RB1 % ("250 kN m", "150 kN m")


def write(tmp_path: Path, text: str, name: str = "floor.toml") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def run_json(capsys: pytest.CaptureFixture[str], *argv: str) -> tuple[int, dict]:
    """JSON results at 15 significant figures, so hand values can be held to 1e-9."""
    status = main([*argv, "--format", "json", "--digits", "15"])
    return status, json.loads(capsys.readouterr().out)


def words(report: str) -> str:
    """A report's words, without the box lines around them."""
    return " ".join(re.sub("[\u2500-\u257f]", " ", report).split())


def by_beam(doc: dict) -> dict[str, dict]:
    return {r["beam"]: r for r in doc["results"]}


# --- hand calculation of RB-1 -----------------------------------------------------------

def rb1_by_hand(dead_knm: float, live_knm: float) -> dict[str, float]:
    b = 300 + 2 * min(8 * 120, 2500 / 2, 6000 / 8)  # 6.3.2.1: ln/8 governs (ln = span)
    a = 2000 * 420 / (0.85 * 30 * b)  # rectangular block inside the flange
    mn = 2000 * 420 * (540 - a / 2) / 1e6  # kN·m
    mu = max(1.4 * dead_knm, 1.2 * dead_knm + 1.6 * live_knm)  # 5.3.1
    return {"b_eff": b, "a": a, "Mn": mn, "M_Rd": 0.9 * mn, "Mu": mu}


# --- check ------------------------------------------------------------------------------------

def test_check_passing_file_exits_0_with_numbers_from_the_engine(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    status, doc = run_json(capsys, "check", str(path))
    assert status == 0
    assert doc["caution"] == CAUTION
    results = by_beam(doc)
    assert set(results) == {"RB-1", "RB-2"}
    rb1 = results["RB-1"]
    assert rb1["status"] == "pass" and rb1["edition"] == "aci318-19"
    assert rb1["governing_check"]["name"] == "flexural strength"
    assert rb1["governing_check"]["clause"]["ref"] == "9.5.1.1"  # ACI 318-19, from memory
    hand = rb1_by_hand(150, 100)
    assert rb1["effective_width"]["value"] == pytest.approx(hand["b_eff"])
    assert rb1["section"]["zone_depth"] == pytest.approx(hand["a"], rel=1e-9)
    assert rb1["section"]["block_in_flange"] is True
    assert rb1["resistance"]["design_resistance"] == pytest.approx(hand["M_Rd"], rel=1e-9)
    assert rb1["demand"]["value"] == pytest.approx(hand["Mu"])
    assert rb1["demand"]["governing"] == "1.2D + 1.6L"
    assert rb1["governing_check"]["utilisation"] == pytest.approx(hand["Mu"] / hand["M_Rd"])

    # the same beam through the Python API gives the same numbers
    entry = next(e for e in load_schedule(path).entries if e.beam.id == "RB-1")
    direct = clausewise.assess(entry.beam, "aci318-19")
    assert rb1["resistance"]["design_resistance"] == pytest.approx(
        direct.design_resistance.value / 1e6, rel=1e-12)
    assert rb1["summary"] == direct.summary()
    assert [c["name"] for c in rb1["checks"]] == [c.name for c in direct.checks]


def test_us_beam_results_in_si_on_request_and_the_inch_pound_form(tmp_path, capsys):
    status, doc = run_json(capsys, "check", str(write(tmp_path, PASSING)), "--units", "SI")
    rb2 = by_beam(doc)["RB-2"]
    assert rb2["form"] == "inch-pound"
    # hogging: compression in the 12 in web; a = As fy / (0.85 f'c bw), all in in and psi
    a_in = 2.37 * 60000 / (0.85 * 4000 * 12)
    mn_kipft = 2.37 * 60000 * (21.5 - a_in / 2) / 12 / 1000
    kipft_in_knm = 4.4482216152605 * 0.3048  # exact by definition of the pound and foot
    assert doc["units"] == "SI" and rb2["units"]["moment"] == "kN·m"
    assert rb2["section"]["nominal_moment"] == pytest.approx(mn_kipft * kipft_in_knm, rel=1e-6)
    assert rb2["section"]["zone_depth"] == pytest.approx(a_in * 25.4, rel=1e-6)
    assert rb2["section"]["block_case"] == "block inside the web"
    assert rb2["inputs"]["web width bw"] == "12 in"


def test_a_failing_check_exits_1(tmp_path, capsys):
    status, doc = run_json(capsys, "check", str(write(tmp_path, FAILING)))
    assert status == 1
    rb1 = by_beam(doc)["RB-1"]
    hand = rb1_by_hand(250, 150)
    assert rb1["status"] == "fail"
    assert rb1["governing_check"]["utilisation"] == pytest.approx(hand["Mu"] / hand["M_Rd"])
    assert rb1["governing_check"]["utilisation"] > 1


def test_a_bad_beam_is_reported_the_others_checked_and_the_status_is_2(tmp_path, capsys):
    status, doc = run_json(capsys, "check", str(write(tmp_path, PASSING + BAD)))
    assert status == 2
    assert set(by_beam(doc)) == {"RB-1", "RB-2"}
    problem = next(p for p in doc["problems"] if p["field"] == "web_width")
    assert problem["beam"] == "RB-9" and problem["value"] == "300 kg"
    assert {p["beam"] for p in doc["problems"]} == {"RB-9"}


def test_the_edition_option_overrides_the_file_and_repeats(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    status, doc = run_json(capsys, "check", str(path), "--edition", "aci318-19",
                           "--edition", "en1992-1-1:2004")
    assert status in (0, 1)
    assert {(r["beam"], r["edition"]) for r in doc["results"]} == {
        (b, e) for b in ("RB-1", "RB-2") for e in ("aci318-19", "en1992-1-1:2004")}
    en = next(r for r in doc["results"] if r["edition"] == "en1992-1-1:2004")
    assert en["stack"][0]["id"] == "en1992-1-1:2004"


def test_situation_option_reaches_the_partial_factors(tmp_path, capsys):
    given = (HEADER + RB1 % ("150 kN m", "100 kN m")).replace(
        'moments = { dead = "150 kN m", live = "100 kN m" }', 'moments = { factored = "300 kN m" }')
    path = write(tmp_path, given)
    resistance = {}
    for situation in ("persistent", "accidental"):
        _, doc = run_json(capsys, "check", str(path), "--edition", "en1992-1-1:2004",
                          "--situation", situation)
        [rec] = doc["results"]
        assert rec["situation"] == situation
        resistance[situation] = rec["resistance"]["design_resistance"]
    # EN 1992-1-1 by hand (from memory): Table 2.1N γc, γs = 1.5, 1.15 (persistent) and
    # 1.2, 1.0 (accidental); 3.1.7(3) block η fcd over 0.8 x, αcc = 1; 5.3.2.1 beff,i =
    # 0.2·1250 + 0.1·6000 = 850 mm a side, so b = 2000 mm; the block stays in the flange.
    for situation, gamma_c, gamma_s in (("persistent", 1.5, 1.15), ("accidental", 1.2, 1.0)):
        fyd, fcd = 420 / gamma_s, 30 / gamma_c
        a = 2000 * fyd / (fcd * 2000)
        assert resistance[situation] == pytest.approx(2000 * fyd * (540 - a / 2) / 1e6,
                                                      rel=1e-9)


def test_the_accidental_situation_needs_its_own_design_moment(tmp_path, capsys):
    """EN 1990 6.11 (from memory): the accidental combination holds the accidental action,
    which service moments do not; an edition without accidental rules says so."""
    path = write(tmp_path, HEADER + RB1 % ("150 kN m", "100 kN m"))
    status, doc = run_json(capsys, "check", str(path), "--edition", "en1992-1-1:2004",
                           "--edition", "aci318-19", "--situation", "accidental")
    assert status == 2
    by_edition = {r["edition"]: r for r in doc["results"]}
    assert by_edition["en1992-1-1:2004"]["status"] == "error"
    assert "moments.factored" in by_edition["en1992-1-1:2004"]["error"]
    assert "6.11" in by_edition["en1992-1-1:2004"]["error"]
    assert by_edition["aci318-19"]["status"] == "error"
    assert "no accidental design situation" in by_edition["aci318-19"]["error"]


def test_form_option_reaches_the_engine(tmp_path, capsys):
    status, doc = run_json(capsys, "check", str(write(tmp_path, PASSING)), "--form", "SI")
    assert {r["form"] for r in doc["results"]} == {"SI"}


# --- user errors: status 2, a message, never a traceback ----------------------------------

@pytest.mark.parametrize("argv, words", [
    (["check", "{file}", "--edition", "no-such-edition"], "unknown edition"),
    (["check", "{missing}"], "no such file"),
    (["explain", "{file}", "RB-77", "--edition", "aci318-19"], "no beam 'RB-77'"),
    (["explain", "{bad}", "RB-9", "--edition", "aci318-19"], "refused"),
    (["check", "{file}", "--format", "yaml"], "invalid choice"),
    (["frobnicate"], "invalid choice"),
])
def test_user_errors_exit_2_with_a_message(tmp_path, capsys, argv, words):
    names = {"file": write(tmp_path, PASSING), "missing": tmp_path / "nothing.toml",
             "bad": write(tmp_path, PASSING + BAD, "bad.toml")}
    status = main([a.format(**names) for a in argv])
    err = capsys.readouterr().err
    assert status == 2
    assert words in err
    assert "Traceback" not in err


def test_a_required_edition_version_not_installed_exits_2(tmp_path, capsys):
    text = PASSING.replace('editions = ["aci318-19"]',
                           'editions = ["aci318-19"]\nrequire = ["aci318-19>=99"]')
    status = main(["check", str(write(tmp_path, text))])
    err = capsys.readouterr().err
    assert status == 2
    assert "aci318-19 >=99" in err and clausewise.__version__ in err


def test_a_required_edition_that_is_installed_lets_the_run_go_on(tmp_path, capsys):
    text = PASSING.replace('editions = ["aci318-19"]',
                           'editions = ["aci318-19"]\nrequire = ["aci318-19>=0.1"]')
    status, doc = run_json(capsys, "check", str(write(tmp_path, text)))
    assert status == 0 and doc["results"]


# --- output files -------------------------------------------------------------------------------

def test_out_writes_the_format_its_extension_names(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    for name in ("r.json", "r.toml", "r.csv", "r.txt", "r.html"):
        assert main(["check", str(path), "--out", str(tmp_path / name)]) == 0
    assert capsys.readouterr().out == ""
    sheet = (tmp_path / "r.html").read_text()
    assert sheet.startswith("<!DOCTYPE html>") and CAUTION in sheet
    assert ET.fromstring(sheet[sheet.index("<svg"):sheet.index("</svg>") + 6]).tag.endswith(
        "svg")  # the figure inline, well-formed
    assert json.loads((tmp_path / "r.json").read_text())["caution"] == CAUTION
    assert tomllib.loads((tmp_path / "r.toml").read_text())["caution"] == CAUTION
    header = (tmp_path / "r.csv").read_text().splitlines()[0]
    assert header.startswith("beam,edition,") and header.endswith(",caution")
    assert CAUTION.split(":")[0] in (tmp_path / "r.txt").read_text()


def test_out_is_atomic_an_error_leaves_the_old_file_and_no_temporary(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    out = tmp_path / "results.json"
    out.write_text("previous results\n")
    status = main(["check", str(path), "--edition", "no-such-edition", "--out", str(out)])
    assert status == 2
    assert out.read_text() == "previous results\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["floor.toml", "results.json"]
    assert main(["check", str(path), "--out", str(out)]) == 0
    assert json.loads(out.read_text())["results"]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["floor.toml", "results.json"]


def test_out_gets_the_permissions_of_a_plain_new_file(tmp_path, capsys):
    out = tmp_path / "r.json"
    assert main(["check", str(write(tmp_path, PASSING)), "--out", str(out)]) == 0
    umask = os.umask(0)
    os.umask(umask)
    assert out.stat().st_mode & 0o777 == 0o666 & ~umask


def test_out_into_a_missing_folder_is_a_user_error(tmp_path, capsys):
    status = main(["check", str(write(tmp_path, PASSING)), "--out",
                   str(tmp_path / "no" / "such" / "r.json")])
    assert status == 2
    assert "Traceback" not in capsys.readouterr().err


def test_json_results_validate_against_the_results_schema(tmp_path, capsys):
    _, doc = run_json(capsys, "check", str(write(tmp_path, PASSING + BAD)), "--edition",
                      "aci318-19", "--edition", "is456:2000")
    jsonschema.Draft202012Validator.check_schema(results_schema())
    jsonschema.validate(doc, results_schema())
    broken = json.loads(json.dumps(doc))
    broken["results"][0]["status"] = "probably fine"
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(broken, results_schema())


def test_toml_output_parses_and_holds_the_same_results(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    main(["check", str(path), "--format", "toml"])
    doc = tomllib.loads(capsys.readouterr().out)
    _, as_json = run_json(capsys, "check", str(path))
    assert doc["caution"] == CAUTION
    assert [r["status"] for r in doc["results"]] == [r["status"] for r in as_json["results"]]
    assert doc["results"][0]["resistance"]["design_resistance"] == pytest.approx(
        as_json["results"][0]["resistance"]["design_resistance"])


def test_csv_output_has_the_header_first_the_caution_in_each_row(tmp_path, capsys):
    path = write(tmp_path, PASSING + BAD)
    assert main(["check", str(path), "--format", "csv", "--edition", "aci318-19",
                 "--edition", "as3600:2018", "--units", "SI"]) == 2
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert rows[0][:2] == ["beam", "edition"] and "M_Rd_kNm" in rows[0]
    table = [dict(zip(rows[0], row, strict=True)) for row in rows[1:]]
    assert all(r["caution"] == CAUTION for r in table)
    assessed = [r for r in table if r["status"] != "input problem"]
    assert {(r["beam"], r["edition"]) for r in assessed} == {
        (b, e) for b in ("RB-1", "RB-2") for e in ("aci318-19", "as3600:2018")}
    rb1 = next(r for r in assessed if r["beam"] == "RB-1" and r["edition"] == "aci318-19")
    assert float(rb1["M_Rd_kNm"]) == pytest.approx(rb1_by_hand(150, 100)["M_Rd"])
    assert "aci318-19 0.1" in rb1["stack"]
    assert {r["beam"] for r in table if r["status"] == "input problem"} == {"RB-9"}


# --- reports for people ------------------------------------------------------------------------

def test_rich_reports_carry_the_caution_and_the_verdict(tmp_path, capsys):
    path = write(tmp_path, PASSING + BAD)
    for argv in (["check", str(path)], ["compare", str(path), "--edition", "aci318-19",
                                         "--edition", "csa-a23.3:19"],
                 ["explain", str(path), "RB-1", "--edition", "aci318-19"], ["editions"]):
        main(argv)
        assert CAUTION in words(capsys.readouterr().out), argv
    main(["check", str(path)])
    text = capsys.readouterr().out
    assert "passes; governed by flexural strength" in text
    assert "RB-9" in text and "300 kg" in text  # the refused beam, listed first
    assert text.index("300 kg") < text.index("passes; governed by")
    assert "kip·ft" in text and "kN·m" in text


def test_compare_puts_every_edition_side_by_side(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    status, doc = run_json(capsys, "compare", str(path))
    installed = [e.id for e in clausewise.editions()]
    assert {r["edition"] for r in doc["results"]} == set(installed)
    assert status == (0 if all(r["status"] == "pass" for r in doc["results"]) else 1)
    main(["compare", str(path), "--edition", "aci318-19", "--edition", "en1992-1-1:2004",
          "--details"])
    header = capsys.readouterr().out
    assert "aci318-19" in header and "en1992-1-1:2004" in header
    assert "φMn" in header and "M_Rd" in header  # each edition's own symbol


def test_explain_gives_the_whole_trail_of_one_beam(tmp_path, capsys):
    path = write(tmp_path, PASSING)
    status, doc = run_json(capsys, "explain", str(path), "RB-1", "--edition", "aci318-19")
    assert status == 0
    [rec] = doc["results"]
    labels = [c["label"] for c in rec["effective_width"]["candidates"]]
    governing = [c for c in rec["effective_width"]["candidates"] if c["governs"]]
    assert len(labels) == 3 and len(governing) == 1 and "ln/8" in governing[0]["label"]
    # the others exceed it by their difference: 8hf gives 300 + 2·960 = 2220 mm
    excess = {c["label"]: c["excess"] for c in rec["effective_width"]["candidates"]}
    assert any(v == pytest.approx(2220 - 1800) for v in excess.values())
    assert {p["supplier"] for p in rec["parameters"]} == {"aci318-19"}
    main(["explain", str(path), "RB-1", "--edition", "aci318-19"])
    text = capsys.readouterr().out
    for words in ("edition stack", "block_intensity", "β1", "22.2.2.4.3", "governs",
                  "steel layer", "1.2D + 1.6L", "tension-controlled"):
        assert words in text, words


# --- editions ------------------------------------------------------------------------------------

class NotAnEdition:
    """A plugin that never says who it is."""


def registry_with_a_broken_plugin() -> Registry:
    registry = Registry()
    registry.load_entry_points()
    registry.register(NotAnEdition(), "half-finished")
    return registry


def test_editions_lists_what_is_installed(capsys):
    status = main(["editions", "--format", "json"])
    doc = json.loads(capsys.readouterr().out)
    assert status == 0
    listed = {e["id"]: e for e in doc["editions"]}
    aci = listed["aci318-19"]
    assert aci["year"] == 2019 and aci["distribution"] == "clausewise"
    assert aci["version"] == clausewise.__version__ and "inch-pound" in aci["forms"]
    assert listed["aci318-14"]["title"].startswith("ACI 318-14")


def test_a_broken_plugin_is_listed_and_strict_makes_it_fatal(monkeypatch, capsys):
    monkeypatch.setattr(registry_module, "default_registry", registry_with_a_broken_plugin)
    assert main(["editions"]) == 0
    captured = capsys.readouterr()
    assert "half-finished" in captured.out and "edition_info" in captured.out
    assert "half-finished" in captured.err
    assert main(["editions", "--strict", "--format", "json"]) == 2
    doc = json.loads(capsys.readouterr().out)
    assert [b["name"] for b in doc["broken"]] == ["half-finished"]
    assert "aci318-19" in {e["id"] for e in doc["editions"]}


def test_a_run_that_leaves_a_broken_plugin_out_says_so(monkeypatch, tmp_path, capsys):
    monkeypatch.setattr(registry_module, "default_registry", registry_with_a_broken_plugin)
    path = write(tmp_path, PASSING)
    main(["compare", str(path)])
    err = capsys.readouterr().err
    assert err.count("half-finished is broken and left out") == 1


def test_an_annex_file_becomes_an_edition_over_its_base(tmp_path, capsys):
    pytest.importorskip("clausewise.annexfile")
    path = write(tmp_path, PASSING)
    status, doc = run_json(capsys, "check", str(path), "--annex", str(ANNEX),
                           "--edition", "xl-na:2023")
    assert status in (0, 1)
    rec = by_beam(doc)["RB-1"]
    assert [s["id"] for s in rec["stack"]] == ["en1992-1-1:2004", "xl-na:2023"]
    suppliers = {p["name"]: p["supplier"] for p in rec["parameters"]}
    assert suppliers["alpha_cc"] == "xl-na:2023" and suppliers["gamma_c"] == "en1992-1-1:2004"
    main(["editions", "--annex", str(ANNEX), "--format", "json"])
    assert "xl-na:2023" in {e["id"] for e in json.loads(capsys.readouterr().out)["editions"]}


# --- schema -----------------------------------------------------------------------------------

def test_schema_of_the_input_and_of_the_results(tmp_path, capsys):
    assert main(["schema"]) == 0
    schema = json.loads(capsys.readouterr().out)
    jsonschema.Draft202012Validator.check_schema(schema)
    assert "beam" in schema["properties"]
    out = tmp_path / "results.schema.json"
    assert main(["schema", "--results", "--out", str(out)]) == 0
    assert json.loads(out.read_text()) == results_schema()


# --- figures ------------------------------------------------------------------------------------

def test_figures_option_draws_one_file_per_beam_and_edition(tmp_path, capsys):
    path = write(tmp_path, HEADER + RB1 % ("150 kN m", "100 kN m"))
    folder = tmp_path / "figures"
    assert main(["check", str(path), "--figures", str(folder), "--format", "json"]) == 0
    [svg] = folder.iterdir()
    assert svg.name == "RB-1_aci318-19.svg" and svg.read_text().lstrip().startswith("<?xml")
    assert main(["compare", str(path), "--edition", "aci318-19", "--edition", "is456:2000",
                 "--figures", str(folder), "--figure-format", "png", "--format", "json"]) in (0, 1)
    assert (folder / "RB-1_editions.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_beams_whose_ids_clean_alike_keep_a_figure_each(tmp_path, capsys):
    """"a/b" and "a_b" clean to one file name, "ß" and "é" to none: each beam still
    gets its own figure, and a plain id keeps its plain name."""
    ids = ["a/b", "a_b", "ß", "é"]
    text = HEADER + "".join(RB1.replace('id = "RB-1"', f'id = "{i}"') % ("150 kN m", "100 kN m")
                            for i in ids)
    path = write(tmp_path, text)
    folder = tmp_path / "figures"
    assert main(["check", str(path), "--figures", str(folder), "--format", "json"]) == 0
    names = sorted(p.name for p in folder.iterdir())
    assert len(names) == len(ids) and "a_b_aci318-19.svg" in names
    assert "4 figure(s) written" in capsys.readouterr().err


# --- as installed -------------------------------------------------------------------------------

def test_the_module_runs_as_a_program(tmp_path):
    path = write(tmp_path, PASSING)
    done = subprocess.run([sys.executable, "-m", "clausewise.cli", "check",
                           str(path), "--format", "json"], capture_output=True, text=True,
                          timeout=120, check=False)
    assert done.returncode == 0, done.stderr
    assert {r["status"] for r in json.loads(done.stdout)["results"]} == {"pass"}


def test_help_imports_no_heavy_library():
    code = ("import sys; from clausewise.cli import build_parser; build_parser()"
            ".format_help(); print(sorted(m for m in ('rich', 'matplotlib', 'pint', "
            "'pydantic') if m in sys.modules))")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          timeout=60, check=True)
    assert done.stdout.strip() == "[]"


# --- the demo files ------------------------------------------------------------------------------

@pytest.mark.skipif(not DEMO, reason="fixtures/demo has no schedule files yet")
@pytest.mark.parametrize("demo", DEMO, ids=[p.name for p in DEMO])
def test_every_demo_file_checks_with_a_status_that_matches_its_results(demo, capsys):
    status, doc = run_json(capsys, "check", str(demo))
    statuses = {r["status"] for r in doc["results"]}
    expected = 2 if doc["problems"] or "error" in statuses else (
        0 if statuses <= {"pass"} else 1)
    assert status == expected
    assert doc["caution"] == CAUTION
    jsonschema.validate(doc, results_schema())
    schedule = load_schedule(demo)
    entries = {e.beam.id: e for e in schedule.entries}
    registry = cli_module._registry(schedule.project.annexes)  # the file's annexes too
    for rec in doc["results"]:
        if rec["status"] == "error":
            continue
        direct = assess(entries[rec["beam"]].beam, rec["edition"], registry=registry,
                        form=schedule.project.form, situation=schedule.project.situation)
        assert rec["status"] == direct.status
        assert rec["summary"] == direct.summary()


def test_checking_a_file_for_design_says_to_run_design(capsys):
    design_file = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / \
        "orrin-vale-depot-design.toml"
    assert main(["check", str(design_file), "--edition", "aci318-19"]) == 2
    err = capsys.readouterr().err
    assert err.count("gives its tension steel") == 1
    assert f"clausewise design {design_file}" in err


def test_a_parameter_file_never_takes_the_place_of_an_installed_edition(tmp_path, capsys):
    """Named alone, aci318-19 is the only plugin a run would load; a file calling itself
    aci318-19 (over aci318-14, with φ = 0.5) must still be refused, not assessed as it."""
    annex = tmp_path / "shadow.toml"
    annex.write_text('[annex]\nid = "aci318-19"\ntitle = "not the standard"\nyear = 2025\n'
                     'extends = "aci318-14"\n[parameters]\nphi_tension = 0.5\n',
                     encoding="utf-8")
    path = write(tmp_path, PASSING)
    for command in ("check", "compare", "explain", "batch"):
        argv = [command, str(path), *(["RB-1"] if command == "explain" else []),
                "--annex", str(annex), "--edition", "aci318-19"]
        assert main(argv) == 2
        assert "already an installed edition" in capsys.readouterr().err


def test_strict_stops_a_run_that_would_leave_a_broken_plugin_out(monkeypatch, tmp_path, capsys):
    monkeypatch.setattr(registry_module, "default_registry", registry_with_a_broken_plugin)
    monkeypatch.setenv("CLAUSEWISE_STRICT", "1")
    path = write(tmp_path, PASSING)
    assert main(["compare", str(path)]) == 2
    assert "CLAUSEWISE_STRICT=1" in capsys.readouterr().err
    # naming the edition loads only its plugin; strict must still find the broken one
    assert main(["check", str(path), "--edition", "aci318-19"]) == 2
    assert "CLAUSEWISE_STRICT=1" in capsys.readouterr().err


def test_a_device_is_not_read_as_a_schedule(tmp_path, capsys):
    device = tmp_path / "endless.toml"
    device.symlink_to("/dev/zero")
    assert main(["check", str(device)]) == 2
    assert "not a regular file" in capsys.readouterr().err


@pytest.mark.parametrize("threshold", ["nan", "inf", "-5"])
def test_a_threshold_that_is_no_finite_percentage_is_refused(threshold, tmp_path, capsys):
    path = write(tmp_path, PASSING)
    assert main(["compare", str(path), "--from", "aci318-19", "--to", "aci318-14",
                 "--threshold", threshold]) == 2
    assert "expected a finite percentage" in capsys.readouterr().err
