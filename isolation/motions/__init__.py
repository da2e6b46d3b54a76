"""Ground motions: response spectra, intensity measures, matched synthetic suites, record files.

Modules
-------
spectrum
    Exact (piecewise-linear) response spectra: :func:`response_spectrum`
    (PSA) and :func:`response_spectra` (SD, PSV, PSA, SA).
measures
    Intensity measures: PGA [g], PGV [m/s], PGD [m], Arias [m/s], Husid,
    D5-95 [s], CAV [m/s].
envelope
    Intensity envelope and typical significant duration from magnitude.
matching
    :func:`matched_suite`: spectrum-compatible synthetic suites.
wavelets
    Optional time-domain wavelet refinement of matched records.
suite
    :class:`MatchedSuite` and its tolerance report :class:`SuiteCheck`.
records_io
    Reading plain-text accelerograms and writing suites.
pair_spectra
    Spectra of component pairs: RotD100, RotDnn by rotation, SRSS, correlation.
pairs
    :func:`matched_pairs`: pairs of orthogonal components matched by the
    code's pair rule; :func:`read_pair` for recorded pairs.
"""

from isolation.motions.envelope import intensity_envelope, typical_significant_duration
from isolation.motions.matching import GOALS, matched_suite
from isolation.motions.measures import (
    IntensityMeasures,
    arias_intensity,
    cumulative_absolute_velocity,
    displacement,
    husid,
    intensity_measures,
    peak_ground_acceleration,
    peak_ground_displacement,
    peak_ground_velocity,
    significant_duration,
    velocity,
)
from isolation.motions.pair_io import RecordedPair, read_pair
from isolation.motions.pair_spectra import component_correlation, rotd100_spectrum, rotd_spectrum, srss_spectrum
from isolation.motions.pair_suite import PAIR_RULES, MatchedPairs, PairCheck
from isolation.motions.pairs import matched_pairs
from isolation.motions.records_io import (
    FORMAT_NAME,
    Accelerogram,
    read_accelerogram,
    read_csv_accelerogram,
    read_suite_records,
    read_text_accelerogram,
    write_suite,
)
from isolation.motions.spectrum import ResponseSpectra, log_periods, response_spectra, response_spectrum
from isolation.motions.suite import (
    BASELINE_TOLERANCE,
    MEAN_RULES,
    RECORD_BAND,
    MatchedSuite,
    RecordCheck,
    SuiteCheck,
)

__all__ = [
    "PAIR_RULES",
    "MatchedPairs",
    "PairCheck",
    "RecordedPair",
    "component_correlation",
    "matched_pairs",
    "read_pair",
    "rotd100_spectrum",
    "rotd_spectrum",
    "srss_spectrum",
    "Accelerogram",
    "BASELINE_TOLERANCE",
    "FORMAT_NAME",
    "GOALS",
    "IntensityMeasures",
    "MEAN_RULES",
    "MatchedSuite",
    "RECORD_BAND",
    "RecordCheck",
    "ResponseSpectra",
    "SuiteCheck",
    "arias_intensity",
    "cumulative_absolute_velocity",
    "displacement",
    "husid",
    "intensity_envelope",
    "intensity_measures",
    "log_periods",
    "matched_suite",
    "peak_ground_acceleration",
    "peak_ground_displacement",
    "peak_ground_velocity",
    "read_accelerogram",
    "read_csv_accelerogram",
    "read_suite_records",
    "read_text_accelerogram",
    "response_spectra",
    "response_spectrum",
    "significant_duration",
    "typical_significant_duration",
    "velocity",
    "write_suite",
]
