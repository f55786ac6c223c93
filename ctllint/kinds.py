"""Device kinds: which parts each kind has in rungs, which fields it takes.

This table is the one source for the loader's field checks, the element
roles the circuit graph uses, and the JSON Schema that editors read. A
plugin adds kinds through the ``ctllint_device_kinds`` hook by returning
more ``DeviceKind`` values.
"""
from __future__ import annotations

from dataclasses import dataclass, field

# Field types. Each names a parser in ctllint.loader and a schema fragment
# in ctllint.schema.
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
SPEEDS = "speeds"            # a multi-speed motor's speeds: name -> {power, fla}

# Contact parts: NO/NC, and a timer's instantaneous contacts (FORMAT.md
# "Additions"), which follow its coil at once while NO/NC are timed.
INSTANT_PARTS = ("instant-NO", "instant-NC")
CONTACT_PARTS = ("NO", "NC", *INSTANT_PARTS)


def contact_sense(part: str | None) -> str | None:
    """"NO" or "NC" for a contact part (``instant-NO`` is an NO contact), else None."""
    if part in ("NO", "instant-NO"):
        return "NO"
    if part in ("NC", "instant-NC"):
        return "NC"
    return None


@dataclass(frozen=True)
class FieldSpec:
    type: str
    choices: tuple[str, ...] = ()     # for TEXT fields with a closed set
    default: object = None
    tag_kinds: tuple[str, ...] = ()   # for TAG/TAGS: kinds the named device may be
    doc: str = ""


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
    doc: str = ""
    plugin: str = "core"

    @property
    def used_in_rungs(self) -> bool:
        return bool(self.parts or self.bare or self.positions)

    def part_role(self, part: str | None) -> str | None:
        """Role of ``TAG.PART`` (or bare ``TAG`` when part is None), None if the kind lacks it."""
        if part is None:
            return self.bare
        if part == "coil" and self.coil:
            return "load"
        if part in CONTACT_PARTS and part in self.parts:
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
    "estop_exempt": FieldSpec(TEXT, doc="why the emergency stop does not drop it (required text)"),
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
            "rating": FieldSpec(CURRENT),
            "suppressed": FieldSpec(BOOL, default=False),
        },
        bare="output",
    ),
    DeviceKind("plc-input", {"voltage": FieldSpec(VOLTAGE), "current": FieldSpec(CURRENT)}, bare="load"),
    DeviceKind("fuse", {"rating": FieldSpec(CURRENT), "side": FieldSpec(TEXT, choices=("primary", "secondary"))}, bare="conductor"),
    DeviceKind("breaker", {"rating": FieldSpec(CURRENT), "side": FieldSpec(TEXT, choices=("primary", "secondary"))}, bare="conductor"),
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
            "efficiency": FieldSpec(NUMBER, doc="output / input power (default 0.85) when its input is counted"),
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
