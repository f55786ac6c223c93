"""Device kinds: which parts each kind has in rungs, which fields it takes.

This table is the one source for the loader's field checks, the element
roles the circuit graph uses, and the JSON Schema that editors read. A
plugin adds kinds through the ``ctllint_device_kinds`` hook by returning
more ``DeviceKind`` values.
"""
from __future__ import annotations

from dataclasses import dataclass, field

# Field types. Each names a parser in ctllint.reading.loader and a schema fragment
# in ctllint.output.schema.
VOLTAGE = "voltage"          # a Quantity of dimension voltage
CURRENT = "current"          # a Quantity of dimension current
APPARENT = "apparent_power"  # VA
POWER = "power"              # W, kW, hp
TIME = "time"
TEMPERATURE = "temperature"
BOOL = "bool"
NUMBER = "number"            # a plain positive number (ratios)
COUNT = "count"              # a positive whole number
TEXT = "text"
TAG = "tag"                  # another device's tag
TAGS = "tags"                # a list of tags
CONTACTS = "contacts"        # ContactCount
RATING = "rating"            # ContactRating
POWER_RATING = "power_rating"  # PowerRating
POSITIONS = "positions"      # a list of position names
CAMS = "cams"                # a selector's cam table: contact block name -> positions it is closed in
SPEEDS = "speeds"            # a multi-speed motor's speeds: name -> {power, fla}

# Contact parts: NO/NC, and a timer's instantaneous contacts (FORMAT.md
# "Additions"), which follow its coil at once while NO/NC are timed.
INSTANT_PARTS = ("instant-NO", "instant-NC")
CONTACT_PARTS = ("NO", "NC", *INSTANT_PARTS)


def contact_sense(part: str | None) -> str | None:
    """"NO" or "NC" for a contact part (``instant-NO`` and ``fault-NO`` are NO contacts), else None."""
    if part in ("NO", "instant-NO", "fault-NO", "trip-NO"):
        return "NO"
    if part in ("NC", "instant-NC", "fault-NC", "trip-NC"):
        return "NC"
    return None


@dataclass(frozen=True)
class FieldSpec:
    type: str
    choices: tuple[str, ...] = ()     # for TEXT fields with a closed set
    default: object = None
    tag_kinds: tuple[str, ...] = ()   # for TAG/TAGS: kinds the named device may be
    doc: str = ""
    maximum: float | None = None      # for NUMBER: the largest value allowed
    required_text: str = ""           # for TEXT: non-empty text is required; the words say what it is for


# ``location: panel | field`` (every kind): outside the panel, a field device's wires pass the terminal strip.
# Absent, the kind decides (ctllint.output.export.FIELD_KINDS: pushbuttons, switches, solenoids, motors, heaters).
LOCATION = FieldSpec(TEXT, choices=("panel", "field"),
                     doc="panel or field (outside the panel: its wires pass the terminal strip); default by kind")


@dataclass(frozen=True)
class DeviceKind:
    """What a device kind is made of.

    ``parts``: the part names usable as ``TAG.PART`` (besides selector
    positions). ``bare``: the role of the bare ``TAG`` in a path ("load",
    "output", "conductor") or None when the bare tag is not usable.
    ``coil``: the kind has a ``coil`` part whose contacts are NO/NC.
    ``inductive``: its load (coil or bare) is inductive. ``mechanical``: its
    contacts are worked by hand or by the process, not by a coil.
    """

    name: str
    fields: dict[str, FieldSpec]
    required: tuple[str, ...] = ()
    parts: tuple[str, ...] = ()
    bare: str | None = None
    coil: bool = False
    inductive: bool = False
    mechanical: bool = False
    positions: bool = False  # selector: one part per position
    contact_parts: tuple[str, ...] = ()  # parts other than NO/NC that are contacts (an alternating relay's A, B)
    coil_parts: tuple[str, ...] = ()  # coils with names of their own instead of ``coil`` (a latching relay's set, reset)
    optional_coils: tuple[str, ...] = ()  # of coil_parts, those a circuit may leave out (a drive's stop input)
    doc: str = ""
    plugin: str = "core"

    def __post_init__(self) -> None:
        # Every kind may say where the device stands (``ctllint export``'s terminal plan).
        self.fields.setdefault("location", LOCATION)

    @property
    def used_in_rungs(self) -> bool:
        return bool(self.parts or self.bare or self.positions)

    def part_role(self, part: str | None) -> str | None:
        """Role of ``TAG.PART`` (or bare ``TAG`` when part is None), None if the kind lacks it."""
        if part is None:
            return self.bare
        if part in self.coil_parts or (part == "coil" and self.coil and not self.coil_parts):
            return "load"
        if part in CONTACT_PARTS and part in self.parts:
            return "contact"
        if part in self.contact_parts:
            return "contact"
        return None


