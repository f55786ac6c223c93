"""contact-rating's arithmetic: the duty of a contact and the limits its rating gives.

A contact's duty (make, break, continuous amperes summed over the loads it serves) and what a
contact rating allows on a supply (NEMA ICS 5 pilot duty, IEC 60947-5-1 categories, a plain
current), with the words a message uses for both. Apart from contact_rating.py because it is
arithmetic on figures and tables, tested on its own (tests/test_ratings_values.py), while the rule
module walks the circuit's contacts and outputs.
"""
from __future__ import annotations

from dataclasses import dataclass

from ctllint.reading.model import ContactRating
from ctllint.reading.quantities import format_si
from ctllint.circuit.tables import category_limits, pilot_duty_limits, voltage_covered
from ctllint_plugins.ratings._figures import LoadFigures, amps_text, exceeds


def category_name(name: str) -> str:
    text = name.strip().upper().replace(" ", "")
    if "-" not in text and len(text) > 2:
        text = f"{text[:2]}-{text[2:]}"
    return text


@dataclass(frozen=True)
class Duty:
    """The duty of a contact, amperes: make (summed inrush), break and
    continuous (summed sealed)."""

    make: float
    break_: float
    continuous: float


def contact_duty(figures: list[LoadFigures]) -> Duty:
    """Sum the loads a contact serves, all assumed on together (worst case)."""
    make = sum(f.inrush_a for f in figures)
    sealed = sum(f.sealed_a for f in figures)
    return Duty(make, sealed, sealed)


@dataclass(frozen=True)
class Limits:
    """What a contact rating allows at one supply voltage, amperes; a None
    figure is not limited by the rating (a thermal rating limits only
    continuous current). ``text`` describes the rating for messages."""

    make: float | None
    break_: float | None
    continuous: float | None
    text: str


def rating_limits(rating: ContactRating, volts: float, current_kind: str | None) -> tuple[list[Limits], str]:
    """The limits a contact rating gives on a supply, and why none apply.

    A plain current is a resistive rating: make = break = continuous.
    Pilot duty: NEMA ICS 5 figures at that voltage (``pilot_duty_limits``),
    each designation of a list for its own kind of supply ([A600, Q300]).
    Category entries: each of the supply's AC/DC kind whose voltage covers
    the supply's (IEC 60947-5-1: AC-15 makes 10 x Ie and breaks Ie, AC-14
    makes 6 x Ie, DC-13 makes and breaks Ie, DC-14 makes 10 x Ie, other
    categories make = break = Ie). Any one of the limits found may carry
    the duty. An empty list comes with the reason the rating does not cover
    the supply. A supply whose voltage leaves AC/DC open accepts either kind.
    """
    supply_text = format_si(volts, "V") + (f" {current_kind}" if current_kind else "")
    if rating.form == "thermal" and rating.current is not None:
        amps = rating.current
        return [Limits(amps, amps, amps, f"{format_si(amps, 'A')} (a plain current: a resistive rating)")], ""
    found: list[Limits] = []
    kinds = [current_kind] if current_kind else ["AC", "DC"]
    for designation in rating.all_designations():
        for kind in kinds:
            limits = pilot_duty_limits(designation, volts, kind)
            if limits is not None:
                found.append(Limits(limits.make, limits.break_, limits.continuous, f"{designation} at {format_si(volts, 'V')}"))
                break
    for cat in rating.categories:
        if current_kind and cat.current_kind != current_kind:
            continue
        if not voltage_covered(cat.voltage, volts):
            continue
        make, brk = category_limits(cat.category, cat.current)
        found.append(Limits(make, brk, cat.current, f"{category_name(cat.category)} {format_si(cat.current, 'A')} at {format_si(cat.voltage, 'V')}"))
    if found:
        return found, ""
    scopes = [_pilot_scope(d) for d in rating.all_designations()]
    if rating.categories:
        scopes.append("a category rating covers its own AC/DC kind up to its voltage, IEC 60947-5-1")
    return [], f"rating {rating.text} has none for a {supply_text} supply ({'; '.join(scopes)})"


def _pilot_scope(designation: str) -> str:
    kind = "DC" if designation[:1].upper() in "NPQR" else "AC"
    article = "an" if kind == "AC" else "a"
    return f"{designation} is {article} {kind} rating up to {designation[1:]} V"


def over_limits(duty: Duty, limits: Limits) -> list[str]:
    """The figures of ``duty`` above ``limits``, as words for a message."""
    over = []
    for name, value, limit in (("make", duty.make, limits.make), ("break", duty.break_, limits.break_), ("continuous", duty.continuous, limits.continuous)):
        if limit is not None and exceeds(value, limit):
            over.append(f"{name} {amps_text(value)} > {amps_text(limit)}")
    return over


def limits_text(limits: Limits) -> str:
    parts = [f"{name} {amps_text(v)}" for name, v in (("make", limits.make), ("break", limits.break_), ("continuous", limits.continuous)) if v is not None]
    return f"{limits.text} allows {', '.join(parts)}"
