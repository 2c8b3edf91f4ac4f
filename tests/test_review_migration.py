"""`compare --from ID --to ID` names the drivers an engineer would name: going from
ACI 318-19 to EN 1992-1-1 the design stresses fall (0.85 f'c to η fcd, fy to fyd), which
the editions' differently named factors alone never showed."""

from __future__ import annotations

import re
from pathlib import Path

from clausewise.cli import main

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"


def test_aci_to_en_names_the_design_stresses(monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", "120")
    main(["compare", str(DEMO), "--from", "aci318-19", "--to", "en1992-1-1:2004"])
    out = " ".join(capsys.readouterr().out.split())
    # demo B1: f'c = fck = 32 MPa, fy = fyk = 500 MPa. ACI 318-19 22.2.2.4.1: 0.85 f'c =
    # 27.2 MPa, steel at fy = 500 MPa; EN 1992-1-1 3.1.6(1), 3.1.7(3), Table 2.1N (from
    # memory): η fcd = 32/1.5 = 21.33 MPa, fyd = 500/1.15 = 434.8 MPa
    assert "concrete design stress 27.2 MPa → 21.33 MPa (-22%)" in out
    assert "tension steel stress 500 MPa → 434.8 MPa (-13%)" in out


def test_no_change_says_so_instead_of_an_empty_table(monkeypatch, capsys):
    # ACI 318-14 differs from 318-19 in φ's transition (εt 0.005), which none of the
    # demo's tension-controlled beams reaches: nothing changes
    monkeypatch.setenv("COLUMNS", "80")
    main(["compare", str(DEMO), "--from", "aci318-19", "--to", "aci318-14"])
    out = " ".join(capsys.readouterr().out.split())
    assert "No beam of 14 changes" in out
    assert "what changes, and the drivers" not in out


def test_a_threshold_below_one_per_cent_is_shown_as_given_and_equal_drivers_are_left_out(
        monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", "120")
    main(["compare", str(DEMO), "--from", "en1992-1-1:2004", "--to", "is456:2000",
          "--threshold", "0.5"])
    out = " ".join(capsys.readouterr().out.split())
    assert "by more than 0.5%" in out
    # a driver whose value is the same on both sides does not drive the change, even
    # when the editions name it otherwise (b_eff, bf)
    assert not re.search(r"→ \w+ (\d[\d.]*) mm → \1 mm", out)
