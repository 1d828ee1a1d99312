"""The worksheet's input labels, unit kinds and blank-field defaults, from the field list."""

from __future__ import annotations

from curvetui.bend.fields import FIELDS, input_keys

# The inputs of each kind of bend, in the order the worksheet prints them.
FIELD_ORDER = {"road": input_keys("road"), "rail": input_keys("rail")}

# An input's name as printed on the worksheet.
FIELD_NAMES = {f.key: f.label for f in FIELDS}

# The kind of unit of each input: a kind of curvetui.results.unit_label, or "deg" and
# "station" (printed as the project's station text).
UNIT_KIND = {
    f.key: {"degrees": "deg", "percent": "%", "factor": "", "choice": ""}.get(f.unit, f.unit)
    for f in FIELDS
}

# What the check uses for an input left blank.
DEFAULTS = {f.key: f.default for f in FIELDS if f.default and not f.required}
