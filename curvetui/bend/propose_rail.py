"""A rail curve's proposal in the project's units (see curvetui.bend.propose): the cant,
transition or least radius of curvetui.core.proposals_rail, with the reasons as text."""

from __future__ import annotations

import math

from curvetui.bend.fields import BY_KEY
from curvetui.bend.propose import Proposal, _clean, _g
from curvetui.core import proposals_rail as pr
from curvetui.core.rail import RailLimits, rail_centres_for_gauge
from curvetui.core.transitions import RAIL_GOVERNING
from curvetui.core.units import UnitSystem


def _rail_centres(si: dict, limits: RailLimits) -> float:
    """The s the evaluation uses (curvetui.bend.evaluate._rail): the limits' own, or the
    given gauge's where it is another."""
    g = si.get("gauge")
    if g is None or abs(g / 1000.0 - limits.gauge) < 0.0005:
        return float(limits.rail_centres)
    return rail_centres_for_gauge(g)


def rail_proposal(si: dict, units: UnitSystem, limits: RailLimits) -> Proposal:
    """The proposal for one rail curve's inputs ``si`` (parsed, SI); no record yet."""
    ln, u, cl, sl = units.length_label, units.name, units.cant_label, units.speed_label
    v, low = si["speed"], si.get("low_speed")
    r_given = si.get("radius")
    s = _rail_centres(si, limits)
    floor, top = (float(units.length_to_si(x)) for x in BY_KEY["radius"].allowed("rail", units))
    deflection = math.radians(si["deflection"]) if "deflection" in si else None
    p = pr.propose_rail(limits, v, low, r_given, s, u, floor, deflection, top)
    L, C = units.length_from_si, units.cant  # noqa: N806 - user units

    def length(x: float) -> str:
        return f"{_g(float(L(x)))} {ln}"

    def cant(x: float) -> str:
        return f"{_g(x / C)} {cl}"

    b = p.band
    fast = f"{float(units.speed_from_si(v)):g} {sl}"
    reasons = []
    if math.isfinite(p.radius_least):  # no cant on the step at the given radius
        if r_given is None:
            given = "no radius was given"
        elif r_given < limits.radius_min * (1 - 1e-12):
            given = f"R {length(r_given)} is below the limits' least radius"
        else:
            given = f"no cant on the {cant(pr.CANT_STEP[u])} step serves both trains at R "
            given += length(r_given)
        reasons.append(
            f"radius {length(p.radius_band)}: {given}; the least radius that admits them is "
            f"max(s v^2 / (g (C + I)), s (v^2 - u^2) / (g (I + X)), the limits' least radius) = "
            f"{length(p.radius_least)}, rounded up to {length(pr.RADIUS_STEP[u])} and raised "
            f"by that step until a cant on the step fits (step: common practice, no source)"
        )
    if p.radius_why == pr.RADIUS_DEFLECTION:
        bound = (
            f"and the bound sqrt(a b / (a + b) s v^2 / (g Delta)) = {length(p.fit_bound)} "
            f"(a = max(1 / cant gradient, v / rate of cant), b = v / rate of deficiency)"
            if p.fit_bound > 0
            else ""
        )
        reasons.append(
            f"radius {length(p.radius)}: two spirals of length L fit the deflection "
            f"{si['deflection']:g} deg only while their angles L / (2R) sum to no more than "
            f"it, L <= R x Delta; at R {length(p.radius_band)} that is "
            f"{length(p.radius_band * p.deflection)}, and the shortest transition of any cant "
            f"on the step inside the limits is {length(p.band_shortest)}: the radius is the "
            f"least on the {length(pr.RADIUS_STEP[u])} step at which a cant's transitions "
            f"fit, walked up from the larger of R {length(p.radius_band)} {bound} (step: "
            f"common practice, no source)"
        )
    slow = (
        f", excess at {float(units.speed_from_si(low)):g} {sl} at most {cant(b.excess_max)}"
        if low is not None and math.isfinite(b.excess_max)
        else ""
    )
    reasons.append(
        f"cants serving both trains at R {length(p.radius)}: {cant(b.lo)} to {cant(b.hi)} "
        f"(cant at most {cant(b.cant_max)}, deficiency at {fast} at most "
        f"{cant(b.deficiency_max)}{slow}; limits {limits.name})"
    )
    if p.rule == "balancing":
        reasons.append(
            f"target {cant(p.target)}: the balancing cant (X E_f + I E_s) / (I + X), the same "
            f"share of the deficiency and excess limits (common practice, no source)"
        )
    else:
        reasons.append(
            f"target {cant(p.target)}: the least cant that keeps the deficiency at {fast} "
            f"within its recommended {cant(b.deficiency_recommended)} (common practice, no "
            f"source)"
        )
    if math.isfinite(p.passed_cant):
        reasons.append(
            f"cant {cant(p.cant)}: the multiple of {cant(pr.CANT_STEP[u])} nearest the "
            f"target, {cant(p.passed_cant)}, needs a transition of {length(p.passed_length)}, "
            f"longer than two spirals fit on the deflection {si['deflection']:g} deg (L <= "
            f"R x Delta = {length(p.radius * p.deflection)}); {cant(p.cant)} is the multiple "
            f"inside the band nearest the target whose transition fits (a lower cant "
            f"shortens the cant-gradient and cant-rate runs, a higher one the deficiency-rate "
            f"run; common practice, no source)"
        )
    else:
        reasons.append(
            f"cant {cant(p.cant)}: the multiple of {cant(pr.CANT_STEP[u])} inside the band "
            f"nearest the target (step: common practice, no source)"
        )
    t = p.transition
    spiral, text = _spirals(si, p, limits, units)
    reasons.append(text)
    proposed: dict[str, float | None] = {
        "radius": _clean(float(L(p.radius))),
        "cant": _clean(p.cant / C),
    }
    if spiral == "none":
        proposed.update(spiral_in=None, spiral_out=None)
    elif spiral is not None:  # else the spirals are left as given
        proposed.update(spiral_in=spiral, spiral_out=None)
    figures = {
        "cant_allowed_min": b.lo / C,
        "cant_allowed_max": b.hi / C,
        "target": p.target / C,
        "rule": p.rule,
        "cant_step": _clean(pr.CANT_STEP[u] / C),
        "radius_least": float(L(p.radius_least)),
        "radius_step": _clean(float(L(pr.RADIUS_STEP[u]))),
        "transition_length": float(L(p.transition_length)),
        "length_cant_gradient": float(L(float(t.length_cant_gradient))),
        "length_cant_rate": float(L(float(t.length_cant_rate))),
        "length_deficiency_rate": float(L(float(t.length_deficiency_rate))),
        "radius_why": p.radius_why,  # kept, "no cant" (the band) or "deflection"
        "radius_band": float(L(p.radius_band)),
        "fit_radius_bound": float(L(p.fit_bound)),
        "cant_passed": p.passed_cant / C,  # the target's step cant, where moved to fit
        "transition_passed": float(L(p.passed_length)),
    }
    return Proposal("rail", u, proposed, {}, reasons, figures, {})


