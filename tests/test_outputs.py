"""Nothing lost (issue 13): an output never replaces an input, the extension decides the
format, a batch replaces a good file only when complete, every file written is confirmed;
commands that name editions load only those."""

from __future__ import annotations

import csv
import json
import math
from pathlib import Path

import pytest

from clausewise import results
from clausewise import stream as stream_module
from clausewise.beamfile import parse_schedule
from clausewise.cli import main
from clausewise.outputs import FORMATS, OutputError, format_for, partial_name
from clausewise.provisions import (
    CAUTION,
    EditionInfo,
    ElasticPlastic,
    Factor,
    Regime,
    Registry,
    Resistance,
    hookimpl,
)
from clausewise.provisions import registry as registry_module
from clausewise.provisions.answers import MaterialModel

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "fixtures" / "demo" / "quellmoor-library.toml"
ANNEX = ROOT / "fixtures" / "annexes" / "lornholm-na-2023.toml"


@pytest.fixture
def beams(tmp_path: Path) -> Path:
    path = tmp_path / "beams.toml"
    path.write_bytes(DEMO.read_bytes())
    return path


@pytest.fixture
def nothing_computed(monkeypatch):
    """Fail the test if a command gets as far as assessing a beam."""
    def refuse(*args, **kwargs):
        raise AssertionError("a beam was assessed before the output was refused")

    monkeypatch.setattr(results, "run", refuse)
    monkeypatch.setattr(stream_module, "stream_schedule", refuse)


# --- an output that is an input --------------------------------------------------------------

@pytest.mark.parametrize("command", ["check", "compare", "batch"])
def test_an_output_that_is_the_beam_file_is_refused_before_anything_is_computed(
        command, beams, capsys, nothing_computed):
    before = beams.read_bytes()
    assert main([command, str(beams), "--out", str(beams)]) == 2
    assert beams.read_bytes() == before
    assert "would overwrite the input file" in capsys.readouterr().err


@pytest.mark.parametrize("command", ["check", "batch"])
def test_an_output_linked_to_the_beam_file_is_refused(command, beams, tmp_path, capsys,
                                                      nothing_computed):
    link = tmp_path / "rows.csv"
    link.symlink_to(beams)
    before = beams.read_bytes()
    assert main([command, str(beams), "--out", str(link)]) == 2
    assert beams.read_bytes() == before and link.is_symlink()
    assert str(beams) in capsys.readouterr().err


def test_an_output_that_is_an_annex_is_refused(beams, tmp_path, capsys, nothing_computed):
    annex = tmp_path / "annex.toml"
    annex.write_bytes(ANNEX.read_bytes())
    assert main(["check", str(beams), "--annex", str(annex), "--out", str(annex)]) == 2
    assert annex.read_bytes() == ANNEX.read_bytes()
    assert "input file" in capsys.readouterr().err


def test_an_annex_named_in_the_file_is_an_input_too(tmp_path, capsys, nothing_computed):
    annex = tmp_path / "na.toml"
    annex.write_bytes(ANNEX.read_bytes())
    text = DEMO.read_text(encoding="utf-8").replace(
        'form = "auto"', 'form = "auto"\nannexes = ["na.toml"]')
    beams = tmp_path / "beams.toml"
    beams.write_text(text, encoding="utf-8")
    assert main(["check", str(beams), "--out", str(tmp_path / "na.toml")]) == 2
    assert annex.read_bytes() == ANNEX.read_bytes()


# --- the extension decides the format --------------------------------------------------------

