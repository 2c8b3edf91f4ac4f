"""Whole schedules through the batch path, with results written as they are computed.

Rows go to CSV or JSON Lines chunk by chunk and are flushed at once, so a run
that is interrupted keeps every row already written. Beams the input refused
are written too (status "refused"), so nothing is lost. A summary is kept on the
way: counts by status per edition and the worst beams.
"""

from __future__ import annotations

import csv
import json
import math
import time
from collections import Counter
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import IO, TYPE_CHECKING, Any

import numpy as np

from clausewise.provisions.batch import CHUNK, BatchTable, iter_assess_many
from clausewise.provisions.beam import UnitSystem
from clausewise.provisions.engine import CAPACITY_ONLY, CAUTION, FAIL, PASS
from clausewise.provisions.registry import Edition
from clausewise.provisions.verdicts import NO_ACTIONS, governed_head
from clausewise.results.display import scale
from clausewise.results.records import refused_beams, units_table
from clausewise.results.writers import NUMBER_COLUMNS, result_columns
from clausewise.rowtext import Column, CsvLines, JsonLines, Numbers

if TYPE_CHECKING:
    from clausewise.beamfile import InputProblem, Schedule
    from clausewise.provisions import Beam

REFUSED = "refused"


MIXED_UNITS = "the file mixes SI and US customary beams; the rows are in SI (one unit per column)"


def mixes_systems(schedule: Schedule) -> bool:
    """The file holds both SI and US customary beams (its rows are then in SI)."""
    return len({entry.beam.unit_system for entry in schedule.entries}) > 1


def schedule_system(schedule: Schedule) -> UnitSystem:
    """The unit system of the rows: the beams' own when they share one, else SI."""
    if mixes_systems(schedule) or not schedule.entries:
        return UnitSystem.SI
    return schedule.entries[0].beam.unit_system


@dataclass
class Summary:
    """Counts by status per edition, and the beams with the highest utilisation.

    The worst kept are the ``keep`` beams whose highest (utilisation, beam, edition,
    check) under any edition is highest, each beam once with its worst edition (a beam
    that fails under every edition filled the list with itself). It is a total order (ids
    are unique in a run), so the list does not depend on how the beams were cut into
    tables or processes: summaries of the parts of a run merge into the summary of the
    whole."""

    counts: dict[str, Counter[str]] = field(default_factory=dict)
    worst: dict[str, tuple[float, str, str, str]] = field(default_factory=dict)  # by beam
    rows: int = 0
    keep: int = 10

    def add(self, table: BatchTable) -> None:
        counts = self.counts.setdefault(table.edition_id, Counter())
        tally = Counter(map(str, table.status.tolist()))
        counts.update({status: tally[status] for status in sorted(tally)})
        self.rows += table.size
        if self.keep <= 0:
            return
        util = np.where(np.isfinite(table.governing_utilisation),
                        table.governing_utilisation, np.inf)
        # a beam below the least kept one cannot enter: look only at the others, and of
        # those only at the highest ``keep`` utilisations, ties included (a table holds
        # each beam once)
        rows = (np.flatnonzero(util >= self._least()[0]) if len(self.worst) == self.keep
                else np.arange(table.size))
        if rows.size > self.keep:
            least = np.partition(util[rows], rows.size - self.keep)[rows.size - self.keep]
            rows = rows[util[rows] >= least]
        for i in rows.tolist():
            self._offer((float(util[i]), table.beam_ids[i], table.edition_id,
                         str(table.governing_check[i])))

    def _least(self) -> tuple[float, str, str, str]:
        return min(self.worst.values())

    def _offer(self, item: tuple[float, str, str, str]) -> None:
        """Keep ``item`` if it is its beam's worst so far and among the ``keep`` worst
        beams; the least kept only rises, so a beam left out never had a place."""
        beam = item[1]
        if beam in self.worst:
            self.worst[beam] = max(self.worst[beam], item)
        elif len(self.worst) < self.keep:
            self.worst[beam] = item
        elif item > (least := self._least()):
            del self.worst[least[1]]
            self.worst[beam] = item

    def merge(self, other: Summary) -> None:
        """Take in the summary of another part of the same run."""
        for edition_id, counts in other.counts.items():
            self.counts.setdefault(edition_id, Counter()).update(counts)
        self.rows += other.rows
        for item in other.worst.values():
            self._offer(item)

    def refused(self, edition_ids: Sequence[str], count: int) -> None:
        for edition_id in edition_ids:
            self.counts.setdefault(edition_id, Counter())[REFUSED] += count

    def worst_first(self) -> list[tuple[float, str, str, str]]:
        return sorted(self.worst.values(), reverse=True)


