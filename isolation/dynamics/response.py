"""Results of response-history analysis: histories, peaks, suite statistics, JSON and NPZ.

Shapes: ``records`` motions, ``steps`` time samples, ``storeys`` storeys of
the superstructure (floor i sits on top of storey i).
"""

from __future__ import annotations

import io
import json
from dataclasses import dataclass, field, fields
from pathlib import Path
from typing import Any

import numpy as np

from isolation.dynamics.oscillator import response_spectrum
from isolation.files import write_bytes_atomic

__all__ = ["HistoryResult", "suite_statistics"]

_ARRAYS = ("ground_acceleration", "floor_acceleration", "floor_displacement", "drift",
           "storey_shear", "base_shear", "balance_error", "heights", "isolator_displacement",
           "isolator_force", "damper_force", "base_acceleration", "floor_velocity", "isolator_velocity",
           "reaction", "yield_shears", "yield_drifts")


@dataclass(frozen=True)
class HistoryResult:
    """Response histories of one case (fixed base or one isolator property set) over a suite.

    Attributes
    ----------
    case : str
        Case name ("fixed", "lower", "nominal", "upper", ...).
    dt : float
        Time step of the histories. [s]
    ground_acceleration : ndarray (records, steps)
        Input motion. [g]
    floor_acceleration : ndarray (records, steps, storeys)
        Absolute acceleration of floors 1..N. [g]
    floor_displacement : ndarray (records, steps, storeys)
        Floor displacement relative to the ground. [m]
    drift : ndarray (records, steps, storeys)
        Storey drift (floor minus the level below; the base for storey 1). [m]
    storey_shear : ndarray (records, steps, storeys)
        Force in each storey's lateral spring: its elastic or hysteretic
        force, without damping forces and without the P-delta term (for a
        rigid superstructure, -sum of the floor inertia forces above). [kN]
    base_shear : ndarray (records, steps)
        Storey-spring shear of the first storey, ``storey_shear[..., 0]``:
        in an isolated building the storey just above the isolators. [kN]
    energy : dict of str -> ndarray (records, steps)
        "input", "kinetic", "viscous", "elastic_strain", "hysteretic". [kN m]
    balance_error : ndarray (records,)
        Largest energy-balance residual over the largest input energy. [-]
    heights : ndarray (storeys,)
        Storey heights. [m]
    isolator_displacement, isolator_force, damper_force, base_acceleration : ndarray (records, steps) or None
        Isolation-layer displacement [m], isolator force [kN], damper force
        [kN] and absolute base-mass acceleration [g]; None for a fixed base.
    model : dict
        Plain description of the building analysed.
    floor_velocity : ndarray (records, steps, storeys) or None
        Floor velocity relative to the ground. [m/s]
    isolator_velocity : ndarray (records, steps) or None
        Isolation-layer (base) velocity relative to the ground; None for a fixed base. [m/s]
    reaction : ndarray (records, steps) or None
        Total horizontal force on the foundation, damping forces included:
        -sum of mass x absolute acceleration over every mass (isolated:
        equal to isolator plus damper force). [kN]
    yield_shears : ndarray (storeys,) or None
        Storey strengths of a yielding model; None when elastic. [kN]
    yield_drifts : ndarray (storeys,) or None
        Storey yield drifts V_y/k; None when elastic. [m]
    notes : tuple of str
        P-delta notes: storeys whose tangent stiffness approaches zero or
        whose drift passed the zero of their resistance.
    """

    case: str
    dt: float
    ground_acceleration: np.ndarray
    floor_acceleration: np.ndarray
    floor_displacement: np.ndarray
    drift: np.ndarray
    storey_shear: np.ndarray
    base_shear: np.ndarray
    energy: dict
    balance_error: np.ndarray
    heights: np.ndarray
    isolator_displacement: np.ndarray | None = None
    isolator_force: np.ndarray | None = None
    damper_force: np.ndarray | None = None
    base_acceleration: np.ndarray | None = None
    model: dict = field(default_factory=dict)
    floor_velocity: np.ndarray | None = None
    isolator_velocity: np.ndarray | None = None
    reaction: np.ndarray | None = None
    yield_shears: np.ndarray | None = None
    yield_drifts: np.ndarray | None = None
    notes: tuple = ()

    # --- derived quantities ----------------------------------------------------
    @property
    def isolated(self) -> bool:
        """True when the case has an isolation layer."""
        return self.isolator_displacement is not None

    @property
    def time(self) -> np.ndarray:
        """Sample times. [s]"""
        return np.arange(self.ground_acceleration.shape[-1]) * self.dt

    @property
    def drift_ratio(self) -> np.ndarray:
        """Drift over storey height (records, steps, storeys). [-]"""
        return self.drift / self.heights

    @property
    def yielding(self) -> bool:
        """True when the storeys carry a hysteretic law (storey strengths known)."""
        return self.yield_shears is not None

    @property
    def roof_acceleration(self) -> np.ndarray:
        """Absolute roof acceleration (records, steps). [g]"""
        return self.floor_acceleration[..., -1]

    @property
    def ductility(self) -> np.ndarray:
        """Storey ductility demand, peak |drift| over the yield drift V_y/k (records, storeys). [-]

        NaN for elastic storeys (no strength given).
        """
        peak = np.max(np.abs(self.drift), axis=1)
        if self.yield_drifts is None:
            return np.full(peak.shape, np.nan)
        return peak / np.asarray(self.yield_drifts)

    @property
    def residual_drift(self) -> np.ndarray:
        """|Drift| at the end of each record over storey height (records, storeys). [-, ratio]

        Measured at the last sample: pad records with zeros when free
        vibration should decay first.
        """
        return np.abs(self.drift[:, -1, :]) / self.heights

    @property
    def shear_strength_ratio(self) -> np.ndarray:
        """Peak |storey_shear| over the storey strength (records, storeys); NaN when elastic. [-]"""
        peak = np.max(np.abs(self.storey_shear), axis=1)
        if self.yield_shears is None:
            return np.full(peak.shape, np.nan)
        return peak / np.asarray(self.yield_shears)

    def peaks(self) -> dict:
        """Peak absolute values per record: name -> array (records,) or (records, storeys).

        Yielding models add "ductility", "residual_drift_ratio" and
        "shear_strength_ratio"; every model has "reaction" when known.
        """
        out = {
            "floor_acceleration": np.max(np.abs(self.floor_acceleration), axis=1),
            "drift": np.max(np.abs(self.drift), axis=1),
            "drift_ratio": np.max(np.abs(self.drift_ratio), axis=1),
            "storey_shear": np.max(np.abs(self.storey_shear), axis=1),
            "base_shear": np.max(np.abs(self.base_shear), axis=1),
        }
        if self.reaction is not None:
            out["reaction"] = np.max(np.abs(self.reaction), axis=1)
        if self.yielding:
            out["ductility"] = self.ductility
            out["residual_drift_ratio"] = self.residual_drift
            out["shear_strength_ratio"] = self.shear_strength_ratio
        if self.isolator_displacement is not None:  # isolated
            assert self.isolator_force is not None  # written with the isolator displacement
            out["isolator_displacement"] = np.max(np.abs(self.isolator_displacement), axis=1)
            out["residual_displacement"] = np.abs(self.isolator_displacement[:, -1])
            out["isolator_force"] = np.max(np.abs(self.isolator_force), axis=1)
        return out

    @property
    def peak_isolator_displacement(self) -> np.ndarray | None:
        """Peak |isolator displacement| per record (records,). [m]"""
        return self.peaks()["isolator_displacement"] if self.isolated else None

    @property
    def residual_displacement(self) -> np.ndarray | None:
        """|Isolator displacement| at the end of each record (records,). [m]"""
        u = self.isolator_displacement
        return np.abs(u[:, -1]) if u is not None else None

    def statistics(self) -> dict:
        """Suite statistics of the peaks: name -> {"per_record", "mean", "max"} (plain lists/floats)."""
        out = {}
        for name, values in self.peaks().items():
            out[name] = {
                "per_record": values.tolist(),
                "mean": np.mean(values, axis=0).tolist(),
                "max": np.max(values, axis=0).tolist(),
            }
        return out

    def floor_spectra(self, periods, damping: float = 0.05) -> np.ndarray:
        """Floor response spectra: peak absolute acceleration of oscillators on each floor.

        Parameters
        ----------
        periods : array (periods,)
            Oscillator periods, > 0. [s]
        damping : float, optional
            Oscillator damping ratio. Default 0.05. [-]

        Returns
        -------
        ndarray (records, storeys, periods)
            Absolute spectral acceleration. [g]
        """
        floors = np.moveaxis(self.floor_acceleration, 1, -1)
        return response_spectrum(floors, self.dt, periods, damping)

    # --- serialisation -----------------------------------------------------------
    def to_dict(self, histories: bool = False) -> dict:
        """Plain-JSON summary: case, model, peaks and statistics; all histories when asked.

        Parameters
        ----------
        histories : bool, optional
            Also include every history as nested lists (large: records x
            steps values per quantity). [-]
        """
        out = {
            "case": self.case,
            "dt": self.dt,
            "records": int(self.ground_acceleration.shape[0]),
            "steps": int(self.ground_acceleration.shape[1]),
            "isolated": self.isolated,
            "model": self.model,
            "balance_error": self.balance_error.tolist(),
            "statistics": self.statistics(),
            "final_energy": {k: v[:, -1].tolist() for k, v in self.energy.items()},
            "notes": list(self.notes),
        }
        if histories:
            out["histories"] = {name: getattr(self, name).tolist() for name in _ARRAYS
                                if getattr(self, name) is not None}
            out["histories"]["energy"] = {k: v.tolist() for k, v in self.energy.items()}
        return out

    def save_npz(self, path) -> Path:
        """Write every array and the case description into one compressed NPZ file.

        Parameters
        ----------
        path : str or Path
            File to write; written under a temporary name first and renamed,
            so no half-written file is left behind. [-]
        """
        path = Path(path)
        arrays = {name: getattr(self, name) for name in _ARRAYS if getattr(self, name) is not None}
        arrays.update({f"energy_{k}": v for k, v in self.energy.items()})
        meta = {"case": self.case, "dt": self.dt, "model": self.model, "notes": list(self.notes)}
        buffer = io.BytesIO()
        np.savez_compressed(buffer, meta=np.array(json.dumps(meta)), **arrays)
        return write_bytes_atomic(path, buffer.getvalue())

    @classmethod
    def load_npz(cls, path) -> "HistoryResult":
        """Read a file written by :meth:`save_npz`.

        Parameters
        ----------
        path : str or Path
            NPZ file. [-]
        """
        with np.load(Path(path), allow_pickle=False) as data:
            meta = json.loads(str(data["meta"]))
            energy = {k[len("energy_"):]: data[k] for k in data.files if k.startswith("energy_")}
            kwargs: dict[str, Any] = {name: (data[name] if name in data.files else None) for name in _ARRAYS}
        names = {f.name for f in fields(cls)}
        return cls(case=meta["case"], dt=float(meta["dt"]), energy=energy, model=meta["model"],
                   notes=tuple(meta.get("notes", ())),
                   **{k: v for k, v in kwargs.items() if k in names})


def suite_statistics(results: dict) -> dict:
    """Statistics of every case: case name -> :meth:`HistoryResult.statistics`.

    Parameters
    ----------
    results : dict of str -> HistoryResult
        As returned by :func:`isolation.dynamics.history.run_cases`. [-]
    """
    return {name: result.statistics() for name, result in results.items()}
