"""Graph engines for plain problems: Γ forcing and implication classes, transitive orientation,
modular decomposition, minimal obstructions, and their compiled kernels.

May import: :mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.  Never a
checker (certify), the file layer (io) or the SAT engines.
"""
