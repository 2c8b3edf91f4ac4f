"""The project's root exception and the mechanics errors.

Every error is also the matching builtin, so ``except ValueError`` still works
for callers who do not know our names.
"""


class ClausewiseError(Exception):
    """Root of every error raised on purpose by clausewise."""


class SectionError(ClausewiseError, ValueError):
    """A section or material law that cannot describe a real member."""
