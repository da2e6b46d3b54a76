"""Tables of a study's results, from :class:`isolation.study.runner.StudyResults` and
:class:`isolation.study.runner.AlternativeResults` or their ``to_dict()`` forms.

Lengths, forces and stiffnesses are shown in the study's unit system (SI or
US customary, :mod:`isolation.units`); everything else in internal units.
"""

from __future__ import annotations

from typing import Any, Mapping

from isolation.codes import registry as _codes
from isolation.output.tables.table import Table, format_number, in_study_units
from isolation.study.quantities import DesignQuantities, HistorySummary

__all__ = [
    "bidirectional_table",
    "pairs_table",
    "inputs_table",
    "alternatives_table",
    "bounds_table",
    "code_quantities_table",
    "suite_table",
    "history_table",
    "verdict_table",
    "comparison_table",
    "display_quantity",
]


def _code_title(basis: str) -> str:
    """Name of a code basis in reports (the name itself when it is not registered here)."""
    return _codes.get(basis).title if basis in _codes.names() else str(basis)


def _part(obj: Any, name: str) -> Any:
    return obj[name] if isinstance(obj, Mapping) else getattr(obj, name)


def _quantities(alternative: Any) -> DesignQuantities:
    """An alternative's code quantities, typed (from results or their ``to_dict()`` form). [m, s, kN, -]"""
    return DesignQuantities.from_dict(_part(alternative, "quantities"))


def _summary(alternative: Any) -> HistorySummary:
    """An alternative's response-history summary, typed (from results or their ``to_dict()`` form)."""
    return HistorySummary.from_dict(_part(alternative, "history")["summary"] or {}, strict=False)


def _display(value: float | None, kind: str, system: str) -> tuple[float | None, str]:
    from isolation.units import to_display

    if value is None:
        return None, to_display(1.0, kind, system)[1]
    return to_display(float(value), kind, system)


def inputs_table(results: Any) -> Table:
    """Basis, site, building, analysis and wind inputs of a study, in its display units."""
    study = _part(results, "study")
    system = study.get("units", "SI")
    site, building, analysis = study["site"], study["building"], study["analysis"]
    fixed = _part(results, "fixed_base")
    rows: list[tuple[str, Any, str]] = [("Code basis", _code_title(study["basis"]), "")]
    for key, label, unit in (("sms", "S_MS (MCE_R, short period)", "g"), ("sm1", "S_M1 (MCE_R, 1 s)", "g"),
                             ("s1", "S_1 (mapped, 1 s)", "g"), ("ag", "a_g (reference PGA)", "g")):
        if site.get(key) is not None:
            rows.append((label, site[key], unit))
    if site.get("long_period") is not None:
        rows.append(("T_L (long-period transition)", site["long_period"], "s"))
    for key, label in (("site_class", "Site class"), ("ground_type", "Ground type"),
                       ("spectrum_type", "Spectrum type")):
        if site.get(key) is not None:
            rows.append((label, site[key], ""))
    if site.get("spectrum_file"):
        rows.append(("Site-specific spectrum file", str(site["spectrum_file"]).rsplit("/", 1)[-1], ""))
    rows.append(("Near an active fault", bool(site.get("near_fault")), ""))
    weight = building["base_weight"] + sum(building["floor_weights"])
    height = sum(building["storey_heights"])
    for label, value, kind in (("Seismic weight W (base slab included)", weight, "weight"),
                               ("Height above the isolation plane", height, "length"),
                               ("Plan length", building["plan_length"], "length"),
                               ("Plan width", building["plan_width"], "length")):
        magnitude, unit = _display(value, kind, system)
        rows.append((label, magnitude, unit))
    rows += [
        ("Storeys", building["storeys"], ""),
        ("Lateral system (fixed base)", str(building["lateral_system"]).replace("_", " "), ""),
        ("Response modification R", building["response_modification"], ""),
        ("Importance factor", building["importance"], ""),
        ("Fixed-base period T_fb", fixed["period"], "s"),
        ("Motions in the suite", analysis["suite_size"], ""),
        ("Record length", analysis["duration"], "s"),
        ("Time step", analysis["time_step"], "s"),
    ]
    wind = study.get("wind_base_shear")
    magnitude, unit = _display(wind, "force", system)
    rows.append(("Wind base shear", magnitude if wind is not None else "not given", unit if wind is not None else ""))
    source = fixed.get("period_source", "")
    return Table(columns=("Input", "Value", "Unit"), rows=tuple(rows), caption="Study inputs", align="lrl",
                 notes=f"Fixed-base period: {source}." if source else "")


