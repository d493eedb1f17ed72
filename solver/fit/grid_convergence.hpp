// Discretisation error from three grids: observed order of convergence and Roache's Grid
// Convergence Index, following the procedure of Celik et al. (2008), J. Fluids Eng. 130:078001
// (the procedure ASME V&V 20-2009 adopts; GCI: Roache 1994, 1998).
#pragma once

#include <string>

namespace oxystrat {

struct GridConvergence {
  double observed_order = 0.0;     //!< p [-]
  double extrapolated = 0.0;       //!< Richardson-extrapolated value [unit of f]
  double gci_fine = 0.0;           //!< GCI of the fine solution, relative [-] (1.25 safety factor)
  double gci_fine_absolute = 0.0;  //!< the same as an absolute band [unit of f]
  bool oscillatory = false;        //!< the differences change sign
  bool converged_already = false;  //!< the three values agree to round-off: no error estimate needed
};

//! f1 on the finest grid with representative cell size h1 < h2 < h3.
GridConvergence grid_convergence(double f1, double f2, double f3, double h1, double h2, double h3);

//! Whether an observed order p lies in the asymptotic range of a scheme of formal order
//! `formal`: 0.5 <= p / formal <= 2. Celik et al. (2008) judge the GCI reliable only when p is
//! close to the formal order and give no number; this band is our own choice. Far outside it the
//! three grids do not follow the leading error term and the GCI means nothing, however small.
bool in_asymptotic_range(double observed_order, double formal_order);

}  // namespace oxystrat
