"""Options of `check road` and `check rail`, made from the field list, and their shared run."""

from __future__ import annotations

import argparse

from curvetui.bend.fields import fields_for


def add_field_options(p: argparse.ArgumentParser, kind: str, keys: tuple = ()) -> None:
    """One option per input of ``kind`` (``curvetui.bend.fields``), or only ``keys``: its
    help says the unit and what a blank means; required inputs are required options."""
    groups = {}
    for f in fields_for(kind):
        if keys and f.key not in keys:
            continue
        unit = {
            "speed": "km/h or mph",
            "length": "m or ft",
            "station": "m or ft",
            "cant": "mm, or in with --units us",
        }.get(f.unit, "")
        bits = [f.help] + ([f"({unit})"] if unit else [])
        if f.default:
            bits.append(f"[default: {f.default}]")
        target = (
            p
            if f.key
            in (
                "speed",
                "radius",
                "cant",
                "low_speed",
                "gauge",
                "traffic",
                "superelevation",
                "emax",
                "friction",
            )
            else groups.setdefault("geometry", p.add_argument_group("geometry and sight"))
        )
        target.add_argument(
            f.cli_option,
            dest=f.key,
            required=kind in f.required and not keys,
            help=" ".join(bits),
        )


def run_check(args: argparse.Namespace, kind: str, evaluate, printer) -> int:
    """Shared body of `check road` and `check rail`: evaluate, print, exit 1 on a failure."""
    from curvetui.cli.common import print_json

    record = evaluate(raw_inputs(args, kind))
    if args.json:
        print_json(record)
    else:
        printer(record)
    return 1 if record["status"] == "fail" else 0


def raw_inputs(args: argparse.Namespace, kind: str | tuple) -> dict:
    """The options given, under the field list's input names."""
    keys = [f.key for f in fields_for(kind)] if isinstance(kind, str) else kind
    return {k: getattr(args, k) for k in keys if getattr(args, k, None) is not None}
