"""Many beams under many editions through the same pipeline, on arrays.

Beams are grouped by kind (everything a rule may branch on: shape, bending,
layer counts, which optional inputs are given, unit system ...), each group is
stacked into one array-valued ``Beam`` and run through ``engine.evaluate`` once
per edition. Results stay columnar (:class:`BatchTable`) so a million rows cost
numpy time, not Python time. Rows outside an edition's scope are cut out before
the mechanics, exactly as the single-beam path stops after applicability. The
sections of an edition's small groups are solved side by side in one call
(``core.solve_together``), the same numbers as one call each: a schedule of many kinds
of beam would otherwise pay a solve's fixed cost for every kind.

If a group raises (a plugin fault, a degenerate beam), its beams are retried one
at a time so that one bad beam is reported and the rest go on.
"""

from __future__ import annotations

import gc
import os
import sys
from collections.abc import Callable, Generator, Iterable, Iterator, Sequence
from contextlib import contextmanager
from dataclasses import dataclass, fields, is_dataclass, replace
from functools import cache
from itertools import chain
from typing import Any, overload

import numpy as np
from numpy.typing import NDArray

from clausewise.core.errors import ClausewiseError
from clausewise.core.solver import OK, STATUS_TEXT, ResponseArrays, solve_arrays, solve_together
from clausewise.provisions.beam import NAMES, Beam, Context, field_roles, kind_of, number_fields
from clausewise.provisions.engine import (
    SolveRequest,
    evaluation,
    resolve_form,
    solved_at_once,
)
from clausewise.provisions.registry import Edition, Registry, default_registry
from clausewise.provisions.verdicts import ERROR, governing, outside_scope_line, status

CHUNK = 20_000
"""Beams run at a time through one edition. The arrays of a chunk this size stay in the
processor's cache between the many passes of the rules and the solver; 50 000 measured
about 15 % slower per beam, 2 000 slower again from the fixed cost of each call."""


@contextmanager
def cycle_collector_paused(set_aside: bool = False) -> Iterator[None]:
    """Python's cycle collector paused for a while. Reading and assessing many beams make
    millions of short-lived objects and no reference cycles (they are freed as they go),
    yet each burst of them makes the collector rescan every object alive, the caller's
    beams too: with 100 000 beams loaded that was 40 % of the time of a run.

    ``set_aside``: what lives on when the block ends (beams read for the rest of a run)
    is moved out of the collector's sight (``gc.freeze``) before it comes back on, whose
    first pass would otherwise go over every object made meanwhile; the caller gives it
    back with ``gc.unfreeze`` once the run is over."""
    enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if set_aside:
            gc.freeze()
        if enabled:
            gc.enable()


KEEP_FREED = 64 << 20  # bytes of freed memory the C allocator keeps for reuse
MMAP_FROM = 32 << 20  # blocks from this size are mapped from the system one by one


@cache
def keep_freed_memory() -> bool:
    """Have glibc's allocator keep freed memory for reuse rather than give it back at once.

    A batch makes its temporaries (arrays of a few hundred kB) and frees them thousands
    of times a second; by default glibc maps blocks that size from the system, or trims
    the heap as soon as they are freed, and each new one then costs page faults: numpy
    took 5 to 10 times longer per number on them, and ``assess_columns`` 20-25 % longer.
    Done once per process, on Linux with glibc only, and not where the user set the
    allocator's thresholds (MALLOC_TRIM_THRESHOLD_, MALLOC_MMAP_THRESHOLD_) already.
    True when the thresholds were set here."""
    if not sys.platform.startswith("linux") or any(
            name in os.environ for name in ("MALLOC_TRIM_THRESHOLD_", "MALLOC_MMAP_THRESHOLD_")):
        return False
    import ctypes

    try:
        mallopt = ctypes.CDLL("libc.so.6").mallopt
    except (OSError, AttributeError):  # not glibc (musl, say)
        return False
    trim_threshold, mmap_threshold = -1, -3  # M_TRIM_THRESHOLD, M_MMAP_THRESHOLD (malloc.h)
    return bool(mallopt(mmap_threshold, MMAP_FROM)) and bool(
        mallopt(trim_threshold, KEEP_FREED))


# --- grouping and stacking -------------------------------------------------------------

