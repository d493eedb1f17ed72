// Size thresholds of the linear and nonlinear solves: plain values passed down with the solve,
// never global settings. The defaults are the measured crossovers of bench/notes.md; tests and
// benchmarks pass others to exercise a path on a small network.
#pragma once

namespace oxystrat {

struct SolverOptions {
  //! From this many zones on, the zone block solver preconditions the liquid blocks by
  //! aggregation multigrid (O(N) cost and memory) instead of the exact ScalarLu, whose fill
  //! grows faster than N.
  int multigrid_from_zones = 3000;
  //! From this many liquid unknowns on, the Krylov basis sweeps (fixed chunks summed in order)
  //! and the zone loops of the Schur product and the preconditioner are split over the threads:
  //! the same bits for any thread count.
  int parallel_from_unknowns = 200000;
  //! From this block size on, ScalarLu hands over to Eigen's supernodal SparseLU (COLAMD). With
  //! AMD the plain columns had so much less fill that they were faster at every size measured up
  //! to 2e5 zones, so the switch is only for larger blocks.
  int supernodal_lu_from = 500000;
  //! Multigrid coarsening stops at this size (the coarsest LU is then a small share of a cycle).
  int multigrid_coarsest_size = 500;
  //! Multigrid levels of at least this many rows coarsen by about 8 instead of 4. At a million
  //! zones each Krylov iteration then costs a quarter less for about a tenth more iterations.
  int multigrid_eightfold_from_rows = 500000;
  //! Cold starts of networks with at least this many zones are seeded from the same case solved
  //! on the halved grid (nested iteration; solver/oxygen/nested_start.hpp). Nesting already pays
  //! near 5000 zones; below it the bundled cases keep the direct cold solve (bench/notes.md).
  int nested_start_from_zones = 5000;
  //! A nested cold start of at least this many zones also corrects the fine state on the halved
  //! grid between its outer passes (solver/oxygen/coarse_correction.hpp).
  int coarse_correction_from_zones = 5000;
  //! From this many zones on, Newton's forcing term is also floored on the max norm of the
  //! convergence test (steady_problem.cpp): at a million zones the last step then stops oversolving
  //! (45 -> 43 Krylov iterations, ~0.4 s). Smaller networks keep only the 2-norm floor: there the
  //! oversolve costs little and its margin absorbs the last holdup update (with the max-norm floor
  //! 494 and 1972 zones took an extra outer pass; bench/notes.md, session 9).
  int max_norm_forcing_from_zones = 5000;
  //! Relative residual of the multigrid solve for the gas each zone carries (gas routing): the
  //! sparged gas leaves through the surface to this times at most sqrt(zones). 1e-10 costs a
  //! sixth less than 1e-12 at 2.5e5 zones; the nested start's coarse grids take 1e-8 (a seed).
  double gas_routing_tolerance = 1e-10;
  //! Up to this many unknowns the general sparse LU takes over when the structured solve fails;
  //! above it its fill would outgrow the memory of a workstation (a million zones asked for
  //! more than 23 GB), so the solve stops with an error instead.
  int general_lu_up_to_unknowns = 400000;

  bool operator==(const SolverOptions&) const = default;
};

}  // namespace oxystrat
