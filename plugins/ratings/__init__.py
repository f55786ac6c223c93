"""Ratings and protection: contacts, overloads, control transformers.

These rules compare what a device is rated for with what the circuit asks of
it. The figures come from the schematic (coil VA, lamp watts, nameplate
currents, fuse ratings) and from published tables held in
``ctllint.circuit.tables`` (NEC Tables 430.250 and 430.248, NEC 430.32, 430.72 and
450.3(B), NEMA ICS 5 pilot duty, IEC 60947 utilisation categories, NEMA
ICS 2 sizes); each table names its source beside it.

How duty is computed (RULES.md "How to compute duty"): the current of a load
is VA / V for inrush and sealed, W / V for resistive loads (pilot lights,
horns) and DC coils, with V the voltage of the supply the load is on; a PLC
input draws its rated ``current``. A load that gives only one of inrush and
sealed uses it for both; a load that gives neither is passed by. The duty of
a contact is the sum over every load it serves, all assumed on together (the
worst case): inrush currents for make, sealed currents for break and for
continuous current.

Rules:

- ``contact-rating``: one contact's (or PLC output's) duty beyond its rating;
  a contactor's main poles below the motor's horsepower at its voltage (NEMA
  size), its controller current (AC-3), a heater's current (AC-1).
- ``overload-setting``: an overload relay whose trip current (dial x trip
  multiple) is above NEC 430.32 of the nameplate current (error), below it
  (warning), or cannot be verified for want of a nameplate (info).
- ``motor-overload``: a contactor feeding a motor with no overload protection.
- ``control-transformer``: the loads of a transformer's supplies (over every
  schematic of the run for a shared transformer) beyond its VA rating,
  sealed and at inrush; a DC power supply's loads beyond its rating.
- ``transformer-protection``: control-transformer fuses missing or above
  NEC 430.72(C) and Table 450.3(B).
- ``vacuum-contactor``: a contactor switching more than 400 A in air (info).
- ``inductive-on-electronic-output``: a transistor or triac output driving an
  unsuppressed inductive load.

The tables are US (NEC, NEMA) and IEC figures, partly from memory; other
codes (CEC, local rules) may differ.
"""
from __future__ import annotations

from ctllint import hookimpl
from ctllint.api import rules_from
from ctllint.circuit.tables import VACUUM_THRESHOLD_A
# The helpers other code reaches as ``ctllint_plugins.ratings.<name>`` (tests, DEVELOPERS.md):
from ctllint_plugins.ratings._contact_duty import Duty, Limits, contact_duty, over_limits, rating_limits
from ctllint_plugins.ratings._controllers import feed_current, motor_at_speed, motor_full_load, role_factor
from ctllint_plugins.ratings._figures import LoadFigures, load_figures, load_power
from ctllint_plugins.ratings._transformer_loads import DEFAULT_EFFICIENCY, SourceLoad, worst_inrush
from ctllint_plugins.ratings.motor_overload import PROTECTIVE_FEEDERS
from ctllint_plugins.ratings.transformer_protection import transformer_fuse_limits

__all__ = [
    "RULES", "ctllint_rules", "VACUUM_THRESHOLD_A", "Duty", "Limits", "contact_duty", "over_limits", "rating_limits",
    "feed_current", "motor_at_speed", "motor_full_load", "role_factor", "LoadFigures", "load_figures", "load_power",
    "DEFAULT_EFFICIENCY", "SourceLoad", "worst_inrush", "PROTECTIVE_FEEDERS", "transformer_fuse_limits",
]

RULES = rules_from(__name__, (
    "contact_rating", "overload_setting", "motor_overload", "control_transformer", "transformer_protection",
    "vacuum_contactor", "inductive_on_electronic_output",
))


@hookimpl
def ctllint_rules():
    return RULES