def alternatives_table(results: Any) -> Table:
    """Bearings of each isolation alternative: type, count, main sizes, property factors, moat."""
    study = _part(results, "study")
    system = study.get("units", "SI")
    length_unit = _display(1.0, "length", system)[1]
    rows = []
    for alternative in study["alternatives"]:
        moat = alternative.get("moat")
        for group in alternative["bearings"]:
            props = group["properties"]
            sizes = []
            for key, label, kind in (("radius", "R", "length"), ("friction", "μ", None),
                                     ("outer_diameter", "D_o", "length"), ("lead_diameter", "D_L", "length"),
                                     ("layers", "layers", None), ("displacement_capacity", "capacity", "length")):
                if props.get(key) is not None:
                    value, unit = (props[key], "") if kind is None else _display(props[key], kind, system)
                    # No-break spaces keep "R = 3.00 m" on one line when the cell wraps.
                    sizes.append(f"{label}\u00a0=\u00a0{format_number(value)}" + (f"\u00a0{unit}" if unit else ""))
            rows.append((alternative["name"], group["type"].replace("_", " "), group["count"], ", ".join(sizes),
                         f"{alternative['lower_factor']:.2f} / {alternative['upper_factor']:.2f}",
                         None if moat is None else _display(moat, "length", system)[0]))
    return Table(columns=("Alternative", "Bearing", "Count", "Main properties",
                          "Factors [-]", f"Moat [{length_unit}]"),
                 rows=tuple(rows), caption="Isolation alternatives", align="plrprr")


def bounds_table(alternative: Any, system: str = "SI") -> Table:
    """Equivalent-linear results for the lower, nominal and upper property sets."""
    bounds = _part(alternative, "bounds")
    length = _display(1.0, "length", system)[1]
    force = _display(1.0, "force", system)[1]
    stiffness = _display(1.0, "stiffness", system)[1]
    rows = []
    for case in ("lower", "nominal", "upper"):
        if case not in bounds:
            continue
        r = bounds[case]
        rows.append((case, _display(r["displacement"], "length", system)[0], r["period"], r["damping"],
                     r["damping_coefficient"], _display(r["stiffness"], "stiffness", system)[0],
                     _display(r["base_shear"], "force", system)[0], r["base_shear"] / r["weight"]))
    return Table(
        columns=("Properties", f"D [{length}]", "T_eff [s]", "β_eff [-]", "B [-]", f"K_eff [{stiffness}]",
                 f"V_b [{force}]", "V_b/W [-]"),
        rows=tuple(rows),
        caption=f"Equivalent-linear results, {_part(alternative, 'name')}",
        notes="Single-mode iteration on the site spectrum; B divides the 5 % spectrum (ASCE/SEI 7-16 "
              "Table 17.5-1 or EN 1998-1 eta).",
    )


def code_quantities_table(alternative: Any, system: str = "SI") -> Table:
    """The code procedure's key quantities (symbol, value, unit, source).

    Lengths, forces, stiffnesses and stresses are shown in the units of the
    ``system`` ("SI" or "US", :func:`~isolation.output.tables.table.in_study_units`);
    periods, ratios and spectral values as they are.
    """
    items = _part(alternative, "report").get("quantities", [])
    rows = []
    for i in items:
        value, unit = in_study_units(i["value"], i["unit"], system)
        rows.append((f"{i['name']} ({i['symbol']})", value, unit, i.get("source", "")))
    return Table(columns=("Quantity", "Value", "Unit", "Source"), rows=tuple(rows), align="prcp",
                 caption=f"Code procedure quantities, {_part(alternative, 'name')}")


def suite_table(results: Any) -> Table:
    """Per-record tolerance check of the matched motion suite."""
    suite = _part(results, "suite")
    check = suite["check"]
    low, high = check["band"]
    rows = tuple((record["index"] + 1, record["seed"], record["lowest_ratio"], record["highest_ratio"],
                  "yes" if record["within_band"] else "NO", "yes" if record["baseline_ok"] else "NO")
                 for record in check["records"])
    notes = (f"Suite mean over {check['check_range_s'][0]:.2f}-{check['check_range_s'][1]:.2f} s: lowest "
             f"{check['lowest_mean_ratio']:.3f} of the target at {check['period_of_lowest_mean_s']:.2f} s; "
             f"required at least {check['required_mean_ratio']:.2f} ({check['rule']} rule): "
             f"{'met' if check['mean_ok'] else 'NOT met'}.")
    if suite.get("note"):
        notes += f" Note: {suite['note']}."
    return Table(columns=("Record", "Seed", "Lowest ratio [-]", "Highest ratio [-]",
                          f"Within {low:.2f}-{high:.2f}", "Baseline ok"),
                 rows=rows, caption="Matched motion suite: spectral ratios to the target", notes=notes)


