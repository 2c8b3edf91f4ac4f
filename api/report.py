"""The engineer's report (rich): a check per beam and edition, a comparison, an audit.

Quantities follow each beam's unit system: kN·m, mm, MPa for SI beams; kip·ft,
in, psi (ksi above 100 000 psi) for US customary beams. Every report ends with
the caution. Imported only by the commands that print a report.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import TYPE_CHECKING

from rich import box
from rich.console import Group, RenderableType
from rich.panel import Panel
from rich.rule import Rule
from rich.table import Table
from rich.text import Text

from clausewise.provisions.engine import CAUTION, FAIL, PASS, Assessment
from clausewise.provisions.verdicts import ERROR
from clausewise.provisions.vocabulary import Check, Clause, Envelope, Factor, Sense
from clausewise.results import Outcome, Units, number

if TYPE_CHECKING:
    from pathlib import Path

    from clausewise.beamfile import InputProblem, Schedule
    from clausewise.provisions.registry import Edition, Registry
    from clausewise.stream import Summary as BatchSummary

STATUS_STYLE = {PASS: "bold green", FAIL: "bold red", ERROR: "bold magenta"}
SAME_CYLINDER = ("f'c of the ACI, CSA and AS editions and fck of EN 1992-1-1 are taken as the "
                 "same specified cylinder strength; IS 456 converts it to cube strength.")


def _units(outcome: Outcome) -> Units:
    return Units(outcome.entry.beam.unit_system)


def _status(status: str) -> Text:
    return Text(status, style=STATUS_STYLE.get(status, "bold yellow"))


def _where(clause: Clause, edition: str = "") -> str:
    """A clause reference, with its supplier unless that is ``edition`` itself."""
    return f"{clause.edition} {clause.ref}" if clause.edition not in ("", edition) \
        else clause.ref


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


def caution() -> Panel:
    return Panel(Text(CAUTION), title="caution", title_align="left", border_style="yellow",
                 box=box.HEAVY)


def _row(table: Table, *cells: RenderableType) -> None:
    """Add a row whose plain-string cells are taken as text, never as markup."""
    table.add_row(*(Text(c) if isinstance(c, str) else c for c in cells))


def two_lines(main: str, sub: str) -> Text:
    """A cell with a plain first line and a dim second one (never read as markup)."""
    text = Text(main)
    if sub:
        text.append("\n" + sub, style="dim")
    return text


def _facts() -> Table:
    """Two borderless columns: a dim label and its value."""
    table = Table.grid(padding=(0, 2))
    table.add_column(style="dim")
    table.add_column()
    return table


def _sign(sense: Sense) -> str:
    return "≤" if sense is Sense.AT_MOST else "≥"


# --- one beam under one edition ------------------------------------------------------------

def _inputs_table(outcome: Outcome, pairs: int = 1) -> Table:
    """The inputs as written, in ``pairs`` side-by-side label/value columns."""
    items = list(outcome.entry.shown.items())
    rows = -(-len(items) // pairs)
    table = Table(box=None, show_header=False, pad_edge=False, padding=(0, 2, 0, 0))
    for _ in range(pairs):
        table.add_column(style="dim")
        table.add_column(ratio=1)
    for i in range(rows):
        cells = [text for label_value in items[i::rows] for text in label_value]
        _row(table, *cells, *[""] * (2 * pairs - len(cells)))
    return table


def _findings_table(a: Assessment, units: Units) -> Table:
    table = _facts()
    if a.effective_width is not None:
        e = a.effective_width
        g = e.governing_candidate
        _row(table, "effective flange width",
             f"{e.symbol} = {units.length(e.value)}, from {g.label} "
             f"[{_where(g.clause, a.edition_id)}]")
    r = a.response
    if r is not None:
        _row(table, "compression zone", f"{r.block_case}; depth {units.length(r.zone_depth)}")
        _row(table, "neutral axis", f"c = {units.length(r.c)}, c/d = {number(r.c_over_d, 3)}")
        _row(table, "net tensile strain", f"εt = {number(r.net_tensile_strain, 3)}")
    if a.resistance is not None:
        f, regime = a.resistance.factor, a.resistance.regime
        _row(table, "regime", f"{regime.name} [{_where(regime.clause, a.edition_id)}]")
        _row(table, "resistance factor", f"{f.symbol} = {number(f.value, 3)}")
    if r is not None:
        _row(table, "nominal moment", f"Mn = {units.moment(r.nominal_moment)}")
    if a.design_resistance is not None:
        _row(table, "design resistance",
             Text(f"{a.design_resistance.symbol} = "
                  f"{units.moment(a.design_resistance.value)}", style="bold"))
    if a.demand is not None:
        _row(table, "design moment",
             Text(f"{a.demand.symbol} = {units.moment(a.demand.value)} "
                  f"({a.demand.governing_candidate.label} governs)", style="bold"))
    else:
        _row(table, "design moment", "none given: capacity only")
    return table


def checks_table(checks: Sequence[Check], units: Units, edition: str, title: str = "checks",
                 notes: bool = False) -> RenderableType:
    """Each check with its value, limit, utilisation, verdict and clause (its supplier
    named when not ``edition``); with ``notes`` the checks' notes follow as footnotes."""
    table = Table(title=title or None, title_justify="left", title_style="bold",
                  box=box.SIMPLE_HEAD, pad_edge=False)
    table.add_column("check", min_width=22)
    table.add_column("value", justify="right", no_wrap=True)
    table.add_column("limit", justify="right", no_wrap=True)
    table.add_column("utilisation", no_wrap=True)
    table.add_column("result", no_wrap=True)
    table.add_column("clause", min_width=18)
    footnotes = Text(style="dim")
    marker = 0
    for c in checks:
        name = Text(c.name)
        if notes and c.note:
            marker += 1
            name.append(f" [{marker}]", style="dim")
            footnotes.append(f"[{marker}] {c.name}: {c.note}\n")
        symbol = f"{c.symbol} " if c.symbol else ""
        _row(table, name, f"{symbol}{units.value(c.value, c.unit)}",
             f"{_sign(c.sense)} {units.value(c.limit, c.unit)}",
             utilisation_bar(c.utilisation), _status(PASS if c.passed else FAIL),
             two_lines(_where(c.clause, edition), c.clause.title))
    if not marker:
        return table
    footnotes.rstrip()
    return Group(table, footnotes)


