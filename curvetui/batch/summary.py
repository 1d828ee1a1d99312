"""A run's summary: row counts by status, the failures grouped by reason (the first failed
rule, its numbers taken out) with a count and the worst bend of each, the worst failing
bends and the first errors."""

from __future__ import annotations

import csv
import heapq
import io
from dataclasses import dataclass, field

import numpy as np
import pyarrow.compute as pc

from curvetui.batch.chunk import ERROR, FAIL, PASS
from curvetui.batch.header import Header

NOT_UTF8_ROW = -1  # in place of a field count: the row holds bytes that are not UTF-8


def row_cells(text: str | list[str], delimiter: str) -> list[str]:
    """A row not checked as its cells: a raw line (quoted fields may hold line breaks) or
    the cells themselves."""
    if isinstance(text, list):
        return text
    return next(csv.reader(io.StringIO(text), delimiter=delimiter), [])


def bad_row_message(number: int, actual: int, width: int) -> str:
    """Why a row read but not checked is an error row."""
    if actual == NOT_UTF8_ROW:
        return (
            f"ERROR row {number}: not UTF-8 text (each such byte, or a SUB control character, "
            "shown as ?); row not checked; save the file as UTF-8"
        )
    return (
        f"ERROR row {number}: {actual} field{'s' if actual != 1 else ''} where the header "
        f"has {width}; row not checked (a separator or quote out of place?)"
    )


WORST_SHOWN = 10


@dataclass
class Worst:
    """One of the worst bends: its largest demand/limit ratio, row, id, kind, first reason."""

    utilisation: float
    row: int
    id: str
    kind: str
    message: str


@dataclass
class Reason:
    """Failing bends that share their first failed rule: the rule as text with its numbers
    shown as #, how many bends, and the worst of them (largest demand/limit ratio)."""

    rule: str
    count: int
    worst: Worst


# the rule of a failure message: its numbers (with sign, decimals, thousands) as #
NUMBER = r"[-+]?\d[\d.,]*(?:[eE][-+]?\d+)?"


def _merge_reasons(into: dict, other: dict) -> None:
    """Add ``other``'s counts by rule to ``into``, keeping the worst example of each."""
    for rule, (count, example) in other.items():
        if rule in into:
            have, worst = into[rule]
            into[rule] = (have + count, max(worst, example, key=lambda w: (w[0], -w[1])))
        else:
            into[rule] = (count, example)


@dataclass
class Summary:
    """Counts and the worst bends of a run."""

    rows: int = 0
    passed: int = 0
    failed: int = 0
    errors: int = 0
    blank: int = 0  # rows with every cell empty: skipped, not bends
    worst: list[Worst] = field(default_factory=list)
    first_errors: list[Worst] = field(default_factory=list)
    reasons: list[Reason] = field(default_factory=list)  # most bends first
    by_rule: dict = field(default_factory=dict, repr=False)  # rule -> (count, example)
    delimiter: str = ","
    columns: tuple[str, ...] = ()
    results: tuple[str, ...] = ()  # the result columns written (columns.chosen_results)
    units: str = ""  # the unit system's name (the summary names it, not every row)
    output_closed: bool = False  # the output pipe closed early; the rows were still checked
    written_rows: int = 0  # rows checked when it closed (their output may be partial)

    @property
    def exit_code(self) -> int:
        return 0 if self.failed == 0 and self.errors == 0 else 1


@dataclass
class Tally:
    """One chunk's share of the summary: its counts, worst failures and first errors."""

    rows: int = 0
    passed: int = 0
    failed: int = 0
    errors: int = 0
    worst: list[tuple[float, int, str, str, str]] = field(default_factory=list)
    first_errors: list[Worst] = field(default_factory=list)
    by_rule: dict = field(default_factory=dict)  # rule -> (count, (ratio, row, id, kind, text))


def merge(summary: Summary, part: Tally, worst: list) -> None:
    """Add one chunk's tally to the summary; ``worst`` is the heap of the worst failures."""
    summary.rows += part.rows
    summary.passed += part.passed
    summary.failed += part.failed
    summary.errors += part.errors
    for item in part.worst:
        if len(worst) < WORST_SHOWN:
            heapq.heappush(worst, item)
        elif item[0] > worst[0][0]:
            heapq.heapreplace(worst, item)
    room = WORST_SHOWN - len(summary.first_errors)
    summary.first_errors += part.first_errors[: max(room, 0)]
    _merge_reasons(summary.by_rule, part.by_rule)


