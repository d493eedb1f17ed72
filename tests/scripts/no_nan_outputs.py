#!/usr/bin/python3
"""No NaN or Inf in any output file: runs `run`, `compare`, `sweep`, `kla-fit` and `calibrate` on
the bundled cases and data, and scans every file they write. A value that does not apply must be
absent (docs/outputs.md), never written as NaN.

Usage: no_nan_outputs.py OXYSTRAT_EXE SOURCE_DIR WORK_DIR

Scanned: every numeric dataset and attribute of result.h5 (h5py), every cell of the CSV tables,
the numbers of calibration.toml (tomllib), the cell and point arrays of the .vtu files (VTK's
reader when importable) and the words of report.html and the terminal text.
"""
import math
import pathlib
import re
import shutil
import subprocess
import sys
import tomllib

import h5py
import numpy

# "nan", "inf", "-inf", "NaN", "Infinity" as whole words, as C++ and Python print them.
BAD_WORD = re.compile(r"(?<![A-Za-z0-9_])[-+]?(nan|inf|infinity)(?![A-Za-z0-9_])", re.IGNORECASE)


def run(exe, args, cwd):
    r = subprocess.run([exe] + args, cwd=cwd, capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"oxystrat {' '.join(args)} failed ({r.returncode}): {r.stderr}")
    return r.stdout


def scan_h5(path, problems):
    def attributes(name, obj):
        for key, value in obj.attrs.items():
            a = numpy.asarray(value)
            if a.dtype.kind == "f" and not numpy.all(numpy.isfinite(a)):
                problems.append(f"{path}:{name}@{key}: not finite")

    def visit(name, obj):
        attributes(name, obj)
        if isinstance(obj, h5py.Dataset) and obj.dtype.kind == "f":
            data = numpy.asarray(obj[()])
            if not numpy.all(numpy.isfinite(data)):
                problems.append(f"{path}:/{name}: {int(numpy.sum(~numpy.isfinite(data)))} value(s) NaN or Inf")

    with h5py.File(path, "r") as f:
        attributes("/", f)
        f.visititems(visit)


def scan_text(path, text, problems):
    for n, line in enumerate(text.splitlines(), 1):
        m = BAD_WORD.search(line)
        if m:
            problems.append(f"{path}:{n}: '{m.group(0)}' in: {line.strip()[:120]}")


def scan_toml(path, problems):
    def walk(prefix, node):
        if isinstance(node, dict):
            for k, v in node.items():
                walk(f"{prefix}.{k}" if prefix else k, v)
        elif isinstance(node, list):
            for i, v in enumerate(node):
                walk(f"{prefix}.{i}", v)
        elif isinstance(node, float) and not math.isfinite(node):
            problems.append(f"{path}: {prefix} = {node}")

    walk("", tomllib.loads(path.read_text()))
    scan_text(path, path.read_text(), problems)


def scan_vtu(path, problems):
    try:
        import vtk
        from vtk.util.numpy_support import vtk_to_numpy
    except ImportError:
        return
    reader = vtk.vtkXMLUnstructuredGridReader()
    reader.SetFileName(str(path))
    reader.Update()
    grid = reader.GetOutput()
    for data in (grid.GetCellData(), grid.GetPointData()):
        for i in range(data.GetNumberOfArrays()):
            a = vtk_to_numpy(data.GetArray(i))
            if a.dtype.kind == "f" and not numpy.all(numpy.isfinite(a)):
                problems.append(f"{path}: array {data.GetArrayName(i)} not finite")


def scan_folder(folder, problems):
    for p in sorted(folder.rglob("*")):
        if p.suffix == ".h5":
            scan_h5(p, problems)
        elif p.suffix in (".csv", ".html", ".pvd"):
            scan_text(p, p.read_text(), problems)
        elif p.suffix == ".toml":
            scan_toml(p, problems)
        elif p.suffix == ".vtu":
            scan_vtu(p, problems)


def main():
    exe, source, work = sys.argv[1], pathlib.Path(sys.argv[2]), pathlib.Path(sys.argv[3])
    shutil.rmtree(work, ignore_errors=True)
    work.mkdir(parents=True)
    cases = sorted((source / "cases").glob("*.toml"))
    pilot = source / "cases" / "pilot-300L.toml"
    runs = []
    for case in cases:
        runs.append([f"run-{case.stem}", ["run", str(case)]])
    runs.append(["run-trust", ["run", str(pilot), "--uncertainty", "8", "--grid-check"]])
    runs.append(["run-no-gas", ["run", str(pilot), "--set", "operation.gas_flow=0 vvm"]])
    runs.append(["compare", ["compare"] + [str(c) for c in cases]])
    runs.append(["compare-no-mixing", ["compare", "--no-mixing", str(cases[0]), str(pilot)]])
    # Without --with-mixing a sweep has no theta95; one point without gas has no oxygen field.
    runs.append(["sweep", ["sweep", str(pilot), "--vary", "operation.speed=150:250:2:rpm", "--no-biomass"]])
    runs.append(["sweep-no-gas", ["sweep", str(pilot), "--vary", "operation.gas_flow=0:1:2:vvm", "--no-biomass"]])
    trace = source / "cases" / "gassing-out-pilot.csv"
    for lag in ("auto", "none", "8 s"):
        runs.append([f"kla-fit-{lag.replace(' ', '')}", ["kla-fit", str(trace), "--probe-lag", lag]])
    runs.append(["calibrate", ["calibrate", str(pilot), "--kla-data", str(source / "cases" / "pilot-300L-calib-kla.csv"),
                               "--mixing-data", str(source / "cases" / "pilot-300L-calib-mixing.csv")]])
    problems = []
    for name, args in runs:
        out = work / name
        stdout = run(exe, args + ["--out", str(out)], work)
        scan_text(pathlib.Path(f"<{name} terminal>"), stdout, problems)
        scan_folder(out, problems)
    for p in problems:
        print(p)
    print(f"no_nan_outputs: {len(runs)} runs, {len(problems)} problem(s)")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
