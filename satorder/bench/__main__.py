"""Worker entry for benchmark runs in a fresh interpreter: ``python -m satorder.bench TASK``."""

import sys

from satorder.bench.isolate import _subprocess_main

raise SystemExit(_subprocess_main(sys.argv[1]))
