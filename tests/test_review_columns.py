"""A report piped or redirected reads at the width the user asked for with ``COLUMNS``
(``COLUMNS=80 clausewise compare F | less``), not at the file width."""

from __future__ import annotations

from pathlib import Path

import pytest

from clausewise.cli import main

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo"


@pytest.mark.parametrize("command", [
    ["compare", str(DEMO / "quellmoor-library.toml")],
    ["check", str(DEMO / "quellmoor-library.toml"), "--edition", "aci318-19"],
    ["design", str(DEMO / "orrin-vale-depot-design.toml")],
])
def test_columns_from_the_environment_bound_a_piped_report(command, monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", "80")
    main(command)
    lines = capsys.readouterr().out.splitlines()
    assert lines, "the report is empty"
    assert max(len(line) for line in lines) <= 80