def _verdict(a: Assessment) -> Text:
    text = Text("▶ ", style=STATUS_STYLE.get(a.status, "bold yellow"))
    text.append(a.summary(), style="bold")
    return text


def _stack_line(a: Assessment) -> str:
    return " over ".join(f"{s.id} {s.version} ({s.distribution})" for s in reversed(a.stack))


def beam_panel(outcome: Outcome) -> Panel:
    """One beam under one edition: inputs beside findings, the checks, what governs."""
    beam = outcome.entry.beam
    name = f"{beam.id}" + (f" · {beam.title}" if beam.title else "")
    a = outcome.assessment
    if a is None:
        return Panel(Text(outcome.error, style="magenta"),
                     title=Text(f"{name} · {outcome.edition}"), title_align="left",
                     subtitle="not assessed", border_style="magenta")
    units = _units(outcome)
    parts: list[RenderableType] = [
        Text("inputs", style="bold"), _inputs_table(outcome, pairs=2),
        Text("\nsection and strength", style="bold"), _findings_table(a, units)]
    if a.checks or a.status != PASS:
        shown = a.checks if a.checks else a.applicability
        parts += [Text(""), checks_table(shown, units, a.edition_id,
                                         "checks" if a.checks else "scope")]
    parts += [Text(f"note: {remark}", style="dim") for remark in a.remarks]
    parts.append(_verdict(a))
    border = {PASS: "green", FAIL: "red"}.get(a.status, "yellow")
    return Panel(Group(*parts), title=Text(f"{name} · {a.edition_id} ({a.form} form, "
                 f"{outcome.situation})"), title_align="left",
                 subtitle=Text(_stack_line(a)), subtitle_align="right", border_style=border)


