"""Hostile command lines: an output that would destroy the input or cannot be written is
refused up front with a message in the user's words, exit status 2, and nothing is
changed on disk."""

from __future__ import annotations

import csv
import io
import shutil
from pathlib import Path

import pytest

from clausewise.cli import main

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo"
CHECKED = DEMO / "quellmoor-library.toml"
DESIGNED = DEMO / "orrin-vale-depot-design.toml"


def test_design_never_writes_over_its_own_input(tmp_path, capsys):
    source = tmp_path / "schedule.toml"
    shutil.copy(DESIGNED, source)
    before = source.read_bytes()
    assert main(["design", str(source), "--out", str(source)]) == 2
    assert source.read_bytes() == before
    assert "would overwrite the input file" in capsys.readouterr().err


@pytest.mark.parametrize("command", [["check", str(CHECKED), "--edition", "aci318-19"],
                                     ["design", str(DESIGNED), "--edition", "aci318-19"],
                                     ["batch", str(CHECKED)]])
def test_an_out_in_a_missing_folder_is_refused_in_plain_words(tmp_path, capsys, command):
    target = tmp_path / "no-such-folder" / "results.csv"
    assert main([*command, "--out", str(target)]) == 2
    err = capsys.readouterr().err
    assert f"--out {target}" in err and "does not exist" in err
    assert ".tmp" not in err and "Errno" not in err
    assert not target.parent.exists()


def test_an_out_that_is_a_folder_is_refused(tmp_path, capsys):
    assert main(["check", str(CHECKED), "--edition", "aci318-19", "--out", str(tmp_path)]) == 2
    assert "is a folder" in capsys.readouterr().err


def test_figures_into_a_file_is_refused_before_any_report(tmp_path, capsys):
    keep = tmp_path / "notes.txt"
    keep.write_text("the engineer's notes", encoding="utf-8")
    assert main(["check", str(CHECKED), "--edition", "aci318-19",
                 "--figures", str(keep)]) == 2
    out, err = capsys.readouterr()
    assert out == "" and "--figures" in err and "not a folder" in err
    assert keep.read_text(encoding="utf-8") == "the engineer's notes"


REFUSED = """
[project]
name = "Corran Yard sheds"
units = "SI"

[[beam]]
id = "WIDE"
shape = "rectangular"
web_width = "300 mm"
overall_depth = "700 mm"
concrete_strength = "30 MPa"
yield_strength = "500 MPa"
tension = [{ bars = "12 x 32 mm", depth = "620 mm" }]
moments = { factored = "100 kN m" }
"""


@pytest.mark.parametrize(("command", "verb"), [("check", "checked"), ("compare", "compared")])
def test_a_file_whose_every_beam_is_refused_says_so(tmp_path, capsys, command, verb):
    """Not an empty table with a blank legend, nor advice to give --edition when one was
    given: one line saying no beam was assessed, then the caution."""
    path = tmp_path / "refused.toml"
    path.write_text(REFUSED, encoding="utf-8")
    assert main([command, str(path), "--edition", "aci318-19"]) == 2
    out = " ".join(capsys.readouterr().out.split())
    assert f"No beam could be {verb}" in out
    assert "give --edition ID" not in out and "marks:" not in out
    assert "CAUTION" in out


@pytest.mark.parametrize("asked", [["--out", "design.html"], ["--format", "pdf"],
                                   ["--format", "html"]])
def test_design_refuses_the_sheet_formats_in_words(tmp_path, capsys, asked):
    """`design --out design.html` raised a KeyError traceback; it is a usage error (exit 2)
    that says which formats design writes and where the sheet comes from."""
    args = [a if not a.endswith(".html") else str(tmp_path / a) for a in asked]
    assert main(["design", str(DESIGNED), "--edition", "aci318-19", *args]) == 2
    err = capsys.readouterr().err
    assert "design writes text, json, toml or csv" in err and "Traceback" not in err
    assert not (tmp_path / "design.html").exists()


def test_schema_is_written_only_as_json(tmp_path, capsys):
    """`schema --out schema.pdf` wrote JSON text into a .pdf file; the extension decides
    the format everywhere else, so a schema goes only to .json."""
    assert main(["schema", "--out", str(tmp_path / "schema.pdf")]) == 2
    assert not (tmp_path / "schema.pdf").exists()
    assert "written as .json" in capsys.readouterr().err
    assert main(["schema", "--out", str(tmp_path / "schema.json")]) == 0


@pytest.mark.parametrize("command", [["editions"], ["editions", "aci318-19"],
                                     ["editions", "--parameters", "csa-a23.3:19"]])
