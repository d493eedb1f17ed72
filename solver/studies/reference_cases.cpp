#include "solver/studies/reference_cases.hpp"

#include <fmt/format.h>

#include "input/case_reader.hpp"

namespace oxystrat {

Case reference_single_impeller(const std::string& type, double d_over_t, int radial, int axial, double speed_rpm) {
  const std::string text = fmt::format(R"toml(
[vessel]
diameter = "1 m"
liquid_height = "1 m"
bottom = "flat"
[[impeller]]
type = "{}"
diameter = "{} m"
elevation = "0.3333 m"
[operation]
speed = "{} rpm"
[grid]
radial = {}
axial = {}
)toml",
                                       type, d_over_t, speed_rpm, radial, axial);
  return read_case_text(text, "reference_single_impeller").data;
}

Case reference_gassed_single_rushton(double speed_rpm, double vvm) {
  const std::string text = fmt::format(R"toml(
[vessel]
diameter = "1.0 m"
liquid_height = "1.0 m"
bottom = "flat"
temperature = "20 degC"
[[impeller]]
type = "rushton"
diameter = "0.333 m"
elevation = "0.333 m"
[sparger]
type = "ring"
elevation = "0.15 m"
diameter = "0.25 m"
[operation]
speed = "{} rpm"
gas_flow = "{} vvm"
[grid]
radial = 10
axial = 30
)toml",
                                       speed_rpm, vvm);
  return read_case_text(text, "reference_gassed_single_rushton").data;
}

Case reference_gassed_vessel(int radial, int axial, double biomass_g_l) {
  const std::string text = fmt::format(R"toml(
[vessel]
diameter = "1.2 m"
liquid_height = "2.4 m"
bottom = "ellipsoidal"
head_pressure = "0.3 bar(g)"
temperature = "30 degC"
[[impeller]]
type = "rushton"
diameter = "0.4 m"
elevation = "0.55 m"
[[impeller]]
type = "rushton"
diameter = "0.4 m"
elevation = "1.55 m"
[sparger]
type = "ring"
elevation = "0.35 m"
diameter = "0.3 m"
[operation]
speed = "180 rpm"
gas_flow = "0.8 vvm"
[culture]
biomass = "{} g/L"
q_o2_max = "5 mmol/g/h"
k_o2 = "0.003 mmol/L"
critical_do = "0.02 mmol/L"
rq = 1.0
[grid]
radial = {}
axial = {}
)toml",
                                       biomass_g_l, radial, axial);
  return read_case_text(text, "reference_gassed_vessel").data;
}

}  // namespace oxystrat
