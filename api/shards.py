"""``clausewise batch`` on several processes: a large file's [[beam]] tables are cut into
contiguous shards, and each shard is read, assessed and written by a process of its own.

Why: reading a beam (TOML, validation, units) costs about as much as assessing it under
the seven built-in editions, and both go beam by beam, so the whole run divides between
processors. Beams never travel between processes (pickling them cost more than reading
them): the workers are forked, so they share the file's text, the editions and the
plugins the parent loaded; each reads its own tables and writes its rows to a temporary
file beside the output. A worker sends back only small things: what its reading found
(input problems numbered in the whole file, default-unit warnings, beam ids, unit
systems) and, once assessed, its summary (counts, worst beams, rows written). The
parent assesses the first shard itself, then writes the output: the header once, each
shard's rows in shard order, the refused rows last; it is renamed over the target only
when every shard succeeded (``outputs.rows_file``).

The rows are those of a one-process run, and so are the summary, the input problems
(in file order), the warnings and the exit status. Only the order of the rows within
the file may differ: rows come grouped by kind of beam within each shard, so compare two
files as sorted lines.

What no shard can see alone is settled once every shard is read and before any is
assessed: the unit system of the rows (the beams' own when all share one, else SI),
and the ids used in two shards. A one-process reading refuses the later of two beams
with one id, and reports nothing else of it; rather than patch the shards' readings, a
run whose shards share an id is done again in one process (rare, and then plainly the
same). So is a run whose tables cannot be read apart (see ``BeamTables.read``).

Linux only (fork); elsewhere a batch is one process. A worker ignores Ctrl-C (the parent
stops every worker on it, keeping the rows written so far) and the kernel stops it when
the parent ends, however that happens, so no worker outlives a run.
"""

from __future__ import annotations

import contextlib
import gc
import multiprocessing
import os
import pickle
import shutil
import signal
import sys
import tempfile
import traceback
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any, BinaryIO, TextIO

from clausewise.beamfile import loading
from clausewise.outputs import rows_file, rows_kind
from clausewise.provisions import ClausewiseError, UnitSystem
from clausewise.provisions.batch import cycle_collector_paused
from clausewise.stream import (
    MIXED_UNITS,
    LazyProgress,
    RowWriter,
    Summary,
    stream_beams,
    write_refused,
)

if TYPE_CHECKING:
    from multiprocessing.connection import Connection
    from multiprocessing.process import BaseProcess

    from clausewise.beamfile import InputProblem, Schedule
    from clausewise.beamfile.loading import BeamsRead, BeamTables
    from clausewise.provisions.registry import Edition


class WorkerError(ClausewiseError, RuntimeError):
    """A worker process that stopped without an answer."""


def processes(asked: int | None) -> int:
    """How many processes a batch may use: ``asked``, else one per processor this process
    may run on; 1 where workers cannot be forked."""
    if sys.platform != "linux" or "fork" not in multiprocessing.get_all_start_methods():
        return 1
    return asked if asked is not None else len(os.sched_getaffinity(0))


