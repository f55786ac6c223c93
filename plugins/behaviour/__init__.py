"""Behaviour: the schematic's own ``expect`` scenarios, run on the simulator.

An ``expect`` scenario states what the circuit must do: press a start
button, release it, and the motor stays on; trip the overload and it stops.
Each scenario starts from the rest state (power on, every device
unactuated, maintained devices in their first position, overloads reset,
settled) and runs its steps in order on the same behaviour model that every
other command uses (FORMAT.md "Behaviour model").

Rules:

- ``expectation``: a ``check`` step whose state does not hold, reported at
  the tag of the check that failed.
- ``unsettled``: a step after which the circuit does not settle (it
  oscillates) or shorts a supply; the scenario stops there.
"""
from __future__ import annotations

from ctllint import hookimpl
from ctllint.api import rules_from

RULES = rules_from(__name__, ("expectation", "unsettled"))


@hookimpl
def ctllint_rules():
    return RULES
