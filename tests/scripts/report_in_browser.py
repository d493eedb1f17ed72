#!/usr/bin/python3
"""Opens oxystrat's HTML reports in headless Chromium (Debian's `chromium`) and checks that they
load with no console errors and show their figures; also that every inline SVG is well-formed XML.
Usage: report_in_browser.py OXYSTRAT_EXE SOURCE_DIR WORK_DIR. Exit 77 (skipped) without chromium."""
import re
import shutil
import subprocess
import sys
import xml.etree.ElementTree as ET

exe, source, work = sys.argv[1:4]
browser = shutil.which("chromium")
if browser is None:
    print("chromium not installed: skipped")
    sys.exit(77)
shutil.rmtree(work, ignore_errors=True)
small = ["--set", "grid.radial=5", "--set", "grid.axial=14"]
runs = {
    "run": [exe, "run", f"{source}/cases/tall-3rushton.toml", "--out", f"{work}/run"] + small,
    "compare": [exe, "compare", f"{source}/cases/tall-3rushton.toml", f"{source}/cases/pilot-300L.toml", "--out",
                f"{work}/compare", "--no-mixing"] + small,
    "sweep": [exe, "sweep", f"{source}/cases/pilot-300L.toml", "--vary", "operation.speed=300:500:3", "--out",
              f"{work}/sweep"] + small,
    "transient": [exe, "transient", f"{source}/cases/fedbatch-60m3.toml", "--duration", "10 min", "--out",
                  f"{work}/transient"] + small,
    "lifelines": [exe, "lifelines", f"{source}/cases/fedbatch-60m3.toml", "--after", "10 min", "--cells", "50",
                  "--duration", "2 min", "--out", f"{work}/lifelines"] + small,
    "calibrate": [exe, "calibrate", f"{source}/cases/pilot-300L.toml", "--kla-data",
                  f"{source}/cases/pilot-300L-calib-kla.csv", "--out", f"{work}/calibrate"],
}
failures = 0
for name, cmd in runs.items():
    subprocess.run(cmd, check=True, capture_output=True)
    page = f"{work}/{name}/report.html"
    html = open(page, encoding="utf-8").read()
    svgs = re.findall(r"<svg.*?</svg>", html, flags=re.S)
    for s in svgs:
        ET.fromstring(s)  # raises on malformed XML
    proc = subprocess.run(
        [browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         f"--user-data-dir={work}/profile", "--enable-logging=stderr", "--v=0", "--dump-dom", f"file://{page}"],
        capture_output=True, text=True, timeout=120)
    console_errors = [l for l in proc.stderr.splitlines() if "CONSOLE" in l or "Uncaught" in l]
    rendered_svgs = proc.stdout.count("<svg")
    ok = proc.returncode == 0 and not console_errors and rendered_svgs >= 2 and rendered_svgs == len(svgs)
    print(f"{'ok  ' if ok else 'FAIL'} {name}: {len(svgs)} well-formed SVG figures, {rendered_svgs} in the rendered DOM, "
          f"{len(console_errors)} console errors")
    for l in console_errors:
        print("   ", l)
    failures += 0 if ok else 1
shutil.rmtree(work, ignore_errors=True)
print("1 passed, 0 failed" if failures == 0 else f"0 passed, {failures} failed")
sys.exit(1 if failures else 0)
