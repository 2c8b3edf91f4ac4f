"""What a user does with `clausewise design`: copy the chosen bars into the beam file as
bars and re-check them with `clausewise check`; they must pass. And the bars chosen are
ones an engineer would place (few, larger bars in one layer where the mass hardly
differs), not the lightest arrangement at any count."""

from __future__ import annotations

import json
import re
import tomllib
from pathlib import Path

import pytest
import tomli_w

from clausewise.cli import main
from clausewise.provisions.bars import METRIC
from clausewise.provisions.design import PRACTICAL_MARGIN, Arrangement, preferred

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "orrin-vale-depot-design.toml"
EDITIONS = ("aci318-19", "en1992-1-1:2004", "csa-a23.3:19", "as3600:2018", "is456:2000")


def _layers(record: dict) -> tuple[list[dict], list[dict]]:
    """The design's bars as beam-file layers, as an engineer copies them from the output."""
    main_bars, _, top = record["bars"].partition("; compression ")
    size = re.sub(r"^\d+\s*(x\s*)?", "", main_bars.split(" (")[0])
    joiner = " x " if "mm" in size else " "
    unit = record["units"]["length"]  # the beam's own units, as the record names them
    tension = [{"bars": f"{n}{joiner}{size}", "depth": f"{depth} {unit}"}
               for n, depth in zip(record["layers"], record["layer_depths"], strict=True)]
    compression = [{"bars": top, "depth": f"{record['compression_depth']} {unit}"}
                   ] if top else []
    return tension, compression


@pytest.mark.parametrize("edition", EDITIONS)
def test_every_chosen_arrangement_passes_check_from_a_beam_file(edition, tmp_path, capsys):
    out = tmp_path / "design.json"
    main(["design", str(DEMO), "--edition", edition, "--out", str(out)])
    designs = {d["beam"]: d for d in json.loads(out.read_text(encoding="utf-8"))["designs"]}
    document = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    for beam in document["beam"]:
        record = designs[beam["id"]]
        assert record["bars"], record["message"]
        beam["tension"], compression = _layers(record)
        if compression:
            beam["compression"] = compression
    detailed = tmp_path / "detailed.toml"
    detailed.write_text(tomli_w.dumps(document), encoding="utf-8")
    capsys.readouterr()
    assert main(["check", str(detailed), "--edition", edition, "--format", "json"]) == 0
    results = json.loads(capsys.readouterr().out)["results"]
    assert len(results) == len(document["beam"])
    assert all(r["status"] == "pass" for r in results)


def test_the_l_beam_gets_four_20s_not_fourteen_10s(tmp_path):
    """Demo M4 (L beam, bw 350 mm) under EN 1992-1-1 needs about 1023 mm²: 14 x 10 mm in
    two layers (1100 mm², 8.63 kg/m) is the lightest that passes, 4 x 20 mm (1257 mm²,
    9.86 kg/m: 2.466 kg/m per 20 mm bar, trade tables) is 14 % heavier and is what an
    engineer places (common practice: few, larger bars in one layer)."""
    out = tmp_path / "design.json"
    main(["design", str(DEMO), "--edition", "en1992-1-1:2004", "--out", str(out)])
    m4 = next(d for d in json.loads(out.read_text(encoding="utf-8"))["designs"]
              if d["beam"] == "M4")
    assert m4["bars"] == "4 x 20 mm"
    assert m4["mass_per_metre"] == pytest.approx(4 * 2.466, rel=0.001)


def _bars(n_bottom: int, n_top: int, diameter: float) -> Arrangement:
    size = next(s for s in METRIC if s.diameter == diameter)
    counts = (n_bottom,) if n_top == 0 else (n_bottom, n_top)
    return Arrangement(size, counts, tuple(500.0 - 40 * i for i in range(len(counts))))


def test_the_practical_rule_by_hand():
    """Masses from the bar areas (7850 kg/m³, common practice): 10 mm 0.617, 12 mm 0.888,
    16 mm 1.578, 20 mm 2.466 kg/m per bar."""
    ten_x_12 = _bars(5, 5, 12.0)     # 8.88 kg/m, the lightest, two layers
    four_x_20 = _bars(4, 0, 20.0)    # 9.86 kg/m, 11 % heavier: within the margin
    six_x_16 = _bars(6, 0, 16.0)     # 9.47 kg/m, one layer but six bars
    assert PRACTICAL_MARGIN >= 0.11
    assert preferred([ten_x_12, six_x_16, four_x_20]) is four_x_20
    # two and three bars count alike: the lighter of 2 x 25 mm (7.71) and 3 x 20 mm (7.40)
    two_x_25, three_x_20 = _bars(2, 0, 25.0), _bars(3, 0, 20.0)
    assert preferred([two_x_25, three_x_20]) is three_x_20
    # beyond the margin the lighter arrangement stays: 4 x 16 mm (6.31) against
    # 3 x 25 mm (11.56, 83 % heavier)
    four_x_16, three_x_25 = _bars(4, 0, 16.0), _bars(3, 0, 25.0)
    assert preferred([three_x_25, four_x_16]) is four_x_16


def test_the_text_report_gives_what_a_beam_file_needs_to_re_check(tmp_path, monkeypatch,
                                                                   capsys):
    """An engineer copies bars and depth from the screen: M4 under EN 1992-1-1 reads
    "4 x 20 mm" and "d = 605 mm" (650 - 25 cover - 10 stirrup - 10 half bar, the edition's
    default cover, from memory of 4.4.1), and those re-check as passing."""
    monkeypatch.setenv("COLUMNS", "80")
    main(["design", str(DEMO), "--edition", "en1992-1-1:2004"])
    lines = capsys.readouterr().out.splitlines()
    start = next(i for i, line in enumerate(lines) if line.startswith("M4 ·"))
    row = next(i for i in range(start, len(lines)) if lines[i].startswith("en1992-1-1:2004"))
    bars = re.search(r"\d+ x \d+ mm", lines[row]).group(0)
    depth = re.search(r"d = (\d+) mm", lines[row + 1]).group(1)
    assert (bars, depth) == ("4 x 20 mm", "605")
    document = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    m4 = next(b for b in document["beam"] if b["id"] == "M4")
    m4["tension"] = [{"bars": bars, "depth": f"{depth} mm"}]
    document["beam"] = [m4]
    path = tmp_path / "m4.toml"
    path.write_text(tomli_w.dumps(document), encoding="utf-8")
    assert main(["check", str(path), "--edition", "en1992-1-1:2004"]) == 0
