"""The quick schema check of project files (curvetui.storage.project.quick_check) against
jsonschema, the reference implementation of JSON Schema 2020-12 the project validates with.

The check must pass only documents jsonschema passes: here both judge the bundled demo
project (an invented scenario) and documents made from it by generated edits (values of
every JSON type put anywhere in it, keys removed, keys added), and a few schemas written
for the keywords one by one, each with jsonschema's verdict beside it. No engineering value
is checked here.
"""

from __future__ import annotations

import copy
import json
import math
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from jsonschema import Draft202012Validator

from curvetui.storage.project.files import ProjectError, load_project, project_schema, validate
from curvetui.storage.project.quick_check import check, conforms

ROOT = Path(__file__).resolve().parents[3]
DEMO = json.loads((ROOT / "projects" / "quillmere-valley-road.json").read_text("utf-8"))
SCHEMA = project_schema()
REFERENCE = Draft202012Validator(SCHEMA)

scalars = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(min_value=-(10**30), max_value=10**30),
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0, 1, 2, 0.5, 1.0, 2.0, 179.0, 179.5, 400, 400.0001, 1e-9, -1e-9]),
    st.text(max_size=5),
    st.sampled_from(["", "road", "rail", "metric", "us", "2026-12-02", "x" * 41, "x" * 201]),
)
json_values = st.recursive(
    scalars,
    lambda inner: st.one_of(
        st.lists(inner, max_size=3), st.dictionaries(st.text(max_size=4), inner, max_size=3)
    ),
    max_leaves=6,
)


def paths(doc, here=()):
    """Every path (keys and indexes) inside a document, its root first."""
    yield here
    if isinstance(doc, dict):
        for k, v in doc.items():
            yield from paths(v, (*here, k))
    elif isinstance(doc, list):
        for i, v in enumerate(doc):
            yield from paths(v, (*here, i))


def at(doc, path):
    for part in path:
        doc = doc[part]
    return doc


@st.composite
def edited_demos(draw):
    doc = copy.deepcopy(DEMO)
    for _ in range(draw(st.integers(1, 3))):
        where = draw(st.sampled_from(list(paths(doc))))
        what = draw(st.sampled_from(["replace", "remove", "add"]))
        if where == ():
            continue
        parent, key = at(doc, where[:-1]), where[-1]
        if what == "replace":
            parent[key] = draw(json_values)
        elif what == "remove":
            del parent[key]
        elif isinstance(parent, dict):
            parent[draw(st.sampled_from(["extra", "speed", "cant", "notes", "kind"]))] = draw(
                json_values
            )
    return doc


def test_the_demo_conforms_as_jsonschema_says():
    assert not list(REFERENCE.iter_errors(DEMO))
    assert conforms(DEMO, SCHEMA)


@settings(max_examples=150, deadline=None)  # 1,000 agreed when run by hand (see the commit)
@given(doc=edited_demos())
def test_passes_only_what_jsonschema_passes(doc):
    reference_ok = not list(REFERENCE.iter_errors(doc))
    verdict = check(doc, SCHEMA, SCHEMA)
    if verdict is True:
        assert reference_ok
    if verdict is False:
        assert not reference_ok
    # the project's validation gives the same problems, quick or not
    assert validate(doc, quick=True) == validate(doc)


@settings(max_examples=100, deadline=None)
@given(
    speed=st.floats(1.0, 400.0),
    radius=st.integers(1, 328084),
    kind=st.sampled_from(["road", "rail"]),
    notes=st.text(max_size=30),
)
def test_valid_edits_are_passed_quickly(speed, radius, kind, notes):
    # the quick check is of use only if it passes valid documents itself
    doc = copy.deepcopy(DEMO)
    bend = doc["bends"][0]
    bend.update(kind=kind, notes=notes)
    bend["inputs"].update(speed=speed, radius=radius, cant=50)
    assert not list(REFERENCE.iter_errors(doc))
    assert conforms(doc, SCHEMA)


