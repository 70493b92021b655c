"""``satorder cnf FILE``: the problem's hard requirements as DIMACS CNF, for any SAT solver.

Comment lines name every literal (``c 17 kiln<loom``: literal 17 is true exactly when kiln comes
before loom) so a model from another solver can be read back; pairs without a literal stay
unordered.  With ``--selectors`` every requirement gets its own selector variable
(``c selector 57 comparable kiln loom``) switched on by a unit clause at the end: delete that
unit to drop the requirement, or hand the selectors to a core or MaxSAT tool.
"""

from __future__ import annotations

import sys

from satorder.cli import options
from satorder.cli.common import check_output_path, err, load
from satorder.io.files import atomic_write
from satorder.sat.encoding import Encoding


def add_parser(sub):
    p = sub.add_parser("cnf", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_out(p, "the CNF, instead of standard output")
    p.add_argument("--selectors", action="store_true",
                   help="give each requirement its own selector variable (no class merging)")
    return p


def cnf_text(problem, selectors: bool = False) -> str:
    """DIMACS text of the complete (eager) encoding of ``problem``, with a progress bar on
    standard error while the transitivity clauses are written."""
    from rich.progress import Progress

    enc = Encoding(problem, selectors=selectors, lazy=True)
    with Progress(console=err.real, transient=True) as bar:
        task = bar.add_task("transitivity clauses", total=problem.n)
        enc.add_all_transitivity(progress=lambda done, total: bar.update(task, completed=done))
    return enc.to_dimacs()


def run(args) -> int:
    check_output_path(args.out, args.file)
    problem = load(args.file)
    text = cnf_text(problem, selectors=args.selectors)
    if args.out:
        atomic_write(args.out, text)
    else:
        sys.stdout.write(text)
        sys.stdout.flush()
    return 0
