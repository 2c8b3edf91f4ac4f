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
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager
from contextvars import ContextVar
from dataclasses import dataclass, field, replace
from functools import partial
from typing import Any

import pluggy

from clausewise.core.errors import ClausewiseError
from clausewise.provisions import hookspecs
from clausewise.provisions.answers import (
    EditionInfo,
    MaterialModel,
    Notation,
    ParameterError,
    Parameters,
    Resistance,
)
from clausewise.provisions.beam import Beam, Context
from clausewise.provisions.vocabulary import Check, Envelope, Parameter

GROUP = "clausewise.editions"


def plugin_names() -> frozenset[str]:
    """The names of the installed edition plugins (their ids), loaded or not."""
    from importlib.metadata import entry_points

    return frozenset(ep.name for ep in entry_points(group=GROUP))


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
    for caller in pm.get_hookcallers(plugin) or ():
        if any(impl.hookwrapper for impl in caller.get_hookimpls()):
            raise PluginError(f"hook {caller.name}: write a wrapper as @hookimpl(wrapper="
                              "True), a generator that returns the changed answer; the old "
                              "hookwrapper=True style is not supported")
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
    _editions: dict[str, Edition] = field(default_factory=dict, init=False, repr=False,
                                          compare=False)

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
        self._editions.clear()  # a new layer may change any stack
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
        """The layered edition ``edition_id`` (its bases below it), built once per id and
        kept until a plugin is added: building one costs a plugin manager."""
        cached = self._editions.get(edition_id)
        if cached is not None:
            return cached
        edition = self._build(edition_id)
        self._editions[edition_id] = edition
        return edition

    def _build(self, edition_id: str) -> Edition:
        by_id = self._by_id()
        if edition_id not in by_id:
            failed = next((r for r in self.broken if r.name == edition_id), None)
            if failed is not None and edition_id in plugin_names():
                raise EditionError(f"edition {edition_id!r} is installed but its plugin is "
                                   f"broken: {failed.error}")
            # a registry that loaded only some plugins still names every installed one
            installed = by_id.keys() if self.only is None else plugin_names()
            known = ", ".join(sorted(installed)) or "none installed"
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


@dataclass(frozen=True)
class TopicAnswer:
    """Who answered one hook in one assessment: the layer whose answer was taken (every
    layer that answered, for a hook that asks every layer) and the layers that wrapped
    it, innermost first."""

    hook: str
    answered_by: tuple[str, ...]
    wrapped_by: tuple[str, ...] = ()


_TRAILS: ContextVar[tuple[dict[str, TopicAnswer], ...]] = ContextVar("clausewise_trails",
                                                                       default=())


@contextmanager
def answers_trail() -> Iterator[dict[str, TopicAnswer]]:
    """Record, by hook, which layer answered and which wrapped, for the hooks called
    inside the block (the engine uses it for the audit); blocks may nest."""
    trail: dict[str, TopicAnswer] = {}
    token = _TRAILS.set((*_TRAILS.get(), trail))
    try:
        yield trail
    finally:
        _TRAILS.reset(token)


@dataclass(frozen=True)
class _Step:
    layer: str
    function: Callable[..., Any]
    argnames: tuple[str, ...]
    wrapper: bool


def _quiet_floats() -> Any:
    """A plugin's floating-point trouble (x/0) never reaches the user as a numpy warning:
    the inf or NaN it makes is in the answer, which the sense checks then judge."""
    import numpy as np

    return np.errstate(all="ignore")


def _sense_checked(edition: Edition, hook: str, value: Any, kwargs: dict[str, Any],
                   layers: tuple[str, ...]) -> None:
    """Values, not only types: see :mod:`clausewise.provisions.answer_checks`; ``layers``
    answered and wrapped the hook, the last one's answer is the one judged."""
    from clausewise.provisions.answer_checks import AnswerError, answer_problems

    problems = answer_problems(hook, value, kwargs.get("response"), kwargs.get("beam"))
    if problems:
        raise AnswerError(edition.id, layers[-1] if layers else "?", hook, problems)


