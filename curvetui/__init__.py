"""curvetui: design and check horizontal road bends and railway-track curves."""

__version__ = "0.1.0"

CAUTION = (
    "CAUTION: local road or rail authority standards govern. These results inform a design; "
    "they must be checked by a qualified engineer before use."
)
