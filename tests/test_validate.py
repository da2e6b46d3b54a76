"""Input checks name the field, the value and what is allowed (project rule)."""

import math

import numpy as np
import pytest

from isolation import validate


@pytest.mark.parametrize("value", [0.0, -1.0, math.nan, math.inf, "abc", None, True])
def test_positive_rejects(value):
    with pytest.raises(ValueError) as err:
        validate.positive("radius", value, "m")
    message = str(err.value)
    assert "radius" in message and "> 0" in message and "[m]" in message


def test_in_range_message_states_interval():
    with pytest.raises(ValueError, match=r"friction = 0\.5 .*\[0\.01, 0\.3\]"):
        validate.in_range("friction", 0.5, 0.01, 0.3)
    assert validate.in_range("friction", 0.06, 0.01, 0.3) == 0.06


def test_arrays_report_first_bad_index():
    with pytest.raises(ValueError, match=r"masses\[2\]"):
        validate.positive_array("masses", [1.0, 2.0, -3.0], "t")
    with pytest.raises(ValueError, match=r"record\[1\]"):
        validate.finite_array("record", np.array([0.0, np.nan]))


def test_one_of_lists_choices():
    with pytest.raises(ValueError, match="'asce7', 'eurocode'"):
        validate.one_of("rule", "nz", ["asce7", "eurocode"])
