"""Results as plain data: one record per beam and edition, for JSON, TOML and CSV.

Machine-readable results are in each beam's own unit system unless SI is asked for,
to a stated number of significant figures; each record names its units and the
edition's notation, and the inputs are kept as the engineer wrote them (labelled in
the edition's symbols). Every record
carries the edition id, the form, the stack's versions, the status, the governing
check and the caution. CSV files of check, compare and batch share one column scheme
(``writers.result_columns``).
"""

from clausewise.results.display import UNITS, Units, convert, number, utilisation_text
from clausewise.results.files import write_atomic
from clausewise.results.records import (
    document,
    editions_document,
    parameters_document,
    problem_record,
    record,
    topics_document,
)
from clausewise.results.running import Outcome, run
from clausewise.results.schema import results_schema
from clausewise.results.writers import (
    csv_row,
    editions_csv,
    parameters_csv,
    to_csv,
    to_json,
    to_toml,
    topics_csv,
)

__all__ = ["UNITS", "Outcome", "Units", "convert", "csv_row", "document", "editions_csv",
           "editions_document", "number", "parameters_csv", "parameters_document",
           "problem_record", "record", "results_schema", "run", "to_csv", "to_json", "to_toml",
           "topics_csv", "topics_document", "utilisation_text", "write_atomic"]