def _rebuilt(template: Any, columns: Iterator[Any]) -> Any:
    """``template`` with its numbers replaced, in :func:`number_fields` order, by the
    next of ``columns``."""
    changes: dict[str, Any] = {}
    cls: type = type(template)
    for name, role in field_roles(cls):
        value = getattr(template, name)
        if value is None or role == "word":
            continue
        if role == "part":
            changes[name] = _rebuilt(value, columns)
        elif role == "group":
            changes[name] = tuple(_rebuilt(part, columns) for part in value)
        else:
            changes[name] = next(columns)
    return replace(template, **changes)


_READERS: dict[tuple[Any, ...], Callable[[Any], tuple[Any, ...]]] = {}


def _numbers_reader(template: Any) -> Callable[[Any], tuple[Any, ...]]:
    """One generated expression per kind that reads every number of a beam at once, as
    ``kind_of`` reads its kind: attribute lookups in one call, no walk per beam."""
    key = (type(template), kind_of(template))
    reader = _READERS.get(key)
    if reader is None:
        reader = eval(  # noqa: S307 (our own field names)
            f"lambda obj: ({''.join(p + ', ' for p, _ in number_fields(template))})")
        _READERS[key] = reader
    return reader


def stack_beams(beams: Sequence[Beam]) -> Beam:
    """One array-valued beam from beams of one kind."""
    items = list(beams)
    template = replace(items[0], id=f"batch of {len(items)}", title="")
    reader = _numbers_reader(template)
    count = len(reader(template))
    flat = np.fromiter(chain.from_iterable(map(reader, items)), float, len(items) * count)
    return _rebuilt(template, iter(np.ascontiguousarray(flat.reshape(len(items), count).T)))


def take_beam(batch: Beam, rows: NDArray[np.int_]) -> Beam:
    """The rows of an array-valued beam, as a smaller batch."""

    def taken(obj: Any) -> Any:
        if is_dataclass(obj) and not isinstance(obj, type):
            return replace(obj, **{f.name: taken(getattr(obj, f.name)) for f in fields(obj)
                                   if f.name not in NAMES})
        if isinstance(obj, tuple):
            return tuple(taken(o) for o in obj)
        if isinstance(obj, np.ndarray):
            return obj[rows]
        return obj

    return taken(batch)


# --- the columnar result ---------------------------------------------------------------

@dataclass
class BatchTable:
    """Results of many beams under one edition; one entry per beam in every column."""

    edition_id: str
    beam_ids: Sequence[str]
    form: NDArray[np.str_]
    status: NDArray[np.str_]
    nominal_moment: NDArray[np.float64]
    design_resistance: NDArray[np.float64]
    demand: NDArray[np.float64]
    resistance_factor: NDArray[np.float64]
    neutral_axis: NDArray[np.float64]
    net_tensile_strain: NDArray[np.float64]
    effective_width: NDArray[np.float64]
    regime: NDArray[np.str_]
    block_case: NDArray[np.str_]
    governing_check: NDArray[np.str_]
    governing_clause: NDArray[np.str_]
    governing_utilisation: NDArray[np.float64]
    utilisation: dict[str, NDArray[np.float64]]
    governing_candidate: dict[str, NDArray[np.str_]]
    message: NDArray[np.str_]

    @property
    def size(self) -> int:
        return len(self.beam_ids)

    @classmethod
    def empty(cls, edition_id: str, beam_ids: Sequence[str]) -> BatchTable:
        n = len(beam_ids)

        def text(value: str = "") -> NDArray[np.str_]:
            column = np.empty(n, dtype=object)  # filled in place: np.full is 3x slower here
            column.fill(value)
            return column

        nan = np.full(n, np.nan)
        return cls(edition_id, _names(beam_ids),
                   text(), text(ERROR), nan.copy(), nan.copy(),
                   nan.copy(), nan.copy(), nan.copy(), nan.copy(), nan.copy(), text(),
                   text(), text(), text(), nan.copy(), {}, {}, text())

    def fill(self, rows: NDArray[np.int_], other: BatchTable) -> None:
        """Write ``other``'s rows into ``rows`` of this table."""
        self.fill_many([(rows, other)])

    def fill_many(self, parts: Sequence[tuple[NDArray[np.int_], BatchTable]]) -> None:
        """Write each part's rows into its ``rows`` of this table, one column at a time:
        a column of a large table then stays in the cache while every part is written
        into it (part by part, all columns each time, was 6 times slower)."""
        for f in fields(self):
            mine = getattr(self, f.name)
            if isinstance(mine, np.ndarray):
                for rows, other in parts:
                    mine[rows] = getattr(other, f.name)
            elif isinstance(mine, dict):
                keys = dict.fromkeys(k for _, other in parts for k in getattr(other, f.name))
                for key in keys:
                    pieces = [(rows, getattr(other, f.name).get(key)) for rows, other in parts]
                    if key not in mine:
                        kind = next(c.dtype.kind for _, c in pieces if c is not None)
                        mine[key] = np.full(self.size, np.nan) if kind == "f" else \
                            np.full(self.size, "", dtype=object)
                    column = mine[key]
                    for rows, piece in pieces:
                        if piece is not None:
                            column[rows] = piece

    def row(self, i: int) -> dict[str, Any]:
        """One beam's result as plain values (for JSON lines and reports)."""
        return {
            "beam": self.beam_ids[i], "edition": self.edition_id, "form": str(self.form[i]),
            "status": str(self.status[i]),
            "nominal_moment": _num(self.nominal_moment[i]),
            "design_resistance": _num(self.design_resistance[i]),
            "demand": _num(self.demand[i]),
            "resistance_factor": _num(self.resistance_factor[i]),
            "neutral_axis": _num(self.neutral_axis[i]),
            "net_tensile_strain": _num(self.net_tensile_strain[i]),
            "effective_width": _num(self.effective_width[i]),
            "regime": str(self.regime[i]), "block_case": str(self.block_case[i]),
            "governing_check": str(self.governing_check[i]),
            "governing_clause": str(self.governing_clause[i]),
            "governing_utilisation": _num(self.governing_utilisation[i]),
            "utilisation": {k: _num(v[i]) for k, v in self.utilisation.items()
                            if np.isfinite(v[i]) or np.isinf(v[i])},
            "governing_candidate": {k: str(v[i]) for k, v in self.governing_candidate.items()
                                    if v[i]},
            "message": str(self.message[i]),
        }


