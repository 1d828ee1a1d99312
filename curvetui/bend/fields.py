"""Every input of a bend, declared once: name, label, unit, range, kinds, help.

The command line's options, the app's form, the worksheet's labels, the batch's columns,
the project file's validation and the README's input table all read ``FIELDS``. Adding an
input is one entry here plus its use in the evaluation.

Ranges are in the user's units (``metric``: km/h, m, mm of cant; ``us``: mph, ft, in).
Lengths are declared in metres and shown converted, rounded as the messages print them.
Two ranges depend on something else: e_max on the road table, and the slow train's
speed on the fast one (see ``curvetui.bend.parse``). A CHOICE field takes one word of its
``choices`` (any case); it is parsed to the word's position in that list.
"""

from __future__ import annotations

from dataclasses import dataclass

from curvetui.core.rotation import AXES
from curvetui.core.traffic import TRAFFIC
from curvetui.core.units import UnitSystem

ROAD, RAIL = "road", "rail"
BOTH = (ROAD, RAIL)

# unit kinds: how a field's number is shown and converted to SI (CHOICE: a word, no unit;
# TEXT: an id kept as text)
SPEED, LENGTH, CANT, PERCENT, DEGREES, FACTOR, MILLIMETRE, STATION, CHOICE, TEXT = (
    "speed",
    "length",
    "cant",
    "percent",
    "degrees",
    "factor",
    "mm",
    "station",
    "choice",
    "text",
)


@dataclass(frozen=True)
class Field:
    """One input of a bend.

    ``ranges`` maps a kind ("road"/"rail") to (lo, hi): in metres for LENGTH and STATION
    fields (converted for US units), else per unit system as {"metric": (lo, hi), "us": ...}
    or the same pair for both. ``lo_open`` excludes lo itself. ``least`` is the smallest
    value above lo that the arithmetic can use (0: any): below it a value is refused with
    the range from ``least``. ``needs`` names a field that must be given too. ``aliases``
    are other batch column names for the field. ``choices`` are the words a CHOICE field
    takes (its value is the word's position).
    """

    key: str
    label: str
    unit: str
    kinds: tuple[str, ...]
    help: str
    ranges: dict
    required: tuple[str, ...] = ()
    lo_open: bool = False
    least: float = 0.0
    needs: str = ""
    option: str = ""
    aliases: tuple[str, ...] = ()
    default: str = ""
    short: str = ""  # the label of a narrow form (the app): the key in words unless given
    hint: str = ""  # the form's hint: "blank: <default>" unless given
    choices: tuple[str, ...] = ()  # the words of a CHOICE field, in code order

    @property
    def short_label(self) -> str:
        return self.short or self.key.replace("_", " ")

    @property
    def form_hint(self) -> str:
        return self.hint or (f"blank: {self.default}" if self.default else "")

    @property
    def cli_option(self) -> str:
        """The command-line option: ``--pi-station`` for ``pi_station`` unless named."""
        return self.option or "--" + self.key.replace("_", "-")

    def unit_label(self, units: UnitSystem) -> str:
        return {
            SPEED: units.speed_label,
            LENGTH: units.length_label,
            STATION: units.length_label,
            CANT: units.cant_label,
            PERCENT: "%",
            DEGREES: "degrees",
            FACTOR: "",
            MILLIMETRE: "mm",
            CHOICE: "",
            TEXT: "",
        }[self.unit]

    def to_si(self, value, units: UnitSystem):
        """A number in the user's unit to SI (m, m/s, fraction, radians kept in degrees);
        a CHOICE field's code is kept as it is."""
        if self.unit == SPEED:
            return units.speed_to_si(value)
        if self.unit in (LENGTH, STATION):
            return units.length_to_si(value)
        if self.unit == CANT:
            return value * units.cant
        if self.unit == PERCENT:
            return value / 100.0
        return value

    def allowed(self, kind: str, units: UnitSystem) -> tuple[float, float] | None:
        """(lo, hi) in the user's units for ``kind``, None where the range is dynamic."""
        spec = self.ranges.get(kind)
        if spec is None:
            return None
        if isinstance(spec, dict):
            return spec[units.name]
        lo, hi = spec
        if self.unit in (LENGTH, STATION):
            return round(units.length_from_si(lo), 1), round(units.length_from_si(hi))
        return lo, hi


