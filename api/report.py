"""The engineer's report (text): a check per beam and edition, a comparison, an audit.

Quantities follow each beam's unit system: kN·m, mm, MPa for SI beams; kip·ft,
in, psi (ksi above 100 000 psi) for US customary beams. Symbols follow each
edition's own notation (``EditionInfo.notation``). Every report states the design
situation in its header, puts the summary before the details, and ends with the
caution. Tables that could outgrow a narrow terminal lay themselves out for the
width they get, so the verdict and the clause are never the columns dropped.
Imported only by the commands that print a report.
"""

from __future__ import annotations

import itertools
import math
import re
from collections import Counter
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from rich import box
from rich.cells import cell_len
from rich.console import Console, ConsoleOptions, Group, RenderableType, RenderResult
from rich.measure import Measurement
from rich.rule import Rule
from rich.table import Table
from rich.text import Text

from clausewise.provisions import Notation
from clausewise.provisions.engine import CAUTION, FAIL, PASS, Assessment
from clausewise.provisions.hookspecs import HOOKS, TOPICS
from clausewise.provisions.registry import TopicAnswer
from clausewise.provisions.verdicts import CAPACITY_ONLY, ERROR, Status
from clausewise.provisions.vocabulary import Bound, Check, Clause, Envelope, Factor, Sense
from clausewise.provisions.widths import OverhangEnvelope
from clausewise.results import Outcome, Units, convert, number, utilisation_text
from clausewise.results.display import in_notation, input_label

if TYPE_CHECKING:
    from pathlib import Path

    from clausewise.beamfile import InputProblem, Schedule
    from clausewise.provisions.registry import Edition, PluginRecord, Registry
    from clausewise.stream import Summary as BatchSummary

STATUS_STYLE: dict[str, str] = {PASS: "bold green", FAIL: "bold red", ERROR: "bold magenta",
                                 CAPACITY_ONLY: "bold cyan"}
# one character per status in the comparison's cells (the legend spells them out)
STATUS_MARK: dict[str, str] = {PASS: "✓", FAIL: "✗", Status.OUT_OF_SCOPE: "⊘",
                               Status.NO_EQUILIBRIUM: "?", ERROR: "!", CAPACITY_ONLY: "○"}
# short codes of the governing check, by words of its name (first match wins)
CHECK_CODES = (("flexural strength", "M"), ("minimum strength", "Mmin"),
               ("minimum", "min"), ("maximum", "max"), ("steel ratio", "ρ"),
               ("net tensile strain", "εt"), ("neutral-axis", "x/d"), ("bars fit", "fit"),
               ("between", "gap"), ("crack control", "crack"))
SCOPE_CODE = "scope"
NARROW = 100  # below this many columns, tables take their compact layout


def _units(outcome: Outcome) -> Units:
    return Units(outcome.entry.beam.unit_system)


def _status(status: str) -> Text:
    return Text(status, style=STATUS_STYLE.get(status, "bold yellow"))


def _where(clause: Clause, edition: str = "") -> str:
    """A clause reference, with its supplier unless that is ``edition`` itself."""
    return f"{clause.edition} {clause.ref}" if clause.edition not in ("", edition) \
        else clause.ref


def check_code(check: Check, in_scope: bool = True) -> str:
    """A short code for a check (a scope check is ``scope``)."""
    if not in_scope:
        return SCOPE_CODE
    name = check.name.lower()
    return next((code for words, code in CHECK_CODES if words in name),
                "".join(w[0] for w in name.split())[:3])


def utilisation_bar(u: float, width: int = 10) -> Text:
    """The utilisation as a number and a bar that fills at 1.0."""
    if not math.isfinite(u):
        return Text("  ∞   " + "▮" * width, style="red")
    style = "red" if u > 1 + 1e-12 else "yellow" if u > 0.9 else "green"
    filled = min(width, round(u * width))
    bar = Text(f"{u:5.3f} ")
    bar.append("▮" * filled, style=style)
    bar.append("·" * (width - filled), style="dim")
    return bar


def caution() -> Text:
    text = Text("CAUTION: ", style="bold yellow")
    text.append(CAUTION)
    return text


def _row(table: Table, *cells: RenderableType) -> None:
    """Add a row whose plain-string cells are taken as text, never as markup."""
    table.add_row(*(Text(c) if isinstance(c, str) else c for c in cells))


# a space after a number (or a limit's sign) that a unit, symbol or further digits follow,
# or inside a count of bars ("271.2 kN·m", "0.85 l", "≤ 20 018 mm²", "5 x 12 mm"): a
# line is never broken there
_NUMBER_SPACE = re.compile(r"(?<=[\d≤≥]) (?=[^\s=≤≥<>+×(),;:\[])|(?<= [x×]) (?=\d)")
_CITED = re.compile(r"[\[(][^\s\[\]()]+( )[^\s\[\]()]+[\])]")  # "[en1992-1-1:2004 6.1]"


class NumbersKept:
    """Text that wraps at its spaces except after a number, so a number stays on the line
    of its unit or symbol: "271.2 kN·m", never "271.2 / kN·m" (rich breaks at every
    space, a no-break space included); a cited "[edition clause]" stays whole too."""

    def __init__(self, text: Text | str) -> None:
        self.text = Text(text) if isinstance(text, str) else text

    @staticmethod
    def _breaks(plain: str) -> list[int]:
        kept = {m.start() for m in _NUMBER_SPACE.finditer(plain)} | {
            m.start(1) for m in _CITED.finditer(plain)}
        return [i for i, ch in enumerate(plain) if ch == " " and i not in kept]

    @classmethod
    def words(cls, plain: str) -> list[str]:
        """The pieces a line may break between: words, a number with its unit as one."""
        return [piece for line in plain.splitlines() for a, b in
                itertools.pairwise([-1, *cls._breaks(line), len(line)])
                if (piece := line[a + 1:b].strip())]

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        lines = self.text.plain.splitlines() or [""]
        longest = max(map(cell_len, self.words(self.text.plain)), default=0)
        widest = max(cell_len(line) for line in lines)
        return Measurement(min(longest, options.max_width), min(widest, options.max_width))

    @classmethod
    def _wrapped(cls, line: Text, width: int) -> list[Text]:
        """One line broken greedily at the last allowed space that fits; a word wider
        than the line stands alone (and folds)."""
        plain = line.plain
        cuts: list[int] = []
        start, last = 0, None
        for i in [*cls._breaks(plain), len(plain)]:
            if cell_len(plain[start:i]) <= width:
                last = i
                continue
            if last is not None:
                cuts.append(last)
                start = last + 1
                if cell_len(plain[start:i]) <= width:
                    last = i
                    continue
            if i < len(plain):
                cuts.append(i)
                start = i + 1
            last = None
        pieces = line.divide(c for cut in cuts for c in (cut, cut + 1))
        return list(pieces)[::2]  # every other piece is the space broken at

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        lines = [part for line in self.text.split("\n", allow_blank=True)
                 for part in self._wrapped(line, options.max_width)]
        yield Text("\n", justify=options.justify, overflow="fold").join(lines)


