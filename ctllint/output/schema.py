"""A JSON Schema (draft-07) of the schematic format, for editors.

Built from the same tables the loader checks against (the device kinds,
the key lists, the units, the rating designations), so the two cannot
drift apart. The loader remains the authority: it also checks what a
schema cannot say (references, duplicate tags across used files).
"""
from __future__ import annotations

import re
from typing import Any

from ctllint.reading import kinds as K
from ctllint.reading.kinds import KindRegistry
from ctllint.reading.loader import FORMAT_VERSION, PILOT_DUTY_VALID, RUNG_KEYS, STEP_ACTIONS, SUPPLY_KEYS, TOP_KEYS, NEMA_SIZES
from ctllint.reading.quantities import UNITS

SCHEMA_ID = "https://ctllint.invalid/schema/ctllint-1.json"


def _quantity(dimension: str) -> dict[str, Any]:
    units = sorted((u for u, (d, _, _) in UNITS.items() if d == dimension), key=lambda u: (-len(u), u))
    number = r"(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?"
    frac = r"[0-9]+/[0-9]+"
    pattern = rf"^\s*(?:{number}(?:\s*(?:-\s*)?{frac})?|{frac})\s*(?:{'|'.join(map(re.escape, units))})\s*$"
    return {"type": "string", "pattern": pattern, "description": f"a {dimension.replace('_', ' ')} with its unit ({', '.join(sorted(units))})"}


_WIRE = {"type": ["string", "integer"], "pattern": r"^\S+$", "description": "wire name or number (no spaces)"}
_TAG = {"type": "string", "pattern": r"^[^.\s]+$", "description": "a device tag"}
_ELEMENT = {"type": "string", "pattern": r"^[^.\s]+(\.[^.\s]+)?( [A-Za-z0-9_+/]+-[A-Za-z0-9_+/]+)?$",
            "description": "TAG or TAG.PART, optionally followed by its terminal numbers after a space (CR1.NO 13-14)"}


def _category(with_power: bool = False) -> dict[str, Any]:
    return {
        "type": "object",
        "additionalProperties": False,
        "required": ["category", "current", "voltage"],
        "properties": {
            "category": {"type": "string", "pattern": r"^(AC|DC)-[0-9]+[a-z]?$"},
            "current": _quantity(K.CURRENT),
            "voltage": _quantity(K.VOLTAGE),
        },
    }


def _field(spec: K.FieldSpec) -> dict[str, Any]:
    t = spec.type
    if t in (K.VOLTAGE, K.CURRENT, K.APPARENT, K.POWER, K.TIME, K.TEMPERATURE):
        out = _quantity(t)
    elif t == K.BOOL:
        out = {"type": "boolean"}
    elif t == K.NUMBER:
        out = {"type": "number", "exclusiveMinimum": 0}
        if spec.maximum is not None:
            out["maximum"] = spec.maximum
    elif t == K.COUNT:
        out = {"type": "integer", "minimum": 1}
        if spec.choices:
            out["enum"] = [int(c) for c in spec.choices]
    elif t == K.TEXT:
        out = {"type": "string"}
        if spec.required_text:
            out["pattern"] = r"\S"
        if spec.choices:
            out["enum"] = list(spec.choices)
    elif t == K.TAG:
        out = dict(_TAG)
    elif t == K.TAGS:
        out = {"type": "array", "items": _TAG}
    elif t == K.POSITIONS:
        out = {"type": "array", "items": _WIRE, "minItems": 2, "uniqueItems": True}
    elif t == K.CAMS:
        out = {"type": "object", "propertyNames": {"pattern": r"^[^.\s]+$"},
               "additionalProperties": {"type": "array", "items": _WIRE, "minItems": 1, "uniqueItems": True}}
    elif t == K.CONTACTS:
        count = {"type": "integer", "minimum": 0}
        out = {"oneOf": [
            {"type": "object", "additionalProperties": False, "properties": {"NO": count, "NC": count, **{p: count for p in K.INSTANT_PARTS}}},
            {"type": "object", "additionalProperties": False, "required": ["poles"], "properties": {"poles": count, "throw": {"enum": ["single", "double"]}}},
        ]}
    elif t == K.RATING:
        out = {"oneOf": [
            {"type": "string", "enum": sorted(PILOT_DUTY_VALID)},
            _quantity(K.CURRENT),
            {"type": "array", "minItems": 1, "items": {"anyOf": [{"type": "string", "enum": sorted(PILOT_DUTY_VALID)}, _category()]}},
        ]}
    elif t == K.SPEEDS:
        out = {
            "type": "object",
            "minProperties": 2,
            "additionalProperties": {
                "type": "object",
                "additionalProperties": False,
                "properties": {"power": _quantity(K.POWER), "fla": _quantity(K.CURRENT)},
            },
        }
    elif t == K.POWER_RATING:
        out = {"oneOf": [
            {"type": "array", "minItems": 1, "items": _category()},
            {"type": "object", "additionalProperties": False, "required": ["size"], "properties": {"size": {"enum": list(NEMA_SIZES) + [int(s) for s in NEMA_SIZES if s != "00"]}}},
        ]}
    else:
        out = {}
    if spec.doc:
        out = {**out, "description": spec.doc}
    return out


