"""The worksheet's input labels, unit kinds and blank-field defaults, in one place."""

# The single list of input fields (curvetui/bend/fields.py) is to own these labels: when it
# lands, this module is the one to point at it.

from __future__ import annotations

from curvetui.bends import RAIL_FIELD_ORDER, ROAD_FIELD_ORDER

# The inputs of each kind of bend, in the order the worksheet prints them.
FIELD_ORDER = {"road": ROAD_FIELD_ORDER, "rail": RAIL_FIELD_ORDER}

# An input's name as printed on the worksheet.
FIELD_NAMES = {
    "speed": "Design speed",
    "low_speed": "Slow train speed",
    "radius": "Radius",
    "deflection": "Deflection angle",
    "pi_station": "PI station",
    "superelevation": "Superelevation given",
    "emax": "Max. superelevation e_max",
    "friction": "Side friction f given",
    "cant": "Applied cant",
    "gauge": "Track gauge",
    "spiral_in": "Spiral / transition in",
    "spiral_out": "Spiral / transition out",
    "obstruction_offset": "Obstruction offset",
    "grade": "Grade",
    "lane_width": "Lane width",
}

# The kind of unit of each input: a kind of curvetui.results.unit_label, or "deg" and
# "station" (printed as the project's station text).
UNIT_KIND = {
    "speed": "speed",
    "low_speed": "speed",
    "radius": "length",
    "deflection": "deg",
    "pi_station": "station",
    "superelevation": "%",
    "emax": "%",
    "friction": "",
    "cant": "cant",
    "gauge": "mm",
    "spiral_in": "length",
    "spiral_out": "length",
    "obstruction_offset": "length",
    "grade": "%",
    "lane_width": "length",
}

# What the check uses for an input left blank.
DEFAULTS = {
    "superelevation": "design value",
    "emax": "table default",
    "friction": "table f_max",
    "gauge": "1435 mm",
    "spiral_out": "= spiral in",
}
