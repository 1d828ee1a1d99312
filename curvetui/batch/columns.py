"""The columns of a batch file: what is read, and the result columns that are added.

Which result columns a run writes is chosen with ``--columns``: ``all`` (every result the
file's inputs allow, with ``units``, ``table`` and ``limits`` on every row), ``default``
(the headline results of the kinds present, see ``default_results``) or a list of result
names. ``row``, ``status`` and the failure lines are always written: a failed check is
never left out.

Input columns are the bend's fields (``curvetui.bend.fields``, aliases included) plus
``id`` and ``kind``, and a curve register's columns (``REGISTER_FIELDS``: feature, begin
and end station, direction) that place each curve among its neighbours. Result columns
are the record's outputs (``curvetui.bend.outputs``) that do not repeat an input, named as
the JSON keys (``transition.runoff``, ``geometry.tangent``); a result column whose name an
input column already uses is written with the prefix ``check.``.
"""

from __future__ import annotations

from curvetui.bend.fields import REGISTER_FIELDS, column_names
from curvetui.bend.outputs import OUTPUTS, RUNOFF_STATIONS, SPIRAL_OUT, STATIONS
from curvetui.bend.outputs import TEXT as TEXT_OUTPUT

FIELD_OF_COLUMN = column_names()  # column name (lower case) -> field key
REGISTER_COLUMNS = tuple(f.key for f in REGISTER_FIELDS)
INPUTS = ("id", "kind", *FIELD_OF_COLUMN, *REGISTER_COLUMNS)
REQUIRED = ("kind", "speed", "radius")

TEXT, FLOAT, INT = "text", "float", "int"

# (name, type) of every result column, in the order they are written
RESULTS: tuple[tuple[str, str], ...] = (
    ("units", TEXT),
    ("table", TEXT),
    ("limits", TEXT),
    *(
        (o.key, TEXT if o.rounding == TEXT_OUTPUT else FLOAT)
        for o in OUTPUTS
        if not (o.echo or o.working)
    ),
    ("row", INT),
    ("status", TEXT),
    ("messages", TEXT),
)
RESULT_NAMES = tuple(name for name, _ in RESULTS)
assert len(set(RESULT_NAMES)) == len(RESULT_NAMES)

# the FAIL, WARNING and ERROR lines of ``messages``, without the notes; not in ``all``,
# whose ``messages`` holds every line
FINDINGS = "findings"
FINDING_NOTES: frozenset[str] = frozenset()  # codes of notes kept with the findings (none)
ALWAYS = ("row", "status")  # and messages or findings: a failed check is never left out
TYPE_OF = {**dict(RESULTS), FINDINGS: TEXT}

# the headline results, by the kind of bend they belong to (curvetui.bend.outputs kinds);
# the checks' values beside their limits, the advisory speed, signs and crash factor. The
# safe speed is left to ``all``: the inferred design speed is the same solve told as the
# highest table speed met (without the safe speed's "at least the table's top" note)
DEFAULT_ROAD = (
    "side_friction_demand",
    "side_friction_max",
    "min_radius",
    "superelevation",
    "sight.status",
    "crash.curvature_cmf",
    "crash.cmf",
    "advisory.speed",
    "advisory.design_speed_inferred",
    "signs.sign",
    "signs.plaque",
    "signs.chevrons",
    "signs.series",
)
DEFAULT_RAIL = (
    "cant_deficiency",
    "deficiency_limit",
    "cant_excess",
    "excess_limit",
    "max_speed",
    "min_speed",
)
DEFAULT_GEOMETRY = (
    "geometry.type",
    "geometry.tangent",
    "geometry.length",
    "geometry.total_tangent",
    "geometry.total_length",
)
DEFAULT_END = (*ALWAYS, FINDINGS)
# in the default only, what a result needs beyond _NEEDS: a bend's signs only with a posted
# speed (a register's series sign needs the register's columns, as in _NEEDS); the combined
# crash factor only with a measured superelevation (its variance factor needs one: without
# it the curvature factor alone is written)
_DEFAULT_NEEDS = (
    *((f"signs.{k}", "posted_speed") for k in ("sign", "plaque", "chevrons")),
    ("crash.cmf", "superelevation"),
)

# result columns written only when the file has the input they need
_NEEDS = (
    ("geometry.", "deflection"),
    ("sight.", "obstruction_offset"),
    ("crash.", "deflection"),
    ("signs.series", "begin_station"),  # a register: curves in series (batch.series)
    *((f"geometry.{k}", "pi_station") for k in STATIONS),
    *((f"transition.{k}", "deflection") for k in RUNOFF_STATIONS),
    *((f"transition.{k}", "pi_station") for k in RUNOFF_STATIONS),
    *((f"geometry.{k}", "spiral_out") for k in (*SPIRAL_OUT, "spiral_angle_out")),
)


def results_for(input_names: list[str]) -> tuple[tuple[str, str], ...]:
    """The result columns (name, type) a file with these headers gets: geometry only with a
    deflection column, stations only with a PI station, the outgoing spiral's keys only with
    a spiral_out column, sight only with an obstruction offset."""
    given = {FIELD_OF_COLUMN.get(n.strip().lower(), n.strip().lower()) for n in input_names}
    return tuple(
        (name, kind)
        for name, kind in RESULTS
        if not any(name.startswith(prefix) and need not in given for prefix, need in _NEEDS)
    )


