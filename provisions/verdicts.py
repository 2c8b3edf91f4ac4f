"""The words every result uses: the caution and the statuses (no imports, so the command
line can show them before loading anything heavy)."""

CAUTION = (
    "An aid to a licensed engineer, not a substitute for one: the adopted edition, local "
    "amendments and the engineer of record govern."
)

PASS, FAIL, OUT_OF_SCOPE, NO_EQUILIBRIUM = "pass", "fail", "outside scope", "no equilibrium"
ERROR = "error"  # an edition could not assess the beam (in batch and command-line results)
