// Design sweeps: a grid (full factorial) or Latin hypercube over numeric case keys, each point
// run as its own case, in parallel with OpenMP; results in point order, identical whatever the
// thread count.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/studies/constraints.hpp"
#include "solver/oxygen/summary_values.hpp"

namespace oxystrat {

struct SweepAxis {
  std::string key;   //!< case key, e.g. "operation.speed"
  double start = 0.0, stop = 0.0;
  int count = 1;
  std::string unit;  //!< unit the values are written in ("rpm"); empty for plain numbers
};

//! Parses KEY=START:STOP:COUNT[:UNIT]; without a unit, the unit the case writes the key in.
SweepAxis parse_vary(const std::string& argument, const LoadedCase& base);

struct SweepPlan {
  std::vector<SweepAxis> axes;
  std::vector<std::vector<double>> points;  //!< per point, one value per axis (in the axis unit)
};

SweepPlan full_factorial(const std::vector<SweepAxis>& axes);
//! n points, one per stratum of every axis, strata paired at random (seeded).
SweepPlan latin_hypercube(const std::vector<SweepAxis>& axes, int n, std::uint64_t seed);

//! The --set arguments that make point `i`.
std::vector<Override> point_overrides(const SweepPlan& plan, size_t i);

struct PointResult {
  bool ok = false;
  std::string error;                  //!< why the point failed (bad geometry, no convergence)
  std::vector<SummaryValue> values;
  std::vector<ConstraintCheck> checks;
  bool feasible = false;
};

struct SweepOptions {
  bool with_mixing = false;           //!< compute theta95 per point
  bool supportable_biomass = true;
  int uncertainty_samples = 0;        //!< > 0: P10/P50/P90 per point from this many samples
  std::uint64_t seed = 1;
  int threads = 0;                    //!< 0: OpenMP default
};

//! Runs the points not yet `done`; `on_done(i, result)` is called (serialised) as each finishes.
void run_sweep(const LoadedCase& base, const std::vector<Override>& base_overrides, const SweepPlan& plan,
               const SweepOptions& opts, const std::vector<bool>& done,
               const std::function<void(size_t, const PointResult&)>& on_done);

//! One point as a case run: the library call `compare` and `sweep` share.
PointResult evaluate_point(const LoadedCase& loaded, bool with_mixing, bool supportable_biomass,
                           int uncertainty_samples = 0, std::uint64_t seed = 1);

//! The uncertainty quantiles as summary values ("do_min_p10", ...), appended to a point's values.
void append_uncertainty_values(const Case& c, int samples, std::uint64_t seed, bool with_mixing,
                               std::vector<SummaryValue>& values);

//! Indices of points on the Pareto front of (least gassed power, highest DO_min) among `ok` points.
std::vector<bool> pareto_front(const std::vector<PointResult>& results);

}  // namespace oxystrat
