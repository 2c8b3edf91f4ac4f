"""The ``clausewise`` command: list editions, check, compare and explain beams of a file.

Output: a text report for people by default (colour only on a terminal); ``--format
html`` a printable calculation sheet (``pdf`` printed from it by headless Chromium);
``--format json|toml|csv`` for programs. An ``--out`` name's extension decides the format
(.txt, .html, .pdf, .json, .toml, .csv; batch rows as .csv or .jsonl): an unknown
extension, or a ``--format`` that contradicts it, is refused, and so is an ``--out`` that
is one of the run's input files (clausewise.outputs). Files are written whole or not at
all, each confirmed by one line on stderr.

Exit status: 0 every check passes (a beam without actions reports "capacity only",
which is not a failure); 1 a check fails, or a beam is outside an edition's scope or
has no equilibrium; 2 bad input or usage, which includes any beam of the file refused
for its input (the good beams are still checked and reported) and any beam an edition
could not assess.

Heavy libraries (rich, matplotlib, the input reader) are imported inside the
commands that need them, so ``clausewise --help`` starts quickly.
"""

from __future__ import annotations

import argparse
import io
import math
import os
import re
import sys
import textwrap
from collections.abc import Callable, Sequence
from dataclasses import replace
from pathlib import Path
from typing import TYPE_CHECKING, Any

from clausewise.provisions import ClausewiseError
from clausewise.provisions.verdicts import CAUTION, ERROR, FAILURES

if TYPE_CHECKING:
    from clausewise.beamfile import Schedule
    from clausewise.beamfile.loading import BeamTables
    from clausewise.provisions.registry import Edition, Registry
    from clausewise.results import Outcome
    from clausewise.stream import Summary

PROGRAM = "clausewise"
FORMATS = ("text", "html", "pdf", "json", "toml", "csv")
REPORT_WIDTH = 110  # columns of a report that does not go to a terminal (unless COLUMNS says)
BATCH_FROM = 2_000  # beam-editions beyond which check takes the batch path (text or CSV)

ENVIRONMENT = """
environment:
  CLAUSEWISE_EDITIONS  comma-separated edition ids: load only these (and their bases)
  CLAUSEWISE_STRICT    1: a broken edition plugin stops every command
"""

EXIT_STATUS = """exit status:
  0  every check passes (beams without actions report "capacity only")
  1  a check fails, or a beam is outside an edition's scope or has no equilibrium
  2  bad input or usage; also when some beams of the file were refused or an edition
     could not assess a beam (the others are still checked and reported)
""" + ENVIRONMENT


EDITIONS_STATUS = """exit status:
  0  the listing was shown (broken plugins are listed, and named on stderr)
  2  with --strict, when a plugin is broken or an edition cannot be used; bad usage
"""


class UsageError(ClausewiseError, ValueError):
    """A command line that names something that does not exist."""


# --- arguments ------------------------------------------------------------------------------

def _output_options(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--format", choices=FORMATS,
                        help="text: a report for people (the default); html: a printable "
                             "calculation sheet; pdf: that sheet printed (needs --out and "
                             "Chromium); json, toml, csv: results for programs")
    parser.add_argument("--out", type=Path, metavar="PATH",
                        help="write to this file instead of the screen; its extension "
                             "decides the format: .txt, .html, .pdf, .json, .toml, .csv")
    parser.add_argument("--paper", choices=("A4", "Letter"), default="A4",
                        help="page size of a PDF sheet (default A4); an HTML sheet prints "
                             "on either")


