"""Clothoid transitions: spiral - circular arc - spiral, equal or unequal spirals.

A clothoid (Euler spiral) has curvature rising linearly with length, 1/rho = s / A^2, with
A^2 = R Ls so that it reaches the radius R at s = Ls. Its tangent has turned through
theta(s) = s^2 / (2 A^2), the spiral angle theta = Ls / (2 R) at the SC. In local
coordinates (x along the tangent at the TS, y offset towards the curve)

    x(s) = int_0^s cos(t^2 / (2 A^2)) dt = A sqrt(pi) C(s / (A sqrt(pi)))
    y(s) = int_0^s sin(t^2 / (2 A^2)) dt = A sqrt(pi) S(s / (A sqrt(pi)))

with the Fresnel integrals C(z) = int_0^z cos(pi t^2 / 2) dt, S likewise with sin
(scipy.special.fresnel): exact, not the usual few terms of X = Ls (1 - theta^2/10 + ...).
Where the tangent has turned through at most 1 rad that series (the Maclaurin series of
cos and sin integrated term by term) is summed to double precision instead, which needs
no scipy (slow to import when the app starts).

The circular arc is shifted inwards by p = Y - R (1 - cos theta) and its centre lies a
distance k = X - R sin theta along the tangent from the TS. With the spiral in (Ls1, p1, k1)
and out (Ls2, p2, k2) on a deflection Delta, placing the arc centre at (k1, R + p1) from
the TS and requiring the forward tangent to lie R + p2 from it gives

    T1 = k1 + (R + p2) / sin Delta - (R + p1) / tan Delta
       = k1 + (R + p1) tan(Delta/2) + (p2 - p1) / sin Delta       (PI to TS)
    T2 = k2 + (R + p2) tan(Delta/2) - (p2 - p1) / sin Delta       (PI to ST)

which for equal spirals is the familiar Ts = (R + p) tan(Delta/2) + k. Lengths:
Lc = R (Delta - theta1 - theta2), stations TS = PI - T1, SC = TS + Ls1, CS = SC + Lc,
ST = CS + Ls2. The spirals fit only while theta1 + theta2 <= Delta.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from curvetui.core.circular import (
    GeometryError,
    check_deflection,
    check_radius,
    check_station,
    exsec_half,
    require,
    versed_half,
)

__all__ = [
    "GeometryError",
    "SpiralCurve",
    "clothoid_xy",
    "require_spirals_fit",
    "spiral_curve",
]

# theta1 + theta2 may exceed Delta by this relative amount (float rounding, e.g. a
# spiral-spiral bend whose Ls was computed as R Delta) before the spirals count as overlapping.
OVERLAP_TOLERANCE = 1e-12
RADIUS_SUGGESTED_MAX = 1e6  # [m] a larger radius (over 1000 km) is no bend: not suggested


def _check_spiral_length(ls, name: str) -> None:
    ls = np.asarray(ls)
    require(np.isfinite(ls) & (ls >= 0), f"{name} must be a length of 0 m or more", ls)


# The clothoid as power series in theta = s^2 / (2 A^2), the tangent's turn at s:
#   x = s sum_n (-1)^n theta^(2n) / ((2n)! (4n + 1)),
#   y = s theta sum_n (-1)^n theta^(2n) / ((2n + 1)! (4n + 3))
# (cos u and sin u of u = t^2 / (2 A^2) expanded and integrated from 0 to s term by term).
# For theta <= 1 the terms fall from the first and the first left out, theta^22 / 22!, is
# below 1e-21 of the sum: eleven terms give the sum to double precision.
SERIES_THETA_MAX = 1.0
_X_TERMS = tuple((-1) ** n / (math.factorial(2 * n) * (4 * n + 1)) for n in range(11))
_Y_TERMS = tuple((-1) ** n / (math.factorial(2 * n + 1) * (4 * n + 3)) for n in range(11))


def _horner(coefficients: tuple[float, ...], u: np.ndarray) -> np.ndarray:
    """sum_n c_n u^n by Horner's rule."""
    out = np.zeros_like(u)
    for c in reversed(coefficients):
        out = out * u + c
    return out


