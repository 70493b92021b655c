"""``satorder bench DIR... --backend NAME ... --out FILE.jsonl``: run suites on back ends.

One JSON row per (instance, back end), appended as each run ends; rerun the same command to
finish an interrupted run (rows already in the file are skipped).  Exit status 1 when back ends
disagree, an answer fails its check or a verdict contradicts a suite's manifest.
"""

from __future__ import annotations

import os

from rich.panel import Panel
from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn
from rich.table import Table

import satorder.bench as bench
from satorder.cli.common import (
    UsageError,
    add_report_option,
    check_output_path,
    check_report_path,
    command_line,
    err,
    out,
    write_report,
)


def add_parser(sub):
    p = sub.add_parser("bench", help="run suites of problems on several back ends",
                       description=__doc__)
    p.add_argument("dirs", nargs="+", metavar="DIR",
                   help="suite folders (with manifest.json) or problem files")
    p.add_argument("--backend", nargs="+", action="extend", metavar="NAME",
                   help="forcing, a python-sat solver (cadical195, glucose4, minisat22, ...) or "
                        "module:function; repeatable (default: forcing)")
    p.add_argument("--timeout", type=float, default=60.0, metavar="S",
                   help="seconds per run before its worker is killed (default 60)")
    p.add_argument("--jobs", type=int, default=1, metavar="N",
                   help="runs at the same time (default 1: timings undisturbed)")
    p.add_argument("--out", required=True, metavar="FILE.jsonl",
                   help="rows are appended here; an existing file is resumed")
    p.add_argument("--plot", metavar="FILE.png",
                   help="cactus plot and scaling plot of every row of this benchmark")
    p.add_argument("--cluster", metavar="ADDRESS",
                   help="send the runs to a Dask distributed scheduler (e.g. tcp://host:8786)")
    add_report_option(p)
    return p


def run(args) -> int:
    if args.timeout <= 0:
        raise UsageError(f"--timeout must be positive, got {args.timeout}")
    if args.jobs < 1:
        raise UsageError(f"--jobs must be at least 1, got {args.jobs}")
    backends = list(dict.fromkeys(args.backend or ["forcing"]))
    for b in backends:
        bench.check_backend(b)
    instances = bench.discover(args.dirs)
    check_output_path(args.out, *[path for _, path, _ in instances])
    if args.plot:
        check_output_path(args.plot, *[path for _, path, _ in instances])
    check_report_path(args.report, *[path for _, path, _ in instances])
    old = bench.read_rows(args.out)
    todo = bench.plan(instances, backends, ((r["instance"], r["backend"]) for r in old))
    wanted = {(key, b) for key, _, _ in instances for b in backends}
    rows = [r for r in old if (r["instance"], r["backend"]) in wanted]
    if rows:
        err.print(f"{args.out}: {len(rows)} runs already done, {len(todo)} to go", markup=False)
    writer = bench.RowWriter(args.out)
    try:
        _run_all(args, todo, rows, writer)
    except KeyboardInterrupt:
        err.print(f"satorder: interrupted; {len(rows)} complete rows in {args.out} — rerun the "
                  "same command to finish", markup=False)
        return 130
    finally:
        writer.close()
    return _report(args, rows, backends)


def _run_all(args, todo, rows, writer) -> None:
    if not todo:
        return
    columns = (TextColumn("{task.description}"), BarColumn(), MofNCompleteColumn(),
               TimeElapsedColumn(), TextColumn("{task.fields[last]}", style="dim"))
    with Progress(*columns, console=err, transient=False) as bar:
        where = f"on {args.cluster}" if args.cluster else f"{args.jobs} at a time"
        task = bar.add_task(f"bench ({where})", total=len(todo), last="")

        def on_row(row):
            writer.write(row)
            rows.append(row)
            bar.update(task, advance=1, last=f"{os.path.basename(row['instance'])} "
                       f"{row['backend']} {row['status']}")

        if args.cluster:
            bench.run_cluster(todo, args.timeout, args.cluster, on_row)
        else:
            bench.run_local(todo, args.timeout, args.jobs, on_row)


def _fmt(x) -> str:
    return "—" if x is None else f"{x:.3f}"


def _report(args, rows, backends) -> int:
    summary = bench.summarize(rows)
    table = Table(title=f"{len({r['instance'] for r in rows})} instances, "
                        f"timeout {args.timeout:g} s")
    for col in ("back end", "runs", "solved", "timeouts", "failed", "skipped",
                "median s", "total s"):
        table.add_column(col, justify="left" if col == "back end" else "right",
                         no_wrap=col == "back end")
    for b in backends:
        s = summary.get(b)
        if s is None:
            continue
        table.add_row(b, str(s["runs"]), str(s["solved"]), str(s["timeouts"]),
                      str(s["failed"]), str(s["skipped"]), _fmt(s["median_seconds"]),
                      _fmt(s["total_seconds"]))
    out.print(table)
    out.print("median over solved runs; total over all runs, a timeout counting its full limit",
              style="dim")
    failed = [r for r in rows if r.get("status") in bench.FAILED]
    for r in failed[:10]:
        err.print(f"{r['instance']} {r['backend']}: {r['status']}: {r.get('error', '')}",
                  markup=False)
    if len(failed) > 10:
        err.print(f"... and {len(failed) - 10} more failed runs (see {args.out})", markup=False)
    if args.plot:
        bench.plot(rows, args.plot)
        out.print(f"plots written to {args.plot}")
    unverified = bench.find_unverified(rows)
    for msg in unverified[:10]:
        err.print(f"unverified: {msg}", markup=False, style="yellow")
    problems = bench.find_problems(rows)
    if args.report:
        from satorder.render.report_pages import bench_report

        write_report(args.report, bench_report(
            rows, backends, summary, bench.cactus_series(rows), problems, unverified,
            args.timeout, args.dirs, command_line(args)))
    if problems:
        body = "\n".join(problems[:40])
        if len(problems) > 40:
            body += f"\n... and {len(problems) - 40} more"
        err.print(Panel(body, title=f"{len(problems)} DISAGREEMENTS / FAILED CHECKS",
                        border_style="bold red"))
        return 1
    return 0
