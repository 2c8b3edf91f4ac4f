"""Benchmark of writing batch rows, the former way and ours side by side (not a test).

    python tests/benchmarks/bench_writing.py [--beams 20000] [--repeat 3]

The tables are computed once (the synthetic schedule under the seven built-in
editions); then, for CSV and JSON Lines, the rows are written to a file the former
way (one Python ``format`` per number, rows zipped, ``csv.writer.writerows`` or
``json.dumps`` of a dict per row; the summary counted through ``np.unique``) and the
current way (``table_columns`` and ``RowWriter.write_columns``; ``Summary.add``). CPU
time of this process, best of ``--repeat``; the two CSV files must be byte for byte
equal, the two JSON Lines files line by line the same values (a number is written as its
``%g`` text, which ``json.dumps`` of that number spells its own way: 1e+06, 1000000.0).
"""

from __future__ import annotations

import argparse
import csv
import json
import tempfile
import time
from collections import Counter
from pathlib import Path

import numpy as np

from clausewise.provisions import default_registry
from clausewise.provisions.batch import iter_assess_many
from clausewise.provisions.beam import UnitSystem
from clausewise.provisions.engine import CAUTION
from clausewise.results.display import scale
from clausewise.results.records import units_table
from clausewise.results.writers import result_columns
from clausewise.stream import RowWriter, Summary, table_columns
from clausewise.synthetic import synthetic_beams

EDITIONS = ("aci318-11", "aci318-14", "aci318-19", "as3600:2018", "csa-a23.3:19",
            "en1992-1-1:2004", "is456:2000")
SYSTEM = UnitSystem.SI
SITUATION = "persistent"
NUMBERS = {"utilisation", "M_Ed_kNm", "M_Rd_kNm", "Mn_kNm", "resistance_factor", "b_eff_mm",
           "c_mm", "net_tensile_strain", "M_Ed_kip_ft", "M_Rd_kip_ft", "Mn_kip_ft", "b_eff_in",
           "c_in"}  # the columns of numbers, by name


# -- the former way, kept here as the reference ------------------------------------------

def former_numbers(values, factor=1.0, digits=6):
    spec = f".{digits}g"
    return ["" if v != v else format(v, spec)
            for v in (np.asarray(values, float) * factor).tolist()]


def former_words(values):
    return [str(v) for v in values]


def former_summaries(table):
    """The one line check writes per beam and edition, row by row."""
    lines = []
    for i in range(table.size):
        status, check, message = str(table.status[i]), str(table.governing_check[i]), \
            str(table.message[i])
        if message or status not in ("pass", "fail", "capacity only"):
            lines.append(message)
        elif not check:
            lines.append("capacity only: no actions given")
        else:
            verdict = {"pass": "passes", "capacity only": "capacity only (no actions given)"
                       }.get(status, "fails")
            lines.append(f"{verdict}; governed by {check} ({table.governing_clause[i]}) at "
                         f"utilisation {table.governing_utilisation[i]:.3f}")
    return lines


def former_json(columns, row):
    """A row of texts as a JSON object, its number columns as numbers (None for none)."""
    record = dict(zip(columns, row, strict=True))
    for name in columns:
        if name in NUMBERS:
            number = float(record[name]) if record[name] else float("nan")
            record[name] = number if np.isfinite(number) else None
    return record


def same_rows(kind, old_path, new_path):
    """Whether two files of rows say the same: byte for byte for CSV, value for value
    (and in the same order) for JSON Lines."""
    if kind == "csv":
        return old_path.read_bytes() == new_path.read_bytes()
    old, new = (path.read_text(encoding="utf-8").splitlines() for path in (old_path, new_path))
    return len(old) == len(new) and all(
        list(json.loads(a).items()) == list(json.loads(b).items())
        for a, b in zip(old, new, strict=True))


def former_rows(table, system, situation, stack):
    width_key = next((k for k in table.governing_candidate if "width" in k), "")
    demand_key = next((k for k in table.governing_candidate if k != width_key), "")
    blank = [""] * table.size

    def candidates(key):
        column = table.governing_candidate.get(key)
        return blank if column is None else former_words(column)

    moment, length = scale("N·mm", system)[0], scale("mm", system)[0]
    n, num, words = table.size, former_numbers, former_words
    columns = [
        table.beam_ids, [table.edition_id] * n, words(table.form), [situation] * n,
        words(table.status), num(table.governing_utilisation), words(table.governing_check),
        words(table.governing_clause), num(table.demand, moment),
        num(table.design_resistance, moment), num(table.nominal_moment, moment),
        num(table.resistance_factor), num(table.effective_width, length),
        candidates(width_key), candidates(demand_key), num(table.neutral_axis, length),
        num(table.net_tensile_strain), words(table.regime), words(table.block_case),
        [stack] * n, former_summaries(table), [CAUTION] * n,
    ]
    return list(zip(*columns, strict=True))


