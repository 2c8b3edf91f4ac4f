"""An annex without code: a TOML file that sets named parameters of an installed edition.

A national annex or a firm's preferred limits often change only numbers the
base edition already names (αcc, γc, k1, a least net tensile strain). Such a
layer needs no Python: a parameter file names the base and the new values::

    [annex]
    id = "xl-na:2023"
    title = "Lornholm National Annex to EN 1992-1-1:2004"
    year = 2023
    extends = "en1992-1-1:2004"

    [parameters]
    alpha_cc = { value = 0.85, clause = "NA 2.6", note = "flexure" }
    k1 = 0.4

The file is read as data and validated against the base's own parameter
declarations, never evaluated: an unknown name, a value of the wrong kind, outside
the bounds or not among the choices the base declares is refused with the file, the parameter
and what was expected. The loaded layer is an ordinary plugin, so the audit
names the file's edition as supplier of exactly the values it sets.
"""

from __future__ import annotations

import difflib
import hashlib
import math
import re
import tomllib
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

from clausewise.provisions import ClausewiseError
from clausewise.provisions.answers import EditionInfo
from clausewise.provisions.declarations import Declaration, declarations
from clausewise.provisions.hookspecs import hookimpl
from clausewise.provisions.registry import (
    Edition,
    EditionError,
    PluginRecord,
    Registry,
    default_registry,
)
from clausewise.provisions.vocabulary import Clause, Parameter

ANNEX_KEYS = {"id": str, "title": str, "year": int, "extends": str, "summary": str}
REQUIRED = ("id", "title", "year", "extends")
PARAMETER_KEYS = ("value", "clause", "note")
EDITION_ID = re.compile(r"^[a-z0-9][a-z0-9.:_+-]*$")


class AnnexError(ClausewiseError, ValueError):
    """A parameter file that cannot be read or does not fit its base edition."""

    def __init__(self, path: Path, problems: Sequence[str]) -> None:
        self.path = path
        self.problems = tuple(problems)
        lines = "\n  ".join(self.problems)
        super().__init__(f"parameter file {path}: {lines}" if len(self.problems) == 1
                         else f"parameter file {path} has {len(self.problems)} problems:\n  "
                         f"{lines}")


class ParameterFileEdition:
    """The plugin a parameter file becomes: who it is, and the parameters it sets."""

    def __init__(self, info: EditionInfo, parameters: Sequence[Parameter]) -> None:
        self.info = info
        self.parameters = tuple(parameters)

    def __repr__(self) -> str:
        return f"ParameterFileEdition({self.info.id!r})"

    @hookimpl
    def edition_info(self) -> EditionInfo:
        return self.info

    @hookimpl
    def edition_parameters(self) -> Sequence[Parameter]:
        return self.parameters


def load_annex(path: Path | str, registry: Registry | None = None) -> PluginRecord:
    """Read, validate and register a parameter file; return its registry record.

    ``registry`` defaults to the process-wide one, so ``clausewise.assess(beam,
    annex_id)`` finds the file's edition afterwards.
    """
    path = Path(path)
    registry = registry if registry is not None else default_registry()
    document = _read(path)
    head, problems = _annex_table(path, document)
    base = None
    if isinstance(head.get("extends"), str):
        base, problem = _base(head["extends"], registry)
        problems += [problem] if problem else []
    edition_id = head.get("id")
    if isinstance(edition_id, str) and edition_id in _installed(registry):
        problems.append(f"[annex] id {edition_id!r} is already an installed edition; give "
                        "the file an id of its own")
    if base is None:  # the parameters can only be judged against their base
        raise AnnexError(path, problems)
    info = EditionInfo(_as(edition_id, str, "?"), _as(head.get("title"), str, ""),
                       _as(head.get("year"), int, 0), extends=base.id, forms=base.info.forms,
                       summary=_as(head.get("summary"), str, ""))
    parameters, wrong = _parameters(path, document.get("parameters", {}), base, info)
    if problems or wrong:  # every problem of the file at once
        raise AnnexError(path, problems + wrong)
    digest = hashlib.sha256(path.read_bytes()).hexdigest()[:12]
    record = registry.register(ParameterFileEdition(info, parameters), info.id,
                               source=f"parameter file {path}", distribution=path.name,
                               version=f"sha256:{digest}")
    if not record.ok:
        raise AnnexError(path, [record.error])
    return record