_CONTACT_FIELDS = {
    "contacts": FieldSpec(CONTACTS, doc="how many contacts the device provides"),
    "rating": FieldSpec(RATING, doc="contact rating: pilot-duty letter, category list or current"),
}

_COIL_FIELDS = {
    "coil": FieldSpec(VOLTAGE, doc="rated coil voltage"),
    "inrush": FieldSpec(APPARENT, doc="coil inrush VA"),
    "sealed": FieldSpec(APPARENT, doc="coil sealed VA"),
    "coil_power": FieldSpec(POWER, doc="DC coil power"),
    "suppressed": FieldSpec(BOOL, default=False, doc="coil has a suppressor"),
    **_CONTACT_FIELDS,
}

_CONTACTOR_FIELDS = {
    **_COIL_FIELDS,
    "poles": FieldSpec(COUNT, doc="number of main poles"),
    "power_rating": FieldSpec(POWER_RATING, doc="main-pole rating: AC-3/AC-1 list or NEMA size"),
    "feeds": FieldSpec(TAG, tag_kinds=("motor", "heater"), doc="the motor or heater it switches"),
    "overload": FieldSpec(TAG, tag_kinds=("overload",), doc="its overload relay"),
    "interlock": FieldSpec(TAG, tag_kinds=("contactor", "starter"), doc="contactor it must never be on with"),
    "vacuum": FieldSpec(BOOL, default=False, doc="vacuum interrupter"),
    "role": FieldSpec(TEXT, choices=("line", "delta", "star"), doc="its place in a wye-delta starter"),
    "speed": FieldSpec(TEXT, doc="the speed of a multi-speed motor it runs (a name under the motor's speeds)"),
    "estop_exempt": FieldSpec(TEXT, doc="why the emergency stop does not drop it (required text)",
                              required_text='the reason the emergency stop leaves it running (e.g. "freeze protection, no motion hazard")'),
}

_SWITCH_FIELDS = {**_CONTACT_FIELDS, "setpoint": FieldSpec(TEXT, doc="free text, e.g. opens at 300 F")}


def _switch(name: str) -> DeviceKind:
    return DeviceKind(name, dict(_SWITCH_FIELDS), parts=("NO", "NC"), mechanical=True)