def plan(tables: int, count: int, least: int | None = None) -> list[range] | None:
    """Contiguous shards of ``tables`` [[beam]] tables for ``count`` processes, each of at
    least ``least`` tables (default: a loader chunk, so each shard's batches stay large);
    None for one process: a file of up to two shards' worth is not worth the forks."""
    least = loading.CHUNK if least is None else least
    shards = min(count, tables // max(least, 1))
    if tables <= 2 * least or shards < 2:
        return None
    cuts = [tables * i // shards for i in range(shards + 1)]
    return [range(a, b) for a, b in zip(cuts, cuts[1:], strict=False)]


@dataclass(frozen=True)
class Sharded:
    """A run done in shards: the schedule without its beams, and the whole summary."""

    schedule: Schedule
    summary: Summary


@dataclass(frozen=True)
class _Reading:
    """What a shard's reading found, as the parent needs it."""

    problems: list[InputProblem]
    ids: list[str]  # every id a later beam may not use (loading.BeamsRead.ids)
    defaulted: list[tuple[str, list[str]]]  # the first five beams read with SI by default
    defaulted_count: int
    systems: set[UnitSystem]

    @classmethod
    def of(cls, read: BeamsRead) -> _Reading:
        return cls(read.problems, list(read.ids), list(read.defaulted.items())[:5],
                   len(read.defaulted), {entry.beam.unit_system for entry in read.entries})


@dataclass(frozen=True)
class _Failure:
    """A worker's exception, with its traceback as text."""

    error: BaseException
    trace: str


class _WorkerTraceback(Exception):
    """Where a worker's exception was raised (the cause of the one raised again here)."""


@dataclass
class _Worker:
    tables: range
    process: BaseProcess
    conn: Connection
    rows: Path | None

    def receive(self) -> Any:
        """The worker's next message; its exception raised here, or a WorkerError when it
        stopped without an answer."""
        try:
            message = self.conn.recv()
        except (EOFError, OSError):
            self.process.join(5)
            raise WorkerError(
                f"the process for beams {self.tables.start + 1} to {self.tables.stop} "
                f"stopped without an answer (exit status {self.process.exitcode})") from None
        if isinstance(message, _Failure):
            raise message.error from _WorkerTraceback(message.trace)
        return message


def run(tables: BeamTables, parts: Sequence[range], editions: Sequence[Edition],
        form: str | None, situation: str, out: Path | None, *,
        warn: Callable[[str], None], progress: bool = False) -> Sharded | None:
    """Read, assess and write the file's shards ``parts``, the first here and each other
    by a forked worker; None when the run must be done again in one process (an id in
    two shards, tables that cannot be read apart). ``warn`` says each warning of the file
    once every shard is read, before any is assessed."""
    context = multiprocessing.get_context("fork")
    kind = rows_kind(out) if out is not None else ""
    workers: list[_Worker] = []
    temporary: list[Path] = []
    gc.freeze()  # the parent's objects, shared by fork, are left alone by the workers' collector
    try:
        for part in parts[1:]:
            rows = None
            if out is not None:
                rows = _temporary_rows(out, len(workers) + 2)
                temporary.append(rows)
            workers.append(_start(context, tables, part, editions, form, situation, rows, kind))
        with cycle_collector_paused(set_aside=True):
            own = tables.read(parts[0])
        if own is None:
            return None
        readings = [_Reading.of(own)]
        for worker in workers:
            reading = worker.receive()
            if reading is None:
                return None
            readings.append(reading)
        if _ids_shared(readings):
            return None
        problems = tuple(p for r in readings for p in r.problems)
        warnings = tables.default_units_warning(
            [d for r in readings for d in r.defaulted][:5],
            sum(r.defaulted_count for r in readings))
        for warning in warnings:
            warn(warning)
        systems = set().union(*(r.systems for r in readings))
        if len(systems) > 1 and out is not None:
            warn(MIXED_UNITS)
        system = systems.pop() if len(systems) == 1 else UnitSystem.SI
        for worker in workers:
            worker.conn.send(system)
        beams = [entry.beam for entry in own.entries]
        del own
        bar = LazyProgress(progress, label=f"assessing part 1 of {len(parts)}")
        try:
            summary = _assess(beams, problems, editions, form, situation, out, kind, system,
                              workers, bar)
        finally:
            bar.close()
        return Sharded(tables.schedule(problems, warnings), summary)
    finally:
        _stop(workers)
        for path in temporary:
            path.unlink(missing_ok=True)
        gc.unfreeze()


def _assess(beams: list[Any], problems: Sequence[InputProblem], editions: Sequence[Edition],
            form: str | None, situation: str, out: Path | None, kind: str,
            system: UnitSystem, workers: list[_Worker], bar: LazyProgress) -> Summary:
    """The parent's shard assessed (its rows straight into the partial output), then each
    worker's summary and rows taken in shard order, then the refused beams."""
    ids = [e.id for e in editions]
    if out is None:
        summary = stream_beams(beams, editions, form, situation, None, bar, system=system)
        for worker in workers:
            summary.merge(worker.receive())
        write_refused(summary, problems, ids, situation, None)
        return summary
    with rows_file(out) as handle:
        writer = RowWriter(handle, kind, system)
        try:
            summary = stream_beams(beams, editions, form, situation, writer, bar,
                                   system=system)
            for worker in workers:
                summary.merge(worker.receive())
        except BaseException:
            _stop(workers)  # before their rows are taken: they write no more
            _append(handle, workers, whole_lines_only=True)
            raise
        _append(handle, workers)
        write_refused(summary, problems, ids, situation, writer)
    return summary


def _start(context: Any, tables: BeamTables, part: range, editions: Sequence[Edition],
           form: str | None, situation: str, rows: Path | None, kind: str) -> _Worker:
    here, there = context.Pipe()
    process = context.Process(
        target=_work, daemon=True, name=f"clausewise beams {part.start + 1}-{part.stop}",
        args=(tables, part, editions, form, situation, rows, kind, there, here, os.getpid()))
    # Ctrl-C held back while forking, so that a worker never takes it before it ignores it
    mask = signal.pthread_sigmask(signal.SIG_BLOCK, {signal.SIGINT})
    try:
        process.start()
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, mask)
    there.close()
    return _Worker(part, process, here, rows)


def _ids_shared(readings: list[_Reading]) -> bool:
    seen: set[str] = set()
    for reading in readings:
        if not seen.isdisjoint(reading.ids):
            return True
        seen.update(reading.ids)
    return False


def _stop(workers: list[_Worker]) -> None:
    """Every worker ended and waited for (one that has answered is ending anyway)."""
    for worker in workers:
        if worker.process.is_alive():
            worker.process.terminate()
    for worker in workers:
        worker.process.join(5)
        if worker.process.is_alive():
            worker.process.kill()
            worker.process.join()
        worker.conn.close()


def _temporary_rows(out: Path, number: int) -> Path:
    """A new file beside ``out`` for one shard's rows, under a partial name."""
    handle, name = tempfile.mkstemp(prefix=f"{out.stem}.partial-{number}-", suffix=out.suffix,
                                    dir=out.parent)
    os.close(handle)
    return Path(name)


def _append(handle: TextIO, workers: list[_Worker], whole_lines_only: bool = False) -> None:
    """Each worker's rows after the parent's, in shard order, streamed file to file. After
    a failure only whole lines: a worker stopped while writing leaves half a row."""
    handle.flush()
    target: BinaryIO = handle.buffer
    for worker in workers:
        if worker.rows is None:
            continue
        with worker.rows.open("rb") as rows:
            if whole_lines_only:
                _copy(rows, target, _whole_lines(rows))
            else:
                shutil.copyfileobj(rows, target)
    target.flush()


def _whole_lines(rows: BinaryIO) -> int:
    """The length of a file up to the end of its last complete line."""
    end = rows.seek(0, os.SEEK_END)
    while end > 0:
        start = max(0, end - (1 << 16))
        rows.seek(start)
        found = rows.read(end - start).rfind(b"\n")
        if found >= 0:
            return start + found + 1
        end = start
    return 0


def _copy(source: BinaryIO, target: BinaryIO, length: int) -> None:
    source.seek(0)
    while length > 0:
        block = source.read(min(length, 1 << 20))
        if not block:
            return
        target.write(block)
        length -= len(block)


# --- in the worker ----------------------------------------------------------------------------

def _work(tables: BeamTables, part: range, editions: Sequence[Edition], form: str | None,
          situation: str, rows: Path | None, kind: str, conn: Connection,
          parents_end: Connection, parent: int) -> None:
    """A worker: read its shard and say what the reading found; once told the unit system
    of the rows, assess and write them, and send its summary."""
    _bound_to(parent)
    parents_end.close()
    try:
        with cycle_collector_paused(set_aside=True):
            read = tables.read(part)
        conn.send(None if read is None else _Reading.of(read))
        system = conn.recv() if read is not None else None
        if read is None or system is None:
            return
        beams = [entry.beam for entry in read.entries]
        del read
        if rows is None:
            summary = stream_beams(beams, editions, form, situation, None, system=system)
        else:
            with rows.open("w", encoding="utf-8", newline="") as handle:
                summary = stream_beams(beams, editions, form, situation,
                                       RowWriter(handle, kind, system, header=False),
                                       system=system)
        conn.send(summary)
    except BaseException as exc:  # said to the parent, which raises it as its own
        _send_failure(conn, exc)


def _bound_to(parent: int) -> None:
    """Ignore Ctrl-C (the parent stops the workers), end quietly when the parent ends this
    process (the command's own handlers, inherited, would raise in a worker that had
    answered and was ending, and print a traceback after a run that went well), and have
    the kernel stop this process when the parent ends, however it ends."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    for name in ("SIGTERM", "SIGHUP"):
        number = getattr(signal, name, None)
        if number is not None:
            signal.signal(number, signal.SIG_DFL)
    signal.pthread_sigmask(signal.SIG_UNBLOCK, {signal.SIGINT})
    try:
        import ctypes

        ctypes.CDLL(None, use_errno=True).prctl(1, signal.SIGKILL)  # PR_SET_PDEATHSIG
    except (OSError, AttributeError):
        pass
    if os.getppid() != parent:  # the parent ended before that took effect
        os._exit(1)


def _send_failure(conn: Connection, exc: BaseException) -> None:
    trace = "".join(traceback.format_exception(exc))
    try:
        pickle.loads(pickle.dumps(exc))
        failure = _Failure(exc, trace)
    except Exception:  # an exception that does not survive pickling: its text does
        failure = _Failure(RuntimeError(f"{type(exc).__name__}: {exc}"), trace)
    with contextlib.suppress(OSError):  # the parent is gone
        conn.send(failure)
