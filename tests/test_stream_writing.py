"""Batch rows written a column at a time are what csv.writer and json.dumps write.

The references are the standard library's own writers (``csv.writer`` with minimal
quoting and ``"\\n"`` lines, byte for byte; ``json.dumps`` of a dict per row, its
numbers as JSON numbers and null where there is none, value for value) on the same rows,
and the former row-by-row writer kept in ``tests/benchmarks/bench_writing.py``.
"""

from __future__ import annotations

import csv
import importlib.util
import io
import json
import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from clausewise.beamfile import load_schedule
from clausewise.provisions import UnitSystem, default_registry
from clausewise.provisions.batch import iter_assess_many
from clausewise.results.records import units_table
from clausewise.results.writers import NUMBER_COLUMNS, result_columns
from clausewise.rowtext import CsvLines, JsonLines, Numbers
from clausewise.stream import RowWriter, Summary, table_columns
from clausewise.synthetic import synthetic_beams

ROOT = Path(__file__).resolve().parents[1]

HOSTILE = [
    "", "plain", "a,b", ",", 'say "hi"', '"', '""', '\\"', "line\nbreak", "\n", "cr\rlf\r\n",
    "\r", "tab\there", "  leading space", "trailing ", "'single'", "ünïcödé", "中文梁",
    "😀 emoji", "\x00nul", "\x1f", "\x7f", "\xa0nbsp", "\u2028sep", "back\\slash", "%", "%s",
    "%%d", "%(name)s", "{braces}", "\ud800 lone surrogate", "B1, grid \"C\"\n2nd line",
]
# beam ids for files: a lone surrogate cannot be written as UTF-8 (by either writer)
FILE_SAFE = [t for t in HOSTILE if "\ud800" not in t]
NUMBERS = [math.nan, math.inf, -math.inf, 0.0, -0.0, 5e-324, 1e-300, 1.7976931348623157e308,
           123456.5, 1234567.0, 999999.5, 0.0001, 0.00001, 1e16, 2.5, 0.125, -0.449571,
           1 / 3, 100000.0, 0.1 + 0.2]


def expand(columns, size):
    """The rows the columns stand for, as strings, the way the former writer made them."""
    def texts(column):
        if isinstance(column, str):
            return [column] * size
        if isinstance(column, Numbers):
            spec = f".{column.digits}g"
            return ["" if v != v else format(v, spec)
                    for v in np.asarray(column.values, float).tolist()]
        return [str(v) for v in column]

    return list(zip(*map(texts, columns), strict=True))


def csv_text(rows):
    out = io.StringIO()
    csv.writer(out, lineterminator="\n").writerows(rows)
    return out.getvalue()


def json_values(columns, size):
    """The rows as json.dumps is given them: numbers rounded to their digits, None where
    there is none or it is not finite (JSON has neither NaN nor inf)."""
    def values(column):
        if isinstance(column, Numbers):
            spec = f".{column.digits}g"
            return [float(format(v, spec)) if math.isfinite(v) else None
                    for v in np.asarray(column.values, float).tolist()]
        return texts(column, size)

    return list(zip(*map(values, columns), strict=True))


def texts(column, size):
    return [column] * size if isinstance(column, str) else [str(v) for v in column]


def refuse_constant(name):
    raise AssertionError(f"{name} is not JSON")


def assert_same_json_lines(ours, names, rows):
    """Every line is JSON (no NaN or Infinity), with the names in order and the values
    json.dumps wrote for the reference rows."""
    lines = ours.splitlines(keepends=True)
    assert len(lines) == len(rows) and all(line.endswith("}\n") for line in lines)
    reference = [json.loads(json.dumps(dict(zip(names, row, strict=True)))) for row in rows]
    parsed = [json.loads(line, parse_constant=refuse_constant) for line in lines]
    assert [list(p.items()) for p in parsed] == [list(r.items()) for r in reference]


def assert_both_formats(names, columns, size):
    rows = expand(columns, size)
    assert CsvLines(names).lines(columns, size) == csv_text(rows)
    assert_same_json_lines(JsonLines(names).lines(columns, size), names,
                           json_values(columns, size))


def test_hostile_texts_varying_constant_and_mixed_with_numbers():
    size = len(HOSTILE)
    rng = np.random.default_rng(3)
    numbers = np.array((NUMBERS * 3)[:size])
    columns = [
        HOSTILE,                                  # a text per row, every one hostile
        "edition, \"quoted\"\n%s",                # one hostile text for every row
        list(reversed(HOSTILE)),
        Numbers(numbers),                         # NaN, inf, -0.0, subnormal, huge
        Numbers(np.full(size, np.nan)),           # no number at all: a blank column
        Numbers(np.full(size, 0.9)),              # one number for every row
        Numbers(rng.lognormal(size=size) * 100, digits=3),
        Numbers(numbers, digits=17),
        ["plain"] * (size - 1) + ["a,b"],         # plain but one
        [""] * size,                              # empty texts
        "",
        "An aid to a licensed engineer: 100% of the caution, \"as is\".",
    ]
    names = [f"c{i}%" if i % 3 else f"col \"{i}\", ü" for i in range(len(columns))]
    assert_both_formats(names, columns, size)