def test_listing_csv_has_its_header_first_and_the_caution_in_every_row(command, capsys):
    """The listings' CSV began with a "# caution" line, which a CSV reader takes for the
    header; like check's CSV, the header comes first and the caution is the last column."""
    import csv
    import io

    from clausewise.provisions import CAUTION

    assert main([*command, "--format", "csv"]) == 0
    rows = list(csv.DictReader(io.StringIO(capsys.readouterr().out)))
    assert rows and list(rows[0])[-1] == "caution"
    assert all(r["caution"] == CAUTION for r in rows)
    assert not any(key.startswith("#") for key in rows[0])


BEAM_WITH_ID = """[project]
units = "SI"

[[beam]]
id = "{id}"
shape = "rectangular"
web_width = 300
overall_depth = 600
concrete_strength = 30
yield_strength = 420
tension = [{{ area = 1500, depth = 540 }}]
moments = {{ factored = "100 kN m" }}
"""


@pytest.mark.parametrize(("written", "shown"), [("B\\r1", "B\\r1"), ("B\\t1", "B\\t1"),
                                                ("B\\u00001", "B\\x001")])
def test_an_id_with_a_control_character_is_refused_and_shown_escaped(tmp_path, capsys,
                                                                     written, shown):
    """A carriage return in an id shows in a terminal as another id ("B1") and breaks the
    CSV rows, so it is refused, and the refusal shows it as an escape."""
    path = tmp_path / "ids.toml"
    path.write_text(BEAM_WITH_ID.format(id=written), encoding="utf-8")
    rows = tmp_path / "rows.csv"
    assert main(["batch", str(path), "--edition", "aci318-19", "--out", str(rows)]) == 2
    text = rows.read_text(encoding="utf-8")
    assert "without control characters" in text
    assert text.count("\n") == 2 and f"{shown},aci318-19" in text  # header and one row
    assert "refused" in text and "\r" not in text and "\t" not in text


def test_an_id_in_any_script_is_kept(tmp_path, capsys):
    path = tmp_path / "ids.toml"
    path.write_text(BEAM_WITH_ID.format(id="Träger 7/Ø–2"), encoding="utf-8")
    assert main(["check", str(path), "--edition", "aci318-19"]) == 0
    assert "Träger 7/Ø–2" in capsys.readouterr().out


def test_a_figures_folder_that_cannot_be_made_is_said_of_the_option(tmp_path, capsys,
                                                                    monkeypatch):
    def refuse(self, *args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(Path, "mkdir", refuse)
    folder = tmp_path / "figs"
    assert main(["check", str(CHECKED), "--edition", "aci318-19", "--figures",
                 str(folder)]) == 2
    err = capsys.readouterr().err
    assert f"--figures {folder}: cannot make the folder: Permission denied" in err
    assert "Errno" not in err


def test_an_operating_system_error_names_its_file_without_its_number(tmp_path, capsys,
                                                                     monkeypatch):
    """A failure the command does not word itself (here the report's file, refused by the
    system after it is opened) still names the file, in the user's words."""
    import clausewise.results as results

    def full(path, data):
        raise OSError(28, "No space left on device", str(path))

    monkeypatch.setattr(results, "write_atomic", full)
    out = tmp_path / "r.json"
    assert main(["check", str(CHECKED), "--edition", "aci318-19", "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert f"{out}: No space left on device" in err and "Errno" not in err
    assert not out.exists()


def test_a_megabyte_of_unit_text_is_not_echoed(tmp_path, capsys):
    text = CHECKED.read_text(encoding="utf-8").replace(
        'web_width = "350 mm"', 'web_width = "350 ' + "q" * 1_000_000 + '"', 1)
    source = tmp_path / "hostile.toml"
    source.write_text(text, encoding="utf-8")
    main(["check", str(source), "--edition", "aci318-19"])
    out, err = capsys.readouterr()
    assert "q" * 100 not in out + err
    assert "(1 000 004 characters)" in out


def test_check_csv_gives_a_refused_beam_one_row_with_all_its_problems(tmp_path, capsys):
    text = CHECKED.read_text(encoding="utf-8").replace(
        'web_width = "350 mm"', 'web_width = "30 MPa"', 1).replace(
        'overall_depth = "650 mm"', 'overall_depth = "650 kg"', 1)
    source = tmp_path / "two-slips.toml"
    source.write_text(text, encoding="utf-8")
    main(["check", str(source), "--edition", "aci318-19", "--format", "csv"])
    rows = [r for r in csv.DictReader(io.StringIO(capsys.readouterr().out))
            if r["status"] == "input problem"]
    assert [r["beam"] for r in rows] == ["B1"]
    assert "field web_width" in rows[0]["summary"]
    assert "field overall_depth" in rows[0]["summary"]