def _names(ids: Sequence[str]) -> Sequence[str]:
    """The beams' ids kept by a table: lazy row names as they are, else a list."""
    return ids if isinstance(ids, RowNames) else list(ids)


def _num(value: Any) -> float | None:
    v = float(value)
    return None if np.isnan(v) else v


# --- one group under one edition ------------------------------------------------------

def _texts(value: Any, n: int) -> NDArray[np.str_]:
    """A column of ``n`` texts from one text or one per beam (assignment broadcasts, and
    refuses a column of another length)."""
    column = np.empty(n, dtype=object)
    column[:] = value
    return column


def _floats(value: Any, n: int) -> NDArray[np.float64]:
    """A column of ``n`` numbers from one number or one per beam."""
    column = np.empty(n)
    column[:] = value
    return column


def _scope_table(edition: Edition, ids: Sequence[str], form: str, checks: Sequence[Any],
                 in_scope: NDArray[np.bool_]) -> BatchTable:
    table = BatchTable.empty(edition.id, ids)
    table.form[:] = form
    table.status[:] = status(in_scope=in_scope, equilibrium=True, checks=(),
                             has_demand=True)  # the rows in scope are filled in later
    _record_checks(table, checks)
    table.message[:] = _scope_messages(edition.id, checks, in_scope)
    return table


def _scope_messages(edition_id: str, checks: Sequence[Any], in_scope: NDArray[np.bool_]
                    ) -> NDArray[np.str_]:
    """Per beam, "" in scope, else the scope checks it fails, as the audited summary
    names them; one text per pattern of failures, made once."""
    pattern = np.zeros(in_scope.size, dtype=np.int64)
    for j, c in enumerate(checks):
        pattern |= np.where(np.asarray(c.passed, dtype=bool), 0, 1 << j)
    texts = {code: outside_scope_line(edition_id, [(c.name, c.clause.ref) for j, c in
                                                   enumerate(checks) if code >> j & 1])
             for code in np.unique(pattern[~in_scope]).tolist()}
    return _texts([texts[p] if not ok else "" for p, ok in
                   zip(pattern.tolist(), in_scope.tolist(), strict=True)], in_scope.size)


