"""Running a schedule: every good beam under every edition, one outcome each."""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from clausewise.provisions import Assessment, ClausewiseError, Notation, assess
from clausewise.provisions.verdicts import ERROR

if TYPE_CHECKING:
    from clausewise.beamfile import BeamEntry, Schedule
    from clausewise.provisions import Edition


@dataclass(frozen=True)
class Outcome:
    """One beam under one edition: its assessment, or why it could not be assessed."""

    entry: BeamEntry
    edition: str
    assessment: Assessment | None = None
    error: str = ""
    situation: str = "persistent"
    notation: Notation = Notation()

    @property
    def status(self) -> str:
        return self.assessment.status if self.assessment else ERROR


def run(schedule: Schedule, editions: Sequence[Edition], form: str | None,
        situation: str) -> Iterator[Outcome]:
    """Every good beam of the schedule under every edition, one at a time.

    A beam that an edition cannot assess (a broken plugin, a form the edition lacks,
    a degenerate section) becomes an outcome with the error, and the others go on.
    """
    notations = {edition.id: edition.info.notation or Notation() for edition in editions}
    for entry in schedule.entries:
        for edition in editions:
            notation = notations[edition.id]
            try:
                found = assess(entry.beam, edition, form=form, situation=situation)
            except ClausewiseError as exc:
                yield Outcome(entry, edition.id, error=str(exc), situation=situation,
                              notation=notation)
            else:
                yield Outcome(entry, edition.id, found, situation=situation, notation=notation)


