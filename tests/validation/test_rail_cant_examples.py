"""Equilibrium cant and cant deficiency against worked examples and first principles.

Sources: REFERENCES.md (read): E = s v^2/(g R), s = 1500 mm for 1435 mm gauge, so
E = 11.8 V^2/R (derived); a textbook solution with the rounded coefficient 11.9 gives
R 600 m, 80 km/h -> 126.93 mm; an older US Army manual (TR 0671) uses 0.00066 D V^2
(2 deg, 55 mph -> about 4 in).
"""

import math

import mpmath
import numpy as np
import pytest

from curvetui.core import rail
from curvetui.core.units import G0, INCH, KMH, MPH
from curvetui.storage.tables import parse_rail_limits, rail_limits


def test_standard_gauge_coefficient_11_8():
    # E [mm] = 11.8 V^2 / R (derived from s = 1500 mm, g = 9.81): 1500/(9.80665 x 3.6^2) = 11.80
    e = rail.equilibrium_cant(120 * KMH, 1000.0, 1.5) * 1000
    assert e == pytest.approx(11.8 * 120**2 / 1000, rel=2e-3)


def test_textbook_11_9_example():
    # the textbook's 11.9 corresponds to s = 11.9 g 3.6^2 mm; with it, 80 km/h on 600 m gives
    # 126.93 mm (read)
    s = 11.9 * G0 * 3.6**2 / 1000
    assert rail.equilibrium_cant(80 * KMH, 600.0, s) * 1000 == pytest.approx(126.93, abs=0.01)


def test_army_coefficient_0_00066(tmp_path):
    # TR 0671 (read via REFERENCES): 0.00066 D V^2, 2 deg and 55 mph gives 3.99 ~ 4 in
    text = open(rail_limits("49cfr213-class3-5").path, encoding="utf-8").read()
    text = text.replace("cant_coefficient = 0.0007", "cant_coefficient = 0.00066")
    import tomllib

    limits = parse_rail_limits(tomllib.loads(text))
    r = 5729.5779513 / 2.0 * 0.3048
    e = rail.check_rail(limits, 55 * MPH, r, 0.0).equilibrium_cant / INCH
    assert float(e) == pytest.approx(0.00066 * 2 * 55**2, rel=1e-6)
    assert round(float(e)) == 4


def test_hand_worked_120_kmh():
    # The case worked by hand with E = s v^2/(g R), s = 1.5 m (EN 13803 convention):
    # v = 33.333 m/s: E = 1.5 x 1111.1 / (9.80665 x 1000) = 0.16995 m = 169.95 mm
    # D = 169.95 - 100 = 69.95 mm; low 60 km/h: E = 42.49 mm, excess = 57.51 mm
    # a_q = g D / s = 9.80665 x 0.06995 / 1.5 = 0.4573 m/s^2
    limits = rail_limits("en13803-2010")
    c = rail.check_rail(limits, 120 * KMH, 1000.0, 0.100, 60 * KMH)
    assert float(c.equilibrium_cant) * 1000 == pytest.approx(169.95, abs=0.01)
    assert float(c.cant_deficiency) * 1000 == pytest.approx(69.95, abs=0.01)
    assert float(c.cant_excess) * 1000 == pytest.approx(57.51, abs=0.01)
    assert float(c.lateral_acceleration) == pytest.approx(0.4573, abs=1e-4)


def test_first_principles_small_angle():
    # Exact statics: a track tilted by theta balances v^2/R when tan(theta) = v^2/(g R); the
    # cant is then s sin(theta). The standards' linear form E = s v^2/(g R) is its small-angle
    # version; check the two agree to within the second-order term, computed with mpmath.
    mpmath.mp.dps = 30
    for v_kmh, r in ((80, 600), (160, 1500), (300, 5000)):
        v = mpmath.mpf(v_kmh) / mpmath.mpf("3.6")
        t = v**2 / (mpmath.mpf("9.80665") * r)
        exact = 1.5 * mpmath.sin(mpmath.atan(t))
        linear = rail.equilibrium_cant(v_kmh * KMH, r, 1.5)
        assert float(linear) == pytest.approx(float(1.5 * t), rel=1e-12)
        assert abs(float(linear) - float(exact)) <= float(1.5 * t**3) * 0.51


def test_speed_limits_invert_the_cant_formula():
    # v_max = sqrt(g R (Ea + I) / s): by the definition of deficiency, D(v_max) = I exactly
    limits = rail_limits("en13803-2010")
    c = rail.check_rail(limits, 140 * KMH, 1200.0, 0.090, 80 * KMH)
    d_at_vmax = rail.equilibrium_cant(c.max_speed, 1200.0, 1.5) - 0.090
    assert float(d_at_vmax) == pytest.approx(float(c.deficiency_limit), rel=1e-12)
    manual = math.sqrt(G0 * 1200.0 * (0.090 + float(c.deficiency_limit)) / 1.5)
    assert float(c.max_speed) == pytest.approx(manual, rel=1e-12)


def test_no_cant_balances_a_wide_speed_range():
    # 200 km/h and 40 km/h on 1200 m: fast needs >= 11.8 x 200^2/1200 - I = 393 - I mm, which no
    # cant within the maximum reaches, while the slow train allows only ~16 + X mm
    limits = rail_limits("en13803-2010")
    c = rail.check_rail(limits, 200 * KMH, 1200.0, 0.150, 40 * KMH)
    assert c.flags & rail.FAIL_NO_BALANCE
    assert c.failed


def test_balancing_cant_uses_equal_shares_of_the_limits():
    # common practice, no source: (E_fast - Ea)/I = (Ea - E_slow)/X
    limits = rail_limits("en13803-2010")
    c = rail.check_rail(limits, 120 * KMH, 1000.0, 0.100, 60 * KMH)
    i, x = float(c.deficiency_limit), float(c.excess_limit)
    ea = float(c.balancing_cant)
    assert (float(c.equilibrium_cant) - ea) / i == pytest.approx(
        (ea - float(c.equilibrium_cant_low)) / x, rel=1e-9
    )


def test_arrays_match_scalars():
    limits = rail_limits("en13803-2010")
    v = np.array([80.0, 120.0, 160.0, 230.0]) * KMH
    r = np.array([500.0, 1000.0, 1800.0, 4000.0])
    ea = np.array([0.08, 0.1, 0.12, 0.15])
    low = np.array([40.0, 60.0, 80.0, 100.0]) * KMH
    arr = rail.check_rail(limits, v, r, ea, low)
    for k in range(4):
        one = rail.check_rail(limits, v[k], r[k], ea[k], low[k])
        assert float(one.cant_deficiency) == arr.cant_deficiency[k]
        assert int(one.flags) == arr.flags[k]


def test_gauge_presets():
    # 1435 mm -> s = 1500 mm (EN 13803 convention, read); others gauge + head (from memory)
    assert rail.rail_centres_for_gauge(1435) == 1.5
    assert 1.06 < rail.rail_centres_for_gauge(1000) < 1.08
    assert rail.rail_centres_for_gauge(1200) == pytest.approx(1.265)


def test_en13803_file_is_marked_unconfirmed():
    limits = rail_limits("en13803-2010")
    assert "from memory" in limits.source
    assert all("from memory" in s for s in limits.band_sources)
