"""Large schedules from the command line: streamed rows, the same numbers, a summary."""

from __future__ import annotations

import csv
import json
import math

import pytest
import tomli_w

import clausewise
from clausewise.beamfile import load_schedule
from clausewise.cli import BATCH_FROM, main
from clausewise.provisions import UnitSystem, assess
from clausewise.results.records import units_table
from clausewise.results.writers import result_columns
from clausewise.stream import RowWriter, stream_schedule
from clausewise.synthetic import schedule_document, synthetic_beams

EDITIONS = ["aci318-19", "en1992-1-1:2004"]
COLUMNS = result_columns(units_table(UnitSystem.SI))  # the synthetic beams are SI


@pytest.fixture(scope="module")
def schedule_file(tmp_path_factory):
    path = tmp_path_factory.mktemp("schedule") / "portfolio.toml"
    document = schedule_document(synthetic_beams(400, seed=5))
    document["beam"][7]["web_width"] = "30 MPa"  # one bad beam: refused, the rest go on
    path.write_bytes(tomli_w.dumps(document).encode())
    return path


def read_rows(path):
    with path.open(encoding="utf-8") as handle:
        lines = list(csv.reader(handle))
    assert tuple(lines[0]) == COLUMNS  # the header is the first row
    rows = [dict(zip(COLUMNS, row, strict=True)) for row in lines[1:]]
    assert all("licensed engineer" in r["caution"] for r in rows)  # the caution in each row
    return rows


def test_batch_writes_every_beam_under_every_edition(schedule_file, tmp_path, capsys):
    out = tmp_path / "rows.csv"
    status = main(["batch", str(schedule_file), "--out", str(out),
                   *[a for e in EDITIONS for a in ("--edition", e)]])
    assert status == 2  # one beam was refused for its input
    rows = read_rows(out)
    assert len(rows) == 400 * len(EDITIONS)
    refused = [r for r in rows if r["status"] == "refused"]
    assert {r["edition"] for r in refused} == set(EDITIONS)
    assert all("web_width" in r["summary"] for r in refused)
    report = capsys.readouterr().out
    assert "beams by status, per edition" in report and "licensed engineer" in report
    assert f"{len(rows):,} rows written" in report  # the refused beams' rows too
    # the input problems come first, before the counts
    assert report.index("input problems") < report.index("beams by status, per edition")


def test_batch_rows_match_the_audited_path(schedule_file, tmp_path):
    out = tmp_path / "rows.csv"
    main(["batch", str(schedule_file), "--out", str(out), "--edition", EDITIONS[1]])
    rows = {r["beam"]: r for r in read_rows(out)}
    beams = {e.beam.id: e.beam for e in load_schedule(schedule_file).entries}
    for beam_id in list(beams)[::23]:
        audited = assess(beams[beam_id], EDITIONS[1])
        row = rows[beam_id]
        assert row["status"] == audited.status
        assert row["governing_check"] == audited.governing.name
        # the rows carry six significant figures
        assert math.isclose(float(row["M_Rd_kNm"]), audited.design_resistance.value / 1e6,
                            rel_tol=1e-5)
        assert math.isclose(float(row["utilisation"]), audited.governing.utilisation,
                            rel_tol=1e-3)


def test_json_lines_carry_the_same_rows(schedule_file, tmp_path):
    out = tmp_path / "rows.jsonl"
    main(["batch", str(schedule_file), "--out", str(out), "--edition", EDITIONS[0]])
    lines = out.read_text(encoding="utf-8").splitlines()
    head = json.loads(lines[0])
    assert "licensed engineer" in head["caution"] and tuple(head["columns"]) == COLUMNS
    rows = [json.loads(line) for line in lines[1:]]
    assert len(rows) == 400 and {r["edition"] for r in rows} == {EDITIONS[0]}


def test_an_interrupted_run_keeps_what_was_written(schedule_file, tmp_path):
    schedule = load_schedule(schedule_file)
    out = tmp_path / "partial.csv"
    from clausewise.provisions import default_registry

    editions = [default_registry().edition(e) for e in EDITIONS]

    def stop_after_first_chunk(done, total):
        raise KeyboardInterrupt

    with out.open("w", encoding="utf-8", newline="") as handle, \
            pytest.raises(KeyboardInterrupt):
        stream_schedule(schedule, editions, None, "persistent", RowWriter(handle, "csv"),
                        stop_after_first_chunk, chunk=50)
    rows = read_rows(out)
    assert 0 < len(rows) < 400 * len(EDITIONS)
    assert all(r["status"] in ("pass", "fail") for r in rows)


def test_check_takes_the_batch_path_for_a_large_file(schedule_file, capsys):
    assert 400 * len(clausewise.editions()) > BATCH_FROM  # enough beam-editions
    main(["check", str(schedule_file)])
    assert "schedule checked (batch path)" in capsys.readouterr().out


def test_check_and_batch_csv_share_one_column_scheme(schedule_file, tmp_path):
    batch_out, check_out = tmp_path / "batch.csv", tmp_path / "check.csv"
    main(["batch", str(schedule_file), "--out", str(batch_out), "--edition", EDITIONS[1]])
    small = tmp_path / "small.toml"
    document = schedule_document(synthetic_beams(3, seed=5))
    small.write_bytes(tomli_w.dumps(document).encode())
    main(["check", str(small), "--out", str(check_out), "--edition", EDITIONS[1]])
    batch_rows = read_rows(batch_out)
    check_rows = read_rows(check_out)  # the same header, asserted in read_rows
    first = next(r for r in batch_rows if r["beam"] == check_rows[0]["beam"])
    for column in ("M_Rd_kNm", "b_eff_mm", "c_mm", "resistance_factor"):
        assert math.isclose(float(first[column]), float(check_rows[0][column]), rel_tol=1e-5)
