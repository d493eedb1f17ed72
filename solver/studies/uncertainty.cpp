#include "solver/studies/uncertainty.hpp"

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <limits>
#include <numeric>
#include <omp.h>


#include "solver/oxygen/case_run.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "physics/impeller_power.hpp"
#include "physics/mass_transfer.hpp"
#include "solver/flow/mixing_time.hpp"
#include "solver/random/latin_hypercube.hpp"

namespace oxystrat {
namespace {

double spearman(const std::vector<double>& a, const std::vector<double>& b) {
  std::vector<size_t> keep;
  for (size_t i = 0; i < a.size(); ++i) {
    if (std::isfinite(a[i]) && std::isfinite(b[i])) keep.push_back(i);
  }
  const auto ranks = [&](const std::vector<double>& v) {
    std::vector<size_t> order(keep.size());
    std::iota(order.begin(), order.end(), 0);
    std::stable_sort(order.begin(), order.end(), [&](size_t x, size_t y) { return v[keep[x]] < v[keep[y]]; });
    std::vector<double> r(keep.size());
    for (size_t i = 0; i < order.size();) {  // ties share their mean rank
      size_t j = i;
      while (j + 1 < order.size() && v[keep[order[j + 1]]] == v[keep[order[i]]]) ++j;
      for (size_t k = i; k <= j; ++k) r[order[k]] = 0.5 * (i + j);
      i = j + 1;
    }
    return r;
  };
  if (keep.size() < 3) return 0.0;
  const auto ra = ranks(a), rb = ranks(b);
  const double ma = std::accumulate(ra.begin(), ra.end(), 0.0) / ra.size();
  const double mb = std::accumulate(rb.begin(), rb.end(), 0.0) / rb.size();
  double sab = 0.0, saa = 0.0, sbb = 0.0;
  for (size_t i = 0; i < ra.size(); ++i) {
    sab += (ra[i] - ma) * (rb[i] - mb);
    saa += (ra[i] - ma) * (ra[i] - ma);
    sbb += (rb[i] - mb) * (rb[i] - mb);
  }
  return saa > 0.0 && sbb > 0.0 ? sab / std::sqrt(saa * sbb) : 0.0;
}

}  // namespace

double normal_quantile(double p) {
  // A Latin hypercube draw can be exactly 0 (one in 2^53 per stratum): the smallest positive p.
  p = std::clamp(p, std::numeric_limits<double>::min(), 1.0 - std::numeric_limits<double>::epsilon() / 2);
  return boost::math::quantile(boost::math::normal(), p);
}

double quantile(std::vector<double> v, double p) {
  v.erase(std::remove_if(v.begin(), v.end(), [](double x) { return !std::isfinite(x); }), v.end());
  if (v.empty()) return std::numeric_limits<double>::quiet_NaN();
  std::sort(v.begin(), v.end());
  const double pos = p * (v.size() - 1);
  const auto i = static_cast<size_t>(std::floor(pos));
  const double f = pos - i;
  return i + 1 < v.size() ? v[i] + f * (v[i + 1] - v[i]) : v[i];
}

std::vector<UncertainConstant> uncertain_constants() {
  return {
      {"kla_prefactor", true, 0.18,
       "+-20-40 % scatter of the van 't Riet correlation (van 't Riet 1979; Humbird et al. 2017) taken as its 90 % range",
       [](Case& c, double f) { c.model.kla_prefactor = vant_riet_constants(c.broth.coalescence, c.model).prefactor * f; }},
      {"kla_power_exponent", false, 0.05, "spread of the P/V exponent between published fits, 0.4 +- 0.1 [mem], as 2 sigma",
       [](Case& c, double s) {
         c.model.kla_power_exponent = vant_riet_constants(c.broth.coalescence, c.model).power_exponent + s;
       }},
      {"kla_gas_exponent", false, 0.05, "spread of the vs exponent between published fits, +- 0.1 [mem], as 2 sigma",
       [](Case& c, double s) { c.model.kla_gas_exponent = vant_riet_constants(c.broth.coalescence, c.model).gas_exponent + s; }},
      {"power_number", true, 0.07, "Rushton Np 4.6-6.0 with blade thickness and clearance (docs/method.md [sec]) as a 95 % range",
       [](Case& c, double f) {
         for (auto& i : c.impellers) i.power_number = i.power_number.value_or(impeller_data(i.type).power_number) * f;
       }},
      {"flow_number", true, 0.05, "Rushton Nq 0.70-0.85 (docs/method.md [sec]) as a 95 % range",
       [](Case& c, double f) {
         for (auto& i : c.impellers) i.flow_number = i.flow_number.value_or(impeller_data(i.type).flow_number) * f;
       }},
      {"gassed_power_factor", true, 0.07, "scatter of gassed-power data about Cui et al. (1996), +-15 % [mem], as a 95 % range",
       [](Case& c, double f) { c.model.gassed_power_multiplier *= f; }},
      {"exchange_constant", true, 0.14,
       "theta95 of the calibration and validation points within +-25 % of the correlation (README, Calibration) as a 90 % range",
       [](Case& c, double f) {
         c.model.exchange_constant = (c.model.exchange_constant > 0.0 ? c.model.exchange_constant : default_exchange_constant) * f;
       }},
      {"slip_velocity", true, 0.10, "bubble slip velocity 0.2-0.3 m/s [mem] as a 95 % range",
       [](Case& c, double f) { c.model.slip_multiplier *= f; }},
      {"critical_do", true, 0.20, "critical-DO values published for one organism differ by +-30-50 % [mem]",
       [](Case& c, double f) { c.culture.critical_do_mol_m3 *= f; }},
      {"q_o2_max", true, 0.10, "culture-to-culture spread of measured specific O2 uptake, +-20 % [mem], as a 95 % range",
       [](Case& c, double f) { c.culture.q_o2_max_mol_kg_s *= f; }},
  };
}

std::vector<UncertainConstant> uncertain_constants(const Case& c) {
  auto constants = uncertain_constants();
  if (c.model.kla_model != KlaModel::mechanistic) return constants;
  for (auto& k : constants) {
    if (k.name == "kla_power_exponent" || k.name == "kla_gas_exponent") {
      k.width = 0.0;
      k.source = "not varied: the mechanistic kLa does not use the correlation's exponents";
    } else if (k.name == "kla_prefactor") {
      k.source = "the mechanistic kLa's level (model.kla_factor), given the correlations' +-20-40 % scatter as its 90 % "
                 "range (our assumption: the eddy model and the bubble size are no better known)";
      k.apply = [](Case& ci, double f) { ci.model.kla_factor *= f; };
    }
  }
  return constants;
}

std::vector<std::string> uncertainty_output_names() {
  return {"do_min", "volume_fraction_below_critical", "max_biomass", "theta95"};
}

UncertaintyResult run_uncertainty(const Case& c, const UncertaintyOptions& opts) {
  UncertaintyResult res;
  res.constants = uncertain_constants(c);
  for (auto& k : res.constants) {
    const bool varied = opts.only.empty() || std::find(opts.only.begin(), opts.only.end(), k.name) != opts.only.end();
    k.width *= varied ? opts.width_scale : 0.0;
  }
  const int n = opts.samples;
  const size_t nk = res.constants.size();
  // Latin hypercube in probability, mapped to standard-normal draws; all drawn before any run.
  res.draws = latin_hypercube_unit(n, static_cast<int>(nk), opts.seed);
  for (auto& draw : res.draws) {
    for (double& x : draw) x = normal_quantile(x);
  }
  const auto names = uncertainty_output_names();
  const char* units_[4] = {"mol/m3", "1", "kg/m3", "s"};       // SI, as /summary
  const char* shown[4] = {"mmol/L", "%", "g/L", "s"};          // for the tables people read
  const char* labels[4] = {"DO min (zones)", "volume below critical DO", "max biomass (zones)", "mixing time theta95"};  // as summary_values() names them
  for (int q = 0; q < 4; ++q) {
    res.outputs.push_back(
        {names[q], labels[q], units_[q], shown[q], std::vector<double>(static_cast<size_t>(n), std::nan("")), {}});
  }
  const auto net0 = build_zone_geometry(c);
  std::vector<std::vector<double>> profiles(static_cast<size_t>(n));
  int failed = 0;
  const int threads = opts.threads > 0 ? opts.threads : omp_get_max_threads();
#pragma omp parallel for schedule(dynamic, 1) num_threads(threads) reduction(+ : failed)
  for (int i = 0; i < n; ++i) {
    Case ci = c;
    for (size_t k = 0; k < nk; ++k) {
      const auto& con = res.constants[k];
      const double x = con.width * res.draws[i][k];
      if (con.width != 0.0) con.apply(ci, con.log_normal ? std::exp(x) : x);
    }
    try {
      // 0.1 % on the biomass is ample against a band of tens of per cent.
      const auto run = run_case(ci, {true, false, 1e-3});
      if (run.field) {
        res.outputs[0].samples[i] = run.field->do_min;
        res.outputs[1].samples[i] = run.field->volume_fraction_below_critical;
        res.outputs[2].samples[i] = run.max_biomass_kg_m3;
        profiles[i] = height_profile(run.net, run.field->do_mol_m3).mean;
      }
      if (opts.with_mixing) res.outputs[3].samples[i] = tracer_mixing_time(run.net, run.hydro, {}).theta_s;
    } catch (const std::exception&) {
      ++failed;
    }
  }
  res.failed = failed;
  for (auto& o : res.outputs) o.q = {quantile(o.samples, 0.1), quantile(o.samples, 0.5), quantile(o.samples, 0.9)};
  const auto finite = [](double v) { return std::isfinite(v); };
  const double ran = static_cast<double>(std::count_if(res.outputs[0].samples.begin(), res.outputs[0].samples.end(), finite));
  res.samples_ran = static_cast<int>(ran);
  res.samples_below_critical = static_cast<int>(
      std::count_if(res.outputs[1].samples.begin(), res.outputs[1].samples.end(), [](double v) { return v > 0.0; }));
  res.noise_bar = ran > 1.0 ? 1.96 / std::sqrt(ran - 1.0) : 1.0;
  const double noise = res.noise_bar;
  for (size_t k = 0; k < nk; ++k) {
    if (res.constants[k].width == 0.0) continue;
    std::vector<double> draws(static_cast<size_t>(n));
    for (int i = 0; i < n; ++i) draws[i] = res.draws[i][k];
    const double rho = spearman(draws, res.outputs[0].samples);
    res.sensitivity.push_back({res.constants[k].name, rho, std::abs(rho) >= noise});
  }
  std::stable_sort(res.sensitivity.begin(), res.sensitivity.end(),
                   [](const Sensitivity& a, const Sensitivity& b) { return std::abs(a.spearman) > std::abs(b.spearman); });
  for (int j = 0; j < net0.rows(); ++j) res.profile_z.push_back(0.5 * (net0.z_lines[j] + net0.z_lines[j + 1]));
  for (size_t j = 0; j < res.profile_z.size(); ++j) {
    std::vector<double> v;
    for (const auto& p : profiles) v.push_back(p.size() > j ? p[j] : std::nan(""));
    res.profile_do.push_back({quantile(v, 0.1), quantile(v, 0.5), quantile(v, 0.9)});
  }
  return res;
}

}  // namespace oxystrat
