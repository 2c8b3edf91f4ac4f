"""IS 456:2000, limit state of collapse in flexure.

IS 456 works in the characteristic cube strength fck: a beam given in cylinder
strength is converted by a basis that is not IS 456 text, named in the audit (the
class pairs of EN 1992-1-1:2004 Table 3.1, or the ratio 0.8 of common practice).
Safety sits in partial factors on the materials, so there is no member factor;
ductility is a limit on the neutral-axis depth. Values from memory of the published
code; clause titles are our own words.

Contents
  scope ............. Table 2 concrete grades, 5.6 reinforcement grades, 29.1 deep beams
  flange width ...... 23.1.2 (a) T-beams, (b) L-beams, (c) isolated beams
  concrete .......... 38.1(b) ultimate strain, 38.1(c) and Fig. 21 parabola-rectangle,
                      resultants as printed (0.36, 0.42) or the exact curve, by choice
  steel ............. 38.1(e) and Fig. 23: mild steel, cold-worked bars; 5.6.3 Es
  strength .......... 36.4.2 partial factors on materials; 38.1 note, xu,max
  demand ............ 36.4.1 and Table 18 load factors
  limits ............ 26.5.1.1 (a) minimum and (b) maximum tension steel, 38.1 xu ≤ xu,max
  detailing ......... 26.3.2 bar spacing, 26.3.3(b) largest spacing, 26.4.2 cover
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from clausewise.provisions import (
    Beam,
    BeamDataError,
    Candidate,
    Check,
    ClassTable,
    Combination,
    Context,
    Continuity,
    DetailingLimits,
    EditionInfo,
    Envelope,
    Factor,
    FloorLayout,
    MaterialModel,
    Notation,
    ParabolaRectangle,
    Parameter,
    Parameters,
    PiecewiseLinear,
    Regime,
    Resistance,
    Sense,
    Shape,
    aggregate_size,
    choose,
    cube_strength,
    factored_moment,
    given_width,
    half_clear_distance,
    hookimpl,
    per_beam,
    ratio_parameter,
    span_depth_check,
)

EDITION = EditionInfo(
    "is456:2000", "IS 456:2000 plain and reinforced concrete, code of practice", 2000,
    summary="Indian code; cube strength, partial factors on the materials, xu ≤ xu,max",
    notation=Notation("fck", "fy", "xu", "εs", "Mu,R", "Mu,R", "Mu", cube=True),
)
clause = EDITION.clause
CONVERSION = clause("- (not IS 456 text)", "cube from cylinder strength by the class pairs of "
                    "EN 1992-1-1:2004 Table 3.1")

STEEL_KINDS = ("unstated", "hot-rolled", "cold-worked", "mild")

# Fig. 23A design curve of cold-worked bars: stress as a fraction of fy/γm at an
# inelastic strain; total strain = stress/Es + inelastic strain (38.1(e), from memory)
FIG23_STRESS = (0.80, 0.85, 0.90, 0.95, 0.975, 1.0)
FIG23_INELASTIC = (0.0, 0.0001, 0.0003, 0.0007, 0.0010, 0.0020)

# Cylinder/cube class pairs as EN 1992-1-1:2004 Table 3.1 tabulates them (MPa, from memory):
# the default basis for a beam given in cylinder strength; not IS 456 text
CLASS_PAIRS = ((12, 15), (16, 20), (20, 25), (25, 30), (30, 37), (35, 45), (40, 50), (45, 55),
               (50, 60), (55, 67), (60, 75), (70, 85), (80, 95), (90, 105))
BY_CLASS_PAIRS, BY_RATIO = "class pairs", "ratio"
CLASS_TABLE = ClassTable(CLASS_PAIRS, CONVERSION, "EN 1992-1-1:2004 Table 3.1")

# Note to 38.1: xu,max/d for the three grades the code tabulates (from memory)
XU_MAX_TABLE = {250.0: 0.53, 415.0: 0.48, 500.0: 0.46}

# The two readings of the stress resultants of 38.1 and Annex G-1.1 (a contested reading):
# the coefficients as printed, 0.36 fck b xu at 0.42 xu (so Mu,lim/(fck b d²) = 0.138 for
# Fe 415, as design handbooks tabulate it), or the exact integral of the design curve of
# Fig. 21, 0.3616 fck b xu at 0.416 xu (0.1389).
PRINTED, EXACT = "printed", "exact curve"
# The printed reading as a law: Fig. 21's parabola-rectangle with its plateau starting at
# k εcu and its peak p fck chosen so that a rectangular zone gives exactly the printed
# resultants. By hand: force p (1 - k/3) = 0.36, centroid from the top 1 - (1/2 - k²/12)/
# (1 - k/3) = 0.42, so k² - 2.32 k + 0.96 = 0.
PRINTED_PLATEAU = 1.16 - (1.16**2 - 0.96) ** 0.5  # k = 0.5390
PRINTED_PEAK = 0.36 / (1.0 - PRINTED_PLATEAU / 3.0)  # p = 0.4389 (fck, at γm = 1.5)


@hookimpl
def edition_info() -> EditionInfo:
    return EDITION


@hookimpl
def edition_parameters(context: Context) -> Sequence[Parameter]:
    return [
        Parameter("gamma_m_concrete", 1.5, clause("36.4.2", "partial factor for concrete"),
                  "γm of concrete at the limit state of collapse", (1.0, 2.0)),
        Parameter("gamma_m_steel", 1.15, clause("36.4.2", "partial factor for steel"),
                  "γm of reinforcement at the limit state of collapse", (1.0, 1.5)),
        Parameter("strength_ratio", 0.67, clause("38.1(c)", "in-member to cube strength"),
                  "design peak stress as a fraction of fck before γm", (0.5, 1.0)),
        Parameter("ultimate_strain", 0.0035, clause("38.1(b)", "ultimate concrete strain"),
                  "strain at the extreme compression fibre in bending", (0.002, 0.004)),
        Parameter("strain_at_peak", 0.002, clause("38.1(c)", "strain at the end of the "
                  "parabola (Fig. 21)"), "strain where the design stress reaches its peak (with "
                  "stress_resultants = exact curve; the printed reading shapes its own)",
                  (0.001, 0.003)),
        Parameter("stress_resultants", PRINTED, clause("38.1, Annex G-1.1", "resultants of "
                  "the concrete stress (a contested reading)"),
                  f"{PRINTED!r} (default): 0.36 fck b xu at 0.42 xu as 38.1 and Annex G print "
                  "them, so that a hand check or a design handbook (Mu,lim = 0.138 fck b d² "
                  f"for Fe 415) gives the same numbers; {EXACT!r}: the exact integral of "
                  "Fig. 21, 0.3616 fck b xu at 0.416 xu (0.1389), about 0.7 % more moment",
                  choices=(PRINTED, EXACT)),
        Parameter("min_inelastic_strain", 0.002, clause("38.1(f)", "least steel strain at "
                  "failure beyond fy/(γm Es)"), "inelastic strain that sets xu,max",
                  (0.0, 0.01)),
        Parameter("steel_modulus", 200_000.0, clause("5.6.3", "modulus of reinforcement"),
                  "200 kN/mm²", (150_000.0, 210_000.0), "MPa"),
        Parameter("mild_steel_fy", 250.0, clause("38.1(e)", "mild steel, Fig. 23B"),
                  "yield strength up to which bars are mild steel by default", (200.0, 300.0),
                  "MPa"),
        Parameter("min_steel_coefficient", 0.85, clause("26.5.1.1(a)", "least tension steel"),
                  "As,min = coefficient × bw d / fy", (0.5, 2.0), "MPa"),
        Parameter("max_steel_ratio", 0.04, clause("26.5.1.1(b)", "greatest tension steel"),
                  "As,max as a fraction of bw D", (0.01, 0.08)),
        Parameter("fck_min", 15.0, clause("6.1, Table 2", "least concrete grade M15"),
                  "least characteristic cube strength", (10.0, 30.0), "MPa"),
        Parameter("fck_max", 80.0, clause("6.1, Table 2", "greatest concrete grade M80"),
                  "greatest characteristic cube strength", (40.0, 100.0), "MPa"),
        Parameter("fy_min", 250.0, clause("5.6", "reinforcement grades: mild steel Fe 250"),
                  "least yield strength", (200.0, 300.0), "MPa"),
        Parameter("fy_max", 550.0, clause("5.6", "reinforcement grades: deformed bars up to "
                  "Fe 550"), "greatest yield strength", (415.0, 600.0), "MPa"),
        Parameter("deep_beam_ratio_simple", 2.0, clause("29.1", "deep beams: simply supported "
                  "below 2.0"), "least effective span over overall depth of a simply supported "
                  "beam (from memory)", (1.0, 10.0)),
        Parameter("deep_beam_ratio_continuous", 2.5, clause("29.1", "deep beams: continuous "
                  "below 2.5"), "least effective span over overall depth of a continuous beam "
                  "(from memory)", (1.0, 10.0)),
        Parameter("cube_from_cylinder", BY_CLASS_PAIRS, CONVERSION,
                  f"{BY_CLASS_PAIRS} (EN 1992-1-1:2004 Table 3.1, else the ratio) or "
                  f"{BY_RATIO} (cylinder_cube_ratio throughout)",
                  choices=(BY_CLASS_PAIRS, BY_RATIO)),
        ratio_parameter(clause("- (not IS 456 text)", "cylinder about 0.8 of cube strength: "
                               "common practice")),
        Parameter("load_factor", 1.5, clause("36.4.1, Table 18", "load factor D + L"),
                  "partial factor on dead plus imposed load", (1.0, 2.0)),
    ]


def characteristic_strength(beam: Beam, params: Parameters) -> Factor:
    """fck, the characteristic cube strength; converted from a cylinder strength by the
    basis ``cube_from_cylinder`` chooses."""
    pairs = params.choice("cube_from_cylinder") == BY_CLASS_PAIRS
    return cube_strength(beam, params, CLASS_TABLE if pairs else None)


# --- scope ----------------------------------------------------------------------------

@hookimpl
def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    fck = characteristic_strength(beam, params)
    fy = beam.yield_strength
    note = f"fck,cube {fck.basis}"
    return [
        Check("cube strength at least the least grade", fck.value, params.value("fck_min"),
              Sense.AT_LEAST, params["fck_min"].clause, "fck", "MPa", note),
        Check("cube strength at most the greatest grade", fck.value, params.value("fck_max"),
              Sense.AT_MOST, params["fck_max"].clause, "fck", "MPa", note),
        Check("yield strength at least mild steel", fy, params.value("fy_min"),
              Sense.AT_LEAST, params["fy_min"].clause, "fy", "MPa"),
        Check("yield strength at most the greatest grade", fy, params.value("fy_max"),
              Sense.AT_MOST, params["fy_max"].clause, "fy", "MPa"),
        *_deep_beam(beam, params),
    ]


def _deep_beam(beam: Beam, params: Parameters) -> list[Check]:
    """29.1: a deep beam below 2.0 (simply supported) or 2.5 (continuous) span over depth;
    a cantilever is not among its cases."""
    if beam.layout is None or beam.layout.continuity is Continuity.CANTILEVER:
        return []
    name = "deep_beam_ratio_simple" if beam.layout.continuity is Continuity.SIMPLE else \
        "deep_beam_ratio_continuous"
    return span_depth_check(beam, params.value(name), params[name].clause, clear=False)


# --- effective flange width -------------------------------------------------------------

def zero_moment_length(beam: Beam, layout: FloorLayout) -> tuple[Any, str]:
    """l0 (mm) and how it was found: as given, else from span and continuity."""
    if layout.zero_moment_length is not None:
        return layout.zero_moment_length, "l0 as given"
    if layout.continuity is Continuity.CANTILEVER:
        raise BeamDataError(f"beam {beam.id!r}: IS 456 needs the floor's zero_moment_length "
                            "(mm, the distance between points of zero moment) for a "
                            "cantilever")
    if layout.continuity is Continuity.SIMPLE:
        return np.asarray(layout.span, float), "l0 = span (simply supported)"
    return 0.7 * np.asarray(layout.span, float), "l0 = 0.7 span (continuous)"


@hookimpl
def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    if beam.flange_thickness is None:
        raise BeamDataError(f"beam {beam.id!r}: a {beam.shape.value} beam needs its "
                            "slab_thickness (mm)")
    bw, df = np.asarray(beam.web_width, float), np.asarray(beam.flange_thickness, float)
    tee = beam.shape is Shape.TEE
    given = given_width(beam)
    layout = beam.layout
    if layout is None:
        if given is None:
            raise BeamDataError(f"beam {beam.id!r}: give effective_flange_width (mm) or the "
                                "floor (span, clear distances to the next webs)")
        return Envelope.smallest("effective flange width", "bf", [given], "mm")
    l0, how = zero_moment_length(beam, layout)
    l0 = np.asarray(l0, float)
    halves = half_clear_distance(beam)
    candidates: list[Candidate] = []
    if beam.isolated:  # the engineer marks the flange as not part of a slab
        if beam.flange_width is None:
            raise BeamDataError(f"beam {beam.id!r}: an isolated {beam.shape.value} beam "
                                "(isolated = true) needs its actual flange width under "
                                "IS 456 23.1.2(c) (effective_flange_width, mm)")
        b = np.asarray(beam.flange_width, float)
        share, label = (1.0, "l0/(l0/b + 4) + bw") if tee else (0.5, "0.5 l0/(l0/b + 4) + bw")
        isolated = clause("23.1.2(c)", "isolated beams, never wider than the actual flange")
        candidates += [Candidate(f"{label} ({how})", per_beam(share * l0 / (l0 / b + 4) + bw),
                                 isolated),
                       Candidate("actual flange width", per_beam(b), isolated)]
    else:
        divisor, slab, ref = (6, 6, "23.1.2(a)") if tee else (12, 3, "23.1.2(b)")
        kind = "T-beams" if tee else "L-beams"
        candidates.append(Candidate(f"l0/{divisor} + bw + {slab}Df ({how})",
                                    per_beam(l0 / divisor + bw + slab * df),
                                    clause(ref, f"{kind} in a floor")))
        known = [h for h in halves if h is not None]
        if len(known) == len(halves):
            candidates.append(Candidate(
                "bw + half the clear distances to the next webs", per_beam(bw + sum(known)),
                clause("23.1.2", "never wider than the web plus half the clear distances")))
        if given is not None:
            candidates.insert(0, given)
    return Envelope.smallest("effective flange width", "bf", candidates, "mm")


# --- materials --------------------------------------------------------------------------

@hookimpl
def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    fck = characteristic_strength(beam, params)
    gamma = params.value("gamma_m_concrete")
    ratio = params.value("strength_ratio")
    eps_cu, eps_c2 = params.value("ultimate_strain"), params.value("strain_at_peak")
    peak = Factor(f"{ratio:g} fck/γm", per_beam(ratio * np.asarray(fck.value, float) / gamma),
                  clause("38.1(c)", "design stress of concrete (Fig. 21)"),
                  f"{params.cite('strength_ratio')}, {params.cite('gamma_m_concrete')} "
                  f"(= {ratio / gamma:.3f} fck)", "MPa")
    factors = (fck, Factor("γm", gamma, params["gamma_m_concrete"].clause, "concrete"), peak,
               Factor("εcu", eps_cu, params["ultimate_strain"].clause))
    if params.choice("stress_resultants") == EXACT:
        return MaterialModel(
            ParabolaRectangle(peak_stress=peak.value, strain_at_peak=eps_c2,
                              ultimate_strain=eps_cu, exponent=2.0),
            (*factors, Factor("εc2", eps_c2, params["strain_at_peak"].clause,
                              "parabola of exponent 2; stress_resultants = exact curve: "
                              "0.3616 fck b xu at 0.416 xu")))
    scale = PRINTED_PEAK / (0.67 / 1.5)  # the printed coefficients belong to 0.67/1.5
    printed = params["stress_resultants"].clause
    shaped = Factor("peak (printed)", per_beam(scale * np.asarray(peak.value, float)), printed,
                    f"stress_resultants = printed: {PRINTED_PEAK:.4f} fck at γm = 1.5, so "
                    "that a rectangular zone gives 0.36 fck b xu at 0.42 xu", "MPa")
    plateau = Factor("εc2 (printed)", PRINTED_PLATEAU * eps_cu, printed,
                     f"{PRINTED_PLATEAU:.4f} εcu: the parabola of Fig. 21 shaped to the "
                     "printed resultants")
    return MaterialModel(
        ParabolaRectangle(peak_stress=shaped.value, strain_at_peak=plateau.value,
                          ultimate_strain=eps_cu, exponent=2.0),
        (*factors, shaped, plateau))


def cold_worked(beam: Beam, params: Parameters) -> Any:
    """Whether each beam's bars follow the Fig. 23A curve of cold-worked bars.

    "cold-worked" bars do; "mild" and "hot-rolled" bars take the elastic-perfectly
    plastic line of Fig. 23B at fyd. Where the kind is not stated, IS practice is
    followed: high-strength deformed bars (fy above the mild-steel grade) are
    designed on the cold-worked curve, which never gives more stress than the
    elastic-plastic one.
    """
    if beam.steel_kind not in STEEL_KINDS:
        raise ValueError(f"beam {beam.id!r}: steel_kind {beam.steel_kind!r} is not one of "
                         f"{', '.join(STEEL_KINDS)}")
    by_grade = np.asarray(beam.yield_strength, float) > params.value("mild_steel_fy")
    if beam.steel_kind == "unstated":
        return by_grade
    return beam.steel_kind == "cold-worked"


def steel_modulus(beam: Beam, params: Parameters) -> Any:
    return beam.steel_modulus if beam.steel_modulus is not None else \
        params.value("steel_modulus")


def design_strength(beam: Beam, params: Parameters) -> Factor:
    gamma = params.value("gamma_m_steel")
    return Factor("fyd", per_beam(np.asarray(beam.yield_strength, float) / gamma),
                  clause("38.1(e)", "design strength of reinforcement"),
                  f"fy/γm, {params.cite('gamma_m_steel')} (≈ 0.87 fy)", "MPa")


@hookimpl
def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    """Fig. 23 as one piecewise-linear law for every beam of a batch: the cold-worked
    curve where it applies, and elsewhere the same points at full design strength,
    which is the elastic-perfectly plastic law of mild steel (Fig. 23B)."""
    es = steel_modulus(beam, params)
    fyd = design_strength(beam, params)
    cold = cold_worked(beam, params)
    points = []
    for fraction, inelastic in zip(FIG23_STRESS, FIG23_INELASTIC, strict=True):
        stress = np.asarray(choose(cold, fraction, 1.0)) * fyd.value
        points.append((per_beam(stress / es + inelastic), per_beam(stress)))
    knee = choose(cold, points[-1][0], np.asarray(fyd.value) / es)
    if np.ndim(cold):
        curve = "per beam: Fig. 23A where cold-worked, else Fig. 23B"
    elif cold:
        curve = "Fig. 23A curve of cold-worked bars: fyd reached at fyd/Es + 0.002"
    else:
        curve = "Fig. 23B mild steel: elastic-perfectly plastic, fyd reached at fyd/Es"
    return MaterialModel(
        PiecewiseLinear(points=tuple(points), knee_strain=knee),
        (Factor("fy", beam.yield_strength, clause("5.6", "characteristic yield strength"),
                f"specified; bars {beam.steel_kind.replace('unstated', 'of kind not stated')}",
                "MPa"),
         Factor("γm", params.value("gamma_m_steel"), params["gamma_m_steel"].clause, "steel"),
         fyd,
         Factor("Es", es, params["steel_modulus"].clause, params["steel_modulus"].description,
                "MPa"),
         Factor("εyd", knee, clause("38.1(e)", "design stress-strain curve (Fig. 23)"), curve)),
    )


# --- strength ---------------------------------------------------------------------------

def limiting_depth_ratio(beam: Beam, params: Parameters) -> Factor:
    """xu,max/d: the note's table for Fe 250, 415 and 500, else the strain condition it
    comes from, εcu/(εcu + 0.002 + fyd/Es) (38.1(f))."""
    fy = np.asarray(beam.yield_strength, float)
    eps_cu = params.value("ultimate_strain")
    eps_s = params.value("min_inelastic_strain") + \
        np.asarray(design_strength(beam, params).value) / steel_modulus(beam, params)
    value: Any = eps_cu / (eps_cu + eps_s)
    tabulated = np.zeros(fy.shape, bool)
    for grade, ratio in XU_MAX_TABLE.items():
        here = np.isclose(fy, grade, rtol=0.0, atol=1e-9)
        value = np.where(here, ratio, value)
        tabulated = tabulated | here
    if np.ndim(fy):
        basis = "per beam: the note's table for Fe 250/415/500, else εcu/(εcu + 0.002 + fyd/Es)"
    elif tabulated:
        basis = f"the note's table for Fe {float(fy):g}"
    else:
        basis = f"εcu/(εcu + 0.002 + fyd/Es) for fy = {float(fy):g} MPa (not a tabulated grade)"
    return Factor("xu,max/d", per_beam(np.asarray(value, float)),
                  clause("38.1 note", "limiting depth of the neutral axis"), basis)


@hookimpl
def resistance_factor(beam: Beam, response: Any, params: Parameters,
                      context: Context) -> Resistance:
    limit = limiting_depth_ratio(beam, params)
    ratio = np.asarray(response.c, float) / np.asarray(beam.effective_depth, float)
    name = choose(ratio <= np.asarray(limit.value) * (1 + 1e-12), "under-reinforced",
                  "over-reinforced")
    return Resistance(
        Factor("member factor", 1.0, clause("36.4.2", "partial factors on the materials"),
               "safety lies in γm of concrete and steel; no member factor"),
        Regime(name, limit.clause, "xu/d against xu,max/d"),
        clause("36.4, 38.1", "design moment of resistance at least the factored moment"))


@hookimpl
def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope | None:
    factor = params.value("load_factor")
    return factored_moment(beam, [Combination(factor, factor, params["load_factor"].clause,
                                              f"{factor:g}(D + L)")],
                           clause("36.4.1", "factored moment as given"), symbol="Mu")


# --- reinforcement limits ---------------------------------------------------------------

@hookimpl
def minimum_reinforcement(beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> Sequence[Check]:
    coefficient = params.value("min_steel_coefficient")
    required = coefficient * np.asarray(beam.web_width, float) * np.asarray(
        beam.effective_depth, float) / np.asarray(beam.yield_strength, float)
    return [Check("minimum tension reinforcement", beam.tension_area, per_beam(required),
                  Sense.AT_LEAST, params["min_steel_coefficient"].clause, "As", "mm²",
                  f"{coefficient:g} bw d / fy")]


@hookimpl
def ductility_limits(beam: Beam, response: Any, params: Parameters,
                     context: Context) -> Sequence[Check]:
    limit = limiting_depth_ratio(beam, params)
    ratio = np.asarray(response.c, float) / np.asarray(beam.effective_depth, float)
    area_limit = params.value("max_steel_ratio") * np.asarray(beam.web_width, float) * \
        np.asarray(beam.depth, float)
    checks = [
        Check("neutral-axis depth", per_beam(ratio), limit.value, Sense.AT_MOST, limit.clause,
              "xu/d", note=f"{limit.basis}; an over-reinforced section fails this check "
              "(its moment is still the strain-compatibility value)"),
        Check("maximum tension reinforcement", beam.tension_area, per_beam(area_limit),
              Sense.AT_MOST, params["max_steel_ratio"].clause, "As", "mm²",
              f"{params.value('max_steel_ratio'):g} bw D"),
    ]
    if beam.compression:
        checks.append(Check("maximum compression reinforcement", beam.compression_area,
                            per_beam(area_limit), Sense.AT_MOST,
                            clause("26.5.1.2", "greatest compression steel"), "Asc", "mm²",
                            f"{params.value('max_steel_ratio'):g} bw D"))
    return checks



# --- detailing (26.3.2 spacing of bars, 26.3.3 maximum distance, 26.4.2 cover) -------

@hookimpl
def detailing_limits(beam: Beam, diameter: Any, params: Parameters,
                     context: Context) -> DetailingLimits:
    """Horizontal distance between bars at least the larger bar diameter and the aggregate
    size + 5 mm; between layers at least 15 mm, 2/3 of the aggregate size and the larger
    bar diameter (26.3.2). Largest clear distance between tension bars without
    redistribution (26.3.3(b), Table 15): fy 250 → 300 mm, 415 → 180, 500 → 150,
    linear between (our reading), checked as clear distance + db centre to centre.
    Default cover 20 mm, mild exposure (26.4.2, Table 16); all from memory."""
    spacing = clause("26.3.2", "least distance between bars")
    aggregate = np.asarray(aggregate_size(beam), float)
    db = np.asarray(diameter, float)
    table = clause("26.3.3(b), Table 15", "largest clear distance between tension bars")
    clear_max = np.interp(np.asarray(beam.yield_strength, float), [250.0, 415.0, 500.0],
                          [300.0, 180.0, 150.0])
    return DetailingLimits(
        Envelope.largest("least clear distance between bars", "s_min", [
            Candidate("bar diameter", diameter, spacing),
            Candidate("aggregate size + 5 mm", per_beam(aggregate + 5.0), spacing)], "mm"),
        Envelope.largest("least clear distance between layers", "s_v", [
            Candidate("15 mm", 15.0, spacing),
            Candidate("2/3 of the aggregate size", per_beam(2 / 3 * aggregate), spacing),
            Candidate("bar diameter", diameter, spacing)], "mm"),
        Envelope.smallest("largest bar spacing for crack control", "s_max", [
            Candidate("Table 15 clear distance + db", per_beam(clear_max + db), table)], "mm"),
        Factor("cover", 20.0, clause("26.4.2, Table 16", "nominal cover, mild exposure"),
               "20 mm", "mm"))
