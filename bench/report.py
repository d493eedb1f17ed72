#!/usr/bin/python3
"""Turns the JSON written by bench/run into the table of figures against targets (printed) and
bench/RESULTS.md (machine facts, the table, the linear-solver comparison, then bench/notes.md).

    report.py RESULTS_DIR RESULTS_MD COMMAND
"""
import json
import math
import os
import platform
import re
import subprocess
import sys
import time


def load(path):
    try:
        with open(path) as f:
            return json.load(f)
    except (OSError, ValueError):
        return None


def benchmarks(out, name):
    data = load(os.path.join(out, name + ".json"))
    return [] if data is None else [b for b in data["benchmarks"] if b.get("run_type", "iteration") == "iteration"]


def seconds(b):
    scale = {"ns": 1e-9, "us": 1e-6, "ms": 1e-3, "s": 1.0}[b["time_unit"]]
    return b["real_time"] * scale


def find(bs, pattern):
    for b in bs:
        if re.search(pattern, b["name"]):
            return b
    return None


def median(bs, pattern):
    """The median of the repeated runs matching pattern (bench/run repeats the short benchmarks:
    single runs on this shared virtual machine vary by up to 25 %), and how many there were."""
    runs = sorted((b for b in bs if re.search(pattern, b["name"])), key=seconds)
    return (runs[len(runs) // 2], len(runs)) if runs else (None, 0)


def of_runs(n):
    return f", median of {n} runs" if n > 1 else ""


def sh(cmd):
    try:
        return subprocess.run(cmd, shell=True, capture_output=True, text=True, timeout=30).stdout.strip()
    except (OSError, subprocess.SubprocessError):
        return ""


def machine():
    lscpu = sh("lscpu")
    def field(name):
        m = re.search(r"^" + re.escape(name) + r":\s*(.+)$", lscpu, re.M)
        return m.group(1).strip() if m else "?"
    mem = sh("awk '/MemTotal/ {printf \"%.1f GiB\", $2/1048576}' /proc/meminfo")
    os_name = sh(". /etc/os-release && echo \"$PRETTY_NAME\"")
    return [
        ("cores (nproc)", sh("nproc")),
        ("CPU (lscpu)", f"{field('Model name')}, {field('CPU(s)')} CPU(s), {field('Thread(s) per core')} thread(s) per core"),
        ("caches (lscpu)", f"L1d {field('L1d cache')}, L2 {field('L2 cache')}, L3 {field('L3 cache')}"),
        ("memory", mem),
        ("system", f"{os_name}, {platform.machine()}, kernel {platform.release()}"),
        ("compiler", sh("c++ --version | head -1")),
        ("commit", sh("git -C '%s' rev-parse --short HEAD" % os.path.dirname(os.path.abspath(__file__)))),
        ("date", time.strftime("%Y-%m-%d %H:%M %Z")),
    ]


def fit_exponent(points):
    """Least-squares slope of log(time) against log(zones)."""
    xs = [math.log(z) for z, _ in points]
    ys = [math.log(t) for _, t in points]
    mx, my = sum(xs) / len(xs), sum(ys) / len(ys)
    sxx = sum((x - mx) ** 2 for x in xs)
    return sum((x - mx) * (y - my) for x, y in zip(xs, ys)) / sxx if sxx > 0 else float("nan")


def verdict(ok):
    return "n/a" if ok is None else ("met" if ok else "**missed**")


def main():
    out, md_path, command = sys.argv[1], sys.argv[2], sys.argv[3]
    rows = []  # (figure, measured, target, verdict, command)
    steady = benchmarks(out, "steady")
    b, n = median(steady, r"^BM_NetworkBuild/")
    if b:
        t = seconds(b) * 1e3
        rows.append((f"network build (geometry + hydrodynamics + gas routing), {b['zones']:.0f} zones{of_runs(n)}",
                     f"{t:.3g} ms", "< 5 ms", verdict(t < 5), "bench_steady --benchmark_filter=BM_NetworkBuild"))
    b, n = median(steady, r"^BM_SteadySolve/2000/")
    if b:
        t = seconds(b) * 1e3
        rows.append((f"steady O2/CO2 solve, {b['zones']:.0f} zones ({b['newton']:.0f} Newton steps, {b.get('linear', 0):.0f} "
                     f"Krylov iterations, {b['outer']:.0f} outer{of_runs(n)})",
                     f"{t:.3g} ms", "< 20 ms", verdict(t < 20), "bench_steady --benchmark_filter=BM_SteadySolve/"))
    b, n = median(steady, r"^BM_SteadySolve/500/")
    if b:
        rows.append((f"steady O2/CO2 solve, {b['zones']:.0f} zones ({b['newton']:.0f} Newton steps, {b.get('linear', 0):.0f} "
                     f"Krylov iterations{of_runs(n)})", f"{seconds(b) * 1e3:.3g} ms", "", "", "bench_steady --benchmark_filter=BM_SteadySolve/"))
    b = find(steady, r"^BM_SteadySolveGeneralLu/")
    if b:
        rows.append((f"steady solve with the general sparse LU of the whole Jacobian (previous solver), {b['zones']:.0f} zones "
                     f"({b['newton']:.0f} Newton steps)", f"{seconds(b) * 1e3:.3g} ms", "", "",
                     "bench_steady --benchmark_filter=BM_SteadySolveGeneralLu"))
    scaling = [(bb["zones"], seconds(bb)) for bb in benchmarks(out, "scaling")]
    scaling_rows = []
    if len(scaling) >= 2:
        k = fit_exponent(scaling)
        lo, hi = min(z for z, _ in scaling), max(z for z, _ in scaling)
        rows.append((f"steady solve cost growth, {lo:.3g} to {hi:.3g} zones (fitted exponent k in N^k)",
                     f"k = {k:.2f}", "k <= 1.2", verdict(k <= 1.2), "bench_steady --benchmark_filter=BM_SteadySolveScaling"))
        scaling_rows = [f"| {bb['zones']:.0f} | {seconds(bb):.3g} | {bb.get('newton', 0):.0f} | {bb.get('linear', 0):.0f} |"
                        for bb in benchmarks(out, "scaling")]
    huge = benchmarks(out, "huge")
    if huge:
        # Repeated runs (bench/run --huge asks for three): the median is the figure. On a virtual
        # machine the first touch of fresh memory costs what the host makes it cost, which varies
        # by seconds between runs minutes apart; the spread is shown beside the median.
        ordered = sorted(huge, key=seconds)
        hb = ordered[len(ordered) // 2]
        runs = "" if len(ordered) < 2 else f" (median of {len(ordered)} runs: " + ", ".join(f"{seconds(b):.3g}" for b in ordered) + " s)"
        peak, peak_gib = "", None
        tv = os.path.join(out, "huge.time")
        if os.path.exists(tv):
            m = re.search(r"Maximum resident set size \(kbytes\): (\d+)", open(tv).read())
            if m:
                peak_gib = int(m.group(1)) / 1048576
                peak = f", peak memory {peak_gib:.1f} GiB"
        ok = seconds(hb) < 10 and peak_gib is not None and peak_gib * 1.073741824 < 2  # GiB -> GB
        rows.append((f"steady solve, {hb['zones']:.3g} zones{runs}", f"{seconds(hb):.4g} s{peak}", "< 10 s and < 2 GB peak",
                     verdict(ok), "bench_steady --huge --benchmark_filter=BM_SteadySolveHuge"))
    elif os.path.exists(os.path.join(out, "huge.failed")):
        why = open(os.path.join(out, "huge.failed")).read()
        what = "std::bad_alloc" if "bad_alloc" in why else ("timed out" if why.startswith("exit 124") else why.strip()[:80])
        tv = os.path.join(out, "huge.time")
        facts = ""
        if os.path.exists(tv):
            t = open(tv).read()
            m = re.search(r"Maximum resident set size \(kbytes\): (\d+)", t)
            e = re.search(r"Elapsed \(wall clock\) time \(h:mm:ss or m:ss\): (\S+)", t)
            facts = f" after {e.group(1) if e else '?'} (m:ss), {int(m.group(1)) / 1048576:.1f} GiB resident" if m else ""
        rows.append(("steady solve, 1e6 zones (address space capped at 16 GiB, 30 min)", f"failed: {what}{facts}",
                     "(fits in memory and time)", "**missed**", "bench/run --huge"))
    sweep = benchmarks(out, "sweep")
    (s1, n1), (s2, n2) = median(sweep, r"BM_Sweep/1/"), median(sweep, r"BM_Sweep/2/")
    if s1 and s2:
        r1, r2 = s1["items_per_second"], s2["items_per_second"]
        rows.append((f"sweep throughput, 476-zone cases, 1 thread{of_runs(n1)}", f"{r1:.3g} cases/s", "", "", "bench_sweep"))
        rows.append((f"sweep throughput, 476-zone cases, 2 threads{of_runs(n2)}", f"{r2:.3g} cases/s", ">= 500 cases/s", verdict(r2 >= 500),
                     "bench_sweep"))
        rows.append(("sweep speed-up, 2 threads over 1", f"{r2 / r1:.2f}x", ">= 1.7x", verdict(r2 / r1 >= 1.7), "bench_sweep"))
    mix = benchmarks(out, "mixing")
    if mix:
        mb = mix[0]
        t = seconds(mb)
        rows.append((f"theta95 of cases/tall-3rushton.toml ({mb['zones']:.0f} zones; theta95 = {mb['theta95_s']:.1f} s)",
                     f"{t:.3g} s", "< 0.5 s", verdict(t < 0.5), "bench_mixing"))
    lives = benchmarks(out, "lifelines")
    for cells, threads in ((10000, 1), (10000, 2), (100000, 2)):
        runs = sorted((b for b in lives if re.search(rf"BM_LifelinesDemoHour/{cells}/{threads}/", b["name"])), key=seconds)
        if not runs:
            continue
        lb = runs[len(runs) // 2]  # the median of the repeated runs
        t = seconds(lb)
        spread = "" if len(runs) < 2 else f", median of {len(runs)} runs: " + ", ".join(f"{seconds(b):.3g}" for b in runs) + " s"
        target = cells == 100000 and threads == 2
        rows.append((f"{cells:.0e} lifelines x 1 h on the demo ({lb['zones']:.0f} zones), {threads} thread(s); "
                     f"{lb['moves']:.3g} moves, {lb['ns_per_move']:.2g} ns per move of wall time{spread}",
                     f"{t:.3g} s", "< 5 s" if target else "", verdict(t < 5.0) if target else "", "bench_lifelines"))
    peers = []
    for name in sorted(os.listdir(out)):
        m = re.match(r"peer-(\d+)-scipy\.json$", name)
        if not m:
            continue
        n = m.group(1)
        py, ox = load(os.path.join(out, name)), load(os.path.join(out, f"peer-{n}-oxystrat.json"))
        proc = load(os.path.join(out, f"peer-{n}-process.json")) or {}
        if py and ox:
            peers.append((int(n), py, ox, proc))
    for n, py, ox, proc in sorted(peers):
        z = ox["zones"]
        rows.append((f"SciPy peer vs oxystrat, {z} zones: DO agreement (max abs difference / max DO)",
                     f"{py['do_max_rel_diff_of_max']:.2g}", "within the Newton tolerance", verdict(py["converged"] and py["do_max_rel_diff_of_max"] < 1e-9),
                     "bench/peer/steady_o2.py"))
        ratio = py["file_to_field_s"] / ox["chain_s"]
        rows.append((f"SciPy peer vs oxystrat, {z} zones: end-to-end time ratio (peer file to DO field "
                     f"{py['file_to_field_s']:.3g} s / oxystrat case to DO field {ox['chain_s']:.3g} s)",
                     f"{ratio:.2f}x", ">= 20x", verdict(ratio >= 20), "bench/run (export_peer --time, steady_o2.py)"))
        inner = py["newton_s"] / ox["inner_newton_s"]
        rows.append((f"SciPy peer vs oxystrat, {z} zones: same inner Newton, same start ({py['iterations']} vs "
                     f"{ox['inner_iterations']} steps; {py['newton_s']:.3g} s / {ox['inner_newton_s']:.3g} s)",
                     f"{inner:.2f}x", "", "", "export_peer --time"))
        if "process_s" in proc:
            rows.append((f"SciPy peer, {z} zones: whole process incl. interpreter and imports", f"{proc['process_s']:.3g} s",
                         "", "", "steady_o2.py"))

    linear = benchmarks(out, "linear")
    linear_rows = []
    for lb in linear:
        if lb.get("error_occurred"):
            linear_rows.append(f"| `{lb['name']}` | | failed | {lb.get('error_message', '')} |")
            continue
        extra = ", ".join(f"{k} {lb[k]:.3g}" for k in ("nnz_A", "nnz_LU", "krylov_iterations") if k in lb)
        linear_rows.append(f"| `{lb['name']}` | {lb['zones']:.0f} | {seconds(lb) * 1e3:.3g} ms | {extra} |")

    context = (load(os.path.join(out, "steady.json")) or {}).get("context", {})
    load_avg = context.get("load_avg")
    lines = ["# Benchmark results", "",
             "Written by `bench/run` (do not edit by hand; the discussion is in `bench/notes.md`, appended below).", "",
             "## Machine", "", "| fact | value |", "|---|---|"]
    lines += [f"| {k} | {v} |" for k, v in machine()]
    if load_avg:
        lines.append(f"| load average at start | {', '.join(f'{x:.2f}' for x in load_avg)} |")
    lines.append(f"| Google Benchmark library | {context.get('library_build_type', '?')} build as packaged by Debian |")
    lines += ["", f"Command: `{command}` (benchmark programs in `build/bench/`). Times are wall-clock (`UseRealTime`).", "",
              "## Figures against targets", "", "| figure | measured | target | verdict | command |", "|---|---|---|---|---|"]
    lines += [f"| {a} | {b} | {c} | {d} | `{e}` |" for a, b, c, d, e in rows]
    if scaling_rows:
        lines += ["", "### Steady solve against network size", "", "| zones | seconds | Newton steps | Krylov iterations |",
                  "|---|---|---|---|"] + scaling_rows
    if linear_rows:
        lines += ["", "### One Newton step's linear solve (Jacobian at the converged demo field)", "",
                  "| solver | zones | time | sizes |", "|---|---|---|---|"] + linear_rows
    notes = os.path.join(os.path.dirname(os.path.abspath(__file__)), "notes.md")
    if os.path.exists(notes):
        lines += ["", open(notes).read().rstrip()]
    with open(md_path, "w") as f:
        f.write("\n".join(lines) + "\n")

    width = max(len(r[0]) for r in rows) if rows else 10
    print()
    print(f"{'figure':<{width}}  {'measured':>22}  {'target':>28}  verdict")
    for a, b, c, d, _ in rows:
        print(f"{a:<{width}}  {b:>22}  {c:>28}  {d.replace('*', '')}")
    print(f"\nwrote {md_path}")


if __name__ == "__main__":
    main()
