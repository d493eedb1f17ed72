#include "solver/flow/transport.hpp"

namespace oxystrat {

void add_transport_triplets(const ZoneNetwork& net, const std::vector<double>& face_flow,
                            const std::vector<double>& face_exchange, Triplets& out, int offset, int stride) {
  for (size_t f = 0; f < net.faces.size(); ++f) {
    const int a = offset + stride * net.faces[f].zone_a;
    const int b = offset + stride * net.faces[f].zone_b;
    const double q = face_flow[f];
    const double from_a = q > 0.0 ? q : 0.0;   // upwind: a's concentration leaves with a->b flow
    const double from_b = q < 0.0 ? -q : 0.0;
    const double e = face_exchange[f];
    out.emplace_back(a, a, -(from_a + e));
    out.emplace_back(b, a, from_a + e);
    out.emplace_back(b, b, -(from_b + e));
    out.emplace_back(a, b, from_b + e);
  }
}

SparseMatrix transport_matrix(const ZoneNetwork& net, const std::vector<double>& face_flow,
                              const std::vector<double>& face_exchange) {
  Triplets t;
  t.reserve(4 * net.faces.size());
  add_transport_triplets(net, face_flow, face_exchange, t);
  SparseMatrix m(net.size(), net.size());
  m.setFromTriplets(t.begin(), t.end());
  return m;
}

}  // namespace oxystrat