def two_lines(main: str, sub: str) -> Text:
    """A cell with a plain first line and a dim second one (never read as markup)."""
    text = Text(main)
    if sub:
        text.append("\n" + sub, style="dim")
    return text


def _facts() -> Table:
    """Two borderless columns: a dim label and its value (the value wraps)."""
    table = Table.grid(padding=(0, 2))
    table.add_column(style="dim", no_wrap=True)
    table.add_column(ratio=1, overflow="fold")
    return table


def _fact(table: Table, label: str, value: str | Text) -> None:
    """A row of a :func:`_facts` table; its value keeps each number with its unit."""
    table.add_row(Text(label), NumbersKept(value))


def _sign(sense: Sense) -> str:
    return "≤" if sense is Sense.AT_MOST else "≥"


@dataclass(frozen=True)
class ByWidth:
    """A renderable built for the width it is given (a narrow terminal gets the compact
    layout instead of a table rich would have to crop)."""

    build: Callable[[int], RenderableType]

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        yield self.build(options.max_width)


def _heading(text: str) -> Text:
    return Text(text, style="bold")


# --- one beam under one edition ------------------------------------------------------------

def _inputs_table(outcome: Outcome, pairs: int = 1) -> RenderableType:
    """The inputs as written, in ``pairs`` side-by-side label/value columns where the
    width allows (one pair on a narrow terminal)."""
    items = [(input_label(k, outcome.notation), v) for k, v in outcome.entry.shown.items()]

    def build(width: int) -> Table:
        n = pairs if width >= NARROW else 1
        rows = -(-len(items) // n)
        table = Table(box=None, show_header=False, pad_edge=False, padding=(0, 2, 0, 0))
        for _ in range(n):
            table.add_column(style="dim", no_wrap=True)
            table.add_column(ratio=1, overflow="fold")
        for i in range(rows):
            cells = [cell for label, value in items[i::rows]
                     for cell in (Text(label), NumbersKept(value))]
            table.add_row(*cells, *[""] * (2 * n - len(cells)))
        return table

    return ByWidth(build)


def _findings_table(outcome: Outcome, a: Assessment, units: Units) -> Table:
    n = outcome.notation
    table = _facts()
    used = a.concrete_factors[0] if a.concrete_factors else None
    if used is not None and used.unit == "MPa" and not math.isclose(
            float(used.value), float(a.beam.concrete_strength), rel_tol=1e-9):
        # given on the other basis (cube for cylinder, or the other way round): the
        # strength the edition works with, and how it was found, stated with the results
        _fact(table, "concrete strength used",
              f"{used.symbol} = {units.value(used.value, 'MPa')}, {used.basis}")
    if a.effective_width is not None:
        e = a.effective_width
        g = e.governing_candidate
        _fact(table, "effective flange width",
             f"{e.symbol} = {units.length(e.value)}, from {g.label} "
             f"[{_where(g.clause, a.edition_id)}]")
    r = a.response
    if r is not None:
        _fact(table, "compression zone", f"{r.block_case}; depth {units.length(r.zone_depth)}")
        _fact(table, "neutral axis", f"{n.neutral_axis} = {units.length(r.c)}, "
             f"{n.neutral_axis}/d = {number(r.c_over_d, 3)}")
        _fact(table, "net tensile strain", f"{n.strain} = {number(r.net_tensile_strain, 3)}")
    if a.resistance is not None:
        f, regime = a.resistance.factor, a.resistance.regime
        _fact(table, "regime", f"{regime.name} [{_where(regime.clause, a.edition_id)}]")
        _fact(table, "resistance factor", f"{f.symbol} = {number(f.value, 3)}")
    if r is not None and n.nominal != n.resistance:
        _fact(table, "nominal moment", f"{n.nominal} = {units.moment(r.nominal_moment)}")
    if a.design_resistance is not None:
        _fact(table, "design resistance",
             Text(f"{n.resistance} = {units.moment(a.design_resistance.value)}",
                  style="bold"))
    if a.demand is not None:
        _fact(table, "design moment",
             Text(f"{n.demand} = {units.moment(a.demand.value)} "
                  f"({a.demand.governing_candidate.label} governs)", style="bold"))
    else:
        _fact(table, "design moment", Text(f"none given: {CAPACITY_ONLY}", style="cyan"))
    return table


def checks_table(checks: Sequence[Check], units: Units, edition: str, title: str = "checks",
                 notes: bool = False, notation: Notation | None = None) -> RenderableType:
    """Each check with its value, limit, utilisation, verdict and clause (its supplier
    named when not ``edition``); with ``notes`` the checks' notes follow as footnotes.
    On a narrow terminal the utilisation loses its bar and the clause its title, never
    the verdict or the clause reference."""
    n = notation or Notation()
    footnotes = Text(style="dim")
    names: list[Text] = []
    for c in checks:
        name = Text(c.name)
        if notes and c.note:
            marker = len(footnotes.plain.splitlines()) + 1
            name.append(f" [{marker}]", style="dim")
            footnotes.append(f"[{marker}] {c.name}: {c.note}\n")
        names.append(name)
    footnotes.rstrip()
    longest_word = max((len(w) for name in names for w in name.plain.split()), default=5)
    # a number stays on the line of its unit: "1257 mm²", never "1257 / mm²"
    value_width = max((len(units.value(c.value, c.unit)) for c in checks), default=5)
    limit_width = max((len(f"{_sign(c.sense)} {units.value(c.limit, c.unit)}") for c in checks),
                      default=5)

    clause_width = max((len(line) for c in checks
                        for line in _narrow_clause(c.clause, edition).plain.splitlines()),
                       default=6)

    def build(width: int) -> RenderableType:
        narrow = width < NARROW
        # narrow: one space between columns, which rich otherwise takes from the clause
        # column by cutting its end ("en1992-1-1:200")
        table = Table(title=title or None, title_justify="left", title_style="bold",
                      box=box.SIMPLE_HEAD, pad_edge=False, expand=narrow,
                      collapse_padding=narrow)
        table.add_column("check", ratio=None if narrow else 3, overflow="fold",
                         min_width=longest_word)
        table.add_column("value", justify="right", overflow="fold", min_width=value_width)
        table.add_column("limit", justify="right", overflow="fold", min_width=limit_width)
        table.add_column("utilisation" if not narrow else "util.", no_wrap=True)
        table.add_column("result", no_wrap=True)
        table.add_column("clause", no_wrap=narrow, overflow="fold",  # never split or cut
                         min_width=clause_width if narrow else 18)
        for c, name in zip(checks, names, strict=True):
            symbol = f"{in_notation(c.symbol, n)} " if c.symbol else ""
            utilisation = (Text(utilisation_text(c.utilisation)) if narrow
                           else utilisation_bar(c.utilisation))
            clause = _where(c.clause, edition)
            _row(table, name, NumbersKept(f"{symbol}{units.value(c.value, c.unit)}"),
                 NumbersKept(f"{_sign(c.sense)} {units.value(c.limit, c.unit)}"),
                 utilisation, _status(PASS if c.passed else FAIL),
                 _narrow_clause(c.clause, edition) if narrow
                 else two_lines(clause, c.clause.title))
        return Group(table, footnotes) if footnotes else table

    return ByWidth(build)


def _narrow_clause(clause: Clause, edition: str) -> Text:
    """On a narrow screen a clause kept whole on its line: the reference, and under it the
    supplier where that is not the edition reported (a local edition's base), since the
    two on one line were cut ("en1992-1-1:2004 9." for 9.2.1.1(1))."""
    text = Text(clause.ref)
    if clause.edition not in ("", edition):
        text.append(f"\n{clause.edition}", style="dim")
    return text


def _verdict(outcome: Outcome) -> Text:
    a = outcome.assessment
    assert a is not None
    status = outcome.status
    text = Text("▶ ", style=STATUS_STYLE.get(status, "bold yellow"))
    text.append(f"{outcome.entry.beam.id} under {a.edition_id}: ", style="bold")
    text.append(a.summary(), style="bold")
    return text


def _stack_line(a: Assessment) -> str:
    return " over ".join(f"{s.id} {s.version} ({s.distribution})" for s in reversed(a.stack))


def _upper_layers_line(a: Assessment) -> str:
    """The topics that a layer above the base answered or wrapped in this assessment."""
    base = a.stack[0].id if a.stack else ""
    said = [f"{', '.join(t.wrapped_by)} wrapped {t.hook}" if t.wrapped_by else
            f"{', '.join(t.answered_by)} answered {t.hook}"
            for t in a.topics if t.hook not in ("edition_info", "edition_parameters")
            and (t.wrapped_by or any(layer != base for layer in t.answered_by))]
    return "; ".join(said)


def _beam_title(outcome: Outcome) -> str:
    beam = outcome.entry.beam
    name = f"{beam.id}" + (f" · {beam.title}" if beam.title else "")
    a = outcome.assessment
    if a is None:
        return f"{name} · {outcome.edition} ({outcome.situation})"
    return f"{name} · {a.edition_id} ({a.form} form, {outcome.situation})"


def beam_panel(outcome: Outcome) -> Group:
    """One beam under one edition: its heading (edition, form, design situation), the
    inputs, the findings, the checks and what governs."""
    a = outcome.assessment
    heading = Group(Text(""), Rule(style=STATUS_STYLE.get(outcome.status, "yellow")),
                    Text(_beam_title(outcome), style="bold"))
    if a is None:
        return Group(heading, Text(f"not assessed: {outcome.error}", style="magenta"))
    units = _units(outcome)
    parts: list[RenderableType] = [
        heading, Text(f"edition stack: {_stack_line(a)}", style="dim"),
        _heading("inputs"), _inputs_table(outcome, pairs=2),
        _heading("\nsection and strength"), _findings_table(outcome, a, units)]
    if a.checks or a.status != PASS:
        shown = a.checks if a.checks else a.applicability
        parts += [Text(""), checks_table(shown, units, a.edition_id,
                                         "checks" if a.checks else "scope",
                                         notation=outcome.notation)]
    parts += [Text(f"note: {remark}", style="dim") for remark in a.remarks]
    parts.append(NumbersKept(_verdict(outcome)))
    upper = _upper_layers_line(a)
    if upper:
        parts.append(Text(upper, style="dim"))
    return Group(*parts)


def _governing(outcome: Outcome) -> tuple[Check | None, bool]:
    """The governing check and whether it is one of the checks proper (not scope)."""
    a = outcome.assessment
    if a is None:
        return None, True
    check = a.governing
    return check, check is not None and check in a.checks


def summary_table(outcomes: Sequence[Outcome]) -> RenderableType:
    """One line per beam and edition: status, utilisation and governing check."""
    def build(width: int) -> Table:
        table = Table(title="summary", title_justify="left", title_style="bold",
                      box=box.SIMPLE_HEAD, pad_edge=False)
        table.add_column("beam", no_wrap=True)
        table.add_column("edition", no_wrap=True)
        table.add_column("status", no_wrap=True)
        table.add_column("util.", justify="right", no_wrap=True)
        table.add_column("governing check", ratio=1, overflow="fold")
        for o in outcomes:
            check, _ = _governing(o)
            a = o.assessment
            governing: RenderableType = Text(o.error, style="magenta")
            if check is not None and a is not None:
                governing = NumbersKept(f"{check.name} [{_where(check.clause, o.edition)}]")
            _row(table, o.entry.beam.id, o.edition, _status(o.status),
                 utilisation_text(check.utilisation) if check else "", governing)
        return table

    return ByWidth(build)


def problems_table(problems: Sequence[InputProblem]) -> Table:
    table = Table(title="beams not assessed: input problems (all of them, found in one "
                  "reading)", title_justify="left", title_style="bold magenta",
                  box=box.SIMPLE_HEAD, pad_edge=False)
    table.add_column("beam", no_wrap=True)
    table.add_column("field", overflow="fold")
    table.add_column("given", overflow="fold")
    table.add_column("expected", ratio=1, overflow="fold")
    for p in problems:
        _row(table, p.beam or "(file)", p.field, p.value or "(missing)", p.expected)
    return table


def header(schedule: Schedule, what: str, situation: str | None = None,
           editions: Sequence[str] = ()) -> Group:
    """The report's head: what it is, the project, the file, the design situation and
    the editions."""
    p = schedule.project
    where = ", ".join(x for x in (p.building, p.town) if x)
    facts = _facts()
    for label, value in (("project", p.name), ("building", where), ("engineer", p.engineer),
                         ("file", str(schedule.source)), ("notes", p.notes),
                         ("design situation", situation or ""),
                         ("editions", ", ".join(editions))):
        if value:
            _fact(facts, label, value)
    return Group(Rule(Text(f"clausewise · {what}"), align="left", style="bold"), facts)


def _situation(outcomes: Sequence[Outcome]) -> str:
    return ", ".join(dict.fromkeys(o.situation for o in outcomes)) or "persistent"


def check_report(schedule: Schedule, outcomes: Sequence[Outcome],
                 details: bool | Iterable[str] = True) -> Group:
    """The input problems and the summary first, then each beam's report (``details``:
    all, none, or only those of the editions named), then the caution."""
    editions = list(dict.fromkeys(o.edition for o in outcomes))
    parts: list[RenderableType] = [header(schedule, "flexural check", _situation(outcomes),
                                          editions)]
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    if not outcomes:
        parts += [Text("No beam could be checked: every beam of the file has an input "
                       "problem (above).", style="bold red"), caution()]
        return Group(*parts)
    shown = editions if details is True else [] if details is False else list(details)
    if len(editions) > 1 and not shown:  # the summary at a glance: a line per beam
        parts.append(comparison_table(outcomes, editions))
    elif len(outcomes) > 1:
        parts.append(summary_table(outcomes))
    parts += [beam_panel(o) for o in outcomes if o.edition in shown]
    if not shown:
        parts.append(Text("Each beam's full report: give --edition ID, or --details for "
                          "every edition.", style="dim"))
    elif len(shown) < len(editions):
        parts.append(Text(f"Each beam's full report is shown for {', '.join(shown)}; "
                          "--details shows it for every edition.", style="dim"))
    if len(outcomes) > 1 and shown:
        parts.append(status_counts(outcomes, editions))
    parts.append(caution())
    return Group(*parts)


def status_counts(outcomes: Sequence[Outcome], editions: Sequence[str]) -> RenderableType:
    """Beams by status, one line per edition."""
    counts = {e: Counter(o.status for o in outcomes if o.edition == e) for e in editions}
    statuses = [s for s in STATUS_MARK if any(c[s] for c in counts.values())]
    table = Table(title="beams by status, per edition", title_justify="left",
                  title_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
    table.add_column("edition", no_wrap=True)
    for s in statuses:
        table.add_column(s, justify="right")
    for e, tally in counts.items():
        _row(table, e, *(str(tally[s]) if tally[s] else "·" for s in statuses))
    return table


# --- editions side by side -------------------------------------------------------------------

def governing_codes(outcomes: Sequence[Outcome | None]) -> dict[tuple[str, bool], str]:
    """The code of each governing check (by name, and whether it is a scope check) among
    ``outcomes``, distinct: two checks whose names give the same code ("bars in tension
    layer 1" and "... layer 2") are told apart by a number (``bit``, ``bit2``)."""
    codes: dict[tuple[str, bool], str] = {}
    taken: set[str] = set()
    for o in outcomes:
        check, proper = _governing(o) if o is not None else (None, True)
        if check is None or (check.name, proper) in codes:
            continue
        base = code = check_code(check, proper)
        number = 1
        while code in taken:
            number += 1
            code = f"{base}{number}"
        taken.add(code)
        codes[check.name, proper] = code
    return codes


def _cell(outcome: Outcome | None, codes: dict[tuple[str, bool], str],
          percent: bool = False) -> Text:
    """Utilisation, a status mark and the governing check's code (one of ``codes``):
    ``0.85✓M`` (or ``85✓M`` in per cent, where the width is short)."""
    if outcome is None:
        return Text("—", style="dim")
    status = outcome.status
    style = STATUS_STYLE.get(status, "bold yellow")
    check, proper = _governing(outcome)
    if check is None:
        return Text(f"{STATUS_MARK.get(status, '?')}", style=style)
    u = check.utilisation
    if not math.isfinite(u):
        shown = "∞"
    elif percent:
        shown = f"{100 * u:.0f}" if u < 10 else ">999"
    else:
        shown = f"{u:.2f}" if u < 10 else f"{u:.1f}" if u < 100 else ">99"
    text = Text(shown)
    text.append(STATUS_MARK.get(status, "?"), style=style)
    text.append(codes[check.name, proper], style="italic")
    return text


def _by_beam(outcomes: Sequence[Outcome]) -> dict[str, dict[str, Outcome]]:
    by_beam: dict[str, dict[str, Outcome]] = {}
    for o in outcomes:
        by_beam.setdefault(o.entry.beam.id, {})[o.edition] = o
    return by_beam


def _keys(editions: Sequence[str]) -> list[str]:
    return [chr(ord("A") + i) if i < 26 else f"E{i + 1}" for i in range(len(editions))]


class EntryLines:
    """``label`` and its entries ("A aci318-11") joined by "; ", wrapped between entries
    and never inside one, so that a key stays on the line of what it stands for; an entry
    wider than the line is wrapped by rich as any text."""

    def __init__(self, label: str, entries: Sequence[str], style: str = "dim") -> None:
        self.label, self.entries, self.style = label, list(entries), style

    def lines(self, width: int) -> list[str]:
        lines: list[str] = []
        line, fresh = self.label, True  # fresh: no entry on this line yet
        last = len(self.entries) - 1
        for k, entry in enumerate(self.entries):
            piece = entry + (";" if k < last else "")
            if fresh or cell_len(f"{line} {piece}") <= width:
                line, fresh = f"{line} {piece}", False
            else:
                lines.append(line)
                line = f"  {piece}"  # a hanging indent marks the continuation
        lines.append(line)
        return lines

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        for line in self.lines(options.max_width):
            yield Text(line, style=self.style)


def _legend(outcomes: Sequence[Outcome], keys: dict[str, str],
            codes: dict[tuple[str, bool], str], percent: bool = False) -> Group:
    """What the marks, codes and column keys of the comparison mean."""
    statuses = dict.fromkeys(o.status for o in outcomes)
    parts: list[RenderableType] = [EntryLines(
        "marks:", [f"{STATUS_MARK.get(s, '?')} {s}" for s in statuses])]
    named = {code: name if proper else "a scope check (outside scope)"
             for (name, proper), code in codes.items()}
    if named:
        parts.append(EntryLines("governing check:", [f"{c} {n}" for c, n in named.items()]))
    if ERROR in statuses:
        parts.append(Text(f"{STATUS_MARK[ERROR]}: the edition could not assess the beam; "
                          "--details gives the reason", style="dim"))
    if keys:
        parts.append(EntryLines("editions:", [f"{k} {e}" for e, k in keys.items()]))
    parts.append(Text(f"cells: governing utilisation{' in per cent' if percent else ''}, "
                      "status mark, governing check; counts of beams at the foot",
                      style="dim"))
    return Group(*parts)


def same_cylinder(outcomes: Sequence[Outcome]) -> str:
    """How the one specified concrete strength is read by each edition compared."""
    symbols: dict[str, list[str]] = {}
    converts: list[str] = []
    for o in outcomes:
        n = o.notation
        (converts if n.cube else symbols.setdefault(n.concrete, [])).append(o.edition)
    read = "; ".join(f"{s} of {', '.join(dict.fromkeys(ids))}" for s, ids in symbols.items())
    text = f"The specified cylinder strength is taken as {read}" if read else ""
    if converts:
        text += ("; " if text else "") + (f"{', '.join(dict.fromkeys(converts))} "
                                          "converts it to cube strength")
    return text + "." if text else ""


def comparison_table(outcomes: Sequence[Outcome], editions: Sequence[str]) -> RenderableType:
    """One line per beam, one compact cell per edition, counts per edition at the foot.

    Laid out for the width it gets: utilisation in per cent when decimals do not fit,
    letters with a legend for the edition ids when the ids do not fit, and the editions
    split into blocks of columns as a last resort; an id or a cell is never cut."""
    by_beam = _by_beam(outcomes)
    statuses = [s for s in STATUS_MARK if any(o.status == s for o in outcomes)]
    counts = {s: Counter(o.edition for o in outcomes if o.status == s) for s in statuses}
    beam_width = max([6, *(len(b) for b in by_beam)])
    codes = governing_codes(outcomes)

    def cells(percent: bool) -> dict[str, list[Text]]:
        return {e: [_cell(row.get(e), codes, percent) for row in by_beam.values()]
                for e in editions}

    def widths(table: dict[str, list[Text]], keys: dict[str, str]) -> dict[str, int]:
        return {e: max([len(keys.get(e, e)), *(c.cell_len for c in column),
                        *(len(str(counts[s][e])) for s in statuses)])
                for e, column in table.items()}

    def build(width: int) -> RenderableType:
        letters = dict(zip(editions, _keys(editions), strict=True))
        for percent, keys in ((False, {}), (True, {}), (False, letters), (True, letters)):
            table = cells(percent)
            sizes = widths(table, keys)
            if beam_width + sum(w + 1 for w in sizes.values()) <= width:
                break
        blocks: list[list[str]] = [[]]
        used = beam_width
        for e in editions:
            if blocks[-1] and used + sizes[e] + 1 > width:
                blocks.append([])
                used = beam_width
            blocks[-1].append(e)
            used += sizes[e] + 1
        parts: list[RenderableType] = []
        for block in blocks:
            grid = Table(box=box.SIMPLE_HEAD, show_edge=False, padding=(0, 0),
                         title="editions side by side" if not parts else None,
                         title_justify="left", title_style="bold")
            grid.add_column("beam", no_wrap=True, min_width=beam_width)
            for e in block:
                grid.add_column(keys.get(e, e), no_wrap=True)
            for i, beam_id in enumerate(by_beam):
                grid.add_row(Text(beam_id, style="bold"), *(table[e][i] for e in block))
            if grid.rows:
                grid.rows[-1].end_section = True
            for s in statuses:
                grid.add_row(Text(f"{STATUS_MARK[s]} {s}", style="dim"),
                             *(Text(str(counts[s][e]) if counts[s][e] else "·")
                               for e in block))
            parts.append(grid)
        return Group(*parts, _legend(outcomes, keys, codes, percent))

    return ByWidth(build)


def details_tables(outcomes: Sequence[Outcome]) -> list[RenderableType]:
    """Per beam, one line per edition: status, utilisation, design resistance and design
    moment in the edition's symbols, the governing check and its clause."""
    parts: list[RenderableType] = []
    for beam_id, row in _by_beam(outcomes).items():
        first = next(iter(row.values()))
        beam = first.entry.beam
        unit = _units(first).unit("N·mm")
        table = Table(title=f"{beam_id}" + (f" · {beam.title}" if beam.title else "")
                      + f" (moments in {unit})", title_justify="left", title_style="bold",
                      box=box.SIMPLE_HEAD, pad_edge=False, collapse_padding=True)
        table.add_column("edition", no_wrap=True)
        table.add_column("status", no_wrap=True)
        table.add_column("util.", justify="right", no_wrap=True)
        table.add_column("resistance", justify="right", no_wrap=True)
        table.add_column("demand", justify="right", no_wrap=True)
        table.add_column("governing check", ratio=1, overflow="fold")
        for edition, o in row.items():
            a, n = o.assessment, o.notation
            if a is None:
                _row(table, edition, _status(ERROR), "", "", "", Text(o.error, style="magenta"))
                continue
            check, _ = _governing(o)
            units = _units(o)

            def moment(value: Any, symbol: str, units: Units = units) -> str:
                if value is None:
                    return "—"
                return f"{symbol} {number(convert(value, 'N·mm', units.system)[0])}"

            _row(table, edition, _status(o.status),
                 utilisation_text(check.utilisation) if check else "",
                 moment(a.design_resistance.value if a.design_resistance else None,
                        n.resistance),
                 moment(a.demand.value if a.demand else None, n.demand),
                 NumbersKept(f"{check.name} [{_where(check.clause, edition)}]" if check
                             else a.summary()))
        governing = table.columns[-1]  # its words kept whole: "[en1992-1-1:2004", not cut
        governing.min_width = min(LONGEST_KEPT_WORD, max(
            (len(word) for cell in governing.cells for word in NumbersKept.words(
                cell.text.plain if isinstance(cell, NumbersKept) else str(cell))),
            default=1))
        parts.append(table)
    return parts


def comparison_report(schedule: Schedule, outcomes: Sequence[Outcome],
                      editions: Sequence[str], details: bool = False) -> Group:
    """Beams as rows, editions as columns, one compact cell each; with ``details`` a
    table per beam with the moments and what governs."""
    parts: list[RenderableType] = [
        header(schedule, "editions compared", _situation(outcomes), editions)]
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    if not outcomes:
        parts += [Text("No beam could be compared: every beam of the file has an input "
                       "problem (above).", style="bold red"), caution()]
        return Group(*parts)
    parts.append(comparison_table(outcomes, editions))
    if details:
        parts += details_tables(outcomes)
    else:
        parts.append(Text("--details: the moments and the governing clause of every cell",
                          style="dim"))
    parts += [Text(same_cylinder(outcomes), style="dim"), caution()]
    return Group(*parts)


# --- from one edition to another ---------------------------------------------------------------

@dataclass(frozen=True)
class Change:
    """One beam whose verdict moves between two editions, and the drivers that differ."""

    beam: str
    before: Outcome
    after: Outcome
    what: tuple[str, ...]
    causes: tuple[str, ...]


DESIGN_STRESSES = ("concrete design stress", "tension steel stress")


def _drivers(outcome: Outcome) -> dict[str, tuple[str, float, str, bool]]:
    """What sets a beam's resistance and limits, by role: (how it is named, value, unit,
    whether it sets the resistance rather than a steel limit)."""
    a = outcome.assessment
    found: dict[str, tuple[str, float, str, bool]] = {}
    if a is None:
        return found
    if a.resistance is not None:
        f = a.resistance.factor
        found["resistance factor"] = (f.symbol, float(f.value), "", True)
    if a.effective_width is not None:
        e = a.effective_width
        found["effective width"] = (e.symbol, float(e.value), "mm", True)
    for f in (*a.concrete_factors, *a.steel_factors):
        found[f.symbol] = (f.symbol, float(f.value), f.unit, True)
    # the design stresses themselves, which every edition has whatever it names its
    # factors (0.85 f'c against η fcd, fy against fyd = fyk/γs): the partial factors show
    law = a.concrete_law
    stress = getattr(law, "stress", getattr(law, "peak_stress", None))
    if stress is not None:
        found[DESIGN_STRESSES[0]] = (DESIGN_STRESSES[0], float(stress), "MPa", True)
    r = a.response
    if r is not None and r.equilibrium and r.layers:
        deepest = max(r.layers, key=lambda layer: float(layer.depth))
        found[DESIGN_STRESSES[1]] = (DESIGN_STRESSES[1], abs(float(deepest.stress)), "MPa",
                                     True)
    for c in a.checks:
        if "minimum" in c.name or "maximum" in c.name:
            found[c.name] = (f"{c.name} {c.symbol}", float(c.limit), c.unit, False)
    return found


def _relative(before: float, after: float) -> float:
    if before == after:
        return 0.0
    if not (math.isfinite(before) and math.isfinite(after)) or before == 0:
        return math.inf
    return (after - before) / abs(before)


def causes(before: Outcome, after: Outcome, threshold: float, limits: bool = True,
           most: int = 3) -> tuple[str, ...]:
    """The drivers both editions have that differ by more than ``threshold`` (a fraction),
    largest first: resistance factor, effective width, stress-block and material factors,
    and with ``limits`` the steel limits."""
    units = _units(before)
    b, a = _drivers(before), _drivers(after)
    if {k for k in b if k not in DESIGN_STRESSES} == {k for k in a if k not in DESIGN_STRESSES}:
        for role in DESIGN_STRESSES:  # the same factors on both sides already say it
            b.pop(role, None)
            a.pop(role, None)
    moved: list[tuple[float, str]] = []
    seen: set[tuple[float, float, str]] = set()  # one line for one change (fcd and η fcd)
    for role in (r for r in b if r in a):  # in the audit's order, so the choice is stable
        (nb, vb, unit, sets), (na, va, _, _) = b[role], a[role]
        change = _relative(vb, va)
        if (vb, va, unit) in seen:
            continue
        seen.add((vb, va, unit))
        # a driver named otherwise (b_eff, bf) but of the same value drives nothing
        if (sets or limits) and (abs(change) > threshold or (nb != na and vb != va)):
            name = nb if nb == na else f"{nb} → {na}"
            percent = f" ({change:+.0%})" if math.isfinite(change) and change else ""
            moved.append((abs(change) if math.isfinite(change) else 1e300,
                          f"{name} {units.value(vb, unit)} → {units.value(va, unit)}{percent}"))
    moved.sort(key=lambda m: -m[0])
    found = tuple(text for _, text in moved[:most])
    if not found:
        own = [r for r in a if r not in b][:4]
        found = (f"rules of {after.edition} without a counterpart: {', '.join(own)}",) \
            if own else ()
    return found


def migration(outcomes: Sequence[Outcome], source: str, target: str,
              threshold: float) -> list[Change]:
    """The beams whose status, governing check or design resistance (by more than
    ``threshold``, a fraction) changes from ``source`` to ``target``."""
    changes = []
    for beam_id, row in _by_beam(outcomes).items():
        if source not in row or target not in row:
            continue
        before, after = row[source], row[target]
        what = []
        if before.status != after.status:
            what.append(f"status {before.status} → {after.status}")
        gb, ga = _governing(before)[0], _governing(after)[0]
        if gb is not None and ga is not None and gb.name != ga.name:
            what.append(f"governing {gb.name} → {ga.name}")
        rb, ra = (o.assessment.design_resistance if o.assessment else None
                  for o in (before, after))
        if rb is not None and ra is not None:
            change = _relative(float(rb.value), float(ra.value))
            if abs(change) > threshold:
                what.append(f"resistance {change:+.1%}" if math.isfinite(change)
                            else "resistance lost")
        if what:
            limits = len(what) > 1 or not what[0].startswith("resistance")
            changes.append(Change(beam_id, before, after, tuple(what),
                                  causes(before, after, threshold, limits)))
    return changes


def _percent(fraction: float) -> str:
    """A threshold as the user gave it in per cent: 2 %, 0.5 %, 0.25 %."""
    return f"{100 * fraction:.4g}%"


def migration_report(schedule: Schedule, outcomes: Sequence[Outcome], source: str,
                     target: str, threshold: float) -> Group:
    """Only the beams that change from one edition to the other, with the drivers."""
    outcomes = [o for o in outcomes if o.edition in (source, target)]
    changes = migration(outcomes, source, target, threshold)
    parts: list[RenderableType] = [
        header(schedule, f"from {source} to {target}", _situation(outcomes),
               [source, target])]
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    beams = len(_by_beam(outcomes))
    shown_outcomes = [x for c in changes for x in (c.before, c.after)]
    codes = governing_codes(shown_outcomes)
    table = Table(title=f"{len(changes)} of {beams} beams change (status, governing check, "
                  f"or design resistance by more than {_percent(threshold)})",
                  title_justify="left",
                  title_style="bold", box=box.SIMPLE_HEAD, pad_edge=False, show_lines=True)
    table.add_column("beam", no_wrap=True)
    table.add_column(source, no_wrap=True)
    table.add_column(target, no_wrap=True)
    table.add_column("what changes, and the drivers that differ", ratio=1, overflow="fold")
    for c in changes:
        text = Text("; ".join(c.what), style="bold")
        for cause in c.causes:
            text.append(f"\n· {cause}")
        _row(table, Text(c.beam, style="bold"), _cell(c.before, codes), _cell(c.after, codes),
             NumbersKept(text))
    keys: dict[str, str] = {}
    shown: RenderableType = table if changes else Text(
        f"No beam of {beams} changes status, governing check or design resistance by more "
        f"than {_percent(threshold)} from {source} to {target}.", style="bold")
    parts += [shown, _legend(shown_outcomes or outcomes, keys, codes),
              Text(same_cylinder(outcomes), style="dim"), caution()]
    return Group(*parts)


# --- the audit trail of one beam under one edition -------------------------------------------

def _section(title: str) -> Rule:
    return Rule(Text(title, style="bold"), align="left", style="dim")


LONGEST_KEPT_WORD = 20  # a longer word (a module path) may still fold at a narrow width


class WordTable(Table):
    """A table whose columns are never narrower than their longest word (up to
    LONGEST_KEPT_WORD), so an edition id or a clause title wraps between words at 80
    columns ("en1992-1-1:2004", never "en1992-1-1:2 / 004"). The widths are shared out
    here, since rich narrows the widest columns first whatever their words."""

    longest_kept = LONGEST_KEPT_WORD  # a table of module paths keeps longer words whole

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        natural, widths, fixed = [], [], []
        for column in self.columns:
            column.width = None
            cells = [c.plain if isinstance(c, Text) else c for c in column.cells]
            texts = [c for c in (column.header, *cells) if isinstance(c, str)]
            longest_line = max((len(line) for t in texts for line in t.splitlines()),
                               default=1)
            longest_word = max((len(w) for t in texts for w in NumbersKept.words(t)),
                               default=1)
            natural.append(longest_line)
            fixed.append(column.no_wrap)
            widths.append(longest_line if column.no_wrap else
                          min(longest_word, self.longest_kept, longest_line))
        room = options.max_width - self._extra_width - sum(
            self._get_padding_width(i) for i in range(len(self.columns)))
        if sum(natural) <= room or any(not isinstance(c, str | Text) for column in
                                       self.columns for c in column.cells):
            yield from super().__rich_console__(console, options)
            return
        if sum(widths) > room:  # too narrow for every word: a block per row instead
            yield from self._stacked(console, options)
            return
        while sum(widths) < room:  # the rest to the columns furthest from their natural width
            short = [(natural[i] - w, i) for i, w in enumerate(widths) if w < natural[i]]
            if not short:
                break
            widths[max(short)[1]] += 1
        for column, width in zip(self.columns, widths, strict=True):
            column.width = width
        yield from super().__rich_console__(console, options)

    def _stacked(self, console: Console, options: ConsoleOptions) -> RenderResult:
        """Where the columns cannot all keep their words: a block per row, its first cell
        as the heading and every other cell under its column's name."""
        if self.title:
            yield Text(str(self.title), style="bold")
        names = [str(column.header) for column in self.columns]
        cells = [list(column.cells) for column in self.columns]
        for row in range(self.row_count):
            yield Text(" ") + (cells[0][row] if isinstance(cells[0][row], Text)
                               else Text(str(cells[0][row]), style="bold"))
            grid = Table.grid(padding=(0, 2), pad_edge=True)
            grid.add_column(style="dim", no_wrap=True)
            grid.add_column(overflow="fold")
            for name, column in zip(names[1:], cells[1:], strict=True):
                value = column[row]
                if (value.plain if isinstance(value, Text) else str(value)).strip():
                    grid.add_row(f"  {name}", value)
            yield grid


ID_COLUMNS = {"supplied by", "answered by"}  # edition ids: never cut


def _plain_table(*columns: str) -> WordTable:
    table = WordTable(box=box.SIMPLE_HEAD, pad_edge=False)
    for column in columns:
        table.add_column(column, overflow="fold", no_wrap=column in ID_COLUMNS)
    return table


def factors_table(factors: Sequence[Factor], units: Units) -> Table:
    table = _plain_table("symbol", "value", "basis", "clause", "supplied by")
    for f in factors:
        _row(table, f.symbol, units.value(f.value, f.unit), f.basis,
             two_lines(f.clause.ref, f.clause.title), f.clause.edition)
    return table


def away(envelope: Envelope) -> str:
    """The sign of a candidate's distance from the governing one: + above the smallest,
    − below the largest."""
    return "+" if envelope.bound is Bound.SMALLEST else "\u2212"


def envelope_table(envelope: Envelope, units: Units) -> Table:
    """Every candidate, the governing one marked, the others with how far they lie from it:
    above it (+) where the smallest governs, below it (−) where the largest does."""
    table = _plain_table("candidate", "value", "from the governing", "clause", "supplied by")
    for i, c in enumerate(envelope.candidates):
        governs = i == envelope.governing
        label = Text(("▶ " if governs else "  ") + c.label, style="bold" if governs else "")
        if c.basis:
            label.append(f"\n  {c.basis}", style="dim")
        _row(
            table, label,
            units.value(c.value, envelope.unit),
            Text("governs", style="bold green") if governs else
            away(envelope) + units.value(envelope.excess(c), envelope.unit),
            two_lines(c.clause.ref, c.clause.title), c.clause.edition)
    return table


def _stack_table(a: Assessment) -> RenderableType:
    """The layers of the edition, base first; on a narrow terminal each layer's source
    goes under its title, so a module path is never cut inside a name."""
    def build(width: int) -> Table:
        if width >= NARROW:
            table = _plain_table("layer", "edition", "distribution", "version", "source")
        else:  # one column holds it all, a name on a line of its own
            table = _plain_table("layer", "edition, its distribution and source")
        table.longest_kept = 60
        for i, s in enumerate(a.stack):
            layer = "base" if i == 0 else f"over {a.stack[i - 1].id}"
            if width >= NARROW:
                _row(table, layer, two_lines(s.id, s.title), s.distribution, s.version,
                     s.source)
            else:
                _row(table, layer, two_lines(s.id, f"{s.title}\n{s.distribution} {s.version}"
                                                   f"\nfrom {s.source}"))
        return table

    return ByWidth(build)


def topics_table(topics: Sequence[TopicAnswer]) -> Table:
    """Per hook, the layer that answered it and the layers that wrapped its answer."""
    table = _plain_table("topic", "answered by", "wrapped by (innermost first)")
    for t in topics:
        _row(table, t.hook, ", ".join(t.answered_by) or "no layer", ", ".join(t.wrapped_by))
    return table


def overhangs_table(envelope: OverhangEnvelope, units: Units) -> Table:
    """Per slab side, the effective overhang and the rule that governs it."""
    table = _plain_table("side", "overhang", "governing rule", "clause", "supplied by")
    for o in envelope.overhangs:
        _row(table, o.side, units.value(o.width, "mm"), o.rule.label,
             two_lines(o.clause.ref, o.clause.title), o.clause.edition)
    return table


def topics_report(edition: Edition) -> Group:
    """Which layer of an edition's stack answers each hook as installed, and which wrap it."""
    title = Text(f"{edition.id}: who answers each topic (layers: "
                 f"{' < '.join(r.info.id for r in edition.layers if r.info)})", style="bold")
    note = Text("A layer may pass on some beams; each assessment records who answered it.",
                style="dim")
    return Group(title, topics_table([edition.layering(h.name) for h in HOOKS]), note,
                 caution())


def _parameters_table(a: Assessment) -> Table:
    table = _plain_table("parameter", "value", "meaning", "clause", "supplied by")
    table.columns[0].no_wrap = True  # spelled as an annex file must spell it
    for p in a.parameters:
        value = (f"{number(p.value, 6)} {p.unit}".strip() if isinstance(p.value, float | int)
                 else str(p.value))
        _row(table, p.name, value, p.description, two_lines(p.clause.ref, p.clause.title),
             p.clause.edition)
    return table


def _response_tables(a: Assessment, units: Units, n: Notation) -> list[RenderableType]:
    r = a.response
    if r is None:
        return []
    state = _facts()
    _fact(state, "equilibrium", r.message)
    _fact(state, "compression zone", f"{r.block_case}; depth {units.length(r.zone_depth)}")
    x = n.neutral_axis
    _fact(state, "neutral axis", f"{x} = {units.length(r.c)}; {x}/d = {number(r.c_over_d, 4)}; "
         f"{x}/dt = {number(r.c_over_dt, 4)}")
    _fact(state, "depths", f"d = {units.length(r.effective_depth)}; "
         f"dt = {units.length(r.extreme_tension_depth)}")
    _fact(state, "net tensile strain", f"{n.strain} = {number(r.net_tensile_strain, 4)}")
    _fact(state, "solver", f"{r.iterations} iterations, force residual {r.residual:.1e}")
    forces = _plain_table("concrete", "force", "depth of resultant")
    if r.overhang_force > 0:
        _row(forces, "flange overhangs", units.value(r.overhang_force, "N"),
             units.length(r.overhang_depth))
    _row(forces, "web width", units.value(r.web_force, "N"), units.length(r.web_depth))
    _row(forces, "total", units.value(r.concrete_force, "N"),
         units.length(r.concrete_depth))
    steel = _plain_table("steel layer", "depth", "area", "strain", "stress", "net force",
                         "yielded")
    for i, s in enumerate(r.layers, start=1):
        _row(steel, str(i), units.length(s.depth), units.value(s.area, "mm²"),
             number(s.strain, 4), units.value(s.stress, "MPa"),
             units.value(s.force, "N"), "yes" if s.yielded else "no")
    note = Text("strains and forces positive in compression; a bar in the compression zone "
                "carries its stress less the concrete it displaces", style="dim")
    return [state, forces, steel, note]


def explain_report(schedule: Schedule, outcome: Outcome) -> Group:
    """The full audit trail of one beam under one edition."""
    parts: list[RenderableType] = [header(schedule, "audit trail", outcome.situation,
                                          [outcome.edition])]
    a = outcome.assessment
    beam = outcome.entry.beam
    if a is None:
        parts += [beam_panel(outcome), caution()]
        return Group(*parts)
    units, n = _units(outcome), outcome.notation
    facts = _facts()
    _fact(facts, "beam", beam.id + (f" · {beam.title}" if beam.title else ""))
    _fact(facts, "edition", f"{a.edition_id} · {a.edition_title}")
    _fact(facts, "form", f"{a.form} ({a.form_basis})")
    _fact(facts, "design situation", outcome.situation)
    _fact(facts, "status", _status(outcome.status))
    parts += [Text(""), facts, _section("inputs"), _inputs_table(outcome),
              _section("edition stack (base first)"), _stack_table(a),
              _section("who answered each topic"), topics_table(a.topics),
              _section("parameters and who supplied them"), _parameters_table(a),
              _section("scope"), checks_table(a.applicability, units, a.edition_id, "", notes=True,
                                              notation=n)]
    if a.effective_width is not None:
        parts += [_section(f"{a.effective_width.name} ({a.effective_width.bound} governs)"),
                  envelope_table(a.effective_width, units)]
        if isinstance(a.effective_width, OverhangEnvelope) and a.effective_width.overhangs:
            parts.append(overhangs_table(a.effective_width, units))
    if a.concrete_factors or a.steel_factors:
        parts += [_section("material factors"),
                  factors_table((*a.concrete_factors, *a.steel_factors), units)]
    if a.response is not None:
        parts += [_section("section at the ultimate state"), *_response_tables(a, units, n)]
    if a.resistance is not None and a.design_resistance is not None:
        res = a.resistance
        resistance = Factor(n.resistance, a.design_resistance.value, a.design_resistance.clause,
                            f"{res.factor.symbol} = {number(res.factor.value, 4)} times the "
                            f"nominal moment {n.nominal}", "N·mm")
        parts += [_section("design resistance"),
                  factors_table((res.factor, resistance), units),
                  Text(f"regime: {res.regime.name} [{_where(res.regime.clause)}] — "
                       f"{res.regime.description}"),
                  Text(f"requirement: {_where(res.requirement)} {res.requirement.title}")]
    if a.demand is not None:
        parts += [_section(f"{a.demand.name} ({a.demand.bound} governs)"),
                  envelope_table(a.demand, units)]
    if a.checks:
        parts += [_section("checks"), checks_table(a.checks, units, a.edition_id, "",
                                                   notes=True, notation=n)]
    parts += [_verdict(outcome), caution()]
    return Group(*parts)


# --- the installed editions ------------------------------------------------------------------

def editions_report(registry: Registry) -> Group:
    table = WordTable(title="installed editions", title_justify="left", title_style="bold",
                      box=box.SIMPLE_HEAD)
    table.add_column("id", no_wrap=True)
    for column in ("title", "year", "extends", "forms", "distribution", "version"):
        table.add_column(column, overflow="fold")
    for r in registry.records:
        if r.ok and r.info:
            _row(table, Text(r.info.id, style="bold"),
                 two_lines(r.info.title, _own_topics(registry, r)), str(r.info.year),
                 r.info.extends or "", ", ".join(registry.forms(r)), r.distribution,
                 r.version)
    parts: list[RenderableType] = [table]
    if registry.broken:
        broken = Table(title="broken plugins (not loaded)", title_justify="left",
                       title_style="bold red", box=box.SIMPLE_HEAD)
        for column in ("name", "source", "distribution", "version", "error"):
            broken.add_column(column)
        for r in registry.broken:
            _row(broken, r.name, r.source, r.distribution, r.version,
                 Text(r.error, style="red"))
        parts.append(broken)
    unusable = registry.unusable()
    if unusable:
        stuck = Table(title="editions that cannot be used as installed", title_justify="left",
                      title_style="bold red", box=box.SIMPLE_HEAD)
        stuck.add_column("id")
        stuck.add_column("why")
        for edition_id, why in unusable.items():
            _row(stuck, edition_id, Text(why, style="red"))
        parts.append(stuck)
    parts.append(caution())
    return Group(*parts)


def _own_topics(registry: Registry, record: PluginRecord) -> str:
    """What a layer answers or wraps itself (``editions ID`` shows the whole stack)."""
    from clausewise.provisions.registry import EditionError

    try:
        own = registry.edition(record.info.id).contributions()  # type: ignore[union-attr]
    except EditionError:
        return ""
    if not record.info.extends:  # type: ignore[union-attr]
        return "every topic" if len(own) >= len(TOPICS) else f"{len(own)} topics"
    words = [f"{how} {hook}" for hook, how in own.items()]
    return "; ".join(words) or "parameters only"


def parameters_report(edition: Edition, form: str) -> Group:
    """An edition's named parameters after layering, with what a layer may set them to."""
    from clausewise.provisions.beam import Context

    table = WordTable(title=f"parameters of {edition.id} ({form} form)",
                      title_justify="left", title_style="bold", box=box.SIMPLE_HEAD)
    table.add_column("name", no_wrap=True)  # spelled as an annex file must spell it
    for column in ("value", "may be set to", "meaning", "clause", "supplied by"):
        table.add_column(column, overflow="fold", no_wrap=column in ID_COLUMNS)
    for p in edition.parameters(Context(form=form)).values():
        allowed = (" | ".join(p.choices) if p.choices else
                   f"{p.bounds[0]:g} to {p.bounds[1]:g}" if p.bounds else "any")
        unit = f" {p.unit}" if p.unit and not p.choices else ""
        value = f"{p.value:g}" if isinstance(p.value, float | int) else str(p.value)
        _row(table, Text(p.name, style="bold"), value + unit, allowed + unit, p.description,
             two_lines(p.clause.ref, p.clause.title), p.clause.edition)
    return Group(table, caution())


# --- a large schedule through the batch path ---------------------------------------------------

def batch_summary(schedule: Schedule, summary: BatchSummary, out: Path | None,
                  situation: str = "persistent") -> Group:
    """Counts by status per edition and the worst beams, after a batch run."""
    every = (*Status, "refused")
    # a status no beam has under any edition is named below the table, not given a
    # column of dots: eight columns of headings did not fit 80 columns uncut
    statuses = [s for s in every if s in (PASS, FAIL) or any(
        tally.get(s) for tally in summary.counts.values())]
    none = [s for s in every if s not in statuses]
    counts = Table(title="beams by status, per edition", title_justify="left",
                   title_style="bold", box=box.SIMPLE_HEAD, pad_edge=False)
    counts.add_column("edition", no_wrap=True)
    for status in statuses:  # a heading may wrap at its space, never be cut in a word
        counts.add_column(status, justify="right",
                          min_width=max(len(word) for word in status.split()))
    for edition, tally in summary.counts.items():
        counts.add_row(edition, *(f"{tally.get(s, 0):,}" if tally.get(s) else "·"
                                  for s in statuses))
    worst = Table(title="highest utilisation, each beam at its worst edition",
                  title_justify="left", title_style="bold",
                  box=box.SIMPLE_HEAD)
    for column in ("beam", "edition", "utilisation"):
        worst.add_column(column, no_wrap=True)
    worst.add_column("governed by", overflow="fold")
    for utilisation, beam, edition, check in summary.worst_first():
        worst.add_row(beam, edition, _status(FAIL if utilisation > 1 else PASS).append(
            f" {utilisation:.3f}"), check)
    written = Text(f"{summary.rows:,} rows written to {out}" if out else
                   "rows not written: give --out results.csv (or .jsonl) to keep them",
                   style="dim")
    parts: list[RenderableType] = [header(schedule, "schedule checked (batch path)", situation,
                                          list(summary.counts))]
    if schedule.problems:  # input problems come first, as in every report
        parts.append(problems_table(schedule.problems))
    parts.append(counts)
    if none:
        parts.append(Text(f"none under any edition: {', '.join(none)}\n", style="dim"))
    parts += [worst, written, caution()]
    return Group(*parts)
