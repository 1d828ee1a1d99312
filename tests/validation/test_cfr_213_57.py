"""49 CFR 213.57, maximum speed on curves: Vmax = sqrt((Ea + Eu) / (0.0007 D)).

Source: 49 CFR 213.57 (Track Safety Standards; 2013 text), the formula read via the FRA
Track Safety Standards Compliance Manual, and Appendix A Table 1 (3 in of unbalance), whose
speeds are rounded to the nearest mph. Rows read (REFERENCES.md): 1 deg 00 min with Ea = 0
gives 65 mph; 2 deg 00 min gives 46, 53, 60, 65, 71, 76, 80 mph at Ea = 0 ... 6 in.
"""

import numpy as np
import pytest

from curvetui.core.rail import check_rail
from curvetui.core.units import FOOT, INCH, MPH
from curvetui.storage.tables import rail_limits


def radius_arc(degree: float) -> float:
    """R = 5729.58 / D ft, the arc definition (read: REFERENCES, degree of curve)."""
    return 5729.5779513 / degree * FOOT


def cfr_max_speed_mph(degree: float, ea_in) -> np.ndarray:
    limits = rail_limits("49cfr213-class3-5")
    ea = np.asarray(ea_in, dtype=float) * INCH
    check = check_rail(limits, speed=30 * MPH, radius=radius_arc(degree), cant=ea)
    return check.max_speed / MPH


def test_table_1_two_degrees():
    # Appendix A Table 1, 2 deg 00 min, Ea 0..6 in (read)
    speeds = cfr_max_speed_mph(2.0, [0, 1, 2, 3, 4, 5, 6])
    assert np.round(speeds).tolist() == [46, 53, 60, 65, 71, 76, 80]


def test_table_1_one_degree_no_elevation():
    assert round(float(cfr_max_speed_mph(1.0, 0.0))) == 65  # Appendix A Table 1 (read)


@pytest.mark.parametrize("degree", [0.5, 1.0, 3.0, 5.5, 10.0])
@pytest.mark.parametrize("ea", [0.0, 2.5, 7.0])
def test_formula_of_213_57(degree, ea):
    # the regulation's own formula, evaluated independently here, and never above the
    # class's speed limit: 90 mph for passenger trains on class 5 (49 CFR 213.9, read)
    expected = min(np.sqrt((ea + 3.0) / (0.0007 * degree)), 90.0)
    assert float(cfr_max_speed_mph(degree, ea)) == pytest.approx(expected, rel=1e-9)


def test_elevation_limits_by_class():
    # 213.57(a): 8 in on classes 1-2, 7 in on classes 3-5 (read, 2013 text)
    for name, cap in (("49cfr213-class1-2", 8.0), ("49cfr213-class3-5", 7.0)):
        limits = rail_limits(name)
        over = check_rail(limits, 40 * MPH, radius_arc(4.0), (cap + 0.5) * INCH)
        within = check_rail(limits, 40 * MPH, radius_arc(4.0), cap * INCH)
        assert over.failed and not within.failed  # 40 mph on 4 deg: E = 4.48 in


def test_unbalance_over_three_inches_fails():
    limits = rail_limits("49cfr213-class3-5")
    # 2 deg, Ea 2 in: Table 1 allows 60 mph (read); 62 mph needs 0.0007*2*62^2 = 5.38 in, Eu 3.38
    assert check_rail(limits, 62 * MPH, radius_arc(2.0), 2 * INCH).failed
    assert not check_rail(limits, 59 * MPH, radius_arc(2.0), 2 * INCH).failed


def test_textbook_us_equilibrium_cant():
    # textbook solution (read, REFERENCES): D 1.75 deg, 60 mph -> E = 0.0007 D V^2 = 4.41 in
    limits = rail_limits("49cfr213-class3-5")
    check = check_rail(limits, 60 * MPH, radius_arc(1.75), 0.0)
    assert float(check.equilibrium_cant) / INCH == pytest.approx(4.41, abs=0.005)
