"""The hooks an edition implements: the plugin author's reference.

An edition is a module (or object) whose functions are marked with
``@hookimpl`` from ``clausewise.provisions``. It is registered through the
entry-point group ``clausewise.editions``. Every function may accept any subset
of a hook's arguments (pluggy passes only those it names), so new arguments can
be added later without breaking anyone.

Every hook is declared once, in :data:`HOOKS` at the end of this module: what it
returns, whether it may return ``None``, and whether every layer is asked. The
``Edition`` methods, :data:`TOPICS`, the checks on what a hook returns and the
author guide's table of hooks all follow from that table; adding a topic is a
function below (its docstring is its reference) and one row.

Arguments every topic receives by name:

``beam``
    :class:`clausewise.provisions.Beam` in N, mm, MPa (moments N·mm). Its numeric
    fields are floats for one beam or numpy arrays for a batch: write rules with
    the helpers (``clamp``, ``interpolate``, ``smallest_of``, ``choose``...) and
    numpy, never with ``if`` on a value, so one rule serves both.
``params``
    :class:`clausewise.provisions.Parameters`, this edition's named parameters after
    layering (``params.value("gamma_c")``). Read a parameter instead of writing a
    number wherever an annex or a firm may want a different one.
``context``
    :class:`clausewise.provisions.Context`: ``context.form`` is the published form in
    use (one of ``EditionInfo.forms``), ``context.situation`` the design situation.
``section``
    a :class:`SectionView`: gross properties of the section with its effective flange.
``response``
    a :class:`SolvedSection`: the section solved by the core (floats for one beam,
    arrays for a batch).

Layering. Topic hooks are asked top down: the topmost layer of a stack that returns
something other than ``None`` answers, the layers below are not asked. An edition
that ``extends`` another implements only the topics it changes, in one of two ways:

*replace* a topic: a plain ``@hookimpl`` answers it outright;

*wrap* a topic: ``@hookimpl(wrapper=True)`` on a generator function receives the
answer of the stack below it at its ``yield`` and returns it changed (an envelope
with a candidate added, a check with a tighter limit, a factor scaled), citing its
own clause for what it added. This is pluggy's wrapper protocol::

    @hookimpl(wrapper=True)
    def effective_flange_width(beam, params):
        base = yield                      # the answer of the layers below
        return add_overhang_rules(base, beam, house_rule(beam, params))

A wrapper changes the edition's own stack only: the base assessed on its own never
sees it. A layer that replaces a topic replaces what the layers below it wrapped.
Hooks marked "every layer" (``edition_parameters``, ``additional_checks``) ask every
layer and keep every answer, bottom layer first; a wrapper there receives them all.

Assessment order (the engine calls the hooks in this order; ``edition_info`` is
read once, when the edition is registered)::

    edition_parameters -> applicability
      -> effective_flange_width (flanged beams only)
      -> concrete_law, steel_law -> [core solves the section]
      -> resistance_factor -> design_actions
      -> minimum_reinforcement, ductility_limits, additional_checks
      -> detailing_limits (layers given by bars: fit, layer and crack spacing)
      -> governing check = highest utilisation
"""

from __future__ import annotations

import inspect
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any, Protocol

import pluggy

from clausewise.provisions.answers import EditionInfo, MaterialModel, Parameters, Resistance
from clausewise.provisions.beam import Beam, Context
from clausewise.provisions.detailing import DetailingLimits
from clausewise.provisions.vocabulary import Check, Envelope, Parameter

PROJECT = "clausewise"
hookspec = pluggy.HookspecMarker(PROJECT)
hookimpl = pluggy.HookimplMarker(PROJECT)

Value = Any
"""A float for one beam, a numpy array over a batch."""


# --- what rules receive --------------------------------------------------------------

