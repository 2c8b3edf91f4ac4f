"""Reading a whole file: TOML, the project and run tables, every beam."""

from __future__ import annotations

import re
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import ValidationError

from clausewise.beamfile.errors import (
    InputError,
    InputProblem,
    _did_you_mean,
    _Fields,
    _from_pydantic,
    _text,
)
from clausewise.beamfile.models import BeamModel, HeaderModel
from clausewise.beamfile.reader import _SYSTEMS, _BeamReader
from clausewise.provisions import Beam, UnitSystem
from clausewise.provisions.batch import cycle_collector_paused


@dataclass(frozen=True)
class BeamEntry:
    """A loaded beam in internal units, and its inputs as the user wrote them."""

    beam: Beam
    shown: dict[str, str]
    # per layer (tension, then compression): each bar's diameter (mm) in the order given,
    # or None where the layer was given as an area; for drawing the bars
    bar_groups: tuple[tuple[float, ...] | None, ...] = ()


@dataclass(frozen=True)
class ProjectInfo:
    """The file's project table and run options; ``annexes`` resolved against the file."""

    name: str
    building: str
    town: str
    engineer: str
    notes: str
    unit_system: UnitSystem
    editions: tuple[str, ...]
    required: tuple[str, ...]
    annexes: tuple[Path, ...]
    form: str
    situation: str


@dataclass(frozen=True)
class Schedule:
    """Everything one file holds: the beams that loaded and the problems of those that did not."""

    source: Path
    project: ProjectInfo
    entries: tuple[BeamEntry, ...]
    problems: tuple[InputProblem, ...]
    warnings: tuple[str, ...] = ()  # said once per file, e.g. plain numbers read as SI


_BEAM_FIELDS = _Fields.of(BeamModel)
# what BeamModel.model_validate calls, without its wrapper's cost on every beam
_validate_beam = BeamModel.__pydantic_validator__.validate_python
_HEADER_FIELDS = _Fields.of(HeaderModel)
_TOP_LEVEL = ("project", "run", "beam")


def _toml_loads(text: str, source: str) -> dict[str, Any]:
    """Parse TOML with the compiled ``rtoml`` (a large schedule parses about five times
    faster than with the standard library), falling back to ``tomllib``."""
    try:
        import rtoml as toml
    except ImportError:
        import tomllib as toml  # type: ignore[no-redef]
    try:
        return toml.loads(text.removeprefix("\ufeff"))
    except ValueError as exc:  # a parse error, or a number out of range
        raise InputError(f"{source}: not a valid TOML file: {exc}") from exc
    except RecursionError as exc:
        raise InputError(f"{source}: not a valid TOML file: nested too deeply") from exc


def _header(data: dict[str, Any], source: str, base: Path
            ) -> tuple[ProjectInfo | None, list[InputProblem]]:
    """The project and run tables, or None with their problems."""
    unknown = [k for k in data if k not in _TOP_LEVEL]
    problems = [InputProblem(source, None, key, _text(data[key]), "no top-level table or key "
                             f"of this name{_did_you_mean(key, _TOP_LEVEL) or ''} (the file "
                             "holds [project], [run] and [[beam]] tables)") for key in unknown]
    header: HeaderModel | None = None
    try:
        header = HeaderModel.model_validate({k: data[k] for k in ("project", "run") if k in data})
    except ValidationError as exc:
        problems += [InputProblem(source, None, f, v, e)
                     for f, v, e in _from_pydantic(exc, _HEADER_FIELDS)]
    annexes: list[Path] = []
    if header is not None:
        for i, annex in enumerate(header.run.annexes, 1):
            path = base / annex
            if not path.is_file():
                problems.append(InputProblem(source, None, f"run.annexes[{i}]", annex,
                                             f"an annex file that exists (looked for {path})"))
            annexes.append(path)
    if problems or header is None:
        return None, problems
    p, run = header.project, header.run
    return ProjectInfo(p.name, p.building, p.town, p.engineer, p.notes, UnitSystem(p.units),
                       tuple(run.editions), tuple(run.require), tuple(annexes), run.form,
                       run.situation), []