def pairs_table(results: Any) -> Table | None:
    """Per-pair tolerance check of the matched pairs (bidirectional runs); None when not run."""
    pairs = _part(results, "suite").get("pairs")
    if not pairs:
        return None
    check = pairs["check"]
    low, high = check["band"]
    rows = tuple((row["pair"], seeds[0], seeds[1], row["lowest_ratio"], row["highest_ratio"],
                  "yes" if row["within_band"] else "NO", row["correlation"], "yes" if row["baseline_ok"] else "NO")
                 for row, seeds in zip(check["pairs"], pairs["seeds"], strict=True))
    notes = (f"{check['spectrum']} spectra of the pairs; suite mean over {check['check_range_s'][0]:.2f}-"
             f"{check['check_range_s'][1]:.2f} s: lowest {check['lowest_mean_ratio']:.3f} of the target at "
             f"{check['period_of_lowest_mean_s']:.2f} s, required at least {check['required_mean_ratio']:.2f} "
             f"({check['rule']} rule for pairs): {'met' if check['mean_ok'] else 'NOT met'}.")
    return Table(columns=("Pair", "Seed x", "Seed y", "Lowest ratio [-]", "Highest ratio [-]",
                          f"Within {low:.2f}-{high:.2f}", "Correlation [-]", "Baseline ok"),
                 rows=rows, caption=f"Matched pairs of components: {check['spectrum']} ratios to the target",
                 notes=notes)


def history_table(alternative: Any, system: str = "SI") -> Table:
    """Suite means of the peak responses: fixed base against the isolated bounds."""
    s = _summary(alternative)
    length = _display(1.0, "length", system)[1]
    force = _display(1.0, "force", system)[1]

    def show(value, kind):
        return None if value is None else _display(value, kind, system)[0]

    rows = (
        (f"Isolator displacement [{length}]", None, show(s.isolator_displacement_lower, "length"),
         show(s.isolator_displacement_upper, "length")),
        (f"Isolator displacement with torsion [{length}]", None,
         show(s.isolator_displacement_with_torsion, "length"), None),
        (f"Residual isolator displacement [{length}]", None, show(s.residual_displacement_lower, "length"), None),
        ("Peak floor acceleration [g]", s.floor_acceleration_fixed, s.floor_acceleration_lower,
         s.floor_acceleration_upper),
        ("Largest storey drift ratio [%]", _times_100(s.drift_ratio_fixed), None,
         _times_100(s.drift_ratio_isolated)),
        (f"Shear above the isolators [{force}]", show(s.superstructure_shear_fixed, "force"), None,
         show(s.superstructure_shear_upper, "force")),
        (f"Shear through the isolation plane [{force}]", None, None, show(s.isolation_shear_upper, "force")),
    )
    fixed = "Fixed base, code design" if s.ductility_fixed is not None else "Fixed base"
    return Table(columns=("Response (suite mean of peaks)", fixed, "Isolated, lower", "Isolated, upper"),
                 rows=rows, caption=f"Response-history results, {_part(alternative, 'name')}", align="prrr",
                 notes="Drift of the isolated building: the larger of the two bounds, shown under upper.")


def _times_100(value: float | None) -> float | None:
    return None if value is None else 100 * value


def verdict_table(alternative: Any) -> Table:
    """The verdict's reasons: topic, level, finding and source."""
    verdict = _part(alternative, "verdict")
    order = {"against": 0, "condition": 1, "note": 2, "ok": 3}
    reasons = sorted(verdict["reasons"], key=lambda r: order.get(r["level"], 4))
    rows = tuple((r["topic"], r["level"], r["message"], r.get("source", "")) for r in reasons)
    return Table(columns=("Topic", "Level", "Finding", "Source of the limit"), rows=rows, align="llpp",
                 caption=f"Verdict for {verdict['alternative']}: {verdict['outcome']}")


