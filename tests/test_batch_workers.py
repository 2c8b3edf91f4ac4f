"""``clausewise batch`` over several processes gives what one process gives.

The reference throughout is the one-process run (``--workers 1``), whose numbers
tests/test_batch.py and tests/test_stream.py check against the audited path. Rows are
grouped by kind of beam within each shard, so two runs' files are compared as sorted
lines (the header first in both). The files are small; the loader's chunk is made small
so that they are cut into shards (two chunks' worth at least), as a large file is.
"""

from __future__ import annotations

import csv
import os
import signal
import subprocess
import sys
import textwrap
import time
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pytest
import tomli_w

from clausewise import shards
from clausewise.beamfile import loading
from clausewise.cli import main
from clausewise.outputs import partial_name
from clausewise.provisions.batch import iter_assess_many
from clausewise.stream import Summary
from clausewise.synthetic import schedule_document, synthetic_beams

pytestmark = pytest.mark.skipif(shards.processes(2) < 2, reason="workers are forked (Linux)")

EDITIONS = ["aci318-19", "en1992-1-1:2004"]
BEAMS = 1200
CHUNK = 100  # 1200 tables: twelve chunks, three shards of 400 under --workers 3


@pytest.fixture(autouse=True)
def small_chunks(monkeypatch):
    monkeypatch.setattr(loading, "CHUNK", CHUNK)


@pytest.fixture
def sharded(monkeypatch):
    """What each sharded run returned: None when it was done again in one process."""
    returned = []
    real = shards.run

    def spy(*args, **kwargs):
        result = real(*args, **kwargs)
        returned.append(result)
        return result

    monkeypatch.setattr(shards, "run", spy)
    return returned


def document():
    return schedule_document(synthetic_beams(BEAMS, seed=13))


def write(tmp_path: Path, doc: dict) -> Path:
    path = tmp_path / "schedule.toml"
    path.write_bytes(tomli_w.dumps(doc).encode())
    return path


@dataclass
class Run:
    status: int
    out: str
    err: str
    rows: list[str]  # the file's lines, the header first


def batch(schedule: Path, folder: Path, capsys, *options: str,
          editions: list[str] = EDITIONS) -> Run:
    folder.mkdir()
    target = folder / "rows.csv"
    status = main(["batch", str(schedule), "--out", str(target),
                   *[a for e in editions for a in ("--edition", e)], *options])
    captured = capsys.readouterr()
    assert sorted(p.name for p in folder.iterdir()) == ["rows.csv"]  # nothing else left
    return Run(status, captured.out.replace(str(target), "ROWS"),
               captured.err.replace(str(target), "ROWS"),
               target.read_text(encoding="utf-8").splitlines())


def assert_same(sharded_run: Run, one: Run) -> None:
    assert sharded_run.status == one.status
    assert sharded_run.out == one.out  # the summary: counts, worst beams, problems
    assert sharded_run.err == one.err  # warnings and the confirmation
    assert sharded_run.rows[0] == one.rows[0]  # the header, once
    assert sorted(sharded_run.rows[1:]) == sorted(one.rows[1:])


def test_shards_give_the_rows_summary_and_warnings_of_one_process(tmp_path, capsys,
                                                                  sharded):
    doc = document()
    del doc["project"]["units"]  # plain numbers read as SI by default: a warning
    schedule = write(tmp_path, doc)
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3")
    assert len(sharded) == 1 and sharded[0] is not None  # cut in shards, not redone
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1")
    assert len(sharded) == 1  # --workers 1 is one process
    assert_same(three, one)
    assert len(three.rows) == 1 + BEAMS * len(EDITIONS)
    assert "numbers without a unit were read as SI" in three.err
    assert f"and {BEAMS - 5} more beam(s)" in three.err  # counted over every shard


def test_a_bad_beam_in_a_later_shard_keeps_its_number_in_the_file(tmp_path, capsys,
                                                                  sharded):
    doc = document()
    del doc["beam"][500]["id"]  # beam number 501, in the second shard (401-800)
    doc["beam"][950]["web_width"] = "30 MPa"  # in the third
    doc["beam"][700]["id"] = doc["beam"][600]["id"]  # an id used twice within one shard
    schedule = write(tmp_path, doc)
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3")
    assert sharded[0] is not None  # the shards stood for the file
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1")
    assert_same(three, one)
    assert three.status == 2  # beams were refused; the others were checked
    refused = [r for r in csv.reader(three.rows[1:]) if r[4] == "refused"]
    assert len(refused) == 3 * len(EDITIONS)
    summaries = {r[-2] for r in refused}
    assert any("beam number 501 (no usable id)" in s for s in summaries)
    assert any("beam number 601 has it" in s for s in summaries)
    assert sum(1 for r in csv.reader(three.rows[1:]) if r[4] != "refused") == \
        (BEAMS - 3) * len(EDITIONS)