@dataclass(frozen=True)
class Edition:
    """A layered edition: ``layers[0]`` is the base, ``layers[-1]`` the edition itself.

    :meth:`ask` calls a hook through the layers as :data:`hookspecs.HOOKS` declares it;
    the typed methods below are the only way the engine calls hooks.
    """

    layers: tuple[PluginRecord, ...]
    _pm: pluggy.PluginManager = field(init=False, repr=False, compare=False)
    _parameters: dict[Context, Parameters] = field(init=False, repr=False, compare=False,
                                                   default_factory=dict)
    _info: EditionInfo = field(init=False, repr=False, compare=False)
    _steps: dict[str, tuple[_Step, ...]] = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "_info", replace(  # type: ignore[type-var]
            self.layers[-1].info, forms=self._inherited("forms", ("SI",)),
            notation=self._inherited("notation", Notation()),
            situations=self._inherited("situations", ("persistent",))))
        pm = pluggy.PluginManager(hookspecs.PROJECT)
        pm.add_hookspecs(hookspecs)
        for record in self.layers:  # later registrations are called first
            pm.register(record.plugin, name=record.info.id)  # type: ignore[union-attr]
        object.__setattr__(self, "_pm", pm)
        order = {r.info.id: i for i, r in enumerate(self.layers)}  # type: ignore[union-attr]
        steps = {}
        for hook in hookspecs.HOOKS:
            impls = sorted(getattr(pm.hook, hook.name).get_hookimpls(),
                           key=lambda impl: order[impl.plugin_name])
            steps[hook.name] = tuple(_Step(impl.plugin_name, impl.function,
                                           tuple(impl.argnames), impl.wrapper)
                                     for impl in impls)
        object.__setattr__(self, "_steps", steps)

    def _inherited(self, name: str, default: Any) -> Any:
        """A field of the identity from the topmost layer that declares it, else
        ``default``: what an extending edition leaves out, it takes from its base."""
        for record in reversed(self.layers):
            value = getattr(record.info, name)
            if value is not None:
                return value
        return default

    @property
    def info(self) -> EditionInfo:
        """The top layer's identity, with the forms, notation and design situations it
        inherits resolved."""
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

    @property
    def situations(self) -> tuple[str, ...]:
        """The design situations this edition distinguishes."""
        return self._info.situations or ("persistent",)

    # --- calling hooks through the layers ---------------------------------------------
    def ask(self, hook: str, **kwargs: Any) -> Any:
        """The stack's answer to ``hook``, checked against what the hook promises.

        Top down: a plain implementation that answers (not ``None``) is taken and the
        layers below it are not asked; a wrapper receives the answer of the layers below
        and returns it changed. A hook of every layer keeps every answer, bottom first.
        """
        spec = hookspecs.BY_NAME[hook]
        with _quiet_floats():  # once for every layer asked
            value, answered, wrapped = self._fold(spec, len(self._steps[hook]) - 1, kwargs)
        if value is None and spec.many:
            value = []
        self._check(spec, "the stack", value)
        _sense_checked(self, hook, value, kwargs, (*answered, *wrapped))
        for trail in _TRAILS.get():
            trail[hook] = TopicAnswer(hook, answered, wrapped)
        return value

    def _fold(self, spec: hookspecs.Hook, i: int, kwargs: dict[str, Any]
              ) -> tuple[Any, tuple[str, ...], tuple[str, ...]]:
        if i < 0:
            return None, (), ()
        step = self._steps[spec.name][i]
        args = [kwargs[name] for name in step.argnames]
        if step.wrapper:
            return self._wrap(spec, step, args, i, kwargs)
        value = self._run(spec, step, args)
        if spec.every_layer:
            below, answered, wrapped = self._fold(spec, i - 1, kwargs)
            if value is None:
                return below, answered, wrapped
            self._check(spec, step.layer, value)
            return [*(below or ()), *value], (*answered, step.layer), wrapped
        if value is None:
            return self._fold(spec, i - 1, kwargs)
        self._check(spec, step.layer, value)
        return value, (step.layer,), ()

    def _wrap(self, spec: hookspecs.Hook, step: _Step, args: list[Any], i: int,
              kwargs: dict[str, Any]) -> tuple[Any, tuple[str, ...], tuple[str, ...]]:
        """pluggy's wrapper protocol: run to ``yield``, send the answer of the layers below
        (or throw what they raised), take the value it returns."""
        generator = self._run(spec, step, args)
        try:
            self._run(spec, step, [], generator.__next__)
        except StopIteration:
            raise PluginError(f"edition {self.id!r}: the wrapper {spec.name} of layer "
                              f"{step.layer!r} returned without a yield") from None
        answered: tuple[str, ...] = ()
        wrapped: tuple[str, ...] = ()
        try:
            below, answered, wrapped = self._fold(spec, i - 1, kwargs)
            resume: Callable[[], Any] = partial(generator.send, below)
        except Exception as exc:
            resume = partial(generator.throw, exc)
        try:
            self._run(spec, step, [], resume)
        except StopIteration as stop:
            value = stop.value
        else:
            raise PluginError(f"edition {self.id!r}: the wrapper {spec.name} of layer "
                              f"{step.layer!r} yielded twice")
        if value is None and not spec.may_return_none:
            raise PluginError(f"edition {self.id!r}: the wrapper {spec.name} of layer "
                              f"{step.layer!r} returned None; return the answer it received, "
                              "changed or not")
        self._check(spec, step.layer, value)
        return value, answered, (*wrapped, step.layer)

    def _run(self, spec: hookspecs.Hook, step: _Step, args: list[Any],
             call: Callable[..., Any] | None = None) -> Any:
        try:
            return (call or step.function)(*args)
        except (ClausewiseError, StopIteration):
            raise
        except Exception as exc:
            raise PluginError(f"edition {self.id!r}: hook {spec.name} of layer "
                              f"{step.layer!r} raised {type(exc).__name__}: {exc}") from exc

    def _check(self, spec: hookspecs.Hook, who: str, value: Any) -> None:
        """An answer has the type its hook promises (each item, for a list)."""
        if value is None:
            if spec.may_return_none or who != "the stack":
                return
            raise PluginError(f"edition {self.id!r}: no layer answers the hook {spec.name} "
                              f"(expected {spec.returns_text.replace('`', '')})")
        if spec.many and (isinstance(value, str | bytes) or not isinstance(value, Sequence)):
            bad: Any = value  # a list hook answered with something that is not a list
        else:
            items = value if spec.many else (value,)
            bad = next((v for v in items if not isinstance(v, spec.returns)), None)
            if bad is None:
                return
        where = "the stack" if who == "the stack" else f"layer {who!r}"
        raise PluginError(f"edition {self.id!r}: hook {spec.name} of {where} returned "
                          f"{type(bad).__name__}, expected "
                          f"{spec.returns_text.replace('`', '')}")

    # --- the typed facade ---------------------------------------------------------------
    def parameters(self, context: Context) -> Parameters:
        """Named parameters after layering (they do not depend on the beam, so each
        context is asked once)."""
        if context in self._parameters:
            for trail in _TRAILS.get():  # asked once, recorded in every assessment
                trail["edition_parameters"] = self.layering("edition_parameters")
            return self._parameters[context]
        merged: dict[str, Parameter] = {}
        for parameter in self.ask("edition_parameters", context=context):
            base = merged.get(parameter.name)
            merged[parameter.name] = parameter if base is None else _override(base, parameter)
        self._parameters[context] = Parameters(merged)
        return self._parameters[context]

    def applicability(self, beam: Beam, params: Parameters, context: Context) -> list[Check]:
        return list(self.ask("applicability", beam=beam, params=params, context=context))

    def effective_flange_width(self, beam: Beam, params: Parameters,
                               context: Context) -> Envelope:
        return self.ask("effective_flange_width", beam=beam, params=params,
                        context=context)

    def concrete_law(self, beam: Beam, params: Parameters, context: Context) -> MaterialModel:
        return self.ask("concrete_law", beam=beam, params=params, context=context)

    def steel_law(self, beam: Beam, params: Parameters, context: Context) -> MaterialModel:
        return self.ask("steel_law", beam=beam, params=params, context=context)

    def resistance_factor(self, beam: Beam, response: hookspecs.SolvedSection,
                          params: Parameters, context: Context) -> Resistance:
        return self.ask("resistance_factor", beam=beam, response=response,
                        params=params, context=context)

    def design_actions(self, beam: Beam, params: Parameters,
                       context: Context) -> Envelope | None:
        return self.ask("design_actions", beam=beam, params=params, context=context)

    def minimum_reinforcement(self, beam: Beam, section: hookspecs.SectionView,
                              response: hookspecs.SolvedSection,
                              demand: Envelope | None, resistance: Resistance,
                              params: Parameters, context: Context) -> list[Check]:
        return list(self.ask("minimum_reinforcement", beam=beam, section=section,
                             response=response, demand=demand, resistance=resistance,
                             params=params, context=context))

    def ductility_limits(self, beam: Beam, section: hookspecs.SectionView,
                         response: hookspecs.SolvedSection, params: Parameters,
                         context: Context) -> list[Check]:
        return list(self.ask("ductility_limits", beam=beam, section=section,
                             response=response, params=params, context=context))

    def additional_checks(self, beam: Beam, section: hookspecs.SectionView,
                          response: hookspecs.SolvedSection, demand: Envelope | None,
                          resistance: Resistance, params: Parameters,
                          context: Context) -> list[Check]:
        return list(self.ask("additional_checks", beam=beam, section=section,
                             response=response, demand=demand, resistance=resistance,
                             params=params, context=context))

    def detailing_limits(self, beam: Beam, diameter: Any, params: Parameters,
                         context: Context) -> Any:
        """The edition's ``DetailingLimits`` for bars of ``diameter`` mm, or None where no
        layer answers."""
        return self.ask("detailing_limits", beam=beam, diameter=diameter, params=params,
                        context=context)

    # --- who answers what ---------------------------------------------------------------
    def implementers(self, hook: str) -> list[str]:
        """Which layers implement a hook, topmost first (replacing or wrapping)."""
        return [step.layer for step in reversed(self._steps[hook])]

    def contributions(self) -> dict[str, str]:
        """What the top layer itself does, by hook: "answers" or "wraps" (identity and
        parameters left out), for the listing of editions."""
        top = self.id
        found = {}
        for hook in hookspecs.HOOKS:
            if hook.name in ("edition_info", "edition_parameters"):
                continue
            for step in self._steps[hook.name]:
                if step.layer == top:
                    found[hook.name] = "wraps" if step.wrapper else "answers"
        return found

    def layering(self, hook: str) -> TopicAnswer:
        """Who answers ``hook`` as installed: the topmost layer that replaces it (every
        layer that implements it, for a hook of every layer) and the layers above that
        wrap it. A layer may still pass (return ``None``) for some beams; an assessment
        records who answered it (``Assessment.topics``)."""
        steps = self._steps[hook]
        plain = [s.layer for s in steps if not s.wrapper]
        if hookspecs.BY_NAME[hook].every_layer:
            return TopicAnswer(hook, tuple(plain), tuple(s.layer for s in steps if s.wrapper))
        top = next((i for i in range(len(steps) - 1, -1, -1) if not steps[i].wrapper), -1)
        return TopicAnswer(hook, tuple(plain[-1:]),
                           tuple(s.layer for s in steps[top + 1:] if s.wrapper))


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
