"""Properties of the rail engine that follow from E = s v^2/(g R) (EN 13803 form; derived in
REFERENCES.md) and the definitions D = E(v) - Ea, X = Ea - E(v_low); checked with hypothesis."""

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

from curvetui.core import rail
from curvetui.core.units import KMH
from curvetui.storage.tables import rail_limits

LIMITS = rail_limits("en13803-2010")
speeds = st.floats(20, 300)
radii = st.floats(150, 20000)
cants = st.floats(0, 0.18)


@given(speeds, speeds, radii, cants)
def test_deficiency_rises_with_speed(v1, v2, r, ea):
    lo, hi = sorted((v1, v2))
    a = rail.check_rail(LIMITS, lo * KMH, r, ea)
    b = rail.check_rail(LIMITS, hi * KMH, r, ea)
    assert float(b.cant_deficiency) >= float(a.cant_deficiency)


@given(speeds, radii, cants, cants)
def test_more_cant_allows_more_speed(v, r, c1, c2):
    lo, hi = sorted((c1, c2))
    a = rail.check_rail(LIMITS, v * KMH, r, lo)
    b = rail.check_rail(LIMITS, v * KMH, r, hi)
    assert float(b.max_speed) >= float(a.max_speed)


@given(speeds, radii, cants)
def test_max_speed_meets_the_limit_of_its_own_band(v, r, ea):
    # issue 13: the maximum speed satisfies the deficiency limit of the band of the speed it
    # returns, and just above it the limit of that speed's band is exceeded (or it is the
    # last band's top speed, beyond which the limits say nothing)
    c = rail.check_rail(LIMITS, v * KMH, r, ea)
    v_max = float(c.max_speed)
    band, _ = LIMITS.band(v_max)
    assert rail.equilibrium_cant(v_max, r, 1.5) - ea <= LIMITS.deficiency_max[band] + 1e-9
    above = v_max * (1 + 1e-6)
    if above < LIMITS.speed_max[-1] and v_max > 0:
        band_above, _ = LIMITS.band(above)
        assert rail.equilibrium_cant(above, r, 1.5) - ea > LIMITS.deficiency_max[band_above]


@given(speeds, radii, cants, st.floats(0, 1))
def test_excess_plus_deficiency_is_the_cant_spread(v, r, ea, frac):
    # D + X = E(v) - E(v_low) whatever the applied cant
    c = rail.check_rail(LIMITS, v * KMH, r, ea, frac * v * KMH)
    spread = float(c.equilibrium_cant - c.equilibrium_cant_low)
    assert np.isclose(float(c.cant_deficiency + c.cant_excess), spread, atol=1e-12)