def build_schema(kinds: KindRegistry | None = None) -> dict[str, Any]:
    kinds = kinds or KindRegistry.builtin()
    device_rules = []
    for name in kinds.names():
        kind = kinds.get(name)
        props = {"kind": {"const": name}}
        props.update({f: _field(spec) for f, spec in kind.fields.items()})
        device_rules.append({
            "if": {"properties": {"kind": {"const": name}}, "required": ["kind"]},
            "then": {"properties": props, "additionalProperties": False, "required": ["kind", *kind.required]},
        })
    device = {
        "type": "object",
        "required": ["kind"],
        "properties": {"kind": {"enum": kinds.names()}},
        "allOf": device_rules,
    }
    path = {"type": "array", "minItems": 3, "items": {"anyOf": [_WIRE, _ELEMENT]}, "description": "[wire, element, wire, ..., wire]"}
    rung = {
        "type": "object",
        "additionalProperties": False,
        "required": ["paths"],
        "properties": {
            "title": {"type": "string"},
            "number": {"type": "integer", "minimum": 0},
            "paths": {"type": "array", "minItems": 1, "items": path},
            "jog": {"type": "boolean"},
            "restart": {"enum": ["automatic"]},
            "note": {"type": "string"},
        },
    }
    assert set(rung["properties"]) == set(RUNG_KEYS)
    supply = {
        "type": "object",
        "additionalProperties": False,
        "required": ["hot", "common", "voltage"],
        "properties": {"hot": _WIRE, "common": _WIRE, "voltage": _quantity(K.VOLTAGE), "grounded": {"type": "boolean"}, "source": _TAG},
    }
    assert set(supply["properties"]) == set(SUPPLY_KEYS)
    tag_list = {"anyOf": [_TAG, {"type": "array", "items": _TAG, "minItems": 1}]}
    states = {"type": "object", "propertyNames": _TAG, "additionalProperties": {"enum": ["on", "off"]}}
    step_bodies = {
        "press": tag_list, "release": tag_list, "trip": tag_list, "reset": tag_list,
        "power": {"enum": ["on", "off"]},
        "wait": _quantity(K.TIME),
        "set": {"type": "object", "propertyNames": _TAG, "additionalProperties": {"type": ["string", "integer"]}},
        "check": states,
    }
    assert set(step_bodies) == set(STEP_ACTIONS)
    step = {"oneOf": [{"type": "object", "additionalProperties": False, "required": [a], "properties": {a: body}} for a, body in step_bodies.items()]}
    scenario = {"type": "object", "additionalProperties": False, "required": ["name", "steps"],
                "properties": {"name": {"type": "string"}, "steps": {"type": "array", "items": step}}}
    use = {"anyOf": [{"type": "string", "pattern": r"\.ctl\.ya?ml$"}, {"type": "array", "items": {"type": "string", "pattern": r"\.ctl\.ya?ml$"}}]}
    top = {
        "ctllint": {"const": FORMAT_VERSION, "description": "format version"},
        "title": {"type": "string"},
        "use": use,
        "supplies": {"type": "object", "additionalProperties": supply},
        "devices": {"type": ["object", "null"], "propertyNames": _TAG, "additionalProperties": device},
        "rungs": {"type": ["array", "null"], "items": rung},
        "expect": {"type": "array", "items": scenario},
    }
    assert set(top) == set(TOP_KEYS)
    return {
        "$schema": "http://json-schema.org/draft-07/schema#",
        "$id": SCHEMA_ID,
        "title": "ctllint schematic, format version 1",
        "type": "object",
        "additionalProperties": False,
        "properties": top,
        "required": ["ctllint"],
        "anyOf": [
            {"required": ["ctllint", "supplies", "devices", "rungs"]},
            {"required": ["ctllint", "devices"], "not": {"anyOf": [{"required": ["supplies"]}, {"required": ["rungs"]}, {"required": ["expect"]}, {"required": ["use"]}]}},
        ],
    }


def kinds_table(kinds: KindRegistry | None = None) -> str:
    """The device kinds as a Markdown table (the README's list, kept current by a test)."""
    kinds = kinds or KindRegistry.builtin()
    lines = ["| kind | in paths | fields (required in bold) |", "|---|---|---|"]
    for name in kinds.names():
        kind = kinds.get(name)
        parts = []
        if kind.positions:
            parts.append("`TAG.<position>`")
            if any(spec.type == K.CAMS for spec in kind.fields.values()):
                parts.append("`TAG.<cam block>`")
        parts += [f"`TAG.{p}`" for p in kind.parts]
        if kind.bare:
            parts.append(f"`TAG` ({kind.bare})")
        fields = [f"**`{f}`**" if f in kind.required else f"`{f}`" for f in kind.fields]
        lines.append(f"| `{name}` | {', '.join(parts) or 'not used in rungs'} | {', '.join(fields)} |")
    return "\n".join(lines) + "\n"
