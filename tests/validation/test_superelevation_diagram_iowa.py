"""The superelevation diagram against hand calculation of a published example.

Sources (REFERENCES.md):
- Iowa DOT Design Manual superelevation tables, e_max 6 %, 12 ft lanes (read): R 2000 ft,
  50 mph: e 4.4 %, runoff 158 ft, tangent runout 72 ft. The runoff equals
  1.5 x 12 ft x e / Delta with Delta 0.50 % (derived): 1.5 x 12 x 4.4 / 0.50 = 158.4 ft; the
  runout equals runoff x 2 % / e: 158.4 x 2 / 4.4 = 72.0 ft.
- Highway Engineering Handbook, "Superelevation Position" (read): simple curves have
  two-thirds of full superelevation at the PC and PT (a share 2/3 of the runoff on the
  tangent); with spirals the transition from adverse crown removal to full superelevation is
  within the spiral (spiral length = runoff length).
- The stations follow from those lengths by the placement rule alone (hand arithmetic below);
  the edge elevations are slope x distance from the axis (the convention in
  curvetui.core.superelevation_diagram: common practice, no source).
"""

from __future__ import annotations

import numpy as np
import pytest

from curvetui.core import superelevation_diagram as sed
from curvetui.core.units import FOOT

E, E_NC = 0.044, 0.02  # Iowa, 50 mph, R 2000 ft; normal crown 2 %
LR = 1.5 * 12 * 4.4 / 0.50  # 158.4 ft (Iowa's 158 ft printed)
LT = LR * 2 / 4.4  # 72.0 ft (Iowa's 72 ft printed)
PC, PT = 1000.0, 1600.0  # ft, an invented curve for the placement arithmetic


def ft(x):
    return np.asarray(x) * FOOT


def simple(pc=PC, pt=PT):
    ramps = sed.simple_placement(ft(pc), ft(pt), ft(LR), 2 / 3)
    return ramps, sed.key_stations(*ramps, E, E_NC)


def test_iowa_lengths_are_the_printed_ones():
    assert round(LR) == 158 and round(LT) == 72  # the hand arithmetic above, as printed


def test_simple_curve_key_stations_by_hand():
    # two-thirds of L_r on the tangent: 2/3 x 158.4 = 105.6 ft before the PC
    # level crown 1000 - 105.6 = 894.4; normal crown 894.4 - 72 = 822.4;
    # reverse crown 894.4 + 72 = 966.4 (e_NC / e x L_r = 2 / 4.4 x 158.4 = 72);
    # full e 894.4 + 158.4 = 1052.8; and from the PT: 1600 - 52.8 = 1547.2 full e,
    # 1705.6 - 72 = 1633.6 reverse crown, 1600 + 105.6 = 1705.6 level, 1777.6 normal crown
    _, k = simple()
    expected = {
        "normal_crown_in": 822.4,
        "level_crown_in": 894.4,
        "reverse_crown_in": 966.4,
        "full_superelevation_in": 1052.8,
        "full_superelevation_out": 1547.2,
        "reverse_crown_out": 1633.6,
        "level_crown_out": 1705.6,
        "normal_crown_out": 1777.6,
    }
    for key, station in expected.items():
        assert float(k[key]) / FOOT == pytest.approx(station, abs=1e-9), key
    assert not bool(k["too_short"])
    assert float(k["peak_slope"]) == pytest.approx(E)


def test_key_stations_are_in_order():
    _, k = simple()
    stations = [float(k[key]) for key in sed.KEY_POINTS]
    assert stations == sorted(stations)
    assert len(set(stations)) == len(stations)


def test_two_thirds_of_e_at_the_pc_and_pt():
    # Highway Engineering Handbook: 2/3 x 4.4 = 2.9333 % at the PC and PT (both halves, the
    # section is past reverse crown there: 2.93 % > 2 %)
    ramps, _ = simple()
    s_out, s_in = sed.edge_slopes(ft([PC, PT]), *ramps, E, E_NC)
    assert s_out == pytest.approx([2 / 3 * 0.044] * 2)
    assert s_in == pytest.approx([2 / 3 * 0.044] * 2)


def test_cross_slopes_along_the_runout_and_runoff():
    # outside half: -2 % at normal crown, 0 at level crown, +2 % at reverse crown, 4.4 % full;
    # halfway through the runout (894.4 - 36 = 858.4) it is -1 %; the inside half keeps +2 %
    # until reverse crown; on the full-superelevation stretch both are 4.4 %
    ramps, _ = simple()
    x = ft([800.0, 822.4, 858.4, 894.4, 966.4, 1052.8, 1300.0, 1800.0])
    s_out, s_in = sed.edge_slopes(x, *ramps, E, E_NC)
    assert s_out == pytest.approx([-0.02, -0.02, -0.01, 0.0, 0.02, 0.044, 0.044, -0.02])
    assert s_in == pytest.approx([0.02, 0.02, 0.02, 0.02, 0.02, 0.044, 0.044, 0.02])


def test_spiral_runoff_is_the_spiral():
    # TS 1000 ft, spirals 158.4 ft: level crown at the TS, full e at the SC 1158.4; normal
    # crown 1000 - 72 = 928; reverse crown 1000 + 72 = 1072. Out: CS 1400, ST 1558.4.
    ramps = sed.spiral_placement(ft(1000.0), ft(1558.4), ft(158.4), ft(158.4))
    k = sed.key_stations(*ramps, E, E_NC)
    got = [float(k[key]) / FOOT for key in sed.KEY_POINTS]
    assert got == pytest.approx([928.0, 1000.0, 1072.0, 1158.4, 1400.0, 1486.4, 1558.4, 1630.4])


