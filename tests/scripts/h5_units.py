#!/usr/bin/python3
"""One name, one SI unit in every HDF5 file (format 2.0): runs `run`, `compare`, `sweep`, `levers`,
`scale-up` and `mixing` on the bundled pilot and cell-culture cases and checks, with h5py:

- the root of every result.h5 carries format_version = "2.0";
- every dataset carries a `units` attribute, and every numeric one an SI unit (or a currency per
  hour or per kg, or a pointer "see /..." to a dataset of per-row units);
- every value of /compare and /sweep whose name /summary also has carries /summary's unit and,
  for the same case at the same operating point, /summary's value to round-off.

Usage: h5_units.py OXYSTRAT_EXE SOURCE_DIR WORK_DIR
"""
import pathlib
import shutil
import subprocess
import sys
import tomllib

import h5py
import numpy

FORMAT_VERSION = "2.0"
# The SI units (and "1") a file may carry; anything else is a table unit that escaped conversion.
SI_UNITS = {
    "1", "m", "m2", "m3", "s", "1/s", "kg", "kg/s", "kg/m3", "mol", "mol/s", "mol/m3", "mol/(m3 s)", "Pa", "Pa s",
    "W", "W/m3", "W/kg", "J/mol", "m/s", "m3/s", "K", "1/s per (W/m3)^alpha (m/s)^beta",
}
# Per hour is the unit the name itself states (excursions_per_hour, transitions_per_hour); rpm is
# the first release's /transient/speed, kept beside speed_rps (docs/outputs.md).
NAMED_EXCEPTIONS = {"1/h", "rpm"}
# Round-off: the same double computed by the same code, written and read back; 1e-12 relative
# allows for a different summation order (a total over zones) without hiding a unit factor (>= 1e-3 off).
REL = 1e-12


def run(exe, args, cwd):
    r = subprocess.run([exe] + args, cwd=cwd, capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"oxystrat {' '.join(args)} failed ({r.returncode}): {r.stderr}")


def text(v):
    return v.decode() if isinstance(v, bytes) else str(v)


def check_file(path, problems):
    with h5py.File(path, "r") as f:
        version = text(f.attrs.get("format_version", ""))
        if version != FORMAT_VERSION:
            problems.append(f"{path}: format_version '{version}', expected '{FORMAT_VERSION}'")

        def visit(name, obj):
            if not isinstance(obj, h5py.Dataset):
                return
            if "units" not in obj.attrs:
                problems.append(f"{path}:/{name}: no units attribute")
                return
            unit = text(obj.attrs["units"])
            if obj.dtype.kind not in "fiu" or unit in SI_UNITS or unit in NAMED_EXCEPTIONS:
                return
            if unit.startswith("see /"):
                return
            if "currency" in obj.attrs and unit in (text(obj.attrs["currency"]) + "/h", text(obj.attrs["currency"]) + "/kg"):
                return
            problems.append(f"{path}:/{name}: unit '{unit}' is not SI")

        f.visititems(visit)


def close(a, b):
    return abs(a - b) <= REL * max(abs(a), abs(b)) + 1e-300


def check_same_as_summary(table_path, group, column, summary_path, problems):
    """Each /GROUP/NAME[column] equals /summary/NAME of the run of the same case."""
    compared = 0
    with h5py.File(table_path, "r") as t, h5py.File(summary_path, "r") as s:
        for name, d in t[group].items():
            if not isinstance(d, h5py.Dataset) or d.dtype.kind != "f" or name not in s["summary"]:
                continue
            ref = s["summary"][name]
            if text(d.attrs["units"]) != text(ref.attrs["units"]):
                problems.append(f"{table_path}:/{group}/{name} in '{text(d.attrs['units'])}', /summary/{name} in "
                                f"'{text(ref.attrs['units'])}'")
                continue
            a, b = float(numpy.asarray(d[()])[column]), float(numpy.asarray(ref[()]).reshape(-1)[0])
            if not close(a, b):
                problems.append(f"{table_path}:/{group}/{name}[{column}] = {a!r}, /summary/{name} = {b!r}")
            compared += 1
    # Power, kLa, DO, biomass, off-gas, pCO2, heat, shear, costs...: far more than a handful.
    if compared < 20:
        problems.append(f"{table_path}: only {compared} values of /{group} found in /summary")
    return compared


def main():
    exe, source, work = sys.argv[1], pathlib.Path(sys.argv[2]), pathlib.Path(sys.argv[3])
    shutil.rmtree(work, ignore_errors=True)
    work.mkdir(parents=True)
    pilot = source / "cases" / "pilot-300L.toml"
    cells = source / "cases" / "cell-culture-2m3.toml"
    production = source / "cases" / "tall-3rushton.toml"
    speed = tomllib.loads(pilot.read_text())["operation"]["speed"]  # e.g. "400 rpm"
    value, unit = speed.split()
    runs = {
        "run-pilot": ["run", str(pilot)],
        "run-cells": ["run", str(cells)],
        "run-trust": ["run", str(pilot), "--uncertainty", "4", "--grid-check"],
        "compare": ["compare", str(pilot), str(cells)],
        # Point 0 is the pilot as written: its values must be the run's.
        "sweep": ["sweep", str(pilot), "--vary", f"operation.speed={value}:{2 * float(value):g}:2:{unit}"],
        "levers": ["levers", str(pilot)],
        "scale-up": ["scale-up", str(pilot), str(production)],
        "mixing": ["mixing", str(pilot)],
    }
    problems = []
    for name, args in runs.items():
        run(exe, args + ["--out", str(work / name)], work)
        for h5 in sorted((work / name).rglob("*.h5")):
            check_file(h5, problems)
    n = check_same_as_summary(work / "compare" / "result.h5", "compare", 0, work / "run-pilot" / "result.h5", problems)
    n += check_same_as_summary(work / "compare" / "result.h5", "compare", 1, work / "run-cells" / "result.h5", problems)
    n += check_same_as_summary(work / "sweep" / "result.h5", "sweep", 0, work / "run-pilot" / "result.h5", problems)
    for p in problems:
        print(p)
    print(f"h5_units: {len(runs)} runs, {n} values checked against /summary, {len(problems)} problem(s)")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