@pytest.mark.parametrize("text", HOSTILE)
def test_each_hostile_text_alone_as_a_column_and_as_the_only_varying_field(text):
    columns = [[text, "x"], text, Numbers(np.array([math.nan, 1.5])), text]
    assert_both_formats(["a", "b", "c", "d"], columns, 2)
    assert_both_formats(["only"], [text], 1)  # one constant field: a line of it


def test_every_column_constant_and_an_empty_table():
    columns = ["B1", "pass", Numbers(np.array([0.5])), ""]
    assert_both_formats(["beam", "status", "u", "note"], columns, 1)
    assert CsvLines(["a"]).lines([[]], 0) == "" == JsonLines(["a"]).lines([[]], 0)


def test_texts_that_are_not_str_are_written_as_their_str():
    columns = [[1, None, 2.5, "a,b"], [True, False, None, 3], [1, 1.0, True, 1]]
    assert_both_formats(["x", "y", "equal, not the same text"], columns, 4)


def test_a_column_of_the_wrong_length_is_refused_not_written_short():
    with pytest.raises(ValueError, match="a column of 2 rows in a table of 3"):
        CsvLines(["a"]).lines([["x", "y"]], 3)
    with pytest.raises(ValueError, match="distinct column names"):
        JsonLines(["a", "a"])


@settings(max_examples=150, deadline=None)
@given(st.integers(1, 6).flatmap(lambda n: st.tuples(
    st.lists(st.text(max_size=8), min_size=n, max_size=n),
    st.lists(st.sampled_from(HOSTILE), min_size=n, max_size=n),
    st.lists(st.floats(allow_nan=True, allow_infinity=True), min_size=n, max_size=n),
    st.text(max_size=6), st.integers(1, 17))))
def test_random_rows_match_the_standard_writers(case):
    texts, hostile, numbers, constant, digits = case
    columns = [texts, constant, Numbers(np.array(numbers), digits), hostile]
    assert_both_formats(["t", "k", "n", "h"], columns, len(texts))


def _blocks(chars, size=997):
    return ["".join(chars[i:i + size]) for i in range(0, len(chars), size)]


def test_every_character_taken_as_plain_is_left_as_it_is_by_csv_writer():
    lines = CsvLines(["a"])
    plain = [chr(c) for c in range(0x110000) if lines.is_plain(chr(c))]
    assert len(plain) > 1_000_000  # the check rules out only the few characters csv acts on
    for block in _blocks(plain):
        assert lines.quoted(block) == block
        assert csv_text([(block, "")]) == block + ",\n"


def test_every_character_taken_as_plain_is_left_as_it_is_by_json_dumps():
    lines = JsonLines(["a"])
    plain = [chr(c) for c in range(0x110000) if lines.is_plain(chr(c))]
    # json.dumps (ensure_ascii) leaves exactly the printable ASCII but '"' and '\\'
    assert plain == [chr(c) for c in range(0x20, 0x7f) if chr(c) not in '"\\']
    for block in _blocks(plain):
        assert json.dumps(block) == f'"{block}"'


@pytest.mark.parametrize("kind", ["csv", "jsonl"])
def test_write_columns_writes_what_write_writes_for_the_same_rows(kind):
    system = UnitSystem.US
    names = result_columns(units_table(system))
    size = len(HOSTILE)
    columns = [Numbers(np.roll((NUMBERS * 2)[:size], i)) if i in NUMBER_COLUMNS
               else HOSTILE if i % 2 == 0 else f"constant {i}, \"%\"" for i in range(len(names))]
    fast, former = io.StringIO(), io.StringIO()
    RowWriter(fast, kind, system).write_columns(columns, size)
    RowWriter(former, kind, system).write(expand(columns, size))
    if kind == "csv":
        assert fast.getvalue() == former.getvalue()
    else:  # the same values; json.dumps spells some numbers its own way (1e+06, 1000000.0)
        head, *rows = former.getvalue().splitlines(keepends=True)
        assert fast.getvalue().startswith(head)
        assert_same_json_lines(fast.getvalue()[len(head):], names,
                               [list(json.loads(r).values()) for r in rows])
    assert fast.getvalue().count("\n") >= size + 1  # the header line and every row