def former_summary_add(summary, table):
    counts = summary.counts.setdefault(table.edition_id, Counter())
    values, tally = np.unique(table.status.astype(str), return_counts=True)
    counts.update(dict(zip(values.tolist(), tally.tolist(), strict=True)))
    summary.rows += table.size
    util = np.where(np.isfinite(table.governing_utilisation),
                    table.governing_utilisation, np.inf)
    worst = dict(summary.worst)  # by beam, its worst edition: the kept, then this table's
    for i in range(table.size):
        item = (float(util[i]), table.beam_ids[i], table.edition_id,
                str(table.governing_check[i]))
        worst[item[1]] = max(worst.get(item[1], item), item)
    summary.worst = dict(sorted(worst.items(), key=lambda kv: kv[1], reverse=True)
                         [: summary.keep])


def former(tables, stacks, kind, path):
    columns = result_columns(units_table(SYSTEM))
    summary = Summary()
    with path.open("w", encoding="utf-8", newline="") as out:
        if kind == "csv":
            writer = csv.writer(out, lineterminator="\n")
            writer.writerow(columns)
        else:
            out.write(json.dumps({"caution": CAUTION, "columns": columns}) + "\n")
        for table in tables:
            rows = former_rows(table, SYSTEM, SITUATION, stacks[table.edition_id])
            if kind == "csv":
                writer.writerows(rows)
            else:
                out.write("".join(json.dumps(former_json(columns, r)) + "\n" for r in rows))
            out.flush()
            former_summary_add(summary, table)
    return summary


# -- the current way -------------------------------------------------------------------

def current(tables, stacks, kind, path):
    summary = Summary()
    with path.open("w", encoding="utf-8", newline="") as out:
        writer = RowWriter(out, kind, SYSTEM)
        for table in tables:
            writer.write_columns(table_columns(table, SYSTEM, SITUATION,
                                               stacks[table.edition_id]), table.size)
            summary.add(table)
    return summary


def summary_text(summary):
    """The summary as written: counts in their order, the worst beams, the rows."""
    return ([(k, list(c.items())) for k, c in summary.counts.items()],
            summary.worst_first(), summary.rows)


def best(repeat, fn, *args):
    times, result = [], None
    for _ in range(repeat):
        start = time.process_time()
        result = fn(*args)
        times.append(time.process_time() - start)
    return min(times), result


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--beams", type=int, default=20_000)
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    registry = default_registry()
    editions = [registry.edition(e) for e in EDITIONS]
    beams = synthetic_beams(args.beams, seed=7)
    tables = [t for _, t in iter_assess_many(beams, editions, situation=SITUATION)]
    stacks = {e.id: " over ".join(f"{r.info.id} {r.version} ({r.distribution})"
                                  for r in reversed(e.layers)) for e in editions}
    rows = sum(t.size for t in tables)
    print(f"{args.beams} beams x {len(editions)} editions = {rows} rows in {len(tables)} "
          f"tables; CPU s, best of {args.repeat}")
    print(f"{'format':12s} {'former s':>9s} {'current s':>10s} {'ratio':>7s} {'MB':>6s}  same")
    with tempfile.TemporaryDirectory() as folder:
        for kind in ("csv", "jsonl"):
            old_path, new_path = Path(folder, f"old.{kind}"), Path(folder, f"new.{kind}")
            old, old_summary = best(args.repeat, former, tables, stacks, kind, old_path)
            new, new_summary = best(args.repeat, current, tables, stacks, kind, new_path)
            same = (same_rows(kind, old_path, new_path)
                    and summary_text(old_summary) == summary_text(new_summary))
            print(f"{kind:12s} {old:9.3f} {new:10.3f} {new / old:7.2f} "
                  f"{new_path.stat().st_size / 1e6:6.1f}  {same}")


if __name__ == "__main__":
    main()
