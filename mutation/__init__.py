"""Mutation-testing driver for the numeric core (see mutation/run.py); not part of CI."""
