// Over 400 lines on purpose: apart from its zone records and cell state the loop is inlined differently.
#include "solver/studies/lifeline_simulator.hpp"

#include <algorithm>
#include <array>
#include <bit>
#include <cmath>
#include <cstdint>
#include <map>
#include <memory>
#include <mutex>
#include <stdexcept>
#include <utility>
#include <vector>

#include "solver/linalg/memory_policy.hpp"
#include "solver/random/cell_random.hpp"
#include "solver/random/exponential_ziggurat.hpp"

namespace oxystrat::lifelines_detail {
namespace {

// One cell's state apart from its zone and clock: touched only when the zone's key changes.
struct FieldCell {
  bool outside = false, seen_change = false;
  double since = 0.0, outside_time = 0.0;
  double last_long_end = -1.0;  // end of the last long excursion [s], -1: none yet
};

struct CellState {
  std::vector<FieldCell> fields;
  int regime = 0;
  bool regime_seen_change = false;
  double regime_since = 0.0;
  std::vector<double> last_entry;  // per regime [s], -1: not entered since the start
  FieldEvents* events = nullptr;   // per field, this cell's lists
};

// The chain as the hot loop reads it: one record per zone, a cache line for the (r, z) grid's four
// columns, holding everything a move out of the zone needs (its dwell, its alias columns) and this
// thread's sums for the zone, so that a move touches one line. Zones are named by the byte offset
// of their record (no multiply in the loop); each thread has its own copy of the records.
template <int LogColumns>
struct alignas(64) ZoneRecord {
  static constexpr int kColumns = 1 << LogColumns;
  Pair sum{0.0, 0.0};     // {time [s], completed visits} of this thread's block
  double mean_s = 0.0;    // mean dwell V / outflow [s]; +inf without outflow
  std::uint32_t to[2][kColumns]{};  // per column: [0] alias, [1] own, as record offsets | kEntersOtherKey
  std::uint16_t top[kColumns]{};    // the column's top kCoinBits of its threshold: the own zone when the coin is below
};

// In the records, a move into another key is flagged by a bit that record offsets (multiples of
// 64) never have, worth the size of a log entry: the log's end advances by `to & flag` itself.
constexpr std::uint32_t kEntersOtherKey = 16;

template <int LogColumns>
std::uint32_t record_target(std::uint32_t slot_to) {
  return static_cast<std::uint32_t>((slot_to & ~kChangeBit) * sizeof(ZoneRecord<LogColumns>)) | (slot_to & kChangeBit ? kEntersOtherKey : 0u);
}

template <int LogColumns>
std::vector<ZoneRecord<LogColumns>> zone_records(const Chain& c) {
  using Record = ZoneRecord<LogColumns>;
  static_assert(sizeof(Record) % 64 == 0 && kEntersOtherKey < 64);
  if (static_cast<std::uint64_t>(c.zones) * sizeof(Record) >= kChangeBit) throw std::invalid_argument("lifelines: too many zones");
  std::vector<Record> r(c.zones);
  for (int k = 0; k < c.zones; ++k) {
    r[k].mean_s = c.mean_dwell[k];
    for (int j = 0; j < Record::kColumns; ++j) {
      const size_t s = (static_cast<size_t>(k) << LogColumns) + j;
      r[k].to[0][j] = record_target<LogColumns>(c.slots[s].to[0]);
      r[k].to[1][j] = record_target<LogColumns>(c.slots[s].to[1]);
      r[k].top[j] = static_cast<std::uint16_t>(c.threshold[s] >> (64 - kCoinBits));
    }
  }
  return r;
}

// A cell being followed: what the hot loop reads and writes on every move (the rest of a cell's
// state, read at key changes and the end, is in its CellState and its Lane).
struct Entry;
struct Walker {
  CellRandom::Words rng{1, 0};
  double t = 0.0;
  std::uint32_t zone = 0;  // the byte offset of its record
  Entry* end = nullptr;    // where the next entry into a zone with another key is written
};

// An entry into a zone with another key. Moves write one every time, without a branch, and keep
// it only when the key changes (the pointer advances by the slot's flag): a branch there would be
// mispredicted on most of the 7 % of moves that change key, each miss discarding the work of all
// the lanes in flight. The log is booked when it is full and when the cell ends.
struct Entry {
  double t;
  std::uint32_t zone;  // record offset
};
static_assert(sizeof(Entry) == kEntersOtherKey, "a flagged move advances the log by one entry");
constexpr int kLogEntries = 128;
// The log starts on a multiple of twice its size, so it is full exactly when this bit of the end
// pointer is set: one test per move, no limit to keep.
constexpr std::uintptr_t kLogFull = kLogEntries * sizeof(Entry);

// What a lane knows of its cell apart from the walker: touched only when its log is booked.
struct alignas(2 * kLogFull) Lane {
  std::array<Entry, kLogEntries + 1> log;  // one spare: every move writes, kept or not
  std::uint32_t key = 0;  // of the zone of the last booked entry
  int cell = -1;          // -1: idle
};

constexpr int kBlock = 64;  // cells per block: the unit of work and of the in-order merge
constexpr int kLanes = 4;   // cells followed side by side in one thread (3-4 measured best, 8 slower)

// The lanes of a thread as the rare paths of a move see them: they take a lane index, so that a
// move does not prepare the addresses of its lane's state on the way (the compiler did, and kept
// them on the stack, on every move).
struct LaneSet {
  Lane* lanes;
  CellState* states;
  Tally* tally;
};

class Simulator {
 public:
  Simulator(const Chain& chain, int n_fields, int n_regimes, const LifelineOptions& o)
      : c_(chain), n_fields_(n_fields), n_regimes_(n_regimes), count_regimes_(n_regimes > 0), duration_(o.duration_s),
        min_excursion_(o.min_excursion_s), seed_(o.seed) {}