def summary_table(outcomes: Sequence[Outcome]) -> Table:
    table = Table(title="summary", title_justify="left", title_style="bold",
                  box=box.SIMPLE_HEAD)
    for column in ("beam", "edition", "status", "governing check", "utilisation"):
        table.add_column(column)
    for o in outcomes:
        a = o.assessment
        check = a.governing if a else None
        _row(table, o.entry.beam.id, o.edition, _status(o.status),
             f"{check.name} [{_where(check.clause)}]" if check else
             Text(o.error, style="magenta"),
             utilisation_bar(check.utilisation) if check else "")
    return table


def problems_table(problems: Sequence[InputProblem]) -> Table:
    table = Table(title="beams not assessed: input problems", title_justify="left",
                  title_style="bold magenta", box=box.SIMPLE_HEAD)
    for column in ("beam", "field", "given", "expected"):
        table.add_column(column)
    for p in problems:
        _row(table, p.beam or "(no usable id)", p.field, p.value or "(missing)", p.expected)
    return table


def header(schedule: Schedule, what: str) -> Group:
    p = schedule.project
    where = ", ".join(x for x in (p.building, p.town) if x)
    facts = _facts()
    for label, value in (("project", p.name), ("building", where), ("engineer", p.engineer),
                         ("file", str(schedule.source)), ("notes", p.notes)):
        if value:
            _row(facts, label, value)
    return Group(Rule(Text(f"clausewise · {what}"), align="left", style="bold"), facts)


def check_report(schedule: Schedule, outcomes: Sequence[Outcome]) -> Group:
    """Every beam under every edition, a summary, the refused beams and the caution."""
    parts: list[RenderableType] = [header(schedule, "flexural check")]
    parts += [beam_panel(o) for o in outcomes]
    if len(outcomes) > 1:
        parts.append(summary_table(outcomes))
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    parts.append(caution())
    return Group(*parts)


# --- editions side by side -------------------------------------------------------------------

def _cell(outcome: Outcome) -> Text:
    """Utilisation and verdict, M_Rd and M_Ed (numbers only: the row names the unit),
    the governing check and its clause."""
    a = outcome.assessment
    if a is None:
        return Text(f"not assessed\n{outcome.error}", style="magenta")
    check = a.governing
    style = STATUS_STYLE.get(a.status, "bold yellow")
    text = Text()
    text.append(f"{check.utilisation:.3f} {a.status}" if check else a.status, style=style)
    units = _units(outcome)
    moment_unit = units.unit("N·mm")
    if a.design_resistance is not None:
        text.append(f"\nM_Rd {units.moment(a.design_resistance.value).removesuffix(moment_unit)}")
    if a.demand is not None:
        text.append(f"\nM_Ed {units.moment(a.demand.value).removesuffix(moment_unit)}")
    if check is not None:
        text.append(f"\n{check.name}", style="italic")
        text.append(f"\n{_where(check.clause, a.edition_id)}", style="dim")
    return text


def comparison_width(editions: int) -> int:
    """Columns a comparison needs to keep each edition's cell readable."""
    return 16 + 15 * editions


def comparison_report(schedule: Schedule, outcomes: Sequence[Outcome],
                      editions: Sequence[str]) -> Group:
    """Beams as rows, editions as columns: utilisation, M_Rd, M_Ed and what governs."""
    table = Table(title="editions side by side (governing utilisation)", title_justify="left",
                  title_style="bold", box=box.SQUARE, show_lines=True)
    table.add_column("beam")
    for edition in editions:
        table.add_column(edition)
    by_beam: dict[str, dict[str, Outcome]] = {}
    for o in outcomes:
        by_beam.setdefault(o.entry.beam.id, {})[o.edition] = o
    for beam_id, row in by_beam.items():
        beam = next(iter(row.values())).entry.beam
        label = Text()
        label.append(beam_id, style="bold")
        if beam.title:
            label.append(f"\n{beam.title}")
        label.append(f"\nmoments in {Units(beam.unit_system).unit('N·mm')}", style="dim")
        _row(table, label, *(_cell(row[e]) if e in row else Text("—") for e in editions))
    parts: list[RenderableType] = [header(schedule, "editions compared"), table,
                                   Text(SAME_CYLINDER, style="dim")]
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    parts.append(caution())
    return Group(*parts)


