#!/usr/bin/python3
"""The lab's way without skysheet, for a whole-process comparison.

For every material of a library written by ``go run ./bench/genlib`` (a
folder holding ``uvvis.csv`` and ``ftir.csv`` in the neutral column format),
this script reads both files, joins them at 2500 nm and computes

* solar reflectance: R weighted by the ASTM G173-03 global tilt spectrum
  over 280-2500 nm,
* thermal emittance: 1 - R - T (Kirchhoff) weighted by the Planck
  blackbody at 300 K over 2.5-25 um,
* window emittance: the same over 8-13 um,

each with the trapezoid rule on the union of the data points, the band
limits and (for the solar figure) the points of the G173 table, both curves
linear between their points. It writes one PNG chart per material and a
``figures.csv`` of the three figures, single-process by default, as a lab
script usually runs.

Run with Debian's python3 and its python3-numpy and python3-matplotlib:

    /usr/bin/python3 bench/labscript.py LIBRARY -o OUT [--jobs N]
"""

import argparse
import glob
import os
import sys
import time

import numpy as np
import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402  (after choosing the backend)

# Exact SI constants (CODATA 2018).
H = 6.62607015e-34  # J s
C = 299792458.0  # m/s
KB = 1.380649e-23  # J/K

SOLAR_BAND = (280.0, 2500.0)  # nm
THERMAL_BAND = (2500.0, 25000.0)  # nm
WINDOW_BAND = (8000.0, 13000.0)  # nm
TEMPERATURE = 300.0  # K

trapezoid = getattr(np, "trapezoid", None) or np.trapz  # numpy >= 2 renamed it


def planck(nm, kelvin):
    """Blackbody spectral radiance, W m-2 sr-1 nm-1, at wavelengths nm."""
    lam = nm * 1e-9
    return 2 * H * C**2 / lam**5 / np.expm1(H * C / (lam * KB * kelvin)) * 1e-9


def read_g173(path):
    """Wavelength (nm) and global tilt irradiance (W m-2 nm-1) of ASTM G173-03."""
    table = np.loadtxt(path, delimiter=",", skiprows=2, usecols=(0, 2))
    return table[:, 0], table[:, 1]


def read_spectrum(path):
    """Read a neutral-format file; return nm (ascending), R, T and metadata."""
    meta = {}
    with open(path, encoding="utf-8") as f:
        for line in f:
            if line.startswith("#"):
                key, _, value = line[1:].partition(":")
                meta[key.strip()] = value.strip()
                continue
            header = [h.strip() for h in line.split(",")]
            break
        data = np.loadtxt(f, delimiter=",", ndmin=2)
    x = data[:, 0]
    axis = header[0]
    if axis.startswith("wavenumber"):
        nm = 1e7 / x
    elif axis.startswith("wavelength_um"):
        nm = x * 1e3
    else:
        nm = x
    zeros = np.zeros_like(x)
    r = data[:, header.index("R")] if "R" in header else zeros
    t = data[:, header.index("T")] if "T" in header else zeros
    order = np.argsort(nm)
    return nm[order], r[order], t[order], meta


def band_mean(nm, x, lo, hi, weight, knots=None):
    """Weighted mean of x over [lo, hi] nm, trapezoid rule on the union grid."""
    inner = nm[(nm > lo) & (nm < hi)]
    grid = np.concatenate(([lo], inner, [hi]))
    if knots is not None:
        grid = np.union1d(grid, knots[(knots > lo) & (knots < hi)])
    w = weight(grid)
    return trapezoid(np.interp(grid, nm, x) * w, grid) / trapezoid(w, grid)