def _record_checks(table: BatchTable, checks: Sequence[Any]) -> None:
    """Every check's utilisation and the governing one (highest) per beam."""
    n = table.size
    if not checks:
        return
    worst, utilisation = governing(checks, n)
    table.governing_check[:] = np.array([c.name for c in checks], dtype=object)[worst]
    table.governing_clause[:] = np.array([f"{c.clause.edition} {c.clause.ref}"
                                          for c in checks], dtype=object)[worst]
    table.governing_utilisation[:] = utilisation
    for c in checks:
        table.utilisation[c.name] = _floats(c.utilisation, n)


def _group_table(edition: Edition, batch: Beam, ids: Sequence[str],
                 context: Context) -> BatchTable:
    """Evaluate one stacked group under one edition."""
    return solved_at_once(_group_steps(edition, batch, ids, context))


def _group_steps(edition: Edition, batch: Beam, ids: Sequence[str], context: Context
                 ) -> Generator[SolveRequest, ResponseArrays, BatchTable]:
    """:func:`_group_table` as steps that ask for the group's section to be solved."""
    n = len(ids)
    params = edition.parameters(context)
    scope_checks = edition.applicability(batch, params, context)
    in_scope = np.ones(n, dtype=bool)
    for c in scope_checks:
        in_scope &= np.asarray(c.passed, dtype=bool)  # one verdict for all, or one each
    rows = np.flatnonzero(in_scope)
    table = None
    if rows.size < n:
        table = _scope_table(edition, ids, context.form, scope_checks, in_scope)
        if rows.size == 0:
            return table
    sub = take_beam(batch, rows) if rows.size < n else batch
    ev = yield from evaluation(sub, edition, context,
                               tuple(scope_checks) if rows.size == n else None)
    m = rows.size
    resp = ev.response
    equilibrium = resp.equilibrium
    width, demand = ev.effective_width, ev.demand
    part = BatchTable(  # the computed columns as they are: no empty table filled in
        edition.id, [ids[i] for i in rows.tolist()] if table else _names(ids),
        form=_texts(context.form, m),
        status=_texts(status(in_scope=True, equilibrium=equilibrium, checks=ev.checks,
                             has_demand=demand is not None), m),
        nominal_moment=resp.nominal_moment,
        design_resistance=_floats(ev.design_resistance.value, m),  # type: ignore[union-attr]
        demand=_floats(np.nan if demand is None else demand.value, m),
        resistance_factor=_floats(ev.resistance.factor.value, m),  # type: ignore[union-attr]
        neutral_axis=resp.c, net_tensile_strain=resp.net_tensile_strain,
        effective_width=_floats(np.nan if width is None else width.value, m),
        regime=_texts(ev.resistance.regime.name, m),  # type: ignore[union-attr]
        block_case=resp.block_cases,
        governing_check=_texts("", m), governing_clause=_texts("", m),
        governing_utilisation=_floats(np.nan, m),
        utilisation={c.name: _floats(c.utilisation, n)[rows] for c in scope_checks},
        governing_candidate={e.name: _labels(e, m) for e in (width, demand) if e is not None},
        message=_equilibrium_messages(resp.status))
    _record_checks(part, ev.checks)
    if table is None:
        return part
    table.fill(rows, part)
    return table


_SOLVER_TEXTS = np.array(["" if code == OK else STATUS_TEXT[code]
                          for code in range(max(STATUS_TEXT) + 1)], dtype=object)


def _equilibrium_messages(solver_status: NDArray[np.int_]) -> NDArray[np.str_]:
    """"" where the section is in equilibrium, else the solver's reason, as the audited
    response words it."""
    texts: NDArray[np.str_] = _SOLVER_TEXTS[solver_status]  # texts as objects, as _texts
    return texts


def _labels(envelope: Any, n: int) -> NDArray[np.str_]:
    labels = np.array([c.label for c in envelope.candidates], dtype=object)
    governing = np.empty(n, dtype=int)
    governing[:] = envelope.governing  # one candidate for all beams, or one per beam
    return labels[governing]


def _single_table(edition: Edition, beam: Beam, form: str | None,
                  situation: str) -> BatchTable:
    """One beam through the batch path; a fault is recorded against that beam alone."""
    try:
        chosen, _ = resolve_form(edition, beam, form)
        return _group_table(edition, stack_beams([beam]), [beam.id],
                            Context(form=chosen, situation=situation))
    except (ClausewiseError, ValueError, ArithmeticError) as exc:
        table = BatchTable.empty(edition.id, [beam.id])
        table.message[:] = f"{type(exc).__name__}: {exc}"
        return table


# --- the public entry points --------------------------------------------------------------

