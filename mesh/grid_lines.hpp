// Grid lines along one axis that pass exactly through required positions (impeller planes,
// tip radii, the sparger, the head seam), with the remaining cells spread by segment length.
#pragma once

#include <vector>

namespace oxystrat {

//! Lines lo = x0 < x1 < ... < xn = hi with every `required` value in (lo, hi) among them and
//! n = max(target, number of segments) cells; each segment is divided uniformly, and its share of
//! cells follows its length (largest remainder, at least one cell per segment).
std::vector<double> aligned_lines(double lo, double hi, std::vector<double> required, int target);

}  // namespace oxystrat
