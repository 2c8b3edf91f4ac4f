"""compare --steel: the tension steel each edition requires, beside the steel given."""

from __future__ import annotations

import json
import re
from pathlib import Path

from clausewise.cli import main

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"
EDITIONS = ["--edition", "aci318-19", "--edition", "en1992-1-1:2004"]


def test_every_beam_gets_a_line_with_the_given_and_the_required_steel(capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "80")
    status = main(["compare", "--steel", str(DEMO), *EDITIONS])
    out = capsys.readouterr().out
    assert status in (0, 1)
    assert max(len(line) for line in out.splitlines()) <= 80
    pattern = re.compile(r"^(B\d+)\s+(\S+ \S+)\s+(\S+ \S+)\s+(\S+ \S+)")
    rows = {m[1]: (m[2], m[3], m[4]) for m in map(pattern.match, out.splitlines()) if m}
    assert set(rows) == {f"B{i}" for i in range(1, 15)}
    # B9 fails flexure in the demo on purpose: it needs more steel than it has
    given, required = rows["B9"][0], rows["B9"][1]
    assert float(required.split()[0]) > float(given.split()[0])
    assert "CAUTION" in out


def test_the_machine_readable_form_is_the_design_document(capsys):
    main(["compare", "--steel", str(DEMO), *EDITIONS, "--format", "json"])
    doc = json.loads(capsys.readouterr().out)
    b9 = [d for d in doc["designs"] if d["beam"] == "B9"]
    assert {d["edition"] for d in b9} == {"aci318-19", "en1992-1-1:2004"}
    assert all(d["required_area"] > 942.0 for d in b9)  # 3 x 20 mm given: 942 mm²


def test_steel_and_a_migration_do_not_go_together(capsys):
    assert main(["compare", "--steel", str(DEMO), "--from", "aci318-19", "--to",
                 "en1992-1-1:2004"]) == 2
    assert "--steel" in capsys.readouterr().err


BEAM = """
[[beam]]
id = "S1"
shape = "T"
web_width = "300 mm"
overall_depth = "650 mm"
slab_thickness = "120 mm"
effective_flange_width = "600 mm"
concrete_strength = "40 MPa"
yield_strength = "500 MPa"
tension = [{{ area = "{area} mm2", depth = "590 mm" }}]
moments = {{ dead = "180 kN m", live = "100 kN m" }}
"""


def test_the_required_steel_is_found_where_the_file_places_its_steel(tmp_path, capsys):
    """Beside the given steel, the area required is the one at the given depth: just that
    much at d = 590 mm passes, 1 % less fails (EN 1992-1-1 6.1, hand check: about
    1590 mm² at d = 590 mm, against 1548 mm² at the 605 mm of a 20 mm bar at the cover)."""
    path = tmp_path / "s1.toml"
    path.write_text(BEAM.format(area=1565), encoding="utf-8")
    main(["compare", "--steel", str(path), "--edition", "en1992-1-1:2004", "--format",
          "json"])
    [d] = json.loads(capsys.readouterr().out)["designs"]
    required = d["required_area"]
    assert 1580 < required < 1600
    for area, passes in ((required * 1.001, True), (required * 0.99, False)):
        path.write_text(BEAM.format(area=f"{area:.3f}"), encoding="utf-8")
        status = main(["check", str(path), "--edition", "en1992-1-1:2004", "--format",
                       "json"])
        capsys.readouterr()
        assert (status == 0) is passes


def test_a_blank_required_area_is_explained(capsys, monkeypatch, tmp_path):
    """A 250 x 400 mm beam under 2 000 kN·m (invented) needs more than any steel can give
    at its size: the blank cell ("– mm²") is followed by why, and the least depth or width
    that would do."""
    monkeypatch.setenv("COLUMNS", "80")
    beam = tmp_path / "heavy.toml"
    beam.write_text('[project]\nname = "Tollby silo"\n\n[[beam]]\nid = "H1"\n'
                    'shape = "rectangular"\nweb_width = "250 mm"\noverall_depth = "400 mm"\n'
                    'concrete_strength = "30 MPa"\nyield_strength = "500 MPa"\n'
                    'tension = [{ bars = "3 x 25 mm", depth = "340 mm" }]\n'
                    'moments = { factored = "2000 kN m" }\n', encoding="utf-8")
    main(["compare", "--steel", str(beam), "--edition", "csa-a23.3:19"])
    out = " ".join(capsys.readouterr().out.split())
    assert "– mm²" in out
    assert "csa-a23.3:19: – for H1: no area of steel passes: the section must grow" in out