  int fields() const { return n_fields_; }
  int regimes() const { return n_regimes_; }
  double duration() const { return duration_; }

  template <int LogColumns>
  [[gnu::noinline]] Walker start(Lane& lane, CellState& st, int cell) const {
    CellRandom rng(seed_, static_cast<std::uint64_t>(cell));
    const int zone = std::min(static_cast<int>(std::lower_bound(c_.start_cdf.begin(), c_.start_cdf.end(), rng.uniform()) - c_.start_cdf.begin()),
                              c_.zones - 1);
    Walker w;
    w.rng = rng.words();
    w.zone = static_cast<std::uint32_t>(zone * sizeof(ZoneRecord<LogColumns>));
    w.end = lane.log.data();
    lane.cell = cell;
    lane.key = c_.key[zone];
    for (int f = 0; f < n_fields_; ++f) st.fields[f] = FieldCell{((lane.key >> (8 + f)) & 1u) != 0};
    st.regime = static_cast<int>(lane.key & 0xffu);
    st.regime_seen_change = false;
    st.regime_since = 0.0;
    std::fill(st.last_entry.begin(), st.last_entry.end(), -1.0);
    return w;
  }

  // What the hot loop reads, as plain values (kept in registers: nothing is reloaded after the
  // stores of a move).
  struct Hot {
    char* records;
    double duration;
  };

  // One move of w; false (and the last partial stay booked) when the cell reaches the end.
  // LogColumns: log2 of the alias columns per zone, a constant so that the indexing is immediate.
  template <int LogColumns, int L>
  [[gnu::always_inline]] bool step(const Hot& h, Walker& w, const LaneSet& lanes) const {
    using Record = ZoneRecord<LogColumns>;
    const std::uint64_t r = CellRandom::next(w.rng);
    Record& z = *reinterpret_cast<Record*>(h.records + w.zone);
    const double t_next = w.t + zig_.from_draw(r, w.rng) * z.mean_s;
    if (!(t_next < h.duration)) [[unlikely]] {  // also catches +inf (no outflow)
      z.sum += Pair{h.duration - w.t, 0.0};
      book<LogColumns>(lanes, L, w.end);
      return false;
    }
    z.sum += Pair{t_next - w.t, 1.0};
    const auto column = static_cast<std::uint32_t>(r >> kCoinBits) & (Record::kColumns - 1);
    const auto coin = static_cast<std::uint16_t>(r & ((1u << kCoinBits) - 1));
    const std::uint16_t top = z.top[column];
    // Own or alias by an index, not a branch: the choice is close to a coin toss, a branch on it
    // would be mispredicted on a large share of the moves.
    std::uint32_t next = z.to[coin < top][column];
    if (coin == top) [[unlikely]] {
      const Refined d = refine<LogColumns>(w.rng, w.zone, column, coin);
      next = d.to, w.rng = d.rng;
    }
    w.t = t_next;
    w.zone = next & ~kEntersOtherKey;
    *w.end = {t_next, w.zone};
    w.end = reinterpret_cast<Entry*>(reinterpret_cast<char*>(w.end) + (next & kEntersOtherKey));
    if (reinterpret_cast<std::uintptr_t>(w.end) & kLogFull) [[unlikely]] w.end = book<LogColumns>(lanes, L, w.end);
    return true;
  }

