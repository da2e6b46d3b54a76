"""Code bases: one module per code (ASCE/SEI 7 in `asce7` and `asce7_fixed_base`, EN 1998-1 in `eurocode`)."""
