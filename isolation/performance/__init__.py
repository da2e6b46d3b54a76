"""Fixed-base comparison: code-designed storey strengths (`strength`), damage-state medians (`damage`) and the
yielding comparison (`comparison`)."""
