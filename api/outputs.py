"""What may be written where: output formats by file extension, outputs that would
replace an input, and batch rows that replace a good file only once complete.

Nothing is lost: an output path that is (or links to) a beam file or a parameter
file is refused before anything is computed; the extension decides the format, and
an option that contradicts it is refused rather than guessed; a batch writes its rows
to ``<name>.partial<ext>`` beside the target and renames it over the target only when
the run completes, so an interrupted or failed run keeps the old file and leaves the
rows it had under a name that says they are partial. Every file written is confirmed
by one line on stderr.
"""

from __future__ import annotations

import os
import sys
from collections.abc import Iterable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import TextIO

from clausewise.provisions import ClausewiseError

PROGRAM = "clausewise"


class OutputError(ClausewiseError, ValueError):
    """An output path that cannot be used: unknown extension, a contradicting format, or
    a file that is one of the run's inputs."""


@dataclass(frozen=True)
class OutputFormat:
    """One output format: the ``--format`` word that asks for it, the extensions that
    name it, and what it holds (a results ``document``, a ``report`` for people, or batch
    ``rows``)."""

    asked_as: str
    suffixes: tuple[str, ...]
    holds: str
    description: str


# One row per format; a new format is one more row here.
FORMATS: dict[str, OutputFormat] = {
    "json": OutputFormat("json", (".json",), "document", "JSON results"),
    "toml": OutputFormat("toml", (".toml",), "document", "TOML results"),
    "csv": OutputFormat("csv", (".csv",), "document", "CSV results, one row per beam and "
                        "edition"),
    "text": OutputFormat("text", (".txt",), "report", "the report as plain text"),
    "html": OutputFormat("html", (".html", ".htm"), "sheet", "the calculation sheet, a "
                         "printable web page"),
    "pdf": OutputFormat("pdf", (".pdf",), "sheet", "the calculation sheet printed to PDF "
                        "(headless Chromium)"),
    "csv rows": OutputFormat("csv", (".csv",), "rows", "batch rows as CSV"),
    "jsonl rows": OutputFormat("jsonl", (".jsonl", ".ndjson"), "rows",
                               "batch rows as JSON Lines"),
}


def _known(holds: Iterable[str]) -> dict[str, tuple[str, OutputFormat]]:
    wanted = set(holds)
    return {suffix: (name, f) for name, f in FORMATS.items() if f.holds in wanted
            for suffix in f.suffixes}


def format_for(out: Path | None, asked: str | None,
               holds: Iterable[str] = ("document", "report", "sheet")) -> str:
    """The name of the format to write (a key of :data:`FORMATS`; ``"text"`` for a
    report on the screen) from ``--out`` and ``--format``.

    The extension decides; an unknown extension, or an ``asked`` format the extension
    contradicts, is an :class:`OutputError` listing what is known.
    """
    known = _known(holds)
    if out is None:
        if asked is None or asked == "text":
            return "text"
        for name, f in FORMATS.items():
            if f.asked_as == asked and f.holds in ("document", "sheet", "rows"):
                return name
        return asked
    suffix = out.suffix.lower()
    if suffix not in known:
        listed = ", ".join(f"{s} ({f.description})" for s, (_, f) in known.items())
        raise OutputError(f"--out {out}: unknown extension {suffix or '(none)'!r}; the "
                          f"extension decides the format, known: {listed}")
    name, chosen = known[suffix]
    if asked is not None and asked != chosen.asked_as:
        raise OutputError(f"--format {asked} contradicts --out {out}, whose extension "
                          f"{suffix} means {chosen.description}; give a matching name or "
                          "leave out --format")
    return name


def rows_kind(out: Path) -> str:
    """``csv`` or ``jsonl``: how the batch rows named by ``out`` are written."""
    return FORMATS[format_for(out, None, holds=("rows",))].asked_as


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.resolve() == b.resolve():
            return True
        return a.exists() and b.exists() and os.path.samefile(a, b)
    except OSError:
        return False


def refuse_inputs(out: Path | None, inputs: Iterable[Path]) -> None:
    """Refuse an output that resolves (also through a link) to one of the inputs, or
    whose partial-rows name would."""
    if out is None:
        return
    for source in inputs:
        for target in (out, partial_name(out)):
            if _same_file(target, source):
                raise OutputError(f"--out {out} would overwrite the input file {source}; "
                                  "choose another name for the results")


def refuse_unwritable(out: Path | None, figures: Path | None) -> None:
    """Refuse, before anything is computed, an --out whose folder does not exist or that
    is a folder, and a --figures that names a file: said in the user's words, not as an
    operating-system error naming a temporary file."""
    if out is not None:
        if out.is_dir():
            raise OutputError(f"--out {out}: is a folder; give a file name such as "
                              f"{out / 'results.json'}")
        folder = out.parent
        if not folder.is_dir():
            raise OutputError(f"--out {out}: the folder {folder} does not exist; create it "
                              "or choose another place for the results")
    if figures is not None and figures.exists() and not figures.is_dir():
        raise OutputError(f"--figures {figures}: is a file, not a folder; the figures go "
                          "into a folder (it is created if missing)")


def confirm(path: Path, what: str = "results") -> None:
    """The one-line confirmation of a file written."""
    print(f"{PROGRAM}: wrote {what} to {path}", file=sys.stderr)


def partial_name(target: Path) -> Path:
    """Where the rows of a batch live until the run completes: ``rows.partial.csv``."""
    return target.with_name(f"{target.stem}.partial{target.suffix}")


@contextmanager
def rows_file(target: Path) -> Iterator[TextIO]:
    """A handle for batch rows: written beside ``target`` under the partial name, and
    renamed over ``target`` only when the block completes. When it does not, the old
    ``target`` is untouched, the partial rows stay, and stderr says where. A link is
    written through (the file it points to is replaced). The partial file is locked while
    it is written and renamed, so a second run to the same target is refused rather than
    mixing its rows into the first's."""
    target = Path(os.path.realpath(target))
    partial = partial_name(target)
    handle = _locked(partial, target)
    replaced = False
    try:
        with handle:
            yield handle
            handle.flush()
            os.replace(partial, target)  # still locked: no other run takes the name between
            replaced = True
    except BaseException:
        if replaced:  # stopped after the rows were complete and in place
            raise
        kept = "left as it was" if target.exists() else "not written"
        print(f"{PROGRAM}: the run did not complete; {target} {kept}; the rows written so "
              f"far are in {partial}", file=sys.stderr)
        raise
    confirm(target, "rows")


def _locked(partial: Path, target: Path) -> TextIO:
    """The partial file opened empty for writing, under an exclusive lock (where the
    system has them): refused when another run holds it."""
    try:
        import fcntl
    except ImportError:  # no advisory locks here: the partial file as it is
        return partial.open("w", encoding="utf-8", newline="")
    for _ in range(5):
        try:
            fd = os.open(partial, os.O_RDWR | os.O_CREAT, 0o666)
        except OSError as exc:
            raise OutputError(f"--out {target}: cannot write {partial}: "
                              f"{exc.strerror or exc}") from None
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            os.close(fd)
            raise OutputError(f"--out {target}: another run is writing its rows to {partial} "
                              "now; wait for it to finish or give another name") from None
        try:  # the name may have been renamed over the target since it was opened
            same = os.fstat(fd).st_ino == os.stat(partial).st_ino
        except FileNotFoundError:
            same = False
        if same:
            os.ftruncate(fd, 0)
            return os.fdopen(fd, "w", encoding="utf-8", newline="")
        os.close(fd)
    raise OutputError(f"--out {target}: {partial} keeps changing under another run; give "
                      "another name")