def _beam_id(raw: Any) -> str | None:
    if isinstance(raw, dict) and isinstance(raw.get("id"), str) and raw["id"].strip():
        return _text(raw["id"].strip())
    return None


def _schedule(data: dict[str, Any], source: str, base: Path, design: bool = False,
              beams: Iterable[Any] | None = None) -> Schedule:
    """The schedule of a parsed file; ``beams``, when given, are the [[beam]] tables read
    apart from ``data`` (chunk by chunk, see :func:`_beam_chunks`)."""
    project, header_problems = _header(data, source, base)
    if beams is None:
        beams = data.get("beam")
        if not beams:
            raise InputError(f"{source}: no beams; add at least one [[beam]] table")
        if not isinstance(beams, list):
            raise InputError(f"{source}, field beam: got {_text(beams)!r}, expected [[beam]] "
                             "tables, one per beam")
    read = _read_beams(beams, source, project, _declares_units(data), design)
    if project is None:  # every problem of the file at once: the header's and the beams'
        found = [*header_problems, *read.problems]
        raise InputError("\n".join(p.message for p in found), tuple(found))
    return Schedule(Path(source), project, tuple(read.entries), tuple(read.problems),
                    _default_units_warning(source, list(read.defaulted.items())[:5],
                                           len(read.defaulted)))


def _declares_units(data: dict[str, Any]) -> bool:
    return isinstance(data.get("project"), dict) and "units" in data["project"]


@dataclass
class BeamsRead:
    """What reading a run of [[beam]] tables found: the beams that loaded, the problems of
    those that did not, the first beam number of every id that passed validation (a later
    beam with one of them is refused), and the fields that took SI units by default, by
    beam id (only where the file declares no unit system)."""

    entries: list[BeamEntry]
    problems: list[InputProblem]
    ids: dict[str, int]
    defaulted: dict[str, list[str]]


def _read_beams(beams: Iterable[Any], source: str, project: ProjectInfo | None,
                declared: bool, design: bool = False, first: int = 1) -> BeamsRead:
    """Validate and read every table of ``beams``, numbered in the file from ``first``."""
    read = BeamsRead([], [], {}, {})
    entries, problems, first_seen, defaulted = (read.entries, read.problems, read.ids,
                                                read.defaulted)
    file_system = project.unit_system if project else UnitSystem.SI

    def report(raw: Any, index: int, found: list[tuple[str, str, str]]) -> None:
        beam_id = _beam_id(raw)  # only for a beam with problems: the happy path skips it
        problems.extend(InputProblem(source, beam_id, f, v, e, index) for f, v, e in found)

    for index, raw in enumerate(beams, first):
        if not isinstance(raw, dict):
            report(raw, index, [("beam", _text(raw), "a table of beam fields ([[beam]])")])
            continue
        try:
            model = _validate_beam(raw)
        except ValidationError as exc:
            report(raw, index, _from_pydantic(exc, _BEAM_FIELDS)
                   + _beyond_the_shape(raw, exc, project, design))
            continue
        if model.id in first_seen:
            report(raw, index, [("id", model.id, f"an id not used by another beam (beam "
                                 f"number {first_seen[model.id]} has it)")])
            continue
        first_seen[model.id] = index
        system = _SYSTEMS[model.units] if model.units else file_system
        reader = _BeamReader(model, system, design)
        beam = reader.read()
        if not declared and model.units is None and reader.defaulted:
            defaulted[model.id] = reader.defaulted
        if beam is None:
            report(raw, index, reader.problems)
        else:
            entries.append(BeamEntry(beam, reader.shown, tuple(reader.bar_groups)))
    return read


def _default_units_warning(source: str, shown_beams: list[tuple[str, list[str]]],
                           count: int) -> tuple[str, ...]:
    """One warning for the file when plain numbers took SI units without the file saying
    so: ``web_width = 300`` is 300 mm only if the engineer meant SI. ``shown_beams``: the
    first five such beams and their fields, of ``count``."""
    if not count:
        return ()
    shown = [f"beam {beam_id}: {', '.join(fields)}" for beam_id, fields in shown_beams[:5]]
    more = count - len(shown)
    return (f"{source}: numbers without a unit were read as SI (mm, mm², MPa, kN m), but the "
            "file declares no unit system; add [project] units = \"SI\" (or \"US\"), or write "
            f"the units. Read by default: {'; '.join(shown)}"
            + (f"; and {more} more beam(s)" if more > 0 else ""),)


