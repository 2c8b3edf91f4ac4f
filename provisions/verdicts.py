"""The words every result uses: the caution, the statuses, and the one rule that turns
checks into a verdict for one beam or a batch (numpy is imported only by that rule, so
the command line can show the words before loading anything heavy)."""

from __future__ import annotations

from collections.abc import Sequence
from enum import StrEnum
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from clausewise.provisions.vocabulary import Check

CAUTION = (
    "An aid to a licensed engineer, not a substitute for one: the adopted edition, local "
    "amendments and the engineer of record govern."
)


class Status(StrEnum):
    """The verdict on one beam under one edition; its value is the text results carry."""

    PASS = "pass"
    FAIL = "fail"
    OUT_OF_SCOPE = "outside scope"
    NO_EQUILIBRIUM = "no equilibrium"
    CAPACITY_ONLY = "capacity only"  # every check passes, but no actions were given
    ERROR = "error"  # an edition could not assess the beam (batch and command-line results)

    @property
    def failed(self) -> bool:
        """Whether the status makes a run fail (exit status 1): a failed check, a beam
        outside scope or without equilibrium. Capacity only is not a failure."""
        return self in (Status.FAIL, Status.OUT_OF_SCOPE, Status.NO_EQUILIBRIUM)


PASS, FAIL, OUT_OF_SCOPE = Status.PASS, Status.FAIL, Status.OUT_OF_SCOPE
NO_EQUILIBRIUM, CAPACITY_ONLY, ERROR = Status.NO_EQUILIBRIUM, Status.CAPACITY_ONLY, Status.ERROR
FAILURES = frozenset(s for s in Status if s.failed)  # plain texts compare equal to these
TOLERANCE = 1e-12  # a utilisation up to 1 + TOLERANCE passes


def governing(checks: Sequence[Check], size: int | None = None) -> tuple[Any, Any]:
    """Index of the check with the highest utilisation and that utilisation: ints and
    floats for one beam (``size`` None), arrays of shape (size,) for a batch. ``(None,
    None)`` without checks."""
    import numpy as np

    if not checks:
        return None, None
    if size is None:
        utilisations = [c.utilisation for c in checks]
        worst = max(range(len(checks)), key=utilisations.__getitem__)
        return worst, utilisations[worst]
    table = np.empty((len(checks), size))
    for i, c in enumerate(checks):
        table[i] = c.utilisation  # one value for all beams, or one per beam
    worst_rows = np.argmax(table, axis=0)
    return worst_rows, table[worst_rows, np.arange(size)]


def status(*, in_scope: Any, equilibrium: Any, checks: Sequence[Check],
           has_demand: bool) -> Any:
    """The verdict: outside scope, else no equilibrium, else fail if a check fails, else
    pass, or capacity only where no actions were given. Scalars give a ``Status``; arrays
    (one entry per beam) give an object array of ``Status``."""
    if all(type(v) is bool or isinstance(v, float | int) for v in (in_scope, equilibrium)) \
            and all(isinstance(c.utilisation, float) for c in checks):
        return _one_status(bool(in_scope), bool(equilibrium), checks, has_demand)
    import numpy as np

    passed: Any = True
    for c in checks:
        passed = np.logical_and(passed, np.asarray(c.utilisation) <= 1.0 + TOLERANCE)
    order = np.array(_ORDER, dtype=object)
    done = _ORDER.index(PASS if has_demand else CAPACITY_ONLY)
    index = np.where(~np.asarray(in_scope, bool), _ORDER.index(OUT_OF_SCOPE),
                     np.where(~np.asarray(equilibrium, bool), _ORDER.index(NO_EQUILIBRIUM),
                              np.where(passed, done, _ORDER.index(FAIL))))
    return order[index] if index.ndim else _ORDER[int(index)]


def _one_status(in_scope: bool, equilibrium: bool, checks: Sequence[Check],
                has_demand: bool) -> Status:
    """The same verdict for one beam, without numpy's per-call cost."""
    if not in_scope:
        return OUT_OF_SCOPE
    if not equilibrium:
        return NO_EQUILIBRIUM
    if not all(c.utilisation <= 1.0 + TOLERANCE for c in checks):
        return FAIL
    return PASS if has_demand else CAPACITY_ONLY


_ORDER = (PASS, FAIL, OUT_OF_SCOPE, NO_EQUILIBRIUM, CAPACITY_ONLY)


# --- the one line on what governs, as every result words it -----------------------------

NO_ACTIONS = "capacity only: no actions given"
_VERDICTS: dict[str, str] = {PASS: "passes", CAPACITY_ONLY: "capacity only (no actions given)"}


def governed_head(status: str, check: str, clause: str) -> str:
    """The line up to its utilisation: "passes; governed by flexural strength (aci318-19
    9.5.1.1) at utilisation " (a batch writes the number after it, row by row)."""
    return f"{_VERDICTS.get(status, 'fails')}; governed by {check} ({clause}) at utilisation "


def outside_scope_line(edition_id: str, failed: Sequence[tuple[str, str]]) -> str:
    """The line of a beam outside an edition's scope: each failed scope check by name and
    clause reference."""
    return f"outside the scope of {edition_id}: " + "; ".join(
        f"{name} ({ref})" for name, ref in failed)
