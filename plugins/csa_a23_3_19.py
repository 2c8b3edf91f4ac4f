"""CSA A23.3-19, design of concrete structures (Canada), SI form.

Safety is applied to the materials, not to the member: φc multiplies the
concrete block and φs the steel force, so the moment the section develops is
already the factored resistance Mr and the member factor is 1. Values from
memory of the published standard; clause titles are our own words.

Contents
  scope ............. 8.6.1.1 concrete strength, 8.5.1 steel strength, 10.7.1 deep members
  flange width ...... 10.3.3 T-beam overhangs, 10.3.4 L-beam overhang
  concrete .......... 8.4.2 φc, 10.1.3 ultimate strain, 10.1.7 α1 and β1
  steel ............. 8.4.3 φs, 8.5.4.1 Es, elastic-plastic
  strength .......... 8.4 material resistance factors, 8.1.3 Mr ≥ Mf
  demand ............ national building code load combinations (NBC 4.1.3.2)
  limits ............ 10.5.1.2 minimum steel, 10.5.2 c/d limit
  detailing ......... 6.6.5.2 bar spacing, 10.6.1 crack control z, cover
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from clausewise.provisions import (
    Beam,
    Candidate,
    Check,
    Context,
    Continuity,
    DetailingLimits,
    EditionInfo,
    ElasticPlastic,
    Envelope,
    Factor,
    MaterialModel,
    Notation,
    OverhangRule,
    Parameter,
    Parameters,
    RectangularBlock,
    Regime,
    Resistance,
    Sense,
    aggregate_size,
    cylinder_strength,
    dead_alone_and_with_live,
    factored_moment,
    half_clear_distance,
    hookimpl,
    largest_of,
    overhang_envelope,
    per_beam,
    ratio_parameter,
    smallest_of,
    span_depth_check,
    sqrt,
    stirrup_diameter,
)

EDITION = EditionInfo(
    "csa-a23.3:19", "CSA A23.3-19 design of concrete structures", 2019,
    summary="Canadian standard; material resistance factors φc and φs inside the forces",
    notation=Notation("f'c", "fy", "c", "εs", "Mr", "Mr", "Mf"),
)
clause = EDITION.clause
LOADS = clause("NBC 4.1.3.2", "load combinations of the national building code")


@hookimpl
def edition_info() -> EditionInfo:
    return EDITION


@hookimpl
def edition_parameters(context: Context) -> Sequence[Parameter]:
    return [
        Parameter("phi_c", 0.65, clause("8.4.2", "resistance factor for concrete"),
                  "φc on the concrete block (cast in place)", (0.5, 1.0)),
        Parameter("phi_s", 0.85, clause("8.4.3", "resistance factor for reinforcing bars"),
                  "φs on the steel force", (0.5, 1.0)),
        Parameter("ultimate_strain", 0.0035, clause("10.1.3", "ultimate concrete strain"),
                  "strain at the extreme compression fibre", (0.002, 0.005)),
        Parameter("steel_modulus", 200_000.0, clause("8.5.4.1", "modulus of reinforcement"),
                  "200 000 MPa", (150_000.0, 210_000.0), "MPa"),
        Parameter("fc_min", 20.0, clause("8.6.1.1", "range of specified concrete strength"),
                  "least f'c", (10.0, 30.0), "MPa"),
        Parameter("fc_max", 80.0, clause("8.6.1.1", "range of specified concrete strength"),
                  "greatest f'c", (50.0, 120.0), "MPa"),
        Parameter("fy_max", 500.0, clause("8.5.1", "greatest specified yield strength"),
                  "greatest fy used in design", (300.0, 700.0), "MPa"),
        Parameter("deep_beam_ratio", 2.0, clause("10.7.1", "deep flexural members: clear span "
                  "below 2 h"), "least clear span over overall depth of a member designed by "
                  "flexure (from memory)", (1.0, 10.0)),
        Parameter("min_steel_coefficient", 0.2,
                  clause("10.5.1.2", "minimum tension reinforcement"),
                  "coefficient of √f'c/fy·bt·h", (0.1, 0.5)),
        Parameter("tension_flange_limit", 1.5,
                  clause("10.5.1.2", "bt of a flange in tension need not exceed 1.5bw"),
                  "multiple of bw beyond which a tension flange on one side of the web "
                  "does not add to bt (from memory)", (1.0, 10.0)),
        Parameter("tension_flanges_limit", 2.5,
                  clause("10.5.1.2", "bt of flanges in tension need not exceed 2.5bw"),
                  "multiple of bw beyond which tension flanges on both sides of the web "
                  "do not add to bt (from memory)", (1.0, 10.0)),
        Parameter("ductility_constant", 700.0, clause("10.5.2", "limit on c/d"),
                  "c/d at most k/(k + fy); k = εcu·Es = 700 MPa", (400.0, 1000.0), "MPa"),
        ratio_parameter(clause("-", "cylinder about 0.8 of cube strength: common practice, "
                               "not CSA text")),
        Parameter("dead_only_factor", 1.4, LOADS, "load case 1: 1.4D", (1.0, 2.0)),
        Parameter("dead_factor", 1.25, LOADS, "load case 2: 1.25D + 1.5L", (1.0, 2.0)),
        Parameter("live_factor", 1.5, LOADS, "load case 2: 1.25D + 1.5L", (1.0, 2.0)),
    ]


# --- scope ----------------------------------------------------------------------------

@hookimpl
def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    fc = cylinder_strength(beam, params).value
    return [
        Check("concrete strength at least the least covered", fc, params.value("fc_min"),
              Sense.AT_LEAST, params["fc_min"].clause, "f'c", "MPa"),
        Check("concrete strength at most the greatest covered", fc, params.value("fc_max"),
              Sense.AT_MOST, params["fc_max"].clause, "f'c", "MPa"),
        Check("yield strength within the design limit", beam.yield_strength,
              params.value("fy_max"), Sense.AT_MOST, params["fy_max"].clause, "fy", "MPa"),
        *span_depth_check(beam, params.value("deep_beam_ratio"), params["deep_beam_ratio"].clause),
    ]


# --- effective flange width -------------------------------------------------------------

def _tee_span_limit(continuity: Continuity) -> tuple[int, str]:
    """Span divisor of the T-beam overhang rule, and its label, for the span's continuity."""
    if continuity is Continuity.SIMPLE:
        return 5, "span/5 (simply supported)"
    if continuity is Continuity.CANTILEVER:  # our choice: the smaller, continuous limit
        return 10, "span/10 (cantilever taken as continuous)"
    return 10, "span/10 (continuous)"