def _beyond_the_shape(raw: dict[str, Any], exc: ValidationError,
                      project: ProjectInfo | None, design: bool = False
                      ) -> list[tuple[str, str, str]]:
    """The value problems (units, ranges, bars) of a beam whose shape was refused, read
    from the fields that were not, so that one reading finds every problem. Nothing
    when the rest cannot be read without the refused fields."""
    refused = {str(error["loc"][0]) for error in exc.errors() if error["loc"]}
    try:
        model = BeamModel.model_validate({k: v for k, v in raw.items() if k not in refused})
    except ValidationError:
        return []
    system = _SYSTEMS[model.units] if model.units else (
        project.unit_system if project else UnitSystem.SI)
    reader = _BeamReader(model, system, design)
    reader.read()
    return [p for p in reader.problems if p[0].split(".")[0].split("[")[0] not in refused]


_BEAM_HEADER = r"\[\[[ \t]*beam[ \t]*\]\][ \t]*(?:#[^\n]*)?$"  # a line [[beam]]
_BEAM_TABLE = re.compile(_BEAM_HEADER, re.MULTILINE)
# the same line after a line break: a literal start, which the regex engine finds several
# times faster than a line start (^) in a large file
_NEXT_BEAM_TABLE = re.compile("\n" + _BEAM_HEADER, re.MULTILINE)
CHUNK = 5_000  # [[beam]] tables parsed at a time in a large file


class _NotChunked(Exception):
    """The file cannot be read in pieces exactly as a whole (a table after the beams, a
    line ``[[beam]]`` inside a string, a syntax error): read it whole instead."""


def _beam_starts(text: str) -> list[int]:
    """Where each line ``[[beam]]`` of the text starts."""
    return ([0] if _BEAM_TABLE.match(text) else []) + [
        m.start() + 1 for m in _NEXT_BEAM_TABLE.finditer(text)]


def _starts_and_head(text: str, source: str) -> tuple[list[int], dict[str, Any]] | None:
    """Where each [[beam]] table of a file of more than ``CHUNK`` beams starts, and the
    tables before the first; None for a smaller file, or a head that cannot be read
    apart."""
    starts = _beam_starts(text)
    if len(starts) <= CHUNK:
        return None
    try:
        head = _toml_loads(text[:starts[0]], source)
    except InputError:
        return None
    return None if "beam" in head else (starts, head)


def _chunk_tables(text: str, source: str, starts: list[int], end: int
                  ) -> Iterator[list[Any]]:
    """The [[beam]] tables from ``starts[0]`` to ``end``, ``CHUNK`` at a time."""
    bounds = [*starts[::CHUNK], end]
    for start, stop in zip(bounds, bounds[1:], strict=False):
        try:
            part = _toml_loads(text[start:stop], source)
        except InputError:
            raise _NotChunked from None
        if set(part) != {"beam"} or not isinstance(part["beam"], list):
            raise _NotChunked
        yield part["beam"]


def _beam_chunks(text: str, source: str) -> tuple[dict[str, Any], Iterator[list[Any]]] | None:
    """The tables before the first [[beam]], and the [[beam]] tables ``CHUNK`` at a time,
    for a file of more than ``CHUNK`` beams: the parsed tree of a large schedule is many
    times the size of its beams, so it is never held whole. None for a smaller file."""
    found = _starts_and_head(text, source)
    if found is None:
        return None
    starts, head = found
    return head, _chunk_tables(text, source, starts, len(text))