BUILTIN_KINDS: tuple[DeviceKind, ...] = (
    DeviceKind(
        "pushbutton",
        {
            "action": FieldSpec(TEXT, choices=("momentary", "maintained"), default="momentary"),
            "function": FieldSpec(TEXT, choices=("start", "stop", "emergency-stop", "jog", "reset", "other"), default="other"),
            **_CONTACT_FIELDS,
        },
        parts=("NO", "NC"),
        mechanical=True,
    ),
    DeviceKind(
        "selector",
        {
            "positions": FieldSpec(POSITIONS, doc="position names, the first is the rest position"),
            "action": FieldSpec(TEXT, choices=("maintained", "spring-return"), default="maintained"),
            "cams": FieldSpec(CAMS, doc="cam table: contact block name -> the positions it is closed in (TAG.<block>)"),
            **_CONTACT_FIELDS,
        },
        required=("positions",),
        mechanical=True,
        positions=True,
    ),
    *(_switch(n) for n in ("limit-switch", "pressure-switch", "temperature-switch", "float-switch", "flow-switch", "foot-switch")),
    DeviceKind("relay", dict(_COIL_FIELDS), parts=("coil", "NO", "NC"), coil=True, inductive=True),
    DeviceKind(
        "timer",
        {
            **_COIL_FIELDS,
            "delay": FieldSpec(TEXT, choices=("on", "off"), doc="on-delay or off-delay"),
            "preset": FieldSpec(TIME, doc="time delay"),
        },
        required=("delay", "preset"),
        parts=("coil", "NO", "NC", *INSTANT_PARTS),
        coil=True,
        inductive=True,
    ),
    DeviceKind("contactor", dict(_CONTACTOR_FIELDS), parts=("coil", "NO", "NC"), coil=True, inductive=True),
    DeviceKind("starter", dict(_CONTACTOR_FIELDS), required=("overload",), parts=("coil", "NO", "NC"), coil=True, inductive=True),
    DeviceKind(
        "overload",
        {
            "setting": FieldSpec(CURRENT, doc="current setting (the dial)"),
            "technology": FieldSpec(TEXT, choices=("thermal", "electronic")),
            "trip_multiple": FieldSpec(NUMBER, doc="ultimate trip current / setting (default 1.20, IEC 60947-4-1)"),
            "starting_allowance": FieldSpec(BOOL, doc="set above NEC 430.32(A)(1) because the motor would not start (430.32(C))"),
            "in": FieldSpec(TEXT, choices=("line", "phase"), doc="sits in the line (default) or in a wye-delta motor's phase leads"),
            "reset": FieldSpec(TEXT, choices=("manual", "automatic"), doc="its reset mode"),
            **_CONTACT_FIELDS,
        },
        parts=("NO", "NC"),
    ),
    DeviceKind(
        "solenoid",
        {
            "voltage": FieldSpec(VOLTAGE),
            "inrush": FieldSpec(APPARENT),
            "sealed": FieldSpec(APPARENT),
            "power": FieldSpec(POWER),
            "suppressed": FieldSpec(BOOL, default=False),
        },
        bare="load",
        inductive=True,
    ),
    DeviceKind("pilot-light", {"voltage": FieldSpec(VOLTAGE), "power": FieldSpec(POWER)}, bare="load"),
    DeviceKind(
        "horn",
        {"voltage": FieldSpec(VOLTAGE), "power": FieldSpec(POWER), "suppressed": FieldSpec(BOOL, default=False)},
        bare="load",
        inductive=True,
    ),
    DeviceKind(
        "plc-output",
        {
            "output": FieldSpec(TEXT, choices=("transistor", "relay", "triac")),
            "voltage": FieldSpec(VOLTAGE),
            "rating": FieldSpec(RATING, doc="a current (resistive), or for a relay output its pilot-duty or category rating"),
            "suppressed": FieldSpec(BOOL, default=False),
        },
        bare="output",
    ),
    DeviceKind("plc-input", {"voltage": FieldSpec(VOLTAGE), "current": FieldSpec(CURRENT)}, bare="load"),
    DeviceKind("fuse", {"rating": FieldSpec(CURRENT), "side": FieldSpec(TEXT, choices=("primary", "secondary"))}, bare="conductor"),
    DeviceKind("breaker", {"rating": FieldSpec(CURRENT), "side": FieldSpec(TEXT, choices=("primary", "secondary")),
                           "contacts": FieldSpec(CONTACTS, doc="auxiliary contacts (NO/NC, open when tripped)"),
                           "contact_rating": FieldSpec(RATING, doc="rating of its auxiliary contacts")},
               bare="conductor", parts=("NO", "NC")),
    DeviceKind(
        "transformer",
        {
            "primary": FieldSpec(VOLTAGE),
            "secondary": FieldSpec(VOLTAGE),
            "rating": FieldSpec(APPARENT),
            "inrush_rating": FieldSpec(APPARENT),
            "fuses": FieldSpec(TAGS, tag_kinds=("fuse", "breaker")),
            "class2": FieldSpec(BOOL, doc="Class 2 or Class 1 power-limited (NEC 430.72(C)(1))"),
            "integral": FieldSpec(BOOL, doc="integral to the controller, inside its enclosure (NEC 430.72(C)(3))"),
        },
    ),
    DeviceKind(
        "power-supply",
        {
            "input": FieldSpec(VOLTAGE),
            "output": FieldSpec(VOLTAGE),
            "rating": FieldSpec(CURRENT, doc="rated output current"),
            "efficiency": FieldSpec(NUMBER, doc="output / input power (default 0.85) when its input is counted", maximum=1.0),
            "source": FieldSpec(TAG, tag_kinds=("transformer",), doc="the transformer that feeds its input"),
        },
    ),
    DeviceKind(
        "motor",
        {
            "power": FieldSpec(POWER),
            "voltage": FieldSpec(VOLTAGE),
            "phases": FieldSpec(COUNT, choices=("1", "3")),
            "fla": FieldSpec(CURRENT),
            "service_factor": FieldSpec(NUMBER),
            "temp_rise": FieldSpec(TEMPERATURE),
            "protection": FieldSpec(TEXT, choices=("integral",), doc="thermally protected motor (NEC 430.32(A)(2))"),
            "connection": FieldSpec(TEXT, choices=("wye-delta",), doc="started wye-delta; its contactors give their role"),
            "speeds": FieldSpec(SPEEDS, doc="a multi-speed motor: each speed its own power and nameplate fla"),
        },
        required=("phases",),
    ),
    DeviceKind(
        "heater",
        {"power": FieldSpec(POWER), "voltage": FieldSpec(VOLTAGE), "phases": FieldSpec(COUNT, choices=("1", "3"))},
        required=("phases",),
    ),
)


