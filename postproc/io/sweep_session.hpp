// A sweep as the command runs it: kept in its journal point by point, resumable, and spread over
// the processes of an MPI run. The MPI calls stay in the program (cli/ranks); this library sees
// only a function that shares lines of text between the processes.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "postproc/io/sweep_journal.hpp"
#include "solver/studies/sweep.hpp"

namespace oxystrat {

//! The processes of the run: this one's rank and their number, and a collective call that returns
//! every rank's lines, concatenated in rank order, on every rank. The default is one process.
struct SweepRanks {
  int rank = 0;
  int size = 1;
  std::function<std::vector<std::string>(const std::vector<std::string>&)> share =
      [](const std::vector<std::string>& mine) { return mine; };
};

struct SweepSessionOptions {
  bool resume = false;   //!< continue from the journal files
  long max_points = -1;  //!< run at most this many new points (all ranks together); < 0: all
};

class SweepSession {
 public:
  //! Collective: loads the journals (resume), shares what every rank found, deals the points not
  //! yet done to the ranks and opens this rank's journal file.
  SweepSession(const LoadedCase& base, std::vector<Override> base_overrides, SweepPlan plan, SweepOptions options,
               SweepJournal journal, SweepSessionOptions session, SweepRanks ranks);

  const SweepPlan& plan() const { return plan_; }
  const PointShare& share() const { return share_; }
  //! Points finished before this run (from the journals).
  size_t from_journal() const { return from_journal_; }
  //! True when this run finishes every point (nothing left for a later --resume).
  bool completes() const { return share_.later == 0; }
  const std::string& journal_path() const { return journal_.path(); }

  //! Collective: runs this rank's points, each recorded in the journal as it finishes
  //! (`on_point` after each, for progress), then shares the results: every point's result on
  //! every rank (points left for later stay empty, ok = false).
  std::vector<PointResult> run(const std::function<void()>& on_point = {});
  //! Removes the journal files once the result folder is written.
  void finish() { journal_.remove(); }

 private:
  LoadedCase base_;
  std::vector<Override> base_overrides_;
  SweepPlan plan_;
  SweepOptions options_;
  SweepJournal journal_;
  SweepRanks ranks_;
  std::vector<PointResult> results_;
  std::vector<bool> done_;
  PointShare share_;
  size_t from_journal_ = 0;
};

}  // namespace oxystrat
