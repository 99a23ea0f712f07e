"""Independent quick check of the invented Corvel Lightworks line-up by the IEC 62471:2006 method.

For each record in ``examples/lineup/`` it prints the assessment distance, illuminance, luminance, the
hazard quantities and their risk groups, and the overall group. It is a tuning aid for
``make_lineup.py`` written apart from the ``hazard`` engine (it shares only the weighting tables), so the
two can be compared. Run from the repository root: ``python examples/check_lineup.py``.
"""

from __future__ import annotations

import math
import sys
import tomllib
from collections.abc import Callable
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
from weighting_tables import load_table  # noqa: E402

LINEUP = Path(__file__).resolve().parent / "lineup"
GROUPS = ("Exempt", "RG1", "RG2")
# Irradiance limits per group [W/m2]; above the last one the group is RG3.
IRRADIANCE_LIMITS = {"E_S": (0.001, 0.003, 0.03), "E_UVA": (10.0, 33.0, 100.0),
                     "E_IR": (100.0, 570.0, 3200.0), "E_B": (1.0, 1.0, 400.0)}
BLUE_FIELD_RAD = (0.1, 0.011, 0.0017)
BLUE_LIMITS = (100.0, 1e4, 4e6)  # [W/m2/sr]
THERMAL_FIELD_RAD = (0.011, 0.011, 0.0017)
THERMAL_ALPHA_MIN_RAD = (0.011, 0.011, 0.0017)
THERMAL_CONSTANTS = (28000.0, 28000.0, 71000.0)  # limit = constant / alpha_b [W/m2/sr]


def band(wl: np.ndarray, e: np.ndarray, lo: float, hi: float, weight: str | None = None) -> float:
    """Trapezoid integral of E (times a weighting table) over the grid points in [lo, hi] [W/m2]."""
    inside = (wl >= lo) & (wl <= hi)
    w = 1.0 if weight is None else load_table(weight).at(wl[inside])
    return float(np.trapezoid(e[inside] * w, wl[inside]))


def cone(full_angle_rad: float) -> float:
    """Solid angle of a cone of the given full angle [sr]."""
    return 2 * math.pi * (1 - math.cos(full_angle_rad / 2))


def clip(x: float, lo: float, hi: float) -> float:
    """x bounded to [lo, hi]."""
    return min(max(x, lo), hi)


def geometry(rec: dict, d_m: float) -> tuple[float, float, Callable[[float, float], float]]:
    """Source solid angle [sr], unbounded α [rad] and α_b(lo, hi) [rad] at distance d_m [m].

    A rectangle's α is the mean of its two angles, each bounded first; ``source_alpha_mrad`` is taken as
    a disc of diameter α·distance_mm.
    """
    if "source_width_mm" in rec:
        w, h = rec["source_width_mm"] * 1e-3, rec["source_height_mm"] * 1e-3
        omega = 4 * math.asin(math.sin(math.atan(w / (2 * d_m))) * math.sin(math.atan(h / (2 * d_m))))
        return omega, (w + h) / (2 * d_m), lambda lo, hi: (clip(w / d_m, lo, hi) + clip(h / d_m, lo, hi)) / 2
    if "source_diameter_mm" in rec:
        diameter = rec["source_diameter_mm"] * 1e-3
    else:
        diameter = rec["source_alpha_mrad"] * 1e-3 * rec["distance_mm"] * 1e-3
    omega = cone(2 * math.atan(diameter / (2 * d_m)))
    return omega, diameter / d_m, lambda lo, hi: clip(diameter / d_m, lo, hi)


def group_of(passes: list[bool]) -> str:
    """First group whose limit is met, else RG3."""
    return next((g for g, ok in zip(GROUPS, passes) if ok), "RG3")


def assess(path: Path) -> dict:
    """Assess one record: quantities at the assessment distance and their groups."""
    rec = tomllib.loads(path.read_text(encoding="utf-8"))
    wl, e = read_spectrum(path.parent / rec["spectrum"])
    d_m = rec["distance_mm"] * 1e-3
    ev_m = 683.0 * band(wl, e, 360, 830, "v_photopic")
    d_a = 0.2 if rec["lamp_type"] != "gls" else max(0.2, d_m * math.sqrt(ev_m / 500.0))
    e = e * (d_m / d_a) ** 2
    omega, alpha, alpha_b = geometry(rec, d_a)
    q = {"id": rec["id"], "d_a_mm": d_a * 1e3, "alpha_mrad": alpha * 1e3, "E_v": ev_m * (d_m / d_a) ** 2}
    q["L_v"] = q["E_v"] / omega
    q["E_S"] = band(wl, e, 200, 400, "s_uv")
    q["E_UVA"] = band(wl, e, 315, 400)
    q["E_IR"] = band(wl, e, 780, 3000)
    q["E_H"] = band(wl, e, 380, 3000)
    groups = {k: group_of([q[k] <= lim for lim in IRRADIANCE_LIMITS[k]]) for k in ("E_S", "E_UVA", "E_IR")}
    e_b = band(wl, e, 300, 700, "blue_light")
    if alpha < 0.011:
        q["E_B"] = e_b
        groups["E_B"] = group_of([e_b <= lim for lim in IRRADIANCE_LIMITS["E_B"]])
    else:
        q["L_B"] = e_b / omega
        groups["L_B"] = group_of([e_b / max(omega, cone(g)) <= lim
                                  for g, lim in zip(BLUE_FIELD_RAD, BLUE_LIMITS)])
    weak = q["L_v"] < 10.0
    key, lo = ("L_IR", 780) if weak else ("L_R", 380)
    e_r = band(wl, e, lo, 1400, "retinal_thermal")
    q[key] = e_r / omega
    if weak:
        limit = 6000.0 / alpha_b(0.011, 0.1)
        groups[key] = "Exempt" if e_r / max(omega, cone(0.011)) <= limit else "RG3"
        q[key + "_limit"] = limit
    else:
        groups[key] = group_of([e_r / max(omega, cone(g)) <= c / alpha_b(amin, 0.1) for g, amin, c
                                in zip(THERMAL_FIELD_RAD, THERMAL_ALPHA_MIN_RAD, THERMAL_CONSTANTS)])
        q[key + "_limit"] = 28000.0 / alpha_b(0.011, 0.1)
    q["groups"] = groups
    q["overall"] = max(groups.values(), key=("Exempt", "RG1", "RG2", "RG3").index)
    return q


def read_spectrum(path: Path) -> tuple[np.ndarray, np.ndarray]:
    """Wavelength [nm] and spectral irradiance [W/m2/nm] from a line-up CSV."""
    rows = [line.split(",") for line in path.read_text(encoding="utf-8").splitlines()
            if line and not line.startswith("#")][1:]
    data = np.array(rows, dtype=float)
    return data[:, 0], data[:, 1]


def main() -> None:
    """Print the check for every record in the line-up."""
    for path in sorted(LINEUP.glob("*.toml")):
        q = assess(path)
        values = "  ".join(f"{k}={q[k]:.4g}" for k in q if k not in ("id", "groups", "overall"))
        groups = " ".join(f"{k}:{g}" for k, g in q["groups"].items())
        print(f"{q['id']:12s} {q['overall']:6s} {values}\n{'':19s}{groups}")


if __name__ == "__main__":
    main()