def clothoid_xy(s, ls, radius):
    """Local coordinates (x, y) [m] of the point a distance ``s`` from the TS along a clothoid
    that reaches ``radius`` at ``ls``.

    A^2 = R Ls; x = A sqrt(pi) C(s / (A sqrt(pi))), y = A sqrt(pi) S(s / (A sqrt(pi))) with
    scipy's Fresnel integrals; where theta = s^2 / (2 A^2) <= 1 rad, their power series
    summed to double precision (no scipy needed). x runs along the tangent at the TS, y
    towards the curve. A zero-length spiral is straight (x = s, y = 0).
    """
    s, ls, r = np.broadcast_arrays(
        np.asarray(s, dtype=float), np.asarray(ls, dtype=float), np.asarray(radius, dtype=float)
    )
    check_radius(r)
    _check_spiral_length(ls, "spiral length")
    require(np.isfinite(s), "distance along the spiral must be finite", s)
    scale = np.sqrt(np.pi * r * ls)  # A sqrt(pi)
    curved = scale > 0
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        theta = np.where(curved, s * s / np.where(curved, 2 * r * ls, 1.0), 0.0)
    near = ~curved | (theta <= SERIES_THETA_MAX)  # straight, or summed by the series
    u = np.where(near, theta * theta, 0.0)
    x = np.array(s * _horner(_X_TERMS, u), dtype=float)  # arrays, also for 0-d inputs
    y = np.array(np.where(curved, s * np.where(near, theta, 0.0) * _horner(_Y_TERMS, u), 0.0))
    if not near.all():
        # imported only here: scipy is slow to import when the app starts
        from scipy.special import fresnel

        far = ~near
        fs, fc = fresnel(s[far] / scale[far])  # scipy returns (S, C)
        x[far] = scale[far] * fc
        y[far] = scale[far] * fs
    return x, y


@dataclass(frozen=True)
class SpiralCurve:
    """A spiral - arc - spiral bend, SI (m, rad), arrays broadcast from the inputs.

    Where the spirals overlap (theta_in + theta_out > deflection) ``overlap`` is True and the
    fitted values (tangents, external, lengths, stations but the PI) are NaN; the properties
    of each spiral on its own (theta, X, Y, p, k) are kept.
    """

    radius: np.ndarray
    deflection: np.ndarray
    ls_in: np.ndarray
    ls_out: np.ndarray
    theta_in: np.ndarray  # spiral angle Ls / (2 R)
    theta_out: np.ndarray
    xs_in: np.ndarray  # X at the SC, along the back tangent from the TS
    ys_in: np.ndarray  # Y at the SC, offset from the back tangent
    xs_out: np.ndarray  # X at the CS, along the forward tangent from the ST
    ys_out: np.ndarray
    p_in: np.ndarray  # shift of the arc from the back tangent
    k_in: np.ndarray  # TS to the foot of the perpendicular from the arc centre
    p_out: np.ndarray
    k_out: np.ndarray
    tangent_in: np.ndarray  # total tangent PI to TS
    tangent_out: np.ndarray  # total tangent PI to ST
    external: np.ndarray  # PI to the arc along the radial line through the PI
    circular_length: np.ndarray  # Lc, SC to CS
    total_length: np.ndarray  # TS to ST
    overlap: np.ndarray  # bool: the spirals overlap and the bend cannot be built
    pi: np.ndarray
    ts: np.ndarray
    sc: np.ndarray
    cs: np.ndarray
    st: np.ndarray


def spiral_curve(radius, deflection, ls_in, ls_out=None, pi_station=0.0) -> SpiralCurve:
    """Spiral - arc - spiral bend of ``radius`` [m] on ``deflection`` [rad].

    ``ls_in`` and ``ls_out`` [m] are the spiral lengths (``ls_out=None``: equal spirals);
    a zero length leaves a plain arc there, and both zero give the simple circular curve.
    theta = Ls/(2R), p = Y - R (1 - cos theta), k = X - R sin theta,
    T_in = k1 + (R + p1) tan(D/2) + (p2 - p1)/sin D, T_out = k2 + (R + p2) tan(D/2)
    - (p2 - p1)/sin D, Lc = R (D - theta1 - theta2), TS = PI - T_in, SC = TS + Ls1,
    CS = SC + Lc, ST = CS + Ls2.

    ``external`` is |PI - O| - R, O the arc centre: the distance from the PI to the arc (or
    the arc's circle) along the radial line through the PI; for equal spirals
    Es = (R + p) sec(D/2) - R, on the bisector.

    Overlapping spirals give NaN and ``overlap`` True (see ``require_spirals_fit``);
    a radius that is not positive, a deflection outside (0, pi) or a negative spiral length
    is refused with GeometryError.
    """
    ls_out = ls_in if ls_out is None else ls_out
    r, d, l1, l2, pi = np.broadcast_arrays(
        *(np.asarray(v, dtype=float) for v in (radius, deflection, ls_in, ls_out, pi_station))
    )
    check_radius(r)
    check_deflection(d)
    _check_spiral_length(l1, "spiral length in")
    _check_spiral_length(l2, "spiral length out")
    check_station(pi)

    th1 = l1 / (2.0 * r)
    th2 = l2 / (2.0 * r)
    x1, y1 = clothoid_xy(l1, l1, r)
    x2, y2 = clothoid_xy(l2, l2, r)
    p1 = y1 - r * versed_half(2.0 * th1)  # Y - R (1 - cos theta)
    p2 = y2 - r * versed_half(2.0 * th2)
    k1 = x1 - r * np.sin(th1)
    k2 = x2 - r * np.sin(th2)

    th_sum = th1 + th2
    overlap = th_sum > d * (1.0 + OVERLAP_TOLERANCE)
    half_tan = np.tan(d / 2.0)
    dp = (p2 - p1) / np.sin(d)
    t1 = k1 + (r + p1) * half_tan + dp
    t2 = k2 + (r + p2) * half_tan - dp

    # equal shifts: Es = (R + p)(sec(D/2) - 1) + p, the simple curve's E when p = 0;
    # otherwise |PI - O| - R with O = (k1, R + p1), PI = (T1, 0) from the TS, written as
    # (|PI - O|^2 - R^2) / (|PI - O| + R) to avoid cancellation.
    u = (r + p1) * half_tan + dp  # T1 - k1
    e_general = (u**2 + p1 * (2.0 * r + p1)) / (np.hypot(u, r + p1) + r)
    external = np.where(p1 == p2, (r + p1) * exsec_half(d) + p1, e_general)

    lc = r * np.maximum(d - th_sum, 0.0)
    total = l1 + lc + l2
    ts = pi - t1
    sc = ts + l1
    cs = sc + lc
    st = cs + l2

    def fitted(values):
        return np.asarray(np.where(overlap, np.nan, values))

    return SpiralCurve(
        radius=np.array(r),
        deflection=np.array(d),
        ls_in=np.array(l1),
        ls_out=np.array(l2),
        theta_in=np.asarray(th1),
        theta_out=np.asarray(th2),
        xs_in=np.asarray(x1),
        ys_in=np.asarray(y1),
        xs_out=np.asarray(x2),
        ys_out=np.asarray(y2),
        p_in=np.asarray(p1),
        k_in=np.asarray(k1),
        p_out=np.asarray(p2),
        k_out=np.asarray(k2),
        tangent_in=fitted(t1),
        tangent_out=fitted(t2),
        external=fitted(external),
        circular_length=fitted(lc),
        total_length=fitted(total),
        overlap=np.asarray(overlap),
        pi=np.array(pi),
        ts=fitted(ts),
        sc=fitted(sc),
        cs=fitted(cs),
        st=fitted(st),
    )


