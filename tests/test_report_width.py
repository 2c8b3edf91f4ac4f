"""A report that does not go to a terminal takes the width COLUMNS asks for (a pager, a
file, a terminal of 80 columns behind a pipe), else 110 columns."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from clausewise.cli import REPORT_WIDTH, main
from clausewise.provisions import default_registry

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"


@pytest.mark.parametrize(("columns", "widest"), [("80", 80), ("120", 120), ("", REPORT_WIDTH)])
def test_piped_reports_take_the_asked_width(columns, widest, monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", columns)
    main(["compare", str(DEMO), "--edition", "aci318-19", "--edition", "en1992-1-1:2004"])
    lines = capsys.readouterr().out.splitlines()
    assert max(len(line) for line in lines) <= widest
    assert max(len(line) for line in lines) > widest - 10  # the width is used, not ignored
    assert any("B9" in line and "✗" in line for line in lines)  # the failing beam shown


@pytest.mark.parametrize("columns", ["80", "120"])
def test_the_legend_keeps_each_key_with_its_edition(columns, monkeypatch, capsys):
    """Every installed edition compared: the key list wraps between entries, so a reader
    finds "J xb-na:2024" on one line, never "J" at a line's end and its id below."""
    monkeypatch.setenv("COLUMNS", columns)
    main(["compare", str(DEMO)])
    out = capsys.readouterr().out
    lines = out.splitlines()
    start = next(i for i, line in enumerate(lines) if line.startswith("editions: A "))
    legend = [lines[start]]
    legend += [line for line in lines[start + 1:] if line.startswith("  ")][:5]
    entries = " ".join(line.strip() for line in legend).removeprefix("editions: ").split("; ")
    ids = [entry.split(" ", 1) for entry in entries]
    assert [key for key, _ in ids][:3] == ["A", "B", "C"]
    assert all(len(pair) == 2 and pair[1] for pair in ids)  # a key never stands alone
    for line in legend:
        assert len(line) <= int(columns)
        assert not line.rstrip().endswith((" A", " B", " C", " D", " E", " F", " G", " H",
                                           " I", " J"))


@pytest.mark.parametrize("columns", [80, 120])
def test_the_edition_stack_never_cuts_a_module_path(columns, monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", str(columns))
    main(["explain", str(DEMO), "B6", "--edition", "en1992-1-1:2004"])
    out = capsys.readouterr().out
    assert "clausewise.plugins.en1992_1_1_2004" in out
    assert max(map(len, out.splitlines())) <= columns


UNIT_WORDS = ("mm", "mm²", "kN·m", "kN", "MPa", "m", "l", "in", "kip·ft", "psi", "ksi")


@pytest.mark.parametrize("columns", [80, 120])
@pytest.mark.parametrize("edition", ["en1992-1-1:2004", "aci318-19", "as3600:2018"])
def test_a_number_stays_on_the_line_of_its_unit(columns, edition, monkeypatch, capsys):
    """Every beam's details at 80 and 120 columns: no line ends in a number whose unit or
    symbol opens the next line ("271.2 / kN·m", "0.85 / l" were printed at 80)."""
    monkeypatch.setenv("COLUMNS", str(columns))
    assert main(["check", str(DEMO), "--edition", edition, "--details"]) == 1  # B9 fails
    lines = capsys.readouterr().out.splitlines()
    assert any("kN·m" in line for line in lines)
    for above, below in zip(lines, lines[1:], strict=False):
        last = above.split()[-1] if above.split() else ""
        first = below.split()[0] if below.split() else ""
        number = last.replace(".", "", 1).isdigit()
        assert not (number and first in UNIT_WORDS), f"{above!r} / {below!r}"
        assert not (last in ("≤", "≥") and first[:1].isdigit()), f"{above!r} / {below!r}"
    assert max(map(len, lines)) <= columns


@pytest.mark.parametrize("columns", [80, 120])
@pytest.mark.parametrize("command", [["check", "--details"], ["compare", "--details"]])
def test_edition_ids_are_never_cut_in_the_details(columns, command, monkeypatch, capsys):
    """Every installed edition, the local ones citing their base's clauses: each id that
    appears is whole ("en1992-1-1:200" lost its last digit in the clause column at 80,
    and the governing cell split "[en1992-1-1:2 / 004 6.1]")."""
    monkeypatch.setenv("COLUMNS", str(columns))
    main([command[0], str(DEMO), *command[1:]])
    out = capsys.readouterr().out
    ids = set(default_registry().ids())
    seen = set(re.findall(r"[a-z][a-z0-9.-]*:\d+", out))
    assert "en1992-1-1:2004" in seen
    assert seen <= ids, sorted(seen - ids)
    assert max(map(len, out.splitlines())) <= columns
    assert "governing check" in out if command[0] == "compare" else "clause" in out


DESIGN_DEMO = DEMO.with_name("orrin-vale-depot-design.toml")


@pytest.mark.parametrize("columns", [80, 120])
def test_the_design_report_keeps_its_headers_and_units(columns, monkeypatch, capsys):
    """Every edition's design of the demo beams: the mass column's header is whole in every
    beam's table (M7's compression bars widened its table and cut "+kg/m" to "+kg/"), a
    number stays with its unit, and the legend says what each "+" means."""
    monkeypatch.setenv("COLUMNS", str(columns))
    main(["design", str(DESIGN_DEMO)])
    out = capsys.readouterr().out
    lines = out.splitlines()
    tables = sum(line.startswith("edition") and "bars chosen" in line for line in lines)
    assert tables >= 10
    assert sum(line.rstrip().endswith(("+kg/m", "+lb/ft")) for line in lines) == tables
    for above, below in zip(lines, lines[1:], strict=False):
        last = above.split()[-1] if above.split() else ""
        first = below.split()[0] if below.split() else ""
        assert not (last.replace(".", "", 1).isdigit() and first in UNIT_WORDS), (above, below)
    assert "steel mass above the lightest edition's" in " ".join(out.split())
    assert "+: compression steel needed too" in " ".join(out.split())
    assert "ductility allows" not in out
    assert max(map(len, lines)) <= columns
