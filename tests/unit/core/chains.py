"""Chains of PIs for the alignment tests, built here from leg bearings and lengths (plane
trigonometry, independent of the code under test)."""

from __future__ import annotations

import math


def chain(bearings_deg, legs, start=(0.0, 0.0)):
    """Points of a chain from its leg bearings [deg, clockwise from north] and lengths."""
    pts = [start]
    for b, d in zip(bearings_deg, legs, strict=True):
        e, n = pts[-1]
        pts.append((e + d * math.sin(math.radians(b)), n + d * math.cos(math.radians(b))))
    return pts
