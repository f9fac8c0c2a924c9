"""``python -m linecalc``: the same command as ``linecalc``."""
import sys

from linecalc.cli import main

sys.exit(main())
