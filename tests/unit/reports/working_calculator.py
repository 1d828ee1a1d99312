"""A checker's calculator for the working's printed lines (tests only).

``redo(text)`` reads a line's substituted text (curvetui.reports.working.text says how it
is written): numbers, + - x * / ^, parentheses, pi, sqrt, max, min, and sin, cos, tan whose
argument ends with "deg" or "rad"; optionally led by "symbol ="; or one comparison
(=, <=, >=, <, >) of two such expressions (then it starts with a number or a parenthesis).
Nothing else parses (``NotArithmetic``).

Each printed number may be rounded: its half unit in the last place is the larger error it
can carry, but never more than six significant figures' (the record's own rounding), so a
short exact constant (2.5, 127) is not loosened. ``Redo.error`` bounds how far the printed
numbers' rounding moves the value (first order, each number moved by its half unit, the
moves added), which is what a tolerance "following the printed significant figures" means.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

TOKEN = re.compile(r"\s*(?:(\d+\.\d+|\d+)|([A-Za-z_]+)|(<=|>=|[-+*/^(),<>=]))")
FUNCTIONS = {"sqrt": "math.sqrt", "max": "max", "min": "min"}
TRIG = {"sin": "math.sin", "cos": "math.cos", "tan": "math.tan"}
COMPARE = ("<=", ">=", "<", ">", "=")
PREFIX = re.compile(r"^\s*(?:1/)?[A-Za-z][\w/]*\s*=(?!=)\s*")


class NotArithmetic(ValueError):
    """The text is not an expression this calculator reads."""


def half_unit(text: str) -> float:
    """Half a unit in the last printed place, at most six significant figures' worth; a
    number with six decimals or trailing zeros (0.000002, 0.500) is held to its decimals:
    the record keeps geometry lengths and stations to six decimals, not figures."""
    value = abs(float(text))
    six = 0.5 * 10 ** (math.floor(math.log10(value)) - 5) if value else 0.0
    if "." not in text:
        return six
    places = 0.5 * 10.0 ** -len(text.split(".")[1])
    held = text.endswith("0") or len(text.split(".")[1]) == 6
    return places if held else min(places, six)


@dataclass
class Redo:
    """A parsed line: ``value`` (or, for a comparison, left minus right) and ``holds``."""

    source: str
    literals: list[float]
    halves: list[float]
    comparison: str | None

    def __post_init__(self):
        self.fn = eval(  # noqa: S307 - code generated from the grammar above only
            f"lambda v: {self.source}", {"math": math, "max": max, "min": min}
        )

    @property
    def value(self) -> float:
        return self.fn(self.literals)

    @property
    def error(self) -> float:
        """How far the printed numbers' rounding can move ``value`` (first order)."""
        base, total = self.value, 0.0
        for i, h in enumerate(self.halves):
            if h == 0:
                continue
            moved = []
            for sign in (1, -1):
                v = list(self.literals)
                v[i] += sign * h
                try:
                    moved.append(abs(self.fn(v) - base))
                except (ValueError, ZeroDivisionError):
                    moved.append(math.inf)
            total += max(moved)
        return total

    @property
    def holds(self) -> bool:
        """For a comparison: true within the printed numbers' rounding."""
        d, slack = self.value, self.error + 1e-12
        return {
            "<=": d <= slack,
            "<": d < slack,
            ">=": d >= -slack,
            ">": d > -slack,
            "=": abs(d) <= slack,
        }[self.comparison]


def redo(text: str) -> Redo:
    """Parse a substituted text (see module docstring) into a Redo."""
    body = PREFIX.sub("", text, count=1)
    tokens, pos = [], 0
    body = body.rstrip()
    while pos < len(body):
        m = TOKEN.match(body, pos)
        if not m or m.end() == pos:
            raise NotArithmetic(f"cannot read {body[pos:]!r} in {text!r}")
        tokens.append(m.group(1) or m.group(2) or m.group(3))
        pos = m.end()
    p = _Parser(tokens, text)
    left = p.sum()
    comparison = None
    if p.peek() in COMPARE:
        comparison = p.take()
        left = f"({left}) - ({p.sum()})"
    if p.peek() is not None:
        raise NotArithmetic(f"unexpected {p.peek()!r} in {text!r}")
    return Redo(left, p.literals, p.halves, comparison)


class _Parser:
    def __init__(self, tokens: list[str], text: str):
        self.tokens, self.i, self.text = tokens, 0, text
        self.literals: list[float] = []
        self.halves: list[float] = []

    def peek(self):
        return self.tokens[self.i] if self.i < len(self.tokens) else None

    def take(self, want: str | None = None) -> str:
        tok = self.peek()
        if tok is None or (want is not None and tok != want):
            raise NotArithmetic(f"expected {want or 'more'} in {self.text!r}")
        self.i += 1
        return tok

    def sum(self) -> str:
        out = self.product()
        while self.peek() in ("+", "-"):
            out = f"{out} {self.take()} {self.product()}"
        return f"({out})"

    def product(self) -> str:
        out = self.unary()
        while self.peek() in ("*", "x", "/"):
            op = "/" if self.take() == "/" else "*"
            out = f"({out} {op} {self.unary()})"
        return out

    def unary(self) -> str:
        if self.peek() == "-":
            self.take()
            return f"(-{self.unary()})"
        base = self.atom()
        if self.peek() == "^":
            self.take()
            return f"({base} ** {self.unary()})"
        return base

    def atom(self) -> str:
        tok = self.take()
        if re.fullmatch(r"\d+(\.\d+)?", tok):
            self.literals.append(float(tok))
            self.halves.append(half_unit(tok))
            return f"v[{len(self.literals) - 1}]"
        if tok == "pi":
            return "math.pi"
        if tok == "(":
            inner = self.sum()
            self.take(")")
            return inner
        if tok in TRIG:
            self.take("(")
            arg = self.sum()
            unit = self.take()
            if unit not in ("deg", "rad"):
                raise NotArithmetic(f"{tok}() needs its unit, deg or rad, in {self.text!r}")
            self.take(")")
            return f"{TRIG[tok]}(math.radians({arg}))" if unit == "deg" else f"{TRIG[tok]}({arg})"
        if tok in FUNCTIONS:
            self.take("(")
            args = [self.sum()]
            while self.peek() == ",":
                self.take()
                args.append(self.sum())
            self.take(")")
            if tok == "sqrt" and len(args) != 1:
                raise NotArithmetic(f"sqrt takes one argument in {self.text!r}")
            return f"{FUNCTIONS[tok]}({', '.join(args)})"
        raise NotArithmetic(f"unexpected {tok!r} in {self.text!r}")


ANSWER = re.compile(r"^\s*(-?\d+(?:\.\d+)?)")


def answer(result: str) -> tuple[float, float]:
    """The answer a result text starts with, and half a unit in its last printed place
    (six significant figures' worth for a whole number: the record's rounding)."""
    m = ANSWER.match(result)
    if not m:
        raise AssertionError(f"the result does not start with its answer: {result!r}")
    text = m.group(1)
    value = float(text)
    if "." in text:
        return value, 0.5 * 10.0 ** -len(text.split(".")[1])
    return value, half_unit(text.lstrip("-"))
