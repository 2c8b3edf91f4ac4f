"""ACI 318-19, in its SI form and its inch-pound form.

The two published forms are soft conversions of each other, so their
coefficients differ slightly (β1 starts falling at 28 MPa or at 4000 psi;
As,min uses 0.25√f'c or 3√f'c). Each rule below evaluates the form in use,
taking strengths in psi for the inch-pound form. Values from memory of the
published code; clause titles are our own words.

Contents
  scope ............. 19.2.1.1 concrete strength, 20.2.2.4 steel strength
  flange width ...... 6.3.2.1 overhang limits, 6.3.2.2 isolated T
  concrete .......... 22.2.2.1 ultimate strain, 22.2.2.4.1 block, 22.2.2.4.3 β1
  steel ............. 20.2.2.1-2 elastic-plastic, Es
  strength .......... 21.2.2 φ by net tensile strain, 9.5.1.1 φMn ≥ Mu
  demand ............ 5.3.1 load combinations
  limits ............ 9.6.1.2-3 minimum steel, 9.3.3.1 net tensile strain
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from clausewise.provisions import (
    MPA_PER_PSI,
    Beam,
    Candidate,
    Check,
    Context,
    EditionInfo,
    ElasticPlastic,
    Envelope,
    Factor,
    MaterialModel,
    Parameter,
    Parameters,
    RectangularBlock,
    Regime,
    Resistance,
    Sense,
    choose,
    clamp,
    cylinder_strength,
    hookimpl,
    largest_of,
    smallest_of,
    sqrt,
)
from clausewise.provisions.widths import OverhangRule, half_clear_distance, overhang_envelope

EDITION = EditionInfo(
    "aci318-19", "ACI 318-19 structural concrete building code", 2019,
    forms=("SI", "inch-pound"),
    summary="US code; member factor φ from the net tensile strain",
)
clause = EDITION.clause
INCH_POUND = "inch-pound"


def psi(value_mpa: Any) -> Any:
    return np.asarray(value_mpa, float) / MPA_PER_PSI


@hookimpl
def edition_info() -> EditionInfo:
    return EDITION


@hookimpl
def edition_parameters(context: Context) -> Sequence[Parameter]:
    ip = context.form == INCH_POUND
    return [
        Parameter("ultimate_strain", 0.003, clause("22.2.2.1", "ultimate concrete strain"),
                  "strain at the extreme compression fibre", (0.002, 0.004)),
        Parameter("block_intensity", 0.85, clause("22.2.2.4.1", "stress block intensity"),
                  "block stress as a fraction of f'c", (0.6, 1.0)),
        Parameter("steel_modulus", 29_000_000 * MPA_PER_PSI if ip else 200_000.0,
                  clause("20.2.2.2", "modulus of reinforcement"),
                  "29 000 ksi" if ip else "200 000 MPa", (150_000.0, 210_000.0), "MPa"),
        Parameter("phi_tension", 0.90, clause("21.2.2", "φ tension-controlled"),
                  "member factor when tension-controlled", (0.5, 1.0)),
        Parameter("phi_compression", 0.65, clause("21.2.2", "φ compression-controlled"),
                  "member factor when compression-controlled (other than spiral)", (0.5, 1.0)),
        Parameter("tension_controlled_margin", 0.003,
                  clause("21.2.2", "tension-controlled limit εty + 0.003"),
                  "εt beyond εty for tension control", (0.001, 0.01)),
        Parameter("min_net_tensile_strain", 0.004,
                  clause("9.3.3.1", "net tensile strain of beams"),
                  "least εt of a non-prestressed beam", (0.002, 0.01)),
        Parameter("fc_min", 2500 * MPA_PER_PSI if ip else 17.0,
                  clause("19.2.1.1", "least specified concrete strength"),
                  "2500 psi" if ip else "17 MPa", (10.0, 30.0), "MPa"),
        Parameter("fy_max", 80_000 * MPA_PER_PSI if ip else 550.0,
                  clause("20.2.2.4", "greatest yield strength for flexure"),
                  "80 000 psi" if ip else "550 MPa", (300.0, 700.0), "MPa"),
        Parameter("dead_only_factor", 1.4, clause("5.3.1", "combination (a): 1.4D"),
                  "factor on dead load alone", (1.0, 2.0)),
        Parameter("dead_factor", 1.2, clause("5.3.1", "combination (b): 1.2D + 1.6L"),
                  "dead-load factor with live load", (1.0, 2.0)),
        Parameter("live_factor", 1.6, clause("5.3.1", "combination (b): 1.2D + 1.6L"),
                  "live-load factor", (1.0, 2.0)),
    ]


# --- scope ----------------------------------------------------------------------------

@hookimpl
def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    fc = cylinder_strength(beam).value
    return [
        Check("concrete strength at least the code minimum", fc, params.value("fc_min"),
              Sense.AT_LEAST, params["fc_min"].clause, "f'c", "MPa"),
        Check("yield strength within the flexure limit", beam.yield_strength,
              params.value("fy_max"), Sense.AT_MOST, params["fy_max"].clause, "fy", "MPa"),
    ]


# --- effective flange width -------------------------------------------------------------

@hookimpl
def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    hf = beam.flange_thickness
    layout = beam.layout
    tee = beam.slab_sides() == 2
    slab_limit, span_divisor = (8, 8) if tee else (6, 12)
    sides = len(half_clear_distance(beam))
    rules = [OverhangRule(f"{slab_limit}hf", (slab_limit * np.asarray(hf, float),) * sides,
                          clause("6.3.2.1", "overhang limit from slab thickness"))]
    if layout is not None:
        rules.append(OverhangRule("sw/2", half_clear_distance(beam),
                                  clause("6.3.2.1", "overhang limit from clear web spacing")))
        clear = layout.clear_span
        label = f"ln/{span_divisor}" if clear is not None else \
            f"ln/{span_divisor} (ln taken as the span: clear span not given)"
        ln = layout.span if clear is None else clear
        rules.append(OverhangRule(label, (np.asarray(ln, float) / span_divisor,) * sides,
                                  clause("6.3.2.1", "overhang limit from clear span")))
    extra = []
    if layout is None and tee:  # an isolated T: its flange may be used up to 4 bw
        extra.append(Candidate("4 bw (isolated T)", 4 * np.asarray(beam.web_width, float),
                               clause("6.3.2.2", "isolated T-beam flange")))
    return overhang_envelope(beam, rules, extra)


# --- materials --------------------------------------------------------------------------

def beta1(fc_mpa: Any, form: str) -> Factor:
    """Depth factor of the block (Table 22.2.2.4.3) in the form in use."""
    if form == INCH_POUND:
        value = clamp(0.85 - 0.05 * (psi(fc_mpa) - 4000.0) / 1000.0, 0.65, 0.85)
        basis = "0.85 - 0.05 (f'c - 4000 psi)/1000 psi, within 0.65..0.85"
    else:
        value = clamp(0.85 - 0.05 * (np.asarray(fc_mpa, float) - 28.0) / 7.0, 0.65, 0.85)
        basis = "0.85 - 0.05 (f'c - 28 MPa)/7 MPa, within 0.65..0.85"
    return Factor("β1", value, clause("22.2.2.4.3", "depth factor of the stress block"), basis)


@hookimpl
def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    fc = cylinder_strength(beam)
    b1 = beta1(fc.value, context.form)
    alpha = params.value("block_intensity")
    eps_cu = params.value("ultimate_strain")
    stress = Factor("0.85 f'c", alpha * np.asarray(fc.value, float),
                    params["block_intensity"].clause, params.cite("block_intensity"), "MPa")
    return MaterialModel(
        RectangularBlock(stress.value, b1.value, eps_cu),
        (fc, stress, b1, Factor("εcu", eps_cu, params["ultimate_strain"].clause)),
    )


@hookimpl
def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    es = beam.steel_modulus if beam.steel_modulus is not None else params.value("steel_modulus")
    fy = beam.yield_strength
    return MaterialModel(
        ElasticPlastic(es, fy),
        (Factor("fy", fy, clause("20.2.2.1", "elastic-plastic reinforcement"),
                "specified yield strength", "MPa"),
         Factor("Es", es, params["steel_modulus"].clause, params["steel_modulus"].description,
                "MPa"),
         Factor("εty", np.asarray(fy, float) / es, clause("21.2.2.1", "yield strain"),
                "fy/Es")),
    )


# --- strength ---------------------------------------------------------------------------

def strength_factor(beam: Beam, eps_t: Any, params: Parameters) -> tuple[Factor, Regime]:
    es = beam.steel_modulus if beam.steel_modulus is not None else params.value("steel_modulus")
    eps_ty = np.asarray(beam.yield_strength, float) / es
    margin = params.value("tension_controlled_margin")
    phi_t, phi_c = params.value("phi_tension"), params.value("phi_compression")
    phi = clamp(phi_c + (phi_t - phi_c) * (np.asarray(eps_t, float) - eps_ty) / margin,
                phi_c, phi_t)
    name = choose(eps_t >= eps_ty + margin, "tension-controlled",
                  choose(eps_t <= eps_ty, "compression-controlled", "transition"))
    table = clause("21.2.2", "strength reduction factor by net tensile strain")
    return (Factor("φ", phi, table, f"εt against εty = fy/Es and εty + {margin:g}"),
            Regime(name, table, "set by the net tensile strain of the extreme layer"))


@hookimpl
def resistance_factor(beam: Beam, response: Any, params: Parameters,
                      context: Context) -> Resistance:
    factor, regime = strength_factor(beam, response.net_tensile_strain, params)
    return Resistance(factor, regime, clause("9.5.1.1", "design strength at least demand"))


@hookimpl
def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope | None:
    a = beam.actions
    combos = clause("5.3.1", "factored load combinations")
    if a.factored is not None:
        return Envelope.largest("factored moment", "Mu", [
            Candidate("as given", a.factored, clause("5.3.1", "factored moment as given"))],
            "N·mm")
    if a.dead is None:
        return None
    dead = np.asarray(a.dead, float)
    live = np.asarray(a.live if a.live is not None else 0.0, float)
    d1, d2, l2 = (params.value(n) for n in ("dead_only_factor", "dead_factor", "live_factor"))
    return Envelope.largest("factored moment", "Mu", [
        Candidate(f"{d1:g}D", _out(d1 * dead), combos),
        Candidate(f"{d2:g}D + {l2:g}L", _out(d2 * dead + l2 * live), combos),
    ], "N·mm")


# --- reinforcement limits ---------------------------------------------------------------

def minimum_area(beam: Beam, width: Any, form: str) -> Any:
    """As,min of 9.6.1.2 for a web (or tension-flange) width in mm."""
    fc, fy = cylinder_strength(beam).value, np.asarray(beam.yield_strength, float)
    d = beam.effective_depth
    if form == INCH_POUND:
        ratio = largest_of(3 * sqrt(psi(fc)) / psi(fy), 200 / psi(fy))
    else:
        ratio = largest_of(0.25 * sqrt(fc) / fy, 1.4 / fy)
    return ratio * np.asarray(width, float) * d


@hookimpl
def minimum_reinforcement(beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> Sequence[Check]:
    bw = np.asarray(beam.web_width, float)
    width, width_note = bw, "bw"
    if beam.flanged and not beam.flange_in_compression and beam.statically_determinate:
        width = smallest_of(section.max_width, 2 * bw)
        width_note = "lesser of bf and 2bw (flange in tension)"
    required = minimum_area(beam, width, context.form)
    # 9.6.1.3: not needed where the steel provided is at least 4/3 of that required by
    # analysis; the area required is estimated as As·Mu/(φMn), which errs on the safe side.
    demand = design_actions(beam, params, context)
    note = f"width {width_note}"
    limit = required
    if demand is not None:
        phi, _ = strength_factor(beam, response.net_tensile_strain, params)
        with np.errstate(divide="ignore", invalid="ignore"):
            by_analysis = beam.tension_area * demand.value / (phi.value * response.nominal_moment)
        limit = smallest_of(required, 4.0 / 3.0 * by_analysis)
        note += "; waived to 4/3 of the area required by analysis where smaller (9.6.1.3)"
    return [Check("minimum tension reinforcement", beam.tension_area, _out(limit),
                  Sense.AT_LEAST, clause("9.6.1.2", "minimum flexural reinforcement"),
                  "As", "mm²", note)]


@hookimpl
def ductility_limits(beam: Beam, response: Any, params: Parameters,
                     context: Context) -> Sequence[Check]:
    return [Check("net tensile strain", response.net_tensile_strain,
                  params.value("min_net_tensile_strain"), Sense.AT_LEAST,
                  params["min_net_tensile_strain"].clause, "εt")]


def _out(value: Any) -> Any:
    return value if np.ndim(value) else float(value)
