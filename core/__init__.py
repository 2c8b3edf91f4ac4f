"""Neutral mechanics of flanged concrete sections: no standard, no clause, no units.

Internal units are N, mm and MPa; strains and stresses are positive in shortening.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from clausewise.core.lazy import lazy_names

_EXPORTS = {
    "ClausewiseError": "clausewise.core.errors",
    "SectionError": "clausewise.core.errors",
    "BilinearHardening": "clausewise.core.laws",
    "ConcreteLaw": "clausewise.core.laws",
    "ElasticPlastic": "clausewise.core.laws",
    "ParabolaRectangle": "clausewise.core.laws",
    "PiecewiseLinear": "clausewise.core.laws",
    "RectangularBlock": "clausewise.core.laws",
    "SteelLaw": "clausewise.core.laws",
    "stack_laws": "clausewise.core.laws",
    "CrackedProperties": "clausewise.core.properties",
    "GrossProperties": "clausewise.core.properties",
    "cracked_properties": "clausewise.core.properties",
    "cracking_moment": "clausewise.core.properties",
    "gross_properties": "clausewise.core.properties",
    "Section": "clausewise.core.section",
    "SectionArrays": "clausewise.core.section",
    "SteelLayer": "clausewise.core.section",
    "Strip": "clausewise.core.section",
    "flanged_profile": "clausewise.core.section",
    "STATUS_TEXT": "clausewise.core.solver",
    "LayerResponse": "clausewise.core.solver",
    "Response": "clausewise.core.solver",
    "ResponseArrays": "clausewise.core.solver",
    "find_neutral_axis": "clausewise.core.solver",
    "solve": "clausewise.core.solver",
    "solve_arrays": "clausewise.core.solver",
    "solve_together": "clausewise.core.solver",
}

if TYPE_CHECKING:
    from clausewise.core.errors import (
        ClausewiseError,
        SectionError,
    )
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
    from clausewise.core.section import (
        Section,
        SectionArrays,
        SteelLayer,
        Strip,
        flanged_profile,
    )
    from clausewise.core.solver import (
        STATUS_TEXT,
        LayerResponse,
        Response,
        ResponseArrays,
        find_neutral_axis,
        solve,
        solve_arrays,
        solve_together,
    )

__all__ = [
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
    "STATUS_TEXT",
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
    "solve_together",
    "stack_laws",
]


__getattr__, __dir__ = lazy_names(globals(), _EXPORTS)