def _numbers(values: Any, factor: float = 1.0, digits: int = 6) -> Numbers:
    """A column of numbers in the shown unit, ``digits`` significant figures, blank
    where there is none."""
    return Numbers(np.asarray(values, float) * factor, digits)


def row_summaries(table: BatchTable) -> list[str]:
    """Each row's one line on what governs, as ``check`` writes it: the verdict, the
    governing check with its clause and utilisation; else why there is none (outside
    scope, no equilibrium, an error, no actions)."""
    heads: dict[tuple[str, str, str], str] = {}  # the text before the utilisation, made once
    lines = []
    for status, check, clause, utilisation, message in zip(
            table.status.tolist(), table.governing_check.tolist(),
            table.governing_clause.tolist(), table.governing_utilisation.tolist(),
            table.message.tolist(), strict=True):
        if message or status not in (PASS, FAIL, CAPACITY_ONLY):
            lines.append(message)
        elif not check:
            lines.append(NO_ACTIONS)
        else:
            head = heads.get((status, check, clause))
            if head is None:
                head = heads[status, check, clause] = governed_head(status, check, clause)
            lines.append(f"{head}{utilisation:.3f}")
    return lines


def table_columns(table: BatchTable, system: UnitSystem = UnitSystem.SI,
                  situation: str = "persistent", stack: str = "") -> list[Column]:
    """The columns of ``result_columns`` (the same as check's CSV) for every beam of a
    batch table, in ``system``'s units; a text where the column holds one for all."""
    width_key = next((k for k in table.governing_candidate if "width" in k), "")
    demand_key = next((k for k in table.governing_candidate if k != width_key), "")

    def candidates(key: str) -> Column:
        column = table.governing_candidate.get(key)
        return "" if column is None else column.tolist()

    moment, length = scale("N·mm", system)[0], scale("mm", system)[0]
    return [
        table.beam_ids, table.edition_id, table.form.tolist(), situation,
        table.status.tolist(), _numbers(table.governing_utilisation),
        table.governing_check.tolist(), table.governing_clause.tolist(),
        _numbers(table.demand, moment), _numbers(table.design_resistance, moment),
        _numbers(table.nominal_moment, moment), _numbers(table.resistance_factor),
        _numbers(table.effective_width, length), candidates(width_key),
        candidates(demand_key), _numbers(table.neutral_axis, length),
        _numbers(table.net_tensile_strain), table.regime.tolist(),
        table.block_case.tolist(), stack, row_summaries(table), CAUTION,
    ]


def json_numbers(row: Sequence[str]) -> list[Any]:
    """A row of texts with its number columns as floats, None where there is none or
    the number is not finite (JSON has neither NaN nor inf)."""
    values: list[Any] = list(row)
    for i in NUMBER_COLUMNS:
        number = float(values[i]) if values[i] != "" else math.nan
        values[i] = number if math.isfinite(number) else None
    return values