@hookimpl
def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    hf = np.asarray(beam.flange_thickness, float)
    layout = beam.layout
    sides = len(half_clear_distance(beam))
    if beam.slab_sides() == 2:
        where, slab_limit = clause("10.3.3", "T-beam overhang on each side"), 12
    else:
        where, slab_limit = clause("10.3.4", "L-beam overhang"), 6
    rules = [OverhangRule(f"{slab_limit}hf", (slab_limit * hf,) * sides, where)]
    if layout is not None:
        divisor, label = _tee_span_limit(layout.continuity) if sides == 2 else (12, "span/12")
        rules += [
            OverhangRule(label, (np.asarray(layout.span, float) / divisor,) * sides, where),
            OverhangRule("half the clear distance to the next web", half_clear_distance(beam),
                         where),
        ]
    return overhang_envelope(beam, rules)


# --- materials --------------------------------------------------------------------------

STRESS_BLOCK = clause("10.1.7", "equivalent rectangular stress block")


def alpha1(fc: Any) -> Factor:
    """Block intensity factor: 0.85 - 0.0015 f'c, at least 0.67."""
    return Factor("α1", largest_of(0.85 - 0.0015 * np.asarray(fc, float), 0.67), STRESS_BLOCK,
                  "0.85 - 0.0015 f'c, at least 0.67")


def beta1(fc: Any) -> Factor:
    """Block depth factor: 0.97 - 0.0025 f'c, at least 0.67."""
    return Factor("β1", largest_of(0.97 - 0.0025 * np.asarray(fc, float), 0.67), STRESS_BLOCK,
                  "0.97 - 0.0025 f'c, at least 0.67")


@hookimpl
def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    fc = cylinder_strength(beam, params)
    a1, b1 = alpha1(fc.value), beta1(fc.value)
    phi_c = params.value("phi_c")
    eps_cu = params.value("ultimate_strain")
    # φc acts on the block, so bars inside it also displace α1 φc f'c of concrete
    stress = Factor("α1 φc f'c", a1.value * phi_c * np.asarray(fc.value, float), STRESS_BLOCK,
                    f"factored block intensity; {params.cite('phi_c')}", "MPa")
    return MaterialModel(
        RectangularBlock(per_beam(stress.value), b1.value, eps_cu),
        (fc, a1, b1, Factor("φc", phi_c, params["phi_c"].clause), stress,
         Factor("εcu", eps_cu, params["ultimate_strain"].clause)),
    )


@hookimpl
def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    es = beam.steel_modulus if beam.steel_modulus is not None else params.value("steel_modulus")
    fy = np.asarray(beam.yield_strength, float)
    phi_s = params.value("phi_s")
    # φs·fs with fs = Es·εs ≤ fy from compatibility is the same law as one with modulus
    # φs·Es and plateau φs·fy: the yield strain fy/Es is unchanged.
    return MaterialModel(
        ElasticPlastic(per_beam(phi_s * np.asarray(es, float)), per_beam(phi_s * fy)),
        (Factor("fy", beam.yield_strength, clause("8.5.1", "specified yield strength"),
                "specified yield strength", "MPa"),
         Factor("Es", es, params["steel_modulus"].clause, params["steel_modulus"].description,
                "MPa"),
         Factor("φs", phi_s, params["phi_s"].clause, "applied to the steel stress"),
         Factor("φs fy", per_beam(phi_s * fy), params["phi_s"].clause, "factored plateau", "MPa"),
         Factor("εy", per_beam(fy / es), clause("8.5.4.1", "yield strain"), "fy/Es, unfactored")),
    )