# Resistive loads in rungs: current W / V at the supply's voltage, no inrush, not inductive.
_RESISTIVE_FIELDS = {
    "voltage": FieldSpec(VOLTAGE, doc="rated voltage"),
    "power": FieldSpec(POWER, doc="rated power (W): its current is W / V, inrush the same"),
}
BUILTIN_KINDS += tuple(
    DeviceKind(name, dict(_RESISTIVE_FIELDS), bare="load", doc=doc)
    for name, doc in (
        ("space-heater", "anti-condensation heater of a motor or enclosure, switched in a rung"),
        ("panel-heater", "heater inside the control panel, usually under a thermostat"),
        ("resistor", "a resistive load: a discharge or load resistor"),
    )
)
# An alternating relay: each time its coil drops out, the other output takes the next turn
# (A on the first cycle, B on the second, ...): duplex pumps share the running hours.
BUILTIN_KINDS += (
    DeviceKind(
        "alternating-relay",
        {k: v for k, v in _COIL_FIELDS.items() if k != "contacts"},
        parts=("coil", "A", "B"),
        coil=True,
        inductive=True,
        contact_parts=("A", "B"),
        doc="coil; contact A closed while the coil is on in A's turn, B in B's; the turn passes at each drop-out",
    ),
    # A latching relay: its set coil closes its NO contacts, its reset coil opens them again,
    # and they stay as they are without power.
    DeviceKind(
        "latching-relay",
        dict(_COIL_FIELDS),
        parts=("set", "reset", "NO", "NC"),
        coil=True,
        inductive=True,
        coil_parts=("set", "reset"),
        doc="set and reset coils; the contacts hold their state without power",
    ),
    # A safety relay module: power terminals, two input channels and a feedback (reset) loop, all
    # electronic inputs on its supply; its safety outputs (NO) close once power and both channels
    # are on and the feedback loop has been closed, and open as soon as power or a channel drops.
    DeviceKind(
        "safety-relay",
        {
            "coil": FieldSpec(VOLTAGE, doc="rated supply voltage of the module (power terminals and inputs)"),
            **_CONTACT_FIELDS,
        },
        parts=("power", "ch1", "ch2", "feedback", "NO", "NC"),
        coil=True,
        coil_parts=("power", "ch1", "ch2", "feedback"),
        doc="power, ch1, ch2 and feedback inputs; NO safety outputs, NC auxiliary contacts",
    ),
)


# A variable-frequency drive or a soft starter: it feeds and protects its motor (motor-overload accepts it).
# Its run and stop command inputs are electronic loads of a few milliamperes on the control supply; it
# runs while its run input is energized (and its stop input, where drawn, is energized too: a stop input
# is wired through the stop button's NC contact) and it has not tripped. NO/NC are its run relay's
# contacts (closed while it runs), fault-NO/fault-NC its fault relay's (worked in ``expect`` by
# ``trip: TAG``, which also stops it).
_DRIVE_FIELDS = {
    "coil": FieldSpec(VOLTAGE, doc="rated voltage of its command inputs"),
    "current": FieldSpec(CURRENT, doc="current drawn by one command input (a few mA)"),
    "feeds": FieldSpec(TAG, tag_kinds=("motor",), doc="the motor it runs and protects"),
    # How it takes its run command, a setting of the drive (common practice: drives offer both). two-wire:
    # it runs while its run input is energized. three-wire: it starts on the rising of its run input while
    # its stop input is energized and latches the command itself until the stop input drops, it trips or
    # control power is lost; its stop input must be drawn (a format error otherwise: nothing could stop it).
    "control": FieldSpec(TEXT, choices=("two-wire", "three-wire"), default="two-wire",
                         doc="two-wire (runs while run is energized) or three-wire (latches a start pulse until stop drops)"),
    # As a contactor's: a drive may run a motor that must stay on through an emergency stop (freeze protection).
    "estop_exempt": _CONTACTOR_FIELDS["estop_exempt"],
    **_CONTACT_FIELDS,
}
BUILTIN_KINDS += tuple(
    DeviceKind(
        name,
        dict(_DRIVE_FIELDS),
        parts=("run", "stop", "NO", "NC", "fault-NO", "fault-NC"),
        coil=True,
        coil_parts=("run", "stop"),
        optional_coils=("stop",),
        contact_parts=("fault-NO", "fault-NC"),
        doc=doc,
    )
    for name, doc in (
        ("drive", "variable-frequency drive: run/stop inputs, run relay NO/NC, fault relay fault-NO/fault-NC"),
        ("soft-starter", "soft starter: run/stop inputs, run relay NO/NC, fault relay fault-NO/fault-NC"),
    )
)


