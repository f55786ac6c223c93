"""The behaviour model (FORMAT.md "Behaviour model"): states, settling, timers.

One model serves the ``expect`` scenarios, the rules that simulate, and any
command that shows states. ``Simulator(circuit)`` holds:

- power on or off;
- for each mechanical switch (pushbutton, limit, pressure, temperature,
  float, flow, foot switch): actuated or not (``press``/``release``,
  ``set: {TAG: on|off}``);
- for each selector: its position (the first at rest; ``set: {SS1: auto}``;
  ``release`` returns it to its first position);
- overloads tripped or not, fuses and breakers blown or not (``trip`` and
  ``reset``);
- PLC outputs on or off (``set: {Q0_3: on}``);
- for each relay, contactor and starter: whether its contacts are moved;
  for each timer: its coil state, the time spent in it, and whether its
  timed contacts are moved;
- for each latching relay: whether it is set (its NO closed): its set coil
  sets it, its reset coil resets it (reset wins when both are on), and it
  holds its state without power;
- for each safety relay: whether its safety outputs are on: they come on
  when its power, both channels and its feedback (reset) loop are on
  together, and go off as soon as power or a channel drops (a reset button
  in the feedback loop: the restart waits for it, and for the mirror
  contacts in the loop);
- for each drive and soft starter: whether it runs (its run relay moved):
  set to two-wire control, while its run input (and its stop input, where
  drawn) is energized; set to three-wire control, from a rising of its run
  input while its stop input is energized until the stop input drops, it
  trips or control power goes (the latch is lost: a run input already on
  at power-up or at rest is no start). Neither runs while tripped;
- for each alternating relay: its coil state and whose turn it is (A at
  rest): A is closed while the coil is on in A's turn, B in B's, and the
  turn passes to the other output each time the coil drops out.

Conduction: a NO contact is closed when its device is actuated (switch
pressed or on, overload tripped, coil energized), a NC contact when it is
not; a selector part is closed in its own position (a block of its cam
table in each position the table lists); a fuse or breaker unless
tripped; a PLC output when on. Timer contacts: on-delay, they move once the
coil has been energized continuously for ``preset`` and return as soon as it
drops; off-delay, they move as soon as the coil energizes and return once it
has been de-energized for ``preset``. A preset of zero acts at once.
Elements whose role is unknown never conduct.

A load is energized when one terminal connects to a supply's hot rail and the
other to the same supply's common rail through closed non-load elements
(union-find over the closed elements: linear in the circuit per evaluation).
With power off nothing is energized, and off-delay timers return at once
(their timing needs control power, as in most timing relays).

Settling is synchronous: evaluate every load, then move every coil's
contacts, and repeat until nothing changes. A state (the vector of contact
positions) seen before means an oscillation: it is reported with the coils
that change within the cycle, never looped on. Two coils racing each other
after the same input change therefore show as an oscillation too, which is
what a race is worth on a drawing. After settling, hot and common of a
supply joined through closed non-load elements is a short circuit, reported
with its path. ``settled`` is false for either.

``wait(seconds)`` jumps from one timer event to the next within the time
given and settles after each; a circuit that cycles through timers (a
flasher) is recognised when a state with the same times returns, and whole
periods are skipped.

The package holds the model in layers, each a class in a module of its own
that the next builds on: ``devices`` (what the circuit's devices are, read
once), ``state`` (the state of every device and what conducts in it),
``coils`` (how each kind of device follows its coils), ``settle``
(energizing loads and settling, oscillation and shorts), ``timing`` (time
passing for timers, and control power), ``scenario`` (running an ``expect``
scenario and its findings); and ``simulator``, the ``Simulator`` rules and
commands use, with its queries and actions.
"""
from ctllint.circuit.simulate.scenario import ScenarioEvent
from ctllint.circuit.simulate.settle import StepResult
from ctllint.circuit.simulate.simulator import Simulator

__all__ = ["ScenarioEvent", "Simulator", "StepResult"]