def comparison_table(results: Any) -> Table:
    """The numbers the verdicts turn on, one column per alternative, and the outcomes."""
    system = _part(results, "study").get("units", "SI")
    length = _display(1.0, "length", system)[1]
    alternatives = list(_part(results, "alternatives"))
    labels = (
        ("T_M, upper bound [s]", lambda q, s: q.period_upper),
        ("T_M, lower bound [s]", lambda q, s: q.period_lower),
        ("Period shift T_M/T_fb, upper bound [-]", lambda q, s: q.period_upper / q.fixed_base_period),
        (f"Total maximum displacement D_TM [{length}]",
         lambda q, s: _display(q.total_displacement, "length", system)[0]),
        ("Design shear, isolated over fixed base [-]", lambda q, s: q.shear_ratio),
        ("Peak floor acceleration, isolated over fixed base [-]", lambda q, s: s.floor_acceleration_ratio),
    )
    rows = [tuple([label] + [read(_quantities(a), _summary(a)) for a in alternatives]) for label, read in labels]
    rows.append(tuple(["Verdict"] + [_part(a, "verdict")["outcome"] for a in alternatives]))
    return Table(
        columns=tuple(["Quantity"] + [_part(a, "name") for a in alternatives]),
        rows=tuple(rows), align="p" + "r" * len(alternatives),
        caption="Alternatives side by side",
        notes="Design shear: V_s above the isolators over the fixed-base design base shear; floor "
              "acceleration: response-history suite means, larger bound.",
    )


def display_quantity(value: float | None, kind: str, system: str = "SI", digits: int = 3) -> str:
    """An internal value as text in a unit system's display unit, e.g. ``"0.462 m"``, ``"18.2 in"``.

    Parameters
    ----------
    value : float or None
        Value in the internal unit of ``kind`` (m, kN, kPa, kN/m, s, t).
    kind : str
        Quantity kind of :data:`isolation.units.KINDS` ("length", "force", ...).
    system : str
        "SI" or "US".
    digits : int
        Significant figures (see :func:`format_number`). [-]
    """
    magnitude, unit = _display(value, kind, system)
    return f"{format_number(magnitude, digits)} {unit}"


def _storey_rows(b: dict) -> tuple:
    """Rows of storey ductility (largest storey, x / y) and residual drift, isolated and fixed base."""
    rows = []
    for label, part in (("isolated", b.get("storeys")), ("fixed base", b.get("fixed_base"))):
        if not part:
            continue
        if part.get("ductility_x") is not None:
            rows.append((f"Storey ductility demand, {label}, largest storey x / y [-]",
                         f"{format_number(max(part['ductility_x']))} / {format_number(max(part['ductility_y']))}"))
        rows.append((f"Residual drift ratio, {label}, largest storey x / y [-]",
                     f"{format_number(max(part['residual_drift_x']))} / "
                     f"{format_number(max(part['residual_drift_y']))}"))
    return tuple(rows)


def bidirectional_table(alternative: Any, system: str = "SI") -> Table | None:
    """Bidirectional (plan-model) results of an alternative against the single-mode D_TM; None when not run."""
    b = _part(alternative, "history").get("bidirectional")
    if not b:
        return None
    length = _display(1.0, "length", system)[1]
    force = _display(1.0, "force", system)[1]

    def show(value, kind):
        return None if value is None else _display(value, kind, system)[0]

    rows = (
        (f"D_TM from the histories (largest bearing, suite mean) [{length}]",
         show(b["total_displacement_history"], "length")),
        (f"D_TM of the single-mode procedure [{length}]", show(b["total_displacement_code"], "length")),
        ("Lower limit on history results [x single-mode D_TM]", b["lower_limit_factor"]),
        (f"D_TM used by the verdict [{length}]", show(b["total_displacement_governing"], "length")),
        (f"Centre-of-mass displacement [{length}]", show(b["centre_displacement_history"], "length")),
        ("Torsional amplification (corner / centre) [-]", b["torsional_amplification"]),
        (f"Smallest axial load on a bearing [{force}]", show(min(b["bearing_axial_min_kN"]), "force")),
        (f"Largest axial load on a bearing [{force}]", show(max(b["bearing_axial_max_kN"]), "force")),
        ("Bearings lifted (sliders, axial load <= 0) [-]", b["uplifted_bearings"]),
    ) + _storey_rows(b)
    check = b["pair_check"]
    law = (b.get("storeys") or {}).get("storey_law", "elastic")
    notes = (f"Plan model: {b['grid'][0]} x {b['grid'][1]} bearings, accidental eccentricity 5 % of the plan "
             f"dimensions, four sign combinations, lower and upper properties; storeys alike in both directions "
             f"(assumption), storey law {law}, torsion elastic. Pairs matched by their {check['spectrum']} spectra: "
             f"suite mean lowest "
             f"{check['lowest_mean_ratio']:.3f} of the target, required {check['required_mean_ratio']:.2f}; "
             f"component correlation at most {max(abs(p['correlation']) for p in check['pairs']):.2f}.")
    return Table(columns=("Bidirectional response", "Value"), rows=rows,
                 caption=f"Bidirectional response histories with torsion, {_part(alternative, 'name')}",
                 align="pr", notes=notes)
