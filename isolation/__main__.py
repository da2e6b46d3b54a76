"""``python -m isolation``: the command line (see :mod:`isolation.app.cli`)."""

import sys

from isolation.app.cli import main

if __name__ == "__main__":
    sys.exit(main())
