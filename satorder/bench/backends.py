"""Back ends and what one run does inside its worker: read the problem, solve it with the back
end, certify the answer with :func:`satorder.pipeline.solve.verify`, and build the row.
"""

from __future__ import annotations

import importlib
import resource
import time

from satorder.errors import CertificateError, InputError
from satorder.model.requirement import INFEASIBLE


# --------------------------------------------------------------------------- back ends
def sat_solver_names() -> dict[str, str]:
    """Every python-sat solver name and alias, mapped to its canonical name."""
    from pysat.solvers import SolverNames

    names = {}
    for canon, aliases in vars(SolverNames).items():
        if not canon.startswith("_") and isinstance(aliases, tuple):
            names[canon] = canon
            for a in aliases:
                names[a] = canon
    return names


def working_backends() -> list[str]:
    """The back-end names that work in this installation: ``forcing`` and every SAT solver the
    engine supports that python-sat can start here (``module:function`` aside)."""
    from satorder.sat.runner import working_solvers

    return ["forcing", *working_solvers()]


def check_backend(name: str) -> str:
    """Validate a back end name before anything runs: ``forcing``, an importable
    ``module:function``, or a SAT solver the engine supports and python-sat can start here.
    Raises :class:`InputError` listing the names that work in this installation."""
    if name == "forcing":
        return name
    if ":" in name:
        module, _, func = name.partition(":")
        try:
            fn = getattr(importlib.import_module(module), func)
        except (ImportError, AttributeError) as exc:
            raise InputError(f"back end {name!r}: cannot import ({exc}); give module:function "
                             "importable on the Python path") from None
        if not callable(fn):
            raise InputError(f"back end {name!r} is not a function")
        return name
    from satorder.sat.runner import resolve_solver

    try:
        canon = resolve_solver(name)
    except InputError:
        canon = None
    if canon not in working_backends():
        raise InputError(f"unknown back end {name!r}; the back ends that work in this "
                         f"installation: {', '.join(working_backends())}, or module:function "
                         "for your own")
    return name


def _call_backend(backend: str, problem, time_limit: float):
    from satorder.pipeline.solve import solve

    if backend == "forcing":
        return solve(problem, engine="forcing", verify_answer=False)
    if ":" in backend:
        module, _, func = backend.partition(":")
        return getattr(importlib.import_module(module), func)(problem, time_limit)
    return solve(problem, engine="sat", solver=backend, time_limit=time_limit,
                 verify_answer=False)


def _side_constraints(problem) -> str:
    kinds = []
    if problem.fixed:
        kinds.append(f"{len(problem.fixed)} fixed arcs")
    if problem.forbidden:
        kinds.append(f"{len(problem.forbidden)} forbidden arcs")
    if problem.prefer:
        kinds.append(f"{len(problem.prefer)} preferences")
    if problem.incomparable is not None:
        kinds.append("an explicit unordered list (open pairs)")
    return ", ".join(kinds)


def _find_stat(stats: dict, *keys):
    for k in keys:
        if isinstance(stats.get(k), int):
            return stats[k]
    for v in stats.values():
        if isinstance(v, dict):
            found = _find_stat(v, *keys)
            if found is not None:
                return found
    return None


# --------------------------------------------------------------------------- one run
def _base_row(task: dict) -> dict:
    row = {"instance": task["instance"], "backend": task["backend"], "status": None,
           "seconds": None, "peak_mb": None, "verified": False, "variables": None,
           "clauses": None}
    row.update(task.get("expected") or {})
    return row


def _peak_mb_self() -> float:
    kb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    return round(kb / 1024.0, 1)  # Linux reports kilobytes


def execute(task: dict) -> dict:
    """Read, solve and check one problem in the current process; always returns a row."""
    from satorder.io.readers import read_problem
    from satorder.pipeline.solve import verify

    row = _base_row(task)
    t_start = time.perf_counter()
    try:
        problem = read_problem(task["path"])
    except InputError as exc:
        row.update(status="error", error=f"cannot read: {exc}", peak_mb=_peak_mb_self())
        return row
    row["item_count"] = problem.n
    row["comparable_pairs"] = problem.num_comparable
    row["read_seconds"] = round(time.perf_counter() - t_start, 6)
    backend = task["backend"]
    if backend == "forcing" and not problem.is_plain:
        row.update(status="skipped", reason="forcing answers plain problems only; this one has "
                   + _side_constraints(problem))
        return row
    remaining = max(0.01, task["timeout"] - (time.perf_counter() - t_start) - 0.05)
    t0 = time.perf_counter()
    try:
        ans = _call_backend(backend, problem, remaining)
    except MemoryError:
        row.update(status="error", error="out of memory", peak_mb=_peak_mb_self())
        return row
    except Exception as exc:  # a back end's failure is a row, not a dead runner
        row.update(status="error", error=_one_line(exc), peak_mb=_peak_mb_self(),
                   seconds=round(time.perf_counter() - t0, 6))
        return row
    row["seconds"] = round(time.perf_counter() - t0, 6)
    row["status"] = str(ans.status)  # rows hold plain JSON values
    stats = ans.stats if isinstance(ans.stats, dict) else {}
    row["variables"] = _find_stat(stats, "variables", "vars", "num_vars")
    row["clauses"] = _find_stat(stats, "clauses", "num_clauses")
    if ans.cost is not None:
        row["cost"] = ans.cost
        row["optimal"] = ans.optimal
    t1 = time.perf_counter()
    try:
        verify(ans)
        # an infeasible verdict is trusted only with a certificate the checks could replay
        row["verified"] = bool(ans.verified) and (
            ans.status != INFEASIBLE or bool(ans.chain) or bool(ans.core))
        if ans.status == INFEASIBLE and not row["verified"]:
            row["note"] = "infeasible without a conflict chain or core to check"
    except CertificateError as exc:
        row["verified"] = False
        row["check_error"] = _one_line(exc)
    row["check_seconds"] = round(time.perf_counter() - t1, 6)
    row["peak_mb"] = _peak_mb_self()
    return row


def _one_line(exc: BaseException) -> str:
    text = f"{type(exc).__name__}: {exc}".strip().splitlines()
    return text[0][:300] if text else type(exc).__name__
