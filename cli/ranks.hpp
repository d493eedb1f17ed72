// MPI ranks for sweeps across machines. MPI is started only when the program was launched by an
// MPI launcher (mpirun sets the process-count variables); otherwise there is one rank and no MPI.
#pragma once

#include <string>
#include <vector>

namespace oxystrat::cli {

struct Ranks {
  int rank = 0;
  int size = 1;
};

//! Starts MPI when launched under mpirun and built with MPI; safe to call once at start-up.
void start_ranks(int* argc, char*** argv);
void stop_ranks();
//! Ends every rank after an error on one of them (a no-op with one rank).
void abort_ranks(int code);
Ranks ranks();

//! Lines from every rank, concatenated in rank order on rank 0 (empty on the others).
std::vector<std::string> gather_lines(const std::vector<std::string>& mine);
//! Lines from every rank, concatenated in rank order, on every rank.
std::vector<std::string> share_lines(const std::vector<std::string>& mine);

}  // namespace oxystrat::cli