def test_an_id_used_in_two_shards_is_refused_as_one_process_refuses_it(tmp_path, capsys,
                                                                       sharded):
    doc = document()
    doc["beam"][1000]["id"] = doc["beam"][5]["id"]  # the third shard reuses the first's
    schedule = write(tmp_path, doc)
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3")
    assert sharded == [None]  # done again in one process
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1")
    assert_same(three, one)
    assert "beam number 6 has it" in three.out


UNITS = {"web_width": "mm", "overall_depth": "mm", "slab_thickness": "mm", "area": "mm²",
         "depth": "mm", "span": "mm", "clear_span": "mm", "clear_left": "mm",
         "clear_right": "mm", "adjacent_span": "mm", "concrete_strength": "MPa",
         "yield_strength": "MPa", "dead": "kN m", "live": "kN m"}


def spelled(value, key=""):
    """A beam's plain SI numbers written with their units (so any unit system reads them)."""
    if isinstance(value, dict):
        return {k: spelled(v, k) for k, v in value.items()}
    if isinstance(value, list):
        return [spelled(v, key) for v in value]
    return f"{value} {UNITS[key]}" if key in UNITS and not isinstance(value, str) else value


def test_a_shard_of_us_beams_in_a_mixed_file_writes_the_file_s_si_rows(tmp_path, capsys,
                                                                      sharded):
    doc = document()
    doc["beam"][800:] = [{**spelled(raw), "units": "US"} for raw in doc["beam"][800:]]
    schedule = write(tmp_path, doc)  # the third shard alone would write US customary units
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3")
    assert sharded[0] is not None
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1")
    assert_same(three, one)
    assert "M_Rd_kNm" in three.rows[0]  # a mixed file's rows are in SI, and it is said
    assert "mixes SI and US customary beams; the rows are in SI" in one.err


# a [run] table that only a whole reading sees: its edition is the run's (none is named)
RUN_TABLE = '[run]\neditions = ["is456:2000"]\n'


def test_a_table_after_the_beams_reads_the_file_in_one_process(tmp_path, capsys, sharded):
    schedule = write(tmp_path, document())
    with schedule.open("a", encoding="utf-8") as handle:
        handle.write("\n" + RUN_TABLE)
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3", editions=[])
    assert sharded == []  # seen before any shard is read: the head is not the whole story
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1", editions=[])
    assert_same(three, one)
    assert {row.split(",")[1] for row in three.rows[1:]} == {"is456:2000"}


def test_a_table_between_the_beams_has_the_run_done_again_in_one_process(tmp_path, capsys,
                                                                         sharded):
    schedule = write(tmp_path, document())
    text = schedule.read_text(encoding="utf-8")
    cut = len(text)
    for _ in range(BEAMS - 900):  # before beam 901, in the third shard
        cut = text.rindex("[[beam]]", 0, cut)
    schedule.write_text(text[:cut] + RUN_TABLE + "\n" + text[cut:], encoding="utf-8")
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3", editions=[])
    assert sharded == [None]  # the third shard could not be read apart
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1", editions=[])
    assert_same(three, one)
    assert {row.split(",")[1] for row in three.rows[1:]} == {"is456:2000"}


def _in_workers_only(monkeypatch, failure) -> None:
    """``failure`` instead of the assessment in every worker; the parent's runs."""
    parent, real = os.getpid(), shards.stream_beams

    def stream_beams(*args, **kwargs):
        if os.getpid() != parent:
            failure()
        return real(*args, **kwargs)

    monkeypatch.setattr(shards, "stream_beams", stream_beams)


def _old_target(tmp_path: Path) -> Path:
    target = tmp_path / "out" / "rows.csv"
    target.parent.mkdir()
    target.write_text("the good rows of yesterday\n")
    return target