def iter_assess_many(beams: Sequence[Beam], editions: Iterable[str | Edition], *,
                     form: str | None = None, situation: str = "persistent",
                     registry: Registry | None = None, chunk: int = CHUNK
                     ) -> Iterator[tuple[NDArray[np.int_], BatchTable]]:
    """Yield ``(indices into beams, table)`` as each group chunk is done under each edition,
    so results can be written while the rest is still computing."""
    keep_freed_memory()
    reg = registry or default_registry()
    resolved = [reg.edition(e) if isinstance(e, str) else e for e in editions]
    groups: dict[tuple[Any, ...], list[int]] = {}
    with cycle_collector_paused():
        for i, beam in enumerate(beams):
            groups.setdefault(kind_of(beam), []).append(i)
    chunks = [members[start:start + chunk] for members in groups.values()
              for start in range(0, len(members), chunk)]
    indices = [np.array(members) for members in chunks]
    stacked: dict[int, tuple[list[Beam], list[str], Beam]] = {}  # built once, for every edition
    together = _runs([number for number, members in enumerate(chunks)
                      if len(members) < SOLVED_TOGETHER], [len(c) for c in chunks], chunk)

    def tables(edition: Edition, numbers: list[int]) -> dict[int, BatchTable]:
        for number in numbers:
            if number not in stacked:
                group = [beams[i] for i in chunks[number]]
                stacked[number] = group, [b.id for b in group], stack_beams(group)
        return dict(zip(numbers, _chunk_tables(edition, [stacked[k] for k in numbers], form,
                                               situation), strict=True))

    for edition in resolved:
        done: dict[int, BatchTable] = {}
        with cycle_collector_paused():  # not across a yield: the caller's time is its own
            for run in together:
                done.update(tables(edition, run))
        for number in range(len(chunks)):  # in the order of the groups, as before
            if number not in done:
                with cycle_collector_paused():
                    done.update(tables(edition, [number]))
            yield indices[number], done.pop(number)


SOLVED_TOGETHER = 2_000
"""Chunks of fewer beams than this have their sections solved side by side, in one call
for every chunk of an edition whose sections can stand together (the fixed cost of a
solve, most of a small chunk's time, is then paid once for them all)."""


def _runs(numbers: list[int], sizes: list[int], most: int) -> list[list[int]]:
    """``numbers`` cut, in order, into runs of at most ``most`` beams in all (a chunk's
    worth: its arrays stay in the cache)."""
    runs: list[list[int]] = []
    total = 0
    for number in numbers:
        if not runs or total + sizes[number] > most:
            runs.append([])
            total = 0
        runs[-1].append(number)
        total += sizes[number]
    return runs


def _chunk_tables(edition: Edition, chunks: Sequence[tuple[list[Beam], list[str], Beam]],
                  form: str | None, situation: str) -> list[BatchTable]:
    """Each chunk's table under one edition, the sections of all solved together. A chunk
    whose rules or section fail (a plugin fault, a degenerate beam) is done again beam by
    beam, so the fault is recorded against its own beams alone."""
    tables: dict[int, BatchTable] = {}
    waiting: dict[int, tuple[Generator[SolveRequest, ResponseArrays, BatchTable],
                             SolveRequest]] = {}
    for i, (group, ids, batch) in enumerate(chunks):
        try:
            chosen, _ = resolve_form(edition, group[0], form)
            steps = _group_steps(edition, batch, ids, Context(form=chosen, situation=situation))
            waiting[i] = steps, next(steps)
        except StopIteration as finished:  # every beam outside the edition's scope
            tables[i] = finished.value
        except (ClausewiseError, ValueError, ArithmeticError):
            tables[i] = _one_by_one(edition, group, form, situation)
    if waiting:
        solved: list[ResponseArrays | None]
        try:
            solved = [*solve_together([request for _, request in waiting.values()])]
        except (ClausewiseError, ValueError, ArithmeticError):  # each on its own, below
            solved = [None] * len(waiting)
        for (i, (steps, request)), response in zip(waiting.items(), solved, strict=True):
            try:
                steps.send(response if response is not None else solve_arrays(*request))
            except StopIteration as finished:
                tables[i] = finished.value
            except (ClausewiseError, ValueError, ArithmeticError):
                tables[i] = _one_by_one(edition, chunks[i][0], form, situation)
    return [tables[i] for i in range(len(chunks))]


