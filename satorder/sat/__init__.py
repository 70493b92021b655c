"""SAT engines: the compact CNF encoding, python-sat back ends behind one session, cores and
minimal cores, weighted preferences (MaxSAT), enumeration of answers.

May import: :mod:`satorder.graph` (implication classes), :mod:`satorder.model`,
:mod:`satorder.errors`, :mod:`satorder.jit`.  Never a checker (certify) nor the file layer (io):
an engine neither checks its own answers nor touches files.
"""
