"""A straightforward vectorised pandas/numpy reduction of a benchmark run, for comparison with the
command line in `npm run bench`. It is what an engineer would write in an afternoon: read_csv,
groupby mean/std/count, the same flow formulas column-wise, classic 3D wall corrections, a line fit.

The formulas are the published ones the engine uses (sources beside each); the wall-correction
factors are computed more roughly than the engine does (closed forms, see below), which changes
no timing. Prints one JSON document (points and fit) to standard output.

Usage: python3 test/bench/pandas_reduce.py RUN.csv SETUP.json
"""
import json
import math
import os
import resource
import sys

import numpy as np
import pandas as pd

# unit → (scale, offset) to SI; NIST SP 811 (2008) Appendix B, as in core/units.ts
UNITS = {
    "pa": (1.0, 0.0), "kpa": (1e3, 0.0), "hpa": (1e2, 0.0), "degc": (1.0, 273.15), "k": (1.0, 0.0),
    "%": (0.01, 0.0), "fraction": (1.0, 0.0), "n": (1.0, 0.0), "nm": (1.0, 0.0),
    "deg": (math.pi / 180, 0.0), "rad": (1.0, 0.0),
}
DEFAULT_UNIT = {"alpha": "deg", "t_total": "degC", "rh": "%"}


def read_run(path):
    df = pd.read_csv(path, comment="#")
    names = {}
    for col in df.columns:
        name, _, unit = col.partition("[")
        name = name.strip().lower()
        unit = unit.rstrip("]").strip() or DEFAULT_UNIT.get(name, "")
        names[col] = name
        if name != "point" and unit:
            scale, offset = UNITS[unit.lower().replace(" ", "")]
            if scale != 1.0 or offset != 0.0:
                df[col] = df[col] * scale + offset
    return df.rename(columns=names)


def flow_state(p, dp, T0, rh, gamma, chord):
    """CIPM-2007 moist-air density (Picard et al., Metrologia 45 (2008) 149), isentropic pitot
    relations (NACA Report 1135, 1953), Sutherland viscosity with ISO 2533:1975 constants."""
    p0 = p + dp
    t0 = T0 - 273.15
    psv = np.exp(1.2378847e-5 * T0**2 - 1.9121316e-2 * T0 + 33.93711047 - 6.3431645e3 / T0)
    f = 1.00062 + 3.14e-8 * p0 + 5.6e-7 * t0**2
    xv = rh * f * psv / p0
    m2 = 2 / (gamma - 1) * ((p0 / p) ** ((gamma - 1) / gamma) - 1)
    T = T0 / (1 + 0.5 * (gamma - 1) * m2)
    t = T - 273.15
    Z = (1 - p / T * (1.58123e-6 - 2.9331e-8 * t + 1.1043e-10 * t**2 + (5.707e-6 - 2.051e-8 * t) * xv
                      + (1.9898e-4 - 2.376e-6 * t) * xv**2)
         + p**2 / T**2 * (1.83e-11 - 0.765e-8 * xv**2))
    Ma, Mv, R = 28.96546e-3, 18.01528e-3, 8.314472
    rho = p * Ma / (Z * R * T) * (1 - xv * (1 - Mv / Ma))
    q = 0.5 * gamma * p * m2
    V = np.sqrt(2 * q / rho)
    mu = 1.458e-6 * T**1.5 / (T + 110.4)
    return {"q": q, "rho": rho, "V": V, "mach": np.sqrt(m2), "mu": mu, "Re": rho * V * chord / mu, "T": T}


def delta_closed_form(B, H, terms=20):
    """Lift interference of a vanishing-span wing in a closed rectangular section, by images
    (docs/methods.md §7): δ = (πH/8B)·[1/3 + 2·Σ (−1)^(n+1)/sinh²(nπH/B)]."""
    s = sum((-1) ** (n + 1) / math.sinh(n * math.pi * H / B) ** 2 for n in range(1, terms + 1))
    return math.pi * H / (8 * B) * (1 / 3 + 2 * s)


