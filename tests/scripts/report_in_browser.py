#!/usr/bin/python3
"""Renders every kind of oxystrat HTML report in headless Chromium (Debian's `chromium`) and fails when
a report does not load cleanly or a figure is broken. For each report, from the bundled cases on a coarse
grid:
  - the page loads with no console errors, and every inline SVG is well-formed XML and in the DOM;
  - every figure has data marks: its <g class="data"> group holds at least one shape with a visible box
    (an empty plot, or one whose data are all off-scale or NaN, has none);
  - no two <text> boxes of one figure overlap (tick labels, legend, marker labels, titles), measured by
    the browser itself with getBoundingClientRect, and no text leaves its figure;
  - the report opens with its verdict (the .verdict box comes before the first figure) where one applies.
Usage: report_in_browser.py OXYSTRAT_EXE SOURCE_DIR WORK_DIR [SCREENSHOT_DIR]. Exit 77 (skipped) without
chromium. With SCREENSHOT_DIR, also saves the first screen of each report there as NAME.png."""
import json
import os
import re
import shutil
import subprocess
import sys
import xml.etree.ElementTree as ET

exe, source, work = sys.argv[1:4]
shots = sys.argv[4] if len(sys.argv) > 4 else None
browser = shutil.which("chromium")
if browser is None:
    print("chromium not installed: skipped")
    sys.exit(77)
shutil.rmtree(work, ignore_errors=True)
os.makedirs(work)
cases = f"{source}/cases"
small = ["--set", "grid.radial=5", "--set", "grid.axial=14"]
# name: (command, opens with a verdict)
runs = {
    "run": ([exe, "run", f"{cases}/tall-3rushton.toml", "--uncertainty", "8", "--no-levers"] + small, True),
    "run-cell-culture": ([exe, "run", f"{cases}/cell-culture-2m3.toml"] + small, True),
    "compare": ([exe, "compare", f"{cases}/tall-3rushton.toml", f"{cases}/pilot-300L.toml", "--no-mixing"] + small, True),
    "sweep": ([exe, "sweep", f"{cases}/pilot-300L.toml", "--vary", "operation.speed=300:500:3"] + small, True),
    "levers": ([exe, "levers", f"{cases}/tall-3rushton.toml"] + small, True),
    "scale-up": ([exe, "scale-up", f"{cases}/pilot-300L.toml", f"{cases}/tall-3rushton.toml"] + small, True),
    "mixing": ([exe, "mixing", f"{cases}/tall-3rushton.toml"] + small, True),
    "transient": ([exe, "transient", f"{cases}/fedbatch-60m3.toml", "--duration", "10 min"] + small, True),
    "lifelines": ([exe, "lifelines", f"{cases}/fedbatch-60m3.toml", "--after", "10 min", "--cells", "50", "--duration",
                   "2 min"] + small, False),
    "calibrate": ([exe, "calibrate", f"{cases}/pilot-300L.toml", "--kla-data", f"{cases}/pilot-300L-calib-kla.csv"], False),
    "kla-fit": ([exe, "kla-fit", f"{cases}/gassing-out-pilot.csv"], False),
    "validate": ([exe, "validate"], True),
}

# Runs in the page after layout; writes what it measured as JSON into <pre id="oxystrat-check">.
CHECK_JS = r"""
<script>
(function () {
  const out = {figures: 0, empty: [], overlaps: [], outside: [], verdict_first: false};
  const svgs = Array.from(document.querySelectorAll('svg'));
  out.figures = svgs.length;
  const verdict = document.querySelector('.verdict');
  out.verdict_first = !!verdict && (svgs.length === 0 ||
      (verdict.compareDocumentPosition(svgs[0]) & Node.DOCUMENT_POSITION_FOLLOWING) !== 0);
  svgs.forEach((svg, i) => {
    const title = (svg.querySelector('text') || {textContent: '#' + i}).textContent;
    const shapes = Array.from(svg.querySelectorAll('g.data polyline, g.data rect, g.data circle, g.data polygon, g.data path'))
        .filter(e => { const b = e.getBoundingClientRect(); return b.width + b.height > 0.5 &&
                       (e.tagName !== 'polyline' || (e.getAttribute('points') || '').trim().split(/\s+/).length >= 2); });
    if (shapes.length === 0) out.empty.push(title);
    const frame = svg.getBoundingClientRect();
    const boxes = Array.from(svg.querySelectorAll('text')).filter(t => t.textContent.trim() !== '')
        .map(t => ({text: t.textContent, b: t.getBoundingClientRect()}));
    boxes.forEach(a => {
      if (a.b.left < frame.left - 1 || a.b.right > frame.right + 1 || a.b.top < frame.top - 1 || a.b.bottom > frame.bottom + 1)
        out.outside.push(title + ': "' + a.text + '"');
    });
    // Glyph boxes include the line's ascent and descent: a few px of vertical overlap between
    // neighbouring lines is normal, so overlap counts when both directions exceed a small margin.
    for (let p = 0; p < boxes.length; ++p) for (let q = p + 1; q < boxes.length; ++q) {
      const a = boxes[p].b, b = boxes[q].b;
      const w = Math.min(a.right, b.right) - Math.max(a.left, b.left);
      const h = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
      if (w > 1 && h > 4) out.overlaps.push(title + ': "' + boxes[p].text + '" / "' + boxes[q].text + '"');
    }
  });
  const pre = document.createElement('pre');
  pre.id = 'oxystrat-check';
  pre.textContent = JSON.stringify(out);
  document.body.appendChild(pre);
})();
</script>
"""

