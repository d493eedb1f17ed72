// Latin hypercube samples (McKay, Beckman & Conover 1979) on the unit cube, drawn by our own
// generator, so that a seed gives the same points with any compiler and standard library.
#pragma once

#include <cstdint>
#include <vector>

namespace oxystrat {

//! n points in `dimensions` dimensions, each coordinate in [0, 1): in every dimension each of the
//! n strata [k/n, (k+1)/n) holds exactly one point, placed uniformly within it; the strata are
//! paired across dimensions by independent random permutations (Fisher-Yates). points[i][d].
std::vector<std::vector<double>> latin_hypercube_unit(int n, int dimensions, std::uint64_t seed);

}  // namespace oxystrat
