// Bins for a histogram a person reads: log bins from a floor to the largest value. The floor
// keeps numerical flickers (excursions of microseconds at the edge of a region) from stretching
// the axis over ten decades; what lies below it is counted together and shown as such.
#pragma once

#include <vector>

#include "solver/fit/histogram.hpp"

namespace oxystrat::report {

struct DisplayBins {
  std::vector<double> edges;   //!< size counts + 1, increasing
  std::vector<double> counts;
  double below = 0.0;          //!< number of values below edges.front()
};

//! From the values themselves: floor at 1/1000 of the largest value (or higher when the smallest
//! is), about four bins per decade, at most 16 bins. Non-positive values count as below.
DisplayBins display_bins(const std::vector<double>& values);

//! The same from a log histogram, each bin's count placed at its geometric centre.
DisplayBins display_bins(const Histogram& h);

}  // namespace oxystrat::report
