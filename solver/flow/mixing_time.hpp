// Tracer mixing time computed by the network itself: a pulse injected in one zone, the linear
// transport integrated implicitly, theta_x taken as the time after which every zone the flow
// reaches (or the probe zone) stays within +-(1 - x) of the final, uniform concentration.
#pragma once

#include <Eigen/Core>
#include <vector>

#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/linear_integrator.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

struct MixingOptions {
  //! Injection point; z < 0: the surface next to the shaft, or where that broth is stagnant (outside
  //! every cavern), the nearest zone the flow reaches.
  double inject_r_m = 0.0, inject_z_m = -1.0;
  double probe_r_m = -1.0, probe_z_m = -1.0;   //!< probe point; < 0: 3/4 radius at the lowest impeller
  double homogeneity = 0.95;                    //!< x in theta_x [-]
  double max_time_s = 1e6;                      //!< give up after this time [s]
  int snapshots = 60;                           //!< about this many stored fields
};

struct MixingResult {
  double theta_s = 0.0;        //!< whole vessel: every zone the flow reaches within the band [s]
  //! Share of the volume theta_s judges: 1, or less where caverns leave stagnant broth, which
  //! exchanges by molecular diffusion only and is left out (unless the tracer is injected there).
  double judged_volume_fraction = 1.0;
  double theta_probe_s = 0.0;  //!< at the probe zone [s]
  int inject_zone = 0, probe_zone = 0;
  bool reached = false;        //!< false when max_time_s ran out first
  std::vector<double> time_s;         //!< accepted step times [s]
  std::vector<double> probe;          //!< c / c_final at the probe [-]
  std::vector<double> max_deviation;  //!< max over the judged zones of |c / c_mixed - 1| [-]
  std::vector<double> snapshot_time_s;
  std::vector<Eigen::VectorXd> snapshots;  //!< c / c_final per zone at snapshot_time_s
  IntegratorStats stats;
};

//! Circulation time scale V / (sum of impeller circulation flows) [s].
double circulation_time(const ZoneNetwork& net, const Hydrodynamics& h);

MixingResult tracer_mixing_time(const ZoneNetwork& net, const Hydrodynamics& h, const MixingOptions& opts);

//! Last time at which `deviation` exceeded `band`, linearly interpolated between samples [s].
double last_exceedance(const std::vector<double>& time_s, const std::vector<double>& deviation, double band);

}  // namespace oxystrat
