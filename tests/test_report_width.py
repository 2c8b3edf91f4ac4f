"""A report that does not go to a terminal takes the width COLUMNS asks for (a pager, a
file, a terminal of 80 columns behind a pipe), else 110 columns."""

from __future__ import annotations

from pathlib import Path

import pytest

from clausewise.cli import REPORT_WIDTH, main

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"


@pytest.mark.parametrize(("columns", "widest"), [("80", 80), ("120", 120), ("", REPORT_WIDTH)])
def test_piped_reports_take_the_asked_width(columns, widest, monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", columns)
    main(["compare", str(DEMO), "--edition", "aci318-19", "--edition", "en1992-1-1:2004"])
    lines = capsys.readouterr().out.splitlines()
    assert max(len(line) for line in lines) <= widest
    assert max(len(line) for line in lines) > widest - 10  # the width is used, not ignored
    assert any("B9" in line and "✗" in line for line in lines)  # the failing beam shown
