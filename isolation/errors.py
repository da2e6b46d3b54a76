"""The package's small exception hierarchy.

* :class:`InputError` (a ``ValueError``): the user's input is wrong; the
  command line exits with code 2 and prints the one-line message.
* :class:`RunError`: a valid study failed while running (no convergence,
  a notebook cell failed, ...); the command line exits with code 1.
"""


class InputError(ValueError):
    """Bad input: names the field, the value and what is allowed."""


class RunError(RuntimeError):
    """A run with valid input failed; the message says where and why."""
