#!/usr/bin/python3
"""Compares oxystrat's property functions, unit conversions and the main job's output with
independent, well-kept libraries (Debian packages):
  - TEOS-10 Gibbs SeaWater toolbox `gsw`: O2 solubility (Garcia & Gordon 1992 fit of Benson &
    Krause's data), in umol/kg, at practical salinity 0;
  - `iapws`: IAPWS-IF97 saturation pressure, latent heat and density of water;
  - `pint`: unit conversions.
Usage: reference_libraries.py PROPERTY_TABLE_EXE OXYSTRAT_EXE CASE_FILE WORK_DIR
"""
import shutil
import subprocess
import sys

import gsw
import h5py
import iapws
import pint

failures = []


def check(what, ours, ref, rel_tol):
    err = abs(ours - ref) / abs(ref)
    ok = err <= rel_tol
    print(f"{'ok  ' if ok else 'FAIL'} {what}: ours {ours:.8g}, reference {ref:.8g}, rel. error {err:.2e} (tol {rel_tol:g})")
    if not ok:
        failures.append(what)


def water_density(t_k):
    return iapws.IAPWS97(T=t_k, P=0.101325).rho  # kg/m3 at 1 atm


def o2_saturation_gsw(t_k):
    # gsw gives umol per kg of water; times the water density gives mol/m3.
    return gsw.O2sol_SP_pt(0.0, t_k - 273.15) * 1e-6 * water_density(t_k)


def main():
    table_exe, oxystrat_exe, case_file, work = sys.argv[1:5]
    ureg = pint.UnitRegistry()
    out = subprocess.run([table_exe], check=True, capture_output=True, text=True).stdout
    for line in out.splitlines():
        if line.startswith("property,"):
            _, t, o2, pw = line.split(",")
            t, o2, pw = float(t), float(o2), float(pw)
            # Two fits of the same measurements (Benson & Krause 1984; Garcia & Gordon 1992): 0.05 %.
            check(f"O2 saturation at {t - 273.15:.0f} degC vs gsw", o2, o2_saturation_gsw(t), 5e-4)
            # The same IAPWS-IF97 equation: round-off only.
            check(f"water vapour pressure at {t - 273.15:.0f} degC vs iapws", pw, iapws.IAPWS97(T=t, x=0).P * 1e6, 1e-7)
        elif line.startswith("latent,"):
            _, t, latent = line.split(",")
            t, latent = float(t), float(latent)
            ref = (iapws.IAPWS97(T=t, x=1).h - iapws.IAPWS97(T=t, x=0).h) * 1e3  # kJ/kg -> J/kg
            # Our cubic fit of the IAPWS-IF97 saturation enthalpies, 0-80 degC (docs/method.md,
            # section 16): 1.4e-5 at worst with the rounded coefficients; 5e-5 allows for it.
            check(f"latent heat of water at {t - 273.15:.0f} degC vs iapws", latent, ref, 5e-5)
        elif line.startswith("unit,"):
            _, text, si = line.split(",")
            number, unit = text.split(" ", 1)
            # The plant spellings (psig, bara, kPag) as pint reads them: the unit and a gauge flag.
            for plain in ("psi", "bar", "kPa"):
                if unit in (plain + "a", plain + "g"):
                    unit = plain + ("(g)" if unit.endswith("g") else "(a)")
            gauge = unit.endswith("(g)")
            unit = unit.replace("(a)", "").replace("(g)", "").replace("degC", "degree_Celsius").replace("\u00b0C", "degree_Celsius")
            unit = {"mmol/g/h": "mmol/g/hour", "cP": "centipoise", "L": "liter", "rpm": "revolutions_per_minute",
                    "g/cm3": "g/cm**3",
                    "1/h": "1/hour", "L/h": "liter/hour", "m3/h": "m**3/hour", "g/g/h": "g/g/hour",
                    "m2": "m**2", "t/h": "tonne/hour", "kcal/mol": "kilocalorie/mol"}.get(unit, unit)
            q = ureg.Quantity(float(number), ureg(unit).units) if unit != "degree_Celsius" else ureg.Quantity(float(number), ureg.degC)
            ref = q.to_base_units().magnitude
            if "revolution" in unit:
                ref = q.to("revolution/second").magnitude  # rotational speed in 1/s
            if gauge:
                ref += 101325.0
            # Exact definitions on both sides: round-off only.
            check(f"unit '{text}' vs pint", float(si), ref, 1e-9)

    # The main job: every zone's C* must be Henry's law on gsw's solubility at the zone's own
    # pressure and gas composition (C* = C*_air,1atm y (p - p_w) / (0.20946 (1 atm - p_w))).
    shutil.rmtree(work, ignore_errors=True)
    subprocess.run([oxystrat_exe, "run", case_file, "--out", work], check=True, capture_output=True)
    with h5py.File(f"{work}/result.h5", "r") as h5:
        cstar = h5["/fields/cstar"][:]
        pressure = h5["/fields/pressure"][:]
        y_o2 = h5["/fields/y_o2"][:]
        holdup = h5["/fields/gas_holdup"][:]
        case_text = h5["/case/text"][()].decode()
        assert h5["/fields/cstar"].attrs["units"] == "mol/m3"
    temperature = None
    for line in case_text.splitlines():
        if line.strip().startswith("temperature"):
            temperature = float(line.split("=")[1].strip().strip("'\"").split()[0]) + 273.15
    pw = iapws.IAPWS97(T=temperature, x=0).P * 1e6
    sat = o2_saturation_gsw(temperature)
    worst = 0.0
    for k in range(len(cstar)):
        if holdup[k] <= 0.0:
            continue
        ref = sat * y_o2[k] * (pressure[k] - pw) / (0.20946 * (101325.0 - pw))
        worst = max(worst, abs(cstar[k] - ref) / ref)
    check("main job: largest C* deviation from gsw + Henry's law over gassed zones", 1.0 + worst, 1.0, 2e-3)
    shutil.rmtree(work, ignore_errors=True)
    if failures:
        print(f"{len(failures)} reference check(s) failed")
        return 1
    print("all reference checks passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
