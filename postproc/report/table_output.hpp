// Tables of summary values: compare.csv / sweep.csv, their HDF5 groups, the terminal table, and
// the sweep journal that lets an interrupted sweep resume.
#pragma once

#include <map>
#include <string>
#include <vector>

#include "postproc/io/h5_writer.hpp"
#include "solver/studies/sweep.hpp"

namespace oxystrat {

//! Quantities down, cases across; units in the second column. A value that applies to some cases
//! only has its row, empty where it does not apply. `violated` (optional): per case, the names of
//! the constraints it breaks ("" for none), as the last row.
void write_compare_csv(const std::string& path, const std::vector<std::string>& names,
                       const std::vector<std::vector<SummaryValue>>& values,
                       const std::vector<std::string>& violated = {});
std::string compare_text(const std::vector<std::string>& names, const std::vector<std::vector<SummaryValue>>& values,
                         const std::vector<bool>& feasible, const std::vector<std::string>& violated = {});
void write_compare_h5(H5Writer& h5, const std::vector<std::string>& names,
                      const std::vector<std::vector<SummaryValue>>& values, const std::vector<bool>& feasible,
                      const std::vector<std::string>& violated = {});

//! One row per point: varied keys, status, every summary value (units in the header), the
//! constraints an infeasible point breaks.
void write_sweep_csv(const std::string& path, const SweepPlan& plan, const std::vector<PointResult>& results,
                     const std::vector<bool>& pareto, int chosen);
void write_sweep_h5(H5Writer& h5, const SweepPlan& plan, const std::vector<PointResult>& results,
                    const std::vector<bool>& pareto, int chosen, const std::string& objective);

//! One point as one line of text (no newline) and back: the journal's format, also what MPI
//! ranks send to rank 0. Values round-trip exactly (17 significant digits).
std::string encode_point(size_t index, const PointResult& r);
//! Returns false for a line cut short (an interrupted write).
bool decode_point(const std::string& line, size_t& index, PointResult& r);

//! Append-only record of finished sweep points, beside the output folder (DIR.journal.csv).
class SweepJournal {
 public:
  //! `signature` identifies the sweep; a journal of another sweep is refused on resume.
  SweepJournal(std::string path, std::string signature);
  //! Points already finished (empty unless the file exists with the same signature).
  std::map<size_t, PointResult> load() const;
  //! Starts a new journal (resume = false) or appends to the existing one.
  void open(bool resume);
  void record(size_t index, const PointResult& r);
  //! Removes the journal once the result folder is complete.
  void remove();

 private:
  std::string path_, signature_;
};

}  // namespace oxystrat
