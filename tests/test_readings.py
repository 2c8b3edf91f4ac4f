"""The contested readings are named parameters with both readings as choices, shown by
``clausewise editions --parameters ID`` with the reason for the default."""

from __future__ import annotations

import json

import pytest

from clausewise.cli import main

READINGS = [  # edition, parameter, default, the other reading
    ("as3600:2018", "gamma_limits", "at least 0.67", "0.67 to 0.85"),
    ("is456:2000", "stress_resultants", "printed", "exact curve"),
    ("en1992-1-1:2004", "neutral_axis_limit", "where redistributed", "always"),
]


@pytest.mark.parametrize(("edition", "name", "default", "other"), READINGS)
def test_reading_is_listed_with_both_choices_and_why(capsys, edition, name, default, other):
    assert main(["editions", "--parameters", edition, "--format", "json"]) == 0
    listed = {p["name"]: p for p in json.loads(capsys.readouterr().out)["parameters"]}
    parameter = listed[name]
    assert parameter["value"] == default
    assert parameter["choices"] == [default, other]
    assert "default" in parameter["description"]
    assert "contested reading" in parameter["clause_title"]
