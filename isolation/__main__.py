"""``python -m isolation``: the command line (see :mod:`isolation.app.cli`)."""

from isolation.app.cli import run

if __name__ == "__main__":
    run()
