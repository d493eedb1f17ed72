#include "solver/studies/verdict.hpp"

#include "solver/studies/levers.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

StarvedRegion starved_region(const Case& c, const CaseRun& run, double floor) {
  StarvedRegion s;
  if (!run.field) return s;
  const auto& net = run.net;
  const auto& f = *run.field;
  s.z_lo = s.r_lo = 1e300;
  double v = 0.0;
  for (int k = 0; k < net.size(); ++k) {
    if (!(f.do_mol_m3[k] < floor)) continue;
    v += net.volume[k];
    s.z_lo = std::min(s.z_lo, std::min(net.z_floor_inner[k], net.z_floor_outer[k]));
    s.z_hi = std::max(s.z_hi, net.z1[k]);
    s.r_lo = std::min(s.r_lo, net.r0[k]);
    s.r_hi = std::max(s.r_hi, net.r1[k]);
  }
  s.volume_fraction = v / net.total_volume();
  if (v <= 0.0) return s;
  const double h = c.vessel.liquid_height_m, big_r = 0.5 * c.vessel.diameter_m;
  const double head = net.shape.head_depth();
  std::string band;
  if (s.z_hi >= h - 1e-9 && s.z_lo > 0.25 * h) {
    band = fmt::format("the top {:.2g} m of the broth ({:.2g}-{:.2g} m above the bottom)", h - s.z_lo, s.z_lo, h);
  } else if (s.z_lo <= 1e-9 && s.z_hi <= std::max(head, 0.25 * h)) {
    band = fmt::format("the bottom {:.2g} m", s.z_hi);
  } else {
    band = fmt::format("the band from {:.2g} to {:.2g} m above the bottom", s.z_lo, s.z_hi);
  }
  std::string radial;
  if (s.r_lo <= 1e-9 && s.r_hi >= big_r - 1e-9) {
    radial = "across the whole section";
  } else if (s.r_lo > 0.5 * big_r) {
    radial = fmt::format("near the wall (r > {:.2g} m)", s.r_lo);
  } else if (s.r_hi < 0.5 * big_r) {
    radial = fmt::format("around the shaft (r < {:.2g} m)", s.r_hi);
  } else {
    radial = fmt::format("between r = {:.2g} and {:.2g} m", s.r_lo, s.r_hi);
  }
  s.where = band + ", " + radial;
  return s;
}

}  // namespace

std::string lever_advice(const LeversStudy& s) {
  std::string fixes;
  for (const auto& r : s.levers) {
    if (!r.found || r.already) continue;
    // Drawn power (agitator + compressor): more gas costs compressor power, not shaft power.
    const double drawn = s.base.total_power_w > 0.0 ? 100.0 * (r.effects.total_power_w / s.base.total_power_w - 1.0) : 0.0;
    const std::string value = r.unit.empty() ? "the impellers of " + r.key : fmt::format("{} {:.4g} {}", r.name, r.value, r.unit);
    // Drawn power leaves out the oxygen an enriched gas needs: say how much, so that a lever that
    // saves power is not read as free.
    const double more_o2_kg_s = added_oxygen_kg_s(r, s);
    const std::string o2 =
        more_o2_kg_s > 0.0 ? fmt::format(", plus {:.3g} t/day of pure O2", more_o2_kg_s * 86400.0 / 1000.0) : "";
    fixes += fmt::format("{}{} (drawn power {:+.0f} %{})", fixes.empty() ? "" : "; or ", value, drawn, o2);
  }
  if (fixes.empty()) {
    return "No single lever fixes it within its limits (speed, gas flow, back pressure, O2 enrichment): combine them, or "
           "change the impellers or the culture; `oxystrat levers` and `oxystrat sweep` show the options.";
  }
  return "Each of these alone fixes it: " + fixes + ". `oxystrat levers` tabulates their side effects.";
}

Verdict make_verdict(const Case& c, const CaseRun& run) {
  Verdict v;
  v.checks = check_constraints(c, run);
  v.meets = feasible(v.checks);
  v.do_floor_mol_m3 = c.constraints.min_do_mol_m3.value_or(c.culture.critical_do_mol_m3);
  v.starved = starved_region(c, run, v.do_floor_mol_m3);
  for (const auto& k : v.checks) {
    if (!k.satisfied) v.binding += (v.binding.empty() ? "" : "; ") + k.detail;
  }
  if (!run.field) {
    v.headline = "NOT FINE: no gas is sparged, so nothing supplies oxygen.";
    v.advice = "Give operation.gas_flow and a [sparger].";
    return v;
  }
  const auto& f = *run.field;
  const double one = run.single_zone ? run.single_zone->do_min : f.do_mean;
  if (v.meets) {
    v.headline = fmt::format("FINE: every constraint holds; the lowest DO is {:.3g} mmol/L, {:.0f} % above the floor of "
                             "{:.3g} mmol/L.",
                             f.do_min, 100.0 * (f.do_min / v.do_floor_mol_m3 - 1.0), v.do_floor_mol_m3);
    // Beyond bubbly flow in much of the tank, one bubble size per zone holds too much gas: the
    // holdup, and the kLa it gives, are overstated, so a pass there is not to be trusted as it reads.
    const bool churning = f.volume_fraction_churning > widespread_churning_share;
    if (churning) {
      v.headline += fmt::format(" But the gas holdup passes {:.0f} % in {:.0f} % of the volume: churn-turbulent flow, "
                                "where the model overstates holdup and kLa, so this answer is optimistic.",
                                100.0 * bubbly_flow_holdup, 100.0 * f.volume_fraction_churning);
    }
    if (!run.cautions.empty()) {
      v.headline += fmt::format(" Read the {} caution{} below before relying on it.", run.cautions.size(),
                                run.cautions.size() == 1 ? "" : "s");
    }
    if (churning) {
      v.advice = "Bring the superficial gas velocity down to stay in bubbly flow (less air; back pressure or O2 "
                 "enrichment instead), or confirm kLa by measurement at this scale and gas rate.";
    } else if (v.do_floor_mol_m3 > 0.0 && f.do_min < 1.5 * v.do_floor_mol_m3) {
      v.advice = "The margin on DO is thin: a 20-40 % kLa error (the correlations' scatter) would take part of the tank below "
                 "the floor; see `oxystrat run --uncertainty 200`.";
    } else {
      v.advice = "Nothing to change for oxygen; the table shows what the other limits leave.";
    }
    return v;
  }
  if (v.starved.volume_fraction > 0.0) {
    v.headline = fmt::format("NOT FINE: {:.1f} % of the broth, {}, is below the DO floor of {:.3g} mmol/L{}.",
                             100.0 * v.starved.volume_fraction, v.starved.where, v.do_floor_mol_m3,
                             one >= v.do_floor_mol_m3 ? " although the one-average-kLa answer says the tank is fine"
                                                      : "");
  } else {
    v.headline = "NOT FINE: the oxygen supply is enough, but a constraint fails: " + v.binding + ".";
  }
  v.advice = "Run `oxystrat levers` on this case for the smallest change of speed, gas flow, back pressure or O2 "
             "enrichment that fixes it, and what each costs.";
  return v;
}

}  // namespace oxystrat
