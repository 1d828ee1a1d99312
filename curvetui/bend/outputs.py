"""Every result of a bend, declared once: its key, the kinds it applies to, how it rounds.

The JSON record of ``curvetui check`` and the batch file's result columns are both
written from this list; keys with a dot (``transition.runoff``) are nested objects in JSON
and column names in CSV. Values are held unrounded until written: ``SIG`` rounds to six
significant figures, ``PLACES`` to six decimals (lengths and stations of the geometry),
``ANGLE`` to nine significant figures, ``INPUT`` (an input repeated) to twelve, so it
reads as given; ``TEXT`` is a word from a short list.
"""

from __future__ import annotations

from dataclasses import dataclass

SIG, PLACES, ANGLE, TEXT, INPUT = "sig", "places", "angle", "text", "input"
ROAD, RAIL = "road", "rail"
BOTH = (ROAD, RAIL)


@dataclass(frozen=True)
class Output:
    key: str
    kinds: tuple[str, ...]
    rounding: str = SIG
    echo: bool = False  # repeats an input: in JSON, left out of batch files


def _o(key, kinds=BOTH, rounding=SIG, **kw) -> Output:
    return Output(key, kinds, rounding, **kw)


_ROAD_MAIN = (
    "lateral_acceleration",
    "lateral_acceleration_g",
    "side_friction_max",
    "side_friction_demand",
    "min_radius",
    "min_radius_rounded",
    "superelevation",
    "superelevation_design",
    "safe_speed",
)
_RAIL_MAIN = (
    "equilibrium_cant",
    "equilibrium_cant_low",
    "cant_deficiency",
    "cant_excess",
    "uncompensated_acceleration",
    "centripetal_acceleration",
    "max_speed",
    "min_speed",
    "balancing_cant",
    "cant_limit",
    "deficiency_limit",
    "excess_limit",
    "rail_centres",
)
ROAD_TRANSITION = (
    "spiral_length_min",
    "spiral_length_max",
    "length_comfort",
    "length_shift_min",
    "length_shift_max",
    "relative_gradient",
    "runoff",
    "runout",
)
RAIL_TRANSITION = ("length", "length_cant_gradient", "length_cant_rate", "length_deficiency_rate")
CIRCULAR = ("tangent", "length", "external", "middle_ordinate", "long_chord")
SPIRAL = ("xs", "ys", "p", "k", "total_tangent", "external", "circular_length", "total_length")
SPIRAL_OUT = ("xs_out", "ys_out", "p_out", "k_out", "total_tangent_out")
STATIONS = ("pi", "pc", "pt", "ts", "sc", "cs", "st")
SIGHT = (
    "stopping_sight_distance",
    "sightline_offset_required",
    "offset_available",
    "sight_distance_available",
    "sightline_radius",
    "speed_that_passes",
    "offset_that_passes",
)

OUTPUTS: tuple[Output, ...] = (
    *(_o(k, (ROAD,)) for k in _ROAD_MAIN),
    _o("cross_section", (ROAD,), TEXT),
    *(_o(k, (RAIL,)) for k in _RAIL_MAIN),
    _o("speed", rounding=INPUT, echo=True),
    _o("radius", rounding=INPUT, echo=True),
    _o("e_max", (ROAD,)),
    _o("cant", (RAIL,), INPUT, echo=True),
    _o("low_speed", (RAIL,), INPUT, echo=True),
    _o("degree_of_curve_arc", (RAIL,)),
    _o("degree_of_curve_chord", (RAIL,)),
    _o("transition.governing", rounding=TEXT),
    _o("transition.status", rounding=TEXT),
    *(_o(f"transition.{k}", (ROAD,)) for k in ROAD_TRANSITION),
    *(_o(f"transition.{k}", (RAIL,)) for k in RAIL_TRANSITION),
    _o("geometry.type", rounding=TEXT),
    _o("geometry.deflection", rounding=ANGLE, echo=True),
    _o("geometry.spiral_angle", rounding=ANGLE),
    *(_o(f"geometry.{k}", rounding=PLACES) for k in dict.fromkeys((*CIRCULAR, *SPIRAL))),
    _o("geometry.spiral_angle_out", rounding=ANGLE),
    *(_o(f"geometry.{k}", rounding=PLACES) for k in SPIRAL_OUT),
    *(_o(f"geometry.{k}", rounding=PLACES) for k in STATIONS),
    _o("sight.status", (ROAD,), TEXT),
    *(_o(f"sight.{k}", (ROAD,)) for k in SIGHT),
)
BY_KEY = {o.key: o for o in OUTPUTS}
assert len(BY_KEY) == len(OUTPUTS)

# keys of the geometry object by its type, in the order JSON lists them
CIRCULAR_JSON = ("type", "deflection", *CIRCULAR, "pi", "pc", "pt")
SPIRAL_JSON = ("type", "deflection", "spiral_angle", *SPIRAL, "pi", "ts", "sc", "cs", "st")
SPIRAL_OUT_JSON = ("spiral_angle_out", *SPIRAL_OUT)