# A motor-protective circuit breaker: a breaker (the bare TAG, a conductor) with an adjustable overload
# ``setting`` checked like an overload relay's (overload-setting) on the motor it ``feeds``, which it
# protects (motor-overload); auxiliary contacts NO/NC follow its handle (open when tripped), trip-NO /
# trip-NC its trip-alarm contact (moved only by a trip). An ordinary breaker may carry NO/NC auxiliary
# contacts too; used bare it stays a conductor.
BUILTIN_KINDS += (
    DeviceKind(
        "motor-breaker",
        {
            "rating": FieldSpec(CURRENT, doc="frame or rated current"),
            "setting": FieldSpec(CURRENT, doc="overload current setting (the dial)"),
            "trip_multiple": FieldSpec(NUMBER, doc="ultimate trip current / setting (default 1.20, IEC 60947-4-1)"),
            "starting_allowance": FieldSpec(BOOL, doc="set above NEC 430.32(A)(1) because the motor would not start (430.32(C))"),
            "feeds": FieldSpec(TAG, tag_kinds=("motor",), doc="the motor it protects"),
            "contacts": FieldSpec(CONTACTS, doc="how many auxiliary contacts it provides"),
            "contact_rating": FieldSpec(RATING, doc="rating of its auxiliary and trip-alarm contacts"),
        },
        parts=("NO", "NC", "trip-NO", "trip-NC"),
        bare="conductor",
        contact_parts=("trip-NO", "trip-NC"),
        doc="breaker with an overload setting: bare TAG a conductor; NO/NC auxiliary, trip-NO/trip-NC trip-alarm contacts",
    ),
)


DRIVE_KINDS = ("drive", "soft-starter")


def three_wire(device) -> bool:
    """``device`` is a drive or soft starter set to three-wire control (it latches a start pulse itself)."""
    return device is not None and device.kind in DRIVE_KINDS and device.get("control") == "three-wire"


def coil_parts(kind: DeviceKind | None) -> tuple[str, ...]:
    """The names of a kind's coils in paths: ``("coil",)``, or its own (``("set", "reset")``); () without a coil."""
    if kind is None or not kind.coil:
        return ()
    return kind.coil_parts or ("coil",)


@dataclass
class KindRegistry:
    """The device kinds known for one run: the built-ins plus plugins' kinds."""

    kinds: dict[str, DeviceKind] = field(default_factory=dict)

    @classmethod
    def builtin(cls) -> "KindRegistry":
        return cls({k.name: k for k in BUILTIN_KINDS})

    def add(self, kind: DeviceKind) -> None:
        self.kinds[kind.name] = kind

    def get(self, name: str) -> DeviceKind | None:
        return self.kinds.get(name)

    def __contains__(self, name: str) -> bool:
        return name in self.kinds

    def names(self) -> list[str]:
        return sorted(self.kinds)


# Element roles (model.Element.role) by the terms of RULES.md.
LOAD = "load"
CONTACT = "contact"
OUTPUT = "output"
CONDUCTOR = "conductor"
SWITCHING_ROLES = (CONTACT, OUTPUT)


def selector_parts(device) -> dict[str, tuple[str, ...]]:
    """A selector's parts and the positions each is closed in.

    Each position ``p`` is a part closed in ``p`` alone (``SS1.hand``); each
    block of the cam table (``cams: {HA: [hand, auto]}``) a part closed in
    every position it lists (``SS1.HA``).
    """
    parts = {str(p): (str(p),) for p in (device.get("positions") or ())}
    for name, closed in (device.get("cams") or {}).items():
        parts.setdefault(name, tuple(closed))
    return parts