def _f(key, label, unit, kinds, help, ranges, **kw) -> Field:
    return Field(key, label, unit, kinds, help, ranges, **kw)


# In the order a designer thinks: speed, the bend's shape, the cross-section and its
# limits, transitions, then sight. Filtered by kind this is each form's order.
FIELDS: tuple[Field, ...] = (
    _f(
        "speed",
        "Design speed",
        SPEED,
        BOTH,
        "design speed; on rail the fastest train",
        {RAIL: {"metric": (1.0, 400.0), "us": (1.0, 250.0)}},  # road: the table's rows,
        required=BOTH,
    ),
    _f(
        "low_speed",
        "Slowest train speed",
        SPEED,
        (RAIL,),
        "speed of the slowest train, for cant excess (0 up to the fast speed)",
        {},
        short="slow train speed",
        hint="for cant excess",
    ),
    _f(
        "radius",
        "Radius",
        LENGTH,
        BOTH,
        "radius of the circular arc",
        {ROAD: (1.0, 100_000.0), RAIL: (20.0, 100_000.0)},
        required=BOTH,
    ),
    _f(
        "deflection",
        "Deflection angle",
        DEGREES,
        BOTH,
        "deflection angle at the PI (0 to 179 degrees)",
        {ROAD: (0.0, 179.0), RAIL: (0.0, 179.0)},
        lo_open=True,
        # in radians, smaller angles are subnormal or zero: T, L and the spiral angles would
        # lose their digits without a word (numerical floor, no source)
        least=1e-300,
    ),
    _f(
        "pi_station",
        "PI station",
        STATION,
        BOTH,
        "station of the PI (2+710.5 or 2710.5; default 0)",
        {ROAD: (-1e7, 1e7), RAIL: (-1e7, 1e7)},
        default="0",
        short="PI station",
        hint="e.g. 2+710",
    ),
    _f(
        "superelevation",
        "Superelevation built",
        PERCENT,
        (ROAD,),
        "built superelevation, percent (default: the design value from the table)",
        {ROAD: (-10.0, 20.0)},
        default="design value",
    ),
    _f(
        "emax",
        "Maximum superelevation e_max",
        PERCENT,
        (ROAD,),
        "maximum superelevation, percent (default: the table's)",
        {},
        default="table default",
        short="e max",
    ),
    _f(
        "friction",
        "Side friction factor",
        FACTOR,
        (ROAD,),
        "side friction factor to check against instead of the table's f_max (R_min, friction "
        "demand, safe speed); the design superelevation keeps the table's distribution and f_max",
        {ROAD: (0.01, 1.0)},
        default="table f_max",
    ),
    _f(
        "cant",
        "Applied cant",
        CANT,
        (RAIL,),
        "applied cant (mm or in)",
        {RAIL: {"metric": (0.0, 300.0), "us": (0.0, 12.0)}},
        required=(RAIL,),
    ),
    _f(
        "gauge",
        "Track gauge",
        MILLIMETRE,
        (RAIL,),
        "track gauge in mm, for another gauge's rail centres (default: the limits')",
        {RAIL: (600.0, 1700.0)},
        default="limits' gauge",
    ),
    _f(
        "traffic",
        "Traffic",
        CHOICE,
        (RAIL,),
        "passenger or freight: the 49 CFR limits' top speed differs by traffic (213.9: class "
        "2 freight 25 mph, passenger 30); limits that set no speed by traffic, such as EN "
        "13803, ignore it",
        {},
        default=TRAFFIC[0],
        choices=TRAFFIC,
        hint=" / ".join(TRAFFIC),
    ),
    _f(
        "spiral_in",
        "Spiral in",
        LENGTH,
        BOTH,
        "clothoid transition length, in (and out unless given)",
        {ROAD: (0.0, 5000.0), RAIL: (0.0, 5000.0)},
        option="--spiral",
        aliases=("spiral",),
        default="none",
        short="spiral in",
    ),
    _f(
        "spiral_out",
        "Spiral out",
        LENGTH,
        BOTH,
        "length of the outgoing spiral when unequal",
        {ROAD: (0.0, 5000.0), RAIL: (0.0, 5000.0)},
        default="= spiral in",
    ),
    _f(
        "lanes_rotated",
        "Lanes rotated n1",
        FACTOR,
        (ROAD,),
        "number of lanes rotated about the axis, for the runoff's b_w factor",
        {ROAD: (1.0, 3.5)},  # Green Book 2018 Table 3-16 tabulates n1 from 1 to 3.5 (from memory)
        default="1",
        short="lanes rotated",
    ),
    _f(
        "runoff_on_tangent",
        "Share of runoff on the tangent",
        FACTOR,
        (ROAD,),
        "share of the runoff placed on the tangent when there is no spiral (AASHTO: 0.6 to 0.9)",
        {ROAD: (0.6, 0.9)},
        default="2/3",
        short="runoff on tangent",
    ),
    _f(
        "obstruction_offset",
        "Obstruction offset",
        LENGTH,
        (ROAD,),
        "clear offset from the inside lane centre to the obstruction",
        {ROAD: (0.0, 200.0)},
        lo_open=True,
        default="no sight check",
        hint="sight clearance",
    ),
    _f(
        "grade",
        "Approach grade",
        PERCENT,
        (ROAD,),
        "approach grade for stopping sight distance, percent (+ up, - down)",
        {ROAD: (-15.0, 15.0)},
        needs="obstruction_offset",
        default="0",
        hint="+ up / - down",
    ),
    _f(
        "lane_width",
        "Lane width",
        LENGTH,
        (ROAD,),
        "lane width: the sight line is on the inside lane's centre and runoff rotates one lane",
        {ROAD: {"metric": (2.0, 6.0), "us": (6.5, 19.7)}},
        default="3.6 m / 12 ft",
    ),
    _f(
        "rotation_axis",
        "Axis of rotation",
        CHOICE,
        (ROAD,),
        "axis the section is rotated about to its superelevation: centreline, inside or "
        "outside edge (the superelevation diagram's edge elevations; n1 counts the lanes "
        "rotated about it)",
        {},
        default=AXES[0],
        choices=AXES,
        hint=" / ".join(AXES),
        short="rotation axis",
    ),
    _f(
        "posted_speed",
        "Posted speed",
        SPEED,
        (ROAD,),
        "posted (or 85th-percentile) speed of the approach, for the curve's warning signs "
        "and advisory speed plaque (the sign table, e.g. MUTCD 2009 Table 2C-5)",
        # speed limits in use (common practice, no source)
        {ROAD: {"metric": (10.0, 150.0), "us": (5.0, 90.0)}},
        default="no sign check",
        short="posted speed",
        hint="for the signs",
    ),
)