def result_names(input_names: list[str]) -> tuple[str, ...]:
    return tuple(name for name, _ in results_for(input_names))


def output_names(input_names: list[str]) -> list[str]:
    """Result column names as written after ``input_names``: ``check.`` before any that an
    input column already uses (compared without case)."""
    taken = {n.strip().lower() for n in input_names}
    return [f"check.{n}" if n in taken else n for n in result_names(input_names)]


ALL, DEFAULT = "all", "default"


class ColumnsError(ValueError):
    """A --columns value that names no result (the message lists the valid names)."""


def parse_columns(text: str | None) -> tuple[str, ...] | str:
    """``all``, ``default`` (also for None or empty) or the tuple of result names of a
    comma-separated list, in its order; ``prefix.*`` stands for every result of a group
    (``geometry.*``). ColumnsError names the unknown ones and lists the valid names."""
    text = (text or "").strip()
    if text.lower() in ("", DEFAULT):
        return DEFAULT
    if text.lower() == ALL:
        return ALL
    valid = (*RESULT_NAMES, FINDINGS)
    names: list[str] = []
    unknown: list[str] = []
    for item in (p.strip() for p in text.split(",")):
        if not item:
            continue
        key = item.lower()
        if key.endswith(".*"):  # expanded by chosen_results to what the file can give
            if any(n.startswith(key[:-1]) for n in valid):
                names.append(key)
            else:
                unknown.append(item)
        elif key in valid:
            names.append(key)
        else:
            unknown.append(item)
    if unknown or not names:
        raise ColumnsError(
            f"--columns: unknown result name{'s' if len(unknown) > 1 else ''} "
            f"{', '.join(repr(u) for u in unknown) or '(none given)'}; use all, default, or a "
            f"comma-separated list of: {', '.join(valid)} (a group as geometry.*)"
        )
    return tuple(dict.fromkeys(names))


def _given(input_names: list[str]) -> set[str]:
    """The field keys (and register columns) a file's headers give."""
    return {FIELD_OF_COLUMN.get(n.strip().lower(), n.strip().lower()) for n in input_names}


def _needs_met(name: str, given: set, needs) -> bool:
    return not any(name.startswith(prefix) and need not in given for prefix, need in needs)


def default_results(input_names: list[str], kinds: frozenset[str]) -> tuple[str, ...]:
    """The default result columns for a file with these headers whose rows are of
    ``kinds`` ("road", "rail"): each kind's headline results, geometry only with a
    deflection (and the other needs of ``results_for``), signs only with a posted speed,
    then row, status and findings."""
    from curvetui.bend.outputs import BY_KEY

    given = _given(input_names)
    allowed = set(result_names(input_names))
    wanted = set()
    if "road" in kinds:
        wanted.update(DEFAULT_ROAD)
    if "rail" in kinds:
        wanted.update(DEFAULT_RAIL)
    wanted.update(DEFAULT_GEOMETRY)
    picked = [
        name
        for name in RESULT_NAMES
        if name in wanted
        and name in allowed
        and _needs_met(name, given, _DEFAULT_NEEDS)
        and any(k in kinds for k in BY_KEY[name].kinds)
    ]
    return (*picked, *DEFAULT_END)


def chosen_results(
    choice: tuple[str, ...] | str, input_names: list[str], kinds: frozenset[str] | None
) -> tuple[str, ...]:
    """The result columns a run writes, in order: ``all`` as ``result_names``; ``default``
    by the kinds present (``kinds`` None: both); a list as given, with row and status
    added when missing, and findings unless messages is listed. A listed result that the
    file's inputs cannot give raises ColumnsError naming the input it needs."""
    if choice == ALL:
        return result_names(input_names)
    if choice == DEFAULT:
        return default_results(input_names, frozenset(("road", "rail")) if kinds is None else kinds)
    available = (*result_names(input_names), FINDINGS)
    allowed = set(available)
    choice = tuple(
        dict.fromkeys(
            name
            for item in choice
            for name in (
                [n for n in available if n.startswith(item[:-1])] if item.endswith(".*") else [item]
            )
        )
    )
    missing = [n for n in choice if n not in allowed]
    if missing:
        given = _given(input_names)
        said = "; ".join(
            f"{n} needs a "
            + " and a ".join(
                dict.fromkeys(need for p, need in _NEEDS if n.startswith(p) and need not in given)
            )
            + " column"
            for n in missing
        )
        raise ColumnsError(f"--columns: the file cannot give {said}")
    names = list(choice)
    names += [n for n in ALWAYS if n not in names]
    if "messages" not in names and FINDINGS not in names:
        names.append(FINDINGS)
    return tuple(names)


def chosen_output_names(input_names: list[str], results: tuple[str, ...]) -> list[str]:
    """Result column names as written after ``input_names`` (``check.`` before a name an
    input column already uses)."""
    taken = {n.strip().lower() for n in input_names}
    return [f"check.{n}" if n in taken else n for n in results]
