"""``python -m isolation``: the command line (see :mod:`isolation.cli`)."""

import sys

from isolation.cli import main

if __name__ == "__main__":
    sys.exit(main())