class SectionView(Protocol):
    """The section with its effective flange, as ``section`` (floats or arrays)."""

    @property
    def area(self) -> Value:
        """Gross area, mm²."""

    @property
    def centroid(self) -> Value:
        """Depth of the gross centroid below the compression face, mm."""

    @property
    def second_moment(self) -> Value:
        """Gross second moment of area about the centroid, mm⁴."""

    @property
    def max_width(self) -> Value:
        """Width of the widest strip (the flange of a flanged section), mm."""

    def cracking_moment(self, flexural_tensile_strength: Value) -> Value:
        """Moment (N·mm) that cracks the tension face of the gross section."""


class SolvedSection(Protocol):
    """The section solved by strain compatibility, as ``response``.

    One beam: every attribute a float (a ``bool`` for ``block_in_flange`` and
    ``equilibrium``). A batch: numpy arrays of one value per beam. Rules read the
    attributes below only, so the same rule serves both shapes.
    """

    @property
    def c(self) -> Value:
        """Neutral-axis depth below the compression face, mm."""

    @property
    def zone_depth(self) -> Value:
        """Depth of the compression zone (the block depth for a rectangular block), mm."""

    @property
    def block_in_flange(self) -> Value:
        """Whether the compression zone stays inside the flange."""

    @property
    def nominal_moment(self) -> Value:
        """Nominal moment resistance Mn, N·mm (before the member factor)."""

    @property
    def net_tensile_strain(self) -> Value:
        """Strain of the extreme tension layer (positive in tension)."""

    @property
    def extreme_tension_depth(self) -> Value:
        """dt, depth of the extreme tension layer, mm."""

    @property
    def effective_depth(self) -> Value:
        """d, depth of the centroid of the tension steel, mm."""

    @property
    def c_over_dt(self) -> Value:
        """c/dt."""

    @property
    def c_over_d(self) -> Value:
        """c/d."""

    @property
    def concrete_force(self) -> Value:
        """Resultant compression of the concrete, N."""

    @property
    def overhang_force(self) -> Value:
        """The part of the concrete force carried by the flange overhangs, N."""

    @property
    def equilibrium(self) -> Value:
        """Whether force equilibrium was found (no resistance without it)."""


# --- who the edition is --------------------------------------------------------------

def edition_info() -> EditionInfo:
    """Return the edition's identity: ``EditionInfo(id, title, year, extends, forms)``.

    ``id`` is lower case and stable (``"aci318-19"``, ``"en1992-1-1:2004"``);
    results are filed under it. ``extends`` names a base edition's id: this edition
    is then layered over the base and answers only what it implements. Example::

        EDITION = EditionInfo("xx-annex:2024", "Example annex", 2024,
                              extends="en1992-1-1:2004")

        @hookimpl
        def edition_info():
            return EDITION
    """


def edition_parameters(context: Context) -> Sequence[Parameter]:
    """Return this edition's named parameters (every layer is asked; upper layers win).

    Each ``Parameter(name, value, clause, description, bounds, unit)`` is a value an
    annex or a firm may change: partial factors, αcc, k1-k4, steel-ratio
    coefficients, preferred limits. ``bounds`` are the values a parameter file may
    set; outside them the file is refused. An extending edition returns only the
    parameters it changes, with its own clause, so the audit names it as supplier.
    """


# --- scope ---------------------------------------------------------------------------

def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    """Return the checks that keep the edition inside its range of validity.

    Typically concrete and steel strength ranges: ``Check("concrete strength in
    range", fc, lower, Sense.AT_LEAST, clause)`` and an upper bound alike. When any
    fails the engine reports the beam as outside the edition's scope and computes
    no resistance: rules are never extrapolated.
    """


# --- geometry ------------------------------------------------------------------------

