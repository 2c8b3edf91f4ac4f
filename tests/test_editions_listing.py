"""What an edition author sees before writing a line, and what a broken stack looks like."""

from __future__ import annotations

import json

from clausewise.cli import main
from clausewise.provisions import EditionInfo, Parameter, Registry, hookimpl
from clausewise.provisions import registry as registry_module
from clausewise.provisions.testing import check_edition

FIRM = EditionInfo("xx-too-bold:2025", "an invented firm's rules", 2025,
                   extends="csa-a23.3:19")


class TooBold:
    """Sets φc below what its base allows (CSA bounds it at 0.5..1.0 in this plugin)."""

    @hookimpl
    def edition_info(self):
        return FIRM

    @hookimpl
    def edition_parameters(self):
        return [Parameter("phi_c", 0.45, FIRM.clause("XX-1", "house factor on concrete"))]


def with_too_bold() -> Registry:
    registry = Registry()
    registry.load_entry_points()
    registry.register(TooBold(), name=FIRM.id)
    return registry


def test_parameters_of_an_edition_with_what_a_layer_may_set(capsys):
    assert main(["editions", "--parameters", "csa-a23.3:19", "--format", "json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    by_name = {p["name"]: p for p in doc["parameters"]}
    # CSA A23.3-19 8.4.2, from memory: φc = 0.65
    assert by_name["phi_c"]["value"] == 0.65 and by_name["phi_c"]["supplier"] == "csa-a23.3:19"
    assert by_name["phi_c"]["bounds"] == [0.5, 1.0]
    assert "licensed engineer" in doc["caution"]
    assert main(["editions", "--parameters", "aci318-19", "--form", "inch-pound",
                 "--format", "json"]) == 0
    es = {p["name"]: p for p in json.loads(capsys.readouterr().out)["parameters"]}
    assert es["steel_modulus"]["value"] == 29_000_000 * 0.006894757293168361  # 29 000 ksi


def test_a_stack_that_breaks_its_base_contract_is_listed_and_strict_fails(monkeypatch,
                                                                           capsys):
    monkeypatch.setattr(registry_module, "default_registry", with_too_bold)
    assert main(["editions"]) == 0
    captured = capsys.readouterr()
    assert "cannot be used" in captured.out and "phi_c = 0.45" in captured.err
    assert main(["editions", "--strict", "--format", "json"]) == 2
    broken = json.loads(capsys.readouterr().out)["broken"]
    assert [b["name"] for b in broken] == [FIRM.id]


def test_the_kit_reports_such_a_stack_instead_of_failing():
    findings = check_edition(FIRM.id, with_too_bold())
    assert findings and all("phi_c = 0.45" in f.message for f in findings)


def with_wrapping_firm() -> Registry:
    import importlib.util
    from pathlib import Path

    source = (Path(__file__).resolve().parents[1]
              / "fixtures/local-editions/local_editions/fennick_beams.py")
    spec = importlib.util.spec_from_file_location("fennick_beams_listing", source)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    registry = Registry(only=frozenset({"en1992-1-1:2004"}))
    registry.load_entry_points()
    registry.register(module)
    return registry


def test_editions_id_shows_which_layer_answers_each_topic(monkeypatch, capsys):
    from clausewise.provisions.hookspecs import HOOKS

    monkeypatch.setattr(registry_module, "default_registry", with_wrapping_firm)
    firm, base = "fennick-beams:2025", "en1992-1-1:2004"
    assert main(["editions", firm, "--format", "json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["layers"] == [base, firm] and "licensed engineer" in doc["caution"]
    topics = {t["hook"]: t for t in doc["topics"]}
    assert list(topics) == [h.name for h in HOOKS]
    assert topics["effective_flange_width"] == {"hook": "effective_flange_width",
                                                "answered_by": [base], "wrapped_by": [firm]}
    assert topics["concrete_law"]["answered_by"] == [base]
    assert topics["concrete_law"]["wrapped_by"] == []
    assert main(["editions", firm]) == 0
    text = " ".join(capsys.readouterr().out.split())
    assert f"effective_flange_width {base} {firm}" in text
    assert main(["editions", "--format", "json"]) == 0
    listed = {e["id"]: e for e in json.loads(capsys.readouterr().out)["editions"]}
    assert listed[firm]["own_topics"] == {"effective_flange_width": "wraps"}
    assert len(listed[base]["own_topics"]) >= 8
