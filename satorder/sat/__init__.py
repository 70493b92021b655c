"""SAT engines: the compact CNF encoding, the one solver runner (every python-sat call, with its
deadline and Ctrl-C, goes through :mod:`satorder.sat.runner`), a session with the lazy
transitivity loop, cores and minimal cores, weighted preferences (MaxSAT), enumeration of
answers.

May import: :mod:`satorder.graph` (implication classes), :mod:`satorder.model`,
:mod:`satorder.errors`, :mod:`satorder.jit`.  Never a checker (certify) nor the file layer (io):
an engine neither checks its own answers nor touches files.
"""
