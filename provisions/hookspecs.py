"""The hooks an edition implements: the plugin author's reference.

An edition is a module (or object) whose functions are marked with
``@hookimpl`` from ``clausewise.provisions``. It is registered through the
entry-point group ``clausewise.editions``. Every function may accept any subset
of a hook's arguments (pluggy passes only those it names), so new arguments can
be added later without breaking anyone.

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

Topic hooks are ``firstresult``: the topmost edition of a layered stack that
returns something other than ``None`` answers, the rest fall through to the
base. An edition that ``extends`` another implements only the topics it changes.

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

from collections.abc import Sequence
from typing import Any

import pluggy

from clausewise.provisions.answers import EditionInfo, MaterialModel, Parameters, Resistance
from clausewise.provisions.beam import Beam, Context
from clausewise.provisions.vocabulary import Check, Envelope, Parameter

PROJECT = "clausewise"
hookspec = pluggy.HookspecMarker(PROJECT)
hookimpl = pluggy.HookimplMarker(PROJECT)


# --- who the edition is --------------------------------------------------------------

@hookspec(firstresult=True)
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


@hookspec
def edition_parameters(context: Context) -> Sequence[Parameter]:
    """Return this edition's named parameters (every layer is asked; upper layers win).

    Each ``Parameter(name, value, clause, description, bounds, unit)`` is a value an
    annex or a firm may change: partial factors, αcc, k1-k4, steel-ratio
    coefficients, preferred limits. ``bounds`` are the values a parameter file may
    set; outside them the file is refused. An extending edition returns only the
    parameters it changes, with its own clause, so the audit names it as supplier.
    """


# --- scope ---------------------------------------------------------------------------

@hookspec(firstresult=True)
def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    """Return the checks that keep the edition inside its range of validity.

    Typically concrete and steel strength ranges: ``Check("concrete strength in
    range", fc, lower, Sense.AT_LEAST, clause)`` and an upper bound alike. When any
    fails the engine reports the beam as outside the edition's scope and computes
    no resistance: rules are never extrapolated.
    """


# --- geometry ------------------------------------------------------------------------

@hookspec(firstresult=True)
def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    """Return the effective flange width (mm) as ``Envelope.smallest`` of candidates.

    Called only for T and L beams. ``beam.layout`` gives span, continuity, clear
    distances to the neighbouring webs (``None`` on a side without slab) and, where
    known, the distance between points of zero moment; ``beam.flange_width`` is an
    outright width the engineer gave (include it as a candidate when present). For
    hogging the flange is in tension and the width serves minimum steel only.
    Each candidate is a total width including the web, e.g.
    ``Candidate("16 hf + bw", 16 * hf + bw, clause)``.
    """


# --- materials -----------------------------------------------------------------------

@hookspec(firstresult=True)
def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    """Return the concrete law for the ultimate state and the factors behind it.

    ``MaterialModel(RectangularBlock(stress, depth_factor, ultimate_strain), factors)``
    or ``ParabolaRectangle(peak_stress, strain_at_peak, ultimate_strain, exponent)``.
    ``stress`` is the block intensity multiplied out (0.85 f'c; η αcc fck/γc;
    α1 φc f'c). Return every derived value as a ``Factor`` (β1 with its basis...).
    """


@hookspec(firstresult=True)
def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    """Return the reinforcement's law (same in tension and compression) and factors.

    ``ElasticPlastic(modulus, yield_stress)``, ``BilinearHardening(...)`` or
    ``PiecewiseLinear(points)``, with design values where the edition factors the
    materials (fyd = fyk/γs, φs fy). The core never assumes that steel yields.
    """


# --- strength ------------------------------------------------------------------------

@hookspec(firstresult=True)
def resistance_factor(beam: Beam, response: Any, params: Parameters,
                      context: Context) -> Resistance:
    """Return the member factor applied to the nominal moment.

    ``response`` is the solved section (``c``, ``net_tensile_strain``,
    ``c_over_dt``, ``nominal_moment`` N·mm, ``block_in_flange``...). Return
    ``Resistance(Factor("φ", value, clause, basis), Regime(name, clause), requirement)``
    where ``requirement`` is the clause demanding design strength ≥ demand. Editions
    with partial factors on the materials return a factor of 1.0.
    """


@hookspec(firstresult=True)
def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope:
    """Return the factored moment (N·mm) as ``Envelope.largest`` of load combinations.

    From ``beam.actions.dead`` / ``.live`` (service moments), e.g.
    ``Candidate("1.2D + 1.6L", 1.2 * D + 1.6 * L, clause)``; when
    ``beam.actions.factored`` is given, a single candidate "as given". Return
    ``None`` when the beam has no actions: the engine then reports capacity only.
    """


# --- reinforcement limits ------------------------------------------------------------

@hookspec(firstresult=True)
def minimum_reinforcement(beam: Beam, section: Any, response: Any, demand: Envelope | None,
                          resistance: Resistance, params: Parameters,
                          context: Context) -> Sequence[Check]:
    """Return the minimum-reinforcement checks (steel area mm², or strength N·mm).

    ``section`` gives gross properties of the section with its effective flange
    (``section.area``, ``.centroid``, ``.second_moment``, ``.max_width``) and
    ``section.cracking_moment(fr)``. ``demand`` (the factored-moment envelope, or
    None) and ``resistance`` (the member factor) are those of this assessment, as
    answered by the whole stack, so a waiver (e.g. provided steel ≥ 4/3 of that
    required by analysis) uses the same numbers as the strength check.
    """


@hookspec(firstresult=True)
def ductility_limits(beam: Beam, section: Any, response: Any, params: Parameters,
                     context: Context) -> Sequence[Check]:
    """Return the maximum-reinforcement and ductility checks.

    Net tensile strain at least a limit, c/d or x/d at most a limit, steel area at
    most a fraction of the concrete area (``section.area`` is the gross area):
    whatever the edition sets.
    """


@hookspec
def additional_checks(beam: Beam, section: Any, response: Any, params: Parameters,
                      context: Context) -> Sequence[Check]:
    """Return further checks; every layer of the stack is asked and all are kept.

    This is where a firm adds its own rule on top of a standard.
    """


# --- detailing -----------------------------------------------------------------------

@hookspec(firstresult=True)
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


TOPICS = (
    "applicability", "effective_flange_width", "concrete_law", "steel_law",
    "resistance_factor", "design_actions", "minimum_reinforcement", "ductility_limits",
)
"""Topic hooks a complete base edition must answer (an extending edition needs none)."""
