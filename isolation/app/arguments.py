"""Command-line parsing shared by the commands: a usage error is one line and exit code 2."""

from __future__ import annotations

import argparse
from typing import NoReturn

from isolation.errors import InputError

__all__ = ["OneLineParser"]


class OneLineParser(argparse.ArgumentParser):
    """argparse that reports a usage error as an :class:`~isolation.errors.InputError` (one line naming
    the command, what was wrong and ``--help``), which the commands turn into exit code 2."""

    def error(self, message: str) -> NoReturn:  # noqa: D401 - argparse hook
        raise InputError(f"{self.prog}: {message} (see --help)")
