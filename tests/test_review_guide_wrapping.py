"""A local edition written from DEVELOPERS.md alone: an invented firm over CSA A23.3-19
that wraps a check of its base. It must conform, and the check names the guide gives
for wrapping must be names the built-in editions really use."""

from __future__ import annotations

import re
from collections.abc import Generator, Sequence
from dataclasses import replace
from pathlib import Path

import pytest

from clausewise.provisions import (
    Beam,
    Bending,
    Check,
    EditionInfo,
    Layer,
    Parameter,
    Parameters,
    Registry,
    Shape,
    assess,
    hookimpl,
)
from clausewise.provisions.testing import check_edition

GUIDE = Path(__file__).resolve().parents[1] / "DEVELOPERS.md"
EDITION = EditionInfo("pellbrook-beams:2026", "Pellbrook Structures beam rules over CSA "
                      "A23.3-19", 2026, extends="csa-a23.3:19", summary="c/d limit tightened")


class Pellbrook:
    """PB-4: c/d at most 0.85 of CSA A23.3-19 10.5.2's 700/(700 + fy) (invented firm)."""

    @hookimpl
    def edition_info(self) -> EditionInfo:
        return EDITION

    @hookimpl
    def edition_parameters(self) -> Sequence[Parameter]:
        return [Parameter("cd_share", 0.85, EDITION.clause("PB-4", "share of the c/d limit"),
                          "share of 700/(700 + fy) allowed", (0.5, 1.0))]

    @hookimpl(wrapper=True)
    def ductility_limits(self, params: Parameters) -> Generator[None, list[Check],
                                                                 list[Check]]:
        checks = yield
        return [replace(c, limit=params.value("cd_share") * c.limit,
                        clause=params["cd_share"].clause)
                if c.name == "neutral-axis depth ratio" else c for c in checks]


@pytest.fixture
def registry():
    reg = Registry(only=frozenset({"csa-a23.3:19", "en1992-1-1:2004"}), strict=True)
    reg.load_entry_points()
    reg.register(Pellbrook(), "pellbrook")
    return reg


def _beam() -> Beam:
    return Beam("R1", Shape.RECTANGLE, Bending.SAGGING, web_width=300.0, depth=600.0,
                concrete_strength=30.0, yield_strength=400.0,
                tension=(Layer(area=2000.0, depth=540.0),))


def test_the_firm_edition_conforms_and_tightens_the_limit(registry):
    assert check_edition("pellbrook-beams:2026", registry) == []
    firm = assess(_beam(), registry.edition("pellbrook-beams:2026"))
    check = next(c for c in firm.checks if c.name == "neutral-axis depth ratio")
    # CSA A23.3-19 10.5.2 (from memory): c/d ≤ 700/(700 + fy) = 700/1100 = 0.636;
    # the firm's PB-4 allows 0.85 of it = 0.541
    assert check.limit == pytest.approx(0.85 * 700 / 1100, rel=1e-9)
    assert check.clause.ref == "PB-4" and check.clause.edition == "pellbrook-beams:2026"
    base = assess(_beam(), registry.edition("csa-a23.3:19"))
    assert next(c for c in base.checks if c.name == "neutral-axis depth ratio").limit == \
        pytest.approx(700 / 1100, rel=1e-9)


def test_the_check_names_the_guide_tells_wrappers_to_match_exist(registry):
    text = " ".join(GUIDE.read_text(encoding="utf-8").split())
    named = set(re.findall(r'c\.name == "([^"]+)"', text))
    named |= set(re.findall(r'c/d limit is "([^"]+)"', text))
    named |= set(re.findall(r'steel cap "([^"]+)"', text))
    assert "neutral-axis depth ratio" in named and "maximum reinforcement" in named
    used = {c.name for edition in ("csa-a23.3:19", "en1992-1-1:2004")
            for c in assess(_beam(), registry.edition(edition)).checks}
    assert named <= used


def test_the_calculation_sheet_names_who_answered_each_topic(tmp_path, capsys):
    """Issue 14: the sheet, like explain and the JSON, says which layer of a local
    edition's stack answered each topic and which wrapped it (Fennick & Lyle wrap the
    base's effective flange width)."""
    from clausewise.cli import main

    demo = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"
    out = tmp_path / "calcs.html"
    main(["check", str(demo), "--edition", "fennick-beams:2025", "--out", str(out)])
    page = out.read_text(encoding="utf-8")
    assert "who answered each topic" in page
    row = re.search(r"<tr><td>effective_flange_width</td><td>([^<]*)</td><td>([^<]*)</td>",
                    page)
    assert row is not None and row.groups() == ("en1992-1-1:2004", "fennick-beams:2025")
