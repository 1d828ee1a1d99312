"""Well-known text (OGC Simple Features, ISO 19125-1, clause 7) for line geometry:
LINESTRING and MULTILINESTRING, with or without Z, M or ZM (those values dropped), EMPTY,
and the ``SRID=n;`` prefix of extended WKT. Other types are recognised by name only, so a
point or polygon is skipped and counted, not an error."""

from __future__ import annotations

import re

import numpy as np

LINE_WORDS = ("LINESTRING", "MULTILINESTRING")
OTHER_WORDS = (
    "POINT", "MULTIPOINT", "POLYGON", "MULTIPOLYGON", "GEOMETRYCOLLECTION", "CIRCULARSTRING",
    "COMPOUNDCURVE", "CURVEPOLYGON", "MULTICURVE", "MULTISURFACE", "TRIANGLE", "TIN",
    "POLYHEDRALSURFACE",
)  # fmt: skip
_HEAD = re.compile(r"\s*(?:SRID\s*=\s*(\d+)\s*;)?\s*([A-Za-z]+)\s*(ZM|Z|M)?\s*", re.I)
_TOKEN = re.compile(r"\(|\)|,|[^\s(),]+")


class WktError(ValueError):
    """Text that is not line WKT; the message says where."""


def parse_wkt(text: str) -> tuple[str, list[np.ndarray], int | None]:
    """(type word, parts as (n, 2) arrays, SRID or None). A non-line type gives no parts."""
    head = _HEAD.match(text)
    if head is None or not head.group(2):
        raise WktError("does not start with a geometry type such as LINESTRING")
    srid = int(head.group(1)) if head.group(1) else None
    word = head.group(2).upper()
    if word in OTHER_WORDS:
        return word, [], srid
    if word not in LINE_WORDS:
        raise WktError(f"unknown geometry type {word[:30]!r}")
    dims = {None: 2, "Z": 3, "M": 3, "ZM": 4}[(head.group(3) or "").upper() or None]
    tokens = _TOKEN.findall(text[head.end() :])
    if [t.upper() for t in tokens] == ["EMPTY"]:
        return word, [], srid
    pos, tree = _nested(tokens, 0)
    if pos != len(tokens):
        raise WktError("text after the closing parenthesis")
    if word == "LINESTRING":
        return word, [_positions(tree, dims, "LINESTRING")], srid
    parts = []
    for i, member in enumerate(tree):
        if member == "EMPTY":
            continue
        if not isinstance(member, list) or not member or not isinstance(member[0], list):
            raise WktError(f"MULTILINESTRING member {i + 1}: not a parenthesised list")
        parts.append(_positions(member, dims, f"MULTILINESTRING member {i + 1}"))
    return word, parts, srid


def _nested(tokens: list[str], pos: int) -> tuple[int, list]:
    """A parenthesised list from tokens[pos]: members separated by commas, each a nested
    list, the word EMPTY, or a position (a run of numbers as text)."""
    if pos >= len(tokens) or tokens[pos] != "(":
        raise WktError("expected '('")
    pos += 1
    members: list = []
    while True:
        if pos < len(tokens) and tokens[pos] == "(":
            pos, inner = _nested(tokens, pos)
            members.append(inner)
        elif pos < len(tokens) and tokens[pos].upper() == "EMPTY":
            members.append("EMPTY")
            pos += 1
        else:
            run = []
            while pos < len(tokens) and tokens[pos] not in ("(", ")", ","):
                run.append(tokens[pos])
                pos += 1
            if not run:
                raise WktError("expected a position or '('")
            members.append(run)
        if pos >= len(tokens):
            raise WktError("a '(' is not closed")
        if tokens[pos] == ")":
            return pos + 1, members
        if tokens[pos] != ",":
            raise WktError(f"expected ',' or ')', got {tokens[pos][:20]!r}")
        pos += 1


def _positions(members: list, dims: int, what: str) -> np.ndarray:
    rows = []
    for i, member in enumerate(members):
        if not isinstance(member, list) or any(isinstance(m, list) for m in member):
            raise WktError(f"{what}, position {i + 1}: not a run of numbers")
        if len(member) not in (dims, 3 if dims == 2 else dims):  # x y z without the Z word
            raise WktError(f"{what}, position {i + 1}: {len(member)} numbers, {dims} expected")
        try:
            x, y = float(member[0]), float(member[1])
        except ValueError:
            raise WktError(f"{what}, position {i + 1}: not a number") from None
        rows.append((x, y))
    return np.array(rows, dtype=float).reshape(-1, 2)
