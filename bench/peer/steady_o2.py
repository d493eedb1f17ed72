#!/usr/bin/python3
"""An independent peer of oxystrat's steady O2/CO2 zone balances, in plain NumPy/SciPy.

It reads an `oxystrat run` result.h5 (faces, face flows and exchange, zone volumes, sparger shares,
kLa, and the DO/CO2 answer to compare with) plus the bench-only export of what result.h5 does not
hold (PEER_H5 from bench/export_peer: C* per unit mole fraction, inert gas, the gas transport
matrix, inlet flows, uptake constants), builds the same four balances per zone

    liquid O2   L c + T (K y - c) - OUR(c) V = 0
    liquid CO2  L d + S (Q x - d) + RQ OUR(c) V = 0
    gas O2      n_O2,in + G g_O2 - T (K y - c) = 0
    gas CO2     n_CO2,in + G g_CO2 - S (Q x - d) = 0

(L: upwind convection plus turbulent exchange on the faces; G: the gas's drift-flux transport; y,
x: O2 and CO2 fractions of the dry gas the zone holds) and solves them with its own damped Newton (Armijo backtracking on the scaled
2-norm, scipy.sparse.linalg.splu for the steps), from the same cold start as bench/export_peer.
The unknowns are stored in blocks (all c, all d, all g_O2, all g_CO2), not interleaved as in
oxystrat. Prints one JSON line: times, iterations, and the agreement of the DO and CO2 fields.

    steady_o2.py RESULT_H5 PEER_H5
"""
import json
import sys
import time

T_START = time.perf_counter()
import h5py  # noqa: E402
import numpy as np  # noqa: E402
import scipy.sparse as sp  # noqa: E402
import scipy.sparse.linalg as spla  # noqa: E402

T_IMPORTED = time.perf_counter()


def read(result_path, peer_path):
    with h5py.File(result_path, "r") as f, h5py.File(peer_path, "r") as g:
        net = {
            "a": f["/faces/zone_a"][:], "b": f["/faces/zone_b"][:],
            "flow": f["/faces/flow"][:], "exchange": f["/faces/exchange"][:],
            "volume": f["/zones/volume"][:], "sparger_share": f["/zones/sparger_share"][:],
            "kla": f["/fields/kla"][:],
            "do": f["/fields/do"][:], "co2": f["/fields/co2"][:],
        }
        for k in ("cstar_per_y_o2", "cstar_per_y_co2", "inert_gas", "gas_row", "gas_col", "gas_value"):
            net[k] = g["/peer/" + k][:]
        for k in ("kla_co2_ratio", "inlet_o2", "inlet_co2", "inlet_o2_fraction", "inlet_co2_fraction",
                  "uptake_rate", "k_o2", "rq"):
            net[k] = float(g["/peer/" + k][()])
    return net