def finish(summary: Summary, worst: list) -> None:
    """Keep the first errors by row and the worst failures, largest ratio first."""
    summary.first_errors.sort(key=lambda w: w.row)
    del summary.first_errors[WORST_SHOWN:]
    summary.worst = [
        Worst(u, r, i, k, m) for u, r, i, k, m in sorted(worst, key=lambda w: (-w[0], w[1]))
    ][:WORST_SHOWN]
    summary.reasons = [
        Reason(rule, count, Worst(*example))
        for rule, (count, example) in sorted(
            summary.by_rule.items(), key=lambda kv: (-kv[1][0], -kv[1][1][0], kv[1][1][1])
        )
    ]


def tally_rows(part: Tally, result, rows, batch, id_pos) -> None:
    """Count one checked chunk's rows and keep its worst failures and first errors."""
    status = result.status
    part.rows += len(status)
    part.passed += int(np.sum(status == PASS))
    part.failed += int(np.sum(status == FAIL))
    part.errors += int(np.sum(status == ERROR))
    messages = result.columns["messages"]

    def ident(i: int) -> str:
        return "" if id_pos is None else str(batch.column(id_pos)[i].as_py()).strip()

    fails = np.nonzero(status == FAIL)[0]
    if len(fails):
        util = np.nan_to_num(result.utilisation[fails], nan=0.0)
        for i in fails[np.argsort(-util, kind="stable")[:WORST_SHOWN]]:
            text = messages[int(i)].as_py() or ""
            first = next((m for m in text.split("; ") if "FAIL" in m), text)
            part.worst.append(
                (
                    float(np.nan_to_num(result.utilisation[i], nan=0.0)),
                    int(rows[i]),
                    ident(int(i)),
                    "rail" if result.is_rail[i] else "road",
                    first,
                )
            )
    for i in np.nonzero(status == ERROR)[0][:WORST_SHOWN]:
        text = messages[int(i)].as_py() or ""
        part.first_errors.append(Worst(np.nan, int(rows[i]), ident(int(i)), "", text))
    if len(fails):
        _tally_rules(part, result, rows, fails, messages, ident)


def _tally_rules(part: Tally, result, rows, fails, messages, ident) -> None:
    """Count the failing rows by their first failed rule (vectorised), keeping the worst
    row of each rule."""
    texts = messages.take(fails)
    first = pc.struct_field(pc.extract_regex(texts, r"(?P<m>FAIL[^;]*)"), [0])
    rules = pc.replace_substring_regex(first, NUMBER, "#").to_numpy(zero_copy_only=False)
    rules = np.array(["FAIL (no message)" if r is None else r for r in rules], dtype=object)
    util = np.nan_to_num(result.utilisation[fails], nan=0.0)
    names, inverse, counts = np.unique(rules, return_inverse=True, return_counts=True)
    for k, (rule, count) in enumerate(zip(names, counts, strict=True)):
        members = np.nonzero(inverse == k)[0]
        j = int(members[np.argmax(util[members])])  # the first of the worst, by row order
        i = int(fails[j])
        text = first[j].as_py() or ""
        example = (
            float(util[j]),
            int(rows[i]),
            ident(i),
            "rail" if result.is_rail[i] else "road",
            text,
        )
        _merge_reasons(part.by_rule, {str(rule): (int(count), example)})


def tally_bad_rows(part: Tally, bad, header: Header) -> None:
    """Count rows with the wrong number of fields as errors, keeping the first ones."""
    part.rows += len(bad)
    part.errors += len(bad)
    id_pos = header.known.get("id")
    for number, actual, text in bad[:WORST_SHOWN]:
        fields = row_cells(text, header.delimiter)
        ident = fields[id_pos].strip() if id_pos is not None and id_pos < len(fields) else ""
        part.first_errors.append(
            Worst(
                np.nan,
                number,
                ident,
                "",
                bad_row_message(number, actual, len(header.names)),
            )
        )


def tally_error_row(part: Tally, number: int, ident: str, text: str) -> None:
    """Count one row written as an error (a row whose check raised), keeping its message."""
    part.rows += 1
    part.errors += 1
    if len(part.first_errors) < WORST_SHOWN:
        part.first_errors.append(Worst(np.nan, number, ident, "", text))


def add_tally(part: Tally, other: Tally) -> None:
    """Add ``other``'s counts, worst failures and first errors to ``part``."""
    part.rows += other.rows
    part.passed += other.passed
    part.failed += other.failed
    part.errors += other.errors
    part.worst += other.worst
    part.first_errors += other.first_errors[: max(WORST_SHOWN - len(part.first_errors), 0)]
    _merge_reasons(part.by_rule, other.by_rule)
