"""The rule vocabulary, hook specifications, edition registry and assessment engine.

This is the public surface for edition authors: import everything a plugin
needs from here, never from ``clausewise.core``.
"""

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
    Bending,
    Context,
    Continuity,
    FloorLayout,
    Layer,
    Shape,
    StrengthBasis,
    UnitSystem,
)
from clausewise.provisions.engine import CAUTION, Assessment, assess, evaluate, input_clause
from clausewise.provisions.hookspecs import hookimpl
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
    "CAUTION", "MM_PER_IN", "MPA_PER_PSI",
    "Actions", "Assessment", "Beam", "Bending", "BilinearHardening", "Bound", "Candidate",
    "Check", "Clause", "ClausewiseError", "Context", "Continuity", "Edition", "EditionError",
    "EditionInfo", "ElasticPlastic", "Envelope", "Factor", "FloorLayout", "Layer",
    "MaterialModel", "ParabolaRectangle", "Parameter", "ParameterError", "Parameters",
    "PiecewiseLinear", "PluginError", "RectangularBlock", "Regime", "Registry", "Resistance", "SectionError",
    "Sense", "Shape", "StrengthBasis", "UnitSystem",
    "assess", "choose", "clamp", "cube_strength", "cylinder_strength", "default_registry",
    "evaluate", "hookimpl", "input_clause", "interpolate", "is_within", "largest_of", "log",
    "power", "smallest_of", "sqrt",
]
