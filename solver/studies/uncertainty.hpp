// Monte Carlo over the uncertain model constants: seeded Latin-hypercube samples in standard-normal
// space, each constant perturbed by a documented width, the case re-run per sample (in parallel,
// results independent of the thread count); P10 / P50 / P90 of the answers and a ranked
// sensitivity (which constant moves DO_min most).
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "input/case.hpp"

namespace oxystrat {

struct UncertainConstant {
  std::string name;
  bool log_normal = true;  //!< true: multiply by exp(width z); false: add width z
  double width = 0.0;      //!< sigma of ln(factor), or of the shift
  std::string source;      //!< where the width comes from
  std::function<void(Case&, double)> apply;  //!< applies the factor (or shift) to a case
};

//! The constants with their default widths and sources (docs/trust.md, "Uncertainty").
std::vector<UncertainConstant> uncertain_constants();
//! The constants as they act on case `c`: with the mechanistic kLa the correlation's exponents do
//! not enter the zones' kLa (width 0, said in the source), and the prefactor's scatter is carried
//! by the mechanistic kLa's level, model.kla_factor.
std::vector<UncertainConstant> uncertain_constants(const Case& c);

struct UncertaintyOptions {
  int samples = 100;
  std::uint64_t seed = 1;
  double width_scale = 1.0;          //!< multiplies every width (0: the deterministic answer)
  std::vector<std::string> only;     //!< when not empty: vary just these constants
  bool with_mixing = true;           //!< theta95 per sample
  int threads = 0;
};

struct Quantiles {
  double p10 = 0.0, p50 = 0.0, p90 = 0.0;
};

struct UncertaintyOutput {
  std::string name;
  std::string label;         //!< as the tables name the value ("DO min (zones)")
  std::string unit;          //!< SI unit of the samples
  std::string display_unit;  //!< unit of the tables people read (units::display_scale)
  std::vector<double> samples;  //!< one per sample (NaN where a sample failed)
  Quantiles q;
};

struct Sensitivity {
  std::string constant;
  double spearman = 0.0;  //!< rank correlation of the constant's draw with DO_min [-]
  //! |spearman| at least 1.96 / sqrt(n - 1) over the n samples that ran: beyond what sampling
  //! noise gives a constant with no effect, 95 % two-sided (the rank correlation of independent
  //! draws has variance 1 / (n - 1); common practice). Below it the ranking says nothing.
  bool significant = false;
};

struct UncertaintyResult {
  std::vector<UncertainConstant> constants;
  std::vector<std::vector<double>> draws;  //!< [sample][constant] standard-normal draws
  std::vector<UncertaintyOutput> outputs;  //!< do_min, volume_fraction_below_critical, max_biomass, theta95
  std::vector<Sensitivity> sensitivity;    //!< sorted by |spearman|, largest first
  double noise_bar = 1.0;                  //!< 1.96 / sqrt(n - 1) over the n samples that ran [-]
  std::vector<double> profile_z;           //!< level heights [m]
  std::vector<Quantiles> profile_do;       //!< mean DO per level [mol/m3]
  int failed = 0;
  //! Samples in which some broth fell below its (sampled) critical DO, of those that ran.
  int samples_below_critical = 0, samples_ran = 0;
};

UncertaintyResult run_uncertainty(const Case& c, const UncertaintyOptions& opts);
//! The names of UncertaintyResult::outputs, in order.
std::vector<std::string> uncertainty_output_names();

//! Linear-interpolation quantile (type 7) of finite values; NaN when none.
double quantile(std::vector<double> values, double p);
//! Inverse of the standard normal CDF (bisection on erfc to round-off).
double normal_quantile(double p);

}  // namespace oxystrat
