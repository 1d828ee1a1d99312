"""Numbers as a designer reads them: each result shown to the precision the trade uses.

JSON and CSV keep full precision (six significant figures); a screen, a printed table or
a worksheet shows a value through ``shown``. The verdict is never taken from these.

- design superelevation: rounded *up* to the road table's step (``superelevation_step``,
  percent; 0.1 % for the shipped Green Book tables, from memory; Iowa DOT rounds to 0.2 %);
- speeds to 1 km/h or mph: a maximum or safe speed rounded *down*, a minimum speed *up*
  (the rounding never claims more than the check found: common practice, no source);
- cant to 1 mm (0.1 in);
- the minimum radius as the source table rounds it (Green Book Table 3-7's rule).
"""

from __future__ import annotations

import math

DOWN = (
    "safe_speed",
    "max_speed",
    "sight.speed_that_passes",
    # an existing curve's speeds: the advisory is already a multiple of the sign table's
    # step; the inferred design speed is claimed no higher than the curve meets
    "advisory.speed",
    "advisory.design_speed_inferred",
    "advisory.design_speed_inferred_row",
    "advisory.step",
    "signs.posted_speed",
    "signs.speed_difference",
)
UP = ("min_speed",)
CANT = (
    "equilibrium_cant",
    "equilibrium_cant_low",
    "cant_deficiency",
    "cant_excess",
    "balancing_cant",
    "cant_allowed_min",
    "cant_allowed_max",
    "cant_limit",
    "deficiency_limit",
    "excess_limit",
)


def shown(key: str, value, units_name: str = "metric", step_pct: float = 0.1, table=None) -> str:
    """``value`` (the record's, in the user's units) as text for people; "-" when absent."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "-"
    if isinstance(value, str):
        return value
    if key in ("superelevation_design", "superelevation"):
        steps = math.ceil(round(value / step_pct, 9))
        return f"{steps * step_pct:.1f}"
    if key in DOWN:
        return f"{math.floor(value + 1e-9):,.0f}"
    if key in UP:
        return f"{math.ceil(value - 1e-9):,.0f}"
    if key in CANT:
        return f"{value:,.0f}" if units_name == "metric" else f"{value:,.1f}"
    if key == "min_radius" and table is not None:
        return f"{table.radius_rounding.apply(value):,.0f}"
    if abs(value) >= 100:
        return f"{value:,.1f}"
    return f"{value:,.3f}"