BY_KEY: dict[str, Field] = {f.key: f for f in FIELDS}

# A curve register's columns (find-curves' output, or an authority's own inventory): the
# batch reads them to place each road curve among its neighbours on the same feature, for
# the Reverse and Winding Road signs (curvetui.core.curve_series). One bend has no
# neighbours, so the one-bend commands, the app's form and the project file do not take
# them (they are not in FIELDS).
DIRECTIONS = ("left", "right")  # in code order: curvetui.core.curve_series LEFT, RIGHT
REGISTER_FIELDS: tuple[Field, ...] = (
    _f(
        "feature",
        "Feature",
        TEXT,
        (ROAD,),
        "the road (feature) the curve lies on: curves of one feature in station order; a "
        "change of feature ends a series (without the column, all rows are one feature)",
        {},
    ),
    _f(
        "begin_station",
        "Begin station",
        STATION,
        (ROAD,),
        "station of the curve's start (TS or PC) along its feature",
        {ROAD: (-1e7, 1e7)},
        short="begin station",
    ),
    _f(
        "end_station",
        "End station",
        STATION,
        (ROAD,),
        "station of the curve's end (ST or PT) along its feature",
        {ROAD: (-1e7, 1e7)},
        short="end station",
    ),
    _f(
        "direction",
        "Direction",
        CHOICE,
        (ROAD,),
        "left or right, seen travelling from the feature's first vertex",
        {},
        choices=DIRECTIONS,
        hint=" / ".join(DIRECTIONS),
    ),
)
REGISTER_BY_KEY: dict[str, Field] = {f.key: f for f in REGISTER_FIELDS}


