#include "solver/linalg/five_point_ilu.hpp"

#include <utility>

namespace oxystrat {

std::optional<FivePointIlu> FivePointIlu::from_rows(const std::vector<int>& start, const std::vector<int>& col,
                                                    const std::vector<float>& val, const std::vector<float>& lu,
                                                    const std::vector<int>& diag_pos, const std::vector<float>& inv_diag) {
  FivePointIlu f;
  const int n = static_cast<int>(start.size()) - 1;
  f.n_ = n;
  f.col_.resize(4 * static_cast<size_t>(n));
  f.lu_.assign(4 * static_cast<size_t>(n), 0.0f);
  f.val_.assign(5 * static_cast<size_t>(n), 0.0f);
  f.inv_diag_ = inv_diag;
  for (int i = 0; i < n; ++i) {
    int* c = &f.col_[4 * static_cast<size_t>(i)];
    float* l = &f.lu_[4 * static_cast<size_t>(i)];
    float* v = &f.val_[5 * static_cast<size_t>(i)];
    c[0] = c[3] = i;
    c[1] = i > 0 ? i - 1 : i;
    c[2] = i + 1 < n ? i + 1 : i;
    bool far_before = false, far_after = false;
    const int d = diag_pos[i];
    for (int e = start[i]; e < start[i + 1]; ++e) {
      if (e == d) continue;
      int slot;
      if (e < d) {
        slot = col[e] == i - 1 ? 1 : 0;
        if (slot == 0 && std::exchange(far_before, true)) return std::nullopt;
      } else {
        slot = col[e] == i + 1 ? 2 : 3;
        if (slot == 3 && std::exchange(far_after, true)) return std::nullopt;
      }
      c[slot] = col[e], l[slot] = lu[e], v[slot] = val[e];
    }
    v[4] = val[d];
  }
  return f;
}

// As ScalarMultigrid's sweeps: the neighbour just finished (i - 1 forward, i + 1 backward) comes
// from a register and is subtracted last, so that the chain from row to row is one multiply and
// one subtraction; the far neighbour and the residual are ready before it arrives.
void FivePointIlu::solve(const std::vector<float>& in, std::vector<float>& r, std::vector<float>* add_to,
                         const std::vector<float>* residual_of) const {
  const int* c = col_.data();
  const float* l = lu_.data();
  const float* b = in.data();
  float* x = r.data();
  double last = 0.0;
  const auto forward = [&](auto rhs) {
    for (int i = 0; i < n_; ++i) {
      const double s = rhs(i) - double(l[4 * i]) * x[c[4 * i]] - double(l[4 * i + 1]) * last;
      x[i] = static_cast<float>(s);
      last = s;
    }
  };
  if (residual_of != nullptr) {
    const float* y = residual_of->data();
    forward([&](int i) { return residual(b, y, i); });
  } else {
    forward([&](int i) { return double(b[i]); });
  }
  last = 0.0;
  float* sum = add_to != nullptr ? add_to->data() : nullptr;
  for (int i = n_ - 1; i >= 0; --i) {
    const double s = double(x[i]) * inv_diag_[i] - double(l[4 * i + 3]) * x[c[4 * i + 3]] - double(l[4 * i + 2]) * last;
    x[i] = static_cast<float>(s);
    last = s;
    if (sum != nullptr) sum[i] += static_cast<float>(s);
  }
}

void FivePointIlu::restrict_residual(const std::vector<float>& b, const std::vector<float>& x, const std::vector<int>& aggregate,
                                     std::vector<float>& coarse) const {
  for (int i = 0; i < n_; ++i) {
    if (aggregate[i] >= 0) coarse[aggregate[i]] += static_cast<float>(residual(b.data(), x.data(), i));
  }
}

}  // namespace oxystrat
