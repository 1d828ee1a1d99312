"""Kinds of train traffic, in the order a CHOICE input codes them (0 passenger, 1 freight):
49 CFR 213.9 sets each track class's top speed by traffic. Its own module (no numpy) so the
field list can name it without loading the engine.
"""

TRAFFIC = ("passenger", "freight")