def test_a_worker_that_raises_fails_the_run_and_keeps_the_old_file(tmp_path, capsys,
                                                                   monkeypatch):
    schedule = write(tmp_path, document())
    target = _old_target(tmp_path)

    def disk_full():
        raise ValueError("the disk is full")

    _in_workers_only(monkeypatch, disk_full)
    status = main(["batch", str(schedule), "--out", str(target), "--workers", "3",
                   "--edition", EDITIONS[0]])
    err = capsys.readouterr().err
    assert status == 2
    assert target.read_text() == "the good rows of yesterday\n"
    partial = partial_name(target)
    assert f"{target} left as it was; the rows written so far are in {partial}" in err
    assert sorted(p.name for p in target.parent.iterdir()) == ["rows.csv", partial.name]
    rows = list(csv.reader(partial.read_text(encoding="utf-8").splitlines()))
    assert rows[0][0] == "beam" and 1 < len(rows) <= 1 + BEAMS  # the parent's share
    assert {len(r) for r in rows} == {len(rows[0])}  # whole rows only
    # the same words as a one-process run that meets the same failure
    monkeypatch.setattr("clausewise.stream.stream_beams", lambda *a, **k: disk_full())
    assert main(["batch", str(schedule), "--out", str(target), "--workers", "1",
                 "--edition", EDITIONS[0]]) == 2
    one = capsys.readouterr().err

    def errors(text):
        return [line for line in text.splitlines() if "error:" in line]

    assert errors(err) == errors(one) == ["clausewise: error: the disk is full"]


def test_a_worker_that_dies_fails_the_run_and_keeps_the_old_file(tmp_path, capsys,
                                                                 monkeypatch):
    schedule = write(tmp_path, document())
    target = _old_target(tmp_path)
    _in_workers_only(monkeypatch, lambda: os._exit(3))
    status = main(["batch", str(schedule), "--out", str(target), "--workers", "2",
                   "--edition", EDITIONS[0]])
    err = capsys.readouterr().err
    assert status == 2
    assert "the process for beams 601 to 1200 stopped without an answer (exit status 3)" in err
    assert target.read_text() == "the good rows of yesterday\n"
    assert sorted(p.name for p in target.parent.iterdir()) == [
        "rows.csv", partial_name(target).name]


@pytest.mark.parametrize("count", ["0", "-2", "two"])
def test_workers_must_be_a_count_of_processes(tmp_path, capsys, count):
    schedule = write(tmp_path, document())
    assert main(["batch", str(schedule), "--workers", count]) == 2
    err = capsys.readouterr().err
    assert "argument --workers" in err and "1 or more" in err


def test_shards_are_contiguous_and_only_for_a_large_file():
    assert shards.plan(600, 2, least=100) == [range(0, 300), range(300, 600)]
    assert shards.plan(600, 8, least=100) == [range(i, i + 100) for i in range(0, 600, 100)]
    assert shards.plan(200, 2, least=100) is None  # two shards' worth: not worth the forks
    assert shards.plan(600, 1, least=100) is None
    assert shards.plan(BEAMS, 3) == [range(0, 400), range(400, 800), range(800, 1200)]


def _summary(tables) -> Summary:
    summary = Summary()
    for table in tables:
        summary.add(table)
    return summary


def test_summaries_of_parts_merge_into_the_summary_of_the_whole():
    beams = synthetic_beams(300, seed=3)
    whole = _summary(t for _, t in iter_assess_many(beams, EDITIONS))
    merged = Summary()
    for start in range(0, 300, 70):
        merged.merge(_summary(t for _, t in iter_assess_many(beams[start:start + 70],
                                                             EDITIONS, chunk=25)))
    assert merged.counts == whole.counts and merged.rows == whole.rows == 300 * 2
    assert merged.worst_first() == whole.worst_first()


def test_the_worst_beams_do_not_depend_on_how_ties_were_cut():
    """Beams without a utilisation all tie (infinite): the ten kept are the ten last ids in
    Python's string order, however the beams are split."""
    beams = synthetic_beams(120, seed=4)

    def tied(chunk):
        for _, table in iter_assess_many(beams, EDITIONS[:1], chunk=chunk):
            table.governing_utilisation[:] = np.nan
            yield table

    expected = sorted(b.id for b in beams)[-10:][::-1]
    for chunk in (7, 50, 120):
        assert [beam for _, beam, _, _ in _summary(tied(chunk)).worst_first()] == expected


# --- the processes end with the run ----------------------------------------------------------

DRIVER = textwrap.dedent("""
    import os, sys, time
    from clausewise import shards
    from clausewise.beamfile import loading
    from clausewise.cli import main

    loading.CHUNK = 100
    parent, real = os.getpid(), shards.stream_beams

    def stream_beams(*args, **kwargs):
        if os.getpid() != parent:  # a worker that takes long
            with open(sys.argv[3], "w") as handle:
                handle.write(str(os.getpid()))
            time.sleep(60)
        return real(*args, **kwargs)

    shards.stream_beams = stream_beams
    sys.exit(main(["batch", sys.argv[1], "--out", sys.argv[2], "--workers", "2",
                   "--edition", "aci318-19"]))
""")


def _alive(pid: int) -> bool:
    try:
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
    except (FileNotFoundError, ProcessLookupError):
        return False
    return state != "Z"