def _bench():
    path = ROOT / "tests" / "benchmarks" / "bench_writing.py"
    spec = importlib.util.spec_from_file_location("bench_writing", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _tables(beams, editions, situation="persistent"):
    registry = default_registry()
    editions = [registry.edition(e) for e in editions]
    stacks = {e.id: " over ".join(f"{r.info.id} {r.version} ({r.distribution})"
                                  for r in reversed(e.layers)) for e in editions}
    return [t for _, t in iter_assess_many(beams, editions, situation=situation,
                                           chunk=37)], stacks


def _hostile_schedule(texts=FILE_SAFE):
    beams = synthetic_beams(120, seed=11)
    return [replace(b, id=f"{texts[i % len(texts)]}#{i}") for i, b in enumerate(beams)]


# csv.writer (Python 3.11, "\n" lines) leaves a lone carriage return unquoted, which
# csv.reader then refuses; both writers write it alike (above), it cannot be read back
READABLE = [t for t in FILE_SAFE if t.replace("\r\n", "") == t.replace("\r", "")]


@pytest.mark.parametrize("kind", ["csv", "jsonl"])
@pytest.mark.parametrize("schedule", ["demo", "hostile ids"])
def test_the_former_writer_and_ours_write_the_same_bytes(kind, schedule, tmp_path,
                                                         monkeypatch):
    bench = _bench()
    if schedule == "demo":
        beams = [e.beam for e in load_schedule(
            ROOT / "fixtures" / "demo" / "quellmoor-library.toml").entries]
    else:
        beams = _hostile_schedule()
    tables, stacks = _tables(beams, bench.EDITIONS)
    old, new = tmp_path / f"old.{kind}", tmp_path / f"new.{kind}"
    for system in (UnitSystem.SI, UnitSystem.US):  # moments and lengths scaled for US
        monkeypatch.setattr(bench, "SYSTEM", system)
        old_summary = bench.former(tables, stacks, kind, old)
        new_summary = bench.current(tables, stacks, kind, new)
        assert bench.same_rows(kind, old, new)
        assert bench.summary_text(old_summary) == bench.summary_text(new_summary)
    assert new.stat().st_size > 1000


def test_a_written_file_reads_back_to_the_same_rows_in_both_formats(tmp_path):
    tables, stacks = _tables(_hostile_schedule(READABLE), ["aci318-19", "en1992-1-1:2004"])
    texts = {}
    for kind in ("csv", "jsonl"):
        out = io.StringIO()
        writer = RowWriter(out, kind)
        for table in tables:
            writer.write_columns(table_columns(table, stack=stacks[table.edition_id]),
                                 table.size)
        texts[kind] = out.getvalue()
    rows = list(csv.reader(io.StringIO(texts["csv"], newline="")))
    assert csv_text(rows) == texts["csv"]  # csv.writer writes the file as we did
    lines = texts["jsonl"].splitlines(keepends=True)
    records = [json.loads(line, parse_constant=refuse_constant) for line in lines[1:]]
    numbers = {rows[0][i] for i in NUMBER_COLUMNS}
    for row, record in zip(rows[1:], records, strict=True):  # texts alike, numbers as numbers
        assert list(record) == rows[0]
        assert [v for k, v in record.items() if k not in numbers] == [
            v for k, v in zip(rows[0], row, strict=True) if k not in numbers]
        assert [record[k] for k in rows[0] if k in numbers] == [
            None if text == "" or not math.isfinite(float(text)) else float(text)
            for k, text in zip(rows[0], row, strict=True) if k in numbers]
    assert len(records) == 240 and any(r["summary"].startswith("passes; governed by")
                                       for r in records)
    assert {r[0] for r in rows[1:]} == {b.id for b in _hostile_schedule(READABLE)}


def test_the_summary_keeps_the_highest_utilisations_and_counts_in_order():
    tables, _ = _tables(synthetic_beams(300, seed=2), ["aci318-19", "is456:2000"])
    summary = Summary(keep=7)
    for table in tables:
        summary.add(table)
    every = sorted(((u if math.isfinite(u) else math.inf, b, t.edition_id,
                     str(t.governing_check[i]))
                    for t in tables for i, (u, b) in enumerate(
                        zip(t.governing_utilisation.tolist(), t.beam_ids, strict=True))),
                   reverse=True)
    worst_of_each = [item for i, item in enumerate(every)  # each beam at its worst edition
                     if item[1] not in {earlier[1] for earlier in every[:i]}]
    assert summary.worst_first() == worst_of_each[:7]  # the seven highest, by hand
    for edition in ("aci318-19", "is456:2000"):
        statuses = [str(s) for t in tables if t.edition_id == edition for s in t.status]
        assert dict(summary.counts[edition]) == {s: statuses.count(s) for s in set(statuses)}
    assert summary.rows == 600
