// The five-point form of the multigrid's finest level: its sweeps apply (LU)^-1 of the ILU(0)
// factors it was given, with and without the residual formed inside the sweep, and it refuses
// rows that do not have the grid's shape. Checked against dense triangular solves of the same
// factors (verification: the same arithmetic by another route).
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <optional>
#include <vector>

#include "solver/linalg/five_point_ilu.hpp"

namespace oxystrat {
namespace {

// Compressed rows of a five-point M-matrix on a grid of `columns` x `rows` cells with some cells
// left out (as a dished bottom cuts a zone grid), numbered row by row over the cells kept.
struct Rows {
  std::vector<int> start{0}, col, diag_pos;
  std::vector<float> val, lu, inv_diag;
  int n = 0;
};

Rows grid_operator(int columns, int rows) {
  std::vector<int> id(static_cast<size_t>(columns) * rows, -1);
  int n = 0;
  for (int j = 0; j < rows; ++j) {
    for (int i = 0; i < columns; ++i) {
      const bool cut = j < 2 && i >= columns - 2 + j;  // corner cells missing in the first rows
      if (!cut) id[static_cast<size_t>(j) * columns + i] = n++;
    }
  }
  Rows m;
  m.n = n;
  for (int j = 0; j < rows; ++j) {
    for (int i = 0; i < columns; ++i) {
      const int k = id[static_cast<size_t>(j) * columns + i];
      if (k < 0) continue;
      const int nb[4] = {j > 0 ? id[static_cast<size_t>(j - 1) * columns + i] : -1, i > 0 ? id[static_cast<size_t>(j) * columns + i - 1] : -1,
                         i + 1 < columns ? id[static_cast<size_t>(j) * columns + i + 1] : -1,
                         j + 1 < rows ? id[static_cast<size_t>(j + 1) * columns + i] : -1};
      double off = 0.0;
      for (int s = 0; s < 4; ++s) {
        if (nb[s] < 0) continue;
        if (s >= 2 && static_cast<int>(m.diag_pos.size()) == k) {  // the diagonal between lower and upper (sorted columns)
          m.diag_pos.push_back(static_cast<int>(m.col.size()));
          m.col.push_back(k);
          m.val.push_back(0.0f);
        }
        const double a = -(0.5 + 0.1 * ((k + 3 * s) % 7));  // unsymmetric, as transport is
        m.col.push_back(nb[s]);
        m.val.push_back(static_cast<float>(a));
        off -= a;
      }
      if (static_cast<int>(m.diag_pos.size()) == k) {  // no upper coupling: the diagonal last
        m.diag_pos.push_back(static_cast<int>(m.col.size()));
        m.col.push_back(k);
        m.val.push_back(0.0f);
      }
      m.val[m.diag_pos[k]] = static_cast<float>(off + 0.3);  // strictly dominant
      m.start.push_back(static_cast<int>(m.col.size()));
    }
  }
  // ILU(0) on the pattern (IKJ), then U's rows divided by their diagonal, as the multigrid keeps them.
  std::vector<double> lu(m.val.begin(), m.val.end());
  std::vector<int> where(n, -1);
  for (int r = 0; r < n; ++r) {
    for (int e = m.start[r]; e < m.start[r + 1]; ++e) where[m.col[e]] = e;
    for (int e = m.start[r]; e < m.diag_pos[r]; ++e) {
      const int k = m.col[e];
      const double l = lu[e] /= lu[m.diag_pos[k]];
      for (int f = m.diag_pos[k] + 1; f < m.start[k + 1]; ++f) {
        if (where[m.col[f]] >= m.start[r]) lu[where[m.col[f]]] -= l * lu[f];
      }
    }
    for (int e = m.start[r]; e < m.start[r + 1]; ++e) where[m.col[e]] = -1;
  }
  m.inv_diag.resize(n);
  for (int r = 0; r < n; ++r) {
    const double d = 1.0 / lu[m.diag_pos[r]];
    m.inv_diag[r] = static_cast<float>(d);
    for (int e = m.diag_pos[r] + 1; e < m.start[r + 1]; ++e) lu[e] *= d;
  }
  m.lu.assign(lu.begin(), lu.end());
  return m;
}

// Dense L (unit diagonal), U and B from the rows.
void dense_factors(const Rows& m, Eigen::MatrixXd& l, Eigen::MatrixXd& u, Eigen::MatrixXd& b) {
  l = Eigen::MatrixXd::Identity(m.n, m.n);
  u = Eigen::MatrixXd::Zero(m.n, m.n);
  b = Eigen::MatrixXd::Zero(m.n, m.n);
  for (int r = 0; r < m.n; ++r) {
    const double d = 1.0 / m.inv_diag[r];
    for (int e = m.start[r]; e < m.start[r + 1]; ++e) {
      b(r, m.col[e]) = m.val[e];
      if (e < m.diag_pos[r]) l(r, m.col[e]) = m.lu[e];
      if (e > m.diag_pos[r]) u(r, m.col[e]) = m.lu[e] * d;
    }
    u(r, r) = d;
  }
}

std::vector<float> sample(int n, double phase) {
  std::vector<float> v(n);
  for (int i = 0; i < n; ++i) v[i] = static_cast<float>(std::sin(0.7 * i + phase) + 0.2);
  return v;
}

// A grid's operator, its five-point form and the same factors dense.
struct Example {
  Rows m;
  std::optional<FivePointIlu> f;
  Eigen::MatrixXd l, u, b;
};

Example example(int columns, int rows) {
  Example e{grid_operator(columns, rows), std::nullopt, {}, {}, {}};
  e.f = FivePointIlu::from_rows(e.m.start, e.m.col, e.m.val, e.m.lu, e.m.diag_pos, e.m.inv_diag);
  dense_factors(e.m, e.l, e.u, e.b);
  return e;
}

TEST(FivePointIlu, SweepsApplyTheInverseOfTheirFactors) {
  const Example e = example(7, 5);
  ASSERT_TRUE(e.f.has_value());
  const Rows& m = e.m;
  const auto& f = e.f;
  const Eigen::MatrixXd &l = e.l, &u = e.u, &b = e.b;
  const std::vector<float> rhs = sample(m.n, 0.0), y = sample(m.n, 1.0), base = sample(m.n, 2.0);
  const Eigen::VectorXd rhs_d = Eigen::Map<const Eigen::VectorXf>(rhs.data(), m.n).cast<double>();
  const Eigen::VectorXd y_d = Eigen::Map<const Eigen::VectorXf>(y.data(), m.n).cast<double>();
  // Single-precision factors and vectors, sums in double: agreement to a few float roundings.
  constexpr double kTol = 1e-5;

  std::vector<float> x(m.n, 0.0f);
  f->solve(rhs, x, nullptr, nullptr);
  Eigen::VectorXd expect = u.triangularView<Eigen::Upper>().solve(l.triangularView<Eigen::UnitLower>().solve(rhs_d));
  for (int i = 0; i < m.n; ++i) EXPECT_NEAR(x[i], expect[i], kTol * expect.cwiseAbs().maxCoeff()) << i;

  // With the residual of y formed in the sweep, and the result added to a vector.
  std::vector<float> r(m.n, 7.0f), sum = base;
  f->solve(rhs, r, &sum, &y);
  expect = u.triangularView<Eigen::Upper>().solve(l.triangularView<Eigen::UnitLower>().solve(rhs_d - b * y_d));
  for (int i = 0; i < m.n; ++i) {
    EXPECT_NEAR(r[i], expect[i], kTol * expect.cwiseAbs().maxCoeff()) << i;
    EXPECT_NEAR(sum[i], base[i] + expect[i], kTol * (expect.cwiseAbs().maxCoeff() + 1.0)) << i;
  }
}

TEST(FivePointIlu, RestrictsTheResidualByAggregate) {
  const Example e = example(6, 4);
  ASSERT_TRUE(e.f.has_value());
  const Rows& m = e.m;
  const Eigen::MatrixXd& b = e.b;
  const std::vector<float> rhs = sample(m.n, 0.3), x = sample(m.n, 1.3);
  std::vector<int> aggregate(m.n);
  for (int i = 0; i < m.n; ++i) aggregate[i] = i % 5 == 4 ? -1 : i / 3;  // some rows left out
  const int coarse = m.n / 3 + 1;
  std::vector<float> got(coarse, 0.0f);
  e.f->restrict_residual(rhs, x, aggregate, got);
  const Eigen::VectorXd res = Eigen::Map<const Eigen::VectorXf>(rhs.data(), m.n).cast<double>() -
                              b * Eigen::Map<const Eigen::VectorXf>(x.data(), m.n).cast<double>();
  std::vector<double> expect(coarse, 0.0);
  for (int i = 0; i < m.n; ++i) {
    if (aggregate[i] >= 0) expect[aggregate[i]] += res[i];
  }
  for (int a = 0; a < coarse; ++a) EXPECT_NEAR(got[a], expect[a], 1e-5 * res.cwiseAbs().maxCoeff()) << a;
}

TEST(FivePointIlu, RefusesRowsWithoutTheGridShape) {
  Rows m = grid_operator(5, 4);
  ASSERT_TRUE(FivePointIlu::from_rows(m.start, m.col, m.val, m.lu, m.diag_pos, m.inv_diag).has_value());
  // The last row gets a third coupling below its diagonal (two further away than i - 1).
  const int r = m.n - 1;
  std::vector<int> col(m.col.begin(), m.col.begin() + m.start[r]);
  std::vector<float> val(m.val.begin(), m.val.begin() + m.start[r]), lu(m.lu.begin(), m.lu.begin() + m.start[r]);
  for (int c : {0, 1, r - 5, r - 1, r}) {
    col.push_back(c);
    val.push_back(c == r ? 4.0f : -0.5f);
    lu.push_back(c == r ? 4.0f : -0.1f);
  }
  std::vector<int> start(m.start.begin(), m.start.begin() + r + 1), diag = m.diag_pos;
  start.push_back(static_cast<int>(col.size()));
  diag[r] = static_cast<int>(col.size()) - 1;
  EXPECT_FALSE(FivePointIlu::from_rows(start, col, val, lu, diag, m.inv_diag).has_value());
}

}  // namespace
}  // namespace oxystrat