def _run_options(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("file", type=Path, metavar="FILE", help="the beam file (TOML)")
    parser.add_argument("--form", choices=("auto", "SI", "inch-pound"),
                        help="published form of the editions (default: the file's, else "
                             "auto: each beam's own units)")
    parser.add_argument("--situation", choices=("persistent", "accidental"),
                        help="design situation (default: the file's, else persistent)")
    parser.add_argument("--annex", type=Path, action="append", default=[], metavar="FILE",
                        help="load a parameter file as an extra edition (repeatable)")
    _output_options(parser)
    parser.add_argument("--units", choices=("beam", "SI"), default="beam",
                        help="units of json, toml and csv results: each beam's own system "
                             "(default) or SI (kN·m, kN, mm, mm², MPa); named in every "
                             "column")
    parser.add_argument("--digits", type=int, default=6, metavar="N",
                        help="significant figures of the numbers in json, toml and csv "
                             "results (default 6)")


def _figure_options(parser: argparse.ArgumentParser, what: str) -> None:
    parser.add_argument("--figures", type=Path, metavar="DIR", help=f"draw {what} into DIR")
    parser.add_argument("--figure-format", choices=("svg", "png"), default="svg",
                        help="file type of the figures (default svg)")


def build_parser() -> argparse.ArgumentParser:
    from clausewise import __version__

    parser = argparse.ArgumentParser(
        prog=PROGRAM, epilog=EXIT_STATUS, formatter_class=argparse.RawDescriptionHelpFormatter,
        description="Flexural strength of reinforced-concrete flanged beams under\n"
                    "interchangeable design standards, with the clause that governs.\n\n"
                    + textwrap.fill(CAUTION, 72))
    parser.add_argument("--version", action="version", version=f"{PROGRAM} {__version__}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND", required=True)

    editions = commands.add_parser("editions", help="list the installed editions",
                                   epilog=EDITIONS_STATUS,
                                   formatter_class=argparse.RawDescriptionHelpFormatter)
    editions.add_argument("edition", nargs="?", metavar="ID",
                          help="show which layer of this edition's stack answers each topic "
                               "and which layers wrap it")
    editions.add_argument("--strict", action="store_true",
                          help="exit with status 2 when any edition plugin is broken")
    editions.add_argument("--annex", type=Path, action="append", default=[], metavar="FILE",
                          help="also load a parameter file as an edition (repeatable)")
    editions.add_argument("--parameters", metavar="ID",
                          help="show one edition's named parameters: value, what a local "
                               "edition may set them to, clause and supplier")
    editions.add_argument("--form", choices=("SI", "inch-pound"),
                          help="with --parameters: the published form (default: its first)")
    _output_options(editions)
    editions.set_defaults(handler=editions_command)

    check = commands.add_parser("check", help="check every beam of a file",
                                epilog=EXIT_STATUS,
                                formatter_class=argparse.RawDescriptionHelpFormatter)
    _run_options(check)
    check.add_argument("--edition", action="append", metavar="ID",
                       help="edition to check against (repeatable; default: the file's "
                            "editions, else every installed one)")
    check.add_argument("--details", action="store_true",
                       help="each beam's report under every edition checked (without "
                            "--edition and editions in the file, only the summary is "
                            "shown by default)")
    _figure_options(check, "the section, strains and stresses of every beam")
    check.set_defaults(handler=check_command)

    compare = commands.add_parser("compare", help="the beams of a file under editions side "
                                  "by side", epilog=EXIT_STATUS,
                                  formatter_class=argparse.RawDescriptionHelpFormatter)
    _run_options(compare)
    compare.add_argument("--edition", action="append", metavar="ID",
                         help="edition to compare (repeatable; default: every installed one)")
    compare.add_argument("--details", action="store_true",
                         help="per beam, the moments and the governing clause of each "
                              "edition")
    compare.add_argument("--from", dest="source", metavar="ID",
                         help="with --to: list only the beams that change from this edition")
    compare.add_argument("--to", dest="target", metavar="ID",
                         help="with --from: the edition they change to")
    compare.add_argument("--steel", action="store_true",
                         help="the tension steel each edition requires for every beam (the "
                              "design search; bars given in the file are shown beside it)")
    compare.add_argument("--threshold", type=float, default=2.0, metavar="PERCENT",
                         help="with --from/--to: a change of design resistance larger than "
                              "this percentage counts (default 2)")
    _figure_options(compare, "the utilisation per edition of every beam")
    compare.set_defaults(handler=compare_command)

    explain = commands.add_parser("explain", help="the full audit trail of one beam",
                                  epilog=EXIT_STATUS,
                                  formatter_class=argparse.RawDescriptionHelpFormatter)
    _run_options(explain)
    explain.add_argument("beam", metavar="BEAM", help="id of the beam in the file")
    explain.add_argument("--edition", required=True, metavar="ID", help="edition to explain")
    _figure_options(explain, "the section, strains and stresses")
    explain.set_defaults(handler=explain_command)

    batch = commands.add_parser(
        "batch", help="check a large schedule fast; rows streamed to CSV or JSON Lines",
        epilog=EXIT_STATUS, formatter_class=argparse.RawDescriptionHelpFormatter,
        description="Every beam under every edition through the array path: the same "
                    "numbers as check, written row by row as they are computed (an "
                    "interrupted run keeps what was written), then a summary.")
    batch.add_argument("file", type=Path, metavar="FILE", help="the beam file (TOML)")
    batch.add_argument("--edition", action="append", metavar="ID",
                       help="edition to check against (repeatable; default: the file's "
                            "editions, else every installed one)")
    batch.add_argument("--form", choices=("auto", "SI", "inch-pound"),
                       help="published form of the editions (default: the file's, else auto)")
    batch.add_argument("--situation", choices=("persistent", "accidental"),
                       help="design situation (default: the file's, else persistent)")
    batch.add_argument("--annex", type=Path, action="append", default=[], metavar="FILE",
                       help="load a parameter file as an extra edition (repeatable)")
    batch.add_argument("--out", type=Path, metavar="PATH",
                       help="the rows: .csv or .jsonl, written as NAME.partial.csv until the "
                            "run completes; without it only the summary is shown")
    batch.add_argument("--workers", type=_process_count, metavar="N",
                       help="processes to share a large file (more than 10 000 beams) "
                            "among, each reading, checking and writing its own part "
                            "(default: one per processor; 1: one process; on Linux, "
                            "elsewhere always one)")
    batch.set_defaults(handler=batch_command)

    _design_parser(commands)

    schema = commands.add_parser("schema", help="JSON Schema of the beam file (for editors)")
    schema.add_argument("--results", action="store_true",
                        help="the schema of the JSON results instead")
    schema.add_argument("--out", type=Path, metavar="PATH", help="write to this file")
    schema.set_defaults(handler=schema_command)
    return parser


def _process_count(text: str) -> int:
    """--workers: a whole number of processes, 1 or more."""
    try:
        count = int(text)
    except ValueError:
        count = 0
    if count < 1:
        raise argparse.ArgumentTypeError(f"expected a whole number of processes, 1 or more "
                                         f"(1: one process), got {text!r}")
    return count


# --- shared steps -----------------------------------------------------------------------------

def _registry(annexes: Sequence[Path], named: Sequence[str] = ()) -> Registry:
    """A registry of this run: the installed editions plus the given parameter files,
    without touching the process-wide one. With ``named`` editions (and no
    CLAUSEWISE_EDITIONS), only those, their bases and the annexes' bases are loaded, so a
    slow plugin the run does not use costs nothing."""
    from clausewise.provisions.registry import Registry, default_registry

    only = _only(annexes, named)
    if only is not None:
        registry = Registry(strict=os.environ.get("CLAUSEWISE_STRICT", "") == "1", only=only)
        registry.load_entry_points()
    else:
        base = default_registry()
        registry = Registry(strict=base.strict, only=base.only, records=list(base.records))
    if annexes:
        from clausewise.annexfile import load_annex

        for path in annexes:
            load_annex(path, registry)
    return registry


def _name_broken(registry: Registry) -> None:
    """A broken plugin is left out of a run, never silently: one line on stderr each; with
    CLAUSEWISE_STRICT=1 it stops the run."""
    if registry.broken and (registry.strict or os.environ.get("CLAUSEWISE_STRICT") == "1"):
        from clausewise.provisions.registry import EditionError

        raise EditionError("CLAUSEWISE_STRICT=1 and broken edition plugins: " + "; ".join(
            f"{r.name}: {r.error}" for r in registry.broken))
    for record in registry.broken:
        _warn(f"edition plugin {record.name} is broken and left out of this run: "
              f"{record.error} (clausewise editions lists it)")


def _only(annexes: Sequence[Path], named: Sequence[str]) -> frozenset[str] | None:
    """The entry points a run needs, or None for all (nothing named, the environment
    chooses, or a name that is no entry point: the full registry then says what is known).
    Under CLAUSEWISE_STRICT=1 every plugin is loaded, so that a broken one stops the run
    whichever editions it names."""
    if not named or os.environ.get("CLAUSEWISE_EDITIONS", "").strip() \
            or os.environ.get("CLAUSEWISE_STRICT") == "1":
        return None
    from clausewise.annexfile import annex_heading
    from clausewise.provisions.registry import plugin_names

    heads = [annex_heading(path) for path in annexes]
    annex_ids = {edition_id for edition_id, _ in heads}
    wanted = {n for n in named if n not in annex_ids} | {base for _, base in heads if base}
    return frozenset(wanted) if wanted <= plugin_names() else None


def _named(args: argparse.Namespace, schedule: Schedule | None = None) -> list[str]:
    """The editions a command names (--edition, --parameters, the file's run.editions and
    required editions); empty when it uses every installed one."""
    asked = getattr(args, "edition", None) or getattr(args, "parameters", None) or []
    named = [asked] if isinstance(asked, str) else list(asked)
    if schedule is not None:
        if not named and args.command in ("check", "batch"):
            named = list(schedule.project.editions)
        if named:
            named += [re.split(r"[\s<>=!~]", r.strip(), maxsplit=1)[0]
                      for r in schedule.project.required]
    return named


def _require(registry: Registry, requirements: Sequence[str]) -> None:
    """Refuse to run unless every required edition is installed at an accepted version
    (``"en1992-1-1:2004"`` or ``"en1992-1-1:2004 >= 1.2"``)."""
    if not requirements:
        return
    from packaging.specifiers import InvalidSpecifier, SpecifierSet

    from clausewise.provisions.registry import EditionError

    installed = {r.info.id: r for r in registry.records if r.ok and r.info}
    for requirement in requirements:
        match = re.fullmatch(r"\s*([^\s<>=!~]+)\s*(.*?)\s*", requirement)
        edition_id, spec = match.groups() if match else (requirement, "")
        if edition_id not in installed:
            raise EditionError(f"the file requires edition {edition_id!r}, which is not "
                               f"installed (installed: {', '.join(sorted(installed))})")
        try:
            accepted = SpecifierSet(spec)
        except InvalidSpecifier as exc:
            raise UsageError(f"required edition {requirement!r}: {exc}") from None
        version = installed[edition_id].version
        if spec and version not in accepted:
            raise EditionError(f"the file requires {edition_id} {spec}, but version "
                               f"{version} is installed")


def _load(args: argparse.Namespace, text: str | None = None
          ) -> tuple[Schedule, Registry, str | None, str]:
    """The file (``text``: its text, already read) and what it and the command line choose."""
    from clausewise.beamfile import load_schedule, parse_schedule
    from clausewise.provisions.batch import cycle_collector_paused

    _guard_inputs(args)
    # the loaded beams live to the end of the command: kept out of the collector's rescans
    # (a third of the computing time of a 100 000-beam batch), given back by main
    with cycle_collector_paused(set_aside=True):
        schedule = load_schedule(args.file) if text is None else parse_schedule(
            text, str(args.file))
    for warning in schedule.warnings:
        _warn(warning)
    bare = {p.beam for p in schedule.problems if p.field == "tension" and not p.value}
    if bare and not schedule.entries and bare == {p.beam for p in schedule.problems}:
        _warn(f"no beam of {args.file} gives its tension steel: to find the steel each "
              f"edition requires and bars that fit, run: {PROGRAM} design {args.file}")
    return schedule, *_settings(args, schedule)


def _settings(args: argparse.Namespace, schedule: Schedule
              ) -> tuple[Registry, str | None, str]:
    """What the file's head and the command line choose before any beam is assessed: the
    registry (annexes guarded, required editions checked), the form and the situation."""
    _guard_inputs(args, *schedule.project.annexes)
    registry = _registry([*args.annex, *schedule.project.annexes], _named(args, schedule))
    _name_broken(registry)
    _require(registry, schedule.project.required)
    form = args.form or schedule.project.form or "auto"
    situation = args.situation or schedule.project.situation or "persistent"
    return registry, None if form == "auto" else form, situation


def _warn(warning: str) -> None:
    print(f"{PROGRAM}: warning: {warning}", file=sys.stderr)


def _editions(registry: Registry, ids: Sequence[str]) -> list[Edition]:
    if not ids:
        chosen = os.environ.get("CLAUSEWISE_EDITIONS", "").strip()
        raise UsageError("no edition is installed" + (
            f" of those CLAUSEWISE_EDITIONS names ({chosen})" if chosen else "") + (
            f"; broken plugins: {', '.join(r.name for r in registry.broken)}"
            if registry.broken else ""))
    return [registry.edition(i) for i in dict.fromkeys(ids)]


def exit_status(outcomes: Sequence[Outcome], schedule: Schedule) -> int:
    if schedule.problems or any(o.status == ERROR for o in outcomes):
        return 2
    return 1 if any(o.status in FAILURES for o in outcomes) else 0


def _chosen_format(args: argparse.Namespace) -> str:
    """text, html, pdf, json, toml or csv: the extension of --out decides, and a --format
    that contradicts it is refused."""
    from clausewise.outputs import format_for

    return format_for(args.out, args.format)


def _guard_inputs(args: argparse.Namespace, *more: Path) -> None:
    """Refuse an --out that is one of the run's input files, before anything is computed."""
    from clausewise.outputs import refuse_inputs, refuse_unwritable

    refuse_unwritable(getattr(args, "out", None), getattr(args, "figures", None))
    refuse_inputs(getattr(args, "out", None),
                  [p for p in (getattr(args, "file", None), *getattr(args, "annex", ()), *more)
                   if p is not None])


def _emit_text(text: str, out: Path | None) -> None:
    from clausewise.results import write_atomic

    if out is None:
        sys.stdout.write(text)
    else:
        write_atomic(out, text)
        _confirm(out)


def _confirm(out: Path) -> None:
    from clausewise.outputs import confirm

    confirm(out)


def _emit_report(renderable: Any, width: int = REPORT_WIDTH, out: Path | None = None) -> None:
    """Print a text report (``width`` columns unless on a terminal or COLUMNS says), or
    write it to a file as plain text."""
    from rich.console import Console

    from clausewise.results import write_atomic

    if out is None:
        Console(width=_screen_width(width), highlight=False).print(renderable)
        return
    console = Console(file=io.StringIO(), record=True, width=width, highlight=False)
    console.print(renderable)
    write_atomic(out, console.export_text())
    _confirm(out)


def _screen_width(default: int) -> int | None:
    """The columns a report gets on stdout: ``COLUMNS`` when the user set it (also when
    the output is piped, as in ``COLUMNS=80 clausewise check F | less``), else the
    terminal's own width, else ``default``."""
    columns = os.environ.get("COLUMNS", "").strip()
    if columns.isdigit() and int(columns) >= 40:
        return int(columns)
    return None if sys.stdout.isatty() else default


def _emit_sheet(page: str, kind: str, out: Path | None) -> None:
    """The calculation sheet as HTML, or printed to PDF by headless Chromium."""
    if kind == "html":
        _emit_text(page, out)
        return
    if out is None:
        raise UsageError("--format pdf needs --out FILE.pdf")
    from clausewise.results import write_atomic
    from clausewise.sheet import print_pdf

    write_atomic(out, print_pdf(page))
    _confirm(out)


def _problems_first(schedule: Schedule, args: argparse.Namespace) -> None:
    """Every input problem of the file on stderr before any result, unless a text report
    on the screen shows them at its top anyway."""
    if not schedule.problems or (_chosen_format(args) == "text" and args.out is None):
        return
    print(f"{PROGRAM}: {len(schedule.problems)} input problem(s); these beams are not "
          "assessed:", file=sys.stderr)
    for p in schedule.problems:
        print(f"  {p.message}", file=sys.stderr)


def _emit_document(data: dict[str, Any], kind: str, out: Path | None,
                   csv_writer: Any = None) -> None:
    from clausewise import results

    writers = {"json": results.to_json, "toml": results.to_toml,
               "csv": csv_writer or results.to_csv}
    _emit_text(writers[kind](data), out)


def _safe(name: str) -> str:
    return re.sub(r"[^A-Za-z0-9._-]+", "_", name).strip("_") or "beam"


def _beam_stem(beam_id: str) -> str:
    """A beam's part of a figure's file name: the id as it is where it is a plain name,
    else cleaned and marked with a short digest of the id, so that ids that clean alike
    ("a/b", "a_b", "ß", "é") never write over one another's figures."""
    import hashlib

    stem = _safe(beam_id)
    if stem == beam_id:
        return stem
    return f"{stem}-{hashlib.sha1(beam_id.encode('utf-8')).hexdigest()[:6]}"


def _make_folder(folder: Path) -> None:
    """The --figures folder, made where missing; a failure said of the option."""
    from clausewise.outputs import OutputError

    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise OutputError(f"--figures {folder}: cannot make the folder: "
                          f"{exc.strerror or exc}") from None


def _beam_figures(folder: Path, outcomes: Sequence[Outcome], kind: str) -> None:
    from clausewise import figures

    _make_folder(folder)
    written = 0
    for o in outcomes:
        a = o.assessment
        if a is None or a.response is None or not a.response.equilibrium:
            print(f"{PROGRAM}: no figure for beam {o.entry.beam.id} under {o.edition} "
                  f"({o.status})", file=sys.stderr)
            continue
        figure = figures.beam_figure(a, o.notation, o.entry.bar_groups)
        figures.save(figure, folder / f"{_beam_stem(o.entry.beam.id)}_{_safe(o.edition)}.{kind}")
        written += 1
    print(f"{PROGRAM}: {written} figure(s) written to {folder}", file=sys.stderr)


def _comparison_figures(folder: Path, outcomes: Sequence[Outcome], kind: str) -> None:
    from clausewise import figures

    _make_folder(folder)
    by_beam: dict[str, list[Outcome]] = {}
    for o in outcomes:
        by_beam.setdefault(o.entry.beam.id, []).append(o)
    written = 0
    for beam_id, group in by_beam.items():
        if group:
            figures.save(figures.utilisation_figure(group),
                         folder / f"{_beam_stem(beam_id)}_editions.{kind}")
            written += 1
    print(f"{PROGRAM}: {written} figure(s) written to {folder}", file=sys.stderr)


# --- commands ---------------------------------------------------------------------------------

def editions_command(args: argparse.Namespace) -> int:
    from clausewise import results

    kind = _chosen_format(args)
    if kind in ("html", "pdf"):
        raise UsageError(f"--format {kind}: the calculation sheet is made by check, compare "
                         "and explain; editions are listed as text, json, toml or csv")
    _guard_inputs(args)
    registry = _registry(args.annex, _named(args))
    if args.parameters:
        edition = registry.edition(args.parameters)
        form = args.form or edition.forms[0]
        if form not in edition.forms:
            raise UsageError(f"edition {edition.id!r} has no form {form!r} "
                             f"(it has: {', '.join(edition.forms)})")
        if kind == "text":
            from clausewise.report import parameters_report

            _emit_report(parameters_report(edition, form), out=args.out)
        else:
            _emit_document(results.parameters_document(edition, form), kind, args.out,
                           results.parameters_csv)
        return 0
    if args.edition:
        edition = registry.edition(args.edition)
        if kind == "text":
            from clausewise.report import topics_report

            _emit_report(topics_report(edition), out=args.out)
        else:
            _emit_document(results.topics_document(edition), kind, args.out,
                           results.topics_csv)
        return 0
    if kind == "text":
        from clausewise.report import editions_report

        _emit_report(editions_report(registry), out=args.out)
    else:
        _emit_document(results.editions_document(registry), kind, args.out,
                       results.editions_csv)
    unusable = registry.unusable()
    for record in registry.broken:
        print(f"{PROGRAM}: broken edition plugin {record.name} ({record.source}): "
              f"{record.error}", file=sys.stderr)
    for edition_id, why in unusable.items():
        print(f"{PROGRAM}: edition {edition_id} cannot be used: {why}", file=sys.stderr)
    return 2 if args.strict and (registry.broken or unusable) else 0


def _assess(args: argparse.Namespace, default_ids: Callable[[Schedule, Registry], list[str]]
            ) -> tuple[Schedule, list[Edition], list[Outcome]]:
    from clausewise.results import run

    schedule, registry, form, situation = _load(args)
    editions = _editions(registry, args.edition or default_ids(schedule, registry))
    _problems_first(schedule, args)
    return schedule, editions, list(run(schedule, editions, form, situation))


def _publish(args: argparse.Namespace, schedule: Schedule, outcomes: Sequence[Outcome],
             build: Callable[[Any], tuple[Any, int]], what: str = "flexural check") -> None:
    """The results in the chosen format; ``build`` makes the report and its width from the
    report module, which is imported only when a report is wanted."""
    from clausewise import results

    kind = _chosen_format(args)
    if kind == "text":
        from clausewise import report

        _emit_report(*build(report), out=args.out)
    elif kind in ("html", "pdf"):
        from clausewise.sheet import calculation_sheet

        paper = args.paper if kind == "pdf" else ""
        _emit_sheet(calculation_sheet(schedule, outcomes, what, paper=paper), kind, args.out)
    else:
        _emit_document(results.document(schedule, outcomes, units=_units(args, kind, schedule),
                                        digits=args.digits), kind, args.out)


def _units(args: argparse.Namespace, kind: str, schedule: Schedule) -> str:
    """The unit system of machine-readable results: as asked, but SI in a CSV of a file
    that mixes SI and US customary beams (one unit per column), said on stderr."""
    from clausewise.stream import mixes_systems

    if kind == "csv" and args.units == "beam" and mixes_systems(schedule):
        print(f"{PROGRAM}: the file mixes SI and US customary beams; the CSV is in SI "
              "(one unit per column)", file=sys.stderr)
        return "SI"
    return str(args.units)


def batch_command(args: argparse.Namespace) -> int:
    from clausewise.outputs import format_for
    from clausewise.shards import processes

    _guard_inputs(args)
    format_for(args.out, None, holds=("rows",))
    text, shards = _large_file(args, processes(args.workers))
    if shards is not None:
        return _sharded_batch(args, *shards)
    return _one_process_batch(args, text)


def _large_file(args: argparse.Namespace, count: int
                ) -> tuple[str | None, tuple[BeamTables, list[range]] | None]:
    """The file's text (when it was read) and its shards for ``count`` processes, where
    the file is large enough to share among them; else no shards."""
    if count < 2:
        return None, None
    from clausewise.beamfile.loading import beam_tables, read_text
    from clausewise.shards import plan

    text = read_text(args.file)
    tables = beam_tables(text, str(args.file))
    parts = None if tables is None else plan(len(tables.starts), count)
    return text, (None if tables is None or parts is None else (tables, parts))


def _one_process_batch(args: argparse.Namespace, text: str | None) -> int:
    schedule, registry, form, situation = _load(args, text)
    editions = _editions(registry, args.edition or list(schedule.project.editions)
                         or registry.ids())
    return _run_batch(schedule, editions, form, situation, args.out)


def _sharded_batch(args: argparse.Namespace, tables: BeamTables, parts: list[range]) -> int:
    """The batch path over shards of a large file, one process each (clausewise.shards).
    The file-level checks are made here, before any beam is read (again only when the run
    is redone in one process); the editions and plugins are loaded before the workers
    are forked, so they share them."""
    from clausewise import shards

    registry, form, situation = _settings(args, tables.schedule())
    editions = _editions(registry, args.edition or list(tables.project.editions)
                         or registry.ids())
    done = shards.run(tables, parts, editions, form, situation, args.out, warn=_warn,
                      progress=sys.stderr.isatty())
    if done is None:
        # the shards cannot stand for the file (an id in two of them, a table between the
        # beams): the whole run again in one process, from the file's text
        return _one_process_batch(args, tables.text)
    return _finish_batch(done.schedule, done.summary, args.out, situation)


def _run_batch(schedule: Schedule, editions: Sequence[Edition], form: str | None,
               situation: str, out: Path | None) -> int:
    """The batch path: rows streamed to ``out`` (CSV, or JSON Lines for .jsonl), progress
    on a terminal for runs longer than a second, and a summary at the end."""
    from clausewise.outputs import rows_file, rows_kind
    from clausewise.stream import (
        MIXED_UNITS,
        LazyProgress,
        RowWriter,
        mixes_systems,
        schedule_system,
        stream_schedule,
    )

    progress = LazyProgress(sys.stderr.isatty())
    if out is not None and mixes_systems(schedule):
        _warn(MIXED_UNITS)
    try:
        if out is None:
            summary = stream_schedule(schedule, editions, form, situation, None, progress)
        else:
            with rows_file(out) as handle:
                summary = stream_schedule(schedule, editions, form, situation,
                                          RowWriter(handle, rows_kind(out),
                                                    schedule_system(schedule)),
                                          progress)
    finally:
        progress.close()
    return _finish_batch(schedule, summary, out, situation)


def _finish_batch(schedule: Schedule, summary: Summary, out: Path | None,
                  situation: str) -> int:
    """The summary of a batch run, and its exit status."""
    from clausewise.report import batch_summary

    _emit_report(batch_summary(schedule, summary, out, situation))
    statuses = {s for counts in summary.counts.values() for s in counts}
    if schedule.problems or ERROR in statuses:
        return 2
    return 1 if any(s in FAILURES for s in statuses) else 0


def check_command(args: argparse.Namespace) -> int:
    from clausewise.results import run
    from clausewise.shards import processes

    _guard_inputs(args)  # an --out that is an input or a folder, said before the format
    kind = _chosen_format(args)
    batch_form = not args.figures and (kind == "csv" or (kind == "text" and args.out is None))
    text = None
    if batch_form:  # a file large enough for shards takes the batch path whatever its editions
        text, shards = _large_file(args, processes(None))
        if shards is not None:
            return _sharded_batch(args, *shards)
    schedule, registry, form, situation = _load(args, text)
    chosen = args.edition or list(schedule.project.editions)
    editions = _editions(registry, chosen or registry.ids())
    if len(schedule.entries) * len(editions) > BATCH_FROM and batch_form:
        return _run_batch(schedule, editions, form, situation, args.out)
    _problems_first(schedule, args)
    outcomes = list(run(schedule, editions, form, situation))
    # every installed edition by default: the summary, and each beam only behind --details
    details = bool(chosen or args.details)
    _publish(args, schedule, outcomes, lambda report: (
        report.check_report(schedule, outcomes, details), REPORT_WIDTH))
    if args.figures:
        _beam_figures(args.figures, outcomes, args.figure_format)
    return exit_status(outcomes, schedule)


def compare_command(args: argparse.Namespace) -> int:
    if (args.source is None) != (args.target is None):
        raise UsageError("--from and --to go together: compare --from ID --to ID FILE")
    if not 0 <= args.threshold < math.inf:  # NaN too
        raise UsageError(f"--threshold {args.threshold}: expected a finite percentage of 0 "
                         "or more")
    migrating = args.source is not None
    if args.steel:
        if migrating:
            raise UsageError("--steel compares required steel across editions; leave out "
                             "--from/--to")
        return _steel_comparison(args)
    if migrating:
        args.edition = [args.source, args.target]
    schedule, editions, outcomes = _assess(args, lambda s, r: r.ids())
    ids = [e.id for e in editions]
    if migrating:
        _publish(args, schedule, outcomes, lambda report: (
            report.migration_report(schedule, outcomes, args.source, args.target,
                                    args.threshold / 100), REPORT_WIDTH),
            f"from {args.source} to {args.target}")
    else:
        _publish(args, schedule, outcomes, lambda report: (
            report.comparison_report(schedule, outcomes, ids, args.details), REPORT_WIDTH),
            "editions compared")
    if args.figures:
        _comparison_figures(args.figures, outcomes, args.figure_format)
    return exit_status(outcomes, schedule)


def explain_command(args: argparse.Namespace) -> int:
    from clausewise.results import run

    schedule, registry, form, situation = _load(args)
    entries = [e for e in schedule.entries if e.beam.id == args.beam]
    if not entries:
        refused = [p for p in schedule.problems if p.beam == args.beam]
        if refused:
            raise UsageError(f"beam {args.beam!r} was refused: "
                             + "; ".join(p.message for p in refused))
        known = ", ".join(e.beam.id for e in schedule.entries) or "none"
        raise UsageError(f"no beam {args.beam!r} in {args.file} (beams: {known})")
    edition = registry.edition(args.edition)
    beam_only = replace(schedule, entries=tuple(entries[:1]), problems=())
    outcomes = list(run(beam_only, [edition], form, situation))

    _publish(args, beam_only, outcomes,
             lambda report: (report.explain_report(schedule, outcomes[0]), REPORT_WIDTH),
             "audit trail")
    if args.figures:
        _beam_figures(args.figures, outcomes, args.figure_format)
    return exit_status(outcomes, beam_only)


def schema_command(args: argparse.Namespace) -> int:
    import json

    from clausewise import results

    if args.out is not None and args.out.suffix.lower() != ".json":
        raise UsageError(f"--out {args.out}: a JSON Schema is written as .json; give a "
                         "name such as schema.json")
    if args.results:
        schema = results.results_schema()
    else:
        from clausewise.beamfile import json_schema

        schema = json_schema()
    _emit_text(json.dumps(schema, indent=2, ensure_ascii=False) + "\n", args.out)
    return 0


DESIGN_STATUS = """exit status:
  0  every beam has bars under every edition, and they pass every check
  1  some beam has none under some edition (the section must grow, no bars fit, or it
     is outside the edition's scope)
  2  bad input or usage; also when some beams of the file were refused or an edition
     could not design a beam (the others are still designed and reported)
""" + ENVIRONMENT


def _design_parser(commands: Any) -> None:
    design = commands.add_parser(
        "design", help="the steel each edition requires, and bars that fit the web",
        epilog=DESIGN_STATUS, formatter_class=argparse.RawDescriptionHelpFormatter)
    _run_options(design)
    design.add_argument("--edition", action="append", metavar="ID",
                        help="edition to design under (repeatable; default: the file's "
                             "editions, else every installed one)")
    _figure_options(design, "each beam's section with the chosen bars under each edition")
    design.set_defaults(handler=design_command)


def _designs(args: argparse.Namespace, audit: bool, at_given_depth: bool = False
             ) -> tuple[Schedule, list[Any], str]:
    """Every beam of the file designed under the chosen editions (bars may be left out);
    ``at_given_depth``: the required areas at the depth of the file's steel."""
    from clausewise.beamfile import load_schedule
    from clausewise.designs import design_schedule

    _guard_inputs(args)
    if _chosen_format(args) in ("html", "pdf"):
        raise UsageError("design writes text, json, toml or csv (.txt, .json, .toml, .csv); "
                         "the calculation sheet (.html, .pdf) is made by check, compare and "
                         "explain: write the chosen bars into the beam file and run check "
                         "--out calcs.html")
    schedule = load_schedule(args.file, design=True)
    registry, form, situation = _settings(args, schedule)
    editions = _editions(registry, args.edition or list(schedule.project.editions)
                         or registry.ids())
    return schedule, design_schedule(schedule, editions, form, situation, audit=audit,
                                     at_given_depth=at_given_depth), situation


def _publish_designs(args: argparse.Namespace, schedule: Schedule, designs: list[Any],
                     report: Any) -> int:
    from clausewise.designs import design_csv, design_document, design_status

    kind = _chosen_format(args)
    if kind == "text":
        _emit_report(report, width=80, out=args.out)
    else:
        _emit_document(design_document(schedule, designs, _units(args, kind, schedule),
                                       args.digits), kind, args.out, design_csv)
    return design_status(designs, schedule)


def design_command(args: argparse.Namespace) -> int:
    """Design every beam of a file (bars may be left out) under every edition."""
    from clausewise.designs import design_report

    schedule, designs, situation = _designs(args, audit=bool(args.figures))
    status = _publish_designs(args, schedule, designs,
                              design_report(schedule, designs, situation))
    if args.figures:
        _design_figures(args.figures, schedule, designs, args.figure_format)
    return status


def _steel_comparison(args: argparse.Namespace) -> int:
    """compare --steel: the required tension steel of every beam under every edition."""
    from clausewise.designs import steel_comparison_report

    schedule, designs, situation = _designs(args, audit=False, at_given_depth=True)
    return _publish_designs(args, schedule, designs,
                            steel_comparison_report(schedule, designs, situation))


def _design_figures(folder: Path, schedule: Schedule, designs: Sequence[Any],
                    kind: str) -> None:
    from clausewise import figures
    from clausewise.designs import design_figure

    _make_folder(folder)
    beams = {e.beam.id: e.beam for e in schedule.entries}
    written = 0
    for d in designs:
        if d.arrangement is None:
            print(f"{PROGRAM}: no figure for beam {d.beam_id} under {d.edition_id} "
                  f"({d.status})", file=sys.stderr)
            continue
        figures.save(design_figure(d, beams[d.beam_id]),
                     folder / f"{_beam_stem(d.beam_id)}_{_safe(d.edition_id)}_design.{kind}")
        written += 1
    print(f"{PROGRAM}: {written} figure(s) written to {folder}", file=sys.stderr)


# --- entry point ------------------------------------------------------------------------------

def main(argv: Sequence[str] | None = None) -> int:
    """Run one command; user errors become a message on stderr and status 2, never a
    traceback."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version, or a usage error already printed
        return exc.code if isinstance(exc.code, int) else 2
    handlers = _interrupted_by_signals()
    try:
        return int(args.handler(args))
    except (ClausewiseError, OSError, ValueError) as exc:
        print(f"{PROGRAM}: error: {_in_words(exc)}", file=sys.stderr)
        return 2
    except KeyboardInterrupt as exc:
        return 128 + getattr(exc, "signal", 2)  # 130 for Ctrl-C, 143 for SIGTERM
    finally:
        import gc
        import signal

        gc.unfreeze()  # what the command set aside from the collector (the loaded beams)
        for number, handler in handlers.items():
            signal.signal(number, handler)


def _in_words(exc: Exception) -> str:
    """An error as the user reads it: an operating system's names its file, without its
    number ("[Errno 28] ...")."""
    if isinstance(exc, OSError) and not isinstance(exc, ClausewiseError) and exc.strerror:
        return f"{exc.filename}: {exc.strerror}" if exc.filename else exc.strerror
    return str(exc)


class Stopped(KeyboardInterrupt):
    """A termination signal taken as Ctrl-C is: what is written is kept and said."""

    def __init__(self, number: int) -> None:
        super().__init__(f"signal {number}")
        self.signal = number


def _interrupted_by_signals() -> dict[int, Any]:
    """SIGTERM and SIGHUP stop a command the way Ctrl-C does (partial rows kept and named,
    temporary files removed) rather than end it on the spot; the former handlers, to put
    back."""
    import signal
    import threading

    if threading.current_thread() is not threading.main_thread():
        return {}

    def stop(number: int, _frame: Any) -> None:
        raise Stopped(number)

    former = {}
    for name in ("SIGTERM", "SIGHUP"):
        number = getattr(signal, name, None)
        if number is not None:
            former[number] = signal.signal(number, stop)
    return former


if __name__ == "__main__":
    sys.exit(main())
