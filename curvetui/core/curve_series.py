"""Curves in series along a feature: which curve carries a Reverse or Winding Road sign.

Pure and vectorised (numpy), with a streaming form for files of any length.

Two consecutive curves of one feature are *joined* when the tangent between them, the
next curve's begin station less this curve's end station, is shorter than the sign
table's limit (MUTCD 2009: two changes of direction separated by less than 600 ft of
tangent; REFERENCES.md "Existing curves", read, secondary). A run of joined curves is a
*series*; its first curve carries the series' sign and the later ones are ``IN_SERIES``:

* one curve (no joined neighbour): ``SINGLE``, its own Turn or Curve sign;
* two curves turning opposite ways: ``REVERSE`` on the first (Reverse Turn or Reverse
  Curve, MUTCD 2009 2C.07, from memory);
* three or more curves: ``WINDING`` on the first (Winding Road, MUTCD 2009 2C.07, from
  memory: "three or more changes of direction"; every curve is a change of direction,
  so the directions are not compared);
* two curves turning the same way: ``SAME_DIRECTION`` on both, each keeping its own sign.
  The Reverse sign shows opposite turns; the manual names no sign for a same-direction
  pair (from memory), so this is the project's choice, no source.

A curve whose begin station is after its end station (``ENDS_BEFORE_BEGIN``), or that
begins before the previous curve of its feature ends (``OUT_OF_ORDER``: the rows are not
in station order), is reported, not used: it joins no series. A curve without stations or
direction is ``NOT_PLACED`` and joins none either. A change of feature ends a series.

A curve's place depends on the two rows after it and the three before it, so the
streaming form (``SeriesScanner``) holds back the last two rows of each chunk until more
rows come or the input ends, and keeps three rows before them.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

SINGLE, REVERSE, SAME_DIRECTION, WINDING, IN_SERIES = 0, 1, 2, 3, 4
NOT_PLACED, OUT_OF_ORDER, ENDS_BEFORE_BEGIN = 5, 6, 7
PLACE_NAMES = (
    "single",
    "reverse",
    "same direction",
    "winding",
    "in series",
    "not placed",
    "out of order",
    "ends before it begins",
)
# added to a place by a caller that follows features over the whole input: the curve's
# feature came earlier, other features between (the register is not grouped by feature)
FEATURE_AGAIN = 16
LEFT, RIGHT = 0, 1  # the register's words "left", "right" (curvetui.bend.fields)
WINDING_MIN = 3  # curves: "three or more changes of direction" (MUTCD 2009 2C.07, memory)
LOOKAHEAD = 2  # rows after a curve that can change its place
LOOKBEHIND = 3  # rows before it that can (whether the one before starts its series)
# stations converted from feet differ from the limit converted from feet by rounding: a
# tangent within a micrometre of the limit counts as at the limit, and a curve beginning
# within a micrometre before the previous one's end as beginning at it (numerical, no source)
TOLERANCE = 1e-6  # m


def series_places(
    feature: ArrayLike, begin: ArrayLike, end: ArrayLike, direction: ArrayLike, limit: float
) -> NDArray[np.int8]:
    """Each curve's place in its series (``SINGLE`` ... ``ENDS_BEFORE_BEGIN``).

    Parameters
    ----------
    feature : array
        The feature of each curve; equal neighbours are the same feature (any dtype).
    begin, end : array of float
        Begin and end stations [m] along the feature (NaN: not given).
    direction : array of float
        ``LEFT`` (0) or ``RIGHT`` (1); NaN or anything else: not given.
    limit : float
        Tangent length [m]: curves closer than this are joined (strictly less, less
        ``TOLERANCE``).

    Returns
    -------
    int8 array of the codes above, one per row, in the rows' order.

    Examples
    --------
    A left and a right curve 100 m apart, then a third 500 m on (limit 182.88 m = 600 ft):

    >>> series_places([1, 1, 1], [0, 150, 750], [50, 250, 800], [0, 1, 0], 182.88).tolist()
    [1, 4, 0]
    """
    b = np.asarray(begin, dtype=float)
    e = np.asarray(end, dtype=float)
    d = np.asarray(direction, dtype=float)
    f = np.asarray(feature)
    n = len(b)
    out = np.full(n, NOT_PLACED, np.int8)
    if n == 0:
        return out
    with np.errstate(invalid="ignore"):
        known = np.isfinite(b) & np.isfinite(e) & ((d == LEFT) | (d == RIGHT))
        backwards = known & (e < b - TOLERANCE)
        ok = known & ~backwards
        same = np.asarray(f[1:] == f[:-1], dtype=bool)
        tangent = b[1:] - e[:-1]
        disorder = ok[:-1] & ok[1:] & same & (tangent < -TOLERANCE)
        placed = ok.copy()
        placed[1:] &= ~disorder
        link = placed[:-1] & placed[1:] & same & (tangent < limit - TOLERANCE)
    linked_before = np.concatenate(([False], link))  # joined to the previous row
    group = np.cumsum(~linked_before) - 1
    size = np.bincount(group)[group]
    opposite = np.concatenate((d[1:] != d[:-1], [False]))  # turns against the next row
    first = placed & ~linked_before
    out[first & (size == 1)] = SINGLE
    out[first & (size >= WINDING_MIN)] = WINDING
    pair = first & (size == 2)
    out[pair & opposite] = REVERSE
    out[pair & ~opposite] = SAME_DIRECTION
    later = placed & linked_before
    out[later] = IN_SERIES
    second_of_same = later & (size == 2) & ~np.concatenate(([False], opposite[:-1]))
    out[second_of_same] = SAME_DIRECTION
    out[backwards] = ENDS_BEFORE_BEGIN
    out[1:][disorder] = OUT_OF_ORDER
    return out


class SeriesScanner:
    """``series_places`` fed chunk after chunk, with the same answer as one call on all rows.

    ``push`` takes the next rows and returns the places of the rows now settled, in order
    (it holds back the last ``LOOKAHEAD`` rows, whose places depend on rows not yet read);
    ``finish`` returns the places of the rows held back. ``feature`` values are compared
    with the previous chunk's last one, so chunk by chunk they must be comparable (the
    batch passes run numbers: equal neighbours, equal numbers).
    """

    def __init__(self, limit: float):
        self.limit = float(limit)
        self._rows: tuple[np.ndarray, ...] | None = None  # the rows kept: context + held
        self._emitted = 0  # how many of the kept rows have had their places returned

    @property
    def held(self) -> int:
        """Rows pushed whose places are not returned yet."""
        return 0 if self._rows is None else len(self._rows[0]) - self._emitted

    def push(
        self, feature: ArrayLike, begin: ArrayLike, end: ArrayLike, direction: ArrayLike
    ) -> NDArray[np.int8]:
        new = (
            np.asarray(feature),
            np.asarray(begin, dtype=float),
            np.asarray(end, dtype=float),
            np.asarray(direction, dtype=float),
        )
        if self._rows is None:
            rows = new
        else:
            rows = tuple(
                np.concatenate((old, add)) for old, add in zip(self._rows, new, strict=True)
            )
        places = series_places(*rows, self.limit)
        settled = max(self._emitted, len(places) - LOOKAHEAD)
        out = places[self._emitted : settled]
        keep_from = max(0, settled - LOOKBEHIND)  # settled rows kept as context
        self._rows = tuple(a[keep_from:] for a in rows)
        self._emitted = settled - keep_from
        return out

    def finish(self) -> NDArray[np.int8]:
        """The places of the rows still held (the input has ended)."""
        if self._rows is None:
            return np.zeros(0, np.int8)
        out = series_places(*self._rows, self.limit)[self._emitted :]
        self._rows, self._emitted = None, 0
        return out
