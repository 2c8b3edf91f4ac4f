"""Problems with a beam file, and pydantic's validation errors in the engineer's words:
the field, the value as written, and what was expected."""

from __future__ import annotations

import difflib
import re
from dataclasses import dataclass
from datetime import date, datetime, time
from typing import Annotated, Any, Literal, get_args, get_origin

from pydantic import BaseModel, ValidationError

from clausewise.beamfile.models import _UNION_TAGS, _Expect
from clausewise.provisions import ClausewiseError
from clausewise.units import ECHOED, shortened


class InputError(ClausewiseError, ValueError):
    """A problem with the whole file: missing, not TOML, no beams, bad project or run table."""

    def __init__(self, message: str, problems: tuple[InputProblem, ...] = ()) -> None:
        super().__init__(message)
        self.problems = problems


@dataclass(frozen=True)
class InputProblem:
    """One bad value: where it is, what was written and what was expected.

    ``value`` is the text as written, "" when the field is missing. ``index`` is the
    beam's place in the file (from 1), for a beam without a usable id.
    """

    file: str
    beam: str | None
    field: str
    value: str
    expected: str
    index: int | None = None

    def __post_init__(self) -> None:  # a hostile file's megabyte of text is not echoed
        object.__setattr__(self, "value", shortened(self.value, ECHOED))
        object.__setattr__(self, "expected", shortened(self.expected, 4 * ECHOED))

    @property
    def message(self) -> str:
        where = [self.file]
        if self.beam is not None:
            where.append(f"beam {self.beam}")
        elif self.index is not None:
            where.append(f"beam number {self.index} (no usable id)")
        if self.field:
            where.append(f"field {self.field}")
        got = f"got {self.value!r}" if self.value else "missing"
        return f"{', '.join(where)}: {got}, expected {self.expected}"



# --- field expectations, derived once from the models ------------------------------------


def _submodel(annotation: Any) -> type[BaseModel] | None:
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    for arg in get_args(annotation):
        found = _submodel(arg)
        if found is not None:
            return found
    return None


def _expectation(annotation: Any, metadata: list[Any]) -> str:
    for item in metadata:
        if isinstance(item, _Expect):
            return item.text
    if get_origin(annotation) is Annotated:
        return _expectation(get_args(annotation)[0], list(annotation.__metadata__))
    if get_origin(annotation) is Literal:
        return "one of " + ", ".join(repr(choice) for choice in get_args(annotation))
    if annotation is bool:
        return "true or false"
    model = _submodel(annotation)
    if model is not None:
        return f"a table of {model.model_config.get('title', 'fields')} fields"
    for arg in get_args(annotation):  # X | None
        if arg is not type(None):
            return _expectation(arg, [])
    return "a valid value"


@dataclass(frozen=True)
class _Fields:
    """Expected text per dotted field path, and the field names under each path."""

    expected: dict[str, str]
    names: dict[str, tuple[str, ...]]

    @classmethod
    def of(cls, model: type[BaseModel]) -> _Fields:
        expected: dict[str, str] = {}
        names: dict[str, tuple[str, ...]] = {}

        def walk(current: type[BaseModel], prefix: str) -> None:
            names[prefix] = tuple(current.model_fields)
            for name, info in current.model_fields.items():
                path = f"{prefix}{name}"
                expected[path] = _expectation(info.annotation, list(info.metadata))
                sub = _submodel(info.annotation)
                if sub is not None:
                    walk(sub, path + ".")

        walk(model, "")
        return cls(expected, names)





def _did_you_mean(word: str, choices: tuple[str, ...] | list[str]) -> str:
    lowered = {c.lower(): c for c in choices}
    close = difflib.get_close_matches(word.lower(), list(lowered), n=1, cutoff=0.6)
    return f" (did you mean {lowered[close[0]]!r}?)" if close else ""


_CONTROL = re.compile(r"[\x00-\x1f\x7f]")


def _text(value: Any) -> str:
    """A value as the user wrote it, for messages; a control character as its escape
    ("B\\r1"), so that it cannot hide in a terminal."""
    if isinstance(value, str):
        return _CONTROL.sub(lambda m: m.group().encode("unicode_escape").decode("ascii"), value)
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, datetime | date | time):
        return value.isoformat()
    text = f"{value:.12g}" if isinstance(value, float) else repr(value)
    return text if len(text) <= 80 else text[:77] + "..."


def _field_path(loc: tuple[Any, ...], tagged: bool) -> tuple[str, str]:
    """Displayed field ("tension[1].bars", layers counted from 1) and lookup key;
    ``tagged``: the location ends in the name of a union member, which is dropped."""
    shown, key = "", ""
    for part in loc[:-1] if tagged and loc[-1] in _UNION_TAGS else loc:
        if isinstance(part, int):
            shown += f"[{part + 1}]"
        else:
            shown += f".{part}" if shown else str(part)
            key += f".{part}" if key else str(part)
    return shown, key


def _from_pydantic(error: ValidationError, fields: _Fields) -> list[tuple[str, str, str]]:
    """(field, value, expected) for each distinct field a pydantic error names."""
    found: dict[str, tuple[str, str, str]] = {}
    for item in error.errors(include_url=False):
        kind = item["type"]
        field, key = _field_path(tuple(item["loc"]), tagged=kind != "extra_forbidden")
        if field in found:
            continue
        value = "" if kind == "missing" else _text(item.get("input"))
        if kind == "extra_forbidden":
            parent, _, name = key.rpartition(".")
            known = fields.names.get(parent + "." if parent else "", ())
            hint = _did_you_mean(name, known) or f" (known fields: {', '.join(known)})"
            expected = f"no field of this name here{hint}"
        else:
            expected = fields.expected.get(key, item["msg"])
            if kind == "literal_error" and isinstance(item.get("input"), str):
                choices = re.findall(r"'([^']*)'", expected)
                expected += _did_you_mean(item["input"], choices)
        found[field] = (field, value, expected)
    return list(found.values())