def _spirals(si: dict, p: pr.RailProposal, limits: RailLimits, units: UnitSystem):
    """The spirals proposed, a length in the user's unit, "none" (cleared) or None (left as
    given), and the reason. Given spirals are kept where they are at least the length
    needed and fit the deflection; otherwise the length needed is proposed (it fits: see
    curvetui.core.proposals_rail) or, where none is needed, they are cleared."""
    ln, u = units.length_label, units.name
    L = units.length_from_si  # noqa: N806 - user units

    def length(x: float) -> str:
        return f"{_g(float(L(x)))} {ln}"

    t = p.transition
    has_d = "deflection" in si
    given = "spiral_in" in si or "spiral_out" in si
    given_in = si.get("spiral_in", 0.0)
    given_out = si.get("spiral_out", given_in)
    given_text = f"{length(given_in)}" + (
        f", {length(given_out)} out" if given_out != given_in else ""
    )
    room = 2 * p.radius * math.radians(si["deflection"]) if has_d else math.inf
    given_fit = given_in + given_out <= room * (1 - 1e-9)
    overlap = (
        f"the spirals given ({given_text}) overlap at R {length(p.radius)}: their angles "
        f"L / (2R) sum to more than the deflection {si.get('deflection', 0):g} deg "
        f"(L_in + L_out > 2 R Delta = {length(room)})"
    )
    if math.isfinite(p.transition_length) and p.transition_length > 0:
        gov = RAIL_GOVERNING[int(t.governing)]
        parts = ", ".join(
            f"{n} {length(float(x))}"
            for n, x in zip(
                RAIL_GOVERNING,
                (t.length_cant_gradient, t.length_cant_rate, t.length_deficiency_rate),
                strict=True,
            )
            if math.isfinite(float(x))
        )
        text = (
            f"transition {length(p.transition_length)}: the longest of {parts} ({gov} "
            f"governs; limits {limits.name}), rounded up to {length(pr.LENGTH_STEP[u])}"
        )
        if has_d:
            text += f"; two fit the deflection (L <= R x Delta = {length(room / 2)})"
        if min(given_in, given_out) >= float(t.length) * (1 + 1e-12) and given_fit:
            return None, f"{text}; the spirals given ({given_text}) are at least that long: kept"
        if given and not given_fit:
            text += f"; {overlap}: replaced by the length needed"
        return _clean(float(L(p.transition_length))), text
    if math.isfinite(p.transition_length):
        text = "transition: none needed (no cant and no deficiency)"
        return ("none" if given else None), text
    text = f"transition: the limits {limits.name} set no transition limits"
    if given and not given_fit:
        return "none", (
            f"{text}, so no length is needed by them; {overlap}: cleared (spirals your "
            f"authority's rules need must fit L_in + L_out <= {length(room)})"
        )
    return None, text
