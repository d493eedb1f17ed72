// Loops and pairs of tasks split over the OpenMP threads only when they are worth it. A region
// entered with a false if-clause is not free: the runtime still builds a team of one and ends it
// with a wake-up system call (~1.3 us here), and a small steady solve enters hundreds of them, so
// the short ones branch around the region instead.
#pragma once

namespace oxystrat {

//! body(i) for i in [0, n): statically split over the threads when `split`, else in order here.
template <typename Index, typename Body>
inline void parallel_loop(Index n, bool split, const Body& body) {
  if (split) {
#pragma omp parallel for schedule(static)
    for (Index i = 0; i < n; ++i) body(i);
  } else {
    for (Index i = 0; i < n; ++i) body(i);
  }
}

//! first() and second() on two threads when `split`, else one after the other here.
template <typename First, typename Second>
inline void side_by_side(bool split, const First& first, const Second& second) {
  if (split) {
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      first();
#pragma omp section
      second();
    }
  } else {
    first();
    second();
  }
}

}  // namespace oxystrat
