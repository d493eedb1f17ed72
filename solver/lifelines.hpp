// What cells experience: each cell moves through the zone network as a continuous-time Markov
// chain on the (steady) flow field (MODEL.md section 9): it leaves zone i after an exponential time
// with mean V_i / sum_j(Q_ij + q_ij) and goes to neighbour j with probability proportional to that
// outflow (convective plus exchange). Its long-run occupancy of zone i is V_i / V. Recording the
// DO along the way gives how long, and how often, cells are below critical DO: the input for
// scale-down experiments.
#pragma once

#include <cstdint>
#include <vector>

#include "hydrodynamics.hpp"
#include "zone_network.hpp"

namespace oxystrat {

struct LifelineOptions {
  int cells = 1000;
  double duration_s = 3600.0;
  std::uint64_t seed = 1;
  int threads = 0;
  int trajectories = 5;  //!< cells whose whole path is kept (for plots)
};

struct Histogram {
  std::vector<double> edges;  //!< bin edges [s], size bins + 1 (logarithmic)
  std::vector<double> counts; //!< number of events per bin
};

struct Trajectory {
  std::vector<double> time_s;  //!< entry times [s]
  std::vector<int> zone;       //!< zone entered
};

struct LifelineResult {
  std::vector<double> occupancy;          //!< share of all cell time spent in each zone [-]
  std::vector<double> residence_mean_s;   //!< mean time per visit in each zone [s]
  std::vector<long> visits;               //!< visits per zone
  std::vector<double> time_below_fraction;  //!< per cell: share of its time below critical DO [-]
  std::vector<double> excursion_durations_s;  //!< every completed excursion below critical DO [s]
  std::vector<double> between_excursions_s;   //!< every completed time above critical between two excursions [s]
  double mean_time_below_fraction = 0.0;
  double excursions_per_hour = 0.0;       //!< transitions into the starved state per cell-hour [1/h]
  Histogram excursion_histogram, between_histogram;
  std::vector<Trajectory> trajectories;
  long jumps = 0;
};

//! `do_mol_m3` is the DO field the cells see (empty: no DO statistics).
LifelineResult simulate_lifelines(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<double>& do_mol_m3,
                                  double critical_do_mol_m3, const LifelineOptions& opts);

//! Logarithmic histogram of positive values between the smallest and largest.
Histogram log_histogram(const std::vector<double>& values, int bins = 20);

}  // namespace oxystrat