def _start_slow_run(tmp_path: Path) -> tuple[subprocess.Popen, Path, int]:
    schedule = write(tmp_path, document())
    target, pid_file = _old_target(tmp_path), tmp_path / "worker.pid"
    run = subprocess.Popen([sys.executable, "-c", DRIVER, str(schedule), str(target),
                            str(pid_file)], start_new_session=True,
                           stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    deadline = time.monotonic() + 60
    while not (pid_file.exists() and pid_file.read_text()):
        assert run.poll() is None and time.monotonic() < deadline, run.stderr.read()
        time.sleep(0.05)
    return run, target, int(pid_file.read_text())


def _gone(pid: int) -> bool:
    deadline = time.monotonic() + 10
    while _alive(pid) and time.monotonic() < deadline:
        time.sleep(0.05)
    return not _alive(pid)


def test_ctrl_c_stops_every_worker_and_keeps_the_old_file(tmp_path):
    run, target, worker = _start_slow_run(tmp_path)
    time.sleep(0.5)  # the parent is assessing its share or waiting for the worker's
    os.killpg(run.pid, signal.SIGINT)  # as a terminal's Ctrl-C: the whole group
    assert run.wait(30) == 130
    assert _gone(worker)
    assert target.read_text() == "the good rows of yesterday\n"
    assert sorted(p.name for p in target.parent.iterdir()) == [
        "rows.csv", partial_name(target).name]
    assert "did not complete" in run.stderr.read()


def test_a_worker_does_not_outlive_a_killed_parent(tmp_path):
    run, target, worker = _start_slow_run(tmp_path)
    run.kill()
    run.wait(30)
    assert _gone(worker)
    assert target.read_text() == "the good rows of yesterday\n"


def test_check_on_a_large_file_shares_it_among_processes_too(tmp_path, capsys, sharded,
                                                             monkeypatch):
    """check takes the batch path for a file this large; it is cut in shards as batch
    cuts it, and gives the rows and summary of a one-process batch."""
    monkeypatch.setattr(shards, "processes", lambda asked: asked or 2)  # as on two processors
    schedule = write(tmp_path, document())
    folder = tmp_path / "check"
    folder.mkdir()
    target = folder / "rows.csv"
    status = main(["check", str(schedule), "--out", str(target),
                   *[a for e in EDITIONS for a in ("--edition", e)]])
    captured = capsys.readouterr()
    assert len(sharded) == 1 and sharded[0] is not None  # cut in shards, not redone
    checked = Run(status, captured.out.replace(str(target), "ROWS"),
                  captured.err.replace(str(target), "ROWS"),
                  target.read_text(encoding="utf-8").splitlines())
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1")
    assert_same(checked, one)
    assert len(checked.rows) == 1 + BEAMS * len(EDITIONS)


def _answered_worker(parent: int, ready) -> None:
    """A worker as the command forks it: the command's signal handlers inherited, then
    bound to its parent; it has answered and waits to end."""
    from clausewise.cli import _interrupted_by_signals

    _interrupted_by_signals()
    shards._bound_to(parent)
    ready.set()
    time.sleep(30)


@pytest.mark.skipif(not hasattr(signal, "SIGTERM") or sys.platform == "win32",
                    reason="POSIX signals")
def test_a_worker_ended_by_its_parent_ends_quietly():
    """The parent ends workers that have answered with SIGTERM; a worker that kept the
    command's handler raised in its teardown and printed a traceback after a good run.
    Ended by the signal's default action, it exits with -SIGTERM and says nothing."""
    import multiprocessing

    context = multiprocessing.get_context("fork")
    ready = context.Event()
    worker = context.Process(target=_answered_worker, args=(os.getpid(), ready))
    worker.start()
    assert ready.wait(10)
    worker.terminate()
    worker.join(10)
    assert worker.exitcode == -signal.SIGTERM


def test_a_beam_with_several_problems_is_one_refused_row_per_edition(tmp_path, capsys,
                                                                     sharded):
    """A table keyed by beam and edition has one row for each, refused or not: the beam's
    problems are joined in that row (they were a row per problem and edition)."""
    doc = document()
    doc["beam"][950]["web_width"] = "30 MPa"
    doc["beam"][950]["concrete_strength"] = "30 mm"
    schedule = write(tmp_path, doc)
    three = batch(schedule, tmp_path / "three", capsys, "--workers", "3")
    one = batch(schedule, tmp_path / "one", capsys, "--workers", "1")
    assert_same(three, one)
    refused = [r for r in csv.reader(three.rows[1:]) if r[4] == "refused"]
    assert sorted(r[1] for r in refused) == sorted(EDITIONS)
    assert all("field web_width" in r[-2] and "field concrete_strength" in r[-2]
               for r in refused)
    assert len(three.rows) == 1 + BEAMS * len(EDITIONS)