# --- the audit trail of one beam under one edition -------------------------------------------

def _section(title: str) -> Rule:
    return Rule(Text(title, style="bold"), align="left", style="dim")


def _plain_table(*columns: str) -> Table:
    table = Table(box=box.SIMPLE_HEAD, pad_edge=False)
    for column in columns:
        table.add_column(column)
    return table


def factors_table(factors: Sequence[Factor], units: Units) -> Table:
    table = _plain_table("symbol", "value", "basis", "clause", "supplied by")
    for f in factors:
        _row(table, f.symbol, units.value(f.value, f.unit), f.basis,
             two_lines(f.clause.ref, f.clause.title), f.clause.edition)
    return table


def envelope_table(envelope: Envelope, units: Units) -> Table:
    """Every candidate, the governing one marked, the others with how far they exceed it."""
    table = _plain_table("candidate", "value", "beyond the governing", "clause", "supplied by")
    for i, c in enumerate(envelope.candidates):
        governs = i == envelope.governing
        label = Text(("▶ " if governs else "  ") + c.label, style="bold" if governs else "")
        if c.basis:
            label.append(f"\n  {c.basis}", style="dim")
        _row(
            table, label,
            units.value(c.value, envelope.unit),
            Text("governs", style="bold green") if governs else
            "+" + units.value(envelope.excess(c), envelope.unit),
            two_lines(c.clause.ref, c.clause.title), c.clause.edition)
    return table


def _stack_table(a: Assessment) -> Table:
    table = _plain_table("layer", "edition", "distribution", "version", "source")
    table.columns[-1].overflow = "fold"
    for i, s in enumerate(a.stack):
        _row(table, "base" if i == 0 else f"over {a.stack[i - 1].id}",
             two_lines(s.id, s.title), s.distribution, s.version, s.source)
    return table


def _parameters_table(a: Assessment) -> Table:
    table = _plain_table("parameter", "value", "meaning", "clause", "supplied by")
    for p in a.parameters:
        value = (f"{number(p.value, 6)} {p.unit}".strip() if isinstance(p.value, float | int)
                 else str(p.value))
        _row(table, p.name, value, p.description, two_lines(p.clause.ref, p.clause.title),
             p.clause.edition)
    return table


def _response_tables(a: Assessment, units: Units) -> list[RenderableType]:
    r = a.response
    if r is None:
        return []
    state = _facts()
    _row(state, "equilibrium", r.message)
    _row(state, "compression zone", f"{r.block_case}; depth {units.length(r.zone_depth)}")
    _row(state, "neutral axis", f"c = {units.length(r.c)}; c/d = {number(r.c_over_d, 4)}; "
         f"c/dt = {number(r.c_over_dt, 4)}")
    _row(state, "depths", f"d = {units.length(r.effective_depth)}; "
         f"dt = {units.length(r.extreme_tension_depth)}")
    _row(state, "net tensile strain", f"εt = {number(r.net_tensile_strain, 4)}")
    _row(state, "solver", f"{r.iterations} iterations, force residual {r.residual:.1e}")
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
    parts: list[RenderableType] = [header(schedule, "audit trail")]
    a = outcome.assessment
    beam = outcome.entry.beam
    if a is None:
        parts += [beam_panel(outcome), caution()]
        return Group(*parts)
    units = _units(outcome)
    facts = _facts()
    _row(facts, "beam", beam.id + (f" · {beam.title}" if beam.title else ""))
    _row(facts, "edition", f"{a.edition_id} · {a.edition_title}")
    _row(facts, "form", f"{a.form} ({a.form_basis})")
    _row(facts, "design situation", outcome.situation)
    _row(facts, "status", _status(a.status))
    parts += [Text(""), facts, _section("inputs"), _inputs_table(outcome),
              _section("edition stack (base first)"), _stack_table(a),
              _section("parameters and who supplied them"), _parameters_table(a),
              _section("scope"), checks_table(a.applicability, units, a.edition_id, "", notes=True)]
    if a.effective_width is not None:
        parts += [_section(f"{a.effective_width.name} ({a.effective_width.bound} governs)"),
                  envelope_table(a.effective_width, units)]
    if a.concrete_factors or a.steel_factors:
        parts += [_section("material factors"),
                  factors_table((*a.concrete_factors, *a.steel_factors), units)]
    if a.response is not None:
        parts += [_section("section at the ultimate state"), *_response_tables(a, units)]
    if a.resistance is not None and a.design_resistance is not None:
        res = a.resistance
        parts += [_section("design resistance"),
                  factors_table((res.factor, a.design_resistance), units),
                  Text(f"regime: {res.regime.name} [{_where(res.regime.clause)}] — "
                       f"{res.regime.description}"),
                  Text(f"requirement: {_where(res.requirement)} {res.requirement.title}")]
    if a.demand is not None:
        parts += [_section(f"{a.demand.name} ({a.demand.bound} governs)"),
                  envelope_table(a.demand, units)]
    if a.checks:
        parts += [_section("checks"), checks_table(a.checks, units, a.edition_id, "", notes=True)]
    parts += [_verdict(a), caution()]
    return Group(*parts)


