"""The text of a form field and back (no Textual): what the worksheet shows for a stored
value, the value stored for what is typed, and the fields named as the form names them.
A station is shown and may be typed as 2+710.5 (metric: km + m) or 27+10.50 (US: 100 ft
stations)."""

from __future__ import annotations

from curvetui.bend.fields import BY_KEY, CHOICE, FIELDS, STATION, TEXT, cli_name
from curvetui.stations import format_station, parse_station
from curvetui.storage.project.model import Bend


def station_text(value: float, units: str) -> str:
    """A station as the form shows it: 2+710.000 (metric) or 27+10.00 (US), with more
    decimals where the value has them (up to 6), so that what is shown is what is stored."""
    decimals = 3 if units == "metric" else 2
    while decimals < 6 and abs(round(value, decimals) - value) > 1e-9 * max(1.0, abs(value)):
        decimals += 1
    return format_station(value, units, decimals)


def input_value(text: str, key: str | None = None, units: str | None = None) -> float | str | None:
    """An input ``key`` as ``set_input`` stores it from typed ``text``: None when blank, a
    number, or the text itself. A station field (``units`` metric or us) reads 2+710.5 as
    its number; a field of words (CHOICE or TEXT) keeps the text as typed: '90' typed for
    the rotation axis stays '90', so the message quotes what was typed."""
    text = text.strip()
    if text == "":
        return None
    unit = BY_KEY[key].unit if key in BY_KEY else None
    if unit in (CHOICE, TEXT):
        return text
    station_units = units if unit == STATION else None
    try:
        return float(text)
    except ValueError:
        pass
    if station_units is not None:
        try:
            return parse_station(text, station_units)
        except ValueError:
            pass
    return text


def same_value(old, new) -> bool:
    """Whether a typed value is the one stored (a number compared as a number)."""
    if isinstance(old, bool) or isinstance(new, bool):
        return old is new
    if isinstance(old, int | float) and isinstance(new, int | float):
        return float(old) == float(new)
    return old == new


def field_text(bend: Bend, key: str, units: str) -> str:
    """The text the worksheet shows for a field of ``bend`` (bend_id, station, notes or an
    input): a number as stored, to 10 significant figures; a station in station form."""
    if key == "bend_id":
        return bend.id
    if key == "station":
        return station_text(bend.station, units)
    if key == "notes":
        return bend.notes
    value = bend.inputs.get(key)
    if value is None:
        return ""
    if not isinstance(value, int | float) or isinstance(value, bool):
        return str(value)
    field = BY_KEY.get(key)
    if field is not None and field.unit == STATION:
        return station_text(value, units)
    return f"{value:.10g}"


def field_label(key: str) -> str:
    """A field's name as shown in the app's form (its short label in the field list)."""
    field = BY_KEY.get(key)
    return field.short_label if field else key.replace("_", " ")


def labelled(message: str) -> str:
    """An engine message with each field named as the form names it ('low_speed: ...' ->
    'slow train speed: ...')."""
    parts = []
    for part in message.split("; "):
        head, sep, rest = part.partition(":")
        parts.append(f"{field_label(head)}{sep}{rest}" if sep and head in BY_KEY else part)
    return "; ".join(parts)


def field_of(message: str) -> str | None:
    """The input named at the start of an engine message ('speed: ...', '--speed: ...' or
    its label in the form)."""
    head = message.split(":", 1)[0].strip()
    for key in (f.key for f in FIELDS):
        if head in (key, cli_name(key), field_label(key)) or head.endswith("." + key):
            return key
    return None
