// Runs a case through oxystrat's library and prints the lowest dissolved O2 in the vessel.
#include <cstdio>

#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"

int main(int argc, char** argv) {
  if (argc != 2) return 2;
  const auto loaded = oxystrat::read_case_file(argv[1]);
  const auto run = oxystrat::run_case(loaded.data, {.supportable_biomass = false, .single_zone = false});
  if (!run.field) return 1;
  std::printf("DO min %.6g mol/m3\n", run.field->do_min);
  return 0;
}
