// Logarithmic histograms of positive durations (excursions, stays, times between events): the
// same counts for any thread count (integer counts, exact range).
#pragma once

#include <vector>

namespace oxystrat {

struct Histogram {
  std::vector<double> edges;  //!< bin edges [s], size bins + 1 (logarithmic)
  std::vector<double> counts; //!< number of events per bin
};

//! Logarithmic histogram of positive values between the smallest and largest; the same counts for
//! any thread count (integer counts, exact minimum and maximum).
Histogram log_histogram(const std::vector<double>& values, int bins = 20, int threads = 1);

//! The same with the range known (lo, hi: the smallest and largest positive value): lists of 10^7
//! values are split over the threads.
Histogram log_histogram_in_range(const std::vector<double>& values, int bins, int threads, double lo, double hi);

}  // namespace oxystrat
