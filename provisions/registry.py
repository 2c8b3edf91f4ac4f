"""Finding, validating and layering editions.

One place, one order: entry points of the group ``clausewise.editions`` (the
built-in editions are declared there like any other), then plugins registered
in code (tests, parameter files), then validation. Each plugin is loaded on its
own; one that fails to import, misnames a hook or raises is recorded with its
entry point and distribution and shown in the listing, and the others go on.

Environment switches:
``CLAUSEWISE_EDITIONS``  comma-separated ids: load only these (and their bases).
``CLAUSEWISE_STRICT``    "1": a broken plugin is a hard error (for CI).
"""

from __future__ import annotations

import os
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from typing import Any

import pluggy

from clausewise.core.errors import ClausewiseError
from clausewise.provisions import hookspecs
from clausewise.provisions.answers import (
    EditionInfo,
    MaterialModel,
    ParameterError,
    Parameters,
    Resistance,
)
from clausewise.provisions.beam import Beam, Context
from clausewise.provisions.vocabulary import Check, Envelope, Parameter

GROUP = "clausewise.editions"


class EditionError(ClausewiseError, LookupError):
    """An edition that is unknown, broken, or whose base is missing."""


class PluginError(ClausewiseError, RuntimeError):
    """A plugin that failed to load, or a hook that raised or answered wrongly."""


@dataclass(frozen=True)
class PluginRecord:
    """One loaded (or failed) plugin: where it came from and what went wrong."""

    name: str  # entry-point name, or the name given in code
    source: str  # "entry point module:attr" or "registered in code"
    distribution: str
    version: str
    info: EditionInfo | None = None
    plugin: Any = None
    error: str = ""

    @property
    def ok(self) -> bool:
        return not self.error


def _validate(plugin: Any) -> EditionInfo:
    """Register a plugin alone against the specs: unknown hooks and wrong argument
    names fail here, then it must say who it is."""
    pm = pluggy.PluginManager(hookspecs.PROJECT)
    pm.add_hookspecs(hookspecs)
    pm.register(plugin)
    pm.check_pending()
    info = pm.hook.edition_info()
    if not isinstance(info, EditionInfo):
        raise PluginError(f"edition_info returned {info!r}, expected an EditionInfo")
    return info


@dataclass
class Registry:
    """Every plugin found, and the editions they make once layered."""

    strict: bool = False
    only: frozenset[str] | None = None
    records: list[PluginRecord] = field(default_factory=list)

    # --- loading -----------------------------------------------------------------
    def load_entry_points(self) -> None:
        """Load the group's entry points, or with ``only`` just those named and the
        bases they extend."""
        from importlib.metadata import entry_points

        available = {ep.name: ep for ep in entry_points(group=GROUP)}
        wanted = sorted(available) if self.only is None else sorted(self.only & available.keys())
        for missing in sorted((self.only or set()) - available.keys()):
            self.records.append(PluginRecord(missing, "CLAUSEWISE_EDITIONS", "", "",
                                             error="EditionError: no such edition installed"))
        while wanted:
            for name in wanted:
                ep = available[name]
                dist = ep.dist
                self._add(str(name), f"entry point {ep.value}", dist.name if dist else "?",
                          dist.version if dist else "?", ep.load)
            loaded = {r.name for r in self.records}
            bases = {r.info.extends for r in self.records if r.ok and r.info
                     and r.info.extends}
            wanted = sorted((bases & available.keys()) - loaded)

    def register(self, plugin: Any, name: str | None = None, *, source: str = "registered "
                 "in code", distribution: str = "", version: str = "") -> PluginRecord:
        """Add a plugin object (module, class instance) that is not an entry point."""
        label = str(name or getattr(plugin, "__name__", type(plugin).__name__))
        return self._add(label, source, distribution, version, lambda: plugin)

    def _add(self, name: str, source: str, distribution: str, version: str,
             load: Callable[[], Any]) -> PluginRecord:
        try:
            plugin = load()
            info = _validate(plugin)
            if source.startswith("entry point") and info.id != name:
                raise PluginError(f"entry point name {name!r} differs from edition id "
                                  f"{info.id!r}")
            if any(r.ok and r.info and r.info.id == info.id for r in self.records):
                raise PluginError(f"edition id {info.id!r} is already registered")
            record = PluginRecord(name, source, distribution, version, info, plugin)
        except Exception as exc:  # a broken plugin is recorded, never fatal unless strict
            record = PluginRecord(name, source, distribution, version,
                                  error=f"{type(exc).__name__}: {exc}")
            if self.strict:
                self.records.append(record)
                raise PluginError(f"plugin {name!r} ({source}) is broken: {record.error}") \
                    from exc
        self.records = [r for r in self.records if r.name != name or r.ok] + [record]
        return record

    # --- lookup ------------------------------------------------------------------
    @property
    def broken(self) -> list[PluginRecord]:
        return [r for r in self.records if not r.ok]

    def _by_id(self) -> dict[str, PluginRecord]:
        return {r.info.id: r for r in self.records if r.ok and r.info}

    def ids(self) -> list[str]:
        return sorted(self._by_id())

    def edition(self, edition_id: str) -> Edition:
        """The layered edition ``edition_id`` (its bases below it)."""
        by_id = self._by_id()
        if edition_id not in by_id:
            known = ", ".join(sorted(by_id)) or "none installed"
            broken = [r.name for r in self.broken]
            hint = f"; broken plugins: {', '.join(broken)}" if broken else ""
            raise EditionError(f"unknown edition {edition_id!r} (known: {known}{hint})")
        chain: list[PluginRecord] = []
        current: str | None = edition_id
        while current is not None:
            if current not in by_id:
                raise EditionError(f"edition {chain[-1].info.id!r} extends "  # type: ignore[union-attr]
                                   f"{current!r}, which is not installed")
            record = by_id[current]
            if record in chain:
                raise EditionError(f"edition {edition_id!r} extends itself through "
                                   f"{current!r}")
            chain.append(record)
            current = record.info.extends  # type: ignore[union-attr]
        return Edition(tuple(reversed(chain)))

    def unusable(self) -> dict[str, str]:
        """Editions that load but cannot be used as installed, with the reason: a missing
        base, a cycle, or a parameter an upper layer sets outside its base's contract."""
        problems: dict[str, str] = {}
        for edition_id in self.ids():
            try:
                edition = self.edition(edition_id)
                for form in edition.forms:
                    edition.parameters(Context(form=form))
            except ClausewiseError as exc:
                problems[edition_id] = f"{type(exc).__name__}: {exc}"
        return problems

    def forms(self, record: PluginRecord) -> tuple[str, ...]:
        """The published forms of a loaded record's edition, inherited where not declared."""
        try:
            return self.edition(record.info.id).forms  # type: ignore[union-attr]
        except EditionError:
            return record.info.forms or ("SI",)  # type: ignore[union-attr]

    def editions(self) -> list[Edition]:
        """Every edition whose whole stack is available."""
        found = []
        for edition_id in self.ids():
            try:
                found.append(self.edition(edition_id))
            except EditionError:
                continue
        return found


