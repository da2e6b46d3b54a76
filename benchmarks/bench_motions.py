"""Benchmark of isolation.motions: matched suite and response spectra.

Case (issue 3): a suite of 11 motions, 40 s at dt 0.005 s, matched at 80
control periods (0.05-6 s) to an invented site spectrum, on one process.
Target: <= 3 s for the whole suite on one core.

Reference run in the same process: the response spectrum of the same 11
records at the same periods by a plain loop over scipy.signal.lsim
(interp=True, the exact first-order-hold solution), against
isolation.motions.response_spectrum (lfilter recurrence).

Run: ``python -m benchmarks.bench_motions`` or ``python benchmarks/bench_motions.py``.
"""

from __future__ import annotations

import os
import sys
import time
from pathlib import Path

import numpy as np

if __package__ in (None, ""):
    sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import eqsig.sdof  # noqa: E402
from scipy.signal import lsim  # noqa: E402

from isolation import GRAVITY  # noqa: E402
from isolation.motions import matched_suite, response_spectrum  # noqa: E402
from isolation.site.spectra import CodeSpectrum  # noqa: E402


def _lsim_spectrum(records: np.ndarray, dt: float, periods: np.ndarray, damping: float) -> np.ndarray:
    """PSA by a naive loop over records and periods with scipy.signal.lsim (reference)."""
    time_axis = np.arange(records.shape[1]) * dt
    result = np.empty((records.shape[0], periods.size))
    for j, period in enumerate(periods):
        omega = 2 * np.pi / period
        system = ([[0.0, 1.0], [-(omega**2), -2 * damping * omega]], [[0.0], [-1.0]], [[1.0, 0.0]], [[0.0]])
        for i, record in enumerate(records):
            _, output, _ = lsim(system, record, time_axis, interp=True)
            result[i, j] = omega**2 * np.abs(output).max()
    return result


def main() -> int:
    spectrum = CodeSpectrum(sms=1.5, sm1=0.9)  # invented high-seismicity site [g]
    matched_suite(spectrum, count=1, duration=10.0, dt=0.01, period_range=(0.1, 2.0), significant_duration=3.0,
                  progress=False)  # warm-up

    start, cpu_start = time.perf_counter(), time.process_time()
    suite = matched_suite(spectrum, count=11, duration=40.0, dt=0.005, seed=0, isolated_period=(2.8, 3.6),
                          progress=False)
    matching_time = time.perf_counter() - start
    matching_cpu = time.process_time() - cpu_start
    report = suite.check()

    start = time.perf_counter()
    ours = response_spectrum(suite.acceleration, suite.dt, suite.periods, suite.damping)
    spectrum_time = time.perf_counter() - start
    start = time.perf_counter()
    _, _, eqsig_psa = eqsig.sdof.pseudo_response_spectra(
        suite.acceleration[0] * GRAVITY, suite.dt, suite.periods, suite.damping
    )
    eqsig_time = (time.perf_counter() - start) * suite.count  # one record timed, 11 extrapolated
    subset = suite.periods[:: suite.periods.size // 8]
    start = time.perf_counter()
    reference = _lsim_spectrum(suite.acceleration[:2], suite.dt, subset, suite.damping)
    lsim_time = (time.perf_counter() - start) * (suite.count / 2) * (suite.periods.size / subset.size)
    columns = np.searchsorted(suite.periods, subset)

    ratios = suite.ratios
    print("isolation.motions benchmark (11 records, 40 s, dt 0.005 s, "
          f"{suite.periods.size} control periods {suite.periods[0]:.3g}-{suite.periods[-1]:.3g} s)")
    print(f"  matched suite:           {matching_time:7.3f} s wall, {matching_cpu:7.3f} s CPU"
          f"   (target <= 3 s on one core; load average {os.getloadavg()[0]:.1f})")
    print(f"  iterations kept:         {list(suite.iterations)}")
    print(f"  worst per-record misfit: {suite.worst_misfit:7.3%} of goal ({suite.goal:.2f} x target)")
    print(f"  record/target ratios:    {ratios.min():.3f} .. {ratios.max():.3f} (band 0.90 .. 1.30)")
    print(f"  suite mean (asce7):      lowest {report.lowest_mean_ratio:.3f} over "
          f"{report.check_range[0]:.2f}-{report.check_range[1]:.2f} s (>= 1.10); all checks passed: {report.passed}")
    print(f"  response spectrum of the suite: {spectrum_time:6.3f} s")
    print(f"    vs eqsig.sdof.pseudo_response_spectra: {eqsig_time:7.3f} s (1 record timed x 11)"
          f" -> ratio {eqsig_time / spectrum_time:6.1f}x")
    print(f"    vs scipy.signal.lsim loop:             {lsim_time:7.3f} s (2 records x {subset.size} periods timed,"
          f" extrapolated) -> ratio {lsim_time / spectrum_time:6.1f}x")
    print(f"    max relative difference to lsim: {np.abs(ours[:2, columns] / reference - 1).max():.2e},"
          f" to eqsig: {np.abs(ours[0] * GRAVITY / eqsig_psa - 1)[suite.periods >= 6 * suite.dt].max():.2e}")
    print(f"  whole matched suite / one lsim spectrum pass of the suite: {matching_time / lsim_time:.3f}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
