#!/usr/bin/python3
"""Golden results: runs `oxystrat run` on every bundled case and compares the headline numbers
of /summary with cases/expected/NAME.toml, so that a change of numbers is always a visible,
deliberate change (regenerate with --update and say why in the commit).

Usage: golden.py OXYSTRAT_EXE SOURCE_DIR WORK_DIR [--update]

Tolerance: relative 1e-6 (absolute 1e-9 in the value's SI unit near zero). The steady solve stops
at a scaled residual of 1e-12 and the mixing time is found on a fixed step, so compilers, libm
versions and thread counts move these numbers by round-off (1e-10 and below); any model or
numerics change moves them by far more than 1e-6.
"""
import pathlib
import shutil
import subprocess
import sys
import tomllib

import h5py

QUANTITIES = [
    "do_min", "do_mean", "volume_fraction_below_critical", "max_biomass", "max_biomass_single_zone",
    "theta95", "power_gassed", "power_ungassed", "kla_mean", "kla_single_zone", "otr_total",
    "offgas_y_o2", "pco2_max", "cstar_bottom", "cstar_top",
]
REL_TOL, ABS_TOL = 1e-6, 1e-9


def summary(exe, case, out):
    shutil.rmtree(out, ignore_errors=True)
    subprocess.run([exe, "run", str(case), "--out", str(out)], check=True, capture_output=True, text=True)
    with h5py.File(out / "result.h5") as f:
        s = f["summary"]
        return {q: (float(s[q][()]), s[q].attrs["units"].decode() if isinstance(s[q].attrs["units"], bytes)
                    else str(s[q].attrs["units"])) for q in QUANTITIES if q in s}


def write_expected(path, case, values):
    lines = [f"# Golden results of `oxystrat run cases/{case.name}` (tests/scripts/golden.py).",
             "# Regenerate with `golden.py EXE SOURCE_DIR WORK --update` only for a deliberate change of",
             "# numbers, and say in the commit which change moved them and why. Values in SI.", "[summary]"]
    for q, (v, unit) in values.items():
        lines.append(f"{q} = {v!r}  # [{unit}]")
    path.write_text("\n".join(lines) + "\n")


def main():
    exe, source, work = sys.argv[1], pathlib.Path(sys.argv[2]), pathlib.Path(sys.argv[3])
    update = "--update" in sys.argv[4:]
    work.mkdir(parents=True, exist_ok=True)
    failures = []
    for case in sorted((source / "cases").glob("*.toml")):
        values = summary(exe, case, work / case.stem)
        expected_file = source / "cases" / "expected" / f"{case.stem}.toml"
        if update:
            write_expected(expected_file, case, values)
            print(f"wrote {expected_file}")
            continue
        if not expected_file.exists():
            failures.append(f"{case.name}: no golden file {expected_file}")
            continue
        expected = tomllib.loads(expected_file.read_text())["summary"]
        for q, want in expected.items():
            if q not in values:
                failures.append(f"{case.name}: /summary/{q} is missing")
                continue
            got, unit = values[q]
            ok = abs(got - want) <= max(REL_TOL * abs(want), ABS_TOL)
            print(f"{'ok  ' if ok else 'FAIL'} {case.stem}: {q} = {got:.10g} {unit} (expected {want:.10g})")
            if not ok:
                failures.append(f"{case.name}: {q} = {got!r}, expected {want!r}")
    for f in failures:
        print("FAIL", f)
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
