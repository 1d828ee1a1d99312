"""Axes about which a road's cross-section is rotated to its superelevation, in the order a
CHOICE input codes them (0 centreline, 1 inside edge, 2 outside edge). Its own module (no
numpy) so the field list can name them without loading the engine.
"""

AXES = ("centreline", "inside", "outside")