def main():
    run_path, setup_path = sys.argv[1], sys.argv[2]
    setup = json.load(open(setup_path))
    model, tunnel = setup["model"], setup["tunnel"]
    S, c, b = model["area_m2"], model["chord_m"], model["span_m"]
    gamma = setup["flow"]["gamma"]
    df = read_run(run_path)
    g = df.groupby("point", sort=False)
    mean, std, n = g.mean(), g.std(), g.size()

    fl = flow_state(mean["p_static"], mean["dp_pitot"], mean["t_total"], mean["rh"], gamma, c)
    qS = fl["q"] * S
    cl_u = mean["lift"] / qS
    cd_u = mean["drag"] / qS
    cm_u = mean["pitch"] / (qS * c)

    # classic 3D corrections (Barlow, Rae & Pope 1999, eqs. 10.2, 10.9, 10.47, 10.60-10.62);
    # τ1 = 0.86 and τ2 = 0.1 are rough chart readings, δ the closed form for vanishing span
    C = tunnel["width_m"] * tunnel["height_m"]
    delta = delta_closed_form(tunnel["width_m"], tunnel["height_m"])
    tau1, tau2 = 0.86, 0.1
    eps_s = setup["corrections"]["solid_blockage_k"] * tau1 * model["volume_m3"] / C**1.5
    eps_w = S / (4 * C) * cd_u
    eps = eps_s + eps_w
    s2 = (1 + eps) ** 2
    cl_w = cl_u / s2
    alpha_deg = mean["alpha"] * 180 / math.pi + np.degrees(delta * S / C * cl_w)
    lin = (alpha_deg > -4) & (alpha_deg < 8)
    slope, intercept = np.polyfit(alpha_deg[lin], cl_w[lin], 1)
    d_alpha_sc = tau2 * delta * S / C * cl_w
    cl = cl_w + slope * 180 / math.pi * d_alpha_sc * -1
    cd = cd_u / s2 + delta * S / C * cl_w**2
    cm = cm_u / s2 + 0.25 * slope * 180 / math.pi * d_alpha_sc

    out = pd.DataFrame({
        "point": mean.index.astype(str), "samples": n.values,
        "alpha_deg": (alpha_deg + np.degrees(d_alpha_sc)).values,
        "alpha_uncorrected_deg": np.degrees(mean["alpha"]).values,
        "q_pa": (fl["q"] * s2).values, "q_uncorrected_pa": fl["q"].values,
        "v_mps": (fl["V"] * (1 + eps)).values, "mach": (fl["mach"] * (1 + eps)).values,
        "reynolds": (fl["Re"] * (1 + eps)).values, "rho_kgm3": fl["rho"].values, "mu_pas": fl["mu"].values,
        "cl": cl.values, "cd": cd.values, "cm": cm.values,
        "cl_uncorrected": cl_u.values, "cd_uncorrected": cd_u.values, "cm_uncorrected": cm_u.values,
        "cl_std": (std["lift"] / qS).values, "eps_solid": eps_s, "eps_wake": eps_w.values,
    })
    sys.stdout.write('{"points":')
    sys.stdout.write(out.to_json(orient="records", double_precision=15))
    sys.stdout.write(json.dumps({"cl_alpha_per_deg": slope, "alpha_zero_lift_deg": -intercept / slope}).join([',"fit":', "}\n"]))

    rss_file = os.environ.get("SWEEPBOOK_BENCH_RSS_FILE")
    if rss_file:  # when /usr/bin/time is missing, the bench asks each process for its own peak and CPU time
        u = resource.getrusage(resource.RUSAGE_SELF)
        with open(rss_file, "w") as fh:
            fh.write(f"{u.ru_maxrss} {u.ru_utime} {u.ru_stime}")


main()
