"""Contact ratings of a device's fields: pilot-duty designations, utilisation categories, NEMA sizes.

``rating`` fields (a pilot-duty letter, a list of category ratings, or a
thermal current) and ``power-rating`` fields (category ratings or a NEMA
size). Its own module because these are values with a grammar of their own,
shared by every kind that has a contact rating.
"""
from __future__ import annotations

import re

from ctllint.reading import kinds as K
from ctllint.reading.loader.sink import Stop
from ctllint.reading.loader.state import FileState
from ctllint.reading.model import CategoryRating, ContactRating, PowerRating
from ctllint.reading.quantities import QuantityError, parse_quantity
from ctllint.reading.yamlsafe import Node, ScalarNode, SequenceNode

PILOT_DUTY = re.compile(r"^[ABCDE](?:150|300|600)$|^[NPQR](?:150|300|600)$")
PILOT_DUTY_VALID = {
    "A600", "A300", "A150", "B600", "B300", "B150", "C600", "C300", "C150", "D300", "D150", "E150",
    "N600", "N300", "N150", "P600", "P300", "P150", "Q600", "Q300", "Q150", "R300", "R150",
}
CATEGORY_RE = re.compile(r"^(AC|DC)-[0-9]+[a-z]?$")
NEMA_SIZES = ("00", "0", "1", "2", "3", "4", "5", "6", "7", "8", "9")


def read_category(st: FileState, node: Node, what: str, power: bool = False) -> CategoryRating:
    entries = st.values.mapping(node, what)
    keys = {k: vn for k, _, vn in entries}
    for key, kn, _ in entries:
        if key not in ("category", "current", "voltage"):
            st.sink.unknown_key(kn, key, what, ("category", "current", "voltage"))
            raise Stop
    for req in ("category", "current", "voltage"):
        if req not in keys:
            st.sink.fail(node, f"{what} needs '{req}'")
    cat = st.values.text(keys["category"], "category")
    if not CATEGORY_RE.match(cat):
        st.sink.fail(keys["category"], f"category '{cat}' is not a utilisation category such as AC-15, DC-13, AC-3 or AC-1")
    cur = st.values.quantity(keys["current"], K.CURRENT, "current")
    volt = st.values.quantity(keys["voltage"], K.VOLTAGE, "voltage")
    return CategoryRating(cat, cur.value, volt.value, cat[:2])


def read_rating(st: FileState, node: Node, what: str) -> ContactRating:
    if isinstance(node, SequenceNode):
        if not node.value:
            st.sink.fail(node, f"{what} is an empty list")
        cats, designations, texts = [], [], []
        for n in node.value:
            if isinstance(n, ScalarNode):  # a NEMA letter beside category entries: [A600, Q300]
                d = designation(st, n, what)
                if d in designations:
                    st.sink.fail(n, f"{what}: {d} is listed twice")
                designations.append(d)
                texts.append(d)
            else:
                c = read_category(st, n, what)
                cats.append(c)
                texts.append(f"{c.category} {c.current:g} A {c.voltage:g} V")
        if not designations:
            return ContactRating("category", categories=tuple(cats), text=", ".join(texts))
        return ContactRating("list", designation=designations[0], categories=tuple(cats), text=", ".join(texts), designations=tuple(designations))
    value = st.values.scalar(node, what)
    if isinstance(value, str) and value.strip() in PILOT_DUTY_VALID:
        return ContactRating("pilot-duty", designation=value.strip(), text=value.strip())
    if isinstance(value, str) and PILOT_DUTY.match(value.strip()):
        st.sink.fail(node, f"{what}: '{value}' is not a NEMA ICS 5 pilot-duty designation")
    try:
        q = parse_quantity(value, K.CURRENT)
    except QuantityError as exc:
        st.sink.fail(node, f"{what}: expected a pilot-duty designation (A600 ... R150), a list of category ratings, or a current: {exc}")
    return ContactRating("thermal", current=q.value, text=q.text)


def designation(st: FileState, node: Node, what: str) -> str:
    """One NEMA ICS 5 pilot-duty designation in a rating list."""
    value = st.values.scalar(node, what)
    text = value.strip() if isinstance(value, str) else ""
    if text not in PILOT_DUTY_VALID:
        st.sink.fail(node, f"{what}: '{node.value}' in a rating list must be a pilot-duty designation (A600 ... R150) or a category entry {{category, current, voltage}}")
    return text


def read_power_rating(st: FileState, node: Node, what: str) -> PowerRating:
    if isinstance(node, SequenceNode):
        cats = tuple(read_category(st, n, what) for n in node.value)
        if not cats:
            st.sink.fail(node, f"{what} is an empty list")
        return PowerRating(categories=cats)
    entries = st.values.mapping(node, what)
    keys = {k: vn for k, _, vn in entries}
    for key, kn, _ in entries:
        if key != "size":
            st.sink.unknown_key(kn, key, what, ("size",))
            raise Stop
    if "size" not in keys:
        st.sink.fail(node, f"{what}: give a list of category ratings or {{size: N}}")
    size = st.values.scalar(keys["size"], "size")
    if isinstance(size, int) and not isinstance(size, bool):
        if keys["size"].value.strip() != str(size):  # a bare 00 is read as 0: a different, larger size
            st.sink.fail(keys["size"], f"NEMA size '{keys['size'].value}' is read as {size} by YAML; write size 00 as \"00\" and other sizes as plain numbers")
        size = str(size)
    if size not in NEMA_SIZES:
        st.sink.fail(keys["size"], f"NEMA size '{keys['size'].value}' is not one of {', '.join(NEMA_SIZES)} (write size 00 as \"00\")")
    return PowerRating(nema_size=size)