flags = [browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync", "--hide-scrollbars",
         f"--user-data-dir={work}/profile", "--window-size=1400,1400"]


def measure(page_html, path):
    """Renders page_html with CHECK_JS; returns (what it measured or None, console errors, browser exit code)."""
    with open(path, "w", encoding="utf-8") as f:
        f.write(page_html.replace("</body>", CHECK_JS + "</body>"))
    dom = subprocess.run(flags + ["--enable-logging=stderr", "--v=0", "--dump-dom", f"file://{path}"],
                         capture_output=True, text=True, timeout=120)
    console_errors = [l for l in dom.stderr.splitlines() if "CONSOLE" in l or "Uncaught" in l]
    found = re.search(r'<pre id="oxystrat-check">(.*?)</pre>', dom.stdout, flags=re.S)
    if found is None:
        return None, console_errors, dom.returncode
    text = found.group(1).replace("&quot;", '"').replace("&lt;", "<").replace("&gt;", ">").replace("&amp;", "&")
    return json.loads(text), console_errors, dom.returncode


# The checker itself first: a figure with two labels on top of each other, one off the figure and no
# data must be caught, or every report below would pass for the wrong reason.
bad = ('<!DOCTYPE html><html><body><svg xmlns="http://www.w3.org/2000/svg" width="200" height="100" font-size="11">'
       '<text x="10" y="20">0.100</text><text x="14" y="22">0.125</text><text x="190" y="50">beyond the edge</text>'
       '<g class="data"><polyline points="5,5"/></g></svg></body></html>')
seen, _, _ = measure(bad, f"{work}/self-check.html")
if seen is None or not seen["overlaps"] or not seen["outside"] or not seen["empty"]:
    print(f"FAIL the checker misses a known-bad figure: {seen}")
    sys.exit(1)

failures = []
for name, (cmd, has_verdict) in runs.items():
    out_dir = f"{work}/{name}"
    proc = subprocess.run(cmd + ["--out", out_dir], capture_output=True, text=True)
    if proc.returncode != 0:
        failures.append(name)
        print(f"FAIL {name}: exit {proc.returncode}: {proc.stderr.strip()}")
        continue
    page = f"{out_dir}/report.html"
    if not os.path.isfile(page):
        failures.append(name)
        print(f"FAIL {name}: no report.html")
        continue
    html = open(page, encoding="utf-8").read()
    svgs = re.findall(r"<svg.*?</svg>", html, flags=re.S)
    problems = []
    for s in svgs:
        try:
            ET.fromstring(s)
        except ET.ParseError as e:
            problems.append(f"malformed SVG: {e}")
    result, console_errors, code = measure(html, f"{out_dir}/checked.html")
    if result is None:
        problems.append(f"the browser did not render the page (exit {code})")
        result = {"figures": 0, "empty": [], "overlaps": [], "outside": [], "verdict_first": False}
    problems += [f"console: {l}" for l in console_errors]
    if len(svgs) == 0:
        problems.append("no figure at all")
    if result["figures"] != len(svgs):
        problems.append(f"{len(svgs)} SVG figures in the file, {result['figures']} in the rendered DOM")
    problems += [f"empty plot: {t}" for t in result["empty"]]
    problems += [f"overlapping text: {t}" for t in result["overlaps"]]
    problems += [f"text outside its figure: {t}" for t in result["outside"]]
    if has_verdict and not result["verdict_first"]:
        problems.append("the verdict does not come first")
    if shots:
        os.makedirs(shots, exist_ok=True)
        subprocess.run(flags + [f"--screenshot={os.path.abspath(shots)}/{name}.png", f"file://{page}"],
                       capture_output=True, timeout=120)
    if problems:
        print(f"FAIL {name}:")
    else:
        print(f"ok   {name}: {len(svgs)} figures, all with data marks, no overlapping text")
    for p in problems[:20]:
        print("    " + p)
    if problems:
        failures.append(name)
shutil.rmtree(work, ignore_errors=True)
print(f"{len(runs) - len(failures)} passed, {len(failures)} failed" + (f": {', '.join(failures)}" if failures else ""))
sys.exit(1 if failures else 0)
