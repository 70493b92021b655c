"""Imported once by the benchmark's worker server (multiprocessing ``forkserver``), so that
every run forks with the engines loaded and warmed up (imports done, any just-in-time compiled
kernels compiled) instead of paying for that in each run's time.  A step that fails is skipped:
the runs then report the failure as rows instead of the server going down."""

import importlib

for _name in ("satorder.bench.isolate", "satorder.pipeline.solve", "satorder.io.readers",
              "satorder.sat.engine", "pysat.solvers", "satorder.cli.main"):
    try:
        importlib.import_module(_name)
    except Exception:  # noqa: BLE001
        pass

try:  # one tiny problem through the forcing engine compiles its kernels here, once
    from satorder.model.problem import Problem
    from satorder.pipeline.solve import solve

    solve(Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("c", "d"), ("a", "c")]),
          engine="forcing")
except Exception:  # noqa: BLE001
    pass