def material(folder, g173, out):
    """Figures of one material folder; writes its chart. Returns a CSV row."""
    slug = os.path.basename(folder)
    uv_nm, uv_r, uv_t, meta = read_spectrum(os.path.join(folder, "uvvis.csv"))
    ir_nm, ir_r, ir_t, _ = read_spectrum(os.path.join(folder, "ftir.csv"))
    keep = ir_nm > uv_nm[-1]  # the files meet at 2500 nm: keep the first file's point
    nm = np.concatenate((uv_nm, ir_nm[keep]))
    r = np.concatenate((uv_r, ir_r[keep]))
    t = np.concatenate((uv_t, ir_t[keep]))
    emittance = 1 - r - t

    g_nm, g_w = g173
    solar = band_mean(nm, r, *SOLAR_BAND, lambda g: np.interp(g, g_nm, g_w), knots=g_nm)
    bb = lambda g: planck(g, TEMPERATURE)  # noqa: E731
    thermal = band_mean(nm, emittance, *THERMAL_BAND, bb)
    window = band_mean(nm, emittance, *WINDOW_BAND, bb)

    fig, (ax1, ax2) = plt.subplots(1, 2, figsize=(10, 3.8))
    s = (g_nm >= 250) & (g_nm <= 2500)
    ax1.fill_between(g_nm[s], g_w[s] / g_w[s].max(), color="gold", alpha=0.3, label="ASTM G173 global (scaled)")
    u = nm <= 2500
    ax1.plot(nm[u], r[u], label="R")
    ax1.plot(nm[u], t[u], label="T")
    ax1.plot(nm[u], 1 - r[u] - t[u], label="A = 1 - R - T")
    ax1.set(xlim=(250, 2500), ylim=(0, 1), xlabel="wavelength (nm)", title=f"solar reflectance {solar:.3f}")
    ax1.legend(fontsize=7, loc="lower right")
    v = nm >= 2500
    um = nm[v] / 1000
    b = planck(nm[v], TEMPERATURE)
    ax2.fill_between(um, b / b.max(), color="0.85", label="blackbody 300 K (scaled)")
    ax2.axvspan(8, 13, color="tab:blue", alpha=0.08, label="8-13 um window")
    ax2.plot(um, emittance[v], color="tab:red", label="emittance")
    ax2.plot(um, r[v], color="tab:blue", lw=0.8, label="R")
    ax2.set(xlim=(2.5, 25), ylim=(0, 1), xlabel="wavelength (um)",
            title=f"thermal emittance {thermal:.3f}, window {window:.3f}")
    ax2.legend(fontsize=7, loc="lower right")
    fig.suptitle(meta.get("sample", slug), fontsize=9)
    # Fixed margins for a fixed-size chart: as tidy as tight_layout here and
    # a third cheaper.
    fig.subplots_adjust(left=0.06, right=0.98, bottom=0.13, top=0.84, wspace=0.15)
    fig.savefig(os.path.join(out, slug + ".png"), dpi=100)
    plt.close(fig)
    return f"{slug},{solar:.9f},{thermal:.9f},{window:.9f}\n"


def _worker(args):
    return material(*args)


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("library", help="library folder (with content/)")
    p.add_argument("-o", "--out", required=True, help="output folder for the PNGs and figures.csv")
    p.add_argument("--g173", default=os.path.join(here, "..", "spectra", "astm-g173-03.csv"),
                   help="ASTM G173-03 table (default: the one embedded in skysheet)")
    p.add_argument("--jobs", type=int, default=1, help="worker processes (default 1)")
    a = p.parse_args()

    start = time.perf_counter()
    folders = sorted(os.path.dirname(f) for f in glob.glob(os.path.join(a.library, "content", "**", "uvvis.csv"), recursive=True))
    if not folders:
        sys.exit(f"labscript: no */uvvis.csv under {a.library}/content")
    os.makedirs(a.out, exist_ok=True)
    g173 = read_g173(a.g173)
    jobs = [(f, g173, a.out) for f in folders]
    if a.jobs > 1:
        import multiprocessing
        with multiprocessing.Pool(a.jobs) as pool:
            rows = pool.map(_worker, jobs, chunksize=8)
    else:
        rows = [material(*j) for j in jobs]
    with open(os.path.join(a.out, "figures.csv"), "w", encoding="utf-8") as f:
        f.write("slug,solar_reflectance,thermal_emittance,window_emittance\n")
        f.writelines(rows)
    print(f"labscript: {len(rows)} materials in {time.perf_counter() - start:.1f} s -> {a.out}")


if __name__ == "__main__":
    main()