  // Time outside per field [s] of a cell that has reached the end.
  void finish(const CellState& st, double* outside) const {
    for (int f = 0; f < n_fields_; ++f) {
      const FieldCell& fc = st.fields[f];
      outside[f] = fc.outside_time + (fc.outside ? duration_ - fc.since : 0.0);
    }
  }

 private:
  // The pick when the coin's top bits tie with the threshold's (one move in 2^13): the coin's
  // other bits decide. Generator words by value: a walker whose address escaped could not be kept
  // unrolled.
  struct Refined {
    std::uint32_t to;
    CellRandom::Words rng;
  };
  template <int LogColumns>
  [[gnu::noinline]] Refined refine(CellRandom::Words rng, std::uint32_t record, std::uint32_t column, std::uint16_t coin) const {
    const size_t slot = (record / sizeof(ZoneRecord<LogColumns>) << LogColumns) + column;
    const std::uint64_t full = (static_cast<std::uint64_t>(coin) << (64 - kCoinBits)) | (CellRandom::next(rng) >> kCoinBits);
    const std::uint32_t to = c_.slots[slot].to[full < c_.threshold[slot]];
    return {record_target<LogColumns>(to), rng};
  }

  // Books the entries of lane l's log up to `end`; returns the log's start. The end pointer by
  // value: a walker whose address escaped could not be kept unrolled.
  template <int LogColumns>
  [[gnu::noinline]] Entry* book(const LaneSet& lanes, int l, const Entry* end) const {
    return book<LogColumns>(lanes.lanes[l], end, *lanes.tally, lanes.states[l]);
  }
  // Whether an entry changes the regime, a field or both is close to random: the entries are first
  // sorted into the two kinds without a branch, then each kind is booked in order by code whose
  // branches follow the cell's own rhythm (a field's side alternates) and are predicted.
  template <int LogColumns>
  [[gnu::noinline]] Entry* book(Lane& lane, const Entry* end, Tally& tally, CellState& st) const {
    const Entry* log = lane.log.data();
    const auto n = static_cast<int>(end - log);
    std::array<std::uint32_t, kLogEntries + 1> key;  // [0]: before the first entry
    std::array<std::uint16_t, kLogEntries> regime_moves, field_moves;
    int regimes = 0, fields = 0;
    key[0] = lane.key;
    for (int i = 0; i < n; ++i) {
      key[i + 1] = c_.key[log[i].zone / sizeof(ZoneRecord<LogColumns>)];
      const std::uint32_t diff = key[i] ^ key[i + 1];
      regime_moves[regimes] = static_cast<std::uint16_t>(i), regimes += (diff & 0xffu) != 0;
      field_moves[fields] = static_cast<std::uint16_t>(i), fields += (diff >> 8) != 0;
    }
    if (count_regimes_) {
      for (int k = 0; k < regimes; ++k) {
        const int i = regime_moves[k];
        regime_change(static_cast<int>(key[i] & 0xffu), static_cast<int>(key[i + 1] & 0xffu), log[i].t, tally, st);
      }
    }
    for (int k = 0; k < fields; ++k) {
      const int i = field_moves[k];
      for (std::uint32_t m = (key[i] ^ key[i + 1]) >> 8; m != 0; m &= m - 1) field_change(std::countr_zero(m), log[i].t, st);
    }
    lane.key = key[n];
    return lane.log.data();
  }

  // A cell passes from regime a to regime b at t.
  [[gnu::always_inline]] void regime_change(int a, int b, double t, Tally& tally, CellState& st) const {
    if (st.regime_seen_change) {
      const double stay = t - st.regime_since;
      tally.stay_sum[a] += stay;
      ++tally.stay_count[a];
      ++tally.stay_bins[static_cast<size_t>(a) * kBins + log_bin(stay)];
    }
    ++tally.transitions[static_cast<size_t>(a) * n_regimes_ + b];
    if (st.last_entry[b] >= 0.0) {
      const double back = t - st.last_entry[b];
      tally.return_sum[b] += back;
      ++tally.return_count[b];
      ++tally.return_bins[static_cast<size_t>(b) * kBins + log_bin(back)];
    }
    st.last_entry[b] = t;
    st.regime_since = t;
    st.regime_seen_change = true;
  }

