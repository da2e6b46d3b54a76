"""Benchmarks: `make bench` (or `python -m benchmarks [name ...]`) runs them.

Each module ``bench_<name>.py`` has a ``main()`` that measures one target of an
issue and prints the figures with a ratio against a reference run made in the
same process, so the numbers compare across machines.
"""