def _returned(edition: Edition, hook: str, value: Any, expected: type | tuple[type, ...],
              allow_none: bool = False) -> Any:
    if value is None and allow_none:
        return None
    if not isinstance(value, expected):
        names = expected.__name__ if isinstance(expected, type) else " or ".join(
            t.__name__ for t in expected)
        raise PluginError(f"edition {edition.id!r}: hook {hook} returned "
                          f"{type(value).__name__}, expected {names}")
    return value


@dataclass(frozen=True)
class Edition:
    """A layered edition: ``layers[0]`` is the base, ``layers[-1]`` the edition itself.

    The typed methods below are the only way the engine calls hooks.
    """

    layers: tuple[PluginRecord, ...]
    _pm: pluggy.PluginManager = field(init=False, repr=False, compare=False)
    _parameters: dict[Context, Parameters] = field(init=False, repr=False, compare=False,
                                                   default_factory=dict)
    _info: EditionInfo = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        declared = [r.info.forms for r in reversed(self.layers)  # type: ignore[union-attr]
                    if r.info.forms is not None]  # type: ignore[union-attr]
        object.__setattr__(self, "_info", replace(self.layers[-1].info,  # type: ignore[type-var]
                                                  forms=declared[0] if declared else ("SI",)))
        pm = pluggy.PluginManager(hookspecs.PROJECT)
        pm.add_hookspecs(hookspecs)
        for record in self.layers:  # later registrations are called first
            pm.register(record.plugin, name=record.info.id)  # type: ignore[union-attr]
        object.__setattr__(self, "_pm", pm)

    @property
    def info(self) -> EditionInfo:
        """The top layer's identity, with the published forms it inherits resolved."""
        return self._info

    @property
    def id(self) -> str:
        return self.info.id

    @property
    def forms(self) -> tuple[str, ...]:
        """The published forms this edition implements (the first is the default)."""
        return self._info.forms or ("SI",)

    @property
    def base(self) -> EditionInfo:
        return self.layers[0].info  # type: ignore[return-value]

    def _call(self, hook: str, **kwargs: Any) -> Any:
        try:
            return getattr(self._pm.hook, hook)(**kwargs)
        except ClausewiseError:
            raise
        except Exception as exc:
            raise PluginError(f"edition {self.id!r}: hook {hook} raised "
                              f"{type(exc).__name__}: {exc}") from exc

    def parameters(self, context: Context) -> Parameters:
        """Named parameters after layering (they do not depend on the beam, so each
        context is asked once)."""
        if context in self._parameters:
            return self._parameters[context]
        merged: dict[str, Parameter] = {}
        for answer in reversed(self._call("edition_parameters", context=context)):
            for parameter in answer:
                _returned(self, "edition_parameters", parameter, Parameter)
                base = merged.get(parameter.name)
                merged[parameter.name] = parameter if base is None else _override(base,
                                                                                   parameter)
        self._parameters[context] = Parameters(merged)
        return self._parameters[context]

    def applicability(self, beam: Beam, params: Parameters, context: Context) -> list[Check]:
        return self._checks("applicability", beam=beam, params=params, context=context)

    def effective_flange_width(self, beam: Beam, params: Parameters,
                               context: Context) -> Envelope:
        return _returned(self, "effective_flange_width", self._call(
            "effective_flange_width", beam=beam, params=params, context=context), Envelope)

    def concrete_law(self, beam: Beam, params: Parameters, context: Context) -> MaterialModel:
        return _returned(self, "concrete_law", self._call(
            "concrete_law", beam=beam, params=params, context=context), MaterialModel)

    def steel_law(self, beam: Beam, params: Parameters, context: Context) -> MaterialModel:
        return _returned(self, "steel_law", self._call(
            "steel_law", beam=beam, params=params, context=context), MaterialModel)

    def resistance_factor(self, beam: Beam, response: Any, params: Parameters,
                          context: Context) -> Resistance:
        return _returned(self, "resistance_factor", self._call(
            "resistance_factor", beam=beam, response=response, params=params,
            context=context), Resistance)

    def design_actions(self, beam: Beam, params: Parameters,
                       context: Context) -> Envelope | None:
        return _returned(self, "design_actions", self._call(
            "design_actions", beam=beam, params=params, context=context), Envelope,
            allow_none=True)

    def minimum_reinforcement(self, beam: Beam, section: Any, response: Any,
                              demand: Envelope | None, resistance: Resistance,
                              params: Parameters, context: Context) -> list[Check]:
        return self._checks("minimum_reinforcement", beam=beam, section=section,
                            response=response, demand=demand, resistance=resistance,
                            params=params, context=context)

    def ductility_limits(self, beam: Beam, section: Any, response: Any, params: Parameters,
                         context: Context) -> list[Check]:
        return self._checks("ductility_limits", beam=beam, section=section, response=response,
                            params=params, context=context)

    def additional_checks(self, beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> list[Check]:
        answers = self._call("additional_checks", beam=beam, section=section,
                             response=response, params=params, context=context)
        return [_returned(self, "additional_checks", c, Check)
                for answer in reversed(answers) for c in answer]

    def detailing_limits(self, beam: Beam, diameter: Any, params: Parameters,
                         context: Context) -> Any:
        """The edition's ``DetailingLimits`` for bars of ``diameter`` mm, or None where no
        layer answers."""
        from clausewise.provisions.detailing import DetailingLimits, senseless

        limits = _returned(self, "detailing_limits", self._call(
            "detailing_limits", beam=beam, diameter=diameter, params=params,
            context=context), DetailingLimits, allow_none=True)
        problem = senseless(limits) if limits is not None else ""
        if problem:
            raise PluginError(f"edition {self.id!r}: hook detailing_limits answered {problem}")
        return limits

    def _checks(self, hook: str, **kwargs: Any) -> list[Check]:
        answer = self._call(hook, **kwargs)
        return [_returned(self, hook, c, Check) for c in (answer or ())]

    def implementers(self, hook: str) -> list[str]:
        """Which layers implement a hook, topmost first (for the guide and the audit)."""
        return [impl.plugin_name for impl in reversed(getattr(self._pm.hook, hook)
                                                      .get_hookimpls())]


def _override(base: Parameter, new: Parameter) -> Parameter:
    """An upper layer's value for a base parameter: it keeps the base's contract (bounds,
    choices, unit, meaning) and must respect it."""
    merged = replace(new, bounds=new.bounds or base.bounds, choices=new.choices or base.choices,
                     unit=new.unit or base.unit, description=new.description or base.description)
    value, who = merged.value, new.clause.edition or "an upper layer"
    if merged.choices is not None and value not in merged.choices:
        raise ParameterError(f"parameter {new.name} = {value!r} (set by {who}): expected one "
                             f"of {', '.join(merged.choices)}")
    if merged.bounds is not None:
        low, high = merged.bounds
        if not isinstance(value, int | float) or not low <= value <= high:
            unit = f" {merged.unit}" if merged.unit else ""
            raise ParameterError(f"parameter {new.name} = {value!r} (set by {who}): expected a "
                                 f"number from {low:g} to {high:g}{unit}")
    return merged


_DEFAULT: Registry | None = None


def default_registry(*, refresh: bool = False) -> Registry:
    """The process-wide registry, scanned once on first use."""
    global _DEFAULT
    if _DEFAULT is None or refresh:
        only = os.environ.get("CLAUSEWISE_EDITIONS", "")
        registry = Registry(strict=os.environ.get("CLAUSEWISE_STRICT", "") == "1",
                            only=frozenset(i.strip() for i in only.split(",") if i.strip())
                            if only.strip() else None)
        registry.load_entry_points()
        _DEFAULT = registry
    return _DEFAULT