class RowWriter:
    """CSV (the header first; the caution a column of every row) or JSON Lines (one
    object a row, after one naming the caution and the columns)."""

    def __init__(self, out: IO[str], kind: str, system: UnitSystem = UnitSystem.SI,
                 header: bool = True) -> None:
        """``header``: False for rows that will follow another part's header."""
        self.out, self.kind = out, kind
        self.columns = result_columns(units_table(system))
        if kind == "csv":
            self.csv = csv.writer(out, lineterminator="\n")
            if header:
                self.csv.writerow(self.columns)
        elif header:
            out.write(json.dumps({"caution": CAUTION, "columns": self.columns}) + "\n")
        out.flush()
        self.line_format = (CsvLines if kind == "csv" else JsonLines)(self.columns)

    def write(self, rows: Sequence[Sequence[str]]) -> None:
        """Rows of texts; in JSON Lines the number columns' texts ("" for none) are
        written as the numbers they stand for (null for none)."""
        if self.kind == "csv":
            self.csv.writerows(rows)
        else:
            self.out.write("".join(json.dumps(dict(zip(self.columns, json_numbers(r),
                                                       strict=True))) + "\n" for r in rows))
        self.out.flush()

    def write_columns(self, columns: Sequence[Column], size: int) -> None:
        """``size`` rows given column by column: the same text as ``write`` of them."""
        self.out.write(self.line_format.lines(columns, size))
        self.out.flush()


def stream_schedule(schedule: Schedule, editions: Sequence[Edition], form: str | None,
                    situation: str, writer: RowWriter | None,
                    progress: Callable[[int, int], None] | None = None,
                    chunk: int = CHUNK) -> Summary:
    """Assess every beam under every edition through the batch path; write and count."""
    summary = stream_beams([entry.beam for entry in schedule.entries], editions, form,
                           situation, writer, progress, chunk, schedule_system(schedule))
    write_refused(summary, schedule.problems, [e.id for e in editions], situation, writer)
    return summary


def stream_beams(beams: Sequence[Beam], editions: Sequence[Edition], form: str | None,
                 situation: str, writer: RowWriter | None,
                 progress: Callable[[int, int], None] | None = None, chunk: int = CHUNK,
                 system: UnitSystem = UnitSystem.SI) -> Summary:
    """The loaded beams' part of :func:`stream_schedule`, rows in ``system``'s units."""
    summary = Summary()
    total = len(beams) * len(editions)
    done = 0
    stacks = {e.id: " over ".join(f"{r.info.id} {r.version} ({r.distribution})"  # type: ignore[union-attr]
                                  for r in reversed(e.layers)) for e in editions}
    for _, table in iter_assess_many(beams, editions, form=form, situation=situation,
                                     chunk=chunk):
        if writer is not None:
            writer.write_columns(table_columns(table, system, situation,
                                               stacks[table.edition_id]), table.size)
        summary.add(table)
        done += table.size
        if progress is not None:
            progress(done, total)
    return summary


def write_refused(summary: Summary, problems: Sequence[InputProblem],
                  edition_ids: Sequence[str], situation: str, writer: RowWriter | None) -> None:
    """The beams the input refused: counted once per id under every edition, and a row
    per beam and edition (after the assessed rows) giving all of the beam's problems."""
    if not problems:
        return
    summary.refused(edition_ids, len({p.beam for p in problems}))
    refused = refused_beams((p.beam, p.index, p.message) for p in problems)
    summary.rows += len(refused) * len(edition_ids)
    if writer is not None:
        blank = [""] * (len(writer.columns) - 7)
        writer.write([[beam or "?", edition_id, "", situation, REFUSED, *blank, messages,
                       CAUTION] for beam, messages in refused for edition_id in edition_ids])


class LazyProgress:
    """A progress bar that appears only once a run has taken more than ``delay`` seconds."""

    def __init__(self, enabled: bool, delay: float = 1.0, label: str = "assessing") -> None:
        self.enabled, self.delay, self.label = enabled, delay, label
        self.start = time.perf_counter()
        self.bar: Any = None
        self.task: Any = None

    def __call__(self, done: int, total: int) -> None:
        if not self.enabled:
            return
        if self.bar is None:
            if time.perf_counter() - self.start < self.delay:
                return
            from rich.console import Console
            from rich.progress import BarColumn, MofNCompleteColumn, Progress, TimeRemainingColumn

            self.bar = Progress(self.label, BarColumn(), MofNCompleteColumn(),
                                TimeRemainingColumn(), transient=True,
                                console=Console(stderr=True))
            self.bar.start()
            self.task = self.bar.add_task("assess", total=total)
        self.bar.update(self.task, completed=done)

    def close(self) -> None:
        if self.bar is not None:
            self.bar.stop()
