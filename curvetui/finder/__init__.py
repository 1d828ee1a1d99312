"""The curve finder's faces on files: centreline features projected to a metric plane,
the pure finder (curvetui.core.curve_finder) run on each, and the register it gives."""