def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    """Return the effective flange width (mm) as ``Envelope.smallest`` of candidates.

    Called only for T and L beams. ``beam.layout`` gives span, continuity, clear
    distances to the neighbouring webs (``None`` on a side without slab) and, where
    known, the distance between points of zero moment; ``beam.flange_width`` is an
    outright width the engineer gave (include it as a candidate when present). For
    hogging the flange is in tension and the width serves minimum steel only.
    Each candidate is a total width including the web, e.g.
    ``Candidate("16 hf + bw", 16 * hf + bw, clause)``.

    Where the standard limits each overhang, give per-side rules to
    ``widths.overhang_envelope(beam, [OverhangRule(...), ...])``: each side then takes
    the least of its own limits and the audit names, per side, the rule that governed.
    To add a limit over a base, wrap this hook and return
    ``widths.add_overhang_rules(base, beam, rule)``. Never add a total-width candidate
    for a per-side limit ("bw + 12 hf"): it is wrong when the sides differ.
    """


# --- materials -----------------------------------------------------------------------

def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    """Return the concrete law for the ultimate state and the factors behind it.

    ``MaterialModel(RectangularBlock(stress, depth_factor, ultimate_strain), factors)``
    or ``ParabolaRectangle(peak_stress, strain_at_peak, ultimate_strain, exponent)``.
    ``stress`` is the block intensity multiplied out (0.85 f'c; η αcc fck/γc;
    α1 φc f'c). Return every derived value as a ``Factor`` (β1 with its basis...).
    """


def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    """Return the reinforcement's law (same in tension and compression) and factors.

    ``ElasticPlastic(modulus, yield_stress)``, ``BilinearHardening(...)`` or
    ``PiecewiseLinear(points)``, with design values where the edition factors the
    materials (fyd = fyk/γs, φs fy). The core never assumes that steel yields.
    """


# --- strength ------------------------------------------------------------------------

def resistance_factor(beam: Beam, response: SolvedSection, params: Parameters,
                      context: Context) -> Resistance:
    """Return the member factor applied to the nominal moment.

    ``response`` is the solved section (``c``, ``net_tensile_strain``,
    ``c_over_dt``, ``nominal_moment`` N·mm, ``block_in_flange``...). Return
    ``Resistance(Factor("φ", value, clause, basis), Regime(name, clause), requirement)``
    where ``requirement`` is the clause demanding design strength ≥ demand. Editions
    with partial factors on the materials return a factor of 1.0.
    """


def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope:
    """Return the factored moment (N·mm) as ``Envelope.largest`` of load combinations.

    From ``beam.actions.dead`` / ``.live`` (service moments), e.g.
    ``Candidate("1.2D + 1.6L", 1.2 * D + 1.6 * L, clause)``; when
    ``beam.actions.factored`` is given, a single candidate "as given". Return
    ``None`` when the beam has no actions: the engine then reports capacity only.
    """


# --- reinforcement limits ------------------------------------------------------------

def minimum_reinforcement(beam: Beam, section: SectionView, response: SolvedSection,
                          demand: Envelope | None, resistance: Resistance, params: Parameters,
                          context: Context) -> Sequence[Check]:
    """Return the minimum-reinforcement checks (steel area mm², or strength N·mm).

    ``section`` gives gross properties of the section with its effective flange
    (``section.area``, ``.centroid``, ``.second_moment``, ``.max_width``) and
    ``section.cracking_moment(fr)``. ``demand`` (the factored-moment envelope, or
    None) and ``resistance`` (the member factor) are those of this assessment, as
    answered by the whole stack, so a waiver (e.g. provided steel ≥ 4/3 of that
    required by analysis) uses the same numbers as the strength check.
    """


def ductility_limits(beam: Beam, section: SectionView, response: SolvedSection, params: Parameters,
                     context: Context) -> Sequence[Check]:
    """Return the maximum-reinforcement and ductility checks.

    Net tensile strain at least a limit, c/d or x/d at most a limit, steel area at
    most a fraction of the concrete area (``section.area`` is the gross area):
    whatever the edition sets.
    """


def additional_checks(beam: Beam, section: SectionView, response: SolvedSection,
                      demand: Envelope | None, resistance: Resistance, params: Parameters,
                      context: Context) -> Sequence[Check]:
    """Return further checks; every layer of the stack is asked and all are kept.

    This is where a firm adds its own rule on top of a standard. ``demand`` and
    ``resistance`` are this assessment's, as for minimum reinforcement: a firm's cap on
    utilisation compares ``demand.value`` with ``resistance.factor.value *
    response.nominal_moment`` (the design resistance the strength check uses).
    """


