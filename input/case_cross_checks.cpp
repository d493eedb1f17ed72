#include "input/case_cross_checks.hpp"

#include <fmt/format.h>

#include "physics/solubility.hpp"

namespace oxystrat::detail {

void check_control_limits(const TomlSource& src, const Case& c) {
  const auto& k = c.control;
  if (k.speed_min_rps > k.speed_max_rps) {
    src.fail(src.has("control.speed_min") ? "control.speed_min" : "control.speed_max",
             fmt::format("control.speed_min ({:.4g} rpm{}) is above control.speed_max ({:.4g} rpm); the controller "
                         "moves the speed between them: give speed_min <= speed_max",
                         60.0 * k.speed_min_rps, src.has("control.speed_min") ? "" : ", by default operation.speed",
                         60.0 * k.speed_max_rps));
  }
  if (k.gas_min_m3_s >= 0.0 && k.gas_max_m3_s >= 0.0 && k.gas_min_m3_s > k.gas_max_m3_s) {
    src.fail("control.gas_min", fmt::format("control.gas_min ({:.4g} Nm3/h) is above control.gas_max ({:.4g} Nm3/h)",
                                            3600.0 * k.gas_min_m3_s, 3600.0 * k.gas_max_m3_s));
  }
}

void check_gas_and_boiling(const TomlSource& src, const Case& c, std::vector<std::string>& notes) {
  const double t = c.vessel.temperature_k, p = c.vessel.head_pressure_pa;
  const double pw = physics::water_vapour_pressure(t);
  // The head is the lowest pressure in the vessel: if the broth does not boil there, it does not
  // boil anywhere, and C* = H y (p - pw) stays positive in every zone.
  if (pw >= p) {
    src.fail(src.has("vessel.head_pressure") ? "vessel.head_pressure" : "vessel.temperature",
             fmt::format("the broth boils: water at {:.4g} degC has a vapour pressure of {:.4g} kPa, at or above the "
                         "head pressure of {:.4g} kPa (absolute), so no gas phase of the given composition can "
                         "exist; raise vessel.head_pressure above {:.4g} kPa or lower vessel.temperature",
                         t - 273.15, pw / 1e3, p / 1e3, pw / 1e3));
  }
  if (pw >= vapour_caution_share * p) {
    notes.push_back(fmt::format("{}: close to boiling: water vapour ({:.4g} kPa at {:.4g} degC) is {:.0f} % of the "
                                "head-space gas at {:.4g} kPa (absolute), so C* is at most {:.0f} % of its dry-gas "
                                "value and evaporation cools and concentrates the broth",
                                src.where("vessel.temperature"), pw / 1e3, t - 273.15, 100.0 * pw / p, p / 1e3,
                                100.0 * (1.0 - pw / p)));
  }
  const double o2 = std::max(c.operation.oxygen_fraction, c.control.enabled ? c.control.oxygen_max : 0.0);
  if (o2 > enriched_o2_fraction) {
    notes.push_back(fmt::format("{}: oxygen-enriched gas ({:.3g} % O2): materials, seals, lubricants and the exhaust "
                                "must be suitable for it; follow the safety rules and codes that apply on your site",
                                src.where(c.operation.oxygen_fraction > enriched_o2_fraction ? "operation.oxygen_fraction"
                                                                                             : "control.oxygen_max"),
                                100.0 * o2));
  }
}

void check_events(const TomlSource& src, const Case& c, const std::string& text, const std::string& file_name,
                  const std::vector<Override>& overrides) {
  // The reads below check the events of the case they read again: once is enough.
  static thread_local bool inside = false;
  if (inside || c.events.empty()) return;
  inside = true;
  struct Reset {
    ~Reset() { inside = false; }
  } reset;
  std::vector<Override> applied = overrides;
  for (size_t i = 0; i < c.events.size(); ++i) {
    const std::string at = src.where(fmt::format("event.{}.set", i));
    for (const auto& set : c.events[i].sets) {
      try {
        applied.push_back(parse_override(set));
        (void)read_case_text(text, file_name, applied);
      } catch (const CaseError& e) {
        // The reader names the override as a --set; here it is the event's own line.
        std::string why = e.what();
        if (const std::string head = "--set '" + set + "': "; why.rfind(head, 0) == 0) why.erase(0, head.size());
        throw CaseError(fmt::format("{}: when this event applies it, {}", at, why));
      }
    }
  }
}

}  // namespace oxystrat::detail
