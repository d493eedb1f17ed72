// The finest level of a zone network's multigrid in a fixed five-point form. The zones are cells
// of an (r, z) grid numbered row by row, coupled only through the grid's faces: each row of a
// transport block then has at most two entries before its diagonal (the zone just before it in
// the numbering and one further away) and two after it. Stored as four columns and values per
// row (a missing coupling is a zero entry), the ILU(0) sweeps and the residual run with fixed
// trip counts and no row starts: fewer bytes per row than compressed rows, on the level where a
// cycle spends most of its time (it runs at memory speed on large networks).
#pragma once

#include <optional>
#include <vector>

namespace oxystrat {

class FivePointIlu {
 public:
  //! From compressed rows sorted by column: the operator B, its ILU(0) factors on B's pattern
  //! (U's rows divided by their diagonal), the position of each diagonal and 1 / U_ii. Nothing
  //! when a row does not have the five-point shape.
  static std::optional<FivePointIlu> from_rows(const std::vector<int>& start, const std::vector<int>& col,
                                               const std::vector<float>& val, const std::vector<float>& lu,
                                               const std::vector<int>& diag_pos, const std::vector<float>& inv_diag);
  //! r = (LU)^-1 in, added to *add_to when given; with residual_of, of in - B residual_of instead.
  void solve(const std::vector<float>& in, std::vector<float>& r, std::vector<float>* add_to,
             const std::vector<float>* residual_of) const;
  //! coarse[aggregate[i]] += (b - B x)_i for the rows with an aggregate (>= 0).
  void restrict_residual(const std::vector<float>& b, const std::vector<float>& x, const std::vector<int>& aggregate,
                         std::vector<float>& coarse) const;
  long nonzeros() const { return static_cast<long>(val_.size() + lu_.size()); }

 private:
  // Row i's residual (b - B y)_i: in the header, so that the sweeps inline it.
  double residual(const float* b, const float* y, int i) const {
    const int* c = &col_[4 * static_cast<size_t>(i)];
    const float* v = &val_[5 * static_cast<size_t>(i)];
    return b[i] - ((double(v[0]) * y[c[0]] + double(v[1]) * y[c[1]]) + (double(v[2]) * y[c[2]] + double(v[3]) * y[c[3]]) +
                   double(v[4]) * y[i]);
  }

  int n_ = 0;
  // Per row, slots 0..3: a column further before, the column just before (i - 1), the column
  // just after (i + 1), a column further after. An absent coupling is a zero value whose column
  // is a valid index (the row itself, or its neighbour), so the loops need no test.
  std::vector<int> col_;
  std::vector<float> lu_;   // 4 per row: L in slots 0, 1; U (divided by its diagonal) in 2, 3
  std::vector<float> val_;  // 5 per row: B in the four slots, then B's diagonal
  std::vector<float> inv_diag_;
};

}  // namespace oxystrat