  // A cell crosses field f's threshold at t. Inlined into the booking, as it was when that was
  // tuned: the compiler's own choice depends on what else the file holds.
  [[gnu::always_inline]] void field_change(int f, double t, CellState& st) const {
    FieldCell& fc = st.fields[f];
    FieldEvents& ev = st.events[f];
    const double run = t - fc.since;
    if (fc.outside) {  // an excursion ends
      fc.outside_time += run;
      if (fc.seen_change) {
        ev.excursions.push_back(run);
        if (min_excursion_ > 0.0 && run >= min_excursion_) {
          if (fc.last_long_end >= 0.0) ev.long_between.push_back(fc.since - fc.last_long_end);
          ev.long_excursions.push_back(run);
          fc.last_long_end = t;
        }
      }
    } else if (fc.seen_change) {
      ev.between.push_back(run);
    }
    fc.outside = !fc.outside;
    fc.seen_change = true;
    fc.since = t;
  }

  const Chain& c_;
  const ExponentialZiggurat zig_;
  int n_fields_, n_regimes_;
  bool count_regimes_;
  double duration_, min_excursion_;
  std::uint64_t seed_;
};

// A thread's workspace for a block of cells: its tally, the event lists of each cell of the block
// (merged in cell order), the lanes. Reused from block to block (see BlockMerger); capacities are kept.
struct BlockWork {
  Tally tally;
  std::vector<std::vector<FieldEvents>> events;  // [cell in block][field]
  std::vector<Lane> lanes;                       // over-aligned: a vector, not on the stack
  std::vector<CellState> states;                 // per lane
  std::vector<double> outside;

  BlockWork(const Simulator& sim, int zones)
      : tally(zones, sim.regimes()), events(kBlock, std::vector<FieldEvents>(sim.fields())), lanes(kLanes), outside(sim.fields()) {
    for (int l = 0; l < kLanes; ++l) states.push_back({std::vector<FieldCell>(sim.fields()), 0, false, 0.0, std::vector<double>(sim.regimes())});
  }
};

// The lanes' walkers are locals reached only through constant indices (the folds below): the
// round of moves is unrolled, each lane's state at a fixed place, with no lane index to carry.
template <int LogColumns, typename Begin, typename Done, int... L>
[[gnu::always_inline]] inline void run_lanes(const Simulator& sim, const Simulator::Hot& h, BlockWork& work, int& next, int last,
                                             Begin& begin, Done& done, std::integer_sequence<int, L...>) {
  Walker w[kLanes];
  const LaneSet lanes{work.lanes.data(), work.states.data(), &work.tally};
  int live = 0;
  ((next < last ? (w[L] = begin(L), ++live) : 0), ...);
  auto move = [&]<int l>(Walker& x) __attribute__((always_inline)) {
    if (!sim.step<LogColumns, l>(h, x, lanes)) [[unlikely]] {
      done(l);
      if (next < last) {
        x = begin(l);
      } else {
        --live;
      }
    }
  };
  while (live == kLanes) (move.template operator()<L>(w[L]), ...);
  auto finish = [&]<int l>(Walker& x) {
    if (work.lanes[l].cell < 0) return;
    while (sim.step<LogColumns, l>(h, x, lanes)) {
    }
    done(l);
  };
  (finish.template operator()<L>(w[L]), ...);
}

// Follows cells [first, last) (one block) on this thread's zone records, writing each cell's time
// outside into `outside[f][c]` and its path, for c < paths.size(), into paths[c]; the block's zone
// sums end up in work.tally (and the records' sums are cleared).
template <int LogColumns>
void run_block(const Simulator& sim, std::vector<ZoneRecord<LogColumns>>& records, int first, int last, BlockWork& work,
               std::vector<std::vector<double>>& outside, std::vector<Trajectory>& paths) {
  work.tally.clear();
  for (int c = first; c < last; ++c) {
    for (auto& e : work.events[c - first]) e.clear();
  }
  for (Lane& lane : work.lanes) lane.cell = -1;
  int next = first;
  auto begin = [&](int l) {
    work.states[l].events = work.events[next - first].data();
    return sim.start<LogColumns>(work.lanes[l], work.states[l], next++);
  };
  auto done = [&](int l) {
    sim.finish(work.states[l], work.outside.data());
    for (int f = 0; f < sim.fields(); ++f) outside[f][work.lanes[l].cell] = work.outside[f];
    work.lanes[l].cell = -1;
  };
  const Simulator::Hot h{reinterpret_cast<char*>(records.data()), sim.duration()};
  // Cells whose path is kept: one by one, recording every entry.
  const LaneSet lanes{work.lanes.data(), work.states.data(), &work.tally};
  while (next < last && next < static_cast<int>(paths.size())) {
    Trajectory& p = paths[next];
    Walker w = begin(0);
    do {
      p.time_s.push_back(w.t), p.zone.push_back(static_cast<int>(w.zone / sizeof(ZoneRecord<LogColumns>)));
    } while (sim.step<LogColumns, 0>(h, w, lanes));
    done(0);
  }
  // The others side by side: kLanes independent chains of loads overlap in the processor.
  run_lanes<LogColumns>(sim, h, work, next, last, begin, done, std::make_integer_sequence<int, kLanes>{});
  for (size_t k = 0; k < records.size(); ++k) work.tally.zone[k].sum = records[k].sum, records[k].sum = Pair{0.0, 0.0};
}

// Adds finished blocks into the totals in block order (so the sums do not depend on the thread
// count): whichever thread finishes the block next in order merges it, with any later ones
// already done. A thread whose block is early parks its workspace and goes on with a spare one
// instead of waiting for its turn, which on a shared machine could be most of a block away.
class BlockMerger {
 public:
  BlockMerger(const Simulator& sim, int zones, int cells, Totals& out) : sim_(sim), zones_(zones), cells_(cells), out_(out) {}

