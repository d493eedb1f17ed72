// What cells experience: each cell moves through the zone network as a continuous-time Markov
// chain on the (steady) flow field (docs/method.md, section 13): it leaves zone i after an exponential time
// with mean V_i / sum_j(Q_ij + q_ij) and goes to neighbour j with probability proportional to that
// outflow (convective plus exchange). Its long-run occupancy of zone i is V_i / V. Recording the
// per-zone fields along the way (DO, later substrate) gives how long, and how often, cells are
// beyond a threshold, and the regime labels of the zones (impeller discharge or bulk of each
// impeller's loop) give how often cells pass between them: the input for scale-down experiments.
//
// Speed (docs/lifelines-speed.md): a move costs one 64-bit draw of a two-word generator, split
// into a ziggurat exponential (the dwell) and an alias-table pick (the next zone), both exact; a
// few cells are followed side by side in each thread so that their chains of dependent loads
// overlap; statistics change only when a cell crosses into a zone with another state (threshold
// side or regime), so the common move touches nothing but its zone's time and visit count.
#pragma once

#include <array>
#include <cstdint>
#include <string>
#include <vector>

#include "solver/fit/histogram.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/random/alias_table.hpp"
#include "solver/random/cell_random.hpp"
#include "solver/random/exponential_ziggurat.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

struct LifelineOptions {
  int cells = 1000;
  double duration_s = 3600.0;
  std::uint64_t seed = 1;
  int threads = 0;
  int trajectories = 5;  //!< cells whose whole path is kept (for plots)
  //! Excursions shorter than this [s] are counted apart ("long" excursions are those at least this
  //! long); 0: no minimum, every excursion is a long one and the long lists stay empty.
  double min_excursion_s = 0.0;
};

//! A per-zone scalar the cells see, with the threshold that matters to them. A cell is "outside"
//! while the value of its zone is below the threshold (`below`, e.g. DO under critical DO) or above
//! it (`!below`, e.g. substrate above an overflow level).
struct LifelineField {
  std::string name;            //!< short key, used in HDF5 paths (/lifelines/fields/NAME/...)
  std::string label;           //!< for text, e.g. "critical DO"
  std::string unit;            //!< SI unit of value and threshold, e.g. "mol/m3" (HDF5 units)
  std::string display_unit;    //!< unit for text, e.g. "mmol/L"
  double display_scale = 1.0;  //!< SI value times this = value in display_unit
  std::vector<double> value;   //!< per zone [SI unit of the field]
  double threshold = 0.0;      //!< [same unit as value]
  bool below = true;
};

//! A label per zone (at most 256 labels) whose changes along a path are counted.
struct LifelineRegimes {
  std::vector<std::string> names;
  std::vector<int> of_zone;  //!< per zone, index into names
};

//! Regimes "impeller k" (the swept volume of impeller k) and "bulk k" (the rest of impeller k's
//! domain), impellers counted from the bottom.
LifelineRegimes impeller_regimes(const ZoneNetwork& net);

struct Trajectory {
  std::vector<double> time_s;  //!< entry times [s]
  std::vector<int> zone;       //!< zone entered
};

//! What the cells saw of one field.
struct FieldStatistics {
  std::string name, label, unit, display_unit;
  double display_scale = 1.0, threshold = 0.0;
  bool below = true;
  std::vector<double> time_outside_fraction;  //!< per cell: share of its time outside [-]
  double mean_time_outside_fraction = 0.0;
  std::vector<double> excursion_durations_s;  //!< every completed excursion outside [s]
  std::vector<double> between_excursions_s;   //!< every completed time inside between two excursions [s]
  double excursions_per_hour = 0.0;           //!< completed excursions per cell-hour [1/h]
  Histogram excursion_histogram, between_histogram;
  //! With LifelineOptions::min_excursion_s > 0: the completed excursions at least that long, the
  //! times between the end of one of them and the start of the next, and their rate.
  double min_excursion_s = 0.0;
  std::vector<double> long_excursion_durations_s;
  std::vector<double> between_long_excursions_s;
  double long_excursions_per_hour = 0.0;
  Histogram long_excursion_histogram, between_long_histogram;
};

//! What the cells did between regimes. A stay is a maximal stretch of a path in one regime.
struct RegimeStatistics {
  std::vector<std::string> names;
  std::vector<double> transitions_per_hour;  //!< row-major from x to [1/cell-hour]
  std::vector<double> occupancy;             //!< share of all cell time in each regime [-]
  std::vector<double> stay_mean_s;           //!< mean completed stay [s] (0: none)
  std::vector<long> stays;                   //!< completed stays
  std::vector<Histogram> stay_histograms;    //!< durations of completed stays [s]
  std::vector<double> return_mean_s;         //!< mean time between two entries into the regime [s] (0: none)
  std::vector<Histogram> return_histograms;  //!< times between two entries (circulation times) [s]
};

struct LifelineResult {
  std::vector<double> occupancy;          //!< share of all cell time spent in each zone [-]
  std::vector<double> residence_mean_s;   //!< mean time per visit in each zone [s]
  std::vector<long> visits;               //!< visits per zone
  std::vector<FieldStatistics> fields;    //!< in the order given
  RegimeStatistics regimes;               //!< empty names: none given
  std::vector<Trajectory> trajectories;
  long jumps = 0;
  int cells = 0;
  double duration_s = 0.0;
  //! The field called "do", or nullptr.
  const FieldStatistics* field(const std::string& name) const;
};

//! Follows `opts.cells` cells for `opts.duration_s` through the network. Results are the same for
//! any thread count: cell c draws from its own generator seeded by (seed, c), and statistics are
//! merged in blocks of cells in cell order.
LifelineResult simulate_lifelines(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<LifelineField>& fields,
                                  const LifelineRegimes& regimes, const LifelineOptions& opts);

//! The DO field as the recorder's field "do" (below `critical_do_mol_m3` is outside).
LifelineField do_lifeline_field(const std::vector<double>& do_mol_m3, double critical_do_mol_m3);

}  // namespace oxystrat