# --- the installed editions ------------------------------------------------------------------

def editions_report(registry: Registry) -> Group:
    table = Table(title="installed editions", title_justify="left", title_style="bold",
                  box=box.SIMPLE_HEAD)
    for column in ("id", "title", "year", "extends", "forms", "distribution", "version"):
        table.add_column(column)
    for r in registry.records:
        if r.ok and r.info:
            _row(table, Text(r.info.id, style="bold"), r.info.title, str(r.info.year),
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


def parameters_report(edition: Edition, form: str) -> Group:
    """An edition's named parameters after layering, with what a layer may set them to."""
    from clausewise.provisions.beam import Context

    table = Table(title=f"parameters of {edition.id} ({form} form)", title_justify="left",
                  title_style="bold", box=box.SIMPLE_HEAD)
    for column in ("name", "value", "may be set to", "meaning", "clause", "supplied by"):
        table.add_column(column)
    for p in edition.parameters(Context(form=form)).values():
        allowed = (" | ".join(p.choices) if p.choices else
                   f"{p.bounds[0]:g} to {p.bounds[1]:g}" if p.bounds else "any")
        unit = f" {p.unit}" if p.unit and not p.choices else ""
        value = f"{p.value:g}" if isinstance(p.value, float | int) else str(p.value)
        _row(table, Text(p.name, style="bold"), value + unit, allowed + unit, p.description,
             two_lines(p.clause.ref, p.clause.title), p.clause.edition)
    return Group(table, caution())


# --- a large schedule through the batch path ---------------------------------------------------

def batch_summary(schedule: Schedule, summary: BatchSummary, out: Path | None) -> Group:
    """Counts by status per edition and the worst beams, after a batch run."""
    statuses = ("pass", "fail", "outside scope", "no equilibrium", "error", "refused")
    counts = Table(title="beams by status, per edition", title_justify="left",
                   title_style="bold", box=box.SIMPLE_HEAD)
    counts.add_column("edition")
    for status in statuses:
        counts.add_column(status, justify="right")
    for edition, tally in summary.counts.items():
        counts.add_row(edition, *(f"{tally.get(s, 0):,}" if tally.get(s) else "·"
                                  for s in statuses))
    worst = Table(title="highest utilisation", title_justify="left", title_style="bold",
                  box=box.SIMPLE_HEAD)
    for column in ("beam", "edition", "utilisation", "governed by"):
        worst.add_column(column)
    for utilisation, beam, edition, check in summary.worst_first():
        worst.add_row(beam, edition, _status(FAIL if utilisation > 1 else PASS).append(
            f" {utilisation:.3f}"), check)
    written = Text(f"{summary.rows:,} rows written to {out}" if out else
                   "rows not written: give --out results.csv (or .jsonl) to keep them",
                   style="dim")
    parts: list[RenderableType] = [header(schedule, "schedule checked (batch path)"), counts,
                                   worst, written]
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    parts.append(caution())
    return Group(*parts)