def test_batch_refuses_an_extension_it_cannot_write(beams, tmp_path, capsys, nothing_computed):
    out = tmp_path / "r.json"
    assert main(["batch", str(beams), "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert not out.exists() and ".csv" in err and ".jsonl" in err and "'.json'" in err


def test_check_refuses_an_unknown_extension_listing_the_known_ones(beams, tmp_path, capsys):
    assert main(["check", str(beams), "--out", str(tmp_path / "r.xlsx")]) == 2
    err = capsys.readouterr().err
    for suffix in (".json", ".toml", ".csv", ".txt", ".html", ".pdf"):
        assert suffix in err
    assert not (tmp_path / "r.xlsx").exists()


def test_a_format_that_contradicts_the_extension_is_refused(beams, tmp_path, capsys):
    assert main(["check", str(beams), "--format", "json", "--out",
                 str(tmp_path / "r.csv")]) == 2
    assert "contradicts" in capsys.readouterr().err
    assert not (tmp_path / "r.csv").exists()


def test_a_format_that_agrees_with_the_extension_is_written(beams, tmp_path, capsys):
    out = tmp_path / "r.json"
    assert main(["check", str(beams), "--format", "json", "--out", str(out)]) == 1  # B9 fails
    assert json.loads(out.read_text())["results"]
    assert capsys.readouterr().err.strip() == f"clausewise: wrote results to {out}"


def test_the_format_table_has_one_row_per_format_and_every_suffix_once_per_kind():
    seen: dict[tuple[str, str], str] = {}
    for name, f in FORMATS.items():
        for suffix in f.suffixes:
            assert (f.holds, suffix) not in seen, (name, seen)
            seen[f.holds, suffix] = name
    assert format_for(Path("x.HTML"), "html") == "html"
    assert format_for(Path("x.txt"), "text") == "text"
    assert format_for(None, None) == "text"
    with pytest.raises(OutputError):
        format_for(Path("x.csv"), "toml")


# --- a batch replaces the target only when complete ------------------------------------------

def test_a_completed_batch_replaces_the_target_and_says_so(beams, tmp_path, capsys):
    out = tmp_path / "rows.csv"
    out.write_text("old rows\n")
    assert main(["batch", str(beams), "--out", str(out), "--edition", "aci318-19"]) == 1
    rows = list(csv.reader(out.read_text(encoding="utf-8").splitlines()))
    assert len(rows) == 1 + 14  # header and the demo's 14 beams
    assert rows[0][0] == "beam" and rows[1][-1] == CAUTION  # the caution is a column
    assert not partial_name(out).exists()
    assert f"clausewise: wrote rows to {out}" in capsys.readouterr().err


def test_an_interrupted_batch_keeps_the_old_file_and_names_the_partial_rows(
        beams, tmp_path, capsys, monkeypatch):
    out = tmp_path / "rows.csv"
    out.write_text("the good results of yesterday\n")
    real = stream_module.stream_schedule

    def interrupted(*args, **kwargs):
        def stop(done, total):
            raise KeyboardInterrupt

        return real(*args[:5], stop, chunk=2)

    monkeypatch.setattr(stream_module, "stream_schedule", interrupted)
    assert main(["batch", str(beams), "--out", str(out), "--edition", "aci318-19"]) == 130
    assert out.read_text() == "the good results of yesterday\n"
    partial = tmp_path / "rows.partial.csv"
    rows = partial.read_text(encoding="utf-8").splitlines()
    assert 1 < len(rows) < 1 + 14  # the header and some of the rows
    err = capsys.readouterr().err
    assert str(partial) in err and "left as it was" in err


def test_a_termination_signal_stops_a_batch_as_ctrl_c_does(beams, tmp_path, capsys,
                                                           monkeypatch):
    """SIGTERM (a scheduler ending a job) keeps the old file and names the partial rows,
    and the exit status says which signal (128 + 15)."""
    import os
    import signal

    out = tmp_path / "rows.csv"
    out.write_text("the good results of yesterday\n")
    real = stream_module.stream_schedule

    def terminated(*args, **kwargs):
        def stop(done, total):
            os.kill(os.getpid(), signal.SIGTERM)

        return real(*args[:5], stop, chunk=2)

    monkeypatch.setattr(stream_module, "stream_schedule", terminated)
    before = signal.getsignal(signal.SIGTERM)
    assert main(["batch", str(beams), "--out", str(out), "--edition", "aci318-19"]) == 143
    assert signal.getsignal(signal.SIGTERM) == before  # the command's handler is put back
    assert out.read_text() == "the good results of yesterday\n"
    assert "left as it was" in capsys.readouterr().err


def test_a_second_run_to_the_same_rows_is_refused_while_the_first_writes(tmp_path):
    """Two runs to one --out never mix their rows: the second is refused while the first
    holds the partial file."""
    from clausewise.outputs import rows_file

    out = tmp_path / "rows.csv"
    with rows_file(out) as first:
        first.write("the first run's rows\n")
        with pytest.raises(OutputError, match="another run is writing its rows"), \
                rows_file(out):
            pass
    assert out.read_text() == "the first run's rows\n"


def test_an_output_that_is_a_link_is_written_through_it(beams, tmp_path, capsys):
    shared = tmp_path / "shared"
    shared.mkdir()
    target = shared / "results.json"
    target.write_text("{}")
    link = tmp_path / "latest.json"
    link.symlink_to(target)
    main(["check", str(beams), "--edition", "aci318-19", "--out", str(link)])
    assert link.is_symlink() and json.loads(target.read_text())["results"]
    rows_link = tmp_path / "rows.csv"
    rows_link.symlink_to(shared / "rows.csv")
    main(["batch", str(beams), "--edition", "aci318-19", "--out", str(rows_link)])
    assert rows_link.is_symlink() and (shared / "rows.csv").read_text().startswith("beam,")


def test_a_batch_that_fails_keeps_the_old_file(beams, tmp_path, capsys, monkeypatch):
    out = tmp_path / "rows.jsonl"
    out.write_text("{}\n")

    def broken(*args, **kwargs):
        args[4].write([["B1", "aci318-19", *[""] * (len(args[4].columns) - 2)]])
        raise ValueError("the disk said no")

    monkeypatch.setattr(stream_module, "stream_schedule", broken)
    assert main(["batch", str(beams), "--out", str(out)]) == 2
    assert out.read_text() == "{}\n"
    assert '"beam": "B1"' in (tmp_path / "rows.partial.jsonl").read_text()
    assert "rows.partial.jsonl" in capsys.readouterr().err


# --- writers take every status and non-finite values -----------------------------------------

class NanFactor:
    """An edition whose bars break at a strain of 0.0001, so no section reaches
    equilibrium, and whose member factor is then NaN (as a strain-dependent φ is)."""

    info = EditionInfo("nan-factor", "a NaN member factor", 2025, extends="aci318-19")

    @hookimpl
    def edition_info(self):
        return self.info

    @hookimpl
    def steel_law(self, beam):
        return MaterialModel(ElasticPlastic(200_000.0, beam.yield_strength, 0.0001), ())

    @hookimpl
    def resistance_factor(self):
        clause = self.info.clause("F1", "deliberate fault")
        return Resistance(Factor("φ", math.nan, clause), Regime("unknown", clause), clause)


def test_every_writer_takes_a_nan_factor_and_an_error(tmp_path):
    registry = Registry(only=frozenset({"aci318-19"}))
    registry.load_entry_points()
    assert registry.register(NanFactor()).ok
    schedule = parse_schedule(DEMO.read_text(encoding="utf-8"), str(DEMO))
    editions = [registry.edition("nan-factor"), registry.edition("aci318-19")]
    outcomes = list(results.run(schedule, editions, None, "persistent"))
    error = results.Outcome(outcomes[0].entry, "gone", error="PluginError: it broke")
    doc = results.document(schedule, [*outcomes, error], units="SI")
    text = results.to_csv(doc)  # raised TypeError in csv_row before
    rows = list(csv.DictReader(text.splitlines()))
    nan_rows = [r for r in rows if r["edition"] == "nan-factor"]
    assert nan_rows and all(r["resistance_factor"] == "" for r in nan_rows)  # no value
    assert {r["status"] for r in nan_rows} == {"no equilibrium"}
    assert all(r["M_Rd_kNm"] == "" for r in nan_rows)
    assert rows[-1]["status"] == "error" and "it broke" in rows[-1]["summary"]
    assert json.loads(results.to_json(doc))["results"][0]["resistance"]["factor"]["value"] \
        is None
    results.to_toml(doc)
    assert results.csv_row({"beam": "B", "edition": "e", "situation": "persistent",
                            "caution": CAUTION, "status": "no equilibrium", "resistance": {
                                "factor": {"symbol": "φ", "value": None}}}
                           )["resistance_factor"] is None


# --- commands that name editions load only those ---------------------------------------------

def test_a_command_that_names_an_edition_loads_only_it_and_its_bases(beams, capsys,
                                                                     monkeypatch):
    loaded: list[str] = []
    real = registry_module.Registry._add

    def spy(self, name, *args, **kwargs):
        loaded.append(name)
        return real(self, name, *args, **kwargs)

    monkeypatch.delenv("CLAUSEWISE_EDITIONS", raising=False)
    monkeypatch.setattr(registry_module, "_DEFAULT", None)
    monkeypatch.setattr(registry_module.Registry, "_add", spy)
    assert main(["check", str(beams), "--edition", "aci318-14", "--format", "json"]) == 1
    assert set(loaded) == {"aci318-14"}  # a base edition: nothing else
    loaded.clear()
    assert main(["check", str(beams), "--annex", str(ANNEX), "--edition", "xl-na:2023",
                 "--format", "json"]) in (0, 1)
    assert set(loaded) == {"en1992-1-1:2004", "xl-na:2023"}
    capsys.readouterr()


def test_a_folder_that_cannot_be_written_is_named_with_the_file_asked_for(
        beams, tmp_path, capsys, monkeypatch):
    import errno
    import tempfile

    def read_only(*args, **kwargs):
        raise OSError(errno.EROFS, "Read-only file system")

    monkeypatch.setattr(tempfile, "mkstemp", read_only)
    out = tmp_path / "r.json"
    assert main(["check", str(beams), "--edition", "aci318-19", "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert f"cannot write {out}: Read-only file system" in err and ".tmp" not in err


def test_json_inputs_are_labelled_in_each_edition_s_symbols(capsys):
    """The inputs of a record read as its edition writes them (EN 1992-1-1 fck and fyk,
    ACI 318 f'c and fy), as the report and the notation table do."""
    demo = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"
    main(["check", str(demo), "--edition", "en1992-1-1:2004", "--edition", "aci318-19",
          "--format", "json"])
    records = {(r["beam"], r["edition"]): r for r in json.loads(capsys.readouterr().out)
               ["results"]}
    en, aci = records["B1", "en1992-1-1:2004"]["inputs"], records["B1", "aci318-19"]["inputs"]
    assert en["fck"] == aci["f'c"] == "32 MPa" and en["fyk"] == aci["fy"] == "500 MPa"
    assert "f'c" not in en and "fy" not in en