  std::unique_ptr<BlockWork> take() {
    {
      const std::lock_guard<std::mutex> lock(mutex_);
      if (!spare_.empty()) {
        auto w = std::move(spare_.back());
        spare_.pop_back();
        return w;
      }
    }
    return std::make_unique<BlockWork>(sim_, zones_);
  }

  void finished(int block, std::unique_ptr<BlockWork> work) {
    const std::lock_guard<std::mutex> lock(mutex_);
    parked_.emplace(block, std::move(work));
    for (auto it = parked_.find(next_); it != parked_.end(); it = parked_.find(next_)) {
      merge(next_, *it->second);
      spare_.push_back(std::move(it->second));
      parked_.erase(it);
      ++next_;
    }
  }

 private:
  void merge(int block, const BlockWork& work) {
    const int first = block * kBlock, last = std::min(cells_, first + kBlock);
    out_.tally.add(work.tally);
    for (int c = first; c < last; ++c) {
      for (int f = 0; f < sim_.fields(); ++f) work.events[c - first][f].append_to(out_.events[f]);
    }
    // Room for all the events, estimated from the first block, so that the lists (hundreds of
    // MB at 1e5 cells) are not copied again and again as they grow.
    if (block == 0) {
      const double scale = 1.05 * cells_ / std::max(last - first, 1);
      for (auto& e : out_.events) {
        for (auto* v : {&e.excursions, &e.between, &e.long_excursions, &e.long_between}) {
          v->reserve(static_cast<size_t>(scale * v->size()) + 64);
          prefer_huge_pages(v->data(), v->capacity() * sizeof(double));
        }
      }
    }
  }

  const Simulator& sim_;
  int zones_, cells_;
  Totals& out_;
  std::mutex mutex_;
  std::vector<std::unique_ptr<BlockWork>> spare_;
  std::map<int, std::unique_ptr<BlockWork>> parked_;
  int next_ = 0;  // the next block to merge
};

// All cells, in blocks over the threads, with the column count a constant.
template <int LogColumns>
void follow_cells(const Chain& chain, const Simulator& sim, int cells, int threads, Totals& out, std::vector<Trajectory>& paths) {
  const auto prototype = zone_records<LogColumns>(chain);
  const int blocks = (cells + kBlock - 1) / kBlock;
  BlockMerger merger(sim, chain.zones, cells, out);
#pragma omp parallel num_threads(threads)
  {
    auto records = prototype;  // this thread's: its sums sit on the lines the moves read
#pragma omp for schedule(dynamic, 1)
    for (int b = 0; b < blocks; ++b) {
      auto work = merger.take();
      const int first = b * kBlock, last = std::min(cells, first + kBlock);
      run_block<LogColumns>(sim, records, first, last, *work, out.outside, paths);
      merger.finished(b, std::move(work));
    }
  }
}

// follow_cells with the column count as a constant (0 .. 8; the (r, z) grid has at most four
// neighbours, so 2).
template <int L = 0>
void follow(const Chain& chain, const Simulator& sim, int cells, int threads, Totals& out, std::vector<Trajectory>& paths) {
  if constexpr (L < 8) {
    if (chain.log_columns != L) return follow<L + 1>(chain, sim, cells, threads, out, paths);
  }
  follow_cells<L>(chain, sim, cells, threads, out, paths);
}

}  // namespace

void follow_lifelines(const Chain& chain, int n_fields, int n_regimes, const LifelineOptions& opts, int cells,
                      int threads, Totals& out, std::vector<Trajectory>& paths) {
  const Simulator sim(chain, n_fields, n_regimes, opts);
  follow(chain, sim, cells, threads, out, paths);
}

}  // namespace oxystrat::lifelines_detail
