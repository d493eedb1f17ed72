// Work to compress a gas from the suppliers' inlet to the sparger: the isothermal ideal (the least
// work of any compressor) and the adiabatic (isentropic) ideal, to which a machine's efficiency
// applies. Free functions, SI in and out; ideal gas (docs/method.md, section 18).
#pragma once

namespace oxystrat::physics {

//! Heat capacity ratio cp/cv of air, O2 and N2 near room temperature [-]: 1.40 [mem].
inline constexpr double air_heat_capacity_ratio = 1.40;

//! Isothermal compression power [W] of a gas flow `inlet_flow_m3_s` [m3/s] measured at the inlet
//! pressure `p_in_pa` [Pa] up to `p_out_pa` [Pa]: P = p1 Q1 ln(p2/p1) (ideal gas, reversible).
double isothermal_compression_power(double p_in_pa, double inlet_flow_m3_s, double p_out_pa);

//! Adiabatic (isentropic) compression power [W], single stage, ideal gas of heat capacity ratio
//! `kappa`: P = p1 Q1 kappa/(kappa - 1) [(p2/p1)^((kappa - 1)/kappa) - 1]. A real machine needs
//! this divided by its isentropic efficiency.
double adiabatic_compression_power(double p_in_pa, double inlet_flow_m3_s, double p_out_pa,
                                   double kappa = air_heat_capacity_ratio);

}  // namespace oxystrat::physics