class Balances:
    def __init__(self, net):
        n = net["volume"].size
        self.n = n
        a, b, q, e = net["a"], net["b"], net["flow"], net["exchange"]
        from_a = np.where(q > 0.0, q, 0.0) + e   # leaves a with a's concentration
        from_b = np.where(q < 0.0, -q, 0.0) + e
        rows = np.concatenate([a, b, b, a])
        cols = np.concatenate([a, a, b, b])
        vals = np.concatenate([-from_a, from_a, -from_b, from_b])
        self.L = sp.csr_matrix((vals, (rows, cols)), shape=(n, n))
        self.G = sp.csr_matrix((net["gas_value"], (net["gas_row"], net["gas_col"])), shape=(n, n))
        self.V = net["volume"]
        self.T = net["kla"] * self.V
        self.S = net["kla_co2_ratio"] * self.T
        self.K = net["cstar_per_y_o2"]
        self.Q = net["cstar_per_y_co2"]
        self.inert = net["inert_gas"]
        self.in_o = net["inlet_o2"] * net["sparger_share"]
        self.in_c = net["inlet_co2"] * net["sparger_share"]
        self.rate = net["uptake_rate"]
        self.k = max(net["k_o2"], 1e-9)   # the same floor as oxystrat's Uptake
        self.rq = net["rq"]
        self.scale = max(net["inlet_o2"], self.rate * self.V.sum(), 1e-300)
        self.eye = sp.identity(n, format="csr")

    def our(self, c):
        return np.where(c >= 0.0, self.rate * c / (self.k + np.maximum(c, 0.0)), self.rate * c / self.k)

    def dour(self, c):
        cp = np.maximum(c, 0.0)
        return np.where(c >= 0.0, self.rate * self.k / (self.k + cp) ** 2, self.rate / self.k)

    def split(self, x):
        n = self.n
        return x[:n], x[n:2 * n], x[2 * n:3 * n], x[3 * n:]

    def fractions(self, no, nc):
        total = no + nc + self.inert
        safe = np.where(total > 0.0, total, 1.0)
        y = np.where(total > 0.0, no / safe, 0.0)
        yc = np.where(total > 0.0, nc / safe, 0.0)
        return total, safe, y, yc

    def residual(self, x):
        c, d, no, nc = self.split(x)
        _, _, y, yc = self.fractions(no, nc)
        otr = self.T * (self.K * y - c)
        ctr = self.S * (self.Q * yc - d)
        our = self.our(c) * self.V
        return np.concatenate([
            self.L @ c + otr - our,
            self.L @ d + ctr + self.rq * our,
            self.in_o + self.G @ no - otr,
            self.in_c + self.G @ nc - ctr,
        ])

    def jacobian(self, x):
        c, d, no, nc = self.split(x)
        total, safe, _, _ = self.fractions(no, nc)
        t2 = safe * safe
        live = total > 0.0
        dy_dno = np.where(live, (total - no) / t2, 0.0)
        dy_dnc = np.where(live, -no / t2, 0.0)
        dyc_dnc = np.where(live, (total - nc) / t2, 0.0)
        dyc_dno = np.where(live, -nc / t2, 0.0)
        dour = self.dour(c) * self.V
        D = sp.diags
        otr_no, otr_nc = self.T * self.K * dy_dno, self.T * self.K * dy_dnc
        ctr_nc, ctr_no = self.S * self.Q * dyc_dnc, self.S * self.Q * dyc_dno
        return sp.bmat([
            [self.L + D(-self.T - dour), None, D(otr_no), D(otr_nc)],
            [D(self.rq * dour), self.L + D(-self.S), D(ctr_no), D(ctr_nc)],
            [D(self.T), None, self.G - D(otr_no), D(-otr_nc)],
            [None, D(self.S), D(-ctr_no), self.G - D(ctr_nc)],
        ], format="csc")

    def cold_start(self, net):
        # Gas carried by the gas transport untouched: G g = -n_in.
        a = self.G.tocsc()
        no = spla.spsolve(a, -self.in_o)
        nc = spla.spsolve(a, -self.in_c)
        c = 0.5 * self.K * net["inlet_o2_fraction"]
        d = self.Q * net["inlet_co2_fraction"]
        return np.concatenate([c, d, no, nc])


def newton(p, x, tol=1e-12, max_iter=60):
    r = p.residual(x)
    m = float(np.sum((r / p.scale) ** 2))
    for it in range(max_iter):
        res = float(np.max(np.abs(r)) / p.scale)
        if res < tol:
            return x, it, res, True
        dx = spla.splu(p.jacobian(x)).solve(-r)
        lam, accepted = 1.0, None
        for _ in range(40):
            xt = x + lam * dx
            rt = p.residual(xt)
            mt = float(np.sum((rt / p.scale) ** 2)) if np.all(np.isfinite(rt)) else np.inf
            if mt < (1.0 - 1e-4 * lam) * m:
                accepted = (xt, rt, mt)
                break
            lam *= 0.5
        if accepted is None:
            return x, it, res, False
        x, r, m = accepted
    res = float(np.max(np.abs(r)) / p.scale)
    return x, max_iter, res, res < tol


def main():
    if len(sys.argv) != 3:
        sys.exit("usage: steady_o2.py RESULT_H5 PEER_H5")
    t0 = time.perf_counter()
    net = read(sys.argv[1], sys.argv[2])
    t1 = time.perf_counter()
    p = Balances(net)
    x0 = p.cold_start(net)
    t2 = time.perf_counter()
    x, iterations, res, converged = newton(p, x0)
    t3 = time.perf_counter()
    c, d, _, _ = p.split(x)
    ref, ref_co2 = net["do"], net["co2"]
    print(json.dumps({
        "zones": int(p.n), "converged": bool(converged), "iterations": iterations, "scaled_residual": res,
        "import_s": T_IMPORTED - T_START, "read_s": t1 - t0, "assemble_s": t2 - t1, "newton_s": t3 - t2,
        "file_to_field_s": t3 - t0,
        "do_max_abs_diff_mol_m3": float(np.max(np.abs(c - ref))),
        "do_max_rel_diff_of_max": float(np.max(np.abs(c - ref)) / np.max(np.abs(ref))),
        "do_min_peer": float(c.min()), "do_min_oxystrat": float(ref.min()),
        "co2_max_rel_diff_of_max": float(np.max(np.abs(d - ref_co2)) / np.max(np.abs(ref_co2))),
    }))
    return 0 if converged else 1


if __name__ == "__main__":
    sys.exit(main())
