#include "solver/flow/mixing_time.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "solver/flow/transport.hpp"
#include "input/errors.hpp"

namespace oxystrat {

double circulation_time(const ZoneNetwork& net, const Hydrodynamics& h) {
  double q = 0.0;
  for (const auto& imp : h.impellers) q += imp.circulation_m3_s;
  return q > 0.0 ? net.total_volume() / q : 1.0;
}

double last_exceedance(const std::vector<double>& time_s, const std::vector<double>& deviation, double band) {
  for (size_t i = deviation.size(); i-- > 0;) {
    if (deviation[i] > band) {
      if (i + 1 >= deviation.size()) return time_s[i];
      const double f = (deviation[i] - band) / (deviation[i] - deviation[i + 1]);
      return time_s[i] + f * (time_s[i + 1] - time_s[i]);
    }
  }
  return 0.0;
}

namespace {

[[noreturn]] void outside_the_liquid(const char* which, double r, double z, const ZoneNetwork& net) {
  throw CaseError(fmt::format("the {} point (r = {:.4g} m, z = {:.4g} m) lies outside the liquid: r runs from the axis "
                              "to the wall at {:.4g} m (less in the bottom head) and z from the lowest point to the "
                              "surface at {:.4g} m",
                              which, r, z, net.shape.radius(), net.liquid_height));
}

}  // namespace

MixingResult tracer_mixing_time(const ZoneNetwork& net, const Hydrodynamics& h, const MixingOptions& opts) {
  MixingResult res;
  const double big_r = net.shape.radius();
  const double inject_z = opts.inject_z_m >= 0.0 ? opts.inject_z_m : net.liquid_height * (1.0 - 1e-9);
  res.inject_zone = net.zone_containing(opts.inject_r_m, inject_z);
  const double probe_r = opts.probe_r_m >= 0.0 ? opts.probe_r_m : 0.75 * big_r;
  double probe_z = opts.probe_z_m;
  if (probe_z < 0.0) probe_z = 0.25 * net.liquid_height;
  res.probe_zone = net.zone_containing(probe_r, probe_z);
  if (res.inject_zone < 0) outside_the_liquid("injection", opts.inject_r_m, inject_z, net);
  // The default point, the surface by the shaft, can lie in stagnant broth above the top cavern,
  // where a tracer would never leave: then the nearest zone the flow reaches stands in for it.
  if (opts.inject_z_m < 0.0 && !h.stagnant.empty() && h.stagnant[res.inject_zone]) {
    const double inject_r = opts.inject_r_m;
    double nearest = std::numeric_limits<double>::infinity();
    for (int k = 0; k < net.size(); ++k) {
      const double d = std::hypot(net.r[k] - inject_r, net.z[k] - inject_z);
      if (!h.stagnant[k] && d < nearest) {
        nearest = d;
        res.inject_zone = k;
      }
    }
  }
  if (res.probe_zone < 0) outside_the_liquid("probe", probe_r, probe_z, net);

  const Eigen::Map<const Eigen::VectorXd> volume(net.volume.data(), net.size());
  const double total = volume.sum();
  // Unit mass of tracer: the final concentration is 1 / V, and fields are reported as c / c_final.
  Eigen::VectorXd c = Eigen::VectorXd::Zero(net.size());
  c[res.inject_zone] = total / net.volume[res.inject_zone];
  const double band = 1.0 - opts.homogeneity;
  // Broth outside every cavern exchanges by molecular diffusion only and would take weeks to
  // follow, the longer the finer the grid resolves it: the whole-vessel criterion covers the zones
  // the flow reaches, against their own uniform level (the tracer mixed among them alone).
  std::vector<int> judged;
  double judged_volume = 0.0;
  for (int k = 0; k < net.size(); ++k) {
    if (h.stagnant.empty() || !h.stagnant[k]) {
      judged.push_back(k);
      judged_volume += net.volume[k];
    }
  }
  // All zones judged: the whole volume exactly (the loop's sum differs from Eigen's in the last
  // bits, and a fraction of 1 - 1e-16 would read as stagnant broth left out).
  if (judged.size() == static_cast<size_t>(net.size()) || judged.empty() ||
      (!h.stagnant.empty() && h.stagnant[res.inject_zone])) {
    judged.resize(net.size());
    for (int k = 0; k < net.size(); ++k) judged[k] = k;
    judged_volume = total;
  }
  res.judged_volume_fraction = judged_volume / total;
  const double level = total / judged_volume;  // c / c_final of the mixed zones once mixed
  const auto deviation = [&](const Eigen::VectorXd& x) {
    double d = 0.0;
    for (const int k : judged) d = std::max(d, std::abs(x[k] / level - 1.0));
    return d;
  };
  const double t_circ = circulation_time(net, h);
  LinearImplicitIntegrator integrator(transport_matrix(net, h.face_flow, h.face_exchange), volume, t_circ / 200.0,
                                      1e-3, 1e-3, 1.0);
  double next_snapshot = t_circ / 50.0;
  const auto record = [&](double t, const Eigen::VectorXd& x) {
    res.time_s.push_back(t);
    res.probe.push_back(x[res.probe_zone]);
    res.max_deviation.push_back(deviation(x));
    if (t >= next_snapshot || res.snapshots.empty()) {
      res.snapshot_time_s.push_back(t);
      res.snapshots.push_back(x);
      next_snapshot = t * 1.12;
    }
  };
  record(0.0, c);
  integrator.run(c, opts.max_time_s, [&](double t, const Eigen::VectorXd& x) {
    record(t, x);
    // Well past the band, with margin: the last crossing of the band lies behind us.
    return res.max_deviation.back() > 0.2 * band;
  });
  res.reached = res.max_deviation.back() <= 0.2 * band;
  std::vector<double> probe_dev(res.probe.size());
  for (size_t i = 0; i < probe_dev.size(); ++i) probe_dev[i] = std::abs(res.probe[i] - 1.0);
  res.theta_s = last_exceedance(res.time_s, res.max_deviation, band);
  res.theta_probe_s = last_exceedance(res.time_s, probe_dev, band);
  if (res.snapshot_time_s.back() != res.time_s.back()) {
    res.snapshot_time_s.push_back(res.time_s.back());
    res.snapshots.push_back(c);
  }
  res.stats = integrator.stats();
  return res;
}

}  // namespace oxystrat
