"""``satorder make-suite OUTDIR``: generate a folder of problems and its ``manifest.json``.

Either a named recipe (``--recipe small|medium|large|threshold``) or one family over several
sizes and seeds (``--family order --items 20 50 --seeds 1 2 3 --set degree=1.5``).  The same
arguments always produce the same files.
"""

from __future__ import annotations

import json
import shlex

from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn
from rich.table import Table

import satorder.generate as gen
from satorder.cli import options
from satorder.cli.common import UsageError, err, out


def add_parser(sub):
    p = sub.add_parser("make-suite", description=__doc__)
    p.add_argument("outdir", nargs="?", help="folder to write the problems and manifest.json into")
    p.add_argument("--recipe", choices=sorted(gen.RECIPES), help="a named suite")
    p.add_argument("--family", choices=sorted(gen.FAMILIES), help="one family instead")
    p.add_argument("--items", type=int, nargs="+", metavar="N", help="sizes (with --family)")
    options.add_seed(p, extra="with --family")
    p.add_argument("--seeds", type=int, nargs="+", default=None, metavar="S",
                   help="several seeds instead of one (with --family)")
    p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                   help="family parameter, e.g. degree=1.5 or conflict=cycle (repeatable)")
    p.add_argument("--format", choices=["json", "edges"], default="json",
                   help="file format for --family (edge lists only for plain families)")
    p.add_argument("--list", action="store_true", help="list families and recipes, then stop")
    return p


def _param(text: str) -> tuple[str, object]:
    if "=" not in text:
        raise UsageError(f"--set {text!r}: write KEY=VALUE, e.g. degree=1.5")
    key, value = text.split("=", 1)
    try:
        return key.strip(), json.loads(value)
    except ValueError:
        return key.strip(), value


def run(args) -> int:
    if args.list:
        table = Table(title="families")
        table.add_column("family")
        table.add_column("about")
        for name in sorted(gen.FAMILIES):
            table.add_row(name, gen.ABOUT[name])
        out.print(table)
        out.print("recipes: " + ", ".join(f"{k} ({len(v)} problems)"
                                          for k, v in gen.RECIPES.items()))
        return 0
    if not args.outdir:
        raise UsageError("give an output folder (or --list)")
    if bool(args.recipe) == bool(args.family):
        raise UsageError("give exactly one of --recipe NAME or --family NAME")
    if args.recipe:
        specs = gen.RECIPES[args.recipe]
        name = args.recipe
        command = f"satorder make-suite {shlex.quote(args.outdir)} --recipe {args.recipe}"
    else:
        if not args.items:
            raise UsageError("--family needs --items N [N ...]")
        params = dict(_param(t) for t in args.set)
        args.seeds = args.seeds or [args.seed]
        specs = gen.suite_specs(args.family, args.items, args.seeds, args.format, **params)
        if args.format == "edges":
            probe = gen.generate(args.family, min(args.items), args.seeds[0], **params)
            if not probe.is_plain:
                raise UsageError(f"family {args.family} has side constraints; use --format json")
        name = args.family
        command = "satorder make-suite " + " ".join(
            shlex.quote(a) for a in [args.outdir, "--family", args.family, "--items",
                                     *map(str, args.items), "--seeds", *map(str, args.seeds),
                                     *[x for t in args.set for x in ("--set", t)],
                                     "--format", args.format])
    with Progress(TextColumn("{task.description}"), BarColumn(), MofNCompleteColumn(),
                  TimeElapsedColumn(), console=err.real, transient=True) as bar:
        task = bar.add_task(f"generating {name}", total=len(specs))
        manifest = gen.make_suite(args.outdir, specs, name, command,
                                  progress=lambda k, total, f: bar.update(task, completed=k))
    known = sum(1 for e in manifest["instances"] if e["expected_status"])
    out.print(f"wrote {len(manifest['instances'])} problems and manifest.json to {args.outdir} "
              f"({known} with a known status)")
    return 0