def _installed(registry: Registry) -> set[str]:
    """The ids in the registry and every installed edition plugin's, loaded or not (a run
    that names a few loads only those): a file never takes the place of either."""
    from clausewise.provisions.registry import plugin_names

    return set(registry.ids()) | plugin_names()


def annex_heading(path: Path | str) -> tuple[str, str | None]:
    """A parameter file's own id and the edition it extends, read without registering it
    (so a run can load just that base); ("", None) when the file cannot say."""
    try:
        head = _read(Path(path)).get("annex")
    except AnnexError:
        return "", None
    if not isinstance(head, dict):
        return "", None
    edition_id, base = head.get("id"), head.get("extends")
    return (edition_id if isinstance(edition_id, str) else "",
            base if isinstance(base, str) else None)


def _read(path: Path) -> dict[str, Any]:
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise AnnexError(path, [f"cannot be read: {exc.strerror or exc}"]) from exc
    except UnicodeDecodeError as exc:
        raise AnnexError(path, [f"is not UTF-8 text (bad byte at position {exc.start}); a "
                                "parameter file is TOML text"]) from exc
    try:
        document = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise AnnexError(path, [f"is not valid TOML: {exc}"]) from exc
    unknown = sorted(set(document) - {"annex", "parameters"})
    if unknown:
        raise AnnexError(path, [f"unknown table or key {k!r}{_hint(k, ['annex', 'parameters'])}"
                                "; a parameter file has [annex] and [parameters]"
                                for k in unknown])
    return document


def _as(value: Any, kind: type, default: Any) -> Any:
    """``value`` where it is of ``kind`` (not a bool), else ``default``: a stand-in so the
    rest of a file can still be judged when a field of its head is wrong."""
    return value if isinstance(value, kind) and not isinstance(value, bool) else default


def _annex_table(path: Path, document: Mapping[str, Any]) -> tuple[dict[str, Any], list[str]]:
    """The [annex] table and its problems (none makes it unreadable but its absence)."""
    head = document.get("annex")
    if not isinstance(head, dict):
        raise AnnexError(path, ["needs an [annex] table with id, title, year and extends"])
    problems = [f"[annex] {k!r} is not a known key{_hint(k, ANNEX_KEYS)}; expected one of "
                f"{', '.join(ANNEX_KEYS)}" for k in head if k not in ANNEX_KEYS]
    problems += [f"[annex] needs {k!r} ({_kind(ANNEX_KEYS[k])})" for k in REQUIRED
                 if k not in head]
    for key, value in head.items():
        expected = ANNEX_KEYS.get(key)
        if expected is not None and (not isinstance(value, expected)
                                     or isinstance(value, bool)):
            problems.append(f"[annex] {key} must be {_kind(expected)}, got {value!r}")
    edition_id = head.get("id")
    if isinstance(edition_id, str) and not EDITION_ID.match(edition_id):
        problems.append(f"[annex] id {edition_id!r} must be lower case letters, digits and "
                        "'.:_+-', e.g. \"xl-na:2023\"")
    if isinstance(edition_id, str) and edition_id == head.get("extends"):
        problems.append(f"[annex] id {edition_id!r} cannot extend itself")
    return head, problems


