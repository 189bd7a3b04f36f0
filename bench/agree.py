#!/usr/bin/python3
"""Compare labscript.py's figures.csv with the figures of a skysheet site.

    /usr/bin/python3 bench/agree.py OUT/figures.csv SITE

Prints, for solar reflectance, thermal emittance and window emittance, the
largest and the mean absolute difference over all materials and the material
with the largest one. Exits 1 when a difference exceeds --tol (default 1e-3)
or a material is missing from either side. Standard library only.
"""

import argparse
import csv
import json
import os
import sys

FIGURES = ("solar_reflectance", "thermal_emittance", "window_emittance")


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("csv", help="figures.csv written by labscript.py")
    p.add_argument("site", help="site folder rendered by skysheet (holds m/SLUG/figures.json)")
    p.add_argument("--tol", type=float, default=1e-3, help="largest difference allowed (default 1e-3)")
    a = p.parse_args()

    with open(a.csv, encoding="utf-8") as f:
        lab = {row["slug"]: row for row in csv.DictReader(f)}
    worst = {k: (0.0, "") for k in FIGURES}
    total = {k: 0.0 for k in FIGURES}
    missing = 0
    for slug, row in sorted(lab.items()):
        path = os.path.join(a.site, "m", slug, "figures.json")
        try:
            with open(path, encoding="utf-8") as f:
                sky = json.load(f)
        except FileNotFoundError:
            print(f"agree: {path}: missing", file=sys.stderr)
            missing += 1
            continue
        for k in FIGURES:
            d = abs(float(row[k]) - sky[k])
            total[k] += d
            if d > worst[k][0]:
                worst[k] = (d, slug)
    n = len(lab) - missing
    print(f"{n} materials compared")
    print("| figure | largest difference | mean difference | material |")
    print("| --- | --- | --- | --- |")
    for k in FIGURES:
        print(f"| {k} | {worst[k][0]:.2e} | {total[k] / max(n, 1):.2e} | {worst[k][1]} |")
    if missing or n == 0 or any(worst[k][0] > a.tol for k in FIGURES):
        sys.exit(1)


if __name__ == "__main__":
    main()