@dataclass(frozen=True)
class BeamTables:
    """A large file's text with its [[beam]] tables found but not yet parsed, so that any
    contiguous run of them can be read apart (each by a process of its own, see
    ``clausewise.shards``) with the beams, problems and numbers a whole reading gives."""

    source: str
    text: str
    head: dict[str, Any]  # the tables before the first [[beam]]
    project: ProjectInfo
    starts: list[int]  # where each [[beam]] table starts in the text

    def read(self, tables: range, design: bool = False) -> BeamsRead | None:
        """The tables ``tables`` (counted from 0), numbered in the file from
        ``tables.start + 1``; None when they cannot be read apart from the rest of the
        file (a table after the beams, a line [[beam]] inside a string, a syntax error):
        the whole file must then be read as one."""
        end = self.starts[tables.stop] if tables.stop < len(self.starts) else len(self.text)
        chunks = _chunk_tables(self.text, self.source, self.starts[tables.start:tables.stop],
                               end)
        try:
            with cycle_collector_paused():
                return _read_beams((raw for chunk in chunks for raw in chunk), self.source,
                                   self.project, _declares_units(self.head), design,
                                   tables.start + 1)
        except _NotChunked:
            return None

    def schedule(self, problems: tuple[InputProblem, ...] = (),
                 warnings: tuple[str, ...] = ()) -> Schedule:
        """The file's schedule without its beams (they stay with the process that read
        them): what the file-level checks and the report need."""
        return Schedule(Path(self.source), self.project, (), problems, warnings)

    def default_units_warning(self, shown_beams: list[tuple[str, list[str]]],
                              count: int) -> tuple[str, ...]:
        """The file's warning of plain numbers read as SI, as a whole reading gives it."""
        return _default_units_warning(self.source, shown_beams, count)


def beam_tables(text: str, source: str) -> BeamTables | None:
    """The [[beam]] tables of a file of more than ``CHUNK`` beams, found; None for a file
    that is read whole anyway: a small one, one whose head or last beam does not parse
    apart, one with a table after the beams (the head is then not all of the project and
    run), or whose project or run table has problems (a whole reading reports them with
    the beams')."""
    found = _starts_and_head(text, source)
    if found is None:
        return None
    starts, head = found
    try:
        last = _toml_loads(text[starts[-1]:], source)
    except InputError:
        return None
    if set(last) != {"beam"}:
        return None
    project, _ = _header(head, source, Path(source).parent)
    if project is None:
        return None
    return BeamTables(source, text, head, project, starts)


def parse_schedule(text: str, source: str = "<text>", *, design: bool = False) -> Schedule:
    """Read a schedule from TOML text; annex paths are taken relative to ``source``'s folder.
    With ``design``, beams may leave out their tension bars (design chooses them). A large
    file is parsed a chunk of beams at a time, with the same result as parsed whole."""
    base = Path(source).parent
    with cycle_collector_paused():
        pieces = _beam_chunks(text, source)
        if pieces is not None:
            head, chunks = pieces
            try:
                return _schedule(head, source, base, design,
                                 (raw for chunk in chunks for raw in chunk))
            except _NotChunked:
                pass
        return _schedule(_toml_loads(text, source), source, base, design)


def read_text(path: Path) -> str:
    """A schedule file's text, or an :class:`InputError` saying why it cannot be read. Only
    a regular file is read: a device or a pipe may never end."""
    import stat

    try:
        if path.exists() and not path.is_dir() and not stat.S_ISREG(path.stat().st_mode):
            raise InputError(f"{path}: not a regular file (a device, a pipe or a socket); "
                             "give the path of a schedule file")
        raw = path.read_bytes()
    except FileNotFoundError as exc:
        raise InputError(f"{path}: no such file") from exc
    except IsADirectoryError as exc:
        raise InputError(f"{path}: is a folder, not a schedule file") from exc
    except OSError as exc:
        raise InputError(f"{path}: cannot be read ({exc.strerror or exc})") from exc
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputError(f"{path}: not UTF-8 text (bad byte at position {exc.start})") from exc


def load_schedule(path: str | Path, *, design: bool = False) -> Schedule:
    """Read a schedule file. Bad beams become problems; the others load."""
    path = Path(path)
    return parse_schedule(read_text(path), str(path), design=design)