def test_unequal_spirals_each_end_its_own_rate():
    # spiral out 100 ft: full e at CS = ST - 100; reverse crown ST - 2/4.4 x 100 = ST - 45.45
    ramps = sed.spiral_placement(ft(0.0), ft(1000.0), ft(158.4), ft(100.0))
    k = sed.key_stations(*ramps, E, E_NC)
    assert float(k["full_superelevation_out"]) / FOOT == pytest.approx(900.0)
    assert float(k["reverse_crown_out"]) / FOOT == pytest.approx(1000 - 200 / 4.4)
    assert float(k["normal_crown_out"]) / FOOT == pytest.approx(1000 + 200 / 4.4)


def test_short_curve_is_flagged_and_capped():
    # PC 1000, PT 1100: the curve (100 ft) is shorter than 2 x (1/3 x 158.4) = 105.6 ft.
    # Full e would start at 1052.8 and end at 1100 - 52.8 = 1047.2: never reached.
    # The ramps (level crown 894.4 and 1205.6, same length) cross at (894.4 + 1205.6) / 2 =
    # 1050, where the slope is 4.4 x (1050 - 894.4) / 158.4 = 4.32222 %
    ramps, k = simple(1000.0, 1100.0)
    assert bool(k["too_short"])
    assert float(k["peak"]) / FOOT == pytest.approx(1050.0)
    assert float(k["peak_slope"]) == pytest.approx(0.044 * 155.6 / 158.4)
    s_out, s_in = sed.edge_slopes(ft([1040.0, 1050.0, 1060.0]), *ramps, E, E_NC)
    assert s_out.max() == pytest.approx(0.044 * 155.6 / 158.4)
    assert s_out.max() < E
    assert s_out[0] == pytest.approx(0.044 * 145.6 / 158.4)  # rising, in
    assert s_out[2] == pytest.approx(0.044 * 145.6 / 158.4)  # falling, out


W = 12.0  # ft, centreline to each edge (one 12 ft lane each side)


@pytest.mark.parametrize(
    "axis, full, level",
    [
        # about the centreline: out +0.044 x 12 = 0.528, in -0.528; at level crown the
        # outside edge is level with the centreline, the inside one at -0.02 x 12 = -0.24
        (sed.CENTRELINE, (0.528, 0.0, -0.528), (0.0, 0.0, -0.24)),
        # about the inside edge, held at its normal-crown -0.24: centreline -0.24 + 0.528 =
        # 0.288, outside 0.288 + 0.528 = 0.816; at level crown nothing moved inside: (0, 0)
        (sed.INSIDE, (0.816, 0.288, -0.24), (0.0, 0.0, -0.24)),
        # about the outside edge, held at -0.24: centreline -0.24 - 0.528 = -0.768, inside
        # -0.768 - 0.528 = -1.296; at level crown the centreline dropped to -0.24 + 0 and the
        # inside edge to -0.24 - 0.24 = -0.48
        (sed.OUTSIDE, (-0.24, -0.768, -1.296), (-0.24, -0.24, -0.48)),
    ],
)
def test_edge_elevations_about_each_axis(axis, full, level):
    z = sed.edge_elevations([E, 0.0], [E, E_NC], ft(W), ft(W), E_NC, axis)
    got = np.asarray(z) / FOOT
    assert got[:, 0] == pytest.approx(full, abs=1e-12)
    assert got[:, 1] == pytest.approx(level, abs=1e-12)


def test_normal_crown_is_the_grade_line_for_every_axis():
    # at normal crown no axis has moved: centreline 0, both edges -0.02 x 12 = -0.24 ft
    for axis in (sed.CENTRELINE, sed.INSIDE, sed.OUTSIDE):
        z = np.asarray(sed.edge_elevations(-E_NC, E_NC, ft(W), ft(W), E_NC, axis)) / FOOT
        assert z == pytest.approx([-0.24, 0.0, -0.24], abs=1e-12)


def test_edge_rotation_keeps_the_relative_gradient_with_b_w():
    # about the inside edge, 24 ft rotated (n1 = 2): past reverse crown the outside edge rises
    # against the axis by e x 24 ft over L_r = 0.044 x 24 / 158.4 = 0.6667 % = Delta / b_w
    # (0.50 % / 0.75), the multilane allowance of the runoff equation
    ramps, _ = simple()
    x = ft([1000.0, 1040.0])
    s_out, s_in = sed.edge_slopes(x, *ramps, E, E_NC)
    z_out, _, z_in = sed.edge_elevations(s_out, s_in, ft(W), ft(W), E_NC, sed.INSIDE)
    rel = (z_out - z_in) / FOOT
    assert (rel[1] - rel[0]) / 40.0 == pytest.approx(0.0050 / 0.75)
    assert z_in / FOOT == pytest.approx([-0.24, -0.24])  # the axis stays put


def test_no_superelevation_gives_no_stations():
    k = sed.key_stations(0.0, 100.0, 50.0, 50.0, 0.0, E_NC)
    assert all(np.isnan(float(k[key])) for key in sed.KEY_POINTS)
    assert not bool(k["too_short"])
