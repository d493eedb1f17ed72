#include "postproc/io/sweep_session.hpp"

namespace oxystrat {

SweepSession::SweepSession(const LoadedCase& base, std::vector<Override> base_overrides, SweepPlan plan,
                           SweepOptions options, SweepJournal journal, SweepSessionOptions session, SweepRanks ranks)
    : base_(base),
      base_overrides_(std::move(base_overrides)),
      plan_(std::move(plan)),
      options_(options),
      journal_(std::move(journal)),
      ranks_(std::move(ranks)) {
  const size_t n = plan_.points.size();
  results_.resize(n);
  done_.assign(n, false);
  // Each rank reads the journals it can see (all of them on a shared disk), and all take the
  // union: the same `done` everywhere, so every rank deals the same share.
  std::vector<std::string> found;
  if (session.resume) {
    for (const auto& [i, r] : journal_.load()) {
      if (i < n) found.push_back(encode_point(i, r));
    }
  }
  for (const auto& line : ranks_.share(found)) {
    size_t i = 0;
    PointResult r;
    if (decode_point(line, i, r) && i < n && !done_[i]) results_[i] = r, done_[i] = true, ++from_journal_;
  }
  share_ = share_points(done_, session.max_points, ranks_.rank, ranks_.size);
  journal_.open(session.resume, ranks_.size);
}

std::vector<PointResult> SweepSession::run(const std::function<void()>& on_point) {
  std::vector<std::string> mine;
  run_sweep(base_, base_overrides_, plan_, options_, share_.skip, [&](size_t i, const PointResult& r) {
    journal_.record(i, r);
    results_[i] = r;
    if (ranks_.size > 1) mine.push_back(encode_point(i, r));
    if (on_point) on_point();
  });
  if (ranks_.size > 1) {
    for (const auto& line : ranks_.share(mine)) {
      size_t i = 0;
      PointResult r;
      if (decode_point(line, i, r) && i < results_.size()) results_[i] = r;
    }
  }
  return results_;
}

}  // namespace oxystrat