def _one_by_one(edition: Edition, group: list[Beam], form: str | None,
                situation: str) -> BatchTable:
    tables = [_single_table(edition, b, form, situation) for b in group]
    merged = BatchTable.empty(edition.id, [b.id for b in group])
    for i, t in enumerate(tables):
        merged.fill(np.array([i]), t)
    return merged


def assess_many(beams: Sequence[Beam], editions: Iterable[str | Edition], *,
                form: str | None = None, situation: str = "persistent",
                registry: Registry | None = None) -> dict[str, BatchTable]:
    """Assess every beam under every edition; one table per edition, rows in input order."""
    ids = [b.id for b in beams]
    out: dict[str, BatchTable] = {}
    parts: list[tuple[NDArray[np.int_], BatchTable]] = []

    def gather() -> None:  # an edition's parts come one after another: written when done
        edition_id = parts[0][1].edition_id
        if edition_id not in out:
            out[edition_id] = BatchTable.empty(edition_id, ids)
        out[edition_id].fill_many(parts)
        parts.clear()

    for index, table in iter_assess_many(beams, editions, form=form, situation=situation,
                                         registry=registry):
        if parts and parts[0][1].edition_id != table.edition_id:
            gather()
        parts.append((index, table))
    if parts:
        gather()
    return out


class RowNames(Sequence[str]):
    """``NAME[0]``, ``NAME[1]`` ...: the names of the rows of an array-valued beam, made
    when asked for (a design search of a million candidates reads a few of them)."""

    def __init__(self, name: str, size: int, start: int = 0) -> None:
        self.name, self.size, self.start = name, size, start

    def __len__(self) -> int:
        return self.size

    @overload
    def __getitem__(self, i: int) -> str: ...

    @overload
    def __getitem__(self, i: slice) -> RowNames: ...

    def __getitem__(self, i: int | slice) -> str | RowNames:
        if isinstance(i, slice):
            begin, end, step = i.indices(self.size)
            if step != 1:
                raise ValueError("row names are sliced in order")
            return RowNames(self.name, max(0, end - begin), self.start + begin)
        if not -self.size <= i < self.size:
            raise IndexError(i)
        return f"{self.name}[{self.start + i % self.size}]"


def assess_columns(batch: Beam, editions: Iterable[str | Edition], *,
                   ids: Sequence[str] | None = None, form: str | None = None,
                   situation: str = "persistent", registry: Registry | None = None,
                   chunk: int = CHUNK) -> dict[str, BatchTable]:
    """The batch path without per-beam objects, for design searches: ``batch`` is one
    array-valued beam (every numeric field an array of shape (N,), or one value shared
    by all), as :func:`stack_beams` makes. Rows are run ``chunk`` at a time; a failing
    chunk is retried row by row."""
    keep_freed_memory()
    reg = registry or default_registry()
    n = batch.size
    names: Sequence[str] = list(ids) if ids is not None else RowNames(batch.id, n)
    parts = [(np.arange(start, min(start + chunk, n)), take_beam(batch, np.arange(
        start, min(start + chunk, n))) if n > chunk else batch) for start in range(0, n, chunk)]
    out: dict[str, BatchTable] = {}
    for edition in (reg.edition(e) if isinstance(e, str) else e for e in editions):
        chosen, _ = resolve_form(edition, batch, form)
        context = Context(form=chosen, situation=situation)
        with cycle_collector_paused():
            if len(parts) == 1:
                out[edition.id] = _columns_table(edition, batch, names, context)
                continue
            table = BatchTable.empty(edition.id, names)
            for rows, part in parts:
                table.fill(rows, _columns_table(edition, part, names[rows[0]:rows[-1] + 1],
                                                context))
            out[edition.id] = table
    return out


def _columns_table(edition: Edition, batch: Beam, names: Sequence[str],
                   context: Context) -> BatchTable:
    """One chunk of :func:`assess_columns`, retried row by row if it fails as a whole."""
    try:
        return _group_table(edition, batch, names, context)
    except (ClausewiseError, ValueError, ArithmeticError):
        table = BatchTable.empty(edition.id, names)
        for i in range(len(names)):
            row = np.array([i])
            try:
                table.fill(row, _group_table(edition, take_beam(batch, row), [names[i]],
                                             context))
            except (ClausewiseError, ValueError, ArithmeticError) as exc:
                table.message[i] = f"{type(exc).__name__}: {exc}"
        return table
