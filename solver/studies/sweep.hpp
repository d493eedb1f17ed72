// Design sweeps: a grid (full factorial) or Latin hypercube over numeric case keys, each point
// run as its own case, in parallel with OpenMP; results in point order, identical whatever the
// thread count.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/linalg/steady_problem.hpp"
#include "solver/studies/constraints.hpp"
#include "solver/oxygen/summary_values.hpp"

namespace oxystrat {

struct SweepAxis {
  std::string key;   //!< case key, e.g. "operation.speed"
  double start = 0.0, stop = 0.0;
  int count = 1;
  std::string unit;  //!< unit the values are written in ("rpm"); empty for plain numbers
  std::string argument;  //!< the --vary text, for messages
  bool plain_assumed = false;  //!< no unit given and none in the case: the values are plain numbers
};

//! Parses KEY=START:STOP:COUNT[:UNIT] (finite numbers, COUNT 1 to 10000); without a unit, the
//! unit the case writes the key in, or plain numbers for a key the case does not write (a
//! fraction, a count; check_sweep_axes says so if the key needs a unit).
SweepAxis parse_vary(const std::string& argument, const LoadedCase& base);

//! Most points one sweep may have: each needs a few kilobytes of results held to the end, and the
//! Pareto front compares every pair.
inline constexpr double max_sweep_points = 100000;
//! Throws CaseError, before anything is built, when the plan would have more than max_sweep_points
//! points: the product of the COUNTs, or `sample_points` (> 0: a Latin hypercube).
void check_sweep_size(const std::vector<SweepAxis>& axes, long sample_points);
//! Reads the case at both ends of every axis (the other axes at their start), so a misspelt key,
//! a wrong unit or a value out of the key's range is refused (CaseError naming the --vary
//! argument) before any point runs.
void check_sweep_axes(const LoadedCase& base, const std::vector<Override>& base_overrides,
                      const std::vector<SweepAxis>& axes);

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

//! The names of the values a point of `base` carries with these options: the summary values,
//! theta95 with mixing, the heat, shear and cost values that apply, the P10/P50/P90 quantiles
//! with uncertainty samples.
std::vector<std::string> sweep_value_names(const Case& base, const SweepOptions& opts);
//! Throws CaseError unless `objective` is NAME or NAME:max with NAME one of sweep_value_names().
//! The feasible point is then chosen by choose_objective_point (solver/studies/sweep_choice.hpp).
void check_objective(const Case& base, const std::string& objective, const SweepOptions& opts);

//! Which points one of `ranks` processes runs now.
struct PointShare {
  std::vector<bool> skip;  //!< true: not this rank's now (done, another rank's, or left for later)
  size_t here = 0;         //!< points this rank runs
  size_t now = 0;          //!< points all ranks run
  size_t later = 0;        //!< points left for a later --resume (beyond max_points)
};
//! The points not `done`, the first `max_points` of them (< 0: all), dealt to the ranks in turn.
//! Every rank computes the same share from the same `done`.
PointShare share_points(const std::vector<bool>& done, long max_points, int rank, int ranks);

//! Runs the points not yet `done`; `on_done(i, result)` is called (serialised) as each finishes.
//! An exception from `on_done` (a journal that cannot be written) stops the sweep: the points
//! under way finish, no new one starts, and it is rethrown here.
void run_sweep(const LoadedCase& base, const std::vector<Override>& base_overrides, const SweepPlan& plan,
               const SweepOptions& opts, const std::vector<bool>& done,
               const std::function<void(size_t, const PointResult&)>& on_done);

//! One point as a case run: the library call `compare` and `sweep` share. A `workspace` kept
//! across points of one grid saves the linear solves' symbolic work (the results do not depend
//! on it).
PointResult evaluate_point(const LoadedCase& loaded, bool with_mixing, bool supportable_biomass,
                           int uncertainty_samples = 0, std::uint64_t seed = 1, NewtonWorkspace* workspace = nullptr);

//! The cautions `run` gives at point `i` of the plan (the point is run again: a sweep keeps only
//! their count per point). Empty when the point fails to run.
std::vector<std::string> point_cautions(const LoadedCase& base, const std::vector<Override>& base_overrides,
                                        const SweepPlan& plan, size_t i, const SweepOptions& opts);

//! The uncertainty quantiles as summary values ("do_min_p10", ...), appended to a point's values.
void append_uncertainty_values(const Case& c, int samples, std::uint64_t seed, bool with_mixing,
                               std::vector<SummaryValue>& values);

//! Indices of points on the Pareto front of (least gassed power, highest DO_min) among `ok` points.
std::vector<bool> pareto_front(const std::vector<PointResult>& results);

}  // namespace oxystrat
