"""Every result of a bend, declared once: its key, the kinds it applies to, how it rounds.

The JSON record of ``curvetui check`` and the batch file's result columns are both
written from this list; keys with a dot (``transition.runoff``) are nested objects in JSON
and column names in CSV. Values are held unrounded until written: ``SIG`` rounds to six
significant figures, ``PLACES`` to six decimals (lengths and stations of the geometry),
``ANGLE`` to nine significant figures, ``INPUT`` (an input repeated) to twelve, so it
reads as given; ``TEXT`` is a word from a short list. ``working`` outputs are the
intermediate values and constants a checker substitutes to redo the working by hand
(``curvetui.reports.working``): JSON keeps them, batch files leave them out.
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
    working: bool = False  # an intermediate of the working: in JSON, left out of batch files
    label: str = ""  # the main results' words (the others show their key)
    short: str = ""
    unit: str = ""


def _o(key, kinds=BOTH, rounding=SIG, **kw) -> Output:
    return Output(key, kinds, rounding, **kw)


# the main results: (key, label, short label for narrow screens, unit kind); the unit kind
# picks the unit of the user's system (curvetui.results.unit_label)
_ROAD_MAIN = (
    ("lateral_acceleration", "Lateral acceleration v^2/R", "a = v^2/R", "acceleration"),
    ("lateral_acceleration_g", "Lateral acceleration", "a in g", "g"),
    ("side_friction_max", "Maximum side friction factor f_max", "f max", ""),
    ("side_friction_demand", "Side friction demand f", "f demand", ""),
    ("min_radius", "Minimum radius R_min", "R min", "length"),
    ("min_radius_rounded", "Minimum radius, as the table rounds", "R min (table)", "length"),
    ("superelevation", "Superelevation in use e", "e in use", "%"),
    ("superelevation_design", "Design superelevation (distribution)", "e design", "%"),
    ("safe_speed", "Safe speed", "safe speed", "speed"),
)
_RAIL_MAIN = (
    ("equilibrium_cant", "Equilibrium cant, fast train", "E equilibrium", "cant"),
    ("equilibrium_cant_low", "Equilibrium cant, slow train", "E slow train", "cant"),
    ("cant_deficiency", "Cant deficiency", "cant deficiency", "cant"),
    ("cant_excess", "Cant excess", "cant excess", "cant"),
    (
        "uncompensated_acceleration",
        "Uncompensated lateral acceleration g D/s",
        "a_q = g D/s",
        "m/s^2",
    ),
    ("centripetal_acceleration", "Centripetal acceleration v^2/R", "v^2/R", "m/s^2"),
    ("max_speed", "Maximum speed (deficiency limit)", "V max (deficiency)", "speed"),
    ("min_speed", "Minimum speed (excess limit)", "V min (excess)", "speed"),
    ("balancing_cant", "Cant balancing both trains", "balancing cant", "cant"),
    ("cant_allowed_min", "Least cant serving both trains", "cant allowed from", "cant"),
    ("cant_allowed_max", "Most cant serving both trains", "cant allowed to", "cant"),
    ("cant_limit", "Cant limit", "cant limit", "cant"),
    ("deficiency_limit", "Cant deficiency limit", "deficiency limit", "cant"),
    ("excess_limit", "Cant excess limit", "excess limit", "cant"),
    ("rail_centres", "Distance between rail centres s", "rail centres s", "cant"),
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
    "spiral_radius_max",  # the table's largest radius that uses a spiral (null: none given)
)
ROAD_TRANSITION_CONSTANTS = (
    "comfort_rate",  # C, m/s^3 or ft/s^3
    "shift_min",  # p_min, m or ft
    "shift_max",  # p_max
    "lane_width",  # w
    "lanes_rotated",  # n1
    "width_factor",  # b_w
    "normal_crown",  # e_NC, percent
)
RUNOFF_STATIONS = (
    "runout_start",
    "level_crown_in",
    "full_superelevation_in",
    "full_superelevation_out",
    "level_crown_out",
    "runout_end",
    "reverse_crown_in",  # both halves at +e_NC (curvetui.core.superelevation_diagram)
    "reverse_crown_out",
)
RAIL_TRANSITION = ("length", "length_cant_gradient", "length_cant_rate", "length_deficiency_rate")
# the rate limits of the design speed's band, in the user's units (mm/m or in/ft; mm/s or in/s)
RAIL_TRANSITION_LIMITS = ("cant_gradient_max", "cant_rate_max", "deficiency_rate_max")
# Method 5's intermediates (curvetui.core.superelevation.method5_terms) in the user's units:
# the point-mass constant K of e + f = V^2 / (K R) in the user's units (the table's 127 or 15
# when they are the table's own), the average running speed, the curvatures 1/R_PI and
# 1/R_min, h, S1, S2, M0, the side friction f by the distribution and the leg used
SUPERELEVATION_WORKING = (
    "constant",
    "friction_table",
    "min_radius_table",
    "running_speed",
    "curvature_pi",
    "curvature_min",
    "friction_at_pi",
    "slope_1",
    "slope_2",
    "middle_ordinate",
    "side_friction",
)
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
# HSM 1st ed. 2010: Eq. 10-13's factor; SV (fraction) and Eqs. 10-14..16's factor; product
CRASH = ("curvature_cmf", "superelevation_variance", "superelevation_cmf", "cmf")
CRASH_WORKING = ("curve_length_mi", "radius_ft", "spirals")  # Eq. 10-13's Lc, R, S
ADVISORY = (
    "speed",  # rounded down to the sign table's step (5 mph; 10 km/h on metric projects)
    "speed_calculated",  # V = sqrt(k R (e + f)) before rounding
    "friction",  # f of the speed's band
    "design_speed_inferred",  # highest speed within the road table's f_max (interpolated)
    "design_speed_inferred_row",  # the highest table row met
)
# e used, percent; the rounding step; the band's top speed where V reached it (a gap)
ADVISORY_WORKING = ("superelevation", "step", "band_top")
SIGNS = ("sign", "warning_sign", "plaque", "chevrons")

OUTPUTS: tuple[Output, ...] = (
    *(_o(k, (ROAD,), label=lab, short=sh, unit=u) for k, lab, sh, u in _ROAD_MAIN),
    _o("cross_section", (ROAD,), TEXT),
    *(_o(f"superelevation_working.{k}", (ROAD,), working=True) for k in SUPERELEVATION_WORKING),
    _o("superelevation_working.leg", (ROAD,), TEXT, working=True),
    *(_o(k, (RAIL,), label=lab, short=sh, unit=u) for k, lab, sh, u in _RAIL_MAIN),
    _o("speed", rounding=INPUT, echo=True),
    _o("radius", rounding=INPUT, echo=True),
    _o("e_max", (ROAD,)),
    _o("cant", (RAIL,), INPUT, echo=True),
    _o("low_speed", (RAIL,), INPUT, echo=True),
    _o("traffic", (RAIL,), TEXT, echo=True),  # null where the limits set no speed by traffic
    _o("degree_of_curve_arc", (RAIL,)),
    _o("degree_of_curve_chord", (RAIL,)),
    _o("transition.governing", rounding=TEXT),
    _o("transition.status", rounding=TEXT),
    *(_o(f"transition.{k}", (ROAD,)) for k in ROAD_TRANSITION),
    _o("transition.runoff_on_tangent", (ROAD,)),
    # the constants the transition used, so its working can be redone by hand
    *(_o(f"transition.{k}", (ROAD,)) for k in ROAD_TRANSITION_CONSTANTS),
    *(_o(f"transition.{k}", (ROAD,), PLACES) for k in RUNOFF_STATIONS),
    _o("transition.rotation_axis", (ROAD,), TEXT, echo=True),  # the superelevation diagram's
    *(_o(f"transition.{k}", (RAIL,)) for k in RAIL_TRANSITION),
    *(_o(f"transition.{k}", (RAIL,), working=True) for k in RAIL_TRANSITION_LIMITS),
    _o("geometry.type", rounding=TEXT),
    _o("geometry.deflection", rounding=ANGLE, echo=True),
    _o("geometry.spiral_length", rounding=INPUT, echo=True),
    _o("geometry.spiral_length_out", rounding=INPUT, echo=True),
    _o("geometry.spiral_angle", rounding=ANGLE),
    *(_o(f"geometry.{k}", rounding=PLACES) for k in dict.fromkeys((*CIRCULAR, *SPIRAL))),
    _o("geometry.spiral_angle_out", rounding=ANGLE),
    *(_o(f"geometry.{k}", rounding=PLACES) for k in SPIRAL_OUT),
    *(_o(f"geometry.{k}", rounding=PLACES) for k in STATIONS),
    _o("sight.status", (ROAD,), TEXT),
    *(_o(f"sight.{k}", (ROAD,)) for k in SIGHT),
    _o("sight.grade", (ROAD,), INPUT, echo=True),
    _o("sight.stopping_sight_distance_calculated", (ROAD,), working=True),
    # curve crash factors, rural two-lane roads (curvetui.bend.crash): with a deflection
    *(_o(f"crash.{k}", (ROAD,)) for k in CRASH),
    _o("crash.curvature_validity", (ROAD,), TEXT),
    *(_o(f"crash.{k}", (ROAD,), working=True) for k in CRASH_WORKING),
    # the curve as an existing one (curvetui.bend.road_advisory): advisory speed by the design
    # method, rounded down to the sign table's step; the inferred design speed; with a
    # posted speed, the warning sign, the advisory speed plaque and chevrons
    *(_o(f"advisory.{k}", (ROAD,)) for k in ADVISORY),
    _o("advisory.design_speed_inferred_kind", (ROAD,), TEXT),
    *(_o(f"advisory.{k}", (ROAD,), working=True) for k in ADVISORY_WORKING),
    _o("advisory.capped", (ROAD,), TEXT, working=True),
    _o("signs.posted_speed", (ROAD,), INPUT, echo=True),
    _o("signs.speed_difference", (ROAD,)),
    *(_o(f"signs.{k}", (ROAD,), TEXT) for k in SIGNS),
    # a register's curves in series (curvetui.bend.series_signs, batch only): the series'
    # sign on its first curve (Reverse Turn/Curve, Winding Road), "in series" on the later
    # ones, "single" or "same direction" (own signs); null where the curve is not placed
    _o("signs.series", (ROAD,), TEXT),
    _o("signs.table", (ROAD,), TEXT, working=True),
)
BY_KEY = {o.key: o for o in OUTPUTS}
assert len(BY_KEY) == len(OUTPUTS)

# keys of the geometry object by its type, in the order JSON lists them
CIRCULAR_JSON = ("type", "deflection", *CIRCULAR, "pi", "pc", "pt")
SPIRAL_JSON = (
    "type",
    "deflection",
    "spiral_length",
    "spiral_angle",
    *SPIRAL,
    "pi",
    "ts",
    "sc",
    "cs",
    "st",
)
SPIRAL_OUT_JSON = ("spiral_length_out", "spiral_angle_out", *SPIRAL_OUT)


def main_results(kind: str) -> tuple[Output, ...]:
    """The main results of a road or rail bend, with their labels, in display order."""
    return tuple(o for o in OUTPUTS if o.label and kind in o.kinds)
