"""Package namespaces that load their public names on first use (PEP 562), so that
``import clausewise.provisions`` costs nothing until a name is asked for."""

from __future__ import annotations

from collections.abc import Callable
from importlib import import_module
from typing import Any


def lazy_names(namespace: dict[str, Any], exports: dict[str, str]
               ) -> tuple[Callable[[str], Any], Callable[[], list[str]]]:
    """``__getattr__`` and ``__dir__`` for a package whose ``exports`` map each public
    name to the module that defines it; a loaded name is kept in ``namespace``."""

    def __getattr__(name: str) -> Any:
        if name not in exports:
            raise AttributeError(f"module {namespace['__name__']!r} has no attribute {name!r}")
        value = getattr(import_module(exports[name]), name)
        namespace[name] = value
        return value

    def __dir__() -> list[str]:
        return sorted(set(namespace) | set(exports))

    return __getattr__, __dir__
