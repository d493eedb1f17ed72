// The sweep journal: every finished point is appended, as it finishes, to a text file beside the
// output folder, so an interrupted sweep (killed, out of time, --max-points) continues with
// --resume and loses nothing. Under MPI each rank keeps its own file; a resumed sweep reads all
// of them, whatever the rank count of the run that wrote them.
#pragma once

#include <map>
#include <string>
#include <vector>

#include "solver/studies/sweep.hpp"

namespace oxystrat {

//! One point as one line of text (no newline) and back: the journal's format, also what MPI
//! ranks send each other. Values round-trip exactly (17 significant digits).
std::string encode_point(size_t index, const PointResult& r);
//! Returns false for a line cut short (an interrupted write).
bool decode_point(const std::string& line, size_t& index, PointResult& r);

//! What identifies a sweep: the case text, the --set and --vary arguments, the design and the
//! options that change the values. A journal of another sweep is refused on resume.
std::string sweep_signature(const LoadedCase& base, const std::vector<std::string>& sets,
                            const std::vector<std::string>& vary, const std::string& sample, const SweepOptions& opts);

//! Append-only record of finished sweep points, beside the output folder DIR: DIR.journal.csv
//! (rank 0, or a single process) and DIR.journal-R.csv (rank R of an MPI run).
class SweepJournal {
 public:
  SweepJournal(const std::string& target, std::string signature, int rank = 0);
  //! Points finished in every journal file of this sweep that this process can see (none when
  //! there is no file). Throws CaseError for a file of another sweep.
  std::map<size_t, PointResult> load() const;
  //! Starts this rank's file afresh (resume = false) or appends to it. A fresh start on rank 0
  //! also removes the files of ranks this run (with `ranks` processes) does not have.
  void open(bool resume, int ranks = 1);
  //! Appends one point; throws IoError when it cannot be written (a full disk).
  void record(size_t index, const PointResult& r);
  //! Removes the journal once the result folder is complete: rank 0 every file, others their own.
  void remove();
  const std::string& path() const { return path_; }

 private:
  //! Every journal file of this sweep in the output's folder.
  std::vector<std::string> files() const;
  std::string target_, signature_, path_;
  int rank_ = 0;
};

}  // namespace oxystrat