def _base(base_id: str, registry: Registry) -> tuple[Edition | None, str]:
    """The base edition, or None and why."""
    try:
        return registry.edition(base_id), ""
    except EditionError as exc:
        if base_id in registry.ids():  # installed, but it cannot be loaded
            return None, f"[annex] extends {base_id!r}, which cannot be loaded: {exc}"
        return None, (f"[annex] extends {base_id!r}, which is not an installed edition"
                      f"{_hint(base_id, registry.ids())}; installed: "
                      f"{', '.join(registry.ids())}")


def _parameters(path: Path, table: Any, base: Edition, info: EditionInfo
                ) -> tuple[list[Parameter], list[str]]:
    """The file's parameters, and the problems of those that cannot be taken."""
    if not isinstance(table, dict):
        return [], ["[parameters] must be a table of name = value"]
    known = declarations(base)
    problems: list[str] = []
    parameters: list[Parameter] = []
    for name, entry in table.items():
        try:
            parameters.append(_parameter(path, name, entry, known, base, info))
        except _Problem as problem:
            problems.append(str(problem))
    return parameters, problems


class _Problem(Exception):
    """One refused entry of [parameters]; collected so the file shows every problem."""


def _parameter(path: Path, name: str, entry: Any, known: Mapping[str, Declaration],
               base: Edition, info: EditionInfo) -> Parameter:
    if name not in known:
        raise _Problem(f"[parameters] {name!r} is not a parameter of {base.id!r}"
                       f"{_hint(name, known)}; it has: {', '.join(sorted(known))}")
    if isinstance(entry, dict):
        extra = [k for k in entry if k not in PARAMETER_KEYS]
        if extra or "value" not in entry:
            raise _Problem(f"[parameters] {name}: a table needs 'value' and may have 'clause' "
                           f"and 'note'" + (f"; unknown key {extra[0]!r}"
                                            f"{_hint(extra[0], PARAMETER_KEYS)}" if extra
                                            else ""))
        value, ref, note = entry["value"], entry.get("clause", ""), entry.get("note", "")
        for key, text in (("clause", ref), ("note", note)):
            if not isinstance(text, str):
                raise _Problem(f"[parameters] {name}.{key} must be a string, got {text!r}")
    else:
        value, ref, note = entry, "", ""
    declared = known[name]
    value = _checked_value(name, value, declared, base)
    top = declared.top
    title = f"{note or top.description or name}, from {path.name}"
    return Parameter(name, value, Clause(ref or path.name, title, info.id),
                     note or top.description, declared.bounds, top.unit, declared.choices)


def _checked_value(name: str, value: Any, declared: Declaration, base: Edition) -> float | str:
    supplier = declared.top.clause
    if not declared.numeric:
        choices = declared.choices
        if not isinstance(value, str):
            raise _Problem(f"[parameters] {name} must be a string (as {supplier.edition} "
                           f"{supplier.ref} sets {declared.top.value!r}), got {value!r}")
        if choices is not None and value not in choices:
            raise _Problem(f"[parameters] {name} = {value!r} is not one of "
                           f"{', '.join(repr(c) for c in choices)}{_hint(value, choices)}")
        return value
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise _Problem(f"[parameters] {name} must be a number{_unit(declared)}, got {value!r}")
    if not math.isfinite(value):
        raise _Problem(f"[parameters] {name} must be a finite number, got {value!r}")
    bounds = declared.bounds
    if bounds is not None and not bounds[0] <= value <= bounds[1]:
        raise _Problem(f"[parameters] {name} = {value:g} is outside {bounds[0]:g} to "
                       f"{bounds[1]:g}{_unit(declared)}, the range {base.id!r} allows "
                       f"({supplier.edition} {supplier.ref}: {declared.top.description})")
    return float(value)


def _unit(declared: Declaration) -> str:
    return f" in {declared.top.unit}" if declared.top.unit else ""


def _kind(expected: type) -> str:
    return {str: "a string", int: "an integer"}[expected]


def _hint(word: str, choices: Any) -> str:
    close = difflib.get_close_matches(word, list(choices), n=1)
    return f" (did you mean {close[0]!r}?)" if close else ""
