"""The calculation sheet: one self-contained, printable HTML page per file.

Light, with inline CSS and the figures inline as SVG: no script, no network font, no
file beside it, so the page can be mailed, archived and printed as it is. Per beam
and edition it shows the inputs as given, the effective-width candidates, every
factor with its clause and supplier, the checks and the governing line, in the
edition's own symbols. Print styles keep the text within 180 mm, which fits A4 and
Letter, and start each beam on a new page. ``print_pdf`` prints the page with
headless Chromium where it is installed. Imported only when a sheet is asked for.
"""

from __future__ import annotations

import html
import re
import shutil
import subprocess
import tempfile
from collections.abc import Sequence
from datetime import date
from pathlib import Path
from typing import TYPE_CHECKING

from clausewise.provisions import CAUTION, ClausewiseError
from clausewise.provisions.vocabulary import Check, Envelope, Factor, Sense
from clausewise.report import (
    STATUS_MARK,
    _cell,
    _where,
    away,
    governing_codes,
    same_cylinder,
)
from clausewise.results import Outcome, Units, number, utilisation_text
from clausewise.results.display import in_notation, input_label

if TYPE_CHECKING:
    from clausewise.beamfile import Schedule

PAPERS = ("A4", "Letter")
BROWSERS = ("chromium", "chromium-browser", "google-chrome", "google-chrome-stable")

STYLE = """
:root { color-scheme: light; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, Helvetica, sans-serif;
       font-size: 10pt; color: #111; background: #fff; margin: 0 auto; padding: 12mm;
       max-width: 180mm; line-height: 1.35; }
h1 { font-size: 16pt; margin: 0 0 2mm; }
h2 { font-size: 13pt; margin: 6mm 0 2mm; border-bottom: 1.5pt solid #333; }
h3 { font-size: 11pt; margin: 5mm 0 1.5mm; }
h4 { font-size: 10pt; margin: 3mm 0 1mm; color: #333; }
table { border-collapse: collapse; width: 100%; margin: 1mm 0 2mm; }
th, td { text-align: left; vertical-align: top; padding: 0.6mm 1.5mm;
         border-bottom: 0.5pt solid #ccc; }
th { border-bottom: 1pt solid #555; font-weight: 600; }
td.n { text-align: right; white-space: nowrap; }
.id { white-space: nowrap; }
.facts td:first-child { color: #555; width: 38%; }
.caution { border: 1.5pt solid #b8860b; background: #fff8e1; padding: 2mm 3mm;
           margin: 3mm 0; }
.pass { color: #1b6e20; font-weight: 600; }
.fail { color: #b00020; font-weight: 600; }
.other { color: #7a4f00; font-weight: 600; }
.governing { border-left: 3pt solid #333; padding: 1.5mm 3mm; margin: 2mm 0 4mm;
             font-weight: 600; background: #f4f4f4; }
.dim { color: #666; }
figure { margin: 2mm 0; }
figure svg { width: 100%; height: auto; }
nav ol { columns: 2; column-gap: 8mm; margin: 1mm 0; padding-left: 7mm; }
table.side { font-size: 7.5pt; width: 100%; table-layout: fixed; }
table.side th { font-weight: 600; }
table.side th + th { writing-mode: vertical-rl; transform: rotate(180deg);
                     white-space: nowrap; text-align: left; vertical-align: bottom; }
table.side td, table.side th:first-child { white-space: nowrap; overflow-wrap: normal; }
table.side a { text-decoration: none; }
nav li { break-inside: avoid; }  /* a second column's numbers sit in its own gap */
section.beam { break-before: page; page-break-before: always; }
h1, h2, h3, h4 { break-after: avoid; page-break-after: avoid; }
.facts.pairs td:nth-child(3) { color: #555; }
.facts.pairs td:first-child { width: auto; }
@media print {
  body { padding: 0; }
  a { color: inherit; text-decoration: none; }
  tr, figure, .governing { break-inside: avoid; page-break-inside: avoid; }
}
"""


def _e(text: object) -> str:
    return html.escape(str(text), quote=True)


def _anchor(beam: str, edition: str = "") -> str:
    raw = f"{beam}--{edition}" if edition else beam
    return "b-" + "".join(c if c.isalnum() or c in "-_" else "_" for c in raw)


