// The linear transport operator on the zone graph: upwind convection along face flows plus
// symmetric turbulent exchange. V dc/dt = L c. L has zero row sums (a uniform field stays) and zero
// column sums (mass is conserved), and is an M-matrix, so implicit steps keep c >= 0.
#pragma once

#include <Eigen/Sparse>
#include <vector>

#include "mesh/zone_network.hpp"

namespace oxystrat {

using SparseMatrix = Eigen::SparseMatrix<double>;
using Triplets = std::vector<Eigen::Triplet<double>>;

//! Appends the transport triplets (row, col, rate [m3/s]) with rows/cols offset by `offset`
//! and zones spaced by `stride` unknowns (for coupled multi-species state vectors).
void add_transport_triplets(const ZoneNetwork& net, const std::vector<double>& face_flow,
                            const std::vector<double>& face_exchange, Triplets& out, int offset = 0, int stride = 1);

//! L as a sparse matrix [m3/s], size zones x zones.
SparseMatrix transport_matrix(const ZoneNetwork& net, const std::vector<double>& face_flow,
                              const std::vector<double>& face_exchange);

}  // namespace oxystrat
