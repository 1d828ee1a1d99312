"""One path from a centreline file's features to register rows: each feature projected
to a metric plane (finder.projection), each of its lines searched by the pure finder
(core.curve_finder.find_curves), each curve found a register row (finder.register).

A feature that cannot be projected, or a line the finder reports as unusable (two points,
repeated vertices, zero length), is told in ``feature_notes`` and the rest still run. A
line on which the finder itself raises (a defect) is told in ``finder_failures``, and the
rest still run; the command then ends with exit code 3."""

from __future__ import annotations

import contextlib
from collections import Counter
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field

from curvetui.core.units import UnitSystem
from curvetui.finder.projection import FeatureProblem, PlaneFeature, to_plane
from curvetui.finder.register import SpeedSource, curve_row, feature_speeds
from curvetui.storage.centrelines.model import CentrelineFile


@dataclass
class FinderRun:
    """What the run found: register rows, counts by curve type and relation, curves
    dropped below the minimum deflection, notes per feature, the plane used and the
    largest scale error (k - 1) met, and speed problems."""

    rows: list[dict[str, object]] = field(default_factory=list)
    types: Counter[str] = field(default_factory=Counter)
    relations: Counter[str] = field(default_factory=Counter)
    dropped: int = 0
    searched: int = 0
    not_projected: list[str] = field(default_factory=list)
    feature_notes: list[str] = field(default_factory=list)
    planes: Counter[str] = field(default_factory=Counter)
    scale_error: float = 0.0
    speed_problems: list[str] = field(default_factory=list)
    deflection_over: int = 0  # curves turning by more than batch's 179-degree deflection
    register_notes: list[str] = field(default_factory=list)
    finder_failures: list[str] = field(default_factory=list)  # defects, told and counted


def search_lines(task) -> list:
    """One feature's lines searched: ``task`` is ((x, y) per line, settings); per line a
    FinderResult, or the name of the exception the finder raised (a defect). At module
    level, so a process pool can run it."""
    from curvetui.core.curve_finder import find_curves

    lines, settings = task
    out: list = []
    for x, y in lines:
        try:
            out.append(find_curves(x, y, settings))
        except Exception as exc:  # noqa: BLE001 - one feature's defect; the rest still run
            out.append(type(exc).__name__)
    return out


@contextlib.contextmanager
def _mapper(jobs: int) -> Iterator[Callable]:
    """map() in this process (jobs 1), or a pool of ``jobs`` processes started by a fork
    server (no threads of this process are copied), results in the features' order."""
    if jobs <= 1:
        yield map
        return
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    context = multiprocessing.get_context("forkserver")
    with ProcessPoolExecutor(max_workers=jobs, mp_context=context) as pool:
        yield lambda fn, tasks: pool.map(fn, tasks, chunksize=4)


def find_in_file(
    source: CentrelineFile,
    settings,
    kind: str,
    units: UnitSystem,
    speeds: SpeedSource,
    keep: tuple[str, ...] = (),
    tick: Callable[[int], None] | None = None,
    jobs: int = 1,
) -> FinderRun:
    """Register rows for every curve found in the file's features (see the module);
    ``tick(n)`` is told as features are done; ``jobs`` processes search them."""
    run = FinderRun()
    planes: list[PlaneFeature] = []
    for feature in source.features:
        try:
            planes.append(to_plane(feature))
        except FeatureProblem as exc:
            run.not_projected.append(f"feature {feature.fid}: {exc}")
    tasks = (([(ln.x, ln.y) for ln in p.lines], settings) for p in planes)
    with _mapper(jobs) as mapper:
        results = mapper(search_lines, tasks)
        for done, (plane, found) in enumerate(zip(planes, results, strict=True), start=1):
            _record(plane, found, kind, units, speeds, keep, run)
            if tick is not None:
                tick(done + len(run.not_projected))
    _register_notes(source, keep, run)
    return run


def _record(plane: PlaneFeature, found: list, kind, units, speeds, keep, run: FinderRun):
    """One feature's curves as register rows, its notes and counts."""
    feature = plane.feature
    run.searched += 1
    run.feature_notes.extend(f"feature {feature.fid}: {note}" for note in plane.notes)
    run.planes[plane.plane] += 1
    if abs(plane.scale_error) > abs(run.scale_error):
        run.scale_error = plane.scale_error
    speed, posted = feature_speeds(
        feature.properties, speeds, units, run.speed_problems, feature.fid
    )
    kept = {name: feature.properties.get(name) for name in keep}
    n = 0
    for line, result in zip(plane.lines, found, strict=True):
        if isinstance(result, str):
            run.finder_failures.append(
                f"feature {feature.fid}: not searched: the curve finder failed ({result}); "
                "this is a defect in curvetui, please report it"
            )
            continue
        run.dropped += result.dropped
        run.feature_notes.extend(f"feature {feature.fid}: {note}" for note in result.notes)
        for curve in result.curves:
            n += 1
            row = curve_row(curve, n, feature.fid, kind, line.start_station, units)
            row["speed"] = speed
            if speeds.posted_field:
                row["posted_speed"] = posted
            row.update(kept)
            run.rows.append(row)
            run.types[curve.shape] += 1
            if curve.relation:
                run.relations[curve.relation] += 1
            if float(row["deflection"]) > 179.0:
                run.deflection_over += 1


def _register_notes(source: CentrelineFile, keep: tuple[str, ...], run: FinderRun) -> None:
    """Feature ids read more than once (their curve ids repeat too), kept properties no
    feature has (their columns are blank)."""
    ids = Counter(f.fid for f in source.features)
    repeated = sorted(fid for fid, n in ids.items() if n > 1)
    if repeated:
        shown = ", ".join(repeated[:5]) + (" ..." if len(repeated) > 5 else "")
        run.register_notes.append(
            f"{len(repeated)} feature id(s) occur more than once ({shown}): their curve ids "
            "repeat too; name a unique property with --id-field"
        )
    for name in keep:
        if not any(name in f.properties for f in source.features):
            run.register_notes.append(f"--keep {name}: no feature has it; the column is blank")
