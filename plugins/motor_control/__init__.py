"""Motor control: the habits of three-wire relay logic, checked on the circuit graph.

These rules look at how stop, start, overload, interlock and emergency-stop
contacts sit around the coils they govern, the way a controls engineer reads
a ladder: stop buttons normally closed and in series, the overload contact in
series with its starter's coil, a seal-in around the start button, reversing
pairs interlocked, an emergency stop that latches and drops every contactor,
no contactor that restarts a motor by itself when power returns, and no coil
that switches itself off.

Every rule asks the shared circuit analyses (``ctx.circuit``) whether a coil
has an energizing path with some elements taken out; none enumerates paths,
so each check stays linear in the size of the circuit per question asked.

Choices where the catalogue leaves room:

- ``stop-normally-closed`` (and the NO problem of ``emergency-stop``) leave
  out an auxiliary NO contact that only signals "pressed": the device stops
  through an NC contact used in the rungs, and the NO serves nothing but
  pilot lights, horns and PLC inputs (an e-stop's status contact to the
  PLC). A stop device used only through NO contacts, or whose NO serves a
  coil or solenoid, is flagged as before.
- ``stop-in-series`` and ``interlock`` look at coils (``X.coil``), not at
  lights or solenoids. The message of ``stop-in-series`` names the part of
  the bypassing path on the stop's side of the coil.
- ``seal-in``: a NO contact of the coil's own device "bypasses" the start
  contact when the two lie on a common loop of non-load wiring (the same
  biconnected component once the loads are taken out) and the contact serves
  the coil. A NO contact of another coil the same start contact energizes
  counts too (the main contactor of a star-delta starter holds the star,
  delta and timer coils started with it). A timer's timed contacts never
  seal, its own coil included (an on-delay NO is still open when the button
  is released, an off-delay NO stays closed after stop and restarts); its
  ``instant-NO`` does. A NO contact around the start that is no seal (a
  timed contact, or a contact of a coil this button does not start) is
  reported with what it really does: a timed contact drops out or restarts,
  another starter's contact starts this coil whenever that one runs. The
  advice for a timer names its ``instant-NO``, never a timed contact. The
  stop and overload contacts that must stay in series are the ones in series
  with the coil while its own NO contacts are open (the circuit as the start
  button sees it); so a seal wired around the stop as well as the start
  fails, while two stop buttons wired in parallel are left to
  ``stop-in-series``.
- ``interlock`` treats the pair as symmetric: when M1F names M1R, both coils
  need the other's NC contact in series, each reported at its own coil.
- ``auto-restart``: a spring-return selector is a momentary device (only its
  rest position can be closed at power return); device kinds that a plugin
  adds, and elements of unknown devices, count as open.
- ``oscillation`` fires when a coil's own NC contact serves the coil (lies on
  at least one energizing path), not only when it is in series: whenever
  that path alone feeds the coil, it chatters. The exception is an own NO
  contact that also serves the coil and lies on a common loop of wiring with
  the NC (as in a changeover): it takes over as the NC opens. Timers are
  left out: a timer's own timed NC contact in its coil circuit is the usual
  recycling (pulse) timer, which switches once per preset rather than
  chattering. The simulator is also run from rest, and a circuit that does
  not settle there is reported at the first coil that keeps switching, when
  no own-NC finding already covers it.
- ``emergency-stop``: contactors and starters with a non-empty
  ``estop_exempt`` reason are left out. "its supply" is the supply of the loads its contacts
  serve, and any supply with a contactor or starter it governs through a
  relay (a 24 VDC safety relay switching 120 VAC starters makes the 120 VAC
  starters its own). A coil is governed when every energizing path passes a
  contact of the emergency stop or a NO contact of a relay, timer, contactor or starter
  whose coil is governed (a master control relay, or a chain of them). The
  momentary, NO and governing problems of one device are given in one
  finding at its tag. A drive's or soft starter's ``run`` input counts as
  its motor's coil (``estop_exempt`` on the drive as on a contactor); the
  drive is dropped when its run input is governed, or its ``stop`` input
  where drawn (it runs only while that is energized). Its run relay's NO
  contacts are not taken as governing what they serve: a drive's relay
  output may be set to signal something other than "running".
- ``stop-in-series`` and ``seal-in`` read a drive's or soft starter's
  ``run`` input (and, for ``stop-in-series``, its ``stop`` input) as a coil:
  the simulator runs a drive only while its run input is energized, so a
  momentary start straight to it needs a seal-in (the drive's own run relay
  NO can give one, as a coil's NO does); a drive set to latch a start pulse
  by itself is not modelled.
- ``switch-fan-out`` counts the power-inductive branches a contact makes:
  coils of contactors and starters (those that feed the same motor or
  heater are one branch, one starter assembly such as a wye-delta), solenoids
  and horns; relay and timer coils are not counted, being the interposing
  devices the rule asks for. Every NO contact (and selector position) makes,
  and so does an NC contact of a maintained or process switch; the NC
  contact of a momentary pushbutton (a stop) only breaks sealed current and
  is not counted. Branches are grouped by the `feeds` field as written: a
  wye-delta's contactors that do not name their motor count apart. "At
  once": the count is the largest set of branches that can be made
  together. Two loads are never made together when a third device's
  contacts choose between them (every path of one passes its NC, of the
  other its NO; or two positions of one selector: that device's state is
  given when the switch closes), and the two coils of an interlock pair
  count as one only where each has an NC contact of the other on every
  energizing path (a one-sided interlock does not count).
- A ``safety-relay`` module is governed by an emergency stop in its power
  or in either input channel (its NO safety outputs then count as governed
  contacts); for ``auto-restart`` its outputs can come on at power return
  when its feedback loop can (no momentary reset button in it), and a
  ``latching-relay``'s contacts are taken as possibly closed (it held its
  state through the outage).
- ``safety-relay-feedback``: the contactors and starters whose coils a safety
  relay's NO outputs serve (directly or further down the path) each need an
  NC contact on every energizing path of its ``feedback`` input.
"""
from __future__ import annotations

from typing import Iterable

from ctllint import hookimpl
from ctllint.api import Rule, rules_from

RULES = rules_from(__name__, (
    "stop_normally_closed",
    "stop_in_series",
    "overload_in_coil_path",
    "seal_in",
    "switch_fan_out",
    "interlock",
    "emergency_stop",
    "auto_restart",
    "safety_relay_feedback",
    "oscillation",
))


@hookimpl
def ctllint_rules() -> Iterable[Rule]:
    return RULES
