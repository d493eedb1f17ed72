#include "cli/ranks.hpp"

#include <cstdlib>

#ifdef OXYSTRAT_WITH_MPI
#include <mpi.h>
#endif

namespace oxystrat::cli {
namespace {
bool started = false;

#ifdef OXYSTRAT_WITH_MPI
// One '\n'-terminated buffer of this rank's lines, to gather as characters.
std::string pack_lines(const std::vector<std::string>& mine) {
  std::string packed;
  for (const auto& l : mine) packed += l + "\n";
  return packed;
}

// Where each rank's buffer starts in the gathered one.
std::vector<int> offsets_of(const std::vector<int>& lengths) {
  std::vector<int> offsets(lengths.size(), 0);
  for (size_t i = 1; i < lengths.size(); ++i) offsets[i] = offsets[i - 1] + lengths[i - 1];
  return offsets;
}

// The lines of a '\n'-terminated buffer gathered from every rank.
std::vector<std::string> split_lines(const std::string& all) {
  std::vector<std::string> lines;
  size_t start = 0;
  for (size_t i = 0; i < all.size(); ++i) {
    if (all[i] == '\n') {
      lines.push_back(all.substr(start, i - start));
      start = i + 1;
    }
  }
  return lines;
}
#endif
}  // namespace

void start_ranks([[maybe_unused]] int* argc, [[maybe_unused]] char*** argv) {
#ifdef OXYSTRAT_WITH_MPI
  const bool launched = std::getenv("OMPI_COMM_WORLD_SIZE") != nullptr || std::getenv("PMI_SIZE") != nullptr ||
                        std::getenv("PMIX_RANK") != nullptr;
  if (launched) {
    MPI_Init(argc, argv);
    started = true;
  }
#endif
}

void stop_ranks() {
#ifdef OXYSTRAT_WITH_MPI
  if (started) MPI_Finalize();
#endif
  started = false;
}

void abort_ranks([[maybe_unused]] int code) {
#ifdef OXYSTRAT_WITH_MPI
  if (started && ranks().size > 1) MPI_Abort(MPI_COMM_WORLD, code);
#endif
}

Ranks ranks() {
  Ranks r;
#ifdef OXYSTRAT_WITH_MPI
  if (started) {
    MPI_Comm_rank(MPI_COMM_WORLD, &r.rank);
    MPI_Comm_size(MPI_COMM_WORLD, &r.size);
  }
#endif
  return r;
}

std::vector<std::string> gather_lines(const std::vector<std::string>& mine) {
  if (ranks().size == 1) return mine;
#ifdef OXYSTRAT_WITH_MPI
  const std::string packed = pack_lines(mine);
  int length = static_cast<int>(packed.size());
  const auto r = ranks();
  std::vector<int> lengths(r.size), offsets(r.size, 0);
  MPI_Gather(&length, 1, MPI_INT, lengths.data(), 1, MPI_INT, 0, MPI_COMM_WORLD);
  std::string all;
  if (r.rank == 0) {
    offsets = offsets_of(lengths);
    all.resize(static_cast<size_t>(offsets.back() + lengths.back()));
  }
  MPI_Gatherv(packed.data(), length, MPI_CHAR, all.data(), lengths.data(), offsets.data(), MPI_CHAR, 0, MPI_COMM_WORLD);
  return r.rank == 0 ? split_lines(all) : std::vector<std::string>{};
#else
  return mine;
#endif
}

std::vector<std::string> share_lines(const std::vector<std::string>& mine) {
  if (ranks().size == 1) return mine;
#ifdef OXYSTRAT_WITH_MPI
  const std::string packed = pack_lines(mine);
  int length = static_cast<int>(packed.size());
  const auto r = ranks();
  std::vector<int> lengths(r.size);
  MPI_Allgather(&length, 1, MPI_INT, lengths.data(), 1, MPI_INT, MPI_COMM_WORLD);
  const auto offsets = offsets_of(lengths);
  std::string all(static_cast<size_t>(offsets.back() + lengths.back()), '\0');
  MPI_Allgatherv(packed.data(), length, MPI_CHAR, all.data(), lengths.data(), offsets.data(), MPI_CHAR, MPI_COMM_WORLD);
  return split_lines(all);
#else
  return mine;
#endif
}

}  // namespace oxystrat::cli