# --- detailing -----------------------------------------------------------------------

def detailing_limits(beam: Beam, diameter: Any, params: Parameters,
                     context: Context) -> Any:
    """Return ``DetailingLimits`` (``clausewise.provisions.detailing``) for bars of
    ``diameter`` (mm; an array over a batch).

    ``clear_in_layer`` / ``clear_between_layers``: least clear distances between
    parallel bars as ``Envelope.largest`` of the rule's terms (db, an absolute least,
    a multiple of the aggregate size: ``detailing.aggregate_size(beam)``);
    ``max_spacing``: the largest centre-to-centre spacing of the tension bars for crack
    control as ``Envelope.smallest``, or ``None`` with ``crack_note`` saying why;
    ``cover``: the default cover to the stirrups as a ``Factor``. Optional: an edition
    that does not answer leaves bars unchecked for fit, and the assessment says so.
    """



# --- the table: each hook declared once ---------------------------------------------------

@dataclass(frozen=True)
class Hook:
    """What a hook answers: ``returns`` (each item's type when ``many``), whether ``None``
    is an answer, whether ``every_layer`` is asked (else the topmost answer counts), and
    whether a complete base edition must implement it (a ``topic``)."""

    name: str
    returns: type | tuple[type, ...]
    many: bool = False
    may_return_none: bool = False
    every_layer: bool = False
    topic: bool = True

    @property
    def signature(self) -> tuple[str, ...]:
        return tuple(inspect.signature(globals()[self.name]).parameters)

    @property
    def returns_text(self) -> str:
        kinds = (self.returns,) if isinstance(self.returns, type) else self.returns
        text = " or ".join(f"`{k.__name__}`" for k in kinds)
        return f"list of {text}" if self.many else text

    @property
    def summary(self) -> str:
        """The first line of the hook's docstring (what to return)."""
        return (inspect.getdoc(globals()[self.name]) or "").split("\n\n")[0].replace(
            "\n", " ").replace("``", "`")


HOOKS: tuple[Hook, ...] = (
    #     name                     returns        many  None   every layer  topic
    Hook("edition_info", EditionInfo, topic=False),
    Hook("edition_parameters", Parameter, many=True, every_layer=True, topic=False),
    Hook("applicability", Check, many=True),
    Hook("effective_flange_width", Envelope),
    Hook("concrete_law", MaterialModel),
    Hook("steel_law", MaterialModel),
    Hook("resistance_factor", Resistance),
    Hook("design_actions", Envelope, may_return_none=True),
    Hook("minimum_reinforcement", Check, many=True),
    Hook("ductility_limits", Check, many=True),
    Hook("additional_checks", Check, many=True, every_layer=True, topic=False),
    Hook("detailing_limits", DetailingLimits, may_return_none=True, topic=False),
)
"""Every hook, in the order the engine calls them."""

BY_NAME = {hook.name: hook for hook in HOOKS}

for _hook in HOOKS:
    hookspec(firstresult=not _hook.every_layer)(globals()[_hook.name])

TOPICS = tuple(hook.name for hook in HOOKS if hook.topic)
"""Topic hooks a complete base edition must answer (an extending edition needs none)."""


def guide_table() -> str:
    """The hook table of the author guide (DEVELOPERS.md), made from :data:`HOOKS`."""
    rows = ["| Hook | Returns | May return `None` | Layers asked | What to return |",
            "|---|---|---|---|---|"]
    for hook in HOOKS:
        asked = "every layer, all kept" if hook.every_layer else "topmost answer"
        none = "yes" if hook.may_return_none else "no"
        rows.append(f"| `{hook.name}({', '.join(hook.signature)})` | {hook.returns_text} "
                    f"| {none} | {asked} | {hook.summary} |")
    return "\n".join(rows) + "\n"
