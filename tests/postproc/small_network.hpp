// The small test case of tests/data and its zone network, shared by the output tests.
#pragma once

#include "input/case_reader.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat::test {

struct SmallNetwork {
  LoadedCase loaded;
  ZoneNetwork net;
};

inline SmallNetwork small_network(const std::vector<Override>& overrides = {}) {
  SmallNetwork s{read_case_file(OXYSTRAT_TEST_DATA_DIR "/small-case.toml", overrides), {}};
  s.net = build_zone_geometry(s.loaded.data);
  return s;
}

}  // namespace oxystrat::test