# (schema, instance, jsonschema's verdict), one keyword at a time
CASES = [
    ({"type": "integer"}, 2.0, True),
    ({"type": "integer"}, 2.5, False),
    ({"type": "number"}, True, False),
    ({"type": ["number", "null"]}, None, True),
    ({"minimum": 1}, 1, True),
    ({"minimum": 1}, 0.999, False),
    ({"minimum": 1}, "text", True),
    ({"exclusiveMinimum": 0}, 0, False),
    ({"maximum": 179}, 179.0, True),
    ({"maxLength": 2}, "abc", False),
    ({"minLength": 1}, "", False),
    ({"pattern": "^[0-9]{4}$"}, "2026", True),
    ({"pattern": "^[0-9]{4}$"}, "26", False),
    ({"const": 2}, 2.0, True),
    ({"const": 2}, True, False),
    ({"const": "rail"}, "road", False),
    ({"enum": ["road", "rail"]}, "rail", True),
    ({"enum": ["road", "rail"]}, 1, False),
    ({"required": ["a"]}, {"b": 1}, False),
    ({"additionalProperties": False, "properties": {"a": {}}}, {"a": 1, "b": 2}, False),
    ({"items": {"type": "string"}}, ["a", 1], False),
    ({"allOf": [{"type": "object"}, {"required": ["a"]}]}, {"a": 1}, True),
    ({"if": {"const": 1}, "then": {"type": "integer"}, "else": False}, 2, False),
    ({"if": {"const": 1}, "then": {"type": "integer"}}, 1, True),
]


@pytest.mark.parametrize(("schema", "instance", "expected"), CASES)
def test_each_keyword_as_jsonschema_judges_it(schema, instance, expected):
    assert Draft202012Validator(schema).is_valid(instance) is expected  # the reference
    assert check(instance, schema, schema) is expected


@pytest.mark.parametrize(
    "schema",
    [{"minProperties": 1}, {"$ref": "other.json"}, {"const": [1]}, {"prefixItems": []}],
)
def test_what_it_does_not_judge_goes_to_jsonschema(schema):
    assert check({"a": 1}, schema, schema) is None
    assert not conforms({"a": 1}, schema)


def test_infinity_goes_to_jsonschema():
    assert check(float("inf"), {"type": "number"}, {}) is None


def test_a_bad_file_still_gets_jsonschemas_messages(tmp_path):
    doc = copy.deepcopy(DEMO)
    doc["bends"][0]["inputs"]["speed"] = 900
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(doc), encoding="utf-8")
    with pytest.raises(ProjectError) as caught:
        load_project(path)
    assert any("$.bends[0].inputs.speed" in p for p in caught.value.problems)


BEND_SCHEMA = {"$defs": SCHEMA["$defs"], "$ref": "#/$defs/bend"}
BEND_REFERENCE = Draft202012Validator(BEND_SCHEMA)


@settings(max_examples=200, deadline=None)
@given(
    key=st.sampled_from(["speed", "radius", "cant", "deflection", "pi_station", "traffic"]),
    value=json_values,
    kind=st.sampled_from(["road", "rail", "tram"]),
)
def test_one_bend_as_the_app_checks_it_while_typing(key, value, kind):
    # app/storable.py: the fields the file cannot store are marked as they are typed
    bend = copy.deepcopy(DEMO["bends"][0])
    bend["kind"] = kind
    bend["inputs"][key] = value
    verdict = check(bend, BEND_SCHEMA, BEND_SCHEMA)
    assert verdict is not None or not math.isfinite(value if _number(value) else 0.0)
    assert verdict is (not list(BEND_REFERENCE.iter_errors(bend))) or verdict is None


def _number(value) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def test_the_app_marks_a_field_the_file_cannot_store():
    from curvetui.app.storable import file_problems
    from curvetui.storage.project.model import Bend

    good = Bend(id="QV-09", kind="road", inputs={"speed": 80, "radius": 250})
    assert file_problems(good) == {}
    bad = Bend(id="QV-09", kind="road", inputs={"speed": 500, "radius": 250})
    assert list(file_problems(bad)) == ["speed"]
    words = "speed: the project file takes a number from 1 to 400, got 500"
    assert file_problems(bad)["speed"] == words