def _angles_text(th1: float, th2: float, d: float) -> tuple[str, str, str]:
    """Degrees with enough decimals (1 to 6) that theta1 + theta2 > Delta still shows."""
    a, b, c = (math.degrees(v) for v in (th1, th2, d))
    for decimals in range(1, 7):
        texts = tuple(f"{v:.{decimals}f}" for v in (a, b, c))
        if float(texts[0]) + float(texts[1]) > float(texts[2]):
            break
    return texts


def require_spirals_fit(curve: SpiralCurve) -> SpiralCurve:
    """Return ``curve`` if its spirals fit, else raise GeometryError saying what to change.

    The spirals fit while theta1 + theta2 = (Ls1 + Ls2) / (2R) <= Delta, that is
    Ls1 + Ls2 <= 2 R Delta; the message suggests spiral lengths (in the same ratio, rounded
    down to the centimetre) and a radius (rounded up) that fit.
    """
    overlap = np.asarray(curve.overlap)
    if not overlap.any():
        return curve
    index = tuple(np.argwhere(overlap)[0]) if overlap.ndim else ()

    def at(field):
        return float(np.asarray(getattr(curve, field))[index])

    r, d, l1, l2 = at("radius"), at("deflection"), at("ls_in"), at("ls_out")
    where = ""
    if overlap.ndim:
        n = int(overlap.sum())
        where = f" (element {index[0] if len(index) == 1 else index}; {n} of {overlap.size})"
    raise GeometryError(overlap_message(r, d, l1, l2, where))


def overlap_message(r: float, d: float, l1: float, l2: float, where: str = "") -> str:
    """What to change when spirals of ``l1`` and ``l2`` [m] overlap on radius ``r`` [m] and
    deflection ``d`` [rad]: shorter spirals (same ratio, rounded down to the centimetre), a
    larger radius (rounded up) or a larger deflection."""
    a, b, c = _angles_text(l1 / (2.0 * r), l2 / (2.0 * r), d)
    scale = 2.0 * r * d / (l1 + l2)
    fit1 = math.floor(l1 * scale * 100.0) / 100.0
    fit2 = math.floor(l2 * scale * 100.0) / 100.0
    lengths = f"{fit1:.2f} m each" if l1 == l2 else f"{fit1:.2f} m in and {fit2:.2f} m out"
    r_need = (l1 + l2) / (2.0 * d) * 100.0
    radius = (
        f"use a radius of at least {math.ceil(r_need) / 100.0:.2f} m, "
        if r_need <= RADIUS_SUGGESTED_MAX * 100.0
        else ""  # a deflection so small that no radius a bend could have would do
    )
    return (
        f"spirals overlap{where}: spiral angles {a}° + {b}° exceed the deflection {c}°; "
        f"shorten the spirals to at most {lengths}, {radius}or increase the deflection"
    )