# --- strength ---------------------------------------------------------------------------

@hookimpl
def resistance_factor(beam: Beam, response: Any, params: Parameters,
                      context: Context) -> Resistance:
    factors = clause("8.4", "material resistance factors")
    return Resistance(
        Factor("member factor", 1.0, factors, "φc and φs already act inside the forces, "
               "so the section's moment is the factored resistance Mr"),
        Regime("material resistance factors", factors,
               "concrete and steel forces are factored, not the member"),
        clause("8.1.3", "factored resistance at least the factored load effect"),
    )


@hookimpl
def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope | None:
    return factored_moment(beam, dead_alone_and_with_live(params),
                           LOADS, name="factored moment", symbol="Mf")


# --- reinforcement limits ---------------------------------------------------------------

@hookimpl
def minimum_reinforcement(beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> Sequence[Check]:
    fc, fy = cylinder_strength(beam, params).value, np.asarray(beam.yield_strength, float)
    if beam.flanged and not beam.flange_in_compression:
        sides = beam.slab_sides()
        cap = params.value("tension_flange_limit" if sides == 1 else "tension_flanges_limit")
        bt = smallest_of(section.max_width, cap * np.asarray(beam.web_width, float))
        where = "a flange on one side" if sides == 1 else "flanges on both sides"
        note = f"bt = effective flange width in tension, at most {cap:g}bw for {where}"
    else:
        bt, note = np.asarray(beam.web_width, float), "bt = bw (tension zone in the web)"
    coefficient = params.value("min_steel_coefficient")
    required = coefficient * sqrt(fc) / fy * bt * np.asarray(beam.depth, float)
    return [Check("minimum tension reinforcement", beam.tension_area, per_beam(required),
                  Sense.AT_LEAST, params["min_steel_coefficient"].clause, "As", "mm²",
                  f"{coefficient:g}√f'c/fy·bt·h with h the overall depth; {note}")]


@hookimpl
def ductility_limits(beam: Beam, response: Any, params: Parameters,
                     context: Context) -> Sequence[Check]:
    k = params.value("ductility_constant")
    limit = k / (k + np.asarray(beam.yield_strength, float))
    return [Check("neutral-axis depth ratio", per_beam(response.c / beam.effective_depth),
                  per_beam(limit), Sense.AT_MOST, params["ductility_constant"].clause, "c/d", "",
                  f"c from the factored forces; d to the tension steel centroid; "
                  f"limit {k:g}/({k:g} + fy)")]



# --- detailing (6.6.5.2 spacing of bars, 10.6.1 crack control, cover) -----------------

@hookimpl
def detailing_limits(beam: Beam, diameter: Any, params: Parameters,
                     context: Context) -> DetailingLimits:
    """Clear distance the greatest of 1.4 db, 1.4 × the aggregate size and 30 mm (Annex A
    / 6.6.5.2, carried from CSA A23.1). Crack control (10.6.1): z = fs (dc A)^(1/3) ≤
    30 000 N/mm for interior exposure with fs = 0.6 fy; with A = 2 dc s per bar this is
    s ≤ z³ / (2 fs³ dc²). Default cover 30 mm for interior beams (CSA A23.1 Table 17,
    not recalled with confidence: common practice); all from memory."""
    spacing = clause("6.6.5.2", "clear distance between parallel bars")
    aggregate = np.asarray(aggregate_size(beam), float)
    terms = [Candidate("1.4 db", per_beam(1.4 * np.asarray(diameter, float)), spacing),
             Candidate("1.4 × aggregate size", per_beam(1.4 * aggregate), spacing),
             Candidate("30 mm", 30.0, spacing)]
    cover_value = 30.0
    dc = (np.asarray(beam.cover if beam.cover is not None else cover_value, float)
          + stirrup_diameter(beam) + np.asarray(diameter, float) / 2)
    fs = 0.6 * np.asarray(beam.yield_strength, float)
    z = 30_000.0
    crack = clause("10.6.1", "crack control parameter z, interior exposure")
    return DetailingLimits(
        Envelope.largest("least clear distance between bars", "s_min", terms, "mm"),
        Envelope.largest("least clear distance between layers", "s_v", terms, "mm"),
        Envelope.smallest("largest bar spacing for crack control", "s_max", [
            Candidate("z³/(2 fs³ dc²), z = 30 000 N/mm, fs = 0.6 fy",
                      per_beam(z**3 / (2 * fs**3 * dc**2)), crack)], "mm"),
        Factor("cover", cover_value, clause("A23.1 Table 17", "cover of interior beams "
                                            "(common practice)"), "30 mm", "mm"))
