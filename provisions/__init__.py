"""The rule vocabulary, hook specifications, edition registry and assessment engine.

This is the public surface for edition authors: import everything a plugin
needs from here, never from ``clausewise.core``.
"""

from __future__ import annotations

from importlib import import_module
from typing import TYPE_CHECKING, Any

_EXPORTS = {
    "BilinearHardening": "clausewise.core",
    "ClausewiseError": "clausewise.core",
    "ElasticPlastic": "clausewise.core",
    "ParabolaRectangle": "clausewise.core",
    "PiecewiseLinear": "clausewise.core",
    "RectangularBlock": "clausewise.core",
    "SectionError": "clausewise.core",
    "EditionInfo": "clausewise.provisions.answers",
    "MaterialModel": "clausewise.provisions.answers",
    "ParameterError": "clausewise.provisions.answers",
    "Parameters": "clausewise.provisions.answers",
    "Resistance": "clausewise.provisions.answers",
    "Actions": "clausewise.provisions.beam",
    "BeamDataError": "clausewise.provisions.beam",
    "Beam": "clausewise.provisions.beam",
    "Bending": "clausewise.provisions.beam",
    "Context": "clausewise.provisions.beam",
    "Continuity": "clausewise.provisions.beam",
    "FloorLayout": "clausewise.provisions.beam",
    "Layer": "clausewise.provisions.beam",
    "Shape": "clausewise.provisions.beam",
    "StrengthBasis": "clausewise.provisions.beam",
    "UnitSystem": "clausewise.provisions.beam",
    "CAUTION": "clausewise.provisions.verdicts",
    "Assessment": "clausewise.provisions.engine",
    "assess": "clausewise.provisions.engine",
    "evaluate": "clausewise.provisions.engine",
    "input_clause": "clausewise.provisions.engine",
    "hookimpl": "clausewise.provisions.hookspecs",
    "MM_PER_IN": "clausewise.provisions.materials",
    "MPA_PER_PSI": "clausewise.provisions.materials",
    "cube_strength": "clausewise.provisions.materials",
    "cylinder_strength": "clausewise.provisions.materials",
    "Edition": "clausewise.provisions.registry",
    "EditionError": "clausewise.provisions.registry",
    "PluginError": "clausewise.provisions.registry",
    "Registry": "clausewise.provisions.registry",
    "default_registry": "clausewise.provisions.registry",
    "Bound": "clausewise.provisions.vocabulary",
    "Candidate": "clausewise.provisions.vocabulary",
    "Check": "clausewise.provisions.vocabulary",
    "Clause": "clausewise.provisions.vocabulary",
    "Envelope": "clausewise.provisions.vocabulary",
    "Factor": "clausewise.provisions.vocabulary",
    "Parameter": "clausewise.provisions.vocabulary",
    "Regime": "clausewise.provisions.vocabulary",
    "Sense": "clausewise.provisions.vocabulary",
    "choose": "clausewise.provisions.vocabulary",
    "clamp": "clausewise.provisions.vocabulary",
    "interpolate": "clausewise.provisions.vocabulary",
    "is_within": "clausewise.provisions.vocabulary",
    "largest_of": "clausewise.provisions.vocabulary",
    "log": "clausewise.provisions.vocabulary",
    "power": "clausewise.provisions.vocabulary",
    "smallest_of": "clausewise.provisions.vocabulary",
    "sqrt": "clausewise.provisions.vocabulary",
}

if TYPE_CHECKING:
    from clausewise.core import (
        BilinearHardening,
        ClausewiseError,
        ElasticPlastic,
        ParabolaRectangle,
        PiecewiseLinear,
        RectangularBlock,
        SectionError,
    )
    from clausewise.provisions.answers import (
        EditionInfo,
        MaterialModel,
        ParameterError,
        Parameters,
        Resistance,
    )
    from clausewise.provisions.beam import (
        Actions,
        Beam,
        BeamDataError,
        Bending,
        Context,
        Continuity,
        FloorLayout,
        Layer,
        Shape,
        StrengthBasis,
        UnitSystem,
    )
    from clausewise.provisions.engine import (
        Assessment,
        assess,
        evaluate,
        input_clause,
    )
    from clausewise.provisions.hookspecs import (
        hookimpl,
    )
    from clausewise.provisions.materials import (
        MM_PER_IN,
        MPA_PER_PSI,
        cube_strength,
        cylinder_strength,
    )
    from clausewise.provisions.registry import (
        Edition,
        EditionError,
        PluginError,
        Registry,
        default_registry,
    )
    from clausewise.provisions.verdicts import CAUTION
    from clausewise.provisions.vocabulary import (
        Bound,
        Candidate,
        Check,
        Clause,
        Envelope,
        Factor,
        Parameter,
        Regime,
        Sense,
        choose,
        clamp,
        interpolate,
        is_within,
        largest_of,
        log,
        power,
        smallest_of,
        sqrt,
    )

__all__ = [
    "Actions",
    "Assessment",
    "Beam",
    "BeamDataError",
    "Bending",
    "BilinearHardening",
    "Bound",
    "CAUTION",
    "Candidate",
    "Check",
    "Clause",
    "ClausewiseError",
    "Context",
    "Continuity",
    "Edition",
    "EditionError",
    "EditionInfo",
    "ElasticPlastic",
    "Envelope",
    "Factor",
    "FloorLayout",
    "Layer",
    "MM_PER_IN",
    "MPA_PER_PSI",
    "MaterialModel",
    "ParabolaRectangle",
    "Parameter",
    "ParameterError",
    "Parameters",
    "PiecewiseLinear",
    "PluginError",
    "RectangularBlock",
    "Regime",
    "Registry",
    "Resistance",
    "SectionError",
    "Sense",
    "Shape",
    "StrengthBasis",
    "UnitSystem",
    "assess",
    "choose",
    "clamp",
    "cube_strength",
    "cylinder_strength",
    "default_registry",
    "evaluate",
    "hookimpl",
    "input_clause",
    "interpolate",
    "is_within",
    "largest_of",
    "log",
    "power",
    "smallest_of",
    "sqrt",
]


def __getattr__(name: str) -> Any:
    """Load a public name on first use, so importing the package stays cheap."""
    if name not in _EXPORTS:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(import_module(_EXPORTS[name]), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(_EXPORTS))
