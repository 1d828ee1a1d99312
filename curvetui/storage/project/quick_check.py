"""A quick check of a project document against the shipped JSON Schema, without jsonschema.

Importing jsonschema costs about 40-60 ms of CPU, as much as a fifth of what a minimal
Textual app takes to start (benchmarks/app_startup.py), and the app opened every project
through it before its first frame. ``conforms`` walks the schema's own keywords (those of
JSON Schema 2020-12 that the shipped schema uses, with jsonschema's meaning of each) and
says True only when the document certainly conforms. A problem, or anything it does not
judge (another keyword, a reference outside the schema, a number that is not finite, a
constant that is not a string, number, true, false or null) makes it False, and the caller
then runs the full validation (jsonschema), which names every problem. So a document it
passes is one jsonschema passes too (tests/unit/storage/test_quick_check.py compares the
two on generated documents); saving still validates with jsonschema.
"""

from __future__ import annotations

import math
import re
from typing import Any

# what each "type" name admits (jsonschema's type checker for 2020-12: bool is no number)
TYPES = {
    "object": lambda v: isinstance(v, dict),
    "array": lambda v: isinstance(v, list),
    "string": lambda v: isinstance(v, str),
    "boolean": lambda v: isinstance(v, bool),
    "null": lambda v: v is None,
    "number": lambda v: isinstance(v, int | float) and not isinstance(v, bool),
    "integer": lambda v: (
        (isinstance(v, int) and not isinstance(v, bool))
        or (isinstance(v, float) and v.is_integer())
    ),
}
# keywords that only annotate (or hold definitions reached through $ref)
ANNOTATIONS = frozenset({"$schema", "$id", "$comment", "$defs", "title", "description"})

Verdict = bool | None  # True conforms, False does not, None: not judged here


def conforms(document: Any, schema: dict) -> bool:
    """True only when ``document`` certainly conforms to ``schema``."""
    return check(document, schema, schema) is True


def check(value: Any, schema: Any, root: dict) -> Verdict:
    """Whether ``value`` conforms to ``schema`` (a part of ``root``): True, False, or None
    when it cannot tell."""
    if schema is True or schema is False:
        return schema
    if not isinstance(schema, dict):
        return None
    if isinstance(value, float) and not math.isfinite(value):
        return None  # infinity and NaN compare oddly; the full validation judges them
    verdicts = []
    for keyword, rule in schema.items():
        if keyword in ANNOTATIONS or keyword in ("then", "else"):
            continue  # then and else are judged with "if"
        judge = KEYWORDS.get(keyword)
        verdicts.append(None if judge is None else judge(value, rule, schema, root))
    if False in verdicts:
        return False  # keywords all apply (each one failing fails the whole)
    return None if None in verdicts else True


def _all(verdicts) -> Verdict:
    seen: Verdict = True
    for verdict in verdicts:
        if verdict is False:
            return False
        if verdict is None:
            seen = None
    return seen


def _type(value, rule, schema, root) -> Verdict:
    names = [rule] if isinstance(rule, str) else rule
    if not isinstance(names, list) or any(n not in TYPES for n in names):
        return None
    return any(TYPES[n](value) for n in names)


def _is_number(value) -> bool:
    return TYPES["number"](value)


def _bound(compare):
    def judge(value, rule, schema, root) -> Verdict:
        if not _is_number(rule) or not math.isfinite(rule):
            return None
        return compare(value, rule) if _is_number(value) else True

    return judge


def _length(compare):
    def judge(value, rule, schema, root) -> Verdict:
        if not isinstance(rule, int) or isinstance(rule, bool):
            return None
        return compare(len(value), rule) if isinstance(value, str) else True

    return judge


def _pattern(value, rule, schema, root) -> Verdict:
    if not isinstance(rule, str):
        return None
    return bool(re.search(rule, value)) if isinstance(value, str) else True  # as jsonschema


def _equal(value, constant) -> Verdict:
    """JSON equality (jsonschema's ``equal``) for a scalar constant."""
    if isinstance(constant, str) or isinstance(value, str):
        return value == constant
    if isinstance(constant, bool) or constant is None:
        return value is constant
    if _is_number(constant):
        return _is_number(value) and value == constant
    return None


def _const(value, rule, schema, root) -> Verdict:
    return _equal(value, rule)


def _enum(value, rule, schema, root) -> Verdict:
    if not isinstance(rule, list):
        return None
    verdicts = [_equal(value, each) for each in rule]
    if True in verdicts:
        return True
    return None if None in verdicts else False


def _properties(value, rule, schema, root) -> Verdict:
    if not isinstance(rule, dict):
        return None
    if not isinstance(value, dict):
        return True
    return _all(check(value[k], sub, root) for k, sub in rule.items() if k in value)


def _required(value, rule, schema, root) -> Verdict:
    if not isinstance(rule, list):
        return None
    return all(k in value for k in rule) if isinstance(value, dict) else True


def _additional(value, rule, schema, root) -> Verdict:
    if not isinstance(value, dict):
        return True
    if "patternProperties" in schema:
        return None
    known = schema.get("properties", {})
    if not isinstance(known, dict):
        return None
    return _all(check(value[k], rule, root) for k in value if k not in known)


def _items(value, rule, schema, root) -> Verdict:
    if "prefixItems" in schema:
        return None
    return _all(check(each, rule, root) for each in value) if isinstance(value, list) else True


def _ref(value, rule, schema, root) -> Verdict:
    if not isinstance(rule, str) or not rule.startswith("#/$defs/"):
        return None
    target = root.get("$defs", {}).get(rule.removeprefix("#/$defs/"))
    return None if target is None else check(value, target, root)


def _all_of(value, rule, schema, root) -> Verdict:
    return _all(check(value, sub, root) for sub in rule) if isinstance(rule, list) else None


def _if(value, rule, schema, root) -> Verdict:
    verdict = check(value, rule, root)
    if verdict is None:
        return None
    branch = schema.get("then" if verdict else "else", True)
    return check(value, branch, root)


KEYWORDS = {
    "type": _type,
    "minimum": _bound(lambda v, r: v >= r),
    "maximum": _bound(lambda v, r: v <= r),
    "exclusiveMinimum": _bound(lambda v, r: v > r),
    "exclusiveMaximum": _bound(lambda v, r: v < r),
    "minLength": _length(lambda n, r: n >= r),
    "maxLength": _length(lambda n, r: n <= r),
    "pattern": _pattern,
    "const": _const,
    "enum": _enum,
    "properties": _properties,
    "required": _required,
    "additionalProperties": _additional,
    "items": _items,
    "$ref": _ref,
    "allOf": _all_of,
    "if": _if,
}
