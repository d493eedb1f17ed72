// Bench-only: writes what the SciPy peer (bench/peer/steady_o2.py) needs beyond an `oxystrat run`
// result.h5, without touching the public output. The case is re-read from /case/text and its
// network rebuilt (deterministic; the zone count is checked against /zones/volume); from the
// zone pressures and kLa in /fields it writes C* per unit mole fraction, inert gas, the gas
// transport matrix, inlet flows and the uptake constants to PEER_H5.
//
//   export_peer RESULT_H5 PEER_H5 [--time REPEATS]
//
// With --time it also times, in this process, oxystrat's own solves of the same network (best of
// REPEATS) and prints them as one JSON line: the inner damped Newton on the same fixed
// coefficients from the same cold start as the peer, and the whole chain from the Case (network,
// hydrodynamics, gas routing, the coupled solve with its outer holdup/kLa loop).
#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <exception>
#include <limits>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/flow/gas_routing.hpp"
#include "h5_read.hpp"
#include "postproc/io/h5_writer.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/linalg/memory_policy.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "peer_problem.hpp"
#include "solver/flow/transport.hpp"
#include "mesh/zone_network.hpp"

namespace {

using namespace oxystrat;
using Clock = std::chrono::steady_clock;

template <typename F>
double best_seconds(int repeats, F&& f) {
  double best = std::numeric_limits<double>::infinity();
  for (int i = 0; i < repeats; ++i) {
    const auto t0 = Clock::now();
    f();
    best = std::min(best, std::chrono::duration<double>(Clock::now() - t0).count());
  }
  return best;
}

int run(int argc, char** argv) {
  if (argc != 3 && !(argc == 5 && std::string(argv[3]) == "--time")) {
    fmt::print(stderr, "usage: export_peer RESULT_H5 PEER_H5 [--time REPEATS]\n");
    return 2;
  }
  const std::string result_path = argv[1], peer_path = argv[2];
  const int repeats = argc == 5 ? std::max(1, std::atoi(argv[4])) : 0;

  std::string text;
  std::vector<double> pressure, kla, volume_h5;
  {
    const auto file = test::open_h5(result_path);
    text = test::read_strings(file, "/case/text").at(0);
    pressure = test::read_doubles(file, "/fields/pressure");
    kla = test::read_doubles(file, "/fields/kla");
    volume_h5 = test::read_doubles(file, "/zones/volume");
  }
  const auto loaded = read_case_text(text, result_path + ":/case/text");
  const Case& c = loaded.data;
  const auto net = build_zone_geometry(c);
  const auto hydro = compute_hydrodynamics(c, net);
  const auto routing = route_gas(c, net, hydro);
  if (static_cast<size_t>(net.size()) != volume_h5.size() || pressure.size() != volume_h5.size()) {
    fmt::print(stderr, "export_peer: the rebuilt network has {} zones, {} holds {}\n", net.size(), result_path,
               volume_h5.size());
    return 1;
  }
  const auto in = bench::peer_inputs(c, net, hydro, routing, pressure, kla);

  std::vector<int> row, col;
  std::vector<double> value;
  for (int k = 0; k < routing.transport.outerSize(); ++k) {
    for (SparseMatrix::InnerIterator it(routing.transport, k); it; ++it) {
      row.push_back(static_cast<int>(it.row()));
      col.push_back(k);
      value.push_back(it.value());
    }
  }
  {
    H5Writer h5(peer_path);
    h5.write("/peer/cstar_per_y_o2", in.coeff.cstar_per_y_o2, "mol/m3");
    h5.write("/peer/cstar_per_y_co2", in.coeff.cstar_per_y_co2, "mol/m3");
    h5.write("/peer/inert_gas", in.coeff.inert_mol_m3, "mol/m3");
    h5.write("/peer/kla_co2_ratio", co2_kla_ratio, "1");
    h5.write("/peer/gas_row", row, "1");
    h5.write("/peer/gas_col", col, "1");
    h5.write("/peer/gas_value", value, "m3/s");
    h5.attribute("/peer/gas_value", "meaning", "gas transport G: d(gas moles of zone gas_row)/dt per unit gas held in gas_col");
    h5.write("/peer/inlet_o2", in.inlet_o2_mol_s, "mol/s");
    h5.write("/peer/inlet_co2", in.inlet_co2_mol_s, "mol/s");
    h5.write("/peer/inlet_o2_fraction", c.operation.oxygen_fraction, "1");
    h5.write("/peer/inlet_co2_fraction", c.operation.co2_fraction, "1");
    h5.write("/peer/uptake_rate", in.uptake.rate_mol_m3_s, "mol/(m3 s)");
    h5.write("/peer/k_o2", in.uptake.k_o2_mol_m3, "mol/m3");
    h5.write("/peer/rq", in.uptake.rq, "1");
    h5.close();
  }
  if (repeats == 0) return 0;

  // oxystrat on the same inner problem, from the same cold start as the peer.
  const auto transport = transport_matrix(net, hydro.face_flow, hydro.face_exchange);
  const OxygenProblem problem(net, routing, transport, in.coeff, in.uptake, in.inlet_o2_mol_s, in.inlet_co2_mol_s);
  NewtonReport rep;
  Eigen::VectorXd x;
  const double inner_s = best_seconds(repeats, [&] {
    x = bench::cold_start(c, net, routing, in);
    rep = solve_newton(problem, x);
  });
  // The whole chain from the Case.
  double do_min = 0.0;
  const double chain_s = best_seconds(repeats, [&] {
    const auto n2 = build_zone_geometry(c);
    const auto h2 = compute_hydrodynamics(c, n2);
    const auto r2 = route_gas(c, n2, h2);
    do_min = solve_oxygen_field({c, n2, h2, r2}).do_min;
  });
  fmt::print("{{\"zones\": {}, \"inner_newton_s\": {:.6g}, \"inner_iterations\": {}, \"inner_converged\": {}, "
             "\"chain_s\": {:.6g}, \"do_min\": {:.9g}}}\n",
             net.size(), inner_s, rep.iterations, rep.converged ? "true" : "false", chain_s, do_min);
  return rep.converged ? 0 : 1;
}

}  // namespace

int main(int argc, char** argv) {
  oxystrat::retain_freed_memory();  // as the command does
  try {
    return run(argc, argv);
  } catch (const std::exception& e) {
    fmt::print(stderr, "export_peer: {}\n", e.what());
    return 1;
  }
}