def _status_class(status: str) -> str:
    return {"pass": "pass", "fail": "fail"}.get(status, "other")


def _table(head: Sequence[str], rows: Sequence[Sequence[str]], numeric: Sequence[int] = (),
           css: str = "") -> str:
    """An HTML table; cells are already escaped."""
    heads = "".join(f"<th>{_e(h)}</th>" for h in head)
    body = "".join("<tr>" + "".join(
        f'<td class="n">{c}</td>' if i in numeric else f"<td>{c}</td>"
        for i, c in enumerate(row)) + "</tr>" for row in rows)
    cls = f' class="{css}"' if css else ""
    thead = f"<thead><tr>{heads}</tr></thead>" if head else ""
    return f"<table{cls}>{thead}<tbody>{body}</tbody></table>"


_NUMBER_THEN_WORD = re.compile(r"(?<=\d) (?=[^\W\d])")


def _kept(text: str) -> str:
    """A number held to the unit or word after it ("595 mm", "4 x 20 mm"), so a narrow
    cell never ends a line between them."""
    return _NUMBER_THEN_WORD.sub("\u00a0", text)


def _facts(pairs: Sequence[tuple[str, str]], columns: int = 1) -> str:
    """Label/value pairs, in ``columns`` side-by-side pairs of columns."""
    items = [(_e(k), _e(_kept(v))) for k, v in pairs if v]
    rows = -(-len(items) // columns)
    cells = [[c for pair in items[i::rows] for c in pair] for i in range(rows)]
    return _table((), [row + [""] * (2 * columns - len(row)) for row in cells],
                  css="facts pairs" if columns > 1 else "facts")


def _clause(ref: str, title: str) -> str:
    return f"{_e(ref)}<br><span class=dim>{_e(title)}</span>"


def _envelope(envelope: Envelope, units: Units) -> str:
    rows = []
    for i, c in enumerate(envelope.candidates):
        governs = i == envelope.governing
        label = ("▶ " if governs else "") + _e(c.label)
        rows.append((f"<b>{label}</b>" if governs else label,
                     _e(units.value(c.value, envelope.unit)),
                     "governs" if governs else _e(away(envelope) + units.value(
                         envelope.excess(c), envelope.unit)),
                     _clause(c.clause.ref, c.clause.title), _edition(c.clause.edition)))
    return _table(("candidate", "value", "from the governing", "clause", "supplied by"),
                  rows, numeric=(1, 2))


def _factors(factors: Sequence[Factor], units: Units) -> str:
    rows = [(_e(f.symbol), _e(units.value(f.value, f.unit)), _e(f.basis),
             _clause(f.clause.ref, f.clause.title), _edition(f.clause.edition)) for f in factors]
    return _table(("symbol", "value", "basis", "clause", "supplied by"), rows, numeric=(1,))


def _checks(checks: Sequence[Check], outcome: Outcome, units: Units, edition: str) -> str:
    rows = []
    for c in checks:
        sign = "≤" if c.sense is Sense.AT_MOST else "≥"
        symbol = f"{in_notation(c.symbol, outcome.notation)} " if c.symbol else ""
        verdict = "pass" if c.passed else "fail"
        rows.append((_e(c.name), _e(symbol + units.value(c.value, c.unit)),
                     _e(f"{sign} {units.value(c.limit, c.unit)}"),
                     _e(utilisation_text(c.utilisation)),
                     f'<span class="{verdict}">{verdict}</span>',
                     _clause(_where(c.clause, edition), c.clause.title)))
    return _table(("check", "value", "limit", "utilisation", "result", "clause"), rows,
                  numeric=(1, 2, 3))


def _figure(outcome: Outcome) -> str:
    """The section above its strains and stresses as inline SVG (text kept as text),
    printed at nearly its own size."""
    a = outcome.assessment
    if a is None or a.response is None or not a.response.equilibrium:
        return ""
    import io

    import matplotlib

    from clausewise import figures

    figure = figures.beam_figure(a, outcome.notation, outcome.entry.bar_groups, stacked=True)
    buffer = io.StringIO()
    with matplotlib.rc_context({"svg.fonttype": "none", "svg.hashsalt": "clausewise"}):
        figure.savefig(buffer, format="svg")
    svg = buffer.getvalue()
    return f"<figure>{svg[svg.index('<svg'):]}</figure>"


def _edition_part(outcome: Outcome, figures: bool) -> str:
    beam = outcome.entry.beam
    a, n = outcome.assessment, outcome.notation
    anchor = _anchor(beam.id, outcome.edition)
    if a is None:
        return (f'<div class="edition" id="{anchor}"><h3>{_e(outcome.edition)}</h3>'
                f'<p class="other">not assessed: {_e(outcome.error)}</p></div>')
    units = Units(beam.unit_system)
    stack = " over ".join(f"{s.id} {s.version} ({s.distribution})" for s in reversed(a.stack))
    parts = [f'<div class="edition" id="{anchor}">',
             f"<h3>{_e(beam.id)} under {_e(a.edition_id)}</h3>",
             _facts([("edition", a.edition_title), ("edition stack", stack),
                     ("form", f"{a.form} ({a.form_basis})"),
                     ("design situation", outcome.situation),
                     ("status", outcome.status)])]
    if len(a.stack) > 1:  # a local edition: which layer answered or wrapped each topic
        parts += ["<h4>who answered each topic</h4>", _table(
            ("topic", "answered by", "wrapped by"),
            [(_e(t.hook), _e(", ".join(t.answered_by) or "no layer"),
              _e(", ".join(t.wrapped_by))) for t in a.topics])]
    renamed = [(input_label(k, n), v) for k, v in outcome.entry.shown.items()
               if input_label(k, n) != k]
    if renamed:
        parts += ["<h4>inputs in this edition's symbols</h4>", _facts(renamed)]
    if a.effective_width is not None:
        parts += [f"<h4>{_e(a.effective_width.name)} ({_e(a.effective_width.bound)} "
                  "governs)</h4>", _envelope(a.effective_width, units)]
    factors = [*a.concrete_factors, *a.steel_factors]
    if a.resistance is not None and a.design_resistance is not None:
        factors.append(a.resistance.factor)
        times = n.nominal if n.nominal != n.resistance else \
            "the section's moment at the design strengths"
        factors.append(Factor(n.resistance, a.design_resistance.value,
                              a.design_resistance.clause,
                              f"{a.resistance.factor.symbol} = "
                              f"{number(a.resistance.factor.value, 4)} times {times}",
                              "N·mm"))
    if factors:
        parts += ["<h4>factors, with clause and supplier</h4>", _factors(factors, units)]
    r = a.response
    if r is not None:
        parts.append(_facts([
            ("compression zone", f"{r.block_case}; depth {units.length(r.zone_depth)}"),
            ("neutral axis", f"{n.neutral_axis} = {units.length(r.c)}"),
            ("net tensile strain", f"{n.strain} = {number(r.net_tensile_strain, 4)}"),
            ("nominal moment", f"{n.nominal} = {units.moment(r.nominal_moment)}"
             if n.nominal != n.resistance else ""),  # partial factors: one moment
            ("design resistance", f"{n.resistance} = {units.moment(a.design_resistance.value)}"
             if a.design_resistance is not None else ""),
            ("regime", a.resistance.regime.name if a.resistance else ""),
            ("design moment", f"{n.demand} = {units.moment(a.demand.value)} "
             f"({a.demand.governing_candidate.label} governs)" if a.demand is not None
             else "none given: capacity only")]))
    if a.demand is not None:
        parts += [f"<h4>{_e(a.demand.name)}</h4>", _envelope(a.demand, units)]
    if figures:
        parts.append(_figure(outcome))
    shown = a.checks if a.checks else a.applicability
    parts += [f"<h4>{'checks' if a.checks else 'scope'}</h4>",
              _checks(shown, outcome, units, a.edition_id),
              _not_checked(a.remarks),
              f'<p class="governing">▶ {_e(beam.id)} under {_e(a.edition_id)}: '
              f"{_unbroken_ids(_e(a.summary()))}</p></div>"]
    return "".join(parts)


def _side_by_side(by_beam: dict[str, list[Outcome]], editions: Sequence[str]) -> str:
    """Beams as rows, editions as columns: utilisation, a status mark and the code of the
    governing check, with the codes spelled out below (the sheet of ``compare``)."""
    outcomes = [o for group in by_beam.values() for o in group]
    codes = governing_codes(outcomes)
    rows = []
    for beam_id, group in by_beam.items():
        by_edition = {o.edition: o for o in group}
        cells = [f'<a href="#{_anchor(beam_id)}">{_e(beam_id)}</a>']
        for edition in editions:
            o = by_edition.get(edition)
            cells.append("—" if o is None else f'<a href="#{_anchor(beam_id, edition)}" '
                         f'class="{_status_class(o.status)}">{_e(_cell(o, codes).plain)}</a>')
        rows.append(cells)
    names = {code: name for (name, _), code in codes.items()}
    legend = "; ".join(f"<i>{_e(code)}</i> {_e(name)}" for code, name in names.items())
    return ("<h2>Editions side by side</h2>"
            + _table(("beam", *editions), rows, numeric=range(1, len(editions) + 1),
                     css="side")
            + "<p class=dim>Each cell: the governing utilisation, the status ("
            + ", ".join(f"{mark} {_e(status)}" for status, mark in STATUS_MARK.items())
            + f"), then the governing check: {legend}.</p>")


def calculation_sheet(schedule: Schedule, outcomes: Sequence[Outcome],
                      what: str = "flexural check", figures: bool = True,
                      paper: str = "") -> str:
    """The whole file as one printable HTML page. ``paper`` ("A4" or "Letter") fixes
    the page size when printing; left empty, the printer's paper is used (the text
    fits both)."""
    from clausewise import __version__

    p = schedule.project
    by_beam: dict[str, list[Outcome]] = {}
    for o in outcomes:
        by_beam.setdefault(o.entry.beam.id, []).append(o)
    editions = list(dict.fromkeys(o.edition for o in outcomes))
    situations = ", ".join(dict.fromkeys(o.situation for o in outcomes)) or "persistent"
    made = f"clausewise {__version__}, {date.today().isoformat()}"
    page_size = _page_rule(paper, f"{p.name or schedule.source}: {what}", made)
    contents = "".join(
        f'<li><a href="#{_anchor(b)}">{_e(b)}</a>: ' + ", ".join(
            f'<a href="#{_anchor(b, o.edition)}">{_edition(o.edition)}</a> '
            f'<span class="{_status_class(o.status)}">{_e(o.status)}</span>'
            for o in group) + "</li>" for b, group in by_beam.items())
    problems = ""
    if schedule.problems:
        problems = "<h2>Beams not assessed: input problems</h2>" + _table(
            ("beam", "field", "given", "expected"),
            [(_e(q.beam or "(file)"), _e(q.field), _e(q.value or "(missing)"),
              _e(q.expected)) for q in schedule.problems])
    side = _side_by_side(by_beam, editions) if len(editions) > 1 else ""
    sections = []
    for beam_id, group in by_beam.items():
        beam = group[0].entry.beam
        title = f"{beam.id}" + (f" · {beam.title}" if beam.title else "")
        sections.append(
            f'<section class="beam" id="{_anchor(beam_id)}"><h2>{_e(title)}</h2>'
            "<h4>inputs as given</h4>" + _facts(list(group[0].entry.shown.items()), 2)
            + "".join(_edition_part(o, figures) for o in group) + "</section>")
    where = ", ".join(x for x in (p.building, p.town) if x)
    head = _facts([("project", p.name), ("building", where), ("engineer", p.engineer),
                   ("file", str(schedule.source)), ("notes", p.notes),
                   ("design situation", situations), ("editions", ", ".join(editions)),
                   ("made by", made)])
    return (
        "<!DOCTYPE html>\n<html lang=en><head><meta charset=utf-8>"
        f"<title>{_e(p.name or schedule.source)}: {_e(what)}</title>"
        f"<style>{page_size}{STYLE}</style></head><body>"
        f"<header><h1>{_e(p.name or 'Calculation sheet')}</h1>"
        f"<p class=dim>{_e(what)}: calculation sheet</p>{head}"
        f'<div class="caution"><b>Caution.</b> {_e(CAUTION)}</div>'
        f"<p class=dim>{_e(same_cylinder(outcomes))}</p></header>"
        f"<nav><h2>Contents</h2><ol>{contents}</ol></nav>{side}{problems}"
        + "".join(sections)
        + f'<footer><div class="caution"><b>Caution.</b> {_e(CAUTION)}</div></footer>'
        "</body></html>\n")


def _css_text(text: str) -> str:
    """``text`` as a CSS string: anything but plain letters, digits and punctuation is
    escaped by its code point, so no name in a file can end the string or the style."""
    plain = set(" .,:;-_()/'+&@#!?")
    return '"' + "".join(c if (c.isalnum() and c.isascii()) or c in plain
                         else f"\\{ord(c):x} " for c in text) + '"'


def _page_rule(paper: str, title: str, made: str) -> str:
    """The printed page: its size (the printer's where ``paper`` is empty), and on every
    page the sheet's title and maker at the head, the caution and the page number at the
    foot, so a page taken out of the bundle still says what it is and how to read it."""
    size = f"size: {paper}; " if paper else ""
    small = "font-family: 'DejaVu Sans', Arial, sans-serif; font-size: 7.5pt; color: #444;"
    return (f"@page {{ {size}margin: 16mm 15mm 18mm; "
            f"@top-left {{ content: {_css_text(title)}; {small} }} "
            f"@top-right {{ content: {_css_text(made)}; {small} }} "
            f"@bottom-left {{ content: {_css_text(CAUTION)}; {small} width: 75%; }} "
            f'@bottom-right {{ content: "page " counter(page) " of " counter(pages); {small} }} }}')


class BrowserMissing(ClausewiseError, RuntimeError):
    """No headless Chromium to print the sheet with."""


def find_browser() -> str | None:
    """The path of an installed Chromium, or None."""
    return next((path for name in BROWSERS if (path := shutil.which(name))), None)


def _headless(browser: str, page: Path, *flags: str, timeout: float = 120) -> None:
    command = [browser, "--headless", "--no-sandbox", "--disable-gpu",
               "--disable-dev-shm-usage", "--no-first-run", "--hide-scrollbars",
               f"--user-data-dir={page.parent / 'profile'}", *flags, page.as_uri()]
    done = subprocess.run(command, capture_output=True, text=True, timeout=timeout,
                          check=False)
    if done.returncode != 0:
        raise ClausewiseError(f"headless Chromium failed (status {done.returncode}): "
                              f"{done.stderr.strip()[-500:]}")


def _browser() -> str:
    browser = find_browser()
    if browser is None:
        raise BrowserMissing("printing the sheet to PDF needs headless Chromium, which is not "
                             "installed (apt-get install chromium); write --out FILE.html "
                             "and print it from a browser instead")
    return browser


def print_pdf(page: str) -> bytes:
    """The sheet printed to PDF by headless Chromium (no header or footer lines)."""
    browser = _browser()
    with tempfile.TemporaryDirectory(prefix="clausewise-sheet-") as folder:
        source = Path(folder) / "sheet.html"
        source.write_text(page, encoding="utf-8")
        target = Path(folder) / "sheet.pdf"
        _headless(browser, source, f"--print-to-pdf={target}", "--no-pdf-header-footer")
        if not target.is_file() or target.stat().st_size == 0:
            raise ClausewiseError("headless Chromium wrote no PDF")
        return target.read_bytes()


def screenshot(page: str, size: tuple[int, int] = (1000, 1400)) -> bytes:
    """A PNG of the sheet's first screen at ``size`` pixels (for checking its look)."""
    browser = _browser()
    with tempfile.TemporaryDirectory(prefix="clausewise-sheet-") as folder:
        source = Path(folder) / "sheet.html"
        source.write_text(page, encoding="utf-8")
        target = Path(folder) / "sheet.png"
        _headless(browser, source, f"--screenshot={target}",
                  f"--window-size={size[0]},{size[1]}")
        return target.read_bytes()


def _not_checked(remarks: Sequence[str]) -> str:
    """What this edition's assessment did not check, as the console report notes it: a
    checker reading only the sheet must see it too."""
    if not remarks:
        return ""
    return "<h4>not checked</h4><ul>" + "".join(f"<li>{_e(r)}</li>" for r in remarks) + "</ul>"


_EDITION_REF = re.compile(r"\(([^()\s]+) ([^()]+)\)")


def _unbroken_ids(text: str) -> str:
    """Keep a cited "(edition clause)" on one line, so a printed sheet never splits an
    edition id such as aci318-19 at its hyphen."""
    return _EDITION_REF.sub(r'<span class="id">(\1 \2)</span>', text)


def _edition(edition_id: str) -> str:
    """An edition id in a table cell, never split at its hyphens when the cell is narrow."""
    return f'<span class="id">{_e(edition_id)}</span>'