def fields_for(kind: str) -> tuple[Field, ...]:
    """The fields of a road or rail bend, in the designer's order."""
    return tuple(f for f in FIELDS if kind in f.kinds)


def input_keys(kind: str) -> tuple[str, ...]:
    return tuple(f.key for f in fields_for(kind))


def choice_text(f: Field) -> str:
    """'passenger' or 'freight' (a CHOICE field's words, quoted, for messages)."""
    words = [repr(c) for c in f.choices]
    return ", ".join(words[:-1]) + " or " + words[-1] if len(words) > 1 else words[0]


def cli_name(key: str) -> str:
    """The command-line option of an input (``--spiral`` for spiral_in)."""
    field = BY_KEY.get(key)
    return field.cli_option if field else "--" + key.replace("_", "-")


def column_names() -> dict[str, str]:
    """Batch column name (lower case) -> field key, aliases included."""
    out = {}
    for f in FIELDS:
        out[f.key] = f.key
        for alias in f.aliases:
            out[alias] = f.key
    return out


def docs_table() -> str:
    """The README's input table (Markdown), from the field list."""
    from curvetui.core.units import METRIC, US

    dynamic = {
        "emax": "the road table's e_max range",
        "low_speed": "0 to the speed",
        "speed": "road: the road table's speeds",
    }
    rows = [
        "| input | option | applies to | unit (metric / US) | allowed (metric / US) "
        "| blank means |",
        "|---|---|---|---|---|---|",
    ]
    for f in FIELDS:
        texts = []
        for kind in f.kinds:
            pair = []
            for units in (METRIC, US):
                r = f.allowed(kind, units)
                if r is not None:
                    lo = f"more than {r[0]:g}" if f.lo_open else f"{r[0]:g}"
                    lo += f" (at least {f.least:g})" if f.least else ""
                    pair.append(f"{lo} to {r[1]:g}")
            if pair:
                text = pair[0] if pair[0] == pair[1] else " / ".join(pair)
                texts.append(f"{kind}: {text}" if len(f.kinds) > 1 else text)
        allowed = "; ".join([*([dynamic[f.key]] if f.key in dynamic else []), *texts])
        if len(set(t.split(": ", 1)[-1] for t in texts)) == 1 and texts:
            allowed = texts[0].split(": ", 1)[-1]
        if f.choices:
            allowed = " or ".join(f"`{c}`" for c in f.choices)
        units_txt = f"{f.unit_label(METRIC) or '-'} / {f.unit_label(US) or '-'}"
        blank = "required" if f.required == f.kinds else f.default or "not used"
        if f.required and f.required != f.kinds:
            blank = f"required ({', '.join(f.required)})"
        rows.append(
            f"| `{f.key}` | `{f.cli_option}` | {', '.join(f.kinds)} | {units_txt} | "
            f"{allowed} | {blank} |"
        )
    return "\n".join(rows)
