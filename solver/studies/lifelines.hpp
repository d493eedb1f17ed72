// What cells experience: each cell moves through the zone network as a continuous-time Markov
// chain on the (steady) flow field (MODEL.md section 9): it leaves zone i after an exponential time
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

#include "solver/flow/hydrodynamics.hpp"
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

struct Histogram {
  std::vector<double> edges;  //!< bin edges [s], size bins + 1 (logarithmic)
  std::vector<double> counts; //!< number of events per bin
};

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

//! Former interface: one DO field (empty: no field statistics), no regimes.
LifelineResult simulate_lifelines(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<double>& do_mol_m3,
                                  double critical_do_mol_m3, const LifelineOptions& opts);

//! Logarithmic histogram of positive values between the smallest and largest; the same counts for
//! any thread count (integer counts, exact minimum and maximum).
Histogram log_histogram(const std::vector<double>& values, int bins = 20, int threads = 1);

// ---- building blocks, exposed for their tests ----

//! A 128-bit multiplicative congruential generator (Lehmer 1951) returning the upper 64 bits of
//! its state: x <- a x mod 2^128 with the 64-bit multiplier a = 0xda942042e4dd58b5 (listed as
//! spectrally good for this modulus by Steele & Vigna 2022, Softw. Pract. Exp. 52(2) [mem]). The
//! upper half of such a generator passes the BigCrush battery (L'Ecuyer & Simard 2007's TestU01)
//! [mem]. Two words of state and one 64x128-bit product per draw: the cheapest good generator we
//! know for a hot loop that draws once per move. The period is 2^126; (seed, stream) pairs start at
//! unrelated points of it (state filled by SplitMix64, Steele, Lea & Flood 2014), so cells do not
//! share stretches of their sequences in any run of practical length.
class CellRandom {
 public:
  CellRandom(std::uint64_t seed, std::uint64_t stream);
  //! The state as two words, for loops that keep several generators as plain values.
  struct Words {
    std::uint64_t lo, hi;
  };
  explicit CellRandom(Words w) : lo_(w.lo), hi_(w.hi) {}
  Words words() const { return {lo_, hi_}; }
  [[gnu::always_inline]] static std::uint64_t next(Words& s) {
    // (hi 2^64 + lo) a = (hi a + high(lo a)) 2^64 + low(lo a), mod 2^128.
    const auto p = static_cast<Wide>(s.lo) * kMultiplier;
    s.lo = static_cast<std::uint64_t>(p);
    s.hi = s.hi * kMultiplier + static_cast<std::uint64_t>(p >> 64);
    return s.hi;
  }
  std::uint64_t next() {
    Words s{lo_, hi_};
    const std::uint64_t r = next(s);
    lo_ = s.lo, hi_ = s.hi;
    return r;
  }
  //! Uniform on [0, 1) with 53 random bits.
  double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }

 private:
  __extension__ typedef unsigned __int128 Wide;
  static constexpr std::uint64_t kMultiplier = 0xda942042e4dd58b5ull;
  std::uint64_t lo_ = 1, hi_ = 0;  //!< the state, odd
};

//! Unit exponential variates by the ziggurat method of Marsaglia & Tsang (2000, J. Stat. Softw.
//! 5(8)) with 32-bit abscissae, as published, but 2048 layers instead of 256 (their set-up, with
//! the base layer's edge r found for that count: base_edge), so that 99.66 % of the draws take the
//! fast path instead of 97.8 %. The layer comes from bits 53-63 and the abscissa from bits 21-52
//! of a draw (disjoint bits, so they are independent; bits 0-20 stay free for the caller). The
//! fast path is one compare and one multiply; the rest test the wedge (first against the chord
//! and the tangents of the convex exp(-x), so that exp is rarely evaluated) or sample the tail
//! exactly, with further draws.
class ExponentialZiggurat {
 public:
  static constexpr int kLayerBits = 11;
  static constexpr int kLayers = 1 << kLayerBits;
  ExponentialZiggurat();
  //! The right edge r of the base layer for `layers` layers of equal area under exp(-x) (for 256:
  //! Marsaglia & Tsang's r = 7.69711747013104972).
  static double base_edge(int layers);
  double operator()(CellRandom& rng) const { return from_draw(rng.next(), rng); }
  double from_draw(std::uint64_t r, CellRandom& rng) const {
    const unsigned i = layer(r);
    const std::uint32_t j = abscissa(r);
    if (j < k_[i]) [[likely]] return static_cast<double>(j) * w_[i];
    return slow(rng, i, j);
  }
  //! The same for a generator held as words: the rare slow path takes and returns them by value.
  [[gnu::always_inline]] double from_draw(std::uint64_t r, CellRandom::Words& s) const {
    const unsigned i = layer(r);
    const std::uint32_t j = abscissa(r);
    if (j < k_[i]) [[likely]] return static_cast<double>(j) * w_[i];
    const Slow d = slow_words(s, i, j);
    s = d.words;
    return d.x;
  }

 private:
  static unsigned layer(std::uint64_t r) { return static_cast<unsigned>(r >> (64 - kLayerBits)); }
  static std::uint32_t abscissa(std::uint64_t r) { return static_cast<std::uint32_t>(r >> (32 - kLayerBits)); }
  double slow(CellRandom& rng, unsigned i, std::uint32_t j) const;
  struct Slow {
    double x;
    CellRandom::Words words;
  };
  [[gnu::noinline]] Slow slow_words(CellRandom::Words s, unsigned i, std::uint32_t j) const;
  double r_;  //!< right edge of the base layer; the tail lies beyond it
  // The fast path's tables first (they are read on every draw).
  std::array<std::uint32_t, kLayers> k_{};
  std::array<double, kLayers> w_{}, f_{};
  // Wedge squeeze of layer i (exp(-x) is convex): the right edge x_i, 1 / (x_i - x_{i-1}), and the
  // slopes of the tangents at both ends relative to the chord.
  std::array<double, kLayers> x_{}, inv_width_{}, tangent_right_{}, tangent_left_{};
};

//! Walker's alias method (Walker 1977, ACM TOMS 3(3); the robust set-up of Vose 1991, IEEE TSE
//! 17(9)) over `weights.size()` outcomes padded to `columns` (a power of two, >= size, <= 256):
//! a draw picks column c uniformly and a uniform 64-bit coin below `threshold[c]` keeps the
//! column's own outcome, else its alias. A column whose own outcome is certain has alias == own.
struct AliasTable {
  int columns = 1;
  std::vector<std::uint64_t> threshold;  //!< per column, probability of the own outcome in units of 2^-64
  std::vector<int> own, alias;           //!< per column: outcome index
  AliasTable(const std::vector<double>& weights, int columns);
  int draw(std::uint64_t column_draw, std::uint64_t coin) const {
    const int c = static_cast<int>(column_draw & static_cast<std::uint64_t>(columns - 1));
    return coin < threshold[c] ? own[c] : alias[c];
  }
};

}  // namespace oxystrat
