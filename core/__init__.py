"""Neutral mechanics of flanged concrete sections: no standard, no clause, no units.

Internal units are N, mm and MPa; strains and stresses are positive in shortening.
"""

from clausewise.core.errors import ClausewiseError, SectionError
from clausewise.core.laws import (
    BilinearHardening,
    ConcreteLaw,
    ElasticPlastic,
    ParabolaRectangle,
    PiecewiseLinear,
    RectangularBlock,
    SteelLaw,
    stack_laws,
)
from clausewise.core.properties import (
    CrackedProperties,
    GrossProperties,
    cracked_properties,
    cracking_moment,
    gross_properties,
)
from clausewise.core.section import Section, SectionArrays, SteelLayer, Strip, flanged_profile
from clausewise.core.solver import (
    STATUS_TEXT,
    LayerResponse,
    Response,
    ResponseArrays,
    find_neutral_axis,
    solve,
    solve_arrays,
)

__all__ = [
    "STATUS_TEXT",
    "BilinearHardening",
    "ClausewiseError",
    "ConcreteLaw",
    "CrackedProperties",
    "ElasticPlastic",
    "GrossProperties",
    "LayerResponse",
    "ParabolaRectangle",
    "PiecewiseLinear",
    "RectangularBlock",
    "Response",
    "ResponseArrays",
    "Section",
    "SectionArrays",
    "SectionError",
    "SteelLaw",
    "SteelLayer",
    "Strip",
    "cracked_properties",
    "cracking_moment",
    "find_neutral_axis",
    "flanged_profile",
    "gross_properties",
    "solve",
    "solve_arrays",
    "stack_laws",
]
