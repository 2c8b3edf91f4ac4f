"""What the layers of an edition declare about each parameter name: its kind, the tightest
bounds and the choices every layer allows. Parameter files and the conformance kit read
these, so a layer can only set a parameter within its base's contract."""

from __future__ import annotations

from dataclasses import dataclass

from clausewise.provisions.beam import Context
from clausewise.provisions.registry import Edition
from clausewise.provisions.vocabulary import Parameter


@dataclass(frozen=True)
class Declaration:
    """Everything the layers of an edition say about one parameter name."""

    name: str
    parameters: tuple[Parameter, ...]  # bottom layer first, every form

    @property
    def numeric(self) -> bool:
        return not isinstance(self.parameters[0].value, str)

    @property
    def bounds(self) -> tuple[float, float] | None:
        """The tightest bounds every layer allows (None where none declares any)."""
        declared = [p.bounds for p in self.parameters if p.bounds is not None]
        if not declared:
            return None
        return max(b[0] for b in declared), min(b[1] for b in declared)

    @property
    def choices(self) -> tuple[str, ...] | None:
        """The words every layer allows (None where none lists any)."""
        declared = [p.choices for p in self.parameters if p.choices is not None]
        if not declared:
            return None
        return tuple(c for c in declared[0] if all(c in d for d in declared))

    @property
    def top(self) -> Parameter:
        return self.parameters[-1]


def declarations(edition: Edition) -> dict[str, Declaration]:
    """Every parameter name the layers of ``edition`` declare, in any of its forms."""
    found: dict[str, list[Parameter]] = {}
    for record in edition.layers:
        layer = Edition((record,))
        for form in edition.forms:
            for parameter in layer.parameters(Context(form=form)).values():
                found.setdefault(parameter.name, []).append(parameter)
    return {name: Declaration(name, tuple(ps)) for name, ps in found.items()}
